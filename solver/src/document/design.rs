//! Design documents: what the user entered, versioned, validated field by field.
//!
//! The same type is saved by the page, exported to files, carried in share
//! links and read by the command-line entry. [`parse_design`] migrates older
//! schema versions, then checks every field and names the first bad one.

use super::docpath;
use crate::document::reagent::{systems_with_forms, validate_custom_forms, validate_user_system};
use crate::error::{Result, SolverError};
use crate::field::FieldSpec;
use crate::limits;
use crate::mixture::{lookup, MixtureSpec, WhatIf};
use crate::recipe::{Method, RecipeSpec};
use crate::system::library::find_form;
use crate::system::{AcidSystem, CustomForm};
use crate::uncertainty::UncertaintyInputs;
use serde::{Deserialize, Serialize};

/// Current schema version of [`Design`].
///
/// History: 1, the first published schema; 2, `recipe.salt` (one optional
/// salt) became `recipe.salts` (a list).
pub const SCHEMA_VERSION: u32 = 2;

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
    /// The pH meter bench (standards, calibration check, sample from mV).
    Meter,
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
#[serde(deny_unknown_fields)]
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
    /// Shelf forms the user added to systems (library or custom); optional,
    /// left out of the document when empty, so older documents read unchanged.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub custom_forms: Vec<CustomForm>,
    /// The user's ± figures for the uncertainty budgets (optional; omitted when default).
    #[serde(default, skip_serializing_if = "UncertaintyInputs::is_default")]
    pub uncertainty: UncertaintyInputs,
    /// The pH meter calibration (optional; omitted when absent, so older
    /// documents read and write unchanged). See `solver::meter`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub calibration: Option<crate::meter::CalibrationSpec>,
}

impl Design {
    /// The systems this design sees besides the library: `custom_systems`, and
    /// the systems `custom_forms` extend, with those forms added. Pass this
    /// wherever the solver takes the custom systems.
    pub fn systems(&self) -> Vec<AcidSystem> {
        systems_with_forms(&self.custom_systems, &self.custom_forms)
    }
}

fn doc_err(field: &str, reason: impl Into<String>) -> SolverError {
    SolverError::Document {
        field: field.into(),
        reason: reason.into(),
    }
}

/// Bring an older document up to [`SCHEMA_VERSION`].
///
/// Each version adds one arm here that rewrites the JSON value from `n` to
/// `n + 1`, and a test with stored version-`n` documents
/// (`solver/tests/data/schema1/`, `solver/tests/it/migration.rs`).
pub(crate) fn migrate(mut value: serde_json::Value) -> Result<serde_json::Value> {
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
    if version < 2 {
        migrate_1_to_2(&mut value);
    }
    if let Some(obj) = value.as_object_mut() {
        obj.insert("schema".into(), serde_json::Value::from(SCHEMA_VERSION));
    }
    Ok(value)
}

/// Schema 1 → 2: the recipe's one optional `salt` becomes the list `salts`
/// (`null` or absent → `[]`). Anything else is left for the parser to judge.
fn migrate_1_to_2(value: &mut serde_json::Value) {
    use serde_json::Value;
    if let Some(recipe) = value.get_mut("recipe").and_then(Value::as_object_mut) {
        let salts = match recipe.remove("salt") {
            None | Some(Value::Null) => vec![],
            Some(salt) => vec![salt],
        };
        recipe.insert("salts".into(), Value::Array(salts));
    }
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
/// use solver::document::{demo_design, parse_design, to_json};
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
    parse_design_value(value)
}

/// [`parse_design`] for a document already read as JSON (one element of a
/// collection file, for example): migrate, refuse unknown keys, validate.
///
/// # Errors
///
/// As [`parse_design`], except that the text is already JSON.
pub fn parse_design_value(value: serde_json::Value) -> Result<Design> {
    let value = migrate(value)?;
    let design: Design = crate::document::docpath::from_value(&value)
        .map_err(|e| docpath::serde_err(&e.path(), &e.message))?;
    let back = serde_json::to_value(&design).unwrap_or(serde_json::Value::Null);
    if let Some(field) = docpath::extra_tagged_key(&value, &back, "") {
        return Err(doc_err(
            &field,
            "unknown field (this kind takes no such key; check the spelling)",
        ));
    }
    validate_design(&design)?;
    let mut design = design;
    // The fit is a record of the inputs: recompute it, never trust it.
    design.calibration = design
        .calibration
        .map(crate::meter::CalibrationSpec::with_fit);
    Ok(design)
}

