//! The module graph of a crate read from its source text: which module's code names which
//! other module (`use crate::…`, `use super::…`, `crate::x::f(…)` in code), so the tidy test
//! can refuse import circles and imports that run back up to an ancestor.
//!
//! Test code (files named `tests.rs`, and everything from a `#[cfg(test)]` line on) is left
//! out: tests may look anywhere.

use std::collections::{BTreeMap, BTreeSet};

/// A module path inside one crate: `[]` is the crate root, `["field", "limit"]` is `field::limit`.
pub type ModPath = Vec<String>;

/// The module path of a source file given its path under the crate's `src/`
/// (`field/mod.rs` → `field`, `field/limit.rs` → `field::limit`, `lib.rs` → root).
pub fn module_of(rel: &str) -> ModPath {
    let trimmed = rel.trim_end_matches(".rs");
    let mut parts: Vec<String> = trimmed.split('/').map(str::to_string).collect();
    if matches!(
        parts.last().map(String::as_str),
        Some("mod" | "lib" | "main")
    ) {
        parts.pop();
    }
    parts
}

/// Source text without comments, string literals and test code.
fn code_only(text: &str) -> String {
    let mut out = String::new();
    for line in text.lines() {
        let t = line.trim_start();
        if t.starts_with("#[cfg(test)]") {
            break;
        }
        let mut in_str = false;
        let mut prev = ' ';
        let mut kept = String::new();
        let chars: Vec<char> = line.chars().collect();
        let mut i = 0;
        while i < chars.len() {
            let c = chars.get(i).copied().unwrap_or(' ');
            if !in_str && c == '/' && chars.get(i + 1) == Some(&'/') {
                break;
            }
            if c == '"' && prev != '\\' {
                in_str = !in_str;
                kept.push(' ');
            } else if !in_str {
                kept.push(c);
            }
            prev = if prev == '\\' && c == '\\' { ' ' } else { c };
            i += 1;
        }
        out.push_str(&kept);
        out.push('\n');
    }
    out
}

/// Parses one use tree at the start of `s` (`a::b::{c, d::e}` …) into full paths.
fn parse_tree(s: &str, prefix: &[String], out: &mut Vec<Vec<String>>) -> usize {
    let bytes: Vec<char> = s.chars().collect();
    let mut i = 0;
    let mut path: Vec<String> = prefix.to_vec();
    loop {
        while bytes.get(i).is_some_and(|c| c.is_whitespace()) {
            i += 1;
        }
        if bytes.get(i) == Some(&'{') {
            i += 1;
            loop {
                let rest: String = bytes.get(i..).unwrap_or(&[]).iter().collect();
                i += parse_tree(&rest, &path, out);
                while bytes.get(i).is_some_and(|c| c.is_whitespace()) {
                    i += 1;
                }
                match bytes.get(i) {
                    Some(',') => i += 1,
                    Some('}') => {
                        i += 1;
                        break;
                    }
                    _ => break,
                }
                while bytes.get(i).is_some_and(|c| c.is_whitespace()) {
                    i += 1;
                }
                if bytes.get(i) == Some(&'}') {
                    i += 1;
                    break;
                }
            }
            return i;
        }
        let start = i;
        while bytes
            .get(i)
            .is_some_and(|c| c.is_alphanumeric() || *c == '_' || *c == '*')
        {
            i += 1;
        }
        let seg: String = bytes.get(start..i).unwrap_or(&[]).iter().collect();
        if seg.is_empty() {
            out.push(path);
            return i;
        }
        path.push(seg);
        if bytes.get(i) == Some(&':') && bytes.get(i + 1) == Some(&':') {
            i += 2;
        } else {
            out.push(path);
            return i;
        }
    }
}

fn ident_before(text: &str, at: usize) -> bool {
    text.get(..at)
        .and_then(|s| s.chars().next_back())
        .is_some_and(|c| c.is_alphanumeric() || c == '_' || c == ':')
}

