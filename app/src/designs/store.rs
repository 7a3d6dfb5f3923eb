//! The reactive store of the designs panel: [`Store`] (saved list, open design, notices,
//! whether work is kept), the notice and keeping types, and the status line; the plain
//! functions it calls live in the sibling files, which never reach back to the folder root.

use super::address;
use super::conflicts::{copy_name, duplicate_design, save_design, SaveOutcome, SaveTarget};
use super::index::{
    clean_name, delete_design, read_design, rename_design, same_content, scan, summary,
    undo_delete, EntryKind, Quarantined, Summary,
};
use super::kv::{LocalStore, StoreError};
use super::recovery::{list_recovery, RecoveryItem};
use super::rules;
use super::transfer::{import_designs, parse_import};
use super::when::local_when;
use crate::state::AppState;
use leptos::prelude::*;
use solver::document::Design;

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
    /// Bring back one piece of set-aside work.
    RestoreSetAside {
        /// Its storage key.
        key: String,
    },
    /// Put back a Recovery entry that was deleted.
    UndoRecoveryDelete {
        /// Its storage key.
        key: String,
        /// Its text as it was.
        raw: String,
    },
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
    /// Whether this tab's work is being kept automatically.
    pub keeping: RwSignal<Keeping>,
    /// The Recovery section: set-aside work, drafts of closed tabs, damaged entries.
    pub recovery: RwSignal<Vec<RecoveryItem>>,
    /// The design an embed started with (to tell the reader edits are not kept).
    pub preset: RwSignal<Option<Design>>,
    /// This tab's id (its draft is `bufferwright.tabdraft.<tab>`).
    pub(super) tab: StoredValue<String>,
    /// The design opened from a share link, while unchanged.
    pub(super) link_design: StoredValue<Option<Design>>,
    next_notice: StoredValue<u64>,
    /// The address the page is served from, as the user gave it (links and QR codes
    /// start with it); `None`: the page's own address ([`address`]).
    pub page_address: RwSignal<Option<String>>,
}

/// Whether this tab's unsaved work is kept automatically.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum Keeping {
    /// Each change is written to this tab's draft.
    Kept,
    /// The last write failed (the reason, in plain words): nothing is kept.
    Failing(String),
    /// This view never keeps changes (embed, read-only).
    Off,
    /// The working design is one the page's reader would refuse (the reason, in plain
    /// words): it is not written, and the last readable version stays kept.
    Held(String),
}

pub(crate) fn now_ms() -> f64 {
    js_sys::Date::now()
}