fn prefixed(prefix: &str, e: SolverError) -> SolverError {
    e.map_field(|f| format!("{prefix}.{f}"))
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
        validate_user_system(s).map_err(|e| e.reroot("system", &format!("custom_systems[{i}]")))?;
    }
    validate_custom_forms(&d.custom_forms, &d.custom_systems)?;
    let systems = d.systems();
    let custom = &systems;
    // Recipe.
    let r = &d.recipe;
    let rp = |e| prefixed("recipe", e);
    let sys = lookup(&r.system, custom)?;
    limits::TARGET_PH.check(r.target_ph).map_err(rp)?;
    limits::TEMPERATURE_C.check(r.temperature_c).map_err(rp)?;
    limits::TOTAL_CONC_M.check(r.total_conc_m).map_err(rp)?;
    limits::VOLUME_L.check(r.volume_l).map_err(rp)?;
    limits::TOLERANCE_PH.check(r.tolerance_ph).map_err(rp)?;
    // The preparation temperature is checked against the system's data range by the
    // recipe (as the working temperature is), not here: a design whose system changed
    // under it still opens, and the recipe says why beside the field.
    if let Some(t) = r.prepare_temperature_c {
        limits::PREPARE_TEMPERATURE_C.check(t).map_err(rp)?;
    }
    if let Some(t) = r.store_temperature_c {
        limits::STORE_TEMPERATURE_C.check(t).map_err(rp)?;
    }
    limits::CONCENTRATE_FACTOR
        .check(r.concentrate_factor)
        .map_err(rp)?;
    for (i, s) in r.salts.iter().enumerate() {
        limits::SALT_CONC_M
            .check_as(&format!("salts[{i}].conc_m"), s.conc_m)
            .map_err(rp)?;
    }
    crate::recipe::validate_salts(&r.salts).map_err(rp)?;
    let form_ok = |field: &str, id: &str| -> Result<()> {
        if find_form(sys, id).is_some() {
            Ok(())
        } else {
            Err(SolverError::UnknownChoice {
                field: format!("recipe.method.{field}"),
                kind: "form".into(),
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
            limits::TITRANT_M.check(*titrant_m).map_err(rp)?;
        }
        Method::TwoStocks {
            acid_form,
            acid_stock_m,
            base_form,
            base_stock_m,
        } => {
            form_ok("acid_form", acid_form)?;
            form_ok("base_form", base_form)?;
            limits::ACID_STOCK_M.check(*acid_stock_m).map_err(rp)?;
            limits::BASE_STOCK_M.check(*base_stock_m).map_err(rp)?;
        }
    }
    // Mixture.
    let mp = |e| prefixed("mixture", e);
    limits::MIXTURE_TEMPERATURE_C
        .check(d.mixture.temperature_c)
        .map_err(mp)?;
    for (i, c) in d.mixture.components.iter().enumerate() {
        let s = lookup(&c.system, custom)?;
        limits::COMPONENT_CONC_M
            .check_as(&format!("components[{i}].conc_m"), c.conc_m)
            .map_err(mp)?;
        if let Some(f) = &c.form {
            if find_form(s, f).is_none() {
                return Err(SolverError::UnknownChoice {
                    field: format!("mixture.components[{i}].form"),
                    kind: "form".into(),
                    name: f.clone(),
                });
            }
        }
    }
    for (i, a) in d.mixture.additives.iter().enumerate() {
        limits::ADDITIVE_CONC_M
            .check_as(&format!("additives[{i}].conc_m"), a.conc_m)
            .map_err(mp)?;
    }
    let wp = |e| prefixed("what_if", e);
    let w = &d.what_if;
    limits::DILUTION_FACTOR
        .check(w.dilution_factor)
        .map_err(wp)?;
    limits::ADD_ACID_M.check(w.add_acid_m).map_err(wp)?;
    limits::ADD_BASE_M.check(w.add_base_m).map_err(wp)?;
    limits::WHAT_IF_TEMPERATURE_C
        .check(w.temperature_c)
        .map_err(wp)?;
    // Field.
    // Field: system, pH, temperature, total, ionic source, alkalinity, limit.
    let fp = |e| prefixed("field", e);
    crate::field::validate_field(&d.field, custom).map_err(fp)?;
    super::gas::validate_design_gas(&d.recipe, &d.mixture, &d.what_if, &d.field, custom)?;
    d.uncertainty.validate()?;
    if let Some(c) = &d.calibration {
        crate::meter::calibration::validate_spec(c)?;
    }
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

#[cfg(test)]
mod tests {
    use super::*;
    use crate::document::report::demo_design;

    #[test]
    fn future_and_missing_schema_are_refused() {
        let j = to_json(&demo_design());
        let now = format!("\"schema\":{SCHEMA_VERSION}");
        let future = j.replace(&now, "\"schema\":99");
        assert_ne!(future, j);
        let e = parse_design(&future).unwrap_err().to_string();
        assert!(e.starts_with("schema"), "{e}");
        let missing = j.replace(&format!("{now},"), "");
        assert_ne!(missing, j);
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
