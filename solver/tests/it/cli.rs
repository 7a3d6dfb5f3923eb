//! The command-line entry answers design documents for each recipe method and a mixture.
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
        child.stdin.take().unwrap().write_all(s.as_bytes()).unwrap();
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

fn example(name: &str) -> String {
    format!("{}/examples/{name}", env!("CARGO_MANIFEST_DIR"))
}

#[test]
fn each_method_example_gives_a_recipe_at_target() {
    for (file, target) in [
        ("two-forms.json", 7.4),
        ("titrate.json", 8.0),
        ("two-stocks.json", 4.8),
    ] {
        let (code, out, err) = run(&[&example(file)], None);
        assert_eq!(code, 0, "{file}: {err}");
        let v: serde_json::Value = serde_json::from_str(&out).unwrap();
        let ph = v["recipe"]["Ok"]["equilibrium"]["ph"].as_f64().unwrap();
        assert!((ph - target).abs() < 1e-6, "{file}: {ph}");
        assert!(v["mixture"]["Ok"]["equilibrium"]["ph"].as_f64().is_some());
        assert!(v["field"]["Ok"]["species"].as_array().unwrap().len() == 2);
    }
}

#[test]
fn table_output_from_stdin() {
    let (_, demo, _) = run(&["--demo"], None);
    let (code, out, err) = run(&["--table", "-"], Some(&demo));
    assert_eq!(code, 0, "{err}");
    assert!(
        out.contains("== Recipe") && out.contains("pH (exact)"),
        "{out}"
    );
    assert!(out.contains("== Mixture") && out.contains("== Field reading"));
}

#[test]
fn invalid_document_names_the_field() {
    let (_, demo, _) = run(&["--demo"], None);
    let bad = demo.replace("\"temperature_c\": 37.0", "\"temperature_c\": -5.0");
    assert_ne!(bad, demo);
    let (code, _, err) = run(&[], Some(&bad));
    assert_eq!(code, 1);
    assert!(err.contains("recipe.temperature_c"), "{err}");
    let (code, _, err) = run(&[], Some("{not json"));
    assert_eq!(code, 1);
    assert!(err.contains("not valid JSON"), "{err}");
}

#[test]
fn usage_errors_exit_2() {
    let (code, _, _) = run(&["--bogus"], None);
    assert_eq!(code, 2);
}

#[test]
fn a_user_defined_system_works_like_a_library_one() {
    // A made-up monoprotic amine buffer (invented values, for the test only).
    let (_, demo, _) = run(&["--demo"], None);
    let mut v: serde_json::Value = serde_json::from_str(&demo).unwrap();
    v["custom_systems"] = serde_json::json!([{
        "id": "my_amine", "name": "My amine", "z0": 1,
        "steps": [{"pk25": 8.5, "temp": {"kind": "vant_hoff", "dh_kj": 40.0, "dcp_j": 0.0}}],
        "species": ["BH⁺", "B"], "t_min_c": 5.0, "t_max_c": 45.0,
        "forms": [
            {"id": "base", "name": "free base", "formula": "C6H15NO3", "units": 1.0, "counter_ions": []},
            {"id": "hcl", "name": "hydrochloride", "formula": "C6H15NO3·HCl", "units": 1.0, "counter_ions": [["cl", 1.0]]}
        ],
        "source": "invented for a test", "hazards": []
    }]);
    v["recipe"]["system"] = "my_amine".into();
    v["recipe"]["target_ph"] = 8.3.into();
    v["recipe"]["temperature_c"] = 25.0.into();
    v["recipe"]["method"] =
        serde_json::json!({"kind": "two_forms", "acid_form": "hcl", "base_form": "base"});
    let text = v.to_string();
    let (code, out, err) = run(&[], Some(&text));
    assert_eq!(code, 0, "{err}");
    let r: serde_json::Value = serde_json::from_str(&out).unwrap();
    let ph = r["recipe"]["Ok"]["equilibrium"]["ph"].as_f64().unwrap();
    assert!((ph - 8.3).abs() < 1e-6, "{ph}");
}

#[test]
fn an_added_shelf_form_is_used_by_id_from_the_command_line() {
    let (_, demo, _) = run(&["--demo"], None);
    let mut v: serde_json::Value = serde_json::from_str(&demo).unwrap();
    v["custom_forms"] = serde_json::json!([{"system": "phosphate", "form": {
        "id": "k2hpo4_3h2o", "name": "dipotassium hydrogen phosphate trihydrate",
        "formula": "K2HPO4·3H2O", "units": 1.0, "counter_ions": [["k", 2.0]]}}]);
    v["recipe"]["method"]["base_form"] = "k2hpo4_3h2o".into();
    let (code, out, err) = run(&[], Some(&v.to_string()));
    assert_eq!(code, 0, "{err}");
    assert!(out.contains("K2HPO4·3H2O"), "{out}");
    // A broken added form is refused with its field.
    v["custom_forms"][0]["form"]["units"] = 0.0.into();
    let (code, _, err) = run(&[], Some(&v.to_string()));
    assert_eq!(code, 1);
    assert!(err.contains("custom_forms[0].form.units"), "{err}");
}
