//! The rules every number field of the page shares, as plain functions: which limit a field
//! path has (one lookup), the unit rule (picking a unit converts the number on screen, never the
//! amount), and the plausibility check ("check the unit"). [`crate::widgets::inputs::NumberField`]
//! is the one component that applies them; the round-trip tests drive the same functions.

use crate::widgets::format::{self, fmt_input, fmt_sig, parse_number_in, Rule, Unit};

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
/// `recipe.salts[].conc_m`, `field.limit.value`): one lookup for every field of the page. The
/// solver's rulebook (`solver::limits`) replaces this table when it lands.
pub fn limit_for(path: &str) -> Rule {
    use format::*;
    match path {
        "recipe.target_ph" | "field.ph" => PH,
        "recipe.temperature_c"
        | "recipe.prepare_temperature_c"
        | "mixture.temperature_c"
        | "what_if.temperature_c"
        | "field.temperature_c" => TEMPERATURE,
        "recipe.total_conc_m" => BUFFER_CONC,
        "recipe.volume_l" => VOLUME,
        "recipe.concentrate_factor" => CONCENTRATE,
        "recipe.tolerance_ph" => TOLERANCE,
        "recipe.method.titrant_m" | "recipe.method.acid_stock_m" | "recipe.method.base_stock_m" => {
            STOCK
        }
        "what_if.dilution_factor" => DILUTION,
        "field.total" => FIELD_TOTAL,
        "field.ionic.ionic_strength" => IONIC,
        "field.ionic.us_cm" => CONDUCTIVITY,
        "field.ionic.mg_l" => TDS,
        "field.ionic.psu" => SALINITY,
        "field.alkalinity.value" => ALKALINITY,
        "field.limit.value" => LIMIT_VALUE,
        "uncertainty.balance_mg" => BALANCE,
        "uncertainty.flask_ml" => FLASK,
        "uncertainty.temperature_k" => TEMP_PM,
        "uncertainty.stock_percent" => PERCENT,
        "uncertainty.ph_meter" => METER,
        // Row amounts (`recipe.salts[].conc_m`, `mixture.components[].conc_m`,
        // `mixture.additives[].conc_m`) and the what-if additions.
        _ => AMOUNT,
    }
}

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
#[allow(clippy::unwrap_used, clippy::indexing_slicing)]
mod tests {
    use super::*;
    use crate::widgets::format::{CONC_UNITS, VOLUME_UNITS};

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

    #[test]
    fn every_path_has_its_limit() {
        assert_eq!(limit_for("recipe.target_ph"), format::PH);
        assert_eq!(limit_for("recipe.salts[].conc_m"), format::AMOUNT);
        assert_eq!(limit_for("field.limit.value"), format::LIMIT_VALUE);
        assert_eq!(limit_for("field.alkalinity.value"), format::ALKALINITY);
        assert_eq!(limit_for("field.ionic.psu"), format::SALINITY);
        assert_eq!(limit_for("uncertainty.ph_meter"), format::METER);
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
