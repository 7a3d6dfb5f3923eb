//! House rules as a test: every source file opens with its `//!` line, no file
//! passes the length limit unless it is on the short allow-list below, and no
//! test is switched off with a should-panic or ignore attribute.
//!
//! It lives in the solver crate because the page crate's tests also run on
//! wasm32, where there is no file system; it checks both crates.

use std::fs;
use std::path::{Path, PathBuf};

/// Longest a source file may be, in lines.
const MAX_LINES: usize = 800;

/// Files allowed past [`MAX_LINES`], each with its reason.
const LONG_FILES: &[(&str, &str)] = &[
    // Data table: 25 acid systems with their constants, forms and sources.
    (
        "solver/src/system/library.rs",
        "the reagent library is a data table",
    ),
];

fn root() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR"))
        .parent()
        .map(Path::to_path_buf)
        .unwrap_or_default()
}

fn rust_files(dir: &Path, out: &mut Vec<PathBuf>) {
    let Ok(entries) = fs::read_dir(dir) else {
        return;
    };
    for e in entries.flatten() {
        let p = e.path();
        if p.is_dir() {
            rust_files(&p, out);
        } else if p.extension().is_some_and(|x| x == "rs") {
            out.push(p);
        }
    }
}

fn sources() -> Vec<(String, String)> {
    let root = root();
    let mut files = Vec::new();
    for dir in [
        "solver/src",
        "solver/tests",
        "solver/benches",
        "app/src",
        "app/tests",
    ] {
        rust_files(&root.join(dir), &mut files);
    }
    files.sort();
    files
        .into_iter()
        .map(|p| {
            let rel = p
                .strip_prefix(&root)
                .unwrap_or(&p)
                .to_string_lossy()
                .replace('\\', "/");
            let text = fs::read_to_string(&p).unwrap_or_default();
            (rel, text)
        })
        .collect()
}

#[test]
fn the_tidy_check_sees_both_crates() {
    let files = sources();
    assert!(files.iter().any(|(p, _)| p == "solver/src/lib.rs"));
    assert!(files.iter().any(|(p, _)| p == "app/src/lib.rs"));
    assert!(files.len() > 30, "only {} files found", files.len());
}

#[test]
fn every_source_file_opens_with_its_purpose() {
    let bad: Vec<String> = sources()
        .into_iter()
        .filter(|(_, t)| !t.trim_start().starts_with("//!"))
        .map(|(p, _)| p)
        .collect();
    assert!(bad.is_empty(), "files without a leading //! line: {bad:?}");
}

#[test]
fn no_source_file_passes_the_length_limit() {
    let bad: Vec<String> = sources()
        .into_iter()
        .filter(|(p, _)| p.contains("/src/"))
        .filter(|(p, _)| !LONG_FILES.iter().any(|(f, _)| f == p))
        .filter_map(|(p, t)| {
            let n = t.lines().count();
            (n > MAX_LINES).then(|| format!("{p}: {n} lines"))
        })
        .collect();
    assert!(bad.is_empty(), "over {MAX_LINES} lines: {bad:?}");
}

#[test]
fn the_allow_list_names_only_long_files_that_exist() {
    let files = sources();
    for (f, why) in LONG_FILES {
        assert!(!why.is_empty());
        let text = files.iter().find(|(p, _)| p == f).map(|(_, t)| t);
        assert!(
            text.is_some(),
            "{f} is on the allow-list but does not exist"
        );
    }
}

#[test]
fn no_test_is_switched_off() {
    // Spelled in two parts so this file does not match itself.
    let banned = [concat!("#[should", "_panic"), concat!("#[ign", "ore")];
    let bad: Vec<String> = sources()
        .into_iter()
        .filter(|(_, t)| banned.iter().any(|b| t.contains(b)))
        .map(|(p, _)| p)
        .collect();
    assert!(bad.is_empty(), "switched-off tests in: {bad:?}");
}
