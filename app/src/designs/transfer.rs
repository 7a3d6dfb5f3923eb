//! Files: export one design or all of them, read an import file (validated whole), and import many designs in one pass.

use super::index::{design_key, ids_for_write, scan, sort_newest_first, to_base36, write_index};
use super::kv::{KvStore, StoreError};
use serde::Serialize;
use solver::document::{parse_design_value, to_json, to_json_pretty, Design};
use std::collections::HashSet;

/// `format` value of a file holding several designs.
pub const COLLECTION_FORMAT: &str = "bufferwright-designs";
/// File name ending of exported files ("Bufferwright design file").
pub const FILE_EXTENSION: &str = ".bwdesign.json";
/// Largest file accepted by import (bytes).
pub const MAX_IMPORT_BYTES: usize = 5 * 1024 * 1024;

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
    for c in name.chars().map(|c| c.to_ascii_lowercase()) {
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
        .map_err(|e| {
            format!(
                "the file is not JSON ({})",
                super::reasons::plain_json_reason(&e)
            )
        })?;
    let is_collection = value.get("format").and_then(serde_json::Value::as_str)
        == Some(COLLECTION_FORMAT)
        || (value.get("designs").is_some() && value.get("recipe").is_none());
    if !is_collection {
        return parse_design_value(value)
            .map(|d| vec![d])
            .map_err(|e| format!("not a usable design: {}", super::reasons::plain_reason(&e)));
    }
    // Each element is read once, as the JSON value it already is.
    let list = match value {
        serde_json::Value::Object(mut o) => match o.remove("designs") {
            Some(serde_json::Value::Array(list)) => list,
            _ => return Err("the file has no \"designs\" list".into()),
        },
        _ => return Err("the file has no \"designs\" list".into()),
    };
    if list.is_empty() {
        return Err("the file holds no designs".into());
    }
    let n = list.len();
    list.into_iter()
        .enumerate()
        .map(|(i, v)| {
            parse_design_value(v).map_err(|e| {
                format!(
                    "design {} of {n}: {}",
                    i + 1,
                    super::reasons::plain_reason(&e)
                )
            })
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
    /// Every saved design after the import, newest first (the list, without reading storage again).
    pub listed: Vec<(String, Design)>,
}

/// Save imported designs (skipping ones already saved identically).
///
/// One pass: the saved designs are read once, each new design is written to
/// its own key, and the index is written once at the end (linear in the
/// number of designs). All or nothing: if a write fails, the entries added
/// are removed again and the index is left as it was.
///
/// # Errors
/// Storage errors; storage is as before then.
pub fn import_designs(
    kv: &mut dyn KvStore,
    designs: &[Design],
    now_ms: f64,
) -> Result<ImportReport, StoreError> {
    let existing = scan(kv, false, now_ms)?;
    let mut seen: HashSet<String> = existing.designs.iter().map(|(_, d)| to_json(d)).collect();
    let mut listed = existing.designs;
    let mut index = ids_for_write(kv)?;
    let mut taken: HashSet<String> = index.iter().cloned().collect();
    let base = format!("k{}", to_base36(now_ms.max(0.0) as u64));
    let mut n = 0u32;
    let mut report = ImportReport::default();
    let undo = |kv: &mut dyn KvStore, added: &[String]| {
        for id in added {
            let _ = kv.remove(&design_key(id));
        }
    };
    for d in designs {
        // Serialised once: the same text is the duplicate check and the stored entry.
        let text = to_json(d);
        if seen.contains(&text) {
            report.already_saved.push(d.name.clone());
            continue;
        }
        let mut stored = d.clone();
        let stored_text = if stored.saved_at_ms <= 0.0 {
            stored.saved_at_ms = now_ms;
            to_json(&stored)
        } else {
            text.clone()
        };
        seen.insert(text);
        let id = loop {
            n += 1;
            let candidate = if n == 1 {
                base.clone()
            } else {
                format!("{base}-{n}")
            };
            if taken.contains(&candidate) {
                continue;
            }
            match kv.get(&design_key(&candidate)) {
                Ok(None) => break candidate,
                Ok(Some(_)) => continue,
                Err(e) => {
                    undo(kv, &report.added);
                    return Err(e);
                }
            }
        };
        taken.insert(id.clone());
        if let Err(e) = kv.set(&design_key(&id), &stored_text) {
            undo(kv, &report.added);
            return Err(e);
        }
        index.push(id.clone());
        report.added.push(id.clone());
        listed.push((id, stored));
    }
    if !report.added.is_empty() {
        if let Err(e) = write_index(kv, &index) {
            undo(kv, &report.added);
            return Err(e);
        }
    }
    sort_newest_first(&mut listed);
    report.listed = listed;
    Ok(report)
}

#[cfg(test)]
mod tests {
    use super::super::testkit::{named, saved};
    use super::*;
    use crate::designs::index::{scan, INDEX_KEY};
    use crate::designs::kv::MemStore;

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
        // The list it returns is what a scan reads.
        assert_eq!(
            rep.listed,
            scan(&mut fresh, false, 5500.0).unwrap_or_default().designs
        );
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
            e.contains("design 2 of 2") && e.contains("the Recipe, target pH"),
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
}
