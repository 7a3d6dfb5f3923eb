//! Saved designs and the autosaved draft in browser local storage.
//!
//! Layout of the keys (all values are JSON text):
//!
//! | key                              | value                                             |
//! |----------------------------------|---------------------------------------------------|
//! | `bufferwright.index`             | `{"schema":1,"ids":["k1a2b3",...]}`               |
//! | `bufferwright.design.<id>`       | one solver design document (`solver::design`)     |
//! | `bufferwright.draft`             | the working design + which saved design it edits  |
//! | `bufferwright.draft.previous`    | a draft set aside when a share link replaced it   |
//! | `bufferwright.quarantine.<id>`   | an entry that could not be read, kept as it was   |
//!
//! Invariants:
//! - each design has its own key, so one unreadable entry cannot hide the others;
//!   an unreadable entry is moved aside (never deleted) and reported once;
//! - a save writes the design entry first and the index second, and removes
//!   the entry again if the index write fails: no half-written save;
//! - before overwriting a saved design, its stored `saved_at_ms` is compared
//!   with the one this page opened; a newer one is a conflict for the user to decide;
//! - everything that decides is a plain function over [`KvStore`], tested
//!   natively with [`MemStore`]; [`LocalStore`] and [`init`] are the page glue.

use crate::embed::{parse_query, UrlOptions};
use crate::share;
use crate::state::{AppState, ViewOptions};
use leptos::prelude::*;
use serde::{Deserialize, Serialize};
use solver::design::{demo_design, parse_design, to_json, to_json_pretty, Design, SCHEMA_VERSION};
use std::collections::BTreeMap;

/// Prefix of every key this page writes.
pub const PREFIX: &str = "bufferwright.";
/// Key of the list of saved design ids.
pub const INDEX_KEY: &str = "bufferwright.index";
/// Key of the autosaved working design.
pub const DRAFT_KEY: &str = "bufferwright.draft";
/// Key of a draft set aside when a share link was opened over it.
pub const PREVIOUS_DRAFT_KEY: &str = "bufferwright.draft.previous";
const DESIGN_PREFIX: &str = "bufferwright.design.";
const QUARANTINE_PREFIX: &str = "bufferwright.quarantine.";
/// `format` value of a file holding several designs.
pub const COLLECTION_FORMAT: &str = "bufferwright-designs";
/// File name ending of exported files ("Bufferwright design file").
pub const FILE_EXTENSION: &str = ".bwdesign.json";
/// Largest file accepted by import (bytes).
pub const MAX_IMPORT_BYTES: usize = 5 * 1024 * 1024;
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

// ---------------------------------------------------------------------------
// Key-value stores
// ---------------------------------------------------------------------------

/// Why storage refused.
#[derive(Debug, Clone, PartialEq, Eq)]
#[non_exhaustive]
pub enum StoreError {
    /// Storage cannot be used at all (private mode, disabled by policy).
    Unavailable(String),
    /// The browser's storage quota is used up.
    Full,
    /// The design asked for is not stored (deleted in another tab?).
    Missing(String),
    /// Anything else the browser reported.
    Other(String),
}

impl std::fmt::Display for StoreError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            StoreError::Unavailable(why) => write!(
                f,
                "Browser storage is not available here ({why}): designs cannot be saved in this \
                 browser. Your work stays on screen; use “Export this design” to keep it in a file."
            ),
            StoreError::Full => write!(
                f,
                "Browser storage is full: nothing was saved. Your design is still on screen. \
                 Export it to a file, or delete saved designs you no longer need, then save again."
            ),
            StoreError::Missing(id) => write!(
                f,
                "That saved design is no longer stored (id {id}); it may have been deleted in another tab."
            ),
            StoreError::Other(why) => write!(f, "Browser storage refused: {why}"),
        }
    }
}

/// A minimal string key-value store: browser local storage or memory.
pub trait KvStore {
    /// Value of `key`, `None` if absent.
    ///
    /// # Errors
    /// Storage unusable.
    fn get(&self, key: &str) -> Result<Option<String>, StoreError>;
    /// Store `value` under `key`.
    ///
    /// # Errors
    /// [`StoreError::Full`] when the quota would be exceeded (nothing is written).
    fn set(&mut self, key: &str, value: &str) -> Result<(), StoreError>;
    /// Remove `key` (absent keys are fine).
    ///
    /// # Errors
    /// Storage unusable.
    fn remove(&mut self, key: &str) -> Result<(), StoreError>;
    /// Every key.
    ///
    /// # Errors
    /// Storage unusable.
    fn keys(&self) -> Result<Vec<String>, StoreError>;
}

/// In-memory store with an optional quota, for tests and for pages without storage.
#[derive(Debug, Clone, Default)]
pub struct MemStore {
    /// Contents.
    pub map: BTreeMap<String, String>,
    /// Quota in bytes of keys + values (local storage counts UTF-16 units; close enough).
    pub quota: Option<usize>,
    /// Fail every `set` whose key starts with this (simulates a write failing midway).
    pub fail_set_prefix: Option<String>,
}

impl MemStore {
    /// Bytes used.
    pub fn used(&self) -> usize {
        self.map.iter().map(|(k, v)| k.len() + v.len()).sum()
    }
}

impl KvStore for MemStore {
    fn get(&self, key: &str) -> Result<Option<String>, StoreError> {
        Ok(self.map.get(key).cloned())
    }
    fn set(&mut self, key: &str, value: &str) -> Result<(), StoreError> {
        if let Some(p) = &self.fail_set_prefix {
            if key.starts_with(p.as_str()) {
                return Err(StoreError::Full);
            }
        }
        if let Some(q) = self.quota {
            let old = self.map.get(key).map_or(0, |v| key.len() + v.len());
            if self.used() - old + key.len() + value.len() > q {
                return Err(StoreError::Full);
            }
        }
        self.map.insert(key.to_string(), value.to_string());
        Ok(())
    }
    fn remove(&mut self, key: &str) -> Result<(), StoreError> {
        self.map.remove(key);
        Ok(())
    }
    fn keys(&self) -> Result<Vec<String>, StoreError> {
        Ok(self.map.keys().cloned().collect())
    }
}

/// The page's `window.localStorage`.
#[derive(Debug, Clone)]
pub struct LocalStore {
    storage: web_sys::Storage,
}

impl LocalStore {
    /// Open local storage; fails in private modes and when blocked by policy.
    ///
    /// # Errors
    /// [`StoreError::Unavailable`] naming what the browser said.
    pub fn open() -> Result<Self, StoreError> {
        let w = web_sys::window().ok_or_else(|| StoreError::Unavailable("no window".into()))?;
        match w.local_storage() {
            Ok(Some(storage)) => Ok(Self { storage }),
            Ok(None) => Err(StoreError::Unavailable("the browser offers none".into())),
            Err(e) => Err(StoreError::Unavailable(js_error_text(&e))),
        }
    }
}

fn js_error_name(e: &wasm_bindgen::JsValue) -> String {
    js_sys::Reflect::get(e, &wasm_bindgen::JsValue::from_str("name"))
        .ok()
        .and_then(|v| v.as_string())
        .unwrap_or_default()
}

fn js_error_text(e: &wasm_bindgen::JsValue) -> String {
    let msg = js_sys::Reflect::get(e, &wasm_bindgen::JsValue::from_str("message"))
        .ok()
        .and_then(|v| v.as_string())
        .or_else(|| e.as_string())
        .unwrap_or_default();
    let name = js_error_name(e);
    match (name.is_empty(), msg.is_empty()) {
        (true, true) => "access refused".into(),
        (false, true) => name,
        (true, false) => msg,
        (false, false) => format!("{name}: {msg}"),
    }
}

