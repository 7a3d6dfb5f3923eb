//! Stored schema-1 documents (frozen fixtures in `tests/data/schema1/`) open under schema 2
//! and give the same numbers as the schema-1 solver gave; the salt list refuses duplicates.
#![allow(
    clippy::unwrap_used,
    clippy::expect_used,
    clippy::indexing_slicing,
    clippy::panic
)]

use serde_json::Value;
use solver::document::{parse_design, report, to_json, SCHEMA_VERSION};
use solver::mixture::{Additive, AdditiveSpec};
use solver::recipe::solve_recipe;

fn data(name: &str) -> String {
    format!("{}/tests/data/schema1/{name}", env!("CARGO_MANIFEST_DIR"))
}

/// Every value in `old` is in `new` at the same path, numbers to the last printed digit;
/// `new` may carry more keys (fields added since).
fn contains(old: &Value, new: &Value, path: &str) -> Result<(), String> {
    match (old, new) {
        (Value::Object(a), Value::Object(b)) => {
            for (k, va) in a {
                let vb = b.get(k).ok_or_else(|| format!("{path}.{k}: missing"))?;
                contains(va, vb, &format!("{path}.{k}"))?;
            }
            Ok(())
        }
        (Value::Array(a), Value::Array(b)) => {
            if a.len() != b.len() {
                return Err(format!("{path}: {} items, now {}", a.len(), b.len()));
            }
            for (i, (va, vb)) in a.iter().zip(b).enumerate() {
                contains(va, vb, &format!("{path}[{i}]"))?;
            }
            Ok(())
        }
        // serde_json's default float reader is not correctly rounded in the
        // last bit, so a number read back from the stored file may sit one or
        // two ulps from the one printed: 1e−14 relative is "the same number".
        (Value::Number(a), Value::Number(b)) => match (a.as_f64(), b.as_f64()) {
            (Some(x), Some(y)) if (x - y).abs() <= 1e-14 * x.abs().max(y.abs()) => Ok(()),
            _ => Err(format!("{path}: was {old}, now {new}")),
        },
        _ if old == new => Ok(()),
        _ => Err(format!("{path}: was {old}, now {new}")),
    }
}

const FIXTURES: [&str; 4] = [
    "two-forms.json",
    "titrate.json",
    "two-stocks.json",
    "demo-with-salt.json",
];

#[test]
fn fixtures_are_schema_1() {
    for f in FIXTURES {
        let v: Value = serde_json::from_str(&std::fs::read_to_string(data(f)).unwrap()).unwrap();
        assert_eq!(v["schema"], 1, "{f}");
        assert!(v["recipe"].get("salt").is_some(), "{f} has no salt key");
        assert!(v["recipe"].get("salts").is_none(), "{f}");
    }
}

#[test]
fn schema_1_documents_open_with_identical_numbers() {
    for f in FIXTURES {
        let text = std::fs::read_to_string(data(f)).unwrap();
        let d = parse_design(&text).unwrap_or_else(|e| panic!("{f}: {e}"));
        assert_eq!(d.schema, SCHEMA_VERSION);
        // The numbers the schema-1 solver reported for this file (recipe,
        // mixture, what-if, field), recorded before the change.
        let stem = f.trim_end_matches(".json");
        let expected: Value = serde_json::from_str(
            &std::fs::read_to_string(data(&format!("expected/{stem}.report.json"))).unwrap(),
        )
        .unwrap();
        let now = serde_json::to_value(report(&d)).unwrap();
        contains(&expected, &now, stem).unwrap_or_else(|e| panic!("{e}"));
        // And the migrated document round-trips under schema 2.
        assert_eq!(parse_design(&to_json(&d)).unwrap(), d);
    }
}

#[test]
fn the_salt_becomes_a_list_of_one_and_null_an_empty_list() {
    let salted =
        parse_design(&std::fs::read_to_string(data("demo-with-salt.json")).unwrap()).unwrap();
    assert_eq!(
        salted.recipe.salts,
        vec![AdditiveSpec {
            additive: Additive::Nacl,
            conc_m: 0.15
        }]
    );
    let none = parse_design(&std::fs::read_to_string(data("titrate.json")).unwrap()).unwrap();
    assert!(none.recipe.salts.is_empty());
    // Absent in a schema-1 document: also an empty list.
    let mut v: Value =
        serde_json::from_str(&std::fs::read_to_string(data("titrate.json")).unwrap()).unwrap();
    v["recipe"].as_object_mut().unwrap().remove("salt");
    assert!(parse_design(&v.to_string())
        .unwrap()
        .recipe
        .salts
        .is_empty());
    // A schema-2 document does not know `salt` any more.
    let mut v: Value = serde_json::from_str(&to_json(&salted)).unwrap();
    v["recipe"]["salt"] = Value::Null;
    let e = parse_design(&v.to_string()).unwrap_err().to_string();
    assert!(e.starts_with("recipe.salt: unknown field"), "{e}");
}

#[test]
fn a_salt_listed_twice_is_refused_by_index() {
    let mut d =
        parse_design(&std::fs::read_to_string(data("demo-with-salt.json")).unwrap()).unwrap();
    d.recipe.salts.push(AdditiveSpec {
        additive: Additive::Kcl,
        conc_m: 0.01,
    });
    // Two different salts are fine, and both are weighed.
    let r = solve_recipe(&d.recipe, &[]).unwrap();
    assert!(r.ingredients.iter().any(|i| i.formula == "NaCl"));
    assert!(r.ingredients.iter().any(|i| i.formula == "KCl"));
    assert!(parse_design(&to_json(&d)).is_ok());
    d.recipe.salts.push(AdditiveSpec {
        additive: Additive::Nacl,
        conc_m: 0.05,
    });
    let e = parse_design(&to_json(&d)).unwrap_err().to_string();
    assert!(e.starts_with("recipe.salts[2]"), "{e}");
    assert!(
        e.contains("listed twice (rows 1 and 3)") && e.contains("refused, not merged"),
        "{e}"
    );
    let e = solve_recipe(&d.recipe, &[]).unwrap_err().to_string();
    assert!(
        e.starts_with("salts[2]") && !e.contains("merge them"),
        "{e}"
    );
}

#[test]
fn a_bad_salt_is_named_by_index() {
    let mut d =
        parse_design(&std::fs::read_to_string(data("demo-with-salt.json")).unwrap()).unwrap();
    d.recipe.salts[0].conc_m = -1.0;
    let e = parse_design(&to_json(&d)).unwrap_err().to_string();
    assert!(e.starts_with("recipe.salts[0].conc_m"), "{e}");
    d.recipe.salts[0] = AdditiveSpec {
        additive: Additive::Hcl,
        conc_m: 0.01,
    };
    let e = parse_design(&to_json(&d)).unwrap_err().to_string();
    assert!(e.starts_with("recipe.salts[0].additive"), "{e}");
}
