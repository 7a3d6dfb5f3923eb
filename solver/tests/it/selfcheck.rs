//! The native suite runs the same self-check list the page and the CLI run: every case must pass.
//!
//! Provenance of each case (published value, source, status, tolerance) is in
//! the case itself (`solver::selfcheck::cases`) and in tests/README.md.
#![allow(clippy::unwrap_used, clippy::expect_used, clippy::indexing_slicing)]

use solver::selfcheck::{cases, exit_code, run_case, run_self_check, to_csv, Status};
use std::collections::BTreeSet;

#[test]
fn every_self_check_case_passes() {
    let mut failures = Vec::new();
    for case in cases() {
        let r = run_case(&case);
        println!(
            "{:<44} published {:.5} computed {:?} tol {}",
            r.id, r.published, r.computed, r.tolerance
        );
        if !r.pass {
            failures.push(format!(
                "{}: {:?} vs {} ({:?})",
                r.id, r.computed, r.published, r.error
            ));
        }
    }
    assert!(failures.is_empty(), "{failures:#?}");
}

#[test]
fn ids_are_unique_and_every_case_names_its_source() {
    let list = cases();
    let ids: BTreeSet<_> = list.iter().map(|c| c.id.clone()).collect();
    assert_eq!(ids.len(), list.len());
    for c in &list {
        assert!(!c.source.is_empty(), "{}", c.id);
        assert!(c.tolerance > 0.0 && c.tolerance.is_finite(), "{}", c.id);
        // A "from memory" value must carry a tolerance a small slip does not break.
        if c.status == Status::FromMemory {
            assert!(c.tolerance >= 0.005, "{}", c.id);
        }
    }
}

#[test]
fn every_case_is_documented_in_the_tests_readme() {
    let readme = include_str!("../README.md");
    for c in cases() {
        assert!(
            readme.contains(&format!("`{}`", c.id)),
            "{} is missing from tests/README.md",
            c.id
        );
    }
}

#[test]
fn the_list_covers_what_it_promises() {
    let ids: Vec<String> = cases().into_iter().map(|c| c.id).collect();
    for want in [
        "ph_standard_khp_25c",
        "ph_standard_kh2_citrate_25c",
        "ph_standard_phosphate_equimolal_25c",
        "ph_standard_phosphate_physiological_25c",
        "ph_standard_borax_25c",
        "ph_standard_carbonate_25c",
        "dilute_hcl_1e-8",
        "pkw_0c",
        "pkw_25c",
        "pkw_50c",
        "ammonia_fraction_ph8_0_20c",
        "hocl_fraction_ph7_5_25c",
        "molar_mass_tris",
        "recipe_round_trip_phosphate",
    ] {
        assert!(ids.iter().any(|i| i == want), "{want}");
    }
}

#[test]
fn report_counts_and_csv_agree() {
    let r = run_self_check();
    assert_eq!(r.passed + r.failed, r.cases.len());
    assert_eq!(r.failed, 0);
    assert_eq!(exit_code(&r), 0);
    assert_eq!(r.engine_version, env!("CARGO_PKG_VERSION"));
    let csv = to_csv(&r);
    let lines: Vec<&str> = csv.lines().collect();
    assert_eq!(lines.len(), r.cases.len() + 1);
    assert!(lines[0].starts_with("id,case,published,computed"));
    // Descriptions with commas are quoted, so every data line splits into the header's columns
    // once quoted fields are honoured.
    for l in &lines[1..] {
        let mut cols = 0;
        let mut quoted = false;
        for ch in l.chars() {
            match ch {
                '"' => quoted = !quoted,
                ',' if !quoted => cols += 1,
                _ => {}
            }
        }
        assert_eq!(cols, 9, "{l}");
    }
    // JSON shape the page reads.
    let v = serde_json::to_value(&r).unwrap();
    for key in ["engine_version", "cases", "passed", "failed"] {
        assert!(v.get(key).is_some(), "{key}");
    }
    let row = &v["cases"][0];
    for key in [
        "id",
        "case",
        "published",
        "source",
        "computed",
        "difference",
        "tolerance",
        "pass",
    ] {
        assert!(row.get(key).is_some(), "{key}");
    }
}

#[test]
fn a_failing_case_fails_the_report() {
    let mut r = run_self_check();
    r.cases[0].pass = false;
    r.failed = 1;
    assert_eq!(exit_code(&r), 1);
    // A case pushed outside its tolerance is reported as a failure.
    let mut c = cases().remove(0);
    c.published += 10.0 * c.tolerance;
    assert!(!run_case(&c).pass);
}
