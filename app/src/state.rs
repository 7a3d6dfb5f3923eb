//! Shared page state: the current design (single source of truth for inputs) and view options.

use leptos::prelude::*;
use solver::design::{demo_design, Design};

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
}

impl AppState {
    /// New state holding the demo design.
    pub fn new() -> Self {
        Self {
            design: RwSignal::new(demo_design()),
            revision: RwSignal::new(0),
            view: RwSignal::new(ViewOptions::default()),
        }
    }

    /// Replace the whole design (load, import, share link) and tell inputs to re-read.
    pub fn load(&self, d: Design) {
        self.design.set(d);
        self.revision.update(|r| *r += 1);
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
