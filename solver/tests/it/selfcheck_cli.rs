//! `bufferwright self-check` prints one line per case and a summary, and exits non-zero on failure.
#![allow(clippy::unwrap_used, clippy::expect_used, clippy::indexing_slicing)]

use std::process::Command;

fn run(args: &[&str]) -> (i32, String, String) {
    let out = Command::new(env!("CARGO_BIN_EXE_bufferwright"))
        .args(args)
        .output()
        .unwrap();
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stdout).into_owned(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

#[test]
fn self_check_prints_a_line_per_case_and_exits_zero() {
    let n = solver::selfcheck::cases().len();
    let (code, out, err) = run(&["self-check"]);
    assert_eq!(code, 0, "{out}{err}");
    let lines: Vec<&str> = out.lines().collect();
    assert_eq!(lines.len(), n + 1, "{out}");
    assert!(lines[..n].iter().all(|l| l.starts_with("pass ")), "{out}");
    let summary = lines[n];
    assert!(
        summary.contains(&format!("{n} passed, 0 failed")),
        "{summary}"
    );
}

#[test]
fn self_check_json_and_csv() {
    let (code, out, _) = run(&["self-check", "--json"]);
    assert_eq!(code, 0);
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    assert_eq!(v["failed"], 0);
    assert!(v["cases"].as_array().unwrap().len() > 20);
    let (code, out, _) = run(&["self-check", "--csv"]);
    assert_eq!(code, 0);
    assert!(out.starts_with("id,case,published"));
}

#[test]
fn self_check_usage_error_exits_2() {
    let (code, _, err) = run(&["self-check", "--bogus"]);
    assert_eq!(code, 2);
    assert!(err.contains("unknown option"), "{err}");
}

#[test]
fn the_pure_command_reports_failure_with_a_non_zero_code() {
    // The binary's exit code is `exit_code` of the report; a report with a
    // failing row gives 1.
    let mut r = solver::selfcheck::run_self_check();
    r.cases[0].pass = false;
    r.failed = 1;
    r.passed -= 1;
    assert_eq!(solver::selfcheck::exit_code(&r), 1);
    assert!(solver::selfcheck::to_text(&r).contains("FAIL"));
}
