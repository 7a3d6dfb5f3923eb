//! Design documents: what the user entered, versioned, validated field by field.
//!
//! The same type is saved by the page, exported to files, carried in share
//! links and read by the command-line entry. [`parse_design`] migrates older
//! schema versions, then checks every field and names the first bad one.

use crate::document::reagent::{
    reroot, systems_with_forms, validate_custom_forms, validate_user_system,
};
use crate::error::{clip, in_range, shorten_quoted, Result, SolverError, QUOTE_MAX};
use crate::field::FieldSpec;
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
/// (`solver/tests/data/schema1/`, `solver/tests/migration.rs`).
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
        .map_err(|e| serde_err(&e.path(), &e.message))?;
    let back = serde_json::to_value(&design).unwrap_or(serde_json::Value::Null);
    if let Some(field) = extra_tagged_key(&value, &back, "") {
        return Err(doc_err(
            &field,
            "unknown field (this kind takes no such key; check the spelling)",
        ));
    }
    validate_design(&design)?;
    Ok(design)
}

/// A serde error as a field-named [`SolverError::Document`]: an unknown key
/// joins the path (`recipe.prepare_temprature_c: unknown field ...`), and a
/// quoted bad value is cut short.
pub(crate) fn serde_err(path: &str, msg: &str) -> SolverError {
    if let Some((key, expected)) = msg
        .strip_prefix("unknown field `")
        .and_then(|rest| rest.split_once('`'))
    {
        // The path may already end with the key (plain structs) or stop at
        // the enclosing object (internally tagged enums).
        let parent = path
            .strip_suffix(key)
            .map(|p| p.trim_end_matches('.'))
            .unwrap_or(path);
        let key = clip(key, QUOTE_MAX);
        let field = if parent.is_empty() || parent == "." {
            key
        } else {
            format!("{parent}.{key}")
        };
        let expected = expected.trim_start_matches([',', ' ']);
        let reason = if expected.is_empty() {
            "unknown field (check the spelling)".to_string()
        } else {
            format!("unknown field ({expected}; check the spelling)")
        };
        return doc_err(&field, reason);
    }
    doc_err(path, shorten_quoted(msg))
}

/// A key of an internally tagged object (one with a `kind`) that the parsed
/// design does not carry. Serde's `deny_unknown_fields` does not reach the
/// unit variants of such enums (`{"kind": "zero", "us_cm": 3}` would pass),
/// so the document is compared with the design read from it.
pub(crate) fn extra_tagged_key(
    input: &serde_json::Value,
    parsed: &serde_json::Value,
    path: &str,
) -> Option<String> {
    use serde_json::Value;
    let join = |key: &str| {
        if path.is_empty() {
            clip(key, QUOTE_MAX)
        } else {
            format!("{path}.{}", clip(key, QUOTE_MAX))
        }
    };
    match (input, parsed) {
        (Value::Object(a), Value::Object(b)) => {
            if a.contains_key("kind") {
                if let Some(k) = a.keys().find(|k| !b.contains_key(k.as_str())) {
                    return Some(join(k));
                }
            }
            a.iter()
                .find_map(|(k, va)| b.get(k).and_then(|vb| extra_tagged_key(va, vb, &join(k))))
        }
        (Value::Array(a), Value::Array(b)) => a
            .iter()
            .zip(b)
            .enumerate()
            .find_map(|(i, (va, vb))| extra_tagged_key(va, vb, &format!("{path}[{i}]"))),
        _ => None,
    }
}

fn prefixed(prefix: &str, e: SolverError) -> SolverError {
    crate::document::reagent::map_field(e, |f| format!("{prefix}.{f}"))
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
        validate_user_system(s)
            .map_err(|e| reroot(e, "system", &format!("custom_systems[{i}]")))?;
    }
    validate_custom_forms(&d.custom_forms, &d.custom_systems)?;
    let systems = d.systems();
    let custom = &systems;
    // Recipe.
    let r = &d.recipe;
    let rp = |e| prefixed("recipe", e);
    let sys = lookup(&r.system, custom)?;
    in_range("target_ph", r.target_ph, 0.0, 14.0).map_err(rp)?;
    in_range("temperature_c", r.temperature_c, 0.0, 60.0).map_err(rp)?;
    in_range("total_conc_m", r.total_conc_m, 0.0, 5.0).map_err(rp)?;
    in_range("volume_l", r.volume_l, 0.0, 1000.0).map_err(rp)?;
    in_range("tolerance_ph", r.tolerance_ph, 0.0, 2.0).map_err(rp)?;
    // The preparation temperature is checked against the system's data range by the
    // recipe (as the working temperature is), not here: a design whose system changed
    // under it still opens, and the recipe says why beside the field.
    if let Some(t) = r.prepare_temperature_c {
        in_range("prepare_temperature_c", t, 0.0, 60.0).map_err(rp)?;
    }
    in_range(
        "concentrate_factor",
        r.concentrate_factor,
        1.0,
        crate::recipe::CONCENTRATE_FACTOR_MAX,
    )
    .map_err(rp)?;
    for (i, s) in r.salts.iter().enumerate() {
        in_range(&format!("salts[{i}].conc_m"), s.conc_m, 0.0, 5.0).map_err(rp)?;
    }
    crate::recipe::validate_salts(&r.salts).map_err(rp)?;
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
    // Field: system, pH, temperature, total, ionic source, alkalinity, limit.
    let fp = |e| prefixed("field", e);
    crate::field::validate_field(&d.field, custom).map_err(fp)?;
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

#[cfg(test)]
#[allow(clippy::unwrap_used, clippy::expect_used, clippy::indexing_slicing)]
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
