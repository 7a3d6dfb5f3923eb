//! House rules as a test: every source file opens with its `//!` line, no file
//! passes the length limit unless it is on the short allow-list below, and no
//! test is switched off with a should-panic or ignore attribute; the module graph of
//! each crate has no import circles (and in the solver no module imports its ancestor),
//! nothing re-exports a glob or imports `super::*` outside tests, and ARCHITECTURE.md's
//! code map names every source file.
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
    #[expect(clippy::disallowed_methods, reason = "a test binary, not the page")]
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

#[path = "tidy/graph.rs"]
mod graph;

/// One crate's source files under `src/` (without `bin/`), as module path and text.
fn crate_modules(krate: &str) -> Vec<(graph::ModPath, String)> {
    let prefix = format!("{krate}/src/");
    sources()
        .into_iter()
        .filter_map(|(p, t)| {
            let rel = p.strip_prefix(&prefix)?.to_string();
            if rel.starts_with("bin/") || rel == "main.rs" || rel.ends_with("/tests.rs") {
                return None;
            }
            Some((graph::module_of(&rel), t))
        })
        .collect()
}

/// Import circles not yet broken, each with its reason. The test fails when one of them is
/// gone (take it off the list) or a new one appears.
const KNOWN_CIRCLES: &[(&str, &[&str], &str)] = &[];

#[test]
fn no_module_import_circles() {
    for krate in ["solver", "app"] {
        let g = graph::graph(&crate_modules(krate));
        assert!(g.len() > 10, "{krate}: only {} modules read", g.len());
        let circles = graph::circles(&g);
        let known: Vec<Vec<String>> = KNOWN_CIRCLES
            .iter()
            .filter(|(k, _, why)| *k == krate && !why.is_empty())
            .map(|(_, c, _)| c.iter().map(|s| s.to_string()).collect())
            .collect();
        let new: Vec<&Vec<String>> = circles.iter().filter(|c| !known.contains(c)).collect();
        assert!(new.is_empty(), "{krate}: import circles {new:?}");
        let gone: Vec<&Vec<String>> = known.iter().filter(|c| !circles.contains(c)).collect();
        assert!(
            gone.is_empty(),
            "{krate}: take these off KNOWN_CIRCLES: {gone:?}"
        );
    }
}

#[test]
fn no_module_imports_its_own_ancestor() {
    for krate in ["solver", "app"] {
        let g = graph::graph(&crate_modules(krate));
        let bad: Vec<String> = g
            .iter()
            .flat_map(|(m, to)| {
                to.iter()
                    .filter(|t| t.len() < m.len() && m.starts_with(t))
                    .map(move |t| format!("{} -> {}", graph::name(m), graph::name(t)))
            })
            .collect();
        assert!(bad.is_empty(), "{krate}: imports that run back up: {bad:?}");
    }
}

#[test]
fn the_graph_reader_sees_a_circle() {
    let files = vec![
        (graph::module_of("a/mod.rs"), "pub use b::X;\n".to_string()),
        (
            graph::module_of("a/b.rs"),
            "use super::{Y, c::Z};\nfn f() { crate::d::g(); }\n".to_string(),
        ),
        (graph::module_of("a/c.rs"), String::new()),
        (graph::module_of("d.rs"), "// crate::a::b\n".to_string()),
    ];
    let g = graph::graph(&files);
    assert_eq!(
        graph::circles(&g),
        vec![vec!["a".to_string(), "a::b".to_string()]]
    );
    let b = g
        .get(&graph::module_of("a/b.rs"))
        .cloned()
        .unwrap_or_default();
    assert!(b.contains(&graph::module_of("a/c.rs")) && b.contains(&graph::module_of("d.rs")));
    assert!(g
        .get(&graph::module_of("d.rs"))
        .is_some_and(|e| e.is_empty()));
}

#[test]
fn no_glob_reexports_and_no_glob_imports_outside_tests() {
    let mut bad = Vec::new();
    for (p, t) in sources().into_iter().filter(|(p, _)| p.contains("/src/")) {
        if p.ends_with("/tests.rs") {
            continue;
        }
        for line in t.lines() {
            let l = line.trim();
            if l.starts_with("#[cfg(test)]") {
                break;
            }
            let glob_reexport = l.starts_with("pub") && l.contains(" use ") && l.ends_with("::*;");
            if glob_reexport || l == "use super::*;" {
                bad.push(format!("{p}: {l}"));
            }
        }
    }
    assert!(bad.is_empty(), "glob imports outside tests: {bad:?}");
}

#[test]
fn architecture_names_every_source_file() {
    let map = fs::read_to_string(root().join("ARCHITECTURE.md")).unwrap_or_default();
    let lines: Vec<&str> = map.lines().collect();
    let mut missing = Vec::new();
    for (p, _) in sources() {
        let Some((krate, rel)) = p.split_once("/src/") else {
            continue;
        };
        let parts: Vec<&str> = rel.split('/').collect();
        let Some((file, dirs)) = parts.split_last() else {
            continue;
        };
        let wanted = if *file == "mod.rs" {
            format!("{}/", dirs.last().copied().unwrap_or(""))
        } else {
            (*file).to_string()
        };
        let covered = (0..=dirs.len()).any(|k| {
            let dir = dirs
                .get(..k)
                .unwrap_or(&[])
                .iter()
                .fold(format!("{krate}/src/"), |acc, d| format!("{acc}{d}/"));
            lines
                .iter()
                .any(|l| l.contains(&dir) && (l.contains(&wanted) || wanted == "/"))
        });
        if !covered {
            missing.push(p);
        }
    }
    assert!(
        missing.is_empty(),
        "not named in ARCHITECTURE.md's code map: {missing:?}"
    );
}