fn unavailable(e: &wasm_bindgen::JsValue) -> StoreError {
    StoreError::Unavailable(js_error_text(e))
}

impl KvStore for LocalStore {
    fn get(&self, key: &str) -> Result<Option<String>, StoreError> {
        self.storage.get_item(key).map_err(|e| unavailable(&e))
    }
    fn set(&mut self, key: &str, value: &str) -> Result<(), StoreError> {
        self.storage.set_item(key, value).map_err(|e| {
            let name = js_error_name(&e);
            if name == "QuotaExceededError" || name == "NS_ERROR_DOM_QUOTA_REACHED" {
                StoreError::Full
            } else if name == "SecurityError" {
                unavailable(&e)
            } else {
                StoreError::Other(js_error_text(&e))
            }
        })
    }
    fn remove(&mut self, key: &str) -> Result<(), StoreError> {
        self.storage.remove_item(key).map_err(|e| unavailable(&e))
    }
    fn keys(&self) -> Result<Vec<String>, StoreError> {
        let n = self.storage.length().map_err(|e| unavailable(&e))?;
        let mut out = Vec::with_capacity(n as usize);
        for i in 0..n {
            if let Some(k) = self.storage.key(i).map_err(|e| unavailable(&e))? {
                out.push(k);
            }
        }
        Ok(out)
    }
}

// ---------------------------------------------------------------------------
// Index and scan
// ---------------------------------------------------------------------------

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

fn design_id_from_key(key: &str) -> Option<&str> {
    key.strip_prefix(DESIGN_PREFIX).filter(|id| !id.is_empty())
}

/// Ids listed by the index; `Err(raw text)` when the index is unreadable.
fn index_ids(kv: &dyn KvStore) -> Result<Result<Vec<String>, String>, StoreError> {
    let Some(text) = kv.get(INDEX_KEY)? else {
        return Ok(Ok(Vec::new()));
    };
    Ok(serde_json::from_str::<IndexFile>(&text)
        .map(|f| f.ids)
        .map_err(|_| text))
}

/// Ids for writing: the index, or (when it is unreadable) the design keys present.
fn ids_for_write(kv: &dyn KvStore) -> Result<Vec<String>, StoreError> {
    match index_ids(kv)? {
        Ok(ids) => Ok(ids),
        Err(_) => Ok(kv
            .keys()?
            .iter()
            .filter_map(|k| design_id_from_key(k).map(str::to_string))
            .collect()),
    }
}

fn write_index(kv: &mut dyn KvStore, ids: &[String]) -> Result<(), StoreError> {
    let file = IndexFile {
        schema: 1,
        ids: ids.to_vec(),
    };
    kv.set(INDEX_KEY, &serde_json::to_string(&file).unwrap_or_default())
}

