//! The list of saved designs: one key per design plus an index, the scan that reads them all, quarantine of unreadable entries, and writes (put, delete, rename, duplicate).

use super::kv::{KvStore, StoreError};
use super::reasons::plain_reason;
use serde::{Deserialize, Serialize};
use solver::document::{parse_design, to_json, Design};

/// Prefix of every key this page writes.
pub const PREFIX: &str = "bufferwright.";
/// Key of the list of saved design ids.
pub const INDEX_KEY: &str = "bufferwright.index";
const DESIGN_PREFIX: &str = "bufferwright.design.";
/// Prefix of the keys of entries that could not be read, kept as they were.
pub const QUARANTINE_PREFIX: &str = "bufferwright.quarantine.";
/// Longest design name the solver accepts.
pub const MAX_NAME_CHARS: usize = 120;

/// Key of a saved design.
pub fn design_key(id: &str) -> String {
    format!("{DESIGN_PREFIX}{id}")
}

/// Key under which an unreadable entry is kept aside.
pub fn quarantine_key(id: &str) -> String {
    format!("{QUARANTINE_PREFIX}{id}")
}

/// What kind of entry a stored value is (for messages in plain words).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum EntryKind {
    /// A saved design.
    Saved,
    /// The list of saved designs.
    Index,
    /// A tab's autosaved draft.
    Draft,
    /// Work set aside when something replaced it.
    SetAside,
}

impl EntryKind {
    /// The kind of a quarantined entry, from its quarantine id
    /// (`index`, `draft...`, `setaside...`, else a saved design).
    pub fn of_quarantine_id(id: &str) -> Self {
        if id == "index" || id.starts_with("index.") {
            Self::Index
        } else if id.starts_with("draft") || id.starts_with("tabdraft") {
            Self::Draft
        } else if id.starts_with("setaside") {
            Self::SetAside
        } else {
            Self::Saved
        }
    }

    /// Plain name of the kind, for messages ("a saved design").
    pub fn noun(self) -> &'static str {
        match self {
            Self::Saved => "saved design",
            Self::Index => "list of saved designs",
            Self::Draft => "draft (work kept automatically, not saved)",
            Self::SetAside => "piece of set-aside work",
        }
    }
}

#[derive(Debug, Clone, Serialize, Deserialize, PartialEq)]
struct IndexFile {
    schema: u32,
    ids: Vec<String>,
}

/// What the list shows for one saved design.
#[derive(Debug, Clone, PartialEq)]
pub struct Summary {
    /// Storage id.
    pub id: String,
    /// Design name.
    pub name: String,
    /// Display name of the recipe's acid system.
    pub system: String,
    /// Recipe target pH.
    pub target_ph: f64,
    /// Last save (ms since the epoch).
    pub saved_at_ms: f64,
}

/// The list line of a design.
pub fn summary(id: &str, d: &Design) -> Summary {
    let system = solver::mixture::lookup(&d.recipe.system, &d.custom_systems)
        .map(|s| s.name.clone())
        .unwrap_or_else(|_| d.recipe.system.clone());
    Summary {
        id: id.to_string(),
        name: d.name.clone(),
        system,
        target_ph: d.recipe.target_ph,
        saved_at_ms: d.saved_at_ms,
    }
}

/// An entry that could not be read and was set aside.
#[derive(Debug, Clone, PartialEq)]
pub struct Quarantined {
    /// Id of the entry (`index` for the index itself).
    pub id: String,
    /// What the entry was.
    pub kind: EntryKind,
    /// Key it now lives under (`None` when moving it failed; it was left in place).
    pub moved_to: Option<String>,
    /// Why it could not be read.
    pub reason: String,
}

/// Result of reading every saved design.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Scan {
    /// Readable designs with their ids, newest save first.
    pub designs: Vec<(String, Design)>,
    /// Entries set aside during this scan (report these once).
    pub quarantined: Vec<Quarantined>,
    /// Entries found without an index line and taken back in.
    pub recovered: usize,
}

impl Scan {
    /// List lines, in display order.
    pub fn summaries(&self) -> Vec<Summary> {
        self.designs.iter().map(|(id, d)| summary(id, d)).collect()
    }
}

pub(crate) fn design_id_from_key(key: &str) -> Option<&str> {
    key.strip_prefix(DESIGN_PREFIX).filter(|id| !id.is_empty())
}

/// Ids listed by the index; `Err(raw text)` when the index is unreadable.
pub(crate) fn index_ids(kv: &dyn KvStore) -> Result<Result<Vec<String>, String>, StoreError> {
    let Some(text) = kv.get(INDEX_KEY)? else {
        return Ok(Ok(Vec::new()));
    };
    Ok(serde_json::from_str::<IndexFile>(&text)
        .map(|f| f.ids)
        .map_err(|_| text))
}

