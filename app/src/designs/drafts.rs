//! Unsaved work: one autosaved draft per tab, drafts left by closed tabs, and the list of work set aside when something replaced it.
//!
//! Keys (values are JSON text):
//!
//! | key                                | value                                               |
//! |------------------------------------|-----------------------------------------------------|
//! | `bufferwright.tabdraft.<tab>`      | the draft of one tab ([`DraftFile`])                |
//! | `bufferwright.alive.<tab>`         | last sign of life of an open tab (ms), removed on close |
//! | `bufferwright.setaside.<id>`       | work set aside (a draft plus when and why), last ten |
//! | session `bufferwright.tab`         | this tab's id (`t` + base-36 ms, survives reloads)   |
//!
//! Older pages kept one draft for every tab under `bufferwright.draft` and one
//! set-aside draft under `bufferwright.draft.previous`; [`migrate_legacy`]
//! moves them into this scheme.

use super::index::{quarantine, read_design, same_content, to_base36, EntryKind, Quarantined};
use super::kv::{KvStore, StoreError};
use super::reasons::{plain_json_reason, plain_reason};
use serde::{Deserialize, Serialize};
use solver::document::{demo_design, parse_design, Design};

/// Key of the single draft of older pages (migrated on load).
pub const LEGACY_DRAFT_KEY: &str = "bufferwright.draft";
/// Key of the draft older pages set aside for a share link (migrated on load).
pub const LEGACY_PREVIOUS_KEY: &str = "bufferwright.draft.previous";
/// Prefix of the per-tab draft keys.
pub const TAB_DRAFT_PREFIX: &str = "bufferwright.tabdraft.";
/// Prefix of the keys open tabs refresh to show they are open.
pub const ALIVE_PREFIX: &str = "bufferwright.alive.";
/// Prefix of the keys of set-aside work.
pub const SET_ASIDE_PREFIX: &str = "bufferwright.setaside.";
/// Session-storage key of this tab's id.
pub const TAB_ID_KEY: &str = "bufferwright.tab";
/// How many pieces of set-aside work are kept.
pub const MAX_SET_ASIDE: usize = 10;
/// How often an open tab refreshes its sign of life (ms).
pub const ALIVE_EVERY_MS: u64 = 15_000;
/// A sign of life older than this means the tab is gone (ms). Generous: hidden
/// tabs may run timers only once a minute, and a closing tab removes its sign at once.
pub const ALIVE_STALE_MS: f64 = 180_000.0;

/// Key of a tab's draft.
pub fn draft_key(tab: &str) -> String {
    format!("{TAB_DRAFT_PREFIX}{tab}")
}

/// Key of a tab's sign of life.
pub fn alive_key(tab: &str) -> String {
    format!("{ALIVE_PREFIX}{tab}")
}

/// Key of a piece of set-aside work.
pub fn set_aside_key(id: &str) -> String {
    format!("{SET_ASIDE_PREFIX}{id}")
}

/// The autosaved working design and what it was opened from.
#[derive(Debug, Clone, PartialEq)]
pub struct Draft {
    /// Working design.
    pub design: Design,
    /// Saved design it edits (`None`: not saved yet).
    pub open_id: Option<String>,
    /// `saved_at_ms` of the stored version it started from.
    pub base_saved_at_ms: f64,
    /// It differs from that stored version.
    pub dirty: bool,
}

/// Stored form of a draft (also of set-aside work, with `set_aside_ms` and `why`).
#[derive(Debug, Serialize, Deserialize)]
pub struct DraftFile {
    schema: u32,
    #[serde(default)]
    open_id: Option<String>,
    #[serde(default)]
    base_saved_at_ms: f64,
    #[serde(default)]
    dirty: bool,
    /// Opened from a share link and not changed since (the link still holds it).
    #[serde(default, skip_serializing_if = "std::ops::Not::not")]
    from_link: bool,
    /// Last write (ms).
    #[serde(default)]
    updated_ms: f64,
    /// When it was set aside (ms; set-aside work only).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    set_aside_ms: Option<f64>,
    /// Why it was set aside, in plain words.
    #[serde(default, skip_serializing_if = "String::is_empty")]
    why: String,
    design: serde_json::Value,
}

