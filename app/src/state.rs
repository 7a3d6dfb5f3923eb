//! Shared page state: the current design (single source of truth for inputs) and view options.

use leptos::prelude::*;
use solver::document::{demo_design, Design, Workspace};
use std::collections::{BTreeMap, BTreeSet};

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
    /// Text typed into fields of a workspace that is not on screen (tab
    /// switch), by field id: it comes back when the tab does, and while it is
    /// invalid the field stays in `pending`, so nothing is silently restored.
    pub parked: RwSignal<BTreeMap<String, Parked>>,
    /// A decimal comma (`7,4`) was typed somewhere in this entry: `1.000` is
    /// then as ambiguous as `1,000`.
    pub decimal_comma: RwSignal<bool>,
    /// Stable keys of the rows of every list (salts, flask components and
    /// additions), see [`crate::widgets::rows`]: a row's fields are named by
    /// its key, never by its position.
    pub rows: StoredValue<crate::widgets::rows::RowLists>,
    /// The field that had the focus when it was rebuilt (id, selection),
    /// taken back by the field of the same id (see `NumberField`).
    pub refocus: StoredValue<Option<(String, u32, u32)>>,
    /// Whether the recipe's forms follow the target (`Some(true)`) or were
    /// picked by hand (`Some(false)`); `None` right after a design is loaded,
    /// until the recipe workspace decides from the loaded forms.
    pub forms_follow: RwSignal<Option<bool>>,
    /// False from the page's start until it has painted once: plots and the
    /// print-only sheet wait for it, so the first frame shows the inputs and
    /// the headline answer without their drawing and text measuring
    /// (see [`AppState::after_first_paint`]). True wherever no page starts
    /// (component tests, a state made on its own).
    pub painted: RwSignal<bool>,
    /// The meter bench's calibration rows: stable row ids (position = the
    /// point's index), tagged with the `revision` they belong to; kept here so
    /// a row keeps its id (and its typed text) across tab switches.
    pub meter_rows: RwSignal<(u64, Vec<u64>)>,
    /// What was typed into the reagent editor when it was closed without
    /// adding the reagent: kept for the page's life (across tabs and both
    /// pickers) until the user continues or discards it. One at a time:
    /// (what is typed, what the editor opened with).
    pub unfinished_reagent: RwSignal<
        Option<(
            crate::reagents::model::EditorModel,
            crate::reagents::model::EditorModel,
        )>,
    >,
}

/// Text typed into a field that went off screen, with the unit it was typed
/// in (the key of the field's unit choice; empty for a field without one):
/// a number never comes back in another unit than it was typed in.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Parked {
    /// The text as typed.
    pub text: String,
    /// Key of the unit it was typed in.
    pub unit: String,
}

/// The workspace an input field belongs to, from its id prefix.
pub fn workspace_of(field_id: &str) -> Option<Workspace> {
    let prefix = field_id.split('-').next().unwrap_or_default();
    match prefix {
        "recipe" => Some(Workspace::Recipe),
        "mixture" | "whatif" => Some(Workspace::Mixture),
        "plot" | "species" => Some(Workspace::Species),
        "field" => Some(Workspace::Field),
        "meter" => Some(Workspace::Meter),
        _ => None,
    }
}

impl AppState {
    /// New state holding the demo design.
    pub fn new() -> Self {
        Self {
            design: RwSignal::new(demo_design()),
            revision: RwSignal::new(0),
            view: RwSignal::new(ViewOptions::default()),
            pending: RwSignal::new(BTreeSet::new()),
            parked: RwSignal::new(BTreeMap::new()),
            decimal_comma: RwSignal::new(false),
            rows: StoredValue::new(crate::widgets::rows::RowLists::default()),
            refocus: StoredValue::new(None),
            forms_follow: RwSignal::new(None),
            painted: RwSignal::new(true),
            meter_rows: RwSignal::new((u64::MAX, vec![])),
            unfinished_reagent: RwSignal::new(None),
        }
    }

