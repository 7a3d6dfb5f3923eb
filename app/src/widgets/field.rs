//! The rules every number field of the page shares, as plain functions: which limit a field
//! path has (one lookup), the unit rule (picking a unit converts the number on screen, never the
//! amount), and the plausibility check ("check the unit"). [`crate::widgets::inputs::NumberField`]
//! is the one component that applies them; the round-trip tests drive the same functions.

use crate::widgets::format::{fmt_input, fmt_sig, parse_number_in, Rule, Unit};

/// One unit a field can be shown in: its key (saved or remembered), its label, and the factor to
/// the field's base (value in base = shown number × factor).
#[derive(Debug, Clone, PartialEq)]
pub struct UnitOpt {
    /// Key (the design's name for a stored unit; the label for a display unit).
    pub key: String,
    /// Label in the picker.
    pub label: String,
    /// Multiply a shown number by this to get the base amount.
    pub factor: f64,
}

impl UnitOpt {
    /// A unit option.
    pub fn new(key: impl Into<String>, label: impl Into<String>, factor: f64) -> Self {
        Self {
            key: key.into(),
            label: label.into(),
            factor,
        }
    }
}

/// The options of a display-only unit choice (the design holds the base unit).
pub fn view_units(units: &[Unit]) -> Vec<UnitOpt> {
    units
        .iter()
        .map(|u| UnitOpt::new(u.label, u.label, u.factor))
        .collect()
}

/// The unit rule, written once for every unit picker of the page: picking another unit converts
/// the number on screen, typed or not (3 mM → 0.003 M), so the amount never changes by picking a
/// unit. Text that is not a number stays as typed (`None`).
pub fn convert_text(text: &str, comma: bool, from: f64, to: f64) -> Option<String> {
    let v = parse_number_in(text, comma).ok()?;
    (to > 0.0 && from.is_finite() && to.is_finite()).then(|| fmt_input(v * from / to))
}

/// The limit of the field at document path `path` (`recipe.target_ph`,
/// `recipe.salts[].conc_m`, `field.limit.value`): the solver's rulebook
/// ([`solver::limits::find`]), one lookup for every field of the page, so the page and the
/// document reader refuse the same values. A path the rulebook does not hold (none of the page's;
/// the test reads every source file) refuses every value, saying so, rather than borrow a rule.
pub fn limit_for(path: &str) -> Rule {
    solver::limits::find(path).unwrap_or(NO_RULE)
}

/// The rule of a field whose path is not in the rulebook: nothing typed is accepted.
const NO_RULE: Rule = Rule {
    path: "",
    min: f64::NAN,
    max: f64::NAN,
    unit: "",
    message: "This box has no rule in the solver's rulebook (a defect of the page): nothing typed here is used.",
};

/// Where numbers of a quantity usually lie (base unit), for the "check the unit" note.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Plausible {
    /// Usual lowest (base unit).
    pub lo: f64,
    /// Usual highest (base unit).
    pub hi: f64,
    /// What the range is, in words ("natural waters").
    pub what: &'static str,
}