/// A draft as read from storage, with its bookkeeping.
#[derive(Debug, Clone, PartialEq)]
pub struct StoredDraft {
    /// The draft.
    pub draft: Draft,
    /// Opened from a share link and unchanged.
    pub from_link: bool,
    /// Last write (ms).
    pub updated_ms: f64,
    /// When it was set aside (set-aside work only).
    pub set_aside_ms: Option<f64>,
    /// Why it was set aside.
    pub why: String,
}

impl StoredDraft {
    /// A fresh record of `draft` written at `now_ms`.
    pub fn new(draft: Draft, now_ms: f64) -> Self {
        Self {
            draft,
            from_link: false,
            updated_ms: now_ms,
            set_aside_ms: None,
            why: String::new(),
        }
    }
}

/// Text of a draft record.
pub fn stored_text(s: &StoredDraft) -> String {
    let d = &s.draft;
    let file = DraftFile {
        schema: 1,
        open_id: d.open_id.clone(),
        base_saved_at_ms: d.base_saved_at_ms,
        dirty: d.dirty,
        from_link: s.from_link,
        updated_ms: s.updated_ms,
        set_aside_ms: s.set_aside_ms,
        why: s.why.clone(),
        design: serde_json::to_value(&d.design).unwrap_or_default(),
    };
    serde_json::to_string(&file).unwrap_or_default()
}

/// Text of a plain draft record (no bookkeeping).
pub fn draft_text(d: &Draft) -> String {
    stored_text(&StoredDraft::new(d.clone(), 0.0))
}

/// Read a draft record.
///
/// # Errors
/// Why it cannot be used, in plain words.
pub fn parse_stored(text: &str) -> Result<StoredDraft, String> {
    let file: DraftFile = serde_json::from_str(text).map_err(|e| plain_json_reason(&e))?;
    let design = parse_design(&file.design.to_string()).map_err(|e| plain_reason(&e))?;
    Ok(StoredDraft {
        draft: Draft {
            design,
            open_id: file.open_id,
            base_saved_at_ms: file.base_saved_at_ms,
            dirty: file.dirty,
        },
        from_link: file.from_link,
        updated_ms: file.updated_ms,
        set_aside_ms: file.set_aside_ms,
        why: file.why,
    })
}

/// Read a draft record (the draft only).
///
/// # Errors
/// Why it cannot be used.
pub fn parse_draft(text: &str) -> Result<Draft, String> {
    parse_stored(text).map(|s| s.draft)
}

/// Quarantine id used for an unreadable entry under `key`.
fn quarantine_id_of(key: &str) -> String {
    if let Some(tab) = key.strip_prefix(TAB_DRAFT_PREFIX) {
        format!("draft.{tab}")
    } else if let Some(id) = key.strip_prefix(SET_ASIDE_PREFIX) {
        format!("setaside.{id}")
    } else if key == LEGACY_PREVIOUS_KEY {
        "setaside.previous".into()
    } else {
        "draft".into()
    }
}

/// Read the draft record under `key`; an unreadable one is moved to quarantine.
///
/// # Errors
/// Storage errors; `Ok(Err(q))` for a record set aside as unreadable.
pub fn load_stored(
    kv: &mut dyn KvStore,
    key: &str,
    now_ms: f64,
) -> Result<Result<Option<StoredDraft>, Quarantined>, StoreError> {
    let Some(text) = kv.get(key)? else {
        return Ok(Ok(None));
    };
    match parse_stored(&text) {
        Ok(d) => Ok(Ok(Some(d))),
        Err(reason) => {
            let id = quarantine_id_of(key);
            let kind = EntryKind::of_quarantine_id(&id);
            let moved_to = quarantine(kv, &id, &text, key, now_ms);
            Ok(Err(Quarantined {
                id,
                kind,
                moved_to,
                reason,
            }))
        }
    }
}

