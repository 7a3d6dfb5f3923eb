//! Recovery: everything kept aside (set-aside work, drafts of closed tabs, entries that could not be read) as one list, and read errors in plain words.

use super::drafts::{closed_drafts, list_set_aside, parse_stored, StoredDraft};
use super::index::{EntryKind, Quarantined, QUARANTINE_PREFIX};
use super::kv::{KvStore, StoreError};
use solver::document::parse_design;
use solver::error::SolverError;

fn between(text: &str, open: char, close: char) -> Option<&str> {
    let start = text.find(open)? + open.len_utf8();
    let len = text.get(start..)?.find(close)?;
    text.get(start..start + len)
}

fn where_in(field: &str) -> String {
    let f = field.trim_matches('.');
    if f.is_empty() || f == "document" {
        String::new()
    } else {
        format!(" in {}", plain_place(f))
    }
}

/// A document path (`recipe.salts[1].conc_m`) as the page names the place: the
/// workspace, then the field or row (`the Recipe's salt row 2, amount`).
pub fn plain_place(path: &str) -> String {
    let mut parts = Vec::new();
    for seg in path.split('.') {
        let (key, index) = match seg.split_once('[') {
            Some((k, rest)) => (k, rest.trim_end_matches(']').parse::<usize>().ok()),
            None => (seg, None),
        };
        let word = match key {
            "recipe" => "the Recipe",
            "mixture" => "the Flask",
            "what_if" => "the Flask's what-if",
            "field" => "the Field reading",
            "custom_systems" => "your own reagent",
            "custom_forms" => "your added form",
            "uncertainty" => "the ± figures",
            "name" => "the design's name",
            "salts" => "salt row",
            "components" => "component row",
            "additives" => "acid or base row",
            "forms" => "form",
            "steps" => "step",
            "target_ph" => "target pH",
            "ph" => "pH",
            "temperature_c" => "temperature",
            "prepare_temperature_c" => "preparation temperature",
            "total_conc_m" => "total concentration",
            "volume_l" => "volume",
            "tolerance_ph" => "pH tolerance",
            "concentrate_factor" => "concentrate factor",
            "conc_m" => "amount",
            "additive" => "salt",
            "method" => "method",
            "titrant_m" => "titrant concentration",
            "acid_stock_m" | "base_stock_m" => "stock concentration",
            "total" => "total",
            "total_unit" => "unit of the total",
            "limit" => "limit",
            "alkalinity" => "alkalinity",
            "counter_ions" => "counter-ions",
            "formula" => "formula",
            "reagent" => "the reagent",
            "pk25" => "pK at 25 °C",
            "dh_kj" => "ΔrH°",
            "dcp_j" => "ΔrCp°",
            "t_min_c" => "lowest temperature",
            "t_max_c" => "highest temperature",
            "bufferwright_reagent" => "the file's version",
            // A key this page does not know stays as written (the user looks for it).
            other => other,
        };
        let word = word.to_string();
        parts.push(match index {
            Some(i) => format!("{word} {}", i + 1),
            None => word,
        });
    }
    parts.join(", ")
}

/// A serde message (`missing field \`name\` at line 1 column 9`) in plain words.
fn plain_serde(msg: &str, field: &str) -> String {
    let at = where_in(field);
    if msg.contains("EOF while parsing") || msg.contains("unexpected end") {
        return "the text is cut short: it ends in the middle".into();
    }
    if msg.starts_with("missing field") {
        let name = between(msg, '`', '`').unwrap_or("a value");
        return format!("a part is missing: “{name}”{at}");
    }
    if msg.starts_with("unknown field") {
        let name = between(msg, '`', '`').unwrap_or("?");
        return format!("it holds an entry “{name}”{at} that this page does not know");
    }
    if msg.starts_with("unknown variant") {
        let name = between(msg, '`', '`').unwrap_or("?");
        return format!("the value “{name}”{at} is not one this page knows");
    }
    if msg.starts_with("invalid type") {
        let want = msg
            .split("expected ")
            .nth(1)
            .map(|w| w.split(" at line").next().unwrap_or(w))
            .unwrap_or("another kind");
        let want = match want {
            w if w.starts_with('f') || w.starts_with('u') || w.starts_with('i') => "a number",
            w if w.contains("string") => "text",
            w if w.contains("sequence") => "a list",
            w if w.contains("bool") => "yes or no",
            _ => "another kind of value",
        };
        return format!("a value{at} has the wrong kind (it should be {want})");
    }
    if msg.starts_with("expected") || msg.contains("key must be") || msg.contains("trailing") {
        return "the text is not readable as a design (it is not well-formed JSON)".into();
    }
    if msg.starts_with("invalid value") || msg.starts_with("invalid length") {
        return format!("a value{at} is not usable");
    }
    format!("it cannot be read{at}")
}

/// A JSON reading error in plain words.
pub fn plain_json_reason(e: &serde_json::Error) -> String {
    if e.is_eof() {
        return "the text is cut short: it ends in the middle".into();
    }
    plain_serde(&e.to_string(), "")
}

