//! One set of rules for what the page keeps: the solver's own document reader judges the working design before it is kept, saved, exported or shared; what it refuses stays on screen (its message beside the field, from the workspace's own computation) and is never stored; a draft the reader refuses is taken apart by workspace on reload, so one unreadable part does not cost the others.

use super::drafts::{parse_stored, StoredDraft};
use super::reasons::plain_reason;
use solver::document::salvage::{salvage_design, RefusedPart};
use solver::document::{parse_design, to_json, Design};

/// Why the reader would refuse `d` as stored (in plain words), or `None` when it reads back.
/// The same text the page writes is read by the same function every later read uses.
pub fn document_problem(d: &Design) -> Option<String> {
    parse_design(&to_json(d)).err().map(|e| plain_reason(&e))
}

/// What the page says when it will not store the working design.
pub fn refusal(action: &str, why: &str) -> String {
    format!("Not {action}: {why}. Correct it first; what is on screen could not be opened again.")
}

/// A stored draft whose design the reader refuses, rebuilt from its readable workspaces
/// (the demo's in place of the refused ones), with the refused parts. `None` when the
/// record is no draft or nothing of it can be kept.
pub fn salvage_stored(raw: &str) -> Option<(StoredDraft, Vec<RefusedPart>)> {
    let mut v: serde_json::Value = serde_json::from_str(raw).ok()?;
    let design = v.get("design")?.to_string();
    let s = salvage_design(&design)?;
    let obj = v.as_object_mut()?;
    obj.insert("design".into(), serde_json::to_value(&s.design).ok()?);
    let stored = parse_stored(&v.to_string()).ok()?;
    Some((stored, s.refused))
}

/// The notice for a draft brought back in part.
pub fn salvage_notice(refused: &[RefusedPart]) -> String {
    let parts: Vec<String> = refused
        .iter()
        .map(|r| format!("{} ({})", r.part, plain_reason(&r.error)))
        .collect();
    let names: Vec<&str> = refused.iter().map(|r| r.part).collect();
    format!(
        "Part of your unsaved work could not be read back: {}. {} now {} the example's values \
         instead; everything else is as you left it. The unreadable copy is kept whole under \
         Recovery.",
        parts.join("; "),
        names.join(" and "),
        if names.len() == 1 { "shows" } else { "show" }
    )
}

#[cfg(test)]
#[allow(clippy::unwrap_used, clippy::indexing_slicing)]
mod tests {
    use super::super::drafts::{stored_text, Draft};
    use super::*;
    use solver::document::demo_design;
    use solver::mixture::{Additive, AdditiveSpec};

    #[test]
    fn a_duplicate_salt_is_a_document_problem_in_plain_words() {
        let mut d = demo_design();
        assert_eq!(document_problem(&d), None);
        d.recipe.salts = vec![
            AdditiveSpec {
                additive: Additive::Nacl,
                conc_m: 0.1,
            };
            2
        ];
        let why = document_problem(&d).unwrap();
        assert!(
            why.starts_with("the Recipe, salt row 2: NaCl is listed twice"),
            "{why}"
        );
    }

    #[test]
    fn a_refused_draft_keeps_its_readable_workspaces() {
        let mut d = demo_design();
        d.field.ph = 6.1;
        d.recipe.salts = vec![
            AdditiveSpec {
                additive: Additive::Kcl,
                conc_m: 0.1,
            };
            2
        ];
        let raw = stored_text(&StoredDraft::new(
            Draft {
                design: d.clone(),
                open_id: None,
                base_saved_at_ms: 0.0,
                dirty: true,
            },
            5.0,
        ));
        assert!(parse_stored(&raw).is_err());
        let (s, refused) = salvage_stored(&raw).unwrap();
        assert_eq!(s.draft.design.field.ph, 6.1);
        assert!(s.draft.dirty);
        assert_eq!(refused.len(), 1);
        let n = salvage_notice(&refused);
        assert!(
            n.contains("Recipe (the Recipe, salt row 2: KCl is listed twice"),
            "{n}"
        );
        assert!(!n.contains("bufferwright.") && !n.contains("salts["), "{n}");
    }
}