impl Store {
    pub(crate) fn new(state: AppState, ephemeral: bool) -> Self {
        Self {
            state,
            list: RwSignal::new(Vec::new()),
            open: RwSignal::new(None),
            notices: RwSignal::new(Vec::new()),
            available: RwSignal::new(true),
            ephemeral,
            name_rev: RwSignal::new(0),
            keeping: RwSignal::new(if ephemeral {
                Keeping::Off
            } else {
                Keeping::Kept
            }),
            recovery: RwSignal::new(Vec::new()),
            preset: RwSignal::new(None),
            tab: StoredValue::new(String::new()),
            link_design: StoredValue::new(None),
            next_notice: StoredValue::new(1),
            page_address: RwSignal::new(if ephemeral { None } else { address::load() }),
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

    pub(crate) fn kv(&self) -> Option<LocalStore> {
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

    pub(crate) fn fail(&self, e: &StoreError) {
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

    pub(crate) fn report_quarantine(&self, q: &[Quarantined]) {
        for item in q {
            let place = match &item.moved_to {
                Some(_) => "It was kept aside unchanged (listed under Recovery below).".to_string(),
                None => "Storage is too full to move it aside; it was left in place and skipped."
                    .to_string(),
            };
            let (what, rest) = match item.kind {
                EntryKind::Saved => ("One saved entry", " The other designs are fine."),
                EntryKind::Index => ("The list of saved designs", ""),
                EntryKind::Draft => ("A draft (unsaved work kept automatically)", ""),
                EntryKind::SetAside => ("A piece of set-aside work", ""),
            };
            self.notify(
                NoticeKind::Warn,
                format!(
                    "{what} could not be read and was left out ({}). {place}{rest}",
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
        self.refresh_recovery(repair);
    }

    /// Re-read the Recovery list (`repair`: move unreadable drafts aside and report them).
    pub fn refresh_recovery(&self, repair: bool) {
        if self.ephemeral {
            return;
        }
        let Ok(mut kv) = LocalStore::open() else {
            return;
        };
        let tab = self.tab.get_value();
        match list_recovery(&mut kv, &tab, now_ms(), repair) {
            Ok((items, bad)) => {
                self.report_quarantine(&bad);
                self.recovery.set(items);
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
        if let Some(why) = self.state.design.with_untracked(rules::document_problem) {
            self.notify(NoticeKind::Error, rules::refusal("saved", &why), None);
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

    /// Open a saved design. The work on screen is set aside first (listed
    /// under Recovery, with a button to bring it back) when it holds anything
    /// found nowhere else; when storage refuses even that, nothing is replaced.
    pub fn open_design(&self, id: &str) {
        let Some(mut kv) = self.kv() else {
            return;
        };
        match read_design(&kv, id) {
            Ok(d) => {
                let current = self.state.design.with_untracked(|w| self.draft_record(w));
                let kept = self.keep_current(
                    &mut kv,
                    Some(current),
                    &d,
                    "replaced when you opened a saved design",
                );
                let name = d.name.clone();
                self.link_design.set_value(None);
                self.open.set(Some(OpenRef {
                    id: id.to_string(),
                    saved: d.clone(),
                }));
                self.state.load(d);
                match kept {
                    Ok(Some(key)) => self.notify(
                        NoticeKind::Info,
                        format!("Opened “{name}”. Your unsaved work was kept aside (see Recovery)."),
                        Some(NoticeAction::RestoreSetAside { key }),
                    ),
                    Ok(None) => {}
                    Err(()) => self.notify(
                        NoticeKind::Warn,
                        format!("Opened “{name}”. Storage is full, so your unsaved work was left where it was kept; it is listed under Recovery."),
                        None,
                    ),
                }
                self.refresh_recovery(false);
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
                // The import returns the whole list: no second read of every design.
                self.list
                    .set(report.listed.iter().map(|(id, d)| summary(id, d)).collect());
                self.refresh_recovery(false);
            }
            Err(e) => self.notify(
                NoticeKind::Error,
                format!("“{file_name}” was not imported: {e} Nothing was changed."),
                None,
            ),
        }
    }
}

/// The status line under the design name. Says the work is kept only while
/// the last automatic write succeeded.
pub fn status_line(open: Option<&OpenRef>, dirty: bool, keeping: &Keeping) -> String {
    let kept = |what: &str| {
        match keeping {
        Keeping::Kept => format!("{what} kept automatically in this browser until you save."),
        Keeping::Failing(why) => format!(
            "{what} NOT kept automatically right now ({why}): save, or export it to a file, before closing this tab."
        ),
        Keeping::Off => "This view does not keep changes.".to_string(),
        Keeping::Held(why) => format!(
            "The latest change is NOT kept ({why}); the version before it is. Correct the marked field to keep your work again."
        ),
    }
    };
    match open {
        Some(o) if !dirty => format!(
            "Showing saved design “{}” (saved {}).",
            o.saved.name,
            local_when(o.saved.saved_at_ms)
        ),
        Some(o) => format!(
            "Unsaved changes to “{}”. {}",
            o.saved.name,
            kept("They are")
        ),
        None => format!("Not saved yet. {}", kept("Your work is")),
    }
}

/// The designs-panel state (from [`init`]).
pub fn use_store() -> Option<Store> {
    use_context::<Store>()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_status_line_never_says_work_is_kept_when_a_write_failed() {
        let kept = status_line(None, true, &Keeping::Kept);
        assert!(kept.starts_with("Not saved yet.") && kept.contains("kept automatically"));
        let failing = status_line(
            None,
            true,
            &Keeping::Failing("browser storage is full".into()),
        );
        assert!(
            failing.contains("NOT kept") && failing.contains("storage is full"),
            "{failing}"
        );
        assert!(!failing.contains(" is kept automatically"), "{failing}");
        let o = OpenRef {
            id: "k1".into(),
            saved: solver::document::demo_design(),
        };
        let s = status_line(Some(&o), true, &Keeping::Failing("x".into()));
        assert!(
            s.starts_with("Unsaved changes to") && s.contains("NOT kept"),
            "{s}"
        );
    }
}
