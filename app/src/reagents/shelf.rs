//! The per-browser reagent shelf: one storage key per reagent (the reagent file's JSON) over the
//! designs' key-value adapter, read back through the solver's reagent-file check; unreadable
//! entries are set aside and reported, a full store is reported and nothing is half-written.
//!
//! Same approach as the saved designs (`designs::index`): one write per reagent (a single
//! key is written whole or not at all), the copy set aside before the bad entry leaves its
//! place, storage errors returned to the caller to show.

use crate::designs::kv::{KvStore, StoreError};
use solver::document::reagent::{parse_reagent, reagent_to_json, Reagent};

/// Prefix of the shelf's keys.
pub const SHELF_PREFIX: &str = "bufferwright.reagent.";
/// Prefix under which unreadable shelf entries are kept as they were.
pub const SHELF_ASIDE_PREFIX: &str = "bufferwright.reagent-aside.";

/// Shelf id of a reagent: `system.<id>` or `form.<system>.<form id>`.
pub fn shelf_id(r: &Reagent) -> String {
    match r {
        Reagent::System(s) => format!("system.{}", s.id),
        Reagent::Form(f) => format!("form.{}.{}", f.system, f.form.id),
    }
}

/// What the shelf holds.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Shelf {
    /// Readable reagents with their shelf ids, by name.
    pub reagents: Vec<(String, Reagent)>,
    /// Entries set aside during this read: (shelf id, key kept under, reason).
    pub set_aside: Vec<(String, Option<String>, String)>,
}

/// Read the shelf; with `repair`, unreadable entries are moved aside (copy
/// first, then the entry is removed) and listed in [`Shelf::set_aside`].
///
/// # Errors
/// Storage unusable.
pub fn read_shelf(kv: &mut dyn KvStore, repair: bool) -> Result<Shelf, StoreError> {
    let mut out = Shelf::default();
    let mut keys = kv.keys()?;
    solver::order::sort_by(&mut keys, Ord::cmp);
    for key in keys {
        let Some(id) = key.strip_prefix(SHELF_PREFIX) else {
            continue;
        };
        let Some(text) = kv.get(&key)? else { continue };
        match parse_reagent(&text) {
            Ok(r) if shelf_id(&r) == id => out.reagents.push((id.to_string(), r)),
            other => {
                let reason = match other {
                    Err(e) => e.to_string(),
                    Ok(_) => "stored under another reagent's name".to_string(),
                };
                if repair {
                    let aside = format!("{SHELF_ASIDE_PREFIX}{id}");
                    let moved = kv.set(&aside, &text).ok().map(|()| aside);
                    if moved.is_some() {
                        let _ = kv.remove(&key);
                    }
                    out.set_aside.push((id.to_string(), moved, reason));
                }
            }
        }
    }
    solver::order::sort_by(&mut out.reagents, |a, b| {
        a.1.name()
            .to_ascii_lowercase()
            .cmp(&b.1.name().to_ascii_lowercase())
    });
    Ok(out)
}

/// Put a reagent on the shelf (replacing the one with the same shelf id).
///
/// # Errors
/// [`StoreError::Full`] and others: nothing was written.
pub fn put_reagent(kv: &mut dyn KvStore, r: &Reagent) -> Result<String, StoreError> {
    let id = shelf_id(r);
    kv.set(&format!("{SHELF_PREFIX}{id}"), &reagent_to_json(r))?;
    Ok(id)
}

/// Take a reagent off the shelf.
///
/// # Errors
/// Storage unusable.
pub fn remove_reagent(kv: &mut dyn KvStore, id: &str) -> Result<(), StoreError> {
    kv.remove(&format!("{SHELF_PREFIX}{id}"))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::designs::kv::MemStore;
    use solver::system::library::find_system;
    use solver::system::AcidSystem;

    fn mine() -> Reagent {
        Reagent::System(AcidSystem {
            id: "user_my_acetate".into(),
            name: "My acetate".into(),
            ..find_system("acetate").unwrap().clone()
        })
    }

    #[test]
    fn put_read_remove() {
        let mut kv = MemStore::default();
        let id = put_reagent(&mut kv, &mine()).unwrap();
        assert_eq!(id, "system.user_my_acetate");
        let shelf = read_shelf(&mut kv, true).unwrap();
        assert_eq!(shelf.reagents, vec![(id.clone(), mine())]);
        remove_reagent(&mut kv, &id).unwrap();
        assert!(read_shelf(&mut kv, true).unwrap().reagents.is_empty());
    }

    #[test]
    fn damaged_entries_are_set_aside_and_reported() {
        let mut kv = MemStore::default();
        put_reagent(&mut kv, &mine()).unwrap();
        kv.set(
            "bufferwright.reagent.system.broken",
            "{\"bufferwright_reagent\": 1, \"reagent\": {\"system\": 5}}",
        )
        .unwrap();
        let shelf = read_shelf(&mut kv, true).unwrap();
        assert_eq!(shelf.reagents.len(), 1);
        assert_eq!(shelf.set_aside.len(), 1);
        assert_eq!(
            shelf.set_aside[0].1.as_deref(),
            Some("bufferwright.reagent-aside.system.broken")
        );
        assert!(kv
            .get("bufferwright.reagent.system.broken")
            .unwrap()
            .is_none());
        assert!(kv
            .get("bufferwright.reagent-aside.system.broken")
            .unwrap()
            .is_some());
        // Read again: nothing more to set aside.
        assert!(read_shelf(&mut kv, true).unwrap().set_aside.is_empty());
    }

    #[test]
    fn a_full_store_writes_nothing() {
        let mut kv = MemStore {
            quota: Some(50),
            ..MemStore::default()
        };
        assert_eq!(put_reagent(&mut kv, &mine()), Err(StoreError::Full));
        assert!(kv.keys().unwrap().is_empty());
    }
}
