//! `bufferwright calibrate`: the fit as text or JSON with the issue's key names, refusals naming the point, the standards table, exit codes.
#![allow(clippy::unwrap_used, clippy::expect_used, clippy::indexing_slicing)]

use std::process::Command;

fn run(args: &[&str]) -> (i32, String, String) {
    let out = Command::new(env!("CARGO_BIN_EXE_bufferwright"))
        .arg("calibrate")
        .args(args)
        .output()
        .unwrap();
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stdout).into_owned(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

/// mV of an electrode at 98.0 % of Nernst and +3.0 mV at pH 7, at 25 °C.
fn mv(ph: f64) -> String {
    let n = solver::meter::nernst_mv_per_ph(25.0);
    format!("{:.4}", 3.0 - 0.98 * n * (ph - 7.0))
}

#[test]
fn json_carries_the_issue_names_and_recovers_the_electrode() {
    let a = format!("phthalate={}", mv(4.005));
    let b = format!("phosphate_1_1={}", mv(6.865));
    let c = format!("borax={}", mv(9.180));
    let (code, out, err) = run(&[
        "--temp",
        "25",
        "--point",
        &a,
        "--point",
        &b,
        "--point",
        &c,
        "--sample-mv",
        &mv(5.5),
        "--json",
    ]);
    assert_eq!(code, 0, "{out}{err}");
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    assert!((v["slope_percent"].as_f64().unwrap() - 98.0).abs() < 0.01);
    assert!((v["mv_at_ph7"].as_f64().unwrap() - 3.0).abs() < 0.01);
    assert!(v["slope_mv_per_ph"].as_f64().unwrap() < 0.0);
    assert!(v["ph_at_0mv"].as_f64().is_some());
    let p = &v["points"][1];
    assert_eq!(p["standard"], "phosphate_1_1");
    assert_eq!(p["ph"], 6.865);
    assert!(p["mv"].is_number() && p["residual_ph"].is_number());
    assert!((v["sample"]["ph"].as_f64().unwrap() - 5.5).abs() < 1e-3);
    assert!(v["sample"]["u95_ph"].as_f64().unwrap() > 0.0);
    assert_eq!(
        v["sample"]["mv"].as_f64().unwrap(),
        mv(5.5).parse::<f64>().unwrap()
    );
    assert_eq!(v["verdicts"].as_array().unwrap().len(), 5);
}

#[test]
fn text_says_slope_offset_and_verdicts() {
    let (code, out, _) = run(&[
        "--temp",
        "25",
        "--point",
        "phosphate_1_1=7.8",
        "--point",
        "phthalate=175.1",
    ]);
    assert_eq!(code, 0, "{out}");
    assert!(out.contains("Nernst slope 59.16 mV/pH"), "{out}");
    assert!(
        out.contains("98.9 % of Nernst") && out.contains("mV at pH 7"),
        "{out}"
    );
    assert!(out.contains("pass slope"), "{out}");
}

#[test]
fn a_failed_verdict_exits_3() {
    // 93 % of Nernst: fitted, but below the common-practice 95 %.
    let n = solver::meter::nernst_mv_per_ph(25.0) * 0.93;
    let a = format!("phosphate_1_1={}", -n * (6.865 - 7.0));
    let b = format!("borax={}", -n * (9.18 - 7.0));
    let (code, out, _) = run(&["--temp", "25", "--point", &a, "--point", &b]);
    assert_eq!(code, 3, "{out}");
    assert!(out.contains("FAIL slope 93.0 %"), "{out}");
}

#[test]
fn refusals_name_the_point_and_exit_1() {
    let (code, _, err) = run(&["--temp", "25", "--point", "borax=-126"]);
    assert_eq!(code, 1);
    assert!(
        err.contains("calibration.points") && err.contains("at least two"),
        "{err}"
    );
    let (code, _, err) = run(&[
        "--temp",
        "25",
        "--point",
        "citrate=190",
        "--point",
        "phthalate=176",
    ]);
    assert_eq!(code, 1);
    assert!(
        err.contains("calibration.points[1].standard") && err.contains("ill-defined"),
        "{err}"
    );
    let (code, _, err) = run(&[
        "--temp",
        "25",
        "--point",
        "phosphate_1_1=7",
        "--point",
        "borax=2500",
    ]);
    assert_eq!(code, 1);
    assert!(err.contains("calibration.points[1].mv"), "{err}");
    let (code, _, err) = run(&[
        "--temp",
        "10",
        "--point",
        "tartrate=200",
        "--point",
        "borax=-126",
    ]);
    assert_eq!(code, 1);
    assert!(
        err.contains("tartrate") && err.contains("25 to 50"),
        "{err}"
    );
    let (code, _, err) = run(&[
        "--temp",
        "25",
        "--point",
        "phosphate_1_1=7",
        "--point",
        "borax=-60",
    ]);
    assert_eq!(code, 1);
    assert!(
        err.contains("% of Nernst") && err.contains("borax"),
        "{err}"
    );
}

#[test]
fn usage_errors_exit_2() {
    assert_eq!(run(&["--point", "borax=1"]).0, 2);
    assert_eq!(run(&["--temp", "warm"]).0, 2);
    assert_eq!(run(&["--temp", "25", "--point", "borax"]).0, 2);
    assert_eq!(run(&["--temp", "25", "--frobnicate"]).0, 2);
    let (code, out, _) = run(&["--help"]);
    assert_eq!(code, 0);
    assert!(out.contains("--sample-mv"));
}

#[test]
fn standards_table_at_a_temperature() {
    let (code, out, _) = run(&["--temp", "10", "--standards"]);
    assert_eq!(code, 0, "{out}");
    assert!(
        out.contains("phosphate_1_1") && out.contains("6.923"),
        "{out}"
    );
    assert!(
        out.contains("tartrate") && out.contains("published 25 to 50"),
        "{out}"
    );
    let (code, out, _) = run(&["--temp", "37", "--standards", "--json"]);
    assert_eq!(code, 0);
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    assert_eq!(v.as_array().unwrap().len(), 9);
    assert_eq!(v[6]["id"], "borax");
    assert_eq!(v[6]["ph"], 9.088);
}
