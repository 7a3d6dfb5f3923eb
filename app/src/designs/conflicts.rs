//! Between tabs: saving over a design another tab saved since (a conflict for the user), and following changes made elsewhere.

use super::index::{
    clean_name, design_key, ids_for_write, new_id, put, quarantine, read_design, scan,
};
use super::kv::{KvStore, StoreError};
use solver::document::{parse_design, Design, SCHEMA_VERSION};

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

#[cfg(test)]
mod tests {
    use super::super::testkit::{named, saved};
    use super::*;
    use crate::designs::index::same_content;
    use crate::designs::index::{delete_design, scan};
    use crate::designs::kv::MemStore;

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
        b.workspace = solver::document::Workspace::Field;
        assert!(same_content(&a, &b));
        b.recipe.target_ph = 7.1;
        assert!(!same_content(&a, &b));
    }
}
