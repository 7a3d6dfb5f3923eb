//! Design documents: what the user entered, versioned, validated field by field.
//!
//! The same type is saved by the page, exported to files, carried in share
//! links and read by the command-line entry. [`parse_design`] migrates older
//! schema versions, then checks every field and names the first bad one.

use crate::activity::ActivityModel;
use crate::error::{in_range, Result, SolverError};
use crate::field::{field_reading, FieldResult, FieldSpec, IonicSource, TotalUnit};
use crate::library::find_form;
use crate::mixture::{
    lookup, prepare, solve_mixture, species_curves, titration_curve, what_if, Additive,
    AdditiveSpec, ComponentSpec, MixtureResult, MixtureSpec, SpeciesCurves, TitrationCurve, WhatIf,
    WhatIfResult,
};
use crate::recipe::{solve_recipe, Method, RecipeResult, RecipeSpec};
use crate::system::AcidSystem;
use crate::thermo::validate_system;
use crate::uncertainty::UncertaintyInputs;
use serde::{Deserialize, Serialize};

/// Current schema version of [`Design`].
pub const SCHEMA_VERSION: u32 = 1;

/// The page's workspaces.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Workspace {
    /// Make a buffer.
    #[default]
    Recipe,
    /// What is in the flask.
    Mixture,
    /// Species and capacity plots.
    Species,
    /// Field reading.
    Field,
}

/// Which composition the species plots show.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum PlotSource {
    /// The recipe's finished solution.
    #[default]
    Recipe,
    /// The mixture.
    Mixture,
}

/// One saved design: every input of every workspace.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Design {
    /// Schema version; always [`SCHEMA_VERSION`] after parsing.
    pub schema: u32,
    /// Name given by the user.
    pub name: String,
    /// Last save, milliseconds since the Unix epoch (0 = never saved).
    #[serde(default)]
    pub saved_at_ms: f64,
    /// Workspace shown when opened.
    #[serde(default)]
    pub workspace: Workspace,
    /// Recipe inputs.
    pub recipe: RecipeSpec,
    /// Mixture inputs.
    pub mixture: MixtureSpec,
    /// What-if inputs.
    #[serde(default)]
    pub what_if: WhatIf,
    /// Field reading inputs.
    pub field: FieldSpec,
    /// Which composition the plots show.
    #[serde(default)]
    pub plot_source: PlotSource,
    /// User-defined acid systems.
    #[serde(default)]
    pub custom_systems: Vec<AcidSystem>,
    /// The user's ± figures for the uncertainty budgets (optional; omitted when default).
    #[serde(default, skip_serializing_if = "UncertaintyInputs::is_default")]
    pub uncertainty: UncertaintyInputs,
}

fn doc_err(field: &str, reason: impl Into<String>) -> SolverError {
    SolverError::Document {
        field: field.into(),
        reason: reason.into(),
    }
}

/// Bring an older document up to [`SCHEMA_VERSION`].
///
/// Version 1 is the first published schema, so there is nothing to migrate
/// yet; each future version adds one arm here that rewrites the JSON value
/// from `n` to `n + 1`, and a test with a stored version-`n` document.
fn migrate(mut value: serde_json::Value) -> Result<serde_json::Value> {
    let version = value
        .get("schema")
        .and_then(serde_json::Value::as_u64)
        .ok_or_else(|| doc_err("schema", "missing or not a whole number"))?;
    if version == 0 || version > u64::from(SCHEMA_VERSION) {
        return Err(doc_err(
            "schema",
            format!("version {version} is not supported (this page reads 1 to {SCHEMA_VERSION})"),
        ));
    }
    if let Some(obj) = value.as_object_mut() {
        obj.insert("schema".into(), serde_json::Value::from(SCHEMA_VERSION));
    }
    Ok(value)
}

/// Parse, migrate and validate a design document.
///
/// # Errors
///
/// [`SolverError::Document`] naming the field path for syntax and type
/// errors; field-named range errors (paths such as `recipe.target_ph`) for
/// values the page would refuse.
///
/// # Example
///
/// ```
/// use solver::design::{demo_design, parse_design, to_json};
/// let d = demo_design();
/// let back = parse_design(&to_json(&d))?;
/// assert_eq!(back, d);
/// let bad = to_json(&d).replace("\"target_ph\":7.4", "\"target_ph\":15.0");
/// let err = parse_design(&bad).unwrap_err();
/// assert!(err.to_string().contains("recipe.target_ph"));
/// # Ok::<(), solver::SolverError>(())
/// ```
pub fn parse_design(text: &str) -> Result<Design> {
    let value: serde_json::Value = serde_json::from_str(text)
        .map_err(|e| doc_err("document", format!("not valid JSON: {e}")))?;
    let value = migrate(value)?;
    let design: Design = serde_path_to_error::deserialize(value).map_err(|e| {
        let path = e.path().to_string();
        doc_err(&path, e.into_inner().to_string())
    })?;
    validate_design(&design)?;
    Ok(design)
}