/// Move a raw entry aside under a quarantine key that does not exist yet.
fn quarantine(
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

fn sort_newest_first(designs: &mut [(String, Design)]) {
    designs.sort_by(|(ia, a), (ib, b)| {
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
    keys.sort();
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
                        moved_to,
                        reason: e.to_string(),
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

// ---------------------------------------------------------------------------
// Writing
// ---------------------------------------------------------------------------

fn to_base36(mut n: u64) -> String {
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

/// Where a save goes.
#[derive(Debug, Clone, PartialEq)]
pub enum SaveTarget {
    /// A new saved design.
    New,
    /// The saved design this page opened, as it was at `base_saved_at_ms`.
    Existing {
        /// Storage id.
        id: String,
        /// `saved_at_ms` of the stored version this page started from.
        base_saved_at_ms: f64,
    },
    /// Overwrite `id` whatever is stored (the user chose to).
    Overwrite {
        /// Storage id.
        id: String,
    },
}

/// What a save did.
#[derive(Debug, Clone, PartialEq)]
pub enum SaveOutcome {
    /// Stored.
    Saved {
        /// Storage id.
        id: String,
        /// The design as stored (with its new `saved_at_ms`).
        design: Design,
        /// The entry had been deleted elsewhere and was written again.
        recreated: bool,
    },
    /// Another tab saved a newer version since this page opened it; nothing written.
    Conflict {
        /// Storage id.
        id: String,
        /// The stored, newer version.
        theirs: Design,
    },
}

/// How a stored version relates to the version a page started from.
#[derive(Debug, Clone, PartialEq)]
pub enum Freshness {
    /// Nothing stored (new, or deleted elsewhere).
    Absent,
    /// Stored version is the one the page started from (or older).
    Same,
    /// Someone saved a newer version.
    Newer(Box<Design>),
}

/// Compare the stored version with the page's base version.
pub fn freshness(stored: Option<Design>, base_saved_at_ms: f64) -> Freshness {
    match stored {
        None => Freshness::Absent,
        Some(d) if d.saved_at_ms > base_saved_at_ms => Freshness::Newer(Box::new(d)),
        Some(_) => Freshness::Same,
    }
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

/// Save `design`, checking for a newer version saved elsewhere first.
///
/// The stored `saved_at_ms` is always later than every earlier version's.
///
/// # Errors
/// Storage errors; nothing is written then.
pub fn save_design(
    kv: &mut dyn KvStore,
    target: &SaveTarget,
    design: &Design,
    now_ms: f64,
) -> Result<SaveOutcome, StoreError> {
    let (id, floor, recreated) = match target {
        SaveTarget::New => {
            let taken = ids_for_write(kv)?;
            (new_id(kv, &taken, now_ms), 0.0, false)
        }
        SaveTarget::Existing {
            id,
            base_saved_at_ms,
        } => {
            let key = design_key(id);
            let stored_text = kv.get(&key)?;
            let stored = match &stored_text {
                Some(t) => match parse_design(t) {
                    Ok(d) => Some(d),
                    Err(_) => {
                        // Never overwrite an unreadable entry: keep it aside first.
                        quarantine(kv, id, t, &key, now_ms);
                        None
                    }
                },
                None => None,
            };
            match freshness(stored, *base_saved_at_ms) {
                Freshness::Newer(theirs) => {
                    return Ok(SaveOutcome::Conflict {
                        id: id.clone(),
                        theirs: *theirs,
                    })
                }
                Freshness::Same => (id.clone(), *base_saved_at_ms, false),
                Freshness::Absent => (id.clone(), *base_saved_at_ms, true),
            }
        }
        SaveTarget::Overwrite { id } => {
            let stored = kv
                .get(&design_key(id))?
                .and_then(|t| parse_design(&t).ok())
                .map_or(0.0, |d| d.saved_at_ms);
            (id.clone(), stored, false)
        }
    };
    let mut d = design.clone();
    d.name = clean_name(&d.name);
    d.saved_at_ms = now_ms.max(floor + 1.0).max(d.saved_at_ms);
    d.schema = SCHEMA_VERSION;
    put(kv, &id, &d)?;
    Ok(SaveOutcome::Saved {
        id,
        design: d,
        recreated,
    })
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

/// Name of a copy: `X (copy)`, `X (copy 2)`, ... not clashing with `names`.
pub fn copy_name(name: &str, names: &[String]) -> String {
    let stem = name.trim();
    let mut n = 1u32;
    loop {
        let candidate = if n == 1 {
            format!("{stem} (copy)")
        } else {
            format!("{stem} (copy {n})")
        };
        if !names.contains(&candidate) || n > 999 {
            return clean_name(&candidate);
        }
        n += 1;
    }
}

/// Duplicate a saved design under a new id and a "(copy)" name.
///
/// # Errors
/// [`StoreError::Missing`] or storage errors.
pub fn duplicate_design(
    kv: &mut dyn KvStore,
    id: &str,
    now_ms: f64,
) -> Result<(String, Design), StoreError> {
    let d = read_design(kv, id)?;
    let names: Vec<String> = scan(kv, false, now_ms)?
        .designs
        .into_iter()
        .map(|(_, d)| d.name)
        .collect();
    let mut copy = d;
    copy.name = copy_name(&copy.name, &names);
    copy.saved_at_ms = 0.0;
    match save_design(kv, &SaveTarget::New, &copy, now_ms)? {
        SaveOutcome::Saved { id, design, .. } => Ok((id, design)),
        SaveOutcome::Conflict { id, .. } => Err(StoreError::Other(format!("id clash on {id}"))),
    }
}

// ---------------------------------------------------------------------------
// Files
// ---------------------------------------------------------------------------

#[derive(Serialize)]
struct CollectionOut<'a> {
    format: &'static str,
    schema: u32,
    designs: &'a [Design],
}

/// Text of a file holding one design (the solver's document, indented).
pub fn export_one(d: &Design) -> String {
    to_json_pretty(d)
}

/// Text of a file holding several designs.
pub fn export_many(designs: &[Design]) -> String {
    serde_json::to_string_pretty(&CollectionOut {
        format: COLLECTION_FORMAT,
        schema: 1,
        designs,
    })
    .unwrap_or_default()
}

/// A file name from a design name: `hatchery-lab-assay-buffer.bwdesign.json`.
pub fn file_name(name: &str) -> String {
    let mut slug = String::new();
    for c in name.chars().flat_map(char::to_lowercase) {
        if c.is_ascii_alphanumeric() {
            slug.push(c);
        } else if !slug.is_empty() && !slug.ends_with('-') {
            slug.push('-');
        }
    }
    let slug: String = slug.trim_matches('-').chars().take(60).collect();
    let slug = slug.trim_matches('-');
    if slug.is_empty() {
        format!("design{FILE_EXTENSION}")
    } else {
        format!("{slug}{FILE_EXTENSION}")
    }
}

/// Read an import file: one design document or a collection of them.
///
/// Every design is migrated and validated; the first bad one refuses the
/// whole file, with its position and field named.
///
/// # Errors
/// The reason, for the user.
pub fn parse_import(text: &str) -> Result<Vec<Design>, String> {
    if text.len() > MAX_IMPORT_BYTES {
        return Err(format!(
            "the file is {} bytes, too large to be a design file",
            text.len()
        ));
    }
    let value: serde_json::Value = serde_json::from_str(text.trim_start_matches('\u{feff}'))
        .map_err(|e| format!("the file is not JSON ({e})"))?;
    let is_collection = value.get("format").and_then(serde_json::Value::as_str)
        == Some(COLLECTION_FORMAT)
        || (value.get("designs").is_some() && value.get("recipe").is_none());
    if !is_collection {
        return parse_design(&value.to_string())
            .map(|d| vec![d])
            .map_err(|e| format!("not a usable design: {e}"));
    }
    let list = value
        .get("designs")
        .and_then(serde_json::Value::as_array)
        .ok_or_else(|| "the file has no \"designs\" list".to_string())?;
    if list.is_empty() {
        return Err("the file holds no designs".into());
    }
    list.iter()
        .enumerate()
        .map(|(i, v)| {
            parse_design(&v.to_string())
                .map_err(|e| format!("design {} of {}: {e}", i + 1, list.len()))
        })
        .collect()
}

/// What an import did.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct ImportReport {
    /// Ids of the designs added.
    pub added: Vec<String>,
    /// Designs skipped because an identical one is already saved.
    pub already_saved: Vec<String>,
}

/// Save imported designs (skipping ones already saved identically).
/// All or nothing: if one write fails, the ones added are removed again.
///
/// # Errors
/// Storage errors; storage is as before then.
pub fn import_designs(
    kv: &mut dyn KvStore,
    designs: &[Design],
    now_ms: f64,
) -> Result<ImportReport, StoreError> {
    let existing = scan(kv, false, now_ms)?;
    let mut report = ImportReport::default();
    let mut seen: Vec<Design> = existing.designs.into_iter().map(|(_, d)| d).collect();
    for d in designs {
        if seen.contains(d) {
            report.already_saved.push(d.name.clone());
            continue;
        }
        let taken = ids_for_write(kv)?;
        let id = new_id(kv, &taken, now_ms);
        let mut stored = d.clone();
        if stored.saved_at_ms <= 0.0 {
            stored.saved_at_ms = now_ms;
        }
        if let Err(e) = put(kv, &id, &stored) {
            for added in &report.added {
                let _ = delete_design(kv, added);
            }
            return Err(e);
        }
        report.added.push(id);
        seen.push(d.clone());
    }
    Ok(report)
}

// ---------------------------------------------------------------------------
// Draft
// ---------------------------------------------------------------------------

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

#[derive(Serialize, Deserialize)]
struct DraftFile {
    schema: u32,
    #[serde(default)]
    open_id: Option<String>,
    #[serde(default)]
    base_saved_at_ms: f64,
    #[serde(default)]
    dirty: bool,
    design: serde_json::Value,
}

/// Text stored under [`DRAFT_KEY`].
pub fn draft_text(d: &Draft) -> String {
    let file = DraftFile {
        schema: 1,
        open_id: d.open_id.clone(),
        base_saved_at_ms: d.base_saved_at_ms,
        dirty: d.dirty,
        design: serde_json::to_value(&d.design).unwrap_or_default(),
    };
    serde_json::to_string(&file).unwrap_or_default()
}

/// Read a draft record.
///
/// # Errors
/// Why it cannot be used.
pub fn parse_draft(text: &str) -> Result<Draft, String> {
    let file: DraftFile =
        serde_json::from_str(text).map_err(|e| format!("draft unreadable: {e}"))?;
    let design = parse_design(&file.design.to_string()).map_err(|e| e.to_string())?;
    Ok(Draft {
        design,
        open_id: file.open_id,
        base_saved_at_ms: file.base_saved_at_ms,
        dirty: file.dirty,
    })
}

/// Read the draft under `key`; an unreadable one is moved to quarantine.
///
/// # Errors
/// Storage errors; `Ok(Err(reason))` for a draft set aside.
pub fn load_draft(
    kv: &mut dyn KvStore,
    key: &str,
    now_ms: f64,
) -> Result<Result<Option<Draft>, Quarantined>, StoreError> {
    let Some(text) = kv.get(key)? else {
        return Ok(Ok(None));
    };
    match parse_draft(&text) {
        Ok(d) => Ok(Ok(Some(d))),
        Err(reason) => {
            let id = key.trim_start_matches(PREFIX);
            let moved_to = quarantine(kv, id, &text, key, now_ms);
            Ok(Err(Quarantined {
                id: id.to_string(),
                moved_to,
                reason,
            }))
        }
    }
}

/// Two designs hold the same inputs (save time and shown workspace aside).
pub fn same_content(a: &Design, b: &Design) -> bool {
    let norm = |d: &Design| {
        let mut d = d.clone();
        d.saved_at_ms = 0.0;
        d.workspace = solver::design::Workspace::default();
        d
    };
    norm(a) == norm(b)
}

/// Whether a draft about to be replaced by a share link holds work worth keeping.
pub fn draft_worth_keeping(draft: &Draft, incoming: &Design) -> bool {
    (draft.open_id.is_none() || draft.dirty)
        && !same_content(&draft.design, incoming)
        && !same_content(&draft.design, &demo_design())
}

/// What to do when another tab changed the design this page has open.
#[derive(Debug, Clone, PartialEq)]
pub enum External {
    /// Nothing new.
    Unchanged,
    /// Deleted there; keep the work here as unsaved.
    Deleted,
    /// Newer there, no edits here: show theirs.
    Reload(Box<Design>),
    /// Newer there and edited here: keep ours, warn, the next save will ask.
    Diverged(Box<Design>),
}

/// Decide how to follow a change made in another tab.
pub fn external_change(stored: Option<Design>, base_saved_at_ms: f64, dirty: bool) -> External {
    match freshness(stored, base_saved_at_ms) {
        Freshness::Absent => External::Deleted,
        Freshness::Same => External::Unchanged,
        Freshness::Newer(d) if dirty => External::Diverged(d),
        Freshness::Newer(d) => External::Reload(d),
    }
}

// ---------------------------------------------------------------------------
// Dates
// ---------------------------------------------------------------------------

/// `YYYY-MM-DD HH:MM` for a time in ms since the epoch, shifted by
/// `tz_offset_min` (JavaScript's `getTimezoneOffset`: minutes *behind* UTC).
pub fn format_when(ms: f64, tz_offset_min: f64) -> String {
    if !ms.is_finite() || ms <= 0.0 {
        return "—".into();
    }
    let local_min = (ms / 60_000.0).floor() as i64 - tz_offset_min.round() as i64;
    let days = local_min.div_euclid(1440);
    let mins = local_min.rem_euclid(1440);
    // Civil date from days since 1970-01-01 (proleptic Gregorian).
    let z = days + 719_468;
    let era = z.div_euclid(146_097);
    let doe = z.rem_euclid(146_097);
    let yoe = (doe - doe / 1460 + doe / 36_524 - doe / 146_096) / 365;
    let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    let mp = (5 * doy + 2) / 153;
    let d = doy - (153 * mp + 2) / 5 + 1;
    let m = if mp < 10 { mp + 3 } else { mp - 9 };
    let y = yoe + era * 400 + i64::from(m <= 2);
    format!("{y:04}-{m:02}-{d:02} {:02}:{:02}", mins / 60, mins % 60)
}

// ---------------------------------------------------------------------------
// Page glue
// ---------------------------------------------------------------------------

/// How serious a notice is.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum NoticeKind {
    /// Done as asked.
    Info,
    /// Needs attention, nothing lost.
    Warn,
    /// Refused or failed.
    Error,
}

/// A button offered with a notice.
#[derive(Debug, Clone, PartialEq)]
pub enum NoticeAction {
    /// Put a deleted design back.
    UndoDelete {
        /// Storage id.
        id: String,
        /// The deleted design.
        design: Box<Design>,
    },
    /// Another tab saved the open design; choose what to keep.
    Conflict {
        /// Storage id.
        id: String,
    },
    /// Bring back the draft set aside by a share link.
    RestorePrevious,
}

/// A message shown in the designs panel.
#[derive(Debug, Clone, PartialEq)]
pub struct Notice {
    /// Counter id (for dismissing).
    pub id: u64,
    /// Seriousness.
    pub kind: NoticeKind,
    /// Text.
    pub text: String,
    /// Offered action.
    pub action: Option<NoticeAction>,
}

/// The saved design the page has open.
#[derive(Debug, Clone, PartialEq)]
pub struct OpenRef {
    /// Storage id.
    pub id: String,
    /// The stored version it started from.
    pub saved: Design,
}

/// Designs-panel state, provided as context by [`init`].
#[derive(Debug, Clone, Copy)]
pub struct Store {
    /// Page state.
    pub state: AppState,
    /// Saved designs, newest first.
    pub list: RwSignal<Vec<Summary>>,
    /// The saved design being edited.
    pub open: RwSignal<Option<OpenRef>>,
    /// Messages.
    pub notices: RwSignal<Vec<Notice>>,
    /// Storage can be used.
    pub available: RwSignal<bool>,
    /// Embed or read-only view: the draft is neither read nor written.
    pub ephemeral: bool,
    /// Bumped when the store changes the working design's name (rename, save
    /// with a cleaned name) so the name field re-reads it.
    pub name_rev: RwSignal<u64>,
    next_notice: StoredValue<u64>,
    autosave_failing: StoredValue<bool>,
}

fn now_ms() -> f64 {
    js_sys::Date::now()
}

fn tz_offset_min() -> f64 {
    js_sys::Date::new_0().get_timezone_offset()
}

/// `format_when` in the browser's time zone.
pub fn local_when(ms: f64) -> String {
    format_when(ms, tz_offset_min())
}

impl Store {
    fn new(state: AppState, ephemeral: bool) -> Self {
        Self {
            state,
            list: RwSignal::new(Vec::new()),
            open: RwSignal::new(None),
            notices: RwSignal::new(Vec::new()),
            available: RwSignal::new(true),
            ephemeral,
            name_rev: RwSignal::new(0),
            next_notice: StoredValue::new(1),
            autosave_failing: StoredValue::new(false),
        }
    }

    /// Show a message (newest first, at most five kept).
    pub fn notify(&self, kind: NoticeKind, text: impl Into<String>, action: Option<NoticeAction>) {
        let id = self.next_notice.get_value();
        self.next_notice.set_value(id + 1);
        let text = text.into();
        self.notices.update(|n| {
            // A repeated message replaces its older copy instead of stacking.
            n.retain(|x| x.text != text || x.action.is_some());
            n.insert(
                0,
                Notice {
                    id,
                    kind,
                    text,
                    action,
                },
            );
            n.truncate(5);
        });
    }

    /// Remove a message.
    pub fn dismiss(&self, id: u64) {
        self.notices.update(|n| n.retain(|x| x.id != id));
    }

    fn kv(&self) -> Option<LocalStore> {
        match LocalStore::open() {
            Ok(kv) => {
                self.available.set(true);
                Some(kv)
            }
            Err(e) => {
                if self.available.get_untracked() {
                    self.notify(NoticeKind::Error, e.to_string(), None);
                }
                self.available.set(false);
                None
            }
        }
    }

    fn fail(&self, e: &StoreError) {
        if matches!(e, StoreError::Unavailable(_)) {
            self.available.set(false);
        }
        self.notify(NoticeKind::Error, e.to_string(), None);
    }

    /// The working design differs from the saved version it was opened from
    /// (always true for a design never saved).
    pub fn dirty(&self) -> bool {
        let open = self.open.get();
        self.state.design.with(|d| match &open {
            Some(o) => !same_content(&o.saved, d),
            None => true,
        })
    }

    fn report_quarantine(&self, q: &[Quarantined]) {
        for item in q {
            let place = match &item.moved_to {
                Some(k) => format!("It was kept aside unchanged under the storage key “{k}”."),
                None => "Storage is too full to move it aside; it was left in place and skipped."
                    .to_string(),
            };
            self.notify(
                NoticeKind::Warn,
                format!(
                    "One saved entry could not be read and was left out ({}). {place} The other designs are fine.",
                    item.reason
                ),
                None,
            );
        }
    }

    /// Re-read the saved designs. `repair` at start-up only (see [`scan`]).
    pub fn refresh(&self, repair: bool) {
        let Some(mut kv) = self.kv() else {
            return;
        };
        match scan(&mut kv, repair, now_ms()) {
            Ok(s) => {
                self.report_quarantine(&s.quarantined);
                if s.recovered > 0 {
                    self.notify(
                        NoticeKind::Info,
                        format!(
                            "{} saved design(s) missing from the list were found and listed again.",
                            s.recovered
                        ),
                        None,
                    );
                }
                self.list.set(s.summaries());
            }
            Err(e) => self.fail(&e),
        }
    }

    fn after_saved(&self, id: String, design: Design) {
        let saved_at = design.saved_at_ms;
        let name = design.name.clone();
        self.open.set(Some(OpenRef { id, saved: design }));
        let renamed = self.state.design.with_untracked(|d| d.name != name);
        self.state.design.update(|d| {
            d.saved_at_ms = saved_at;
            d.name = name;
        });
        if renamed {
            self.name_rev.update(|r| *r += 1);
        }
    }

    /// Save the working design: over the open saved design, or as a new one.
    pub fn save(&self, as_new: bool) {
        if let Some(why) = crate::state::unsaved_reason(&self.state) {
            self.notify(NoticeKind::Error, why, None);
            return;
        }
        let Some(mut kv) = self.kv() else {
            return;
        };
        let mut design = self.state.design.get_untracked();
        let target = match (as_new, self.open.get_untracked()) {
            (false, Some(o)) => SaveTarget::Existing {
                id: o.id,
                base_saved_at_ms: o.saved.saved_at_ms,
            },
            (true, Some(o)) => {
                // "Save as new" under the open design's own name: name it a copy.
                if clean_name(&design.name) == o.saved.name {
                    let names: Vec<String> = self
                        .list
                        .get_untracked()
                        .into_iter()
                        .map(|s| s.name)
                        .collect();
                    design.name = copy_name(&design.name, &names);
                }
                SaveTarget::New
            }
            (_, None) => SaveTarget::New,
        };
        self.save_to(&mut kv, &target, design);
    }

    fn save_to(&self, kv: &mut LocalStore, target: &SaveTarget, design: Design) {
        let mut design = design;
        if matches!(target, SaveTarget::New) {
            design.saved_at_ms = 0.0;
        }
        match save_design(kv, target, &design, now_ms()) {
            Ok(SaveOutcome::Saved {
                id,
                design,
                recreated,
            }) => {
                let extra = if recreated {
                    " (it had been deleted in another tab, so it was stored again)"
                } else {
                    ""
                };
                self.notify(
                    NoticeKind::Info,
                    format!("Saved “{}” in this browser{extra}.", design.name),
                    None,
                );
                self.after_saved(id, design);
                self.refresh(false);
            }
            Ok(SaveOutcome::Conflict { id, theirs }) => {
                self.notify(
                    NoticeKind::Warn,
                    format!(
                        "“{}” was saved in another tab or window at {}, after you opened it here. \
                         Nothing was overwritten. Choose what to keep:",
                        theirs.name,
                        local_when(theirs.saved_at_ms)
                    ),
                    Some(NoticeAction::Conflict { id }),
                );
            }
            Err(e) => self.fail(&e),
        }
    }

    /// Conflict answer: overwrite the other tab's version with ours.
    pub fn resolve_overwrite(&self, id: &str) {
        if let Some(mut kv) = self.kv() {
            let design = self.state.design.get_untracked();
            self.save_to(&mut kv, &SaveTarget::Overwrite { id: id.into() }, design);
        }
    }

    /// Conflict answer: keep theirs, save ours as a new design.
    pub fn resolve_copy(&self) {
        if let Some(mut kv) = self.kv() {
            let mut design = self.state.design.get_untracked();
            let names: Vec<String> = self
                .list
                .get_untracked()
                .into_iter()
                .map(|s| s.name)
                .collect();
            design.name = copy_name(&design.name, &names);
            self.save_to(&mut kv, &SaveTarget::New, design);
        }
    }

    /// Open a saved design (replaces the working design).
    pub fn open_design(&self, id: &str) {
        let Some(kv) = self.kv() else {
            return;
        };
        match read_design(&kv, id) {
            Ok(d) => {
                self.open.set(Some(OpenRef {
                    id: id.to_string(),
                    saved: d.clone(),
                }));
                self.state.load(d);
            }
            Err(e) => {
                self.fail(&e);
                self.refresh(false);
            }
        }
    }

    /// Rename a saved design.
    pub fn rename(&self, id: &str, name: &str) {
        let Some(mut kv) = self.kv() else {
            return;
        };
        let open = self.open.get_untracked().filter(|o| o.id == id);
        // Was the open version the latest stored one? Then the renamed entry
        // becomes the new base; if not, keep the old base so the next save
        // still reports the other tab's newer version.
        let open_is_latest = open.as_ref().is_some_and(|o| {
            read_design(&kv, id).is_ok_and(|b| b.saved_at_ms <= o.saved.saved_at_ms)
        });
        match rename_design(&mut kv, id, name, now_ms()) {
            Ok(d) => {
                if let Some(o) = open {
                    let saved = if open_is_latest {
                        d.clone()
                    } else {
                        Design {
                            name: d.name.clone(),
                            ..o.saved
                        }
                    };
                    self.open.set(Some(OpenRef {
                        id: id.to_string(),
                        saved,
                    }));
                    let name = d.name.clone();
                    self.state.design.update(|w| w.name = name);
                    self.name_rev.update(|r| *r += 1);
                }
                self.refresh(false);
            }
            Err(e) => self.fail(&e),
        }
    }

    /// Duplicate a saved design.
    pub fn duplicate(&self, id: &str) {
        let Some(mut kv) = self.kv() else {
            return;
        };
        match duplicate_design(&mut kv, id, now_ms()) {
            Ok((_, d)) => {
                self.notify(
                    NoticeKind::Info,
                    format!("Saved a copy: “{}”.", d.name),
                    None,
                );
                self.refresh(false);
            }
            Err(e) => self.fail(&e),
        }
    }

    /// Delete a saved design, offering undo.
    pub fn delete(&self, id: &str) {
        let Some(mut kv) = self.kv() else {
            return;
        };
        match delete_design(&mut kv, id) {
            Ok(Some(d)) => {
                if self.open.get_untracked().is_some_and(|o| o.id == id) {
                    self.open.set(None);
                }
                self.notify(
                    NoticeKind::Info,
                    format!("Deleted “{}”.", d.name),
                    Some(NoticeAction::UndoDelete {
                        id: id.to_string(),
                        design: Box::new(d),
                    }),
                );
                self.refresh(false);
            }
            Ok(None) => self.refresh(false),
            Err(e) => self.fail(&e),
        }
    }

    /// Put a deleted design back.
    pub fn undo_delete(&self, id: &str, d: &Design) {
        let Some(mut kv) = self.kv() else {
            return;
        };
        match undo_delete(&mut kv, id, d) {
            Ok(()) => {
                // Deleting the open design unlinked it; undoing links it again.
                let relink = self.open.with_untracked(Option::is_none)
                    && self.state.design.with_untracked(|w| same_content(w, d));
                if relink {
                    self.open.set(Some(OpenRef {
                        id: id.to_string(),
                        saved: d.clone(),
                    }));
                }
                self.notify(NoticeKind::Info, format!("Restored “{}”.", d.name), None);
                self.refresh(false);
            }
            Err(e) => self.fail(&e),
        }
    }

    /// Every readable saved design, in list order.
    pub fn all_saved(&self) -> Vec<Design> {
        let Some(mut kv) = self.kv() else {
            return Vec::new();
        };
        scan(&mut kv, false, now_ms())
            .map(|s| s.designs.into_iter().map(|(_, d)| d).collect())
            .unwrap_or_default()
    }

    /// Import a file's text: refuse a bad file with its reason, changing nothing.
    pub fn import_text(&self, file_name: &str, text: &str) {
        let designs = match parse_import(text) {
            Ok(d) => d,
            Err(why) => {
                self.notify(
                    NoticeKind::Error,
                    format!("“{file_name}” was not imported: {why}. Nothing was changed."),
                    None,
                );
                return;
            }
        };
        let single = designs.len() == 1;
        let Some(mut kv) = self.kv() else {
            // No storage: a single design can still be opened for this session.
            if let (true, Some(d)) = (single, designs.into_iter().next()) {
                self.open.set(None);
                self.state.load(d);
                self.notify(
                    NoticeKind::Warn,
                    "The design was opened but cannot be saved in this browser.",
                    None,
                );
            }
            return;
        };
        match import_designs(&mut kv, &designs, now_ms()) {
            Ok(report) => {
                let added = report.added.len();
                let same = report.already_saved.len();
                let text = match (added, same) {
                    (0, _) => format!(
                        "Every design in “{file_name}” is already saved; nothing was added."
                    ),
                    (a, 0) => format!(
                        "Imported {a} design{} from “{file_name}”.",
                        if a == 1 { "" } else { "s" }
                    ),
                    (a, s) => format!(
                        "Imported {a} design{} from “{file_name}” ({s} already saved, skipped).",
                        if a == 1 { "" } else { "s" }
                    ),
                };
                self.notify(NoticeKind::Info, text, None);
                self.refresh(false);
            }
            Err(e) => self.notify(
                NoticeKind::Error,
                format!("“{file_name}” was not imported: {e} Nothing was changed."),
                None,
            ),
        }
    }

    /// Bring back the draft set aside when a share link was opened.
    pub fn restore_previous(&self) {
        let Some(mut kv) = self.kv() else {
            return;
        };
        match load_draft(&mut kv, PREVIOUS_DRAFT_KEY, now_ms()) {
            Ok(Ok(Some(d))) => {
                self.apply_draft(&kv, d);
                let _ = kv.remove(PREVIOUS_DRAFT_KEY);
                self.notify(NoticeKind::Info, "Your previous work is back.", None);
            }
            Ok(Ok(None)) => self.notify(
                NoticeKind::Warn,
                "There is no previous work to bring back.",
                None,
            ),
            Ok(Err(q)) => self.report_quarantine(&[q]),
            Err(e) => self.fail(&e),
        }
    }

    /// Load a draft, re-linking it to its saved design when that still matches.
    fn apply_draft(&self, kv: &dyn KvStore, draft: Draft) {
        let stored = draft
            .open_id
            .as_deref()
            .and_then(|id| read_design(kv, id).ok());
        let open_id = draft.open_id.clone();
        match (
            open_id,
            external_change(stored, draft.base_saved_at_ms, draft.dirty),
        ) {
            (Some(id), External::Unchanged) => {
                if let Ok(saved) = read_design(kv, &id) {
                    self.open.set(Some(OpenRef { id, saved }));
                }
                self.state.load(draft.design);
            }
            (Some(id), External::Reload(theirs)) => {
                let theirs = *theirs;
                self.open.set(Some(OpenRef {
                    id,
                    saved: theirs.clone(),
                }));
                self.notify(
                    NoticeKind::Info,
                    format!(
                        "“{}” was updated in another tab; showing the newer version.",
                        theirs.name
                    ),
                    None,
                );
                self.state.load(theirs);
            }
            (Some(id), External::Diverged(theirs)) => {
                let theirs = *theirs;
                // Keep the edits; the next save will report the conflict.
                let mut base = theirs.clone();
                base.saved_at_ms = draft.base_saved_at_ms;
                self.open.set(Some(OpenRef { id, saved: base }));
                self.notify(
                    NoticeKind::Warn,
                    format!(
                        "“{}” was saved in another tab since you edited it here. Your unsaved changes are kept; saving will ask what to keep.",
                        theirs.name
                    ),
                    None,
                );
                self.state.load(draft.design);
            }
            (_, _) => {
                self.open.set(None);
                self.state.load(draft.design);
            }
        }
    }

    /// Follow a storage change made by another tab.
    fn on_storage_event(&self, key: Option<String>) {
        match key.as_deref() {
            Some(k) if !k.starts_with(PREFIX) => return,
            Some(DRAFT_KEY) | Some(PREVIOUS_DRAFT_KEY) => return,
            _ => {}
        }
        self.refresh(false);
        let Some(open) = self.open.get_untracked() else {
            return;
        };
        if key
            .as_deref()
            .is_some_and(|k| k != design_key(&open.id) && k != INDEX_KEY)
        {
            return;
        }
        let Some(kv) = self.kv() else {
            return;
        };
        let stored = read_design(&kv, &open.id).ok();
        let dirty = self.dirty();
        match external_change(stored, open.saved.saved_at_ms, dirty) {
            External::Unchanged => {}
            External::Deleted => {
                self.open.set(None);
                self.notify(
                    NoticeKind::Warn,
                    format!(
                        "“{}” was deleted in another tab. It stays on screen here; save it to keep it.",
                        open.saved.name
                    ),
                    None,
                );
            }
            External::Reload(theirs) => {
                let theirs = *theirs;
                self.open.set(Some(OpenRef {
                    id: open.id.clone(),
                    saved: theirs.clone(),
                }));
                let ws = self.state.design.with_untracked(|d| d.workspace);
                let mut shown = theirs.clone();
                shown.workspace = ws;
                self.state.load(shown);
                self.notify(
                    NoticeKind::Info,
                    format!("“{}” was saved in another tab; this tab now shows that version.", theirs.name),
                    None,
                );
            }
            External::Diverged(theirs) => self.notify(
                NoticeKind::Warn,
                format!(
                    "“{}” was saved in another tab at {}. Your unsaved changes here are kept; saving will ask before overwriting.",
                    theirs.name,
                    local_when(theirs.saved_at_ms)
                ),
                None,
            ),
        }
    }

    fn autosave(&self, design: &Design) {
        let open = self.open.get_untracked();
        let draft = Draft {
            design: design.clone(),
            dirty: open
                .as_ref()
                .is_none_or(|o| !same_content(&o.saved, design)),
            base_saved_at_ms: open.as_ref().map_or(0.0, |o| o.saved.saved_at_ms),
            open_id: open.map(|o| o.id),
        };
        let Ok(mut kv) = LocalStore::open() else {
            return;
        };
        match kv.set(DRAFT_KEY, &draft_text(&draft)) {
            Ok(()) => {
                if self.autosave_failing.get_value() {
                    self.autosave_failing.set_value(false);
                    self.notify(
                        NoticeKind::Info,
                        "Automatic keeping of your work has resumed.",
                        None,
                    );
                }
            }
            Err(e) => {
                if !self.autosave_failing.get_value() {
                    self.autosave_failing.set_value(true);
                    let why = match e {
                        StoreError::Full => "browser storage is full".to_string(),
                        other => other.to_string(),
                    };
                    self.notify(
                        NoticeKind::Warn,
                        format!(
                            "Your work can no longer be kept automatically ({why}). It is still on screen; export it or free some space."
                        ),
                        None,
                    );
                }
            }
        }
    }
}

/// The designs-panel state (from [`init`]).
pub fn use_store() -> Option<Store> {
    use_context::<Store>()
}

fn location_parts() -> (String, String, String) {
    let loc = window().location();
    (
        loc.search().unwrap_or_default(),
        loc.hash().unwrap_or_default(),
        loc.href().unwrap_or_default(),
    )
}

/// Drop the fragment from the address bar, so a reload shows the (autosaved)
/// edits instead of the link's original design.
fn forget_fragment(href: &str) {
    if let Ok(history) = window().history() {
        let _ = history.replace_state_with_url(
            &wasm_bindgen::JsValue::NULL,
            "",
            Some(share::strip_fragment(href)),
        );
    }
}

/// Read a share-link fragment: keep the current unsaved draft aside when the
/// link replaces it, report a broken link, and drop the fragment from the
/// address bar (except in embeds, whose reload must show the preset again).
fn open_fragment(
    store: &Store,
    kv: Option<&mut LocalStore>,
    hash: &str,
    href: &str,
) -> Option<Design> {
    match share::decode_link(hash)? {
        Ok(share::LinkDesign { design: d, checked }) => {
            if !checked {
                store.notify(NoticeKind::Info, share::UNCHECKED_NOTE, None);
            }
            if !store.ephemeral {
                if let Some(kv) = kv {
                    if let Ok(Some(text)) = kv.get(DRAFT_KEY) {
                        if parse_draft(&text).is_ok_and(|old| draft_worth_keeping(&old, &d))
                            && kv.set(PREVIOUS_DRAFT_KEY, &text).is_ok()
                        {
                            store.notify(
                                NoticeKind::Info,
                                "Opened the design from the link. Your previous unsaved work was kept aside.",
                                Some(NoticeAction::RestorePrevious),
                            );
                        }
                    }
                }
                forget_fragment(href);
            }
            Some(d)
        }
        Err(why) => {
            store.notify(
                NoticeKind::Error,
                format!("The design in this link could not be opened: {why}."),
                None,
            );
            if !store.ephemeral {
                forget_fragment(href);
            }
            None
        }
    }
}

/// Start-up: URL options, the design to show, autosave and two-tab sync.
///
/// Call once inside the root component, after `provide_context(state)`.
/// Provides the [`Store`] context used by `DesignsPanel`.
///
/// Order: `?embed=1&readonly=1&ws=` set `state.view` and the workspace; the
/// design is the share link's (`#d=`), else the autosaved draft, else the demo.
/// Embed and read-only views never read nor write the draft.
pub fn init(state: AppState) {
    let (search, hash, href) = location_parts();
    let opts: UrlOptions = parse_query(&search);
    state.view.set(ViewOptions {
        embed: opts.embed,
        readonly: opts.readonly,
    });
    let store = Store::new(state, opts.ephemeral());
    provide_context(store);

    let mut kv = match LocalStore::open() {
        Ok(kv) => Some(kv),
        Err(e) => {
            store.available.set(false);
            if !opts.embed {
                store.notify(NoticeKind::Error, e.to_string(), None);
            }
            None
        }
    };

    let shown = open_fragment(&store, kv.as_mut(), &hash, &href);

    let mut draft_to_apply = None;
    if shown.is_none() && !store.ephemeral {
        if let Some(kv) = kv.as_mut() {
            match load_draft(kv, DRAFT_KEY, now_ms()) {
                Ok(Ok(d)) => draft_to_apply = d,
                Ok(Err(q)) => store.report_quarantine(&[q]),
                Err(e) => store.fail(&e),
            }
        }
    }

    if let (Some(d), Some(kv)) = (draft_to_apply, kv.as_ref()) {
        store.apply_draft(kv, d);
    } else {
        let mut d = shown.unwrap_or_else(|| state.design.get_untracked());
        if let Some(ws) = opts.workspace {
            d.workspace = ws;
        }
        state.load(d);
    }
    if let Some(ws) = opts.workspace {
        state.design.update(|d| d.workspace = ws);
    }

    if kv.is_some() {
        store.refresh(true);
    }

    if !store.ephemeral && kv.is_some() {
        Effect::new(move |_| {
            let d = state.design.get();
            store.autosave(&d);
        });
    }

    let _storage = window_event_listener(leptos::ev::storage, move |ev: web_sys::StorageEvent| {
        store.on_storage_event(ev.key());
    });
    // A share link pasted into the address bar of an open page only changes the fragment.
    let _hash = window_event_listener(leptos::ev::hashchange, move |_| {
        let (_, hash, href) = location_parts();
        let mut kv = LocalStore::open().ok();
        if let Some(mut d) = open_fragment(&store, kv.as_mut(), &hash, &href) {
            if let Some(ws) = opts.workspace {
                d.workspace = ws;
            }
            store.open.set(None);
            state.load(d);
        }
    });
}

/// Download `text` as a file (Blob + temporary link; nothing leaves the page).
pub fn download(file_name: &str, text: &str) {
    use wasm_bindgen::JsCast;
    let parts = js_sys::Array::of1(&wasm_bindgen::JsValue::from_str(text));
    let opts = web_sys::BlobPropertyBag::new();
    opts.set_type("application/json");
    let Ok(blob) = web_sys::Blob::new_with_str_sequence_and_options(&parts, &opts) else {
        return;
    };
    let Ok(url) = web_sys::Url::create_object_url_with_blob(&blob) else {
        return;
    };
    let doc = document();
    if let Some(a) = doc
        .create_element("a")
        .ok()
        .and_then(|e| e.dyn_into::<web_sys::HtmlAnchorElement>().ok())
    {
        a.set_href(&url);
        a.set_download(file_name);
        a.set_hidden(true);
        if let Some(body) = doc.body() {
            let _ = body.append_child(&a);
            a.click();
            let _ = body.remove_child(&a);
        }
    }
    set_timeout(
        move || {
            let _ = web_sys::Url::revoke_object_url(&url);
        },
        std::time::Duration::from_secs(30),
    );
}

#[cfg(test)]
#[allow(
    clippy::unwrap_used,
    clippy::expect_used,
    clippy::indexing_slicing,
    clippy::panic
)]
mod tests {
    use super::*;
    use solver::design::demo_design;

    fn named(name: &str, ph: f64) -> Design {
        let mut d = demo_design();
        d.name = name.into();
        d.recipe.target_ph = ph;
        d
    }

    fn saved(kv: &mut MemStore, d: &Design, now: f64) -> (String, Design) {
        match save_design(kv, &SaveTarget::New, d, now) {
            Ok(SaveOutcome::Saved { id, design, .. }) => (id, design),
            other => panic!("save failed: {other:?}"),
        }
    }

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
        assert!(reason.contains("recipe.target_ph"), "{reason}");
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
    fn overwriting_a_newer_save_is_a_conflict() {
        let mut kv = MemStore::default();
        let (id, mine) = saved(&mut kv, &named("Alpha", 7.0), 1000.0);
        // Tab B opens and saves a change.
        let mut theirs = mine.clone();
        theirs.recipe.target_ph = 7.2;
        let target_b = SaveTarget::Existing {
            id: id.clone(),
            base_saved_at_ms: mine.saved_at_ms,
        };
        assert!(matches!(
            save_design(&mut kv, &target_b, &theirs, 2000.0),
            Ok(SaveOutcome::Saved { .. })
        ));
        // Tab A, still on the old base, tries to save: conflict, nothing written.
        let mut edit = mine.clone();
        edit.recipe.target_ph = 6.9;
        let before = kv.map.clone();
        let r = save_design(&mut kv, &target_b, &edit, 3000.0);
        match r {
            Ok(SaveOutcome::Conflict { theirs: t, .. }) => assert_eq!(t.recipe.target_ph, 7.2),
            other => panic!("expected conflict, got {other:?}"),
        }
        assert_eq!(kv.map, before);
        // The user chooses to overwrite.
        let r = save_design(
            &mut kv,
            &SaveTarget::Overwrite { id: id.clone() },
            &edit,
            2500.0,
        );
        match r {
            Ok(SaveOutcome::Saved { design, .. }) => {
                assert_eq!(design.recipe.target_ph, 6.9);
                assert!(design.saved_at_ms > 2000.0, "save times only move forward");
            }
            other => panic!("{other:?}"),
        }
    }

    #[test]
    fn saving_the_same_base_twice_is_not_a_conflict() {
        let mut kv = MemStore::default();
        let (id, d) = saved(&mut kv, &named("Alpha", 7.0), 1000.0);
        let t = SaveTarget::Existing {
            id: id.clone(),
            base_saved_at_ms: d.saved_at_ms,
        };
        let r = save_design(&mut kv, &t, &d, 1000.0);
        match r {
            Ok(SaveOutcome::Saved {
                design, recreated, ..
            }) => {
                assert!(!recreated);
                assert_eq!(design.saved_at_ms, 1001.0);
            }
            other => panic!("{other:?}"),
        }
    }

    #[test]
    fn saving_over_a_deleted_design_recreates_it() {
        let mut kv = MemStore::default();
        let (id, d) = saved(&mut kv, &named("Alpha", 7.0), 1000.0);
        let _ = delete_design(&mut kv, &id);
        let t = SaveTarget::Existing {
            id: id.clone(),
            base_saved_at_ms: d.saved_at_ms,
        };
        assert!(matches!(
            save_design(&mut kv, &t, &d, 2000.0),
            Ok(SaveOutcome::Saved {
                recreated: true,
                ..
            })
        ));
        assert_eq!(scan(&mut kv, true, 3000.0).map(|s| s.designs.len()), Ok(1));
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

    #[test]
    fn export_import_round_trip_exactly() {
        let mut kv = MemStore::default();
        saved(&mut kv, &named("Alpha", 7.0), 1000.0);
        saved(&mut kv, &named("Beta µ", 7.25), 2000.5);
        let all: Vec<Design> = scan(&mut kv, true, 3000.0)
            .map(|s| s.designs.into_iter().map(|(_, d)| d).collect())
            .unwrap_or_default();
        let file = export_many(&all);
        let back = parse_import(&file).unwrap_or_default();
        assert_eq!(back, all);
        // Into a fresh browser: same designs, same order, same file again.
        let mut fresh = MemStore::default();
        let rep = import_designs(&mut fresh, &back, 5000.0).unwrap_or_default();
        assert_eq!(rep.added.len(), 2);
        let again: Vec<Design> = scan(&mut fresh, true, 6000.0)
            .map(|s| s.designs.into_iter().map(|(_, d)| d).collect())
            .unwrap_or_default();
        assert_eq!(export_many(&again), file);
        // Importing the same file again adds nothing.
        let rep = import_designs(&mut fresh, &back, 7000.0).unwrap_or_default();
        assert!(rep.added.is_empty());
        assert_eq!(rep.already_saved.len(), 2);
        // A single design file.
        let one = parse_import(&export_one(&named("Solo", 8.0))).unwrap_or_default();
        assert_eq!(one.first().map(|d| d.name.as_str()), Some("Solo"));
    }

    #[test]
    fn bad_import_files_are_refused_with_a_reason() {
        let e = parse_import("hello").unwrap_err();
        assert!(e.contains("not JSON"), "{e}");
        let e = parse_import("{\"format\":\"bufferwright-designs\",\"schema\":1,\"designs\":[]}")
            .unwrap_err();
        assert!(e.contains("no designs"), "{e}");
        let good = named("Good", 7.0);
        let mut bad = named("Bad", 7.0);
        bad.recipe.target_ph = 15.0;
        // A collection with one bad design is refused whole, naming it.
        let text = export_many(&[good, bad]);
        let e = parse_import(&text).unwrap_err();
        assert!(
            e.contains("design 2 of 2") && e.contains("recipe.target_ph"),
            "{e}"
        );
        let e = parse_import("{\"schema\":9}").unwrap_err();
        assert!(e.contains("schema"), "{e}");
        let e = parse_import("[1,2]").unwrap_err();
        assert!(e.contains("not a usable design"), "{e}");
    }

    #[test]
    fn import_full_storage_is_all_or_nothing() {
        let mut kv = MemStore::default();
        saved(&mut kv, &named("Alpha", 7.0), 1000.0);
        let one = kv.used();
        kv.quota = Some(one * 2);
        let before = kv.map.clone();
        let designs = vec![named("B", 7.1), named("C", 7.2), named("D", 7.3)];
        let r = import_designs(&mut kv, &designs, 2000.0);
        assert_eq!(r, Err(StoreError::Full));
        assert_eq!(kv.map.get(INDEX_KEY), before.get(INDEX_KEY));
        assert_eq!(scan(&mut kv, false, 3000.0).map(|s| s.designs.len()), Ok(1));
    }

    #[test]
    fn file_names_are_slugs() {
        assert_eq!(
            file_name("Hatchery lab — assay buffer"),
            "hatchery-lab-assay-buffer.bwdesign.json"
        );
        assert_eq!(file_name("   "), "design.bwdesign.json");
    }

    #[test]
    fn draft_round_trip_and_corrupt_draft_quarantined() {
        let mut kv = MemStore::default();
        let d = Draft {
            design: named("Work", 7.1),
            open_id: Some("k1".into()),
            base_saved_at_ms: 5.0,
            dirty: true,
        };
        let _ = kv.set(DRAFT_KEY, &draft_text(&d));
        assert_eq!(load_draft(&mut kv, DRAFT_KEY, 1.0), Ok(Ok(Some(d))));
        let _ = kv.set(DRAFT_KEY, "nonsense");
        let r = load_draft(&mut kv, DRAFT_KEY, 1.0);
        assert!(matches!(r, Ok(Err(Quarantined { .. }))));
        assert!(kv.map.contains_key(&quarantine_key("draft")));
        assert_eq!(load_draft(&mut kv, DRAFT_KEY, 1.0), Ok(Ok(None)));
    }

    #[test]
    fn share_link_keeps_only_drafts_with_work_in_them() {
        let incoming = named("Shared", 6.8);
        let fresh_demo = Draft {
            design: demo_design(),
            open_id: None,
            base_saved_at_ms: 0.0,
            dirty: true,
        };
        assert!(!draft_worth_keeping(&fresh_demo, &incoming));
        let unsaved = Draft {
            design: named("Mine", 7.7),
            ..fresh_demo.clone()
        };
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
    fn external_changes_follow_or_warn() {
        let d = named("A", 7.0);
        let mut newer = d.clone();
        newer.saved_at_ms = 10.0;
        assert_eq!(external_change(None, 5.0, false), External::Deleted);
        assert_eq!(
            external_change(Some(d.clone()), 5.0, false),
            External::Unchanged
        );
        assert_eq!(
            external_change(Some(newer.clone()), 5.0, false),
            External::Reload(Box::new(newer.clone()))
        );
        assert_eq!(
            external_change(Some(newer.clone()), 5.0, true),
            External::Diverged(Box::new(newer))
        );
    }

    #[test]
    fn same_content_ignores_save_time_and_tab() {
        let a = named("A", 7.0);
        let mut b = a.clone();
        b.saved_at_ms = 99.0;
        b.workspace = solver::design::Workspace::Field;
        assert!(same_content(&a, &b));
        b.recipe.target_ph = 7.1;
        assert!(!same_content(&a, &b));
    }

    #[test]
    fn dates_format_in_local_time() {
        // 2026-12-02T04:08:52Z
        let ms = 1_796_184_532_000.0;
        assert_eq!(format_when(ms, 0.0), "2026-12-02 04:08");
        // UTC+2 has getTimezoneOffset -120.
        assert_eq!(format_when(ms, -120.0), "2026-12-02 06:08");
        assert_eq!(format_when(ms, 300.0), "2026-12-01 23:08");
        assert_eq!(format_when(0.0, 0.0), "—");
        assert_eq!(format_when(951_782_400_000.0, 0.0), "2000-02-29 00:00");
    }
}
