//! The command line with a CO₂ atmosphere: the design's `atmosphere` keys, the `--co2` flag and their refusals.
#![allow(clippy::unwrap_used, clippy::expect_used, clippy::indexing_slicing)]

use std::process::{Command, Stdio};

fn run(args: &[&str]) -> (i32, String, String) {
    let out = Command::new(env!("CARGO_BIN_EXE_bufferwright"))
        .args(args)
        .stdin(Stdio::null())
        .output()
        .unwrap();
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stdout).into_owned(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

fn incubator() -> String {
    format!("{}/examples/incubator.json", env!("CARGO_MANIFEST_DIR"))
}

fn mixture_ph(json: &str) -> f64 {
    let v: serde_json::Value = serde_json::from_str(json).unwrap();
    v["mixture"]["Ok"]["equilibrium"]["ph"].as_f64().unwrap()
}

#[test]
fn a_design_with_atmospheres_reports_the_gas() {
    let (code, out, err) = run(&[&incubator()]);
    assert_eq!(code, 0, "{err}");
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    let recipe = &v["recipe"]["Ok"];
    assert!((recipe["equilibrium"]["ph"].as_f64().unwrap() - 7.4).abs() < 1e-6);
    assert_eq!(recipe["ingredients"][0]["formula"], "NaHCO3");
    let gas = &v["gas"];
    let room = gas["mixture"]["what_if"]["Ok"]["room_air_ph"]
        .as_f64()
        .unwrap();
    assert!(room > mixture_ph(&out) + 1.0, "{room}");
    let at = gas["recipe"]["curve"]["Ok"]["target_co2_percent"]
        .as_f64()
        .unwrap();
    assert!((at - 5.0).abs() < 1e-3, "{at}");
    assert!(gas["field"]["Ok"]["co2_change_mg_l"].as_f64().unwrap() < 0.0);
    let (code, table, _) = run(&["--table", &incubator()]);
    assert_eq!(code, 0);
    assert!(
        table.contains("== CO₂ atmosphere") && table.contains("not computed"),
        "{table}"
    );
}

#[test]
fn the_co2_flag_sets_the_gas_where_there_is_carbonate() {
    let (_, five, _) = run(&[&incubator()]);
    let (code, ten, err) = run(&["--co2", "10%", &incubator()]);
    assert_eq!(code, 0, "{err}");
    assert!(err.contains("recipe, mixture, field"), "{err}");
    assert!(mixture_ph(&ten) < mixture_ph(&five) - 0.2);
    let (code, air, _) = run(&["--co2=420uatm", &incubator()]);
    assert_eq!(code, 0);
    assert!(mixture_ph(&air) > 8.5);
}

#[test]
fn the_co2_flag_is_refused_where_it_changes_nothing() {
    // The demo design holds no carbonate: nothing is added, exit 1.
    let demo = format!("{}/examples/two-forms.json", env!("CARGO_MANIFEST_DIR"));
    let (code, out, err) = run(&["--co2", "5%", &demo]);
    assert_eq!(code, 1);
    assert!(out.is_empty() && err.contains("changes nothing"), "{err}");
    let (code, _, err) = run(&["--co2", "5", &incubator()]);
    assert_eq!(code, 1);
    assert!(err.contains("--co2"), "{err}");
    let (code, _, err) = run(&["--co2", "120%", &incubator()]);
    assert_eq!(code, 1);
    assert!(
        err.contains("co2_percent") || err.contains("--co2"),
        "{err}"
    );
    let (code, _, _) = run(&["--co2"]);
    assert_eq!(code, 2);
}
