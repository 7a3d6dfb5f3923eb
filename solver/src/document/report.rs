//! What a whole design gives: the command line's report of every part, the uncertainty of
//! every part, and the demo design loaded on a first visit.

use super::design::{validate_design, Design, PlotSource, Workspace, SCHEMA_VERSION};
use super::gas::{gas_report, has_carbonate};
use crate::equilibrium::activity::ActivityModel;
use crate::equilibrium::gas::{validate, Atmosphere, CARBONATE};
use crate::error::{Result, SolverError};
use crate::field::{field_reading, FieldResult, FieldSpec, IonicSource, TotalUnit};
use crate::mixture::{
    lookup, prepare, solve_mixture, species_curves, titration_curve, what_if, Additive,
    AdditiveSpec, ComponentSpec, MixtureResult, MixtureSpec, SpeciesCurves, TitrationCurve, WhatIf,
    WhatIfResult,
};
use crate::recipe::{solve_recipe, Method, RecipeResult, RecipeSpec};
use crate::uncertainty::{
    field_uncertainty, mixture_uncertainty, recipe_uncertainty, FieldUncertainty, Uncertainty,
    UncertaintyInputs,
};
use serde::Serialize;

/// The demo design loaded on first visit: a fish-hatchery lab's morning.
///
/// Invented scenario, for the demo only: the hatchery's lab makes 500 mL of
/// 50 mM phosphate, pH 7.40 at 37 °C, for an enzyme assay, made and checked
/// at the 22 °C bench; the mixture
/// workspace holds a Tris/NaCl wash it keeps at room temperature; the field
/// workspace holds this morning's reading from rearing tank 3.
pub fn demo_design() -> Design {
    Design {
        schema: SCHEMA_VERSION,
        name: "Hatchery lab — assay buffer".into(),
        saved_at_ms: 0.0,
        workspace: Workspace::Recipe,
        recipe: RecipeSpec {
            system: "phosphate".into(),
            target_ph: 7.4,
            temperature_c: 37.0,
            total_conc_m: 0.05,
            volume_l: 0.5,
            salts: vec![],
            activity: ActivityModel::Davies,
            method: Method::TwoForms {
                acid_form: "nah2po4_h2o".into(),
                base_form: "na2hpo4_7h2o".into(),
            },
            tolerance_ph: 0.05,
            // Made and checked at the bench, used in the 37 °C assay.
            prepare_temperature_c: Some(22.0),
            concentrate_factor: 1.0,
            atmosphere: None,
            store_temperature_c: None,
        },
        mixture: MixtureSpec {
            temperature_c: 20.0,
            activity: ActivityModel::Davies,
            components: vec![
                ComponentSpec {
                    system: "tris".into(),
                    form: Some("tris_base".into()),
                    conc_m: 0.02,
                },
                ComponentSpec {
                    system: "tris".into(),
                    form: Some("tris_hcl".into()),
                    conc_m: 0.03,
                },
            ],
            additives: vec![AdditiveSpec {
                additive: Additive::Nacl,
                conc_m: 0.15,
            }],
            atmosphere: None,
        },
        what_if: WhatIf::default(),
        field: FieldSpec {
            system: "ammonium".into(),
            ph: 8.1,
            temperature_c: 18.5,
            total: Some(0.8),
            total_unit: TotalUnit::MgPerLAs,
            ionic: IonicSource::Conductivity { us_cm: 450.0 },
            alkalinity: None,
            limit: None,
            atmosphere: None,
        },
        plot_source: PlotSource::Recipe,
        custom_systems: vec![],
        custom_forms: vec![],
        uncertainty: UncertaintyInputs::default(),
        calibration: None,
    }
}