/// Ids for writing: the index, or (when it is unreadable) the design keys present.
pub(crate) fn ids_for_write(kv: &dyn KvStore) -> Result<Vec<String>, StoreError> {
    match index_ids(kv)? {
        Ok(ids) => Ok(ids),
        Err(_) => Ok(kv
            .keys()?
            .iter()
            .filter_map(|k| design_id_from_key(k).map(str::to_string))
            .collect()),
    }
}

pub(crate) fn write_index(kv: &mut dyn KvStore, ids: &[String]) -> Result<(), StoreError> {
    let file = IndexFile {
        schema: 1,
        ids: ids.to_vec(),
    };
    kv.set(INDEX_KEY, &serde_json::to_string(&file).unwrap_or_default())
}

/// Move a raw entry aside under a quarantine key that does not exist yet.
pub(crate) fn quarantine(
    kv: &mut dyn KvStore,
    id: &str,
    raw: &str,
    from_key: &str,
    now_ms: f64,
) -> Option<String> {
    let mut target = quarantine_key(id);
    if kv.get(&target).ok().flatten().is_some() {
        target = quarantine_key(&format!("{id}.{}", now_ms as u64));
    }
    kv.set(&target, raw).ok()?;
    // The copy is safe; now the bad entry can leave its place.
    let _ = kv.remove(from_key);
    Some(target)
}

pub(crate) fn sort_newest_first(designs: &mut [(String, Design)]) {
    solver::order::sort_by(designs, |(ia, a), (ib, b)| {
        b.saved_at_ms
            .total_cmp(&a.saved_at_ms)
            .then_with(|| a.name.cmp(&b.name))
            .then_with(|| to_json(a).cmp(&to_json(b)))
            .then_with(|| ia.cmp(ib))
    });
}

/// Read every saved design.
///
/// With `repair`, unreadable entries are moved to quarantine keys, an
/// unreadable index is set aside and rebuilt, design entries missing from the
/// index are taken back in and index lines without an entry are dropped.
/// Without `repair` (used when another tab changed storage) nothing is
/// written: unreadable entries are just left out.
///
/// # Errors
/// Storage unusable.
pub fn scan(kv: &mut dyn KvStore, repair: bool, now_ms: f64) -> Result<Scan, StoreError> {
    let mut out = Scan::default();
    let mut index_dirty = false;
    let mut ids = match index_ids(kv)? {
        Ok(ids) => ids,
        Err(raw) => {
            if repair {
                let moved_to = quarantine(kv, "index", &raw, INDEX_KEY, now_ms);
                out.quarantined.push(Quarantined {
                    id: "index".into(),
                    kind: EntryKind::Index,
                    moved_to,
                    reason:
                        "the list of saved designs was unreadable; it was rebuilt from the entries"
                            .into(),
                });
                index_dirty = true;
            }
            Vec::new()
        }
    };
    // Entries without an index line (a save interrupted between its two writes, or a lost index).
    let mut keys = kv.keys()?;
    solver::order::sort_by(&mut keys, Ord::cmp);
    for k in &keys {
        if let Some(id) = design_id_from_key(k) {
            if !ids.iter().any(|i| i == id) {
                ids.push(id.to_string());
                out.recovered += 1;
                index_dirty = true;
            }
        }
    }
    let mut kept = Vec::with_capacity(ids.len());
    for id in ids {
        if kept.contains(&id) {
            index_dirty = true;
            continue;
        }
        let key = design_key(&id);
        let Some(text) = kv.get(&key)? else {
            index_dirty = true;
            continue;
        };
        match parse_design(&text) {
            Ok(d) => {
                kept.push(id.clone());
                out.designs.push((id, d));
            }
            Err(e) => {
                if repair {
                    let moved_to = quarantine(kv, &id, &text, &key, now_ms);
                    if moved_to.is_none() {
                        kept.push(id.clone());
                    }
                    out.quarantined.push(Quarantined {
                        id,
                        kind: EntryKind::Saved,
                        moved_to,
                        reason: plain_reason(&e),
                    });
                    index_dirty = true;
                }
            }
        }
    }
    if !repair {
        out.recovered = 0;
    }
    if repair && index_dirty {
        // Best effort: a full store keeps the old index, and the next scan repairs again.
        let _ = write_index(kv, &kept);
    }
    sort_newest_first(&mut out.designs);
    Ok(out)
}