/// Read the draft under `key` (see [`load_stored`]).
///
/// # Errors
/// Storage errors; `Ok(Err(q))` for a draft set aside as unreadable.
pub fn load_draft(
    kv: &mut dyn KvStore,
    key: &str,
    now_ms: f64,
) -> Result<Result<Option<Draft>, Quarantined>, StoreError> {
    Ok(load_stored(kv, key, now_ms)?.map(|o| o.map(|s| s.draft)))
}

/// Whether a draft holds work found nowhere else: not the untouched demo,
/// not an unchanged saved design that is still stored.
pub fn holds_work(kv: &dyn KvStore, s: &StoredDraft) -> bool {
    let d = &s.draft;
    if s.from_link || same_content(&d.design, &demo_design()) {
        return false;
    }
    match &d.open_id {
        None => true,
        Some(id) => d.dirty || read_design(kv, id).is_err(),
    }
}

/// Whether a draft about to be replaced by `incoming` holds work worth keeping.
pub fn draft_worth_keeping(draft: &Draft, incoming: &Design) -> bool {
    (draft.open_id.is_none() || draft.dirty)
        && !same_content(&draft.design, incoming)
        && !same_content(&draft.design, &demo_design())
}

// ---------------------------------------------------------------------------
// Tabs
// ---------------------------------------------------------------------------

fn valid_tab_id(id: &str) -> bool {
    id.len() > 1
        && id.len() < 40
        && id.starts_with('t')
        && id
            .chars()
            .all(|c| c.is_ascii_lowercase() || c.is_ascii_digit() || c == '-')
}

/// Whether the tab `tab` showed a sign of life within [`ALIVE_STALE_MS`].
pub fn tab_alive(kv: &dyn KvStore, tab: &str, now_ms: f64) -> bool {
    kv.get(&alive_key(tab))
        .ok()
        .flatten()
        .and_then(|v| v.parse::<f64>().ok())
        .is_some_and(|t| now_ms - t < ALIVE_STALE_MS)
}

/// A tab id nobody uses: `t` + base-36 ms, with a counter if taken.
pub fn new_tab_id(kv: &dyn KvStore, now_ms: f64) -> String {
    let base = format!("t{}", to_base36(now_ms.max(0.0) as u64));
    let free = |id: &str| {
        matches!(kv.get(&draft_key(id)), Ok(None)) && matches!(kv.get(&alive_key(id)), Ok(None))
    };
    if free(&base) {
        return base;
    }
    (2..10_000u32)
        .map(|n| format!("{base}-{n}"))
        .find(|id| free(id))
        .unwrap_or_else(|| format!("{base}-x"))
}

/// This tab's id: the one kept in session storage (a reload keeps its draft),
/// unless another open tab holds it (a duplicated tab copies session
/// storage), then a new one.
pub fn choose_tab_id(session_id: Option<&str>, kv: &dyn KvStore, now_ms: f64) -> String {
    match session_id {
        Some(id) if valid_tab_id(id) && !tab_alive(kv, id, now_ms) => id.to_string(),
        _ => new_tab_id(kv, now_ms),
    }
}

/// Record that `tab` is open.
///
/// # Errors
/// Storage errors.
pub fn mark_alive(kv: &mut dyn KvStore, tab: &str, now_ms: f64) -> Result<(), StoreError> {
    kv.set(&alive_key(tab), &format!("{}", now_ms.max(0.0) as u64))
}

/// Record that `tab` was closed (its draft stays, for recovery).
pub fn mark_closed(kv: &mut dyn KvStore, tab: &str) {
    let _ = kv.remove(&alive_key(tab));
}

/// A draft left by a tab that is no longer open.
#[derive(Debug, Clone, PartialEq)]
pub struct ClosedDraft {
    /// Storage key.
    pub key: String,
    /// The draft.
    pub stored: StoredDraft,
}