fn prefixed(prefix: &str, e: SolverError) -> SolverError {
    let p = |f: String| format!("{prefix}.{f}");
    match e {
        SolverError::NotFinite { field } => SolverError::NotFinite { field: p(field) },
        SolverError::Negative { field, value } => SolverError::Negative {
            field: p(field),
            value,
        },
        SolverError::OutOfRange {
            field,
            value,
            min,
            max,
        } => SolverError::OutOfRange {
            field: p(field),
            value,
            min,
            max,
        },
        SolverError::Infeasible { field, reason } => SolverError::Infeasible {
            field: p(field),
            reason,
        },
        other => other,
    }
}

/// Check every field a user can enter, without solving anything.
///
/// # Errors
///
/// The first bad field, named by its path.
pub fn validate_design(d: &Design) -> Result<()> {
    if d.name.chars().count() > 120 {
        return Err(doc_err("name", "longer than 120 characters"));
    }
    for (i, s) in d.custom_systems.iter().enumerate() {
        validate_system(s).map_err(|e| prefixed(&format!("custom_systems[{i}]"), e))?;
    }
    let custom = &d.custom_systems;
    // Recipe.
    let r = &d.recipe;
    let rp = |e| prefixed("recipe", e);
    let sys = lookup(&r.system, custom)?;
    in_range("target_ph", r.target_ph, 0.0, 14.0).map_err(rp)?;
    in_range("temperature_c", r.temperature_c, 0.0, 60.0).map_err(rp)?;
    in_range("total_conc_m", r.total_conc_m, 0.0, 5.0).map_err(rp)?;
    in_range("volume_l", r.volume_l, 0.0, 1000.0).map_err(rp)?;
    in_range("tolerance_ph", r.tolerance_ph, 0.0, 2.0).map_err(rp)?;
    if let Some(s) = &r.salt {
        in_range("salt.conc_m", s.conc_m, 0.0, 5.0).map_err(rp)?;
    }
    let form_ok = |field: &str, id: &str| -> Result<()> {
        if find_form(sys, id).is_some() {
            Ok(())
        } else {
            Err(SolverError::Unknown {
                kind: format!("form (recipe.method.{field})"),
                name: id.into(),
            })
        }
    };
    match &r.method {
        Method::TwoForms {
            acid_form,
            base_form,
        } => {
            form_ok("acid_form", acid_form)?;
            form_ok("base_form", base_form)?;
        }
        Method::Titrate {
            form, titrant_m, ..
        } => {
            form_ok("form", form)?;
            in_range("method.titrant_m", *titrant_m, 0.0, 20.0).map_err(rp)?;
        }
        Method::TwoStocks {
            acid_form,
            acid_stock_m,
            base_form,
            base_stock_m,
        } => {
            form_ok("acid_form", acid_form)?;
            form_ok("base_form", base_form)?;
            in_range("method.acid_stock_m", *acid_stock_m, 0.0, 20.0).map_err(rp)?;
            in_range("method.base_stock_m", *base_stock_m, 0.0, 20.0).map_err(rp)?;
        }
    }
    // Mixture.
    let mp = |e| prefixed("mixture", e);
    in_range("temperature_c", d.mixture.temperature_c, 0.0, 60.0).map_err(mp)?;
    for (i, c) in d.mixture.components.iter().enumerate() {
        let s = lookup(&c.system, custom)?;
        in_range(&format!("components[{i}].conc_m"), c.conc_m, 0.0, 5.0).map_err(mp)?;
        if let Some(f) = &c.form {
            if find_form(s, f).is_none() {
                return Err(SolverError::Unknown {
                    kind: format!("form (mixture.components[{i}].form)"),
                    name: f.clone(),
                });
            }
        }
    }
    for (i, a) in d.mixture.additives.iter().enumerate() {
        in_range(&format!("additives[{i}].conc_m"), a.conc_m, 0.0, 5.0).map_err(mp)?;
    }
    let wp = |e| prefixed("what_if", e);
    let w = &d.what_if;
    in_range("dilution_factor", w.dilution_factor, 1.0, 1e9).map_err(wp)?;
    in_range("add_acid_m", w.add_acid_m, 0.0, 5.0).map_err(wp)?;
    in_range("add_base_m", w.add_base_m, 0.0, 5.0).map_err(wp)?;
    in_range("temperature_c", w.temperature_c, 0.0, 60.0).map_err(wp)?;
    // Field.
    let fp = |e| prefixed("field", e);
    lookup(&d.field.system, custom)?;
    in_range("ph", d.field.ph, 0.0, 14.0).map_err(fp)?;
    in_range("temperature_c", d.field.temperature_c, 0.0, 60.0).map_err(fp)?;
    if let Some(t) = d.field.total {
        in_range("total", t, 0.0, 1e6).map_err(fp)?;
    }
    crate::field::ionic_from(&d.field.ionic).map_err(fp)?;
    d.uncertainty.validate()?;
    Ok(())
}