/// Everything the command-line entry reports for a design; each part is
/// either a result or the error message for that part.
#[derive(Debug, Clone, Serialize)]
pub struct Report {
    /// Design name.
    pub name: String,
    /// Recipe result.
    pub recipe: std::result::Result<RecipeResult, String>,
    /// Mixture result.
    pub mixture: std::result::Result<MixtureResult, String>,
    /// What-if result.
    pub what_if: std::result::Result<WhatIfResult, String>,
    /// Field reading.
    pub field: std::result::Result<FieldResult, String>,
    /// Species and capacity curves of the plotted composition (61 points, pH 0–14... coarse).
    pub curves: std::result::Result<SpeciesCurves, String>,
    /// Titration curve of the plotted composition.
    pub titration: std::result::Result<TitrationCurve, String>,
    /// Under a CO₂ atmosphere: room-air and CO₂ what-ifs, pH against CO₂ %,
    /// the field sample's equilibrium (absent when no workspace has one).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub gas: Option<super::gas::GasReport>,
}

/// Compute every part of a design.
pub fn report(d: &Design) -> Report {
    let systems = d.systems();
    let custom = &systems;
    let recipe = solve_recipe(&d.recipe, custom);
    let plotted = match (d.plot_source, &recipe) {
        (PlotSource::Recipe, Ok(r)) => r.mixture.clone(),
        _ => d.mixture.clone(),
    };
    let curves = prepare(&plotted, custom).and_then(|p| {
        let eq = p.solve()?;
        species_curves(&p, eq.ionic_strength, 0.0, 14.0, 57)
    });
    let titration = prepare(&plotted, custom).and_then(|p| {
        let c: f64 = p.composition.acids.iter().map(|a| a.total).sum();
        let span = (c * 2.0).max(0.001);
        titration_curve(&p, span, span, 41)
    });
    let gas = gas_report(
        &d.recipe,
        &d.mixture,
        &d.what_if,
        &d.field,
        custom,
        recipe.as_ref().ok().map(|r| &r.mixture),
    );
    let s = |e: SolverError| e.to_string();
    Report {
        name: d.name.clone(),
        recipe: recipe.map_err(s),
        mixture: solve_mixture(&d.mixture, custom).map_err(s),
        what_if: what_if(&d.mixture, custom, &d.what_if).map_err(s),
        field: field_reading(&d.field, custom).map_err(s),
        curves: curves.map_err(s),
        titration: titration.map_err(s),
        gas,
    }
}

/// Uncertainty of every part of a design that has one; each part is a
/// result or the error message for that part.
#[derive(Debug, Clone, Serialize)]
pub struct DesignUncertainty {
    /// Inputs used.
    pub inputs: UncertaintyInputs,
    /// Recipe pH.
    pub recipe: std::result::Result<Uncertainty, String>,
    /// Mixture (flask) pH, with the recipe's tolerance window for warnings.
    pub mixture: std::result::Result<Uncertainty, String>,
    /// Field reading fractions.
    pub field: std::result::Result<FieldUncertainty, String>,
}

/// Uncertainty of the recipe, mixture and field reading of a design.
pub fn design_uncertainty(d: &Design, inputs: &UncertaintyInputs) -> DesignUncertainty {
    let systems = d.systems();
    let custom = &systems;
    let s = |e: SolverError| e.to_string();
    let recipe = solve_recipe(&d.recipe, custom)
        .and_then(|r| recipe_uncertainty(&d.recipe, &r, inputs, custom));
    let mixture = mixture_uncertainty(&d.mixture, inputs, custom, Some(d.recipe.tolerance_ph));
    let field = field_reading(&d.field, custom)
        .and_then(|r| field_uncertainty(&d.field, &r, inputs, custom));
    DesignUncertainty {
        inputs: inputs.clone(),
        recipe: recipe.map_err(s),
        mixture: mixture.map_err(s),
        field: field.map_err(s),
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
    validate_design(&out)?;
    Ok((out, changed))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::document::design::{parse_design, to_json_pretty};

    #[test]
    fn demo_round_trips_and_reports() {
        let d = demo_design();
        assert_eq!(parse_design(&to_json_pretty(&d)).unwrap(), d);
        let r = report(&d);
        assert!(r.recipe.is_ok() && r.mixture.is_ok() && r.field.is_ok());
        assert!(r.what_if.is_ok() && r.curves.is_ok() && r.titration.is_ok());
    }
}