/// Drafts of closed tabs that hold work, newest first. Drafts of closed tabs
/// without work (the demo, an unchanged saved design) are removed; with
/// `repair`, unreadable ones are moved to quarantine.
///
/// # Errors
/// Storage errors.
pub fn closed_drafts(
    kv: &mut dyn KvStore,
    own_tab: &str,
    now_ms: f64,
    repair: bool,
) -> Result<(Vec<ClosedDraft>, Vec<Quarantined>), StoreError> {
    let mut out = Vec::new();
    let mut bad = Vec::new();
    let keys = kv.keys()?;
    for key in keys {
        let Some(tab) = key.strip_prefix(TAB_DRAFT_PREFIX) else {
            continue;
        };
        if tab == own_tab || tab_alive(kv, tab, now_ms) {
            continue;
        }
        let read = if repair {
            load_stored(kv, &key, now_ms)?
        } else {
            Ok(kv.get(&key)?.and_then(|t| parse_stored(&t).ok()))
        };
        match read {
            Ok(Some(stored)) => {
                if holds_work(kv, &stored) {
                    out.push(ClosedDraft { key, stored });
                } else if repair {
                    let _ = kv.remove(&key);
                }
            }
            Ok(None) => {}
            Err(q) => bad.push(q),
        }
    }
    solver::order::sort_by(&mut out, |a, b| {
        b.stored.updated_ms.total_cmp(&a.stored.updated_ms)
    });
    Ok((out, bad))
}

// ---------------------------------------------------------------------------
// Set-aside work
// ---------------------------------------------------------------------------

/// A piece of set-aside work.
#[derive(Debug, Clone, PartialEq)]
pub struct SetAside {
    /// Storage key.
    pub key: String,
    /// The work, with when and why it was set aside.
    pub stored: StoredDraft,
}

/// Set `draft` aside (newest first, the last [`MAX_SET_ASIDE`] kept). Returns its key.
///
/// # Errors
/// Storage errors (full storage): nothing written then.
pub fn set_aside(
    kv: &mut dyn KvStore,
    draft: &Draft,
    why: &str,
    now_ms: f64,
) -> Result<String, StoreError> {
    let base = format!("s{}", to_base36(now_ms.max(0.0) as u64));
    let free = |id: &str| matches!(kv.get(&set_aside_key(id)), Ok(None));
    let id = if free(&base) {
        base
    } else {
        (2..10_000u32)
            .map(|n| format!("{base}-{n}"))
            .find(|id| free(id))
            .unwrap_or_else(|| format!("{base}-x"))
    };
    let key = set_aside_key(&id);
    let stored = StoredDraft {
        draft: draft.clone(),
        from_link: false,
        updated_ms: now_ms,
        set_aside_ms: Some(now_ms),
        why: why.to_string(),
    };
    kv.set(&key, &stored_text(&stored))?;
    // Keep the last ten.
    let mut all: Vec<(f64, String)> = kv
        .keys()?
        .into_iter()
        .filter(|k| k.starts_with(SET_ASIDE_PREFIX))
        .map(|k| {
            let t = kv
                .get(&k)
                .ok()
                .flatten()
                .and_then(|t| parse_stored(&t).ok())
                .and_then(|s| s.set_aside_ms)
                .unwrap_or(f64::INFINITY); // unreadable: never pruned here
            (t, k)
        })
        .collect();
    solver::order::sort_by(&mut all, |a, b| {
        b.0.total_cmp(&a.0).then_with(|| b.1.cmp(&a.1))
    });
    for (_, k) in all.into_iter().skip(MAX_SET_ASIDE) {
        if k != key {
            let _ = kv.remove(&k);
        }
    }
    Ok(key)
}