/// Why a design could not be used, in plain words (field paths kept where a
/// value is refused, so the user can find it).
pub fn plain_reason(e: &SolverError) -> String {
    match e {
        SolverError::Document { field, reason } => {
            if field == "document" {
                if reason.contains("EOF while parsing") {
                    "the text is cut short: it ends in the middle".into()
                } else if reason.starts_with("not valid JSON") {
                    "the text is not readable as a design (it is not well-formed JSON)".into()
                } else if reason.contains("schema") {
                    reason.clone()
                } else {
                    plain_serde(reason, "")
                }
            } else if reason.starts_with("unknown field") {
                // The field already ends with the unknown key.
                format!(
                    "{}: an entry this page does not know (unknown field: check the spelling)",
                    plain_place(field)
                )
            } else if reason.contains('`') || reason.starts_with("invalid") {
                plain_serde(reason, field)
            } else {
                format!("{}: {reason}", plain_place(field))
            }
        }
        other => match other.field() {
            Some(field) => {
                let text = other.to_string();
                let reason = text
                    .strip_prefix(field)
                    .map_or(text.as_str(), |r| r.trim_start_matches([':', ' ']));
                format!("{}: {reason}", plain_place(field))
            }
            None => other.to_string(),
        },
    }
}

/// What a recovery item is.
#[derive(Debug, Clone, PartialEq)]
pub enum RecoveryKind {
    /// Work set aside when a share link (or a restore) replaced it.
    SetAside,
    /// The draft of a tab that was closed.
    ClosedTab,
    /// An entry that could not be read, kept as it was.
    Damaged(EntryKind),
}

/// One line of the Recovery section.
#[derive(Debug, Clone, PartialEq)]
pub struct RecoveryItem {
    /// Storage key.
    pub key: String,
    /// What it is.
    pub kind: RecoveryKind,
    /// Design name, or a description for damaged entries.
    pub title: String,
    /// What happened / what is wrong, in plain words.
    pub detail: String,
    /// When (ms; 0 when unknown).
    pub when_ms: f64,
    /// It can be opened (damaged entries only when they read now).
    pub can_open: bool,
}

/// Name of a design in a damaged entry, when the text still shows it (even cut short).
fn name_hint(raw: &str) -> Option<String> {
    if let Ok(v) = serde_json::from_str::<serde_json::Value>(raw) {
        let name = v
            .get("name")
            .or_else(|| v.get("design").and_then(|d| d.get("name")))
            .and_then(serde_json::Value::as_str);
        return name.map(|n| n.chars().take(60).collect());
    }
    let at = raw.find("\"name\":\"")? + 8;
    let rest = raw.get(at..)?;
    let name: String = rest.chars().take_while(|c| *c != '"').take(60).collect();
    (!name.is_empty()).then_some(name)
}

/// Why a damaged entry cannot be read (read again now, in plain words), and
/// whether it reads now.
pub fn damaged_reason(kind: EntryKind, raw: &str) -> (String, bool) {
    match kind {
        EntryKind::Index => (
            "the list of saved designs was unreadable; it was rebuilt from the designs, so nothing is missing"
                .into(),
            false,
        ),
        EntryKind::Saved => match parse_design(raw) {
            Ok(_) => ("it reads correctly now".into(), true),
            Err(e) => (plain_reason(&e), false),
        },
        EntryKind::Draft | EntryKind::SetAside => match parse_stored(raw) {
            Ok(_) => ("it reads correctly now".into(), true),
            Err(e) => (e, false),
        },
    }
}

/// Everything kept aside, for the Recovery section: set-aside work (newest
/// first), drafts of closed tabs, then damaged entries. `repair` moves
/// unreadable drafts and set-aside entries to quarantine (returned, to report once).
///
/// # Errors
/// Storage errors.
pub fn list_recovery(
    kv: &mut dyn KvStore,
    own_tab: &str,
    now_ms: f64,
    repair: bool,
) -> Result<(Vec<RecoveryItem>, Vec<Quarantined>), StoreError> {
    let mut items = Vec::new();
    let (aside, mut bad) = list_set_aside(kv, now_ms, repair)?;
    for s in aside {
        let why = if s.stored.why.is_empty() {
            "set aside".to_string()
        } else {
            s.stored.why.clone()
        };
        items.push(item(s.key, RecoveryKind::SetAside, &s.stored, why));
    }
    let (closed, bad2) = closed_drafts(kv, own_tab, now_ms, repair)?;
    bad.extend(bad2);
    for c in closed {
        let what = if c.stored.draft.open_id.is_some() {
            "unsaved changes left in a tab that was closed"
        } else {
            "unsaved work left in a tab that was closed"
        };
        items.push(item(c.key, RecoveryKind::ClosedTab, &c.stored, what.into()));
    }
    let mut damaged: Vec<String> = kv
        .keys()?
        .into_iter()
        .filter(|k| k.starts_with(QUARANTINE_PREFIX))
        .collect();
    solver::order::sort_by(&mut damaged, Ord::cmp);
    for key in damaged {
        let id = key.trim_start_matches(QUARANTINE_PREFIX);
        let kind = EntryKind::of_quarantine_id(id);
        let raw = kv.get(&key)?.unwrap_or_default();
        let (why, can_open) = damaged_reason(kind, &raw);
        let title = match name_hint(&raw) {
            Some(n) => format!("A damaged {}: “{n}”", kind.noun()),
            None => format!("A damaged {}", kind.noun()),
        };
        items.push(RecoveryItem {
            key,
            kind: RecoveryKind::Damaged(kind),
            title,
            detail: format!("It could not be read: {why}."),
            when_ms: 0.0,
            can_open,
        });
    }
    Ok((items, bad))
}

