//! A design's atmospheres: their checks when a document is read, and their part of the report.

use super::field::{field_gas, validate_field_gas, FieldGas};
use super::what_if::{co2_curve, gas_what_if, Co2Curve, GasWhatIf};
use super::{gas_at, no_carbonate, validate, Atmosphere, CARBONATE};
use crate::design::Design;
use crate::error::{in_range, Result, SolverError};
use crate::mixture::{lookup, MixtureSpec};
use crate::reagent::map_field;
use crate::system::AcidSystem;
use serde::Serialize;

fn under(prefix: &str) -> impl Fn(SolverError) -> SolverError + '_ {
    move |e| map_field(e, |f| format!("{prefix}.{f}"))
}

/// The atmosphere's own fields and the temperature its constants need.
fn gas_ok(a: &Atmosphere, t_c: f64) -> Result<()> {
    validate(a)?;
    gas_at(a, t_c, 0.0)?;
    Ok(())
}

/// Check every atmosphere of a design (recipe, mixture, field) and the gas
/// what-if figures, naming fields by their path (`recipe.atmosphere.co2_percent`).
///
/// # Errors
///
/// The first bad field: a CO₂ percentage outside 0–100, a partial pressure
/// above the total pressure, an atmosphere over a solution with no
/// carbonate, a temperature outside the gas constants' range (0–40 °C).
pub fn validate_design_gas(d: &Design, custom: &[AcidSystem]) -> Result<()> {
    if let Some(a) = &d.recipe.atmosphere {
        let rp = under("recipe");
        gas_ok(a, d.recipe.temperature_c).map_err(&rp)?;
        if lookup(&d.recipe.system, custom)?.id != CARBONATE {
            return Err(rp(no_carbonate("atmosphere")));
        }
    }
    if let Some(a) = &d.mixture.atmosphere {
        let mp = under("mixture");
        gas_ok(a, d.mixture.temperature_c).map_err(&mp)?;
        if !has_carbonate(&d.mixture, custom) {
            return Err(mp(no_carbonate("atmosphere")));
        }
    }
    validate_field_gas(&d.field, custom).map_err(under("field"))?;
    if let Some(u) = d.what_if.room_co2_uatm {
        in_range("what_if.room_co2_uatm", u, 0.0, 1e6)?;
    }
    if let Some(x) = d.what_if.co2_percent {
        in_range("what_if.co2_percent", x, 0.0, 100.0)?;
    }
    Ok(())
}

/// Whether a mixture lists the carbonate system (at any amount, even 0).
pub fn has_carbonate(m: &MixtureSpec, custom: &[AcidSystem]) -> bool {
    m.components.iter().any(|c| {
        lookup(&c.system, custom)
            .map(|s| s.id == CARBONATE)
            .unwrap_or(false)
    })
}

/// The gas results of one solution under its atmosphere.
#[derive(Debug, Clone, Serialize)]
pub struct GasParts {
    /// Room air and another CO₂ percentage.
    pub what_if: std::result::Result<GasWhatIf, String>,
    /// pH against CO₂ % (0–20 %, 41 points), target marked for a recipe.
    pub curve: std::result::Result<Co2Curve, String>,
}

/// The gas part of a design's report: present only when the design has an atmosphere.
#[derive(Debug, Clone, Serialize)]
pub struct GasReport {
    /// The recipe's finished solution under its atmosphere.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub recipe: Option<GasParts>,
    /// The mixture under its atmosphere.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub mixture: Option<GasParts>,
    /// The field sample at equilibrium with its atmosphere.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub field: Option<std::result::Result<FieldGas, String>>,
}

/// Highest CO₂ % of the report's curve.
pub const CURVE_MAX_PERCENT: f64 = 20.0;
/// Points of the report's curve.
pub const CURVE_POINTS: usize = 41;

/// The gas what-ifs and pH-vs-CO₂ curve of one solution.
pub fn gas_parts(
    m: &MixtureSpec,
    custom: &[AcidSystem],
    d: &Design,
    target: Option<f64>,
) -> GasParts {
    let s = |e: SolverError| e.to_string();
    GasParts {
        what_if: gas_what_if(m, custom, &d.what_if).map_err(s),
        curve: co2_curve(m, custom, target, CURVE_MAX_PERCENT, CURVE_POINTS).map_err(s),
    }
}

/// The gas part of a report; `recipe_mixture` is the recipe's finished
/// solution when it solved. `None` when no workspace has an atmosphere.
pub fn gas_report(
    d: &Design,
    custom: &[AcidSystem],
    recipe_mixture: Option<&MixtureSpec>,
) -> Option<GasReport> {
    let recipe = match (d.recipe.atmosphere, recipe_mixture) {
        (Some(_), Some(m)) => Some(gas_parts(m, custom, d, Some(d.recipe.target_ph))),
        _ => None,
    };
    let mixture = d
        .mixture
        .atmosphere
        .map(|_| gas_parts(&d.mixture, custom, d, None));
    let field = match field_gas(&d.field, custom) {
        Ok(None) => None,
        Ok(Some(f)) => Some(Ok(f)),
        Err(e) => Some(Err(e.to_string())),
    };
    if recipe.is_none() && mixture.is_none() && field.is_none() {
        return None;
    }
    Some(GasReport {
        recipe,
        mixture,
        field,
    })
}