/// Every piece of set-aside work, newest first; with `repair` unreadable ones
/// are moved to quarantine.
///
/// # Errors
/// Storage errors.
pub fn list_set_aside(
    kv: &mut dyn KvStore,
    now_ms: f64,
    repair: bool,
) -> Result<(Vec<SetAside>, Vec<Quarantined>), StoreError> {
    let mut out = Vec::new();
    let mut bad = Vec::new();
    for key in kv.keys()? {
        if !key.starts_with(SET_ASIDE_PREFIX) {
            continue;
        }
        let read = if repair {
            load_stored(kv, &key, now_ms)?
        } else {
            Ok(kv.get(&key)?.and_then(|t| parse_stored(&t).ok()))
        };
        match read {
            Ok(Some(stored)) => out.push(SetAside { key, stored }),
            Ok(None) => {}
            Err(q) => bad.push(q),
        }
    }
    solver::order::sort_by(&mut out, |a, b| {
        b.stored
            .set_aside_ms
            .unwrap_or(0.0)
            .total_cmp(&a.stored.set_aside_ms.unwrap_or(0.0))
            .then_with(|| b.key.cmp(&a.key))
    });
    Ok((out, bad))
}

/// Move the keys of older pages into this scheme (safe to run on every load):
/// `bufferwright.draft` becomes the draft of a closed tab, `bufferwright.draft.previous`
/// becomes set-aside work. A key is removed only after its copy is written.
/// Returns how many keys were moved.
///
/// # Errors
/// Storage errors (the old keys then stay where they are).
pub fn migrate_legacy(kv: &mut dyn KvStore, now_ms: f64) -> Result<usize, StoreError> {
    let mut moved = 0;
    if let Some(text) = kv.get(LEGACY_DRAFT_KEY)? {
        let tab = format!("t{}-old", to_base36(now_ms.max(0.0) as u64));
        // Keep the text as it was (an unreadable one is quarantined as a draft later).
        let text = match parse_stored(&text) {
            Ok(mut s) => {
                if s.updated_ms <= 0.0 {
                    s.updated_ms = now_ms;
                }
                stored_text(&s)
            }
            Err(_) => text,
        };
        kv.set(&draft_key(&tab), &text)?;
        kv.remove(LEGACY_DRAFT_KEY)?;
        moved += 1;
    }
    if let Some(text) = kv.get(LEGACY_PREVIOUS_KEY)? {
        match parse_draft(&text) {
            Ok(d) => {
                set_aside(
                    kv,
                    &d,
                    "kept aside by an earlier version of this page",
                    now_ms,
                )?;
                kv.remove(LEGACY_PREVIOUS_KEY)?;
            }
            Err(_) => {
                let _ = load_stored(kv, LEGACY_PREVIOUS_KEY, now_ms)?;
            }
        }
        moved += 1;
    }
    Ok(moved)
}

#[cfg(test)]
mod tests {
    use super::super::index::quarantine_key;
    use super::super::testkit::{named, saved};
    use super::*;
    use crate::designs::kv::MemStore;

    fn work(name: &str, ph: f64) -> Draft {
        Draft {
            design: named(name, ph),
            open_id: None,
            base_saved_at_ms: 0.0,
            dirty: true,
        }
    }

    #[test]
    fn draft_round_trip_and_corrupt_draft_quarantined() {
        let mut kv = MemStore::default();
        let key = draft_key("t1");
        let d = Draft {
            design: named("Work", 7.1),
            open_id: Some("k1".into()),
            base_saved_at_ms: 5.0,
            dirty: true,
        };
        let _ = kv.set(&key, &draft_text(&d));
        assert_eq!(load_draft(&mut kv, &key, 1.0), Ok(Ok(Some(d))));
        let _ = kv.set(&key, "nonsense");
        let r = load_draft(&mut kv, &key, 1.0);
        match r {
            Ok(Err(q)) => {
                assert_eq!(
                    q.kind,
                    EntryKind::Draft,
                    "a damaged draft is called a draft"
                );
                assert!(!q.reason.contains('`'), "plain words: {}", q.reason);
            }
            other => panic!("{other:?}"),
        }
        assert!(kv.map.contains_key(&quarantine_key("draft.t1")));
        assert_eq!(load_draft(&mut kv, &key, 1.0), Ok(Ok(None)));
    }