    /// Hold back the work that waits for the first paint ([`AppState::painted`])
    /// until the browser has painted the page once: an animation frame, then a
    /// zero-delay timer queued in it (it runs after that frame is painted).
    pub fn after_first_paint(&self) {
        let painted = self.painted;
        painted.set(false);
        request_animation_frame(move || {
            set_timeout(
                move || {
                    let _ = painted.try_set(true);
                },
                std::time::Duration::ZERO,
            );
        });
    }

    /// Replace the whole design (load, import, share link) and tell inputs to re-read.
    pub fn load(&self, d: Design) {
        self.design.set(d);
        self.pending.update(BTreeSet::clear);
        self.parked.update(BTreeMap::clear);
        self.decimal_comma.set(false);
        self.forms_follow.set(None);
        self.rows
            .update_value(crate::widgets::rows::RowLists::reset);
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

    /// A field is going away with the text typed into it (`None` when it
    /// showed the design's value). The text is parked under the field's id
    /// with its unit: a field that comes back (tab switch, view rebuilt)
    /// takes it again with its pending mark, so nothing typed is silently
    /// replaced. Row fields are named by their row's stable key, so a removed
    /// row's text never lands in another row; a field that does not come
    /// back (row removed, method changed) is forgotten once the page has
    /// redrawn.
    pub fn field_gone(&self, id: &str, typed: Option<Parked>) {
        let active = self.design.try_with_untracked(|d| d.workspace);
        let off_screen = active.is_some() && workspace_of(id) != active;
        match typed {
            Some(t) => {
                self.parked.try_update(|p| p.insert(id.to_string(), t));
                if !off_screen {
                    let app = *self;
                    let id = id.to_string();
                    set_timeout(move || app.sweep(&id), std::time::Duration::ZERO);
                }
            }
            None if !off_screen => self.mark_field(id, true),
            None => {}
        }
    }

    /// Forget parked text that no field took back after a redraw.
    fn sweep(&self, id: &str) {
        let active = self.design.try_with_untracked(|d| d.workspace);
        if active.is_some() && workspace_of(id) != active {
            return; // its tab went away meanwhile: keep it for the tab's return
        }
        if self.parked.try_update(|p| p.remove(id)).flatten().is_some() {
            self.mark_field(id, true);
        }
    }

    /// Text parked for `id` by [`AppState::field_gone`], taken back by the field.
    pub fn take_parked(&self, id: &str) -> Option<Parked> {
        self.parked.try_update(|p| p.remove(id)).flatten()
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

/// Why the current design must not be saved now: fields whose text is not a
/// valid value (the design still holds their previous value, so saving would
/// store something other than what is on screen). Names the fields by their
/// visible labels.
pub fn unsaved_reason(state: &AppState) -> Option<String> {
    let bad: Vec<String> = state
        .pending
        .with_untracked(|p| p.iter().cloned().collect());
    if bad.is_empty() {
        return None;
    }
    let names: Vec<String> = bad.iter().map(|id| field_label(id)).collect();
    Some(format!(
        "Not saved: correct the marked field{} first ({}). What is on screen is not what would be saved.",
        if names.len() == 1 { "" } else { "s" },
        names.join(", ")
    ))
}

/// The visible label of the input `id` (from the page), or the id itself.
fn field_label(id: &str) -> String {
    web_sys::window()
        .and_then(|w| w.document())
        .and_then(|d| {
            d.query_selector(&format!("label[for=\"{id}\"]"))
                .ok()
                .flatten()
        })
        .and_then(|l| l.text_content())
        .map(|t| t.trim().to_string())
        .filter(|t| !t.is_empty())
        .unwrap_or_else(|| id.to_string())
}

/// The state from context (provided by the shell).
pub fn use_app() -> AppState {
    use_context::<AppState>().unwrap_or_default()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn field_ids_belong_to_their_tab() {
        assert_eq!(workspace_of("recipe-ph"), Some(Workspace::Recipe));
        assert_eq!(workspace_of("whatif-dilution"), Some(Workspace::Mixture));
        assert_eq!(
            workspace_of("mixture-comp-0-conc"),
            Some(Workspace::Mixture)
        );
        assert_eq!(workspace_of("plot-lo"), Some(Workspace::Species));
        assert_eq!(workspace_of("field-ph"), Some(Workspace::Field));
        assert_eq!(workspace_of("design-name"), None);
    }
}
