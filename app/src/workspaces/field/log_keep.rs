//! The day's log kept while the page lives and across reloads: its text (pasted, or the file's when small enough), file name and column choices, in memory for workspace switches and in this tab's side entry for a reload; the results are computed again from them, so they are the same numbers.

use crate::designs::side::DAY_LOG;
use crate::designs::use_store;
use serde::{Deserialize, Serialize};
use solver::field::log::Role;
use std::cell::RefCell;

/// Largest log text kept across a reload (characters): browser storage is small and
/// shared with the saved designs. A larger file is kept while the page is open.
pub const KEEP_MAX_CHARS: usize = 1_000_000;

/// What the day's log panel holds.
#[derive(Debug, Clone, Default, PartialEq, Serialize, Deserialize)]
pub struct LogDraft {
    /// The log's name (`pasted-log`, the file's name).
    pub name: String,
    /// The text in the paste box.
    pub pasted: String,
    /// The log that was computed, as text (`None`: none computed, or not kept).
    #[serde(default)]
    pub source: Option<String>,
    /// A log was computed but was too large (or not text) to keep across a reload.
    #[serde(default)]
    pub source_dropped: bool,
    /// The user's column choices: (role key, column header).
    #[serde(default)]
    pub mapping: Vec<(String, String)>,
}

impl LogDraft {
    /// The column choices as the planner takes them.
    pub fn choices(&self) -> Vec<(Role, String)> {
        self.mapping
            .iter()
            .filter_map(|(k, h)| Role::from_key(k).map(|r| (r, h.clone())))
            .collect()
    }

    /// The column choices as kept.
    pub fn set_choices(&mut self, m: &[(Role, String)]) {
        self.mapping = m
            .iter()
            .map(|(r, h)| (r.key().to_string(), h.clone()))
            .collect();
    }

    /// What is kept across a reload: the source only when it is text and small enough.
    fn for_storage(&self) -> LogDraft {
        let mut d = self.clone();
        if d.source
            .as_ref()
            .is_some_and(|s| s.chars().count() > KEEP_MAX_CHARS)
        {
            d.source = None;
            d.source_dropped = true;
        }
        if d.pasted.chars().count() > KEEP_MAX_CHARS {
            d.pasted.clear();
        }
        d
    }
}

thread_local! {
    /// The panel's state for this page's life (with the log's bytes, text or not).
    static LIVE: RefCell<Option<(LogDraft, Vec<u8>)>> = const { RefCell::new(None) };
}

/// The log to show when the panel mounts: this page's own (a workspace switch), else
/// this tab's side entry (a reload), with the bytes to compute.
pub fn restore() -> Option<(LogDraft, Vec<u8>)> {
    if let Some(live) = LIVE.with(|l| l.borrow().clone()) {
        return Some(live);
    }
    let text = use_store()?.side_get(DAY_LOG)?;
    let d: LogDraft = serde_json::from_str(&text).ok()?;
    let bytes = d.source.clone().unwrap_or_default().into_bytes();
    LIVE.with(|l| *l.borrow_mut() = Some((d.clone(), bytes.clone())));
    Some((d, bytes))
}

/// Keep the panel's state (in memory, and in this tab's side entry).
pub fn keep(d: &LogDraft, bytes: &[u8]) {
    LIVE.with(|l| *l.borrow_mut() = Some((d.clone(), bytes.to_vec())));
    if let Some(store) = use_store() {
        let stored = d.for_storage();
        let text = serde_json::to_string(&stored).unwrap_or_default();
        if !store.side_set(DAY_LOG, &text) && stored.source.is_some() {
            // Storage refused the text: keep the choices at least.
            let small = LogDraft {
                source: None,
                source_dropped: true,
                ..stored
            };
            let _ = store.side_set(DAY_LOG, &serde_json::to_string(&small).unwrap_or_default());
        }
    }
}

#[cfg(test)]
#[allow(clippy::unwrap_used)]
mod tests {
    use super::*;

    #[test]
    fn a_large_log_keeps_its_choices_not_its_text() {
        let mut d = LogDraft {
            name: "big.csv".into(),
            source: Some("pH\n7\n".repeat(KEEP_MAX_CHARS / 4)),
            ..LogDraft::default()
        };
        d.set_choices(&[(Role::Ph, "pH".into())]);
        let s = d.for_storage();
        assert!(s.source.is_none() && s.source_dropped);
        assert_eq!(s.choices(), vec![(Role::Ph, "pH".to_string())]);
        let small = LogDraft {
            source: Some("pH\n7\n".into()),
            ..d
        };
        assert_eq!(small.for_storage(), small);
    }
}
