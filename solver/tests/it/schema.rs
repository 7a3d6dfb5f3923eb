//! Design-document integrity: unknown keys are refused by name, messages never repeat huge inputs.
#![allow(
    clippy::unwrap_used,
    clippy::expect_used,
    clippy::indexing_slicing,
    clippy::panic
)]

use serde_json::{json, Value};
use solver::document::{demo_design, parse_design, to_json, to_json_pretty};

fn demo_value() -> Value {
    serde_json::from_str(&to_json(&demo_design())).unwrap()
}

fn refused(v: &Value) -> String {
    parse_design(&v.to_string())
        .expect_err("document should be refused")
        .to_string()
}

/// A made-up monoprotic system (invented values, for the test only).
fn custom_system() -> Value {
    json!({
        "id": "my_amine", "name": "My amine", "z0": 1,
        "steps": [{"pk25": 8.5, "temp": {"kind": "vant_hoff", "dh_kj": 40.0, "dcp_j": 0.0}}],
        "species": ["BH⁺", "B"], "t_min_c": 5.0, "t_max_c": 45.0,
        "forms": [
            {"id": "base", "name": "free base", "formula": "C6H15NO3", "units": 1.0, "counter_ions": []}
        ],
        "source": "invented for a test", "hazards": []
    })
}

#[test]
fn the_custom_system_fixture_is_accepted() {
    let mut v = demo_value();
    v["custom_systems"] = json!([custom_system()]);
    parse_design(&v.to_string()).unwrap();
}

#[test]
fn a_typo_in_an_optional_recipe_field_is_refused_by_name() {
    let mut v = demo_value();
    v["recipe"]["tolerance_phh"] = json!(0.1);
    let e = refused(&v);
    assert!(e.starts_with("recipe.tolerance_phh: unknown field"), "{e}");
    let mut v = demo_value();
    v["recipe"]["prepare_temprature_c"] = json!(25.0);
    let e = refused(&v);
    assert!(
        e.starts_with("recipe.prepare_temprature_c: unknown field"),
        "{e}"
    );
}

#[test]
fn a_typo_inside_the_recipe_method_is_refused_by_name() {
    let mut v = demo_value();
    v["recipe"]["method"]["acid_frm"] = json!("x");
    let e = refused(&v);
    assert!(
        e.starts_with("recipe.method.acid_frm: unknown field"),
        "{e}"
    );
}

#[test]
fn a_typo_in_an_optional_field_field_is_refused_by_name() {
    let mut v = demo_value();
    v["field"]["totl"] = json!(1.0);
    let e = refused(&v);
    assert!(e.starts_with("field.totl: unknown field"), "{e}");
    let mut v = demo_value();
    v["field"]["ionic"]["us_cm_"] = json!(1.0);
    let e = refused(&v);
    assert!(e.starts_with("field.ionic.us_cm_: unknown field"), "{e}");
    // A unit variant of an internally tagged enum takes no other key either.
    let mut v = demo_value();
    v["field"]["ionic"] = json!({"kind": "zero", "us_cm": 3.0});
    let e = refused(&v);
    assert!(e.starts_with("field.ionic.us_cm: unknown field"), "{e}");
}

#[test]
fn a_typo_in_an_optional_mixture_field_is_refused_by_name() {
    let mut v = demo_value();
    v["mixture"]["activty"] = json!("ideal");
    let e = refused(&v);
    assert!(e.starts_with("mixture.activty: unknown field"), "{e}");
    let mut v = demo_value();
    v["mixture"]["components"][1]["frm"] = json!("tris_base");
    let e = refused(&v);
    assert!(
        e.starts_with("mixture.components[1].frm: unknown field"),
        "{e}"
    );
    let mut v = demo_value();
    v["what_if"]["dilution"] = json!(2.0);
    let e = refused(&v);
    assert!(e.starts_with("what_if.dilution: unknown field"), "{e}");
}