/// Read the command line's CO₂ figure: `5%` (of the dry gas) or `420uatm`
/// (also `420µatm`), a plain number being ambiguous.
///
/// # Errors
///
/// [`SolverError::Infeasible`] on `--co2` for text that is neither.
pub fn parse_co2(text: &str) -> Result<Atmosphere> {
    let t = text.trim();
    let num = |s: &str| s.trim().parse::<f64>().ok().filter(|v| v.is_finite());
    let bad = || SolverError::Infeasible {
        field: "--co2".into(),
        reason: format!(
            "{} is not a CO₂ figure: write a percentage (5%) or a partial pressure (420uatm)",
            crate::error::quote(t)
        ),
    };
    if let Some(v) = t.strip_suffix('%').and_then(num) {
        return Ok(Atmosphere::percent(v));
    }
    let low = t.to_ascii_lowercase();
    let uatm = low
        .strip_suffix("uatm")
        .or_else(|| low.strip_suffix("µatm"));
    match uatm.and_then(num) {
        Some(v) => Ok(Atmosphere::uatm(v)),
        None => Err(bad()),
    }
}

/// A design with the gas `a` put over every workspace that holds carbonate
/// (a carbonate recipe, a mixture listing carbonate, a carbonate field
/// reading with an alkalinity), keeping a pressure already given there.
/// Returns the design and the workspaces changed, checked as a document.
///
/// # Errors
///
/// [`SolverError::Infeasible`] on `--co2` when no workspace holds carbonate
/// (none is added); the design's own checks with the gas in place.
pub fn with_co2(d: &Design, a: &Atmosphere) -> Result<(Design, Vec<&'static str>)> {
    validate(a).map_err(|e| map_field(e, |_| "--co2".into()))?;
    let systems = d.systems();
    let custom = &systems;
    let mut out = d.clone();
    let mut changed = Vec::new();
    let put = |slot: &mut Option<Atmosphere>| {
        let pressure_kpa = slot.and_then(|s| s.pressure_kpa);
        *slot = Some(Atmosphere { pressure_kpa, ..*a });
    };
    if lookup(&d.recipe.system, custom).is_ok_and(|s| s.id == CARBONATE) {
        put(&mut out.recipe.atmosphere);
        changed.push("recipe");
    }
    if has_carbonate(&d.mixture, custom) {
        put(&mut out.mixture.atmosphere);
        changed.push("mixture");
    }
    if d.field.alkalinity.is_some()
        && lookup(&d.field.system, custom).is_ok_and(|s| s.id == CARBONATE)
    {
        put(&mut out.field.atmosphere);
        changed.push("field");
    }
    if changed.is_empty() {
        return Err(SolverError::Infeasible {
            field: "--co2".into(),
            reason: "no workspace of this design holds carbonate (a carbonate recipe, carbonate \
                     in the mixture, a carbonate field reading with an alkalinity), so a CO₂ \
                     atmosphere changes nothing and none is added"
                .into(),
        });
    }
    crate::design::validate_design(&out)?;
    Ok((out, changed))
}

/// The gas part of a report as text, for the command line's `--table`.
pub fn gas_table(g: &GasReport) -> String {
    use crate::recipe::{sig, sig_trim};
    let mut out = String::from("\n== CO₂ atmosphere\n");
    let parts = |out: &mut String, label: &str, p: &GasParts| {
        match &p.what_if {
            Ok(w) => {
                out.push_str(&format!(
                    "  {label}: pH {:.2} under its gas; in room air ({} µatm) pH {:.2}",
                    w.ph,
                    sig_trim(w.room_air_uatm, 4),
                    w.room_air_ph
                ));
                if let (Some(x), Some(y)) = (w.other_percent, w.other_ph) {
                    out.push_str(&format!("; at {} % CO₂ pH {y:.2}", sig_trim(x, 3)));
                }
                out.push('\n');
            }
            Err(e) => out.push_str(&format!("  {label}: error: {e}\n")),
        }
        if let Ok(c) = &p.curve {
            let row: Vec<String> = c
                .co2_percent
                .iter()
                .zip(&c.ph)
                .step_by(4)
                .map(|(x, y)| format!("{}%:{y:.2}", sig_trim(*x, 3)))
                .collect();
            out.push_str(&format!(
                "  {label}: pH against CO₂ at {} °C  {}\n",
                sig(c.temperature_c, 3),
                row.join("  ")
            ));
            if let (Some(t), Some(x)) = (c.target_ph, c.target_co2_percent) {
                out.push_str(&format!(
                    "  {label}: target pH {t:.2} at {} % CO₂\n",
                    sig(x, 3)
                ));
            }
        }
    };
    if let Some(p) = &g.recipe {
        parts(&mut out, "recipe", p);
    }
    if let Some(p) = &g.mixture {
        parts(&mut out, "mixture", p);
    }
    match &g.field {
        Some(Ok(f)) => out.push_str(&format!(
            "  field: the sample is in balance with {} µatm; with {} µatm it settles at pH {:.2}, {} {} mg/L CO₂ (DIC {} → {} mmol/L)\n",
            sig(f.sample_co2_uatm, 3),
            sig(f.gas.co2_uatm, 3),
            f.equilibrium_ph,
            if f.co2_change_mg_l < 0.0 { "losing" } else { "gaining" },
            sig(f.co2_change_mg_l.abs(), 3),
            sig(f.dic_sample_mmol_l, 3),
            sig(f.dic_equilibrium_mmol_l, 3)
        )),
        Some(Err(e)) => out.push_str(&format!("  field: error: {e}\n")),
        None => {}
    }
    out.push_str("  (equilibrium with the gas; the time it takes is not computed)\n");
    out
}
