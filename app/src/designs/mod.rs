//! Saved designs, drafts and recovery in browser local storage: the reactive [`Store`] the page uses (in [`store`]), over plain functions tested natively.
//!
//! Layout of the keys (all values are JSON text):
//!
//! | key                              | value                                             |
//! |----------------------------------|---------------------------------------------------|
//! | `bufferwright.index`             | `{"schema":1,"ids":["k1a2b3",...]}`               |
//! | `bufferwright.design.<id>`       | one solver design document (`solver::document`)     |
//! | `bufferwright.tabdraft.<tab>`    | one tab's working design + which saved design it edits |
//! | `bufferwright.alive.<tab>`       | an open tab's last sign of life (removed on close) |
//! | `bufferwright.setaside.<id>`     | work set aside when a share link replaced it (last ten) |
//! | `bufferwright.quarantine.<id>`   | an entry that could not be read, kept as it was   |
//!
//! Invariants:
//! - each design has its own key, so one unreadable entry cannot hide the others;
//!   an unreadable entry is moved aside (never deleted), reported once and
//!   listed under Recovery until the user deletes it;
//! - a save writes the design entry first and the index second, and removes
//!   the entry again if the index write fails: no half-written save;
//! - before overwriting a saved design, its stored `saved_at_ms` is compared
//!   with the one this page opened; a newer one is a conflict for the user to decide;
//! - each tab autosaves to its own key; work is never replaced without being
//!   set aside first, and the page never says work is kept when a write failed;
//! - everything that decides is a plain function over [`KvStore`], tested
//!   natively with [`MemStore`]; [`LocalStore`] and [`init`] are the page glue.
//!
//! Files: [`kv`] (key-value adapter), [`index`] (saved designs, scan,
//! quarantine), [`conflicts`] (between tabs), [`drafts`] (per-tab drafts,
//! set-aside work), [`recovery`] (the Recovery list, plain reasons),
//! [`transfer`] (import/export), `session` (start-up, autosave, share links),
//! [`panel`] (the designs panel), [`embed`] (URL options and the embed bar), [`store`]
//! (the reactive store and its notices).

pub mod address;
pub mod conflicts;
pub mod drafts;
pub mod embed;
pub mod index;
pub mod kv;
pub mod panel;
pub mod reasons;
pub mod recovery;
pub mod rules;
mod session;
pub mod share;
pub mod side;
pub mod store;
pub mod when;
pub use when::{format_when, local_when};
pub mod transfer;

pub use conflicts::{
    copy_name, duplicate_design, external_change, freshness, save_design, External, Freshness,
    SaveOutcome, SaveTarget,
};
pub use drafts::{
    alive_key, choose_tab_id, closed_drafts, draft_key, draft_text, draft_worth_keeping,
    holds_work, list_set_aside, load_draft, load_stored, mark_alive, mark_closed, migrate_legacy,
    new_tab_id, parse_draft, parse_stored, set_aside, set_aside_key, stored_text, tab_alive,
    ClosedDraft, Draft, DraftFile, SetAside, StoredDraft, ALIVE_EVERY_MS, ALIVE_PREFIX,
    ALIVE_STALE_MS, LEGACY_DRAFT_KEY, LEGACY_PREVIOUS_KEY, MAX_SET_ASIDE, SET_ASIDE_PREFIX,
    TAB_DRAFT_PREFIX, TAB_ID_KEY,
};
pub use index::{
    clean_name, delete_design, design_key, new_id, put, quarantine_key, read_design, rename_design,
    same_content, scan, summary, undo_delete, EntryKind, Quarantined, Scan, Summary, INDEX_KEY,
    MAX_NAME_CHARS, PREFIX, QUARANTINE_PREFIX,
};
pub use kv::{KvStore, LocalStore, MemStore, StoreError};
pub use reasons::{plain_json_reason, plain_reason};
pub use recovery::{damaged_reason, list_recovery, RecoveryItem, RecoveryKind};
pub use session::{download, init};
pub use store::{
    status_line, use_store, Keeping, Notice, NoticeAction, NoticeKind, OpenRef, Store,
};
pub use transfer::{
    export_many, export_one, file_name, import_designs, parse_import, ImportReport,
    COLLECTION_FORMAT, FILE_EXTENSION, MAX_IMPORT_BYTES,
};

#[cfg(test)]
pub(crate) mod testkit {
    //! Helpers shared by the native tests of this folder.
    use super::{save_design, MemStore, SaveOutcome, SaveTarget};
    use solver::document::{demo_design, Design};

    /// The demo design under another name and target pH.
    pub fn named(name: &str, ph: f64) -> Design {
        let mut d = demo_design();
        d.name = name.into();
        d.recipe.target_ph = ph;
        d
    }

    /// Save `d` as a new design.
    pub fn saved(kv: &mut MemStore, d: &Design, now: f64) -> (String, Design) {
        match save_design(kv, &SaveTarget::New, d, now) {
            Ok(SaveOutcome::Saved { id, design, .. }) => (id, design),
            other => panic!("save failed: {other:?}"),
        }
    }
}