/// Read one saved design.
///
/// # Errors
/// [`StoreError::Missing`] when absent or unreadable.
pub fn read_design(kv: &dyn KvStore, id: &str) -> Result<Design, StoreError> {
    let text = kv
        .get(&design_key(id))?
        .ok_or_else(|| StoreError::Missing(id.to_string()))?;
    parse_design(&text).map_err(|_| StoreError::Missing(id.to_string()))
}

pub(crate) fn to_base36(mut n: u64) -> String {
    const DIGITS: &[u8; 36] = b"0123456789abcdefghijklmnopqrstuvwxyz";
    let mut buf = Vec::new();
    loop {
        buf.push(DIGITS.get((n % 36) as usize).copied().unwrap_or(b'0'));
        n /= 36;
        if n == 0 {
            break;
        }
    }
    buf.reverse();
    String::from_utf8(buf).unwrap_or_default()
}

/// A new id from the clock: `k` + base-36 milliseconds, with a suffix if taken.
/// No randomness (none is needed, and getrandom on wasm is a trap).
pub fn new_id(kv: &dyn KvStore, taken: &[String], now_ms: f64) -> String {
    let base = format!("k{}", to_base36(now_ms.max(0.0) as u64));
    let free =
        |id: &str| !taken.iter().any(|t| t == id) && matches!(kv.get(&design_key(id)), Ok(None));
    if free(&base) {
        return base;
    }
    (2..10_000u32)
        .map(|n| format!("{base}-{n}"))
        .find(|id| free(id))
        .unwrap_or_else(|| format!("{base}-x"))
}

/// Write a design under `id`: entry first, then the index; on failure the
/// entry is put back as it was.
///
/// # Errors
/// The storage error; nothing changed in storage.
pub fn put(kv: &mut dyn KvStore, id: &str, d: &Design) -> Result<(), StoreError> {
    let key = design_key(id);
    let previous = kv.get(&key)?;
    kv.set(&key, &to_json(d))?;
    let ids = match ids_for_write(kv) {
        Ok(ids) => ids,
        Err(e) => {
            rollback(kv, &key, previous);
            return Err(e);
        }
    };
    let indexed = matches!(index_ids(kv), Ok(Ok(_)));
    if !ids.iter().any(|i| i == id) || !indexed {
        let mut ids = ids;
        if !ids.iter().any(|i| i == id) {
            ids.push(id.to_string());
        }
        if let Err(e) = write_index(kv, &ids) {
            rollback(kv, &key, previous);
            return Err(e);
        }
    }
    Ok(())
}

fn rollback(kv: &mut dyn KvStore, key: &str, previous: Option<String>) {
    let _ = match previous {
        Some(p) => kv.set(key, &p),
        None => kv.remove(key),
    };
}

/// A name the solver accepts: trimmed, at most [`MAX_NAME_CHARS`], never empty.
pub fn clean_name(name: &str) -> String {
    let t: String = name.trim().chars().take(MAX_NAME_CHARS).collect();
    let t = t.trim().to_string();
    if t.is_empty() {
        "Untitled design".into()
    } else {
        t
    }
}

/// Delete a saved design: index line first, then the entry. Returns it for undo.
///
/// # Errors
/// Storage errors.
pub fn delete_design(kv: &mut dyn KvStore, id: &str) -> Result<Option<Design>, StoreError> {
    let key = design_key(id);
    let old = kv.get(&key)?.and_then(|t| parse_design(&t).ok());
    let ids: Vec<String> = ids_for_write(kv)?.into_iter().filter(|i| i != id).collect();
    write_index(kv, &ids)?;
    kv.remove(&key)?;
    Ok(old)
}

/// Put a deleted design back as it was (same id, same save time).
///
/// # Errors
/// Storage errors.
pub fn undo_delete(kv: &mut dyn KvStore, id: &str, d: &Design) -> Result<(), StoreError> {
    put(kv, id, d)
}

/// Rename a saved design (bumps its save time).
///
/// # Errors
/// [`StoreError::Missing`] or storage errors.
pub fn rename_design(
    kv: &mut dyn KvStore,
    id: &str,
    name: &str,
    now_ms: f64,
) -> Result<Design, StoreError> {
    let mut d = read_design(kv, id)?;
    d.name = clean_name(name);
    let floor = d.saved_at_ms;
    d.saved_at_ms = now_ms.max(floor + 1.0);
    put(kv, id, &d)?;
    Ok(d)
}

// ---------------------------------------------------------------------------

