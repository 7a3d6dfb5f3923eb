//! `bufferwright uncertainty` prints the budgets of a design as JSON or a table.
#![allow(clippy::unwrap_used, clippy::expect_used, clippy::indexing_slicing)]

use std::io::Write;
use std::process::{Command, Stdio};

fn run(args: &[&str], stdin: Option<&str>) -> (i32, String, String) {
    let mut child = Command::new(env!("CARGO_BIN_EXE_bufferwright"))
        .args(args)
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    if let Some(s) = stdin {
        // The command may refuse its arguments before it reads stdin.
        let _ = child.stdin.take().unwrap().write_all(s.as_bytes());
    } else {
        drop(child.stdin.take());
    }
    let out = child.wait_with_output().unwrap();
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stdout).into_owned(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

#[test]
fn demo_design_budgets_as_json_and_table() {
    let (_, demo, _) = run(&["--demo"], None);
    let (code, out, err) = run(&["uncertainty", "-"], Some(&demo));
    assert_eq!(code, 0, "{err}");
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    let u = v["recipe"]["Ok"]["u95_ph"].as_f64().unwrap();
    assert!(u > 0.005 && u < 0.1, "{u}");
    assert!(v["mixture"]["Ok"]["budget"].as_array().unwrap().len() > 3);
    assert_eq!(v["field"]["Ok"]["species"].as_array().unwrap().len(), 2);
    let (code, out, err) = run(&["uncertainty", "--table", "-"], Some(&demo));
    assert_eq!(code, 0, "{err}");
    assert!(
        out.contains("Recipe: U95 = ±") && out.contains("pK2 of Phosphate"),
        "{out}"
    );
}

#[test]
fn inputs_file_is_read_and_checked() {
    let (_, demo, _) = run(&["--demo"], None);
    let dir = std::env::temp_dir().join(format!("bw-unc-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let good = dir.join("good.json");
    std::fs::write(&good, r#"{"balance_mg": 0.1, "temperature_k": 0.1}"#).unwrap();
    let (code, out, err) = run(
        &["uncertainty", "--inputs", good.to_str().unwrap(), "-"],
        Some(&demo),
    );
    assert_eq!(code, 0, "{err}");
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    assert_eq!(v["inputs"]["balance_mg"], 0.1);
    let bad = dir.join("bad.json");
    std::fs::write(&bad, r#"{"balance_mg": -3}"#).unwrap();
    let (code, _, err) = run(
        &["uncertainty", "--inputs", bad.to_str().unwrap(), "-"],
        Some(&demo),
    );
    assert_eq!(code, 1);
    assert!(err.contains("uncertainty.balance_mg"), "{err}");
    let unknown = dir.join("unknown.json");
    std::fs::write(&unknown, r#"{"balanse_mg": 1}"#).unwrap();
    let (code, _, err) = run(
        &["uncertainty", "--inputs", unknown.to_str().unwrap(), "-"],
        Some(&demo),
    );
    assert_eq!(code, 1, "{err}");
    let _ = std::fs::remove_dir_all(&dir);
    let (code, _, _) = run(&["uncertainty", "--bogus"], None);
    assert_eq!(code, 2);
}

#[test]
fn a_design_carries_its_own_uncertainty_inputs() {
    let (_, demo, _) = run(&["--demo"], None);
    assert!(
        !demo.contains("\"uncertainty\""),
        "defaults are not written"
    );
    let mut v: serde_json::Value = serde_json::from_str(&demo).unwrap();
    v["uncertainty"] = serde_json::json!({"balance_mg": 0.1, "flask_ml": 0.5});
    let (code, out, err) = run(&["uncertainty", "-"], Some(&v.to_string()));
    assert_eq!(code, 0, "{err}");
    let r: serde_json::Value = serde_json::from_str(&out).unwrap();
    assert_eq!(r["inputs"]["balance_mg"], 0.1);
    assert_eq!(r["inputs"]["flask_ml"], 0.5);
    // The ordinary report still reads the document.
    let (code, _, err) = run(&["-"], Some(&v.to_string()));
    assert_eq!(code, 0, "{err}");
    // Unknown keys and bad values are refused with the path.
    v["uncertainty"] = serde_json::json!({"balanse_mg": 0.1});
    let (code, _, err) = run(&["-"], Some(&v.to_string()));
    assert_eq!(code, 1);
    assert!(
        err.contains("uncertainty") && err.contains("balanse_mg"),
        "{err}"
    );
    v["uncertainty"] = serde_json::json!({"temperature_k": -1.0});
    let (code, _, err) = run(&["-"], Some(&v.to_string()));
    assert_eq!(code, 1);
    assert!(err.contains("uncertainty.temperature_k"), "{err}");
}