/// "Check the unit" when `shown` in `units[unit]` lies outside the usual range, naming a unit in
/// which the same number would be usual. Never refuses: the value may be right.
pub fn unit_check(shown: f64, unit: usize, units: &[UnitOpt], p: Plausible) -> Option<String> {
    let here = units.get(unit)?;
    let base = shown * here.factor;
    if base.is_nan() || base <= 0.0 || (p.lo..=p.hi).contains(&base) {
        return None;
    }
    let usual = |u: &UnitOpt| (p.lo..=p.hi).contains(&(shown * u.factor));
    let other = units
        .iter()
        .enumerate()
        .find(|(i, u)| *i != unit && usual(u))
        .map(|(_, u)| format!(" Did you mean {} {}?", fmt_input(shown), u.label));
    let side = if base > p.hi { "above" } else { "below" };
    Some(format!(
        "Check the unit: {} {} is far {side} {} ({} to {} {}).{}",
        fmt_input(shown),
        here.label,
        p.what,
        fmt_sig(p.lo / here.factor, 3),
        fmt_sig(p.hi / here.factor, 3),
        here.label,
        other.unwrap_or_default()
    ))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::widgets::format::{check_in, CONC_UNITS, VOLUME_UNITS};

    #[test]
    fn a_unit_change_converts_numbers_and_keeps_other_text() {
        assert_eq!(
            convert_text("3", false, 1e-3, 1.0).as_deref(),
            Some("0.003")
        );
        assert_eq!(
            convert_text("3", false, 1e-3, 1e-6).as_deref(),
            Some("3000")
        );
        assert_eq!(convert_text("0,5", true, 1.0, 1e-3).as_deref(), Some("500"));
        // Out of range still converts: the amount is what was typed, in whatever unit.
        assert_eq!(convert_text("6", false, 1.0, 1e-3).as_deref(), Some("6000"));
        assert_eq!(convert_text("abc", false, 1.0, 1e-3), None);
        assert_eq!(
            convert_text("1,000", false, 1.0, 1e-3),
            None,
            "ambiguous stays"
        );
        let v = view_units(VOLUME_UNITS);
        assert_eq!(v[0].label, "mL");
        assert_eq!(view_units(CONC_UNITS).len(), 3);
    }

    /// Every document path a `NumberField` of the page names (`path=` in the workspaces).
    pub(crate) const PAGE_PATHS: &[&str] = &[
        "recipe.target_ph",
        "recipe.temperature_c",
        "recipe.prepare_temperature_c",
        "recipe.store_temperature_c",
        "recipe.total_conc_m",
        "recipe.volume_l",
        "recipe.concentrate_factor",
        "recipe.tolerance_ph",
        "recipe.method.titrant_m",
        "recipe.method.acid_stock_m",
        "recipe.method.base_stock_m",
        "recipe.salts[].conc_m",
        "mixture.temperature_c",
        "mixture.components[].conc_m",
        "mixture.additives[].conc_m",
        "what_if.dilution_factor",
        "what_if.add_acid_m",
        "what_if.add_base_m",
        "what_if.temperature_c",
        "field.ph",
        "field.temperature_c",
        "field.total",
        "field.ionic.ionic_strength",
        "field.ionic.us_cm",
        "field.ionic.mg_l",
        "field.ionic.psu",
        "field.alkalinity.value",
        "field.limit.value",
        "recipe.atmosphere.co2_percent",
        "recipe.atmosphere.co2_uatm",
        "recipe.atmosphere.pressure_kpa",
        "mixture.atmosphere.co2_percent",
        "mixture.atmosphere.co2_uatm",
        "mixture.atmosphere.pressure_kpa",
        "what_if.room_co2_uatm",
        "what_if.co2_percent",
        "field.atmosphere.co2_percent",
        "field.atmosphere.co2_uatm",
        "field.atmosphere.pressure_kpa",
        "uncertainty.balance_mg",
        "uncertainty.flask_ml",
        "uncertainty.temperature_k",
        "uncertainty.stock_percent",
        "uncertainty.ph_meter",
        "calibration.temperature_c",
        "calibration.points[].mv",
        "calibration.points[].displayed_ph",
        "calibration.limits.slope_min_percent",
        "calibration.limits.slope_max_percent",
        "calibration.limits.offset_max_mv",
        "calibration.limits.residual_max_ph",
        "calibration.buffers[].values[].temperature_c",
        "calibration.buffers[].values[].ph",
    ];

    #[test]
    fn every_path_of_the_page_is_in_the_solvers_rulebook() {
        for p in PAGE_PATHS {
            let l =
                solver::limits::find(p).unwrap_or_else(|| panic!("{p} is not in solver::limits"));
            assert_eq!(limit_for(p), l);
        }
        // And every path= (and every path passed to a field helper) in any source file of the
        // page is one of them, so a new screen cannot name a path the rulebook lacks.
        let mut seen = 0;
        for (file, src) in page_sources() {
            for marker in ["path=\"", "path: \""] {
                for part in src.split(marker).skip(1) {
                    let p = part.split('"').next().unwrap_or_default();
                    if p.is_empty() {
                        continue; // NO_RULE
                    }
                    assert!(PAGE_PATHS.contains(&p), "{file}: {p} is not in PAGE_PATHS");
                    seen += 1;
                }
            }
        }
        assert!(
            seen > 20,
            "only {seen} paths found: is the source scan reading files?"
        );
        assert!(check_in("1", limit_for("recipe.colour"), 1.0, false).is_err());
    }

    /// Every `.rs` file under `app/src` with its text.
    fn page_sources() -> Vec<(String, String)> {
        fn walk(dir: &std::path::Path, out: &mut Vec<(String, String)>) {
            let Ok(entries) = std::fs::read_dir(dir) else {
                return;
            };
            for e in entries.flatten() {
                let p = e.path();
                if p.is_dir() {
                    walk(&p, out);
                } else if p.extension().is_some_and(|x| x == "rs") {
                    let text = std::fs::read_to_string(&p).unwrap_or_default();
                    out.push((p.display().to_string(), text));
                }
            }
        }
        let mut out = Vec::new();
        walk(
            &std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("src"),
            &mut out,
        );
        out
    }

    #[test]
    fn odd_numbers_ask_to_check_the_unit() {
        let units = vec![
            UnitOpt::new("mg_caco3", "mg/L as CaCO₃", 1.0 / 50.04),
            UnitOpt::new("meq", "meq/L", 1.0),
        ];
        let p = Plausible {
            lo: 0.0,
            hi: 20.0,
            what: "natural waters",
        };
        assert_eq!(unit_check(125.0, 0, &units, p), None);
        let m = unit_check(125.0, 1, &units, p).unwrap();
        assert!(
            m.starts_with("Check the unit: 125 meq/L is far above natural waters"),
            "{m}"
        );
        assert!(m.contains("Did you mean 125 mg/L as CaCO₃?"), "{m}");
        assert_eq!(unit_check(2.5, 1, &units, p), None);
    }
}
