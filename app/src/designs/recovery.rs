//! Recovery: everything kept aside (set-aside work, drafts of closed tabs, entries that could not be read) as one list.

use super::drafts::{closed_drafts, list_set_aside, parse_stored, StoredDraft};
use super::index::{EntryKind, Quarantined, QUARANTINE_PREFIX};
use super::kv::{KvStore, StoreError};
use super::reasons::plain_reason;
use solver::document::parse_design;

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
    use super::super::reasons::{plain_json_reason, plain_place};
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