/// Two designs hold the same inputs (save time and shown workspace aside).
pub fn same_content(a: &Design, b: &Design) -> bool {
    let norm = |d: &Design| {
        let mut d = d.clone();
        d.saved_at_ms = 0.0;
        d.workspace = solver::document::Workspace::default();
        d
    };
    norm(a) == norm(b)
}

#[cfg(test)]
mod tests {
    use super::super::testkit::{named, saved};
    use super::*;
    use crate::designs::conflicts::duplicate_design;
    use crate::designs::conflicts::{save_design, SaveTarget};
    use crate::designs::kv::MemStore;

    #[test]
    fn save_then_scan_lists_newest_first_with_summary() {
        let mut kv = MemStore::default();
        let (a, _) = saved(&mut kv, &named("Alpha", 7.0), 1000.0);
        let (b, _) = saved(&mut kv, &named("Beta", 7.4), 2000.0);
        assert_ne!(a, b);
        let s = scan(&mut kv, true, 3000.0).unwrap_or_default();
        let list = s.summaries();
        assert_eq!(list.len(), 2);
        assert_eq!(list.first().map(|x| x.name.as_str()), Some("Beta"));
        assert_eq!(list.first().map(|x| x.system.as_str()), Some("Phosphate"));
        assert_eq!(list.first().map(|x| x.target_ph), Some(7.4));
        assert_eq!(list.get(1).map(|x| x.saved_at_ms), Some(1000.0));
        assert!(s.quarantined.is_empty());
        // Each design has its own key plus one index.
        assert!(kv.map.contains_key(&design_key(&a)));
        assert!(kv.map.contains_key(INDEX_KEY));
    }

    #[test]
    fn corrupted_entry_is_quarantined_once_and_others_load() {
        let mut kv = MemStore::default();
        let (a, _) = saved(&mut kv, &named("Alpha", 7.0), 1000.0);
        let (b, _) = saved(&mut kv, &named("Beta", 7.4), 2000.0);
        kv.map.insert(design_key(&a), "{not json".into());
        let s = scan(&mut kv, true, 3000.0).unwrap_or_default();
        assert_eq!(s.designs.len(), 1);
        assert_eq!(s.designs.first().map(|(id, _)| id.clone()), Some(b.clone()));
        assert_eq!(s.quarantined.len(), 1);
        let q = s.quarantined.first().cloned();
        assert_eq!(
            q.as_ref().and_then(|q| q.moved_to.clone()),
            Some(quarantine_key(&a))
        );
        // Kept, not deleted.
        assert_eq!(
            kv.map.get(&quarantine_key(&a)).map(String::as_str),
            Some("{not json")
        );
        assert!(!kv.map.contains_key(&design_key(&a)));
        // Reported once: the next scan is clean.
        let again = scan(&mut kv, true, 4000.0).unwrap_or_default();
        assert!(again.quarantined.is_empty());
        assert_eq!(again.designs.len(), 1);
    }

    #[test]
    fn invalid_field_is_quarantined_with_the_field_named() {
        let mut kv = MemStore::default();
        let (a, _) = saved(&mut kv, &named("Alpha", 7.0), 1000.0);
        let bad = kv
            .map
            .get(&design_key(&a))
            .cloned()
            .unwrap_or_default()
            .replace("\"target_ph\":7.0", "\"target_ph\":99.0");
        kv.map.insert(design_key(&a), bad);
        let s = scan(&mut kv, true, 2000.0).unwrap_or_default();
        let reason = s
            .quarantined
            .first()
            .map(|q| q.reason.clone())
            .unwrap_or_default();
        assert!(reason.contains("the Recipe, target pH"), "{reason}");
    }

    #[test]
    fn scan_without_repair_writes_nothing() {
        let mut kv = MemStore::default();
        let (a, _) = saved(&mut kv, &named("Alpha", 7.0), 1000.0);
        kv.map.insert(design_key(&a), "garbage".into());
        kv.map
            .insert(design_key("orphan"), to_json(&named("Orphan", 6.0)));
        let before = kv.map.clone();
        let s = scan(&mut kv, false, 2000.0).unwrap_or_default();
        assert_eq!(kv.map, before);
        assert!(s.quarantined.is_empty());
        assert_eq!(s.designs.len(), 1);
    }

    #[test]
    fn corrupt_index_is_set_aside_and_rebuilt_from_entries() {
        let mut kv = MemStore::default();
        saved(&mut kv, &named("Alpha", 7.0), 1000.0);
        saved(&mut kv, &named("Beta", 7.2), 2000.0);
        kv.map.insert(INDEX_KEY.into(), "[[[".into());
        let s = scan(&mut kv, true, 3000.0).unwrap_or_default();
        assert_eq!(s.designs.len(), 2);
        assert_eq!(s.quarantined.first().map(|q| q.id.as_str()), Some("index"));
        assert_eq!(
            kv.map.get(&quarantine_key("index")).map(String::as_str),
            Some("[[[")
        );
        let again = scan(&mut kv, true, 4000.0).unwrap_or_default();
        assert!(again.quarantined.is_empty() && again.recovered == 0);
    }

