//! Reading back what can be read: a design document refused whole is taken apart by
//! workspace, each part the reader accepts is kept (over the demo design), and each part it
//! refuses is named with the reason, so one unreadable workspace does not cost the others.

use super::design::{migrate, parse_design_value, Design};
use super::report::demo_design;
use crate::error::SolverError;
use serde_json::{Map, Value};

/// The parts a document is taken apart into, in the order they are tried (the user's own
/// systems first: the workspaces may use them), each with the page's name for it and its
/// top-level keys.
pub const PARTS: &[(&str, &[&str])] = &[
    ("the design's name", &["name", "saved_at_ms", "workspace"]),
    ("your own reagents", &["custom_systems", "custom_forms"]),
    ("Recipe", &["recipe"]),
    ("Flask", &["mixture", "what_if"]),
    ("Field reading", &["field"]),
    ("Species & capacity", &["plot_source"]),
    ("the ± figures", &["uncertainty"]),
];

/// One part the reader refused.
#[derive(Debug, Clone, PartialEq)]
pub struct RefusedPart {
    /// The page's name for the part (`Recipe`, `Field reading`).
    pub part: &'static str,
    /// Why the reader refused it.
    pub error: SolverError,
}

/// A design rebuilt from the readable parts of a refused document.
#[derive(Debug, Clone, PartialEq)]
pub struct Salvaged {
    /// The design: the document's readable parts, the demo's in place of the others.
    pub design: Design,
    /// The parts left out, with the reasons.
    pub refused: Vec<RefusedPart>,
}

/// Take a refused design document apart by workspace and keep what reads ([`PARTS`], in
/// order: each part of the document replaces the demo's when the whole still reads).
/// `None` when the text is no design document at all (not JSON, not an object, an
/// unsupported schema), or when no part could be kept.
///
/// # Example
///
/// ```
/// use solver::document::{demo_design, to_json};
/// use solver::document::salvage::salvage_design;
/// let mut d = demo_design();
/// d.field.ph = 6.5;
/// let text = to_json(&d).replace("\"target_ph\":7.4", "\"target_ph\":15.0");
/// let s = salvage_design(&text).ok_or(solver::SolverError::Unknown { kind: "design".into(), name: "x".into() })?;
/// assert_eq!(s.design.field.ph, 6.5);
/// assert_eq!(s.design.recipe, demo_design().recipe);
/// assert_eq!(s.refused[0].part, "Recipe");
/// # Ok::<(), solver::SolverError>(())
/// ```
pub fn salvage_design(text: &str) -> Option<Salvaged> {
    let value: Value = serde_json::from_str(text).ok()?;
    let Value::Object(doc) = migrate(value).ok()? else {
        return None;
    };
    let Value::Object(mut current) = serde_json::to_value(demo_design()).ok()? else {
        return None;
    };
    let mut refused = Vec::new();
    let mut kept = 0usize;
    for (part, keys) in PARTS {
        if !keys.iter().any(|k| doc.contains_key(*k)) {
            continue;
        }
        let mut candidate: Map<String, Value> = current.clone();
        for key in *keys {
            match doc.get(*key) {
                Some(v) => candidate.insert((*key).to_string(), v.clone()),
                None => candidate.remove(*key),
            };
        }
        if candidate == current {
            continue;
        }
        match parse_design_value(Value::Object(candidate.clone())) {
            Ok(_) => {
                current = candidate;
                kept += 1;
            }
            Err(error) => refused.push(RefusedPart { part, error }),
        }
    }
    if kept == 0 {
        return None;
    }
    let design = parse_design_value(Value::Object(current)).ok()?;
    Some(Salvaged { design, refused })
}