fn item(key: String, kind: RecoveryKind, s: &StoredDraft, why: String) -> RecoveryItem {
    RecoveryItem {
        key,
        kind,
        title: s.draft.design.name.clone(),
        detail: why,
        when_ms: s.set_aside_ms.unwrap_or(s.updated_ms),
        can_open: true,
    }
}

#[cfg(test)]
mod tests {
    use super::super::drafts::{
        draft_key, set_aside, stored_text, Draft, StoredDraft, SET_ASIDE_PREFIX,
    };
    use super::super::index::{design_key, quarantine_key, scan};
    use super::super::testkit::{named, saved};
    use super::*;
    use crate::designs::kv::MemStore;

    fn work(name: &str) -> Draft {
        Draft {
            design: named(name, 6.0),
            open_id: None,
            base_saved_at_ms: 0.0,
            dirty: true,
        }
    }

    #[test]
    fn read_errors_are_in_plain_words() {
        let e = parse_design(r#"{"schema":1}"#).unwrap_err();
        let r = plain_reason(&e);
        assert!(!r.contains('`') && !r.starts_with('.'), "{r}");
        assert!(r.contains("missing"), "{r}");
        let r = plain_reason(&parse_design(r#"{"schema":1,"name":"Sec"#).unwrap_err());
        assert_eq!(r, "the text is cut short: it ends in the middle");
        let r = plain_reason(&parse_design("nonsense").unwrap_err());
        assert!(r.contains("not well-formed"), "{r}");
        let mut v: serde_json::Value =
            serde_json::from_str(&solver::document::to_json(&named("A", 7.0))).unwrap();
        v["recipe"]["target_ph"] = serde_json::json!("seven");
        let r = plain_reason(&parse_design(&v.to_string()).unwrap_err());
        assert!(
            r.contains("the Recipe, target pH") && r.contains("a number"),
            "{r}"
        );
        v["recipe"]["target_ph"] = serde_json::json!(99.0);
        let r = plain_reason(&parse_design(&v.to_string()).unwrap_err());
        assert!(
            r.contains("the Recipe, target pH") && !r.contains("recipe."),
            "{r}"
        );
        assert_eq!(
            plain_place("recipe.salts[1].conc_m"),
            "the Recipe, salt row 2, amount"
        );
        let e = serde_json::from_str::<serde_json::Value>("[1,").unwrap_err();
        assert_eq!(
            plain_json_reason(&e),
            "the text is cut short: it ends in the middle"
        );
    }

    #[test]
    fn recovery_lists_set_aside_closed_tabs_and_damaged_entries_in_plain_words() {
        let mut kv = MemStore::default();
        set_aside(
            &mut kv,
            &work("Original"),
            "replaced by a share link",
            1000.0,
        )
        .unwrap();
        let _ = kv.set(
            &draft_key("tclosed"),
            &stored_text(&StoredDraft::new(work("Closed tab work"), 900.0)),
        );
        let (a, _) = saved(&mut kv, &named("Alpha", 7.0), 500.0);
        kv.map
            .insert(design_key(&a), r#"{"schema":1,"name":"Sec"#.into());
        kv.map.insert(draft_key("tbroken"), "{oops".into());
        let s = scan(&mut kv, true, 1100.0).unwrap();
        assert_eq!(s.quarantined.len(), 1);
        let (items, bad) = list_recovery(&mut kv, "tme", 1200.0, true).unwrap();
        assert_eq!(bad.len(), 1, "the broken draft is reported once");
        assert_eq!(bad[0].kind, EntryKind::Draft);
        let kinds: Vec<_> = items.iter().map(|i| i.kind.clone()).collect();
        assert_eq!(
            kinds,
            vec![
                RecoveryKind::SetAside,
                RecoveryKind::ClosedTab,
                RecoveryKind::Damaged(EntryKind::Draft),
                RecoveryKind::Damaged(EntryKind::Saved),
            ]
        );
        assert_eq!(items[0].title, "Original");
        assert!(items[0].key.starts_with(SET_ASIDE_PREFIX));
        assert_eq!(items[1].title, "Closed tab work");
        let saved_item = &items[3];
        assert_eq!(saved_item.key, quarantine_key(&a));
        assert!(saved_item.title.contains("saved design") && saved_item.title.contains("Sec"));
        assert!(
            saved_item.detail.contains("cut short"),
            "{}",
            saved_item.detail
        );
        assert!(!saved_item.can_open);
        assert!(items[2].title.contains("draft"), "{}", items[2].title);
        for i in &items {
            assert!(!i.detail.contains('`'), "{}", i.detail);
        }
    }
}