    #[test]
    fn share_link_keeps_only_drafts_with_work_in_them() {
        let incoming = named("Shared", 6.8);
        let fresh_demo = Draft {
            design: demo_design(),
            ..work("x", 7.0)
        };
        assert!(!draft_worth_keeping(&fresh_demo, &incoming));
        let unsaved = work("Mine", 7.7);
        assert!(draft_worth_keeping(&unsaved, &incoming));
        let clean_saved = Draft {
            open_id: Some("k1".into()),
            dirty: false,
            ..unsaved.clone()
        };
        assert!(!draft_worth_keeping(&clean_saved, &incoming));
        assert!(!draft_worth_keeping(&unsaved, &named("Mine", 7.7)));
    }

    #[test]
    fn each_tab_has_its_own_draft_and_a_duplicated_tab_gets_a_new_id() {
        let mut kv = MemStore::default();
        let a = choose_tab_id(None, &kv, 1000.0);
        mark_alive(&mut kv, &a, 1000.0).unwrap();
        let _ = kv.set(&draft_key(&a), &draft_text(&work("A's work", 6.0)));
        // A second tab, same millisecond: another id.
        let b = choose_tab_id(None, &kv, 1000.0);
        assert_ne!(a, b);
        // A duplicated tab carries A's session id while A is open: new id.
        let dup = choose_tab_id(Some(&a), &kv, 3000.0);
        assert_ne!(dup, a);
        // A reload of A (closed mark removed on hide) keeps its id, hence its draft.
        mark_closed(&mut kv, &a);
        assert_eq!(choose_tab_id(Some(&a), &kv, 4000.0), a);
        // A stale sign of life (a crash) does not hold the id either.
        mark_alive(&mut kv, &a, 4000.0).unwrap();
        assert_eq!(
            choose_tab_id(Some(&a), &kv, 4000.0 + ALIVE_STALE_MS + 1.0),
            a
        );
        // Nonsense in session storage is replaced.
        assert!(choose_tab_id(Some("../x"), &kv, 5000.0).starts_with('t'));
    }

    #[test]
    fn closed_tabs_drafts_are_listed_open_tabs_are_not() {
        let mut kv = MemStore::default();
        let (sid, sd) = saved(&mut kv, &named("Saved", 7.0), 500.0);
        for (tab, d, t) in [
            ("ta", work("A's work", 6.0), 1000.0),
            ("tb", work("B's work", 6.5), 2000.0),
            (
                "tc",
                Draft {
                    design: demo_design(),
                    ..work("", 7.0)
                },
                2500.0,
            ),
            (
                "td",
                Draft {
                    design: sd.clone(),
                    open_id: Some(sid.clone()),
                    base_saved_at_ms: sd.saved_at_ms,
                    dirty: false,
                },
                2600.0,
            ),
        ] {
            let _ = kv.set(&draft_key(tab), &stored_text(&StoredDraft::new(d, t)));
        }
        mark_alive(&mut kv, "tb", 2900.0).unwrap();
        let (list, bad) = closed_drafts(&mut kv, "tme", 3000.0, true).unwrap();
        assert!(bad.is_empty());
        let names: Vec<_> = list
            .iter()
            .map(|c| c.stored.draft.design.name.clone())
            .collect();
        assert_eq!(
            names,
            vec!["A's work".to_string()],
            "B is open; C and D hold no work"
        );
        // Drafts without work were cleaned up; A's stays.
        assert!(!kv.map.contains_key(&draft_key("tc")));
        assert!(!kv.map.contains_key(&draft_key("td")));
        assert!(kv.map.contains_key(&draft_key("ta")));
        // B closes: now both, newest first.
        mark_closed(&mut kv, "tb");
        let (list, _) = closed_drafts(&mut kv, "tme", 3000.0, true).unwrap();
        assert_eq!(list.len(), 2);
        assert_eq!(list[0].stored.draft.design.name, "B's work");
    }

