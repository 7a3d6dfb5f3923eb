//! Shared page state: the current design (single source of truth for inputs) and view options.

use leptos::prelude::*;
use solver::design::{demo_design, Design};
use std::collections::BTreeSet;

/// How the page is shown (from URL parameters).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub struct ViewOptions {
    /// Compact layout for an iframe (`?embed=1`).
    pub embed: bool,
    /// No editing (`?readonly=1`).
    pub readonly: bool,
}

/// State shared by every component through the Leptos context.
///
/// `design` holds the last *valid* value of every input. Input fields keep
/// their own raw text; when a design is replaced from outside (opened from
/// storage, imported, share link) the loader bumps `revision` and every field
/// re-reads its text from `design`.
#[derive(Debug, Clone, Copy)]
pub struct AppState {
    /// Current design.
    pub design: RwSignal<Design>,
    /// Bumped whenever `design` is replaced wholesale.
    pub revision: RwSignal<u64>,
    /// View options.
    pub view: RwSignal<ViewOptions>,
    /// Ids of the input fields whose typed text is not valid right now (the
    /// design still holds their last valid value, so results that depend on
    /// them are stale and the workspaces say so instead of showing numbers).
    pub pending: RwSignal<BTreeSet<String>>,
}

impl AppState {
    /// New state holding the demo design.
    pub fn new() -> Self {
        Self {
            design: RwSignal::new(demo_design()),
            revision: RwSignal::new(0),
            view: RwSignal::new(ViewOptions::default()),
            pending: RwSignal::new(BTreeSet::new()),
        }
    }

    /// Replace the whole design (load, import, share link) and tell inputs to re-read.
    pub fn load(&self, d: Design) {
        self.design.set(d);
        self.pending.update(BTreeSet::clear);
        self.revision.update(|r| *r += 1);
    }

    /// Record whether the input `id` holds valid text (called from input handlers).
    pub fn mark_field(&self, id: &str, valid: bool) {
        // `try_` forms: a field cleaned up after the page state is gone must not panic.
        let Some(known) = self.pending.try_with_untracked(|p| p.contains(id)) else {
            return;
        };
        if valid && known {
            self.pending.try_update(|p| p.remove(id));
        } else if !valid && !known {
            self.pending.try_update(|p| p.insert(id.to_string()));
        }
    }

    /// Ids of invalid fields whose id starts with `prefix` (`recipe-`, `mixture-`...).
    pub fn pending_in(&self, prefix: &str) -> Vec<String> {
        self.pending.with(|p| {
            p.iter()
                .filter(|id| id.starts_with(prefix))
                .cloned()
                .collect()
        })
    }
}

impl Default for AppState {
    fn default() -> Self {
        Self::new()
    }
}

/// The state from context (provided by the shell).
pub fn use_app() -> AppState {
    use_context::<AppState>().unwrap_or_default()
}
