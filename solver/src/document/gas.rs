//! A design's CO₂ atmospheres: their checks when a document is read, their part of the report, and a gas put over a whole design.

use super::design::Design;
use crate::atmosphere::field::{field_gas, validate_field_gas, FieldGas};
use crate::atmosphere::what_if::{co2_curve, gas_what_if, Co2Curve, GasWhatIf};
use crate::equilibrium::gas::{gas_at, no_carbonate, validate, Atmosphere, CARBONATE};
use crate::error::{Result, SolverError};
use crate::mixture::{lookup, MixtureSpec};
use crate::system::AcidSystem;
use serde::Serialize;

fn under(prefix: &str) -> impl Fn(SolverError) -> SolverError + '_ {
    move |e: SolverError| e.map_field(|f| format!("{prefix}.{f}"))
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
        crate::limits::ROOM_CO2_UATM.check_path(u)?;
    }
    if let Some(x) = d.what_if.co2_percent {
        crate::limits::WHAT_IF_CO2_PERCENT.check_path(x)?;
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
    validate(a).map_err(|e| e.map_field(|_| "--co2".into()))?;
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
    super::design::validate_design(&out)?;
    Ok((out, changed))
}
