//! A design's CO₂ atmospheres: their checks when a document is read and their part of the
//! report, over the design's parts (recipe, mixture, what-ifs, field), so the design can call
//! the checks without this file naming the design; a gas put over a whole design (`--co2`) is
//! [`super::report::with_co2`].

use crate::atmosphere::field::{field_gas, validate_field_gas, FieldGas};
use crate::atmosphere::what_if::{co2_curve, gas_what_if, Co2Curve, GasWhatIf};
use crate::equilibrium::gas::{gas_at, no_carbonate, validate, Atmosphere, CARBONATE};
use crate::error::{Result, SolverError};
use crate::field::FieldSpec;
use crate::mixture::{lookup, MixtureSpec, WhatIf};
use crate::recipe::RecipeSpec;
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
pub fn validate_design_gas(
    recipe: &RecipeSpec,
    mixture: &MixtureSpec,
    what_if: &WhatIf,
    field: &FieldSpec,
    custom: &[AcidSystem],
) -> Result<()> {
    if let Some(a) = &recipe.atmosphere {
        let rp = under("recipe");
        gas_ok(a, recipe.temperature_c).map_err(&rp)?;
        if lookup(&recipe.system, custom)?.id != CARBONATE {
            return Err(rp(no_carbonate("atmosphere")));
        }
    }
    if let Some(a) = &mixture.atmosphere {
        let mp = under("mixture");
        gas_ok(a, mixture.temperature_c).map_err(&mp)?;
        if !has_carbonate(mixture, custom) {
            return Err(mp(no_carbonate("atmosphere")));
        }
    }
    validate_field_gas(field, custom).map_err(under("field"))?;
    if let Some(u) = what_if.room_co2_uatm {
        crate::limits::ROOM_CO2_UATM.check_path(u)?;
    }
    if let Some(x) = what_if.co2_percent {
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
    what_if: &WhatIf,
    target: Option<f64>,
) -> GasParts {
    let s = |e: SolverError| e.to_string();
    GasParts {
        what_if: gas_what_if(m, custom, what_if).map_err(s),
        curve: co2_curve(m, custom, target, CURVE_MAX_PERCENT, CURVE_POINTS).map_err(s),
    }
}

/// The gas part of a report; `recipe_mixture` is the recipe's finished
/// solution when it solved. `None` when no workspace has an atmosphere.
pub fn gas_report(
    recipe: &RecipeSpec,
    mixture: &MixtureSpec,
    what_if: &WhatIf,
    field: &FieldSpec,
    custom: &[AcidSystem],
    recipe_mixture: Option<&MixtureSpec>,
) -> Option<GasReport> {
    let recipe = match (recipe.atmosphere, recipe_mixture) {
        (Some(_), Some(m)) => Some(gas_parts(m, custom, what_if, Some(recipe.target_ph))),
        _ => None,
    };
    let mixture = mixture
        .atmosphere
        .map(|_| gas_parts(mixture, custom, what_if, None));
    let field = match field_gas(field, custom) {
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