    #[test]
    fn orphan_entries_are_recovered_and_dangling_lines_dropped() {
        let mut kv = MemStore::default();
        saved(&mut kv, &named("Alpha", 7.0), 1000.0);
        kv.map
            .insert(design_key("lost"), to_json(&named("Lost", 6.5)));
        let mut ids = ids_for_write(&kv).unwrap_or_default();
        ids.push("gone".into());
        let _ = write_index(&mut kv, &ids);
        let s = scan(&mut kv, true, 2000.0).unwrap_or_default();
        assert_eq!(s.recovered, 1);
        assert_eq!(s.designs.len(), 2);
        let ids = ids_for_write(&kv).unwrap_or_default();
        assert!(ids.contains(&"lost".to_string()));
        assert!(!ids.contains(&"gone".to_string()));
    }

    #[test]
    fn full_storage_writes_nothing() {
        let mut kv = MemStore::default();
        saved(&mut kv, &named("Alpha", 7.0), 1000.0);
        kv.quota = Some(kv.used() + 100);
        let before = kv.map.clone();
        let r = save_design(&mut kv, &SaveTarget::New, &named("Beta", 7.2), 2000.0);
        assert_eq!(r, Err(StoreError::Full));
        assert_eq!(kv.map, before);
    }

    #[test]
    fn index_write_failure_rolls_back_the_entry() {
        let mut kv = MemStore::default();
        saved(&mut kv, &named("Alpha", 7.0), 1000.0);
        kv.fail_set_prefix = Some(INDEX_KEY.into());
        let before = kv.map.clone();
        let r = save_design(&mut kv, &SaveTarget::New, &named("Beta", 7.2), 2000.0);
        assert_eq!(r, Err(StoreError::Full));
        assert_eq!(kv.map, before, "no half-written save");
    }

    #[test]
    fn delete_and_undo_restore_exactly() {
        let mut kv = MemStore::default();
        let (id, d) = saved(&mut kv, &named("Alpha", 7.0), 1000.0);
        let before = kv.map.clone();
        let removed = delete_design(&mut kv, &id).ok().flatten();
        assert_eq!(removed.as_ref(), Some(&d));
        assert!(scan(&mut kv, true, 2000.0).map(|s| s.designs.is_empty()) == Ok(true));
        let _ = undo_delete(&mut kv, &id, &d);
        assert_eq!(kv.map, before);
    }

    #[test]
    fn rename_and_duplicate() {
        let mut kv = MemStore::default();
        let (id, _) = saved(&mut kv, &named("Alpha", 7.0), 1000.0);
        let r = rename_design(&mut kv, &id, "  Wash buffer  ", 2000.0);
        assert_eq!(
            r.map(|d| (d.name, d.saved_at_ms)),
            Ok(("Wash buffer".into(), 2000.0))
        );
        let dup = duplicate_design(&mut kv, &id, 3000.0);
        assert_eq!(dup.map(|(_, d)| d.name), Ok("Wash buffer (copy)".into()));
        let dup2 = duplicate_design(&mut kv, &id, 3000.0);
        assert_eq!(dup2.map(|(_, d)| d.name), Ok("Wash buffer (copy 2)".into()));
        assert_eq!(scan(&mut kv, true, 4000.0).map(|s| s.designs.len()), Ok(3));
        assert_eq!(
            rename_design(&mut kv, "nope", "x", 1.0),
            Err(StoreError::Missing("nope".into()))
        );
    }

    #[test]
    fn names_are_cleaned() {
        assert_eq!(clean_name("   "), "Untitled design");
        assert_eq!(clean_name(&"x".repeat(500)).chars().count(), MAX_NAME_CHARS);
    }

    #[test]
    fn ids_come_from_the_clock_and_never_clash() {
        let mut kv = MemStore::default();
        let (a, _) = saved(&mut kv, &named("A", 7.0), 1000.0);
        let (b, _) = saved(&mut kv, &named("B", 7.0), 1000.0);
        let (c, _) = saved(&mut kv, &named("C", 7.0), 1000.0);
        assert_eq!(a, "krs");
        assert_eq!(b, "krs-2");
        assert_eq!(c, "krs-3");
    }
}