/// Every path a file's code names, as written (first segment `crate`, `super`, `self` or a
/// bare name from a `use` line).
pub fn named_paths(text: &str) -> Vec<Vec<String>> {
    let code = code_only(text);
    let mut out = Vec::new();
    for key in ["crate::", "super::", "self::"] {
        let mut from = 0;
        while let Some(k) = code.get(from..).and_then(|s| s.find(key)) {
            let at = from + k;
            from = at + key.len();
            if ident_before(&code, at) {
                continue;
            }
            parse_tree(code.get(at..).unwrap_or(""), &[], &mut out);
        }
    }
    // Relative `use child::…` lines (a parent naming its own child).
    for line in code.lines() {
        let t = line.trim_start();
        let t = t
            .strip_prefix("pub(crate) ")
            .or_else(|| t.strip_prefix("pub(super) "))
            .or_else(|| t.strip_prefix("pub "))
            .unwrap_or(t);
        if let Some(rest) = t.strip_prefix("use ") {
            let first: String = rest
                .chars()
                .take_while(|c| c.is_alphanumeric() || *c == '_')
                .collect();
            if !matches!(first.as_str(), "crate" | "super" | "self" | "") {
                parse_tree(rest, &[], &mut out);
            }
        }
    }
    out
}

/// Resolves a written path from module `from` to the deepest known module it names.
pub fn resolve(from: &[String], path: &[String], modules: &BTreeSet<ModPath>) -> Option<ModPath> {
    let mut abs: Vec<String> = Vec::new();
    let mut rest = path;
    match path.first().map(String::as_str) {
        Some("crate") => rest = path.get(1..).unwrap_or(&[]),
        Some("self") => {
            abs = from.to_vec();
            rest = path.get(1..).unwrap_or(&[]);
        }
        Some("super") => {
            abs = from.to_vec();
            while rest.first().map(String::as_str) == Some("super") {
                abs.pop();
                rest = rest.get(1..).unwrap_or(&[]);
            }
        }
        Some(first) => {
            let mut child = from.to_vec();
            child.push(first.to_string());
            if !modules.contains(&child) {
                return None;
            }
            abs = from.to_vec();
        }
        None => return None,
    }
    let mut best = abs.clone();
    for seg in rest {
        abs.push(seg.clone());
        if modules.contains(&abs) {
            best = abs.clone();
        } else {
            break;
        }
    }
    Some(best)
}

/// The crate's module graph: each module and the modules its code names.
pub fn graph(files: &[(ModPath, String)]) -> BTreeMap<ModPath, BTreeSet<ModPath>> {
    let modules: BTreeSet<ModPath> = files.iter().map(|(m, _)| m.clone()).collect();
    let mut g: BTreeMap<ModPath, BTreeSet<ModPath>> = BTreeMap::new();
    for (m, text) in files {
        let edges = g.entry(m.clone()).or_default();
        for p in named_paths(text) {
            if let Some(to) = resolve(m, &p, &modules) {
                if &to != m {
                    edges.insert(to);
                }
            }
        }
    }
    g
}

/// Strongly connected groups of more than one module (the import circles), each sorted.
pub fn circles(g: &BTreeMap<ModPath, BTreeSet<ModPath>>) -> Vec<Vec<String>> {
    let nodes: Vec<&ModPath> = g.keys().collect();
    let reach = |a: &ModPath| -> BTreeSet<ModPath> {
        let mut seen = BTreeSet::new();
        let mut stack = vec![a.clone()];
        while let Some(n) = stack.pop() {
            for next in g.get(&n).into_iter().flatten() {
                if seen.insert(next.clone()) {
                    stack.push(next.clone());
                }
            }
        }
        seen
    };
    let reaches: BTreeMap<&ModPath, BTreeSet<ModPath>> =
        nodes.iter().map(|n| (*n, reach(n))).collect();
    let mut done: BTreeSet<ModPath> = BTreeSet::new();
    let mut out = Vec::new();
    for n in &nodes {
        if done.contains(*n) {
            continue;
        }
        let group: Vec<ModPath> = nodes
            .iter()
            .filter(|m| {
                reaches.get(*n).is_some_and(|r| r.contains(**m))
                    && reaches.get(**m).is_some_and(|r| r.contains(*n))
            })
            .map(|m| (*m).clone())
            .collect();
        if group.len() > 1 {
            done.extend(group.iter().cloned());
            out.push(group.iter().map(|m| name(m)).collect());
        }
    }
    out
}

/// `field::limit`, or `crate` for the root.
pub fn name(m: &[String]) -> String {
    if m.is_empty() {
        "crate".to_string()
    } else {
        m.join("::")
    }
}
