//! One set of rules for the page and its reader: states the page can reach read back as the
//! same design (a preparation temperature outside the system's data, a limit left set while
//! the total is not measured), the duplicate-salt refusal in plain words, and a refused
//! document taken apart by workspace so one bad part does not cost the others.
#![allow(clippy::unwrap_used, clippy::expect_used, clippy::indexing_slicing)]

use solver::document::salvage::salvage_design;
use solver::document::{demo_design, parse_design, to_json};
use solver::field::field_reading;
use solver::field::limit::{Limit, LimitUnit};
use solver::mixture::{Additive, AdditiveSpec};
use solver::recipe::solve_recipe;

#[test]
fn a_preparation_temperature_outside_the_systems_data_reads_back_and_the_recipe_says_why() {
    let mut d = demo_design();
    d.recipe.system = "tris".into();
    d.recipe.method = solver::recipe::Method::TwoForms {
        acid_form: "tris_hcl".into(),
        base_form: "tris_base".into(),
    };
    d.recipe.prepare_temperature_c = Some(55.0);
    assert_eq!(parse_design(&to_json(&d)).unwrap(), d);
    let e = solve_recipe(&d.recipe, &d.systems())
        .unwrap_err()
        .to_string();
    assert!(e.starts_with("prepare_temperature_c"), "{e}");
}

#[test]
fn a_limit_left_set_without_a_total_reads_back_and_the_reading_says_why() {
    let mut d = demo_design();
    d.field.system = "ammonium".into();
    d.field.total = Some(1.0);
    d.field.limit = Some(Limit {
        value: 0.02,
        unit: LimitUnit::MgPerLNh3,
    });
    assert!(field_reading(&d.field, &[]).is_ok());
    d.field.total = None;
    assert_eq!(parse_design(&to_json(&d)).unwrap(), d);
    let e = field_reading(&d.field, &[]).unwrap_err().to_string();
    assert!(e.starts_with("limit") && e.contains("needs a total"), "{e}");
}

#[test]
fn a_duplicate_salt_is_refused_in_plain_words() {
    let mut d = demo_design();
    for _ in 0..2 {
        d.recipe.salts.push(AdditiveSpec {
            additive: Additive::Nacl,
            conc_m: 0.1,
        });
    }
    let e = parse_design(&to_json(&d)).unwrap_err().to_string();
    assert!(e.contains("NaCl is listed twice (rows 1 and 2)"), "{e}");
    assert!(
        e.contains("refused, not merged") && !e.contains("merge them"),
        "{e}"
    );
}

#[test]
fn one_unreadable_workspace_leaves_the_others_as_they_were() {
    let mut d = demo_design();
    d.name = "Pond survey".into();
    d.field.ph = 6.4;
    d.mixture.temperature_c = 30.0;
    d.recipe.salts = vec![
        AdditiveSpec {
            additive: Additive::Kcl,
            conc_m: 0.01,
        },
        AdditiveSpec {
            additive: Additive::Kcl,
            conc_m: 0.02,
        },
    ];
    let text = to_json(&d);
    assert!(parse_design(&text).is_err());
    let s = salvage_design(&text).unwrap();
    assert_eq!(s.design.name, "Pond survey");
    assert_eq!(s.design.field, d.field);
    assert_eq!(s.design.mixture, d.mixture);
    assert_eq!(s.design.recipe, demo_design().recipe);
    assert_eq!(s.refused.len(), 1);
    assert_eq!(s.refused[0].part, "Recipe");
    assert!(s.refused[0].error.to_string().contains("listed twice"));
    // Nothing to keep: no salvage.
    assert!(salvage_design("{\"schema\": 2}").is_none());
    assert!(salvage_design("not json").is_none());
    // A schema-1 document is migrated before it is taken apart.
    let one = text.replacen("\"schema\":2", "\"schema\":1", 1).replace(
        "\"salts\":[",
        "\"salt\":{\"additive\":\"nacl\",\"conc_m\":0.1},\"x\":[",
    );
    assert!(salvage_design(&one).is_some());
}