/// Serialise a design (compact JSON).
pub fn to_json(d: &Design) -> String {
    serde_json::to_string(d).unwrap_or_default()
}

/// Serialise a design for reading (indented JSON).
pub fn to_json_pretty(d: &Design) -> String {
    serde_json::to_string_pretty(d).unwrap_or_default()
}

/// The demo design loaded on first visit: a fish-hatchery lab's morning.
///
/// Invented scenario, for the demo only: the hatchery's lab makes 500 mL of
/// 50 mM phosphate, pH 7.40 at 37 °C, for an enzyme assay; the mixture
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
            salt: None,
            activity: ActivityModel::Davies,
            method: Method::TwoForms {
                acid_form: "nah2po4_h2o".into(),
                base_form: "na2hpo4_7h2o".into(),
            },
            tolerance_ph: 0.05,
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
        },
        what_if: WhatIf::default(),
        field: FieldSpec {
            system: "ammonium".into(),
            ph: 8.1,
            temperature_c: 18.5,
            total: Some(0.8),
            total_unit: TotalUnit::MgPerLAs,
            ionic: IonicSource::Conductivity { us_cm: 450.0 },
        },
        plot_source: PlotSource::Recipe,
        custom_systems: vec![],
        uncertainty: UncertaintyInputs::default(),
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
}

/// Compute every part of a design.
pub fn report(d: &Design) -> Report {
    let custom = &d.custom_systems;
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
    let s = |e: SolverError| e.to_string();
    Report {
        name: d.name.clone(),
        recipe: recipe.map_err(s),
        mixture: solve_mixture(&d.mixture, custom).map_err(s),
        what_if: what_if(&d.mixture, custom, &d.what_if).map_err(s),
        field: field_reading(&d.field, custom).map_err(s),
        curves: curves.map_err(s),
        titration: titration.map_err(s),
    }
}

#[cfg(test)]
#[allow(clippy::unwrap_used, clippy::expect_used, clippy::indexing_slicing)]
mod tests {
    use super::*;

    #[test]
    fn demo_round_trips_and_reports() {
        let d = demo_design();
        assert_eq!(parse_design(&to_json_pretty(&d)).unwrap(), d);
        let r = report(&d);
        assert!(r.recipe.is_ok() && r.mixture.is_ok() && r.field.is_ok());
        assert!(r.what_if.is_ok() && r.curves.is_ok() && r.titration.is_ok());
    }

    #[test]
    fn future_and_missing_schema_are_refused() {
        let j = to_json(&demo_design());
        let future = j.replace("\"schema\":1", "\"schema\":99");
        let e = parse_design(&future).unwrap_err().to_string();
        assert!(e.starts_with("schema"), "{e}");
        let missing = j.replace("\"schema\":1,", "");
        assert!(parse_design(&missing)
            .unwrap_err()
            .to_string()
            .starts_with("schema"));
    }

    #[test]
    fn type_errors_name_the_path() {
        let j = to_json(&demo_design()).replace("\"volume_l\":0.5", "\"volume_l\":\"half\"");
        let e = parse_design(&j).unwrap_err().to_string();
        assert!(e.contains("recipe.volume_l"), "{e}");
    }

    #[test]
    fn unknown_form_is_named() {
        let j = to_json(&demo_design()).replace("na2hpo4_7h2o", "unobtainium");
        let e = parse_design(&j).unwrap_err().to_string();
        assert!(
            e.contains("unobtainium") && e.contains("recipe.method"),
            "{e}"
        );
    }

    #[test]
    fn negative_mixture_amount_is_named() {
        let mut d = demo_design();
        if let Some(c) = d.mixture.components.first_mut() {
            c.conc_m = -1.0;
        }
        let e = parse_design(&to_json(&d)).unwrap_err().to_string();
        assert!(e.contains("mixture.components[0].conc_m"), "{e}");
    }
}
