//! The command-line entry reports the meter reading and the concentrate of a bench-workflow document.
#![allow(
    clippy::unwrap_used,
    clippy::expect_used,
    clippy::indexing_slicing,
    clippy::panic
)]

use std::io::Write;
use std::process::{Command, Stdio};

fn run(args: &[&str], stdin: &str) -> (i32, String, String) {
    let mut child = Command::new(env!("CARGO_BIN_EXE_bufferwright"))
        .args(args)
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    child
        .stdin
        .take()
        .unwrap()
        .write_all(stdin.as_bytes())
        .unwrap();
    let out = child.wait_with_output().unwrap();
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stdout).into_owned(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

fn bench_document() -> String {
    let path = format!("{}/examples/titrate.json", env!("CARGO_MANIFEST_DIR"));
    let mut v: serde_json::Value =
        serde_json::from_str(&std::fs::read_to_string(path).unwrap()).unwrap();
    v["recipe"]["prepare_temperature_c"] = 37.0.into();
    v["recipe"]["concentrate_factor"] = 5.0.into();
    v.to_string()
}

#[test]
fn json_output_has_the_meter_and_the_concentrate() {
    let (code, out, err) = run(&["-"], &bench_document());
    assert_eq!(code, 0, "{err}");
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    let r = &v["recipe"]["Ok"];
    assert!((r["equilibrium"]["ph"].as_f64().unwrap() - 8.0).abs() < 1e-6);
    assert_eq!(r["meter"]["temperature_c"].as_f64(), Some(37.0));
    let meter = r["meter"]["ph"].as_f64().unwrap();
    // Tris reads lower when warmer (Bates & Hetzer 1961; see bench_workflow.rs).
    assert!(meter < 7.9, "{meter}");
    assert_eq!(r["concentrate"]["factor"].as_f64(), Some(5.0));
    assert!(r["concentrate"]["ph"].as_f64().is_some());
    assert!(r["concentrate"]["ionic_strength"].as_f64().unwrap() > 0.0);
    let steps = r["steps"].as_array().unwrap();
    let last = steps.last().unwrap().as_str().unwrap();
    assert!(last.contains("dilute 1 + 4 with water"), "{last}");
}

#[test]
fn table_output_prints_the_meter_reading() {
    let (code, out, err) = run(&["--table", "-"], &bench_document());
    assert_eq!(code, 0, "{err}");
    let line = out
        .lines()
        .find(|l| l.contains("meter reads"))
        .unwrap_or_else(|| panic!("{out}"));
    assert!(line.contains("at 37.0 °C"), "{line}");
    assert!(out.contains("concentrate    5×"), "{out}");
    assert!(out.contains("automatic temperature compensation"), "{out}");
}

#[test]
fn a_document_with_a_typo_in_a_bench_field_is_refused() {
    let bad = bench_document().replace("prepare_temperature_c", "prepare_temprature_c");
    let (code, _, err) = run(&["-"], &bad);
    assert_eq!(code, 1);
    assert!(
        err.contains("recipe.prepare_temprature_c: unknown field"),
        "{err}"
    );
}

#[test]
fn the_bench_example_gives_its_target_meter_and_concentrate() {
    let path = format!(
        "{}/examples/bench-concentrate.json",
        env!("CARGO_MANIFEST_DIR")
    );
    let text = std::fs::read_to_string(path).unwrap();
    let (code, out, err) = run(&["-"], &text);
    assert_eq!(code, 0, "{err}");
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    let r = &v["recipe"]["Ok"];
    assert!((r["equilibrium"]["ph"].as_f64().unwrap() - 7.4).abs() < 1e-6);
    assert_eq!(r["meter"]["temperature_c"].as_f64(), Some(22.0));
    // Made cooler than it is used, Tris reads higher (Bates & Hetzer 1961).
    assert!(r["meter"]["ph"].as_f64().unwrap() > 7.4);
    assert_eq!(r["concentrate"]["factor"].as_f64(), Some(10.0));
    let nacl = r["ingredients"]
        .as_array()
        .unwrap()
        .iter()
        .find(|i| i["formula"] == "NaCl")
        .unwrap();
    // 0.15 M × 10 in 0.5 L.
    assert!((nacl["mol"].as_f64().unwrap() - 0.75).abs() < 1e-12);
}