#[test]
fn a_typo_in_a_custom_system_is_refused_by_name() {
    let mut v = demo_value();
    let mut s = custom_system();
    s["comment"] = json!("mine");
    v["custom_systems"] = json!([s]);
    let e = refused(&v);
    assert!(
        e.starts_with("custom_systems[0].comment: unknown field"),
        "{e}"
    );

    let mut v = demo_value();
    let mut s = custom_system();
    s["steps"][0]["temp"]["dh_kJ"] = json!(40.0);
    v["custom_systems"] = json!([s]);
    let e = refused(&v);
    assert!(
        e.starts_with("custom_systems[0].steps[0].temp.dh_kJ: unknown field"),
        "{e}"
    );

    // A unit variant (`constant`) of an internally tagged enum takes no other key.
    let mut v = demo_value();
    let mut s = custom_system();
    s["steps"][0]["temp"] = json!({"kind": "constant", "dh_kj": 40.0});
    v["custom_systems"] = json!([s]);
    let e = refused(&v);
    assert!(
        e.starts_with("custom_systems[0].steps[0].temp.dh_kj: unknown field"),
        "{e}"
    );

    let mut v = demo_value();
    let mut s = custom_system();
    s["forms"][0]["unit"] = json!(1.0);
    v["custom_systems"] = json!([s]);
    let e = refused(&v);
    assert!(
        e.starts_with("custom_systems[0].forms[0].unit: unknown field"),
        "{e}"
    );
}

#[test]
fn a_typo_at_the_top_level_is_refused_by_name() {
    let mut v = demo_value();
    v["plot_sourse"] = json!("mixture");
    let e = refused(&v);
    assert!(e.starts_with("plot_sourse: unknown field"), "{e}");
}

#[test]
fn every_example_still_parses_and_the_demo_round_trips() {
    let dir = format!("{}/examples", env!("CARGO_MANIFEST_DIR"));
    let mut n = 0;
    for entry in std::fs::read_dir(dir).unwrap() {
        let path = entry.unwrap().path();
        if path.extension().is_some_and(|e| e == "json") {
            let text = std::fs::read_to_string(&path).unwrap();
            parse_design(&text).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
            n += 1;
        }
    }
    assert!(n >= 3, "only {n} examples found");
    let d = demo_design();
    assert_eq!(parse_design(&to_json_pretty(&d)).unwrap(), d);
    assert_eq!(parse_design(&to_json(&d)).unwrap(), d);
}

#[test]
fn a_huge_string_in_a_number_field_is_not_repeated() {
    let huge = "9".repeat(5_000) + &"x".repeat(5_000);
    let mut v = demo_value();
    v["recipe"]["volume_l"] = json!(huge);
    let e = refused(&v);
    assert!(e.starts_with("recipe.volume_l"), "{e}");
    assert!(e.contains('…'), "{e}");
    assert!(e.chars().count() < 300, "{} chars: {e}", e.chars().count());
}

#[test]
fn a_huge_unknown_system_name_is_not_repeated() {
    let huge = "s".repeat(10_000);
    for part in ["recipe", "field"] {
        let mut v = demo_value();
        v[part]["system"] = json!(huge);
        let e = refused(&v);
        assert!(e.starts_with("unknown system \"sss"), "{e}");
        assert!(e.chars().count() < 300, "{} chars: {e}", e.chars().count());
    }
    // Through the recipe solver directly, too.
    let mut spec = demo_design().recipe;
    spec.system = huge.clone();
    let e = solver::recipe::solve_recipe(&spec, &[])
        .unwrap_err()
        .to_string();
    assert!(e.chars().count() < 300, "{} chars: {e}", e.chars().count());
}

#[test]
fn a_huge_unknown_key_or_form_is_not_repeated() {
    let huge = "k".repeat(10_000);
    let mut v = demo_value();
    v["recipe"][huge.as_str()] = json!(1);
    let e = refused(&v);
    assert!(e.starts_with("recipe.kkk"), "{e}");
    assert!(e.chars().count() < 400, "{} chars: {e}", e.chars().count());
    let mut v = demo_value();
    v["recipe"]["method"]["acid_form"] = json!(huge);
    let e = refused(&v);
    assert!(e.contains("recipe.method.acid_form"), "{e}");
    assert!(e.chars().count() < 300, "{} chars: {e}", e.chars().count());
    let mut v = demo_value();
    v["workspace"] = json!(huge);
    let e = refused(&v);
    assert!(e.starts_with("workspace"), "{e}");
    assert!(e.chars().count() < 300, "{} chars: {e}", e.chars().count());
}

#[test]
fn a_huge_custom_formula_is_not_repeated() {
    let mut v = demo_value();
    let mut s = custom_system();
    s["forms"][0]["formula"] = json!("Q".repeat(10_000));
    v["custom_systems"] = json!([s]);
    let e = refused(&v);
    assert!(e.starts_with("custom_systems[0]"), "{e}");
    assert!(e.chars().count() < 300, "{} chars: {e}", e.chars().count());
}