    #[test]
    fn set_aside_keeps_every_piece_up_to_ten_newest_first() {
        let mut kv = MemStore::default();
        let k1 = set_aside(&mut kv, &work("Original", 5.5), "a share link", 1000.0).unwrap();
        let k2 = set_aside(&mut kv, &work("Link one", 8.2), "a share link", 1000.0).unwrap();
        assert_ne!(k1, k2);
        let (list, _) = list_set_aside(&mut kv, 2000.0, true).unwrap();
        assert_eq!(list.len(), 2);
        let names: Vec<_> = list
            .iter()
            .map(|s| s.stored.draft.design.name.as_str())
            .collect();
        assert!(names.contains(&"Original") && names.contains(&"Link one"));
        for i in 0..12 {
            set_aside(
                &mut kv,
                &work(&format!("W{i}"), 7.0),
                "x",
                3000.0 + f64::from(i),
            )
            .unwrap();
        }
        let (list, _) = list_set_aside(&mut kv, 9000.0, true).unwrap();
        assert_eq!(list.len(), MAX_SET_ASIDE);
        assert_eq!(list[0].stored.draft.design.name, "W11");
        assert_eq!(list[0].stored.why, "x");
    }

    #[test]
    fn set_aside_on_full_storage_writes_nothing() {
        let mut kv = MemStore {
            quota: Some(10),
            ..Default::default()
        };
        assert_eq!(
            set_aside(&mut kv, &work("Big", 7.0), "x", 1.0),
            Err(StoreError::Full)
        );
        assert!(kv.map.is_empty());
    }

    #[test]
    fn old_single_draft_and_previous_keys_are_migrated() {
        let mut kv = MemStore::default();
        let _ = kv.set(LEGACY_DRAFT_KEY, &draft_text(&work("Old draft", 6.2)));
        let _ = kv.set(LEGACY_PREVIOUS_KEY, &draft_text(&work("Old previous", 5.2)));
        assert_eq!(migrate_legacy(&mut kv, 1000.0), Ok(2));
        assert!(!kv.map.contains_key(LEGACY_DRAFT_KEY));
        assert!(!kv.map.contains_key(LEGACY_PREVIOUS_KEY));
        let (closed, _) = closed_drafts(&mut kv, "tnew", 2000.0, true).unwrap();
        assert_eq!(closed.len(), 1);
        assert_eq!(closed[0].stored.draft.design.name, "Old draft");
        let (aside, _) = list_set_aside(&mut kv, 2000.0, true).unwrap();
        assert_eq!(aside.len(), 1);
        assert_eq!(aside[0].stored.draft.design.name, "Old previous");
        // Nothing left to move.
        assert_eq!(migrate_legacy(&mut kv, 3000.0), Ok(0));
    }

    #[test]
    fn unreadable_old_keys_are_kept_not_lost() {
        let mut kv = MemStore::default();
        let _ = kv.set(LEGACY_DRAFT_KEY, "{broken");
        let _ = kv.set(LEGACY_PREVIOUS_KEY, "{broken too");
        migrate_legacy(&mut kv, 1000.0).unwrap();
        let (_, bad) = closed_drafts(&mut kv, "tnew", 2000.0, true).unwrap();
        assert_eq!(bad.len(), 1);
        assert_eq!(bad[0].kind, EntryKind::Draft);
        assert!(kv.map.values().any(|v| v == "{broken"));
        assert!(kv.map.values().any(|v| v == "{broken too"));
    }

    #[test]
    fn migration_on_full_storage_leaves_the_old_keys() {
        let mut kv = MemStore::default();
        let text = draft_text(&work("Old draft", 6.2));
        let _ = kv.set(LEGACY_DRAFT_KEY, &text);
        kv.quota = Some(kv.used() + 10);
        assert_eq!(migrate_legacy(&mut kv, 1000.0), Err(StoreError::Full));
        assert_eq!(kv.map.get(LEGACY_DRAFT_KEY), Some(&text));
    }
}
