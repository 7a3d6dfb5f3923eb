//! Work kept beside this tab's draft that is not part of the design: the day's log (its text, file and column choices) and an unfinished reagent in the editor; one key per kind and tab (`bufferwright.side.<kind>.<tab>`), carried along when a new tab takes over a closed tab's draft.

use super::kv::{KvStore, LocalStore};
use super::store::Store;
use crate::reagents::model::EditorModel;
use crate::state::AppState;
use leptos::prelude::*;
use std::cell::RefCell;

/// What is typed and what the editor opened with.
type Typed = (EditorModel, EditorModel);

thread_local! {
    /// The reagent editor open on screen right now, when what is typed differs from what it
    /// opened with.
    static OPEN_REAGENT: RefCell<Option<Typed>> = const { RefCell::new(None) };
}

/// Prefix of the side entries' keys.
pub const SIDE_PREFIX: &str = "bufferwright.side.";

/// The kinds of side entries.
pub const SIDE_KINDS: &[&str] = &[DAY_LOG, UNFINISHED_REAGENT];
/// The day's log of the field workspace.
pub const DAY_LOG: &str = "daylog";
/// The reagent editor's unfinished reagent.
pub const UNFINISHED_REAGENT: &str = "reagent";

/// Key of the side entry `kind` of tab `tab`.
pub fn side_key(kind: &str, tab: &str) -> String {
    format!("{SIDE_PREFIX}{kind}.{tab}")
}

/// Move every side entry of tab `from` to tab `to` (a new tab took over a closed tab's
/// draft). An entry that cannot be written stays under its old key.
pub fn move_side(kv: &mut dyn KvStore, from: &str, to: &str) {
    for kind in SIDE_KINDS {
        let old = side_key(kind, from);
        if let Ok(Some(text)) = kv.get(&old) {
            if kv.set(&side_key(kind, to), &text).is_ok() {
                let _ = kv.remove(&old);
            }
        }
    }
}

impl Store {
    /// This tab's side entry `kind` (`None` in views that keep nothing).
    pub fn side_get(&self, kind: &str) -> Option<String> {
        if self.ephemeral {
            return None;
        }
        let kv = LocalStore::open().ok()?;
        kv.get(&side_key(kind, &self.tab.get_value()))
            .ok()
            .flatten()
    }

    /// Keep this tab's side entry `kind`; `false` when storage refused it.
    pub fn side_set(&self, kind: &str, text: &str) -> bool {
        if self.ephemeral {
            return false;
        }
        LocalStore::open()
            .and_then(|mut kv| kv.set(&side_key(kind, &self.tab.get_value()), text))
            .is_ok()
    }

    /// Forget this tab's side entry `kind`.
    pub fn side_remove(&self, kind: &str) {
        if let Ok(mut kv) = LocalStore::open() {
            let _ = kv.remove(&side_key(kind, &self.tab.get_value()));
        }
    }
}

/// The editor on screen changed (`None`: it closed; what was typed, if anything, is then
/// in [`AppState::unfinished_reagent`]): keep what is typed across a reload.
pub fn set_open_reagent(open: Option<Typed>) {
    OPEN_REAGENT.with(|o| *o.borrow_mut() = open);
    if let Some(store) = super::store::use_store() {
        write_reagent(&store);
    }
}

/// Write this tab's unfinished-reagent entry: the open editor's text, else the reagent
/// left unfinished, else nothing.
fn write_reagent(store: &Store) {
    let current = OPEN_REAGENT
        .with(|o| o.borrow().clone())
        .or_else(|| store.state.unfinished_reagent.get_untracked());
    match current {
        Some(pair) => {
            let _ = store.side_set(
                UNFINISHED_REAGENT,
                &serde_json::to_string(&pair).unwrap_or_default(),
            );
        }
        None => store.side_remove(UNFINISHED_REAGENT),
    }
}

/// Start-up: bring back the reagent this tab left unfinished (offered as "continue"), and
/// keep it from now on whenever it changes.
pub(crate) fn keep_unfinished_reagent(store: Store, state: AppState) {
    if let Some(pair) = store
        .side_get(UNFINISHED_REAGENT)
        .and_then(|t| serde_json::from_str::<Typed>(&t).ok())
    {
        state.unfinished_reagent.set(Some(pair));
    }
    Effect::new(move |_| {
        state.unfinished_reagent.track();
        write_reagent(&store);
    });
}

#[cfg(test)]
#[allow(clippy::unwrap_used)]
mod tests {
    use super::*;
    use crate::designs::kv::MemStore;

    #[test]
    fn side_entries_follow_the_tab_that_takes_over() {
        let mut kv = MemStore::default();
        kv.set(&side_key(DAY_LOG, "old"), "log").unwrap();
        kv.set(&side_key(UNFINISHED_REAGENT, "old"), "r").unwrap();
        move_side(&mut kv, "old", "new");
        assert_eq!(
            kv.get(&side_key(DAY_LOG, "new")).unwrap().as_deref(),
            Some("log")
        );
        assert_eq!(
            kv.get(&side_key(UNFINISHED_REAGENT, "new"))
                .unwrap()
                .as_deref(),
            Some("r")
        );
        assert_eq!(kv.get(&side_key(DAY_LOG, "old")).unwrap(), None);
    }
}
