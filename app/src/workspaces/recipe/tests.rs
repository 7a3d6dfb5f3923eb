//! Native tests of the recipe tab's logic: forms, text, checks and cautions.
#![allow(
    clippy::unwrap_used,
    clippy::expect_used,
    clippy::indexing_slicing,
    clippy::panic
)]
use super::*;
use crate::widgets::cautions::Caution;
use solver::document::demo_design;
use solver::mixture::lookup;
use solver::recipe::solve_recipe;
use solver::system::library::find_form;

fn forms(spec: &RecipeSpec) -> (String, String) {
    match &spec.method {
        Method::TwoForms {
            acid_form,
            base_form,
        } => (acid_form.clone(), base_form.clone()),
        other => panic!("unexpected {other:?}"),
    }
}

#[test]
fn demo_hydrates_count_as_following_the_suggestion() {
    let spec = demo_design().recipe;
    assert!(follows_suggestion(&spec, &[]));
    assert_eq!(
        retarget(&spec, &[]),
        None,
        "7.4 already sits between the demo's forms"
    );
}

#[test]
fn moving_the_target_to_another_pk_keeps_hydrate_and_counter_ion() {
    let mut spec = demo_design().recipe;
    spec.target_ph = 7.1;
    assert_eq!(retarget(&spec, &[]), None, "same step: nothing to change");
    spec.target_ph = 11.5;
    spec.method = retarget(&spec, &[]).unwrap();
    let (a, b) = forms(&spec);
    assert_eq!(
        a, "na2hpo4_7h2o",
        "the heptahydrate sits on the new acid side: kept"
    );
    let sys = lookup("phosphate", &[]).unwrap();
    let base = find_form(sys, &b).unwrap();
    assert!(
        base.formula.contains('·'),
        "a hydrate replaces a hydrate: {}",
        base.formula
    );
    assert!(base
        .counter_ions
        .iter()
        .all(|(i, _)| *i == solver::system::Ion::Na));
    let r = solve_recipe(&spec, &[]);
    assert!(r.is_ok(), "{r:?}");
    // Back to 7.4: the monohydrate-or-anhydrous choice follows the user's forms.
    spec.target_ph = 7.4;
    spec.method = retarget(&spec, &[]).unwrap();
    assert_eq!(forms(&spec).1, "na2hpo4_7h2o");
}

#[test]
fn a_passing_keystroke_changes_nothing_by_itself() {
    // The page moves forms only on commit; the design holding a transient
    // target keeps the user's forms, and coming back proposes nothing.
    let mut spec = demo_design().recipe;
    let before = spec.method.clone();
    spec.target_ph = 1.0;
    assert!(retarget(&spec, &[]).is_some(), "pH 1 is at another pK");
    assert_eq!(spec.method, before);
    spec.target_ph = 7.4;
    assert_eq!(retarget(&spec, &[]), None);
    assert_eq!(spec.method, before);
}

#[test]
fn hand_picked_forms_are_detected_on_open() {
    let mut spec = demo_design().recipe;
    if let Method::TwoForms { base_form, .. } = &mut spec.method {
        *base_form = "na3po4_12h2o".into();
    }
    assert!(!follows_suggestion(&spec, &[]));
}

#[test]
fn implausible_bench_amounts_ask_to_check_the_unit() {
    let mut spec = demo_design().recipe;
    let r = solve_recipe(&spec, &[]).unwrap();
    assert!(
        bench_checks(&spec, &r.ingredients).is_empty(),
        "the demo is a bench recipe"
    );
    spec.volume_l = 250.0; // "250" typed, then the unit switched to L
    let r = solve_recipe(&spec, &[]).unwrap();
    let checks = bench_checks(&spec, &r.ingredients);
    assert!(
        checks.iter().any(|c| c.contains("final volume")),
        "{checks:?}"
    );
    assert!(
        checks.iter().any(|c| c.contains("more than 1 kg")),
        "{checks:?}"
    );
    spec.volume_l = 0.5;
    spec.total_conc_m = 2.5;
    assert!(bench_checks(&spec, &[])
        .iter()
        .any(|c| c.contains("unusually strong")));
}

#[test]
fn forms_read_as_formulas() {
    let spec = demo_design().recipe;
    let t = forms_text(&spec.method, &spec.system, &[]);
    assert!(t.contains(" + "), "{t}");
    assert!(t.contains('·'), "{t}");
}

#[test]
fn switching_method_picks_forms_of_the_system() {
    let mut spec = demo_design().recipe;
    switch_method(&mut spec, &[], "titrate");
    match &spec.method {
        Method::Titrate { form, titrant, .. } => {
            assert_eq!(*titrant, Additive::Naoh);
            assert!(lookup("phosphate", &[])
                .unwrap()
                .forms
                .iter()
                .any(|f| f.id == *form));
        }
        other => panic!("unexpected {other:?}"),
    }
    assert!(solve_recipe(&spec, &[]).is_ok());
    switch_method(&mut spec, &[], "two_stocks");
    assert!(solve_recipe(&spec, &[]).is_ok());
}

#[test]
fn recipe_text_has_name_reagents_steps_and_prediction() {
    let d = demo_design();
    let r = solve_recipe(&d.recipe, &[]).unwrap();
    let t = recipe_text(&d.name, "2026-01-01", &d.recipe, &r, "Phosphate");
    assert!(t.starts_with("Hatchery lab"));
    assert!(t.contains("Date: 2026-01-01"));
    assert!(t.contains(&amount_text(&r.ingredients[0])));
    assert!(t.contains("1. Weigh"));
    assert!(t.contains("Predicted pH 7.40"));
}

#[test]
fn cautions_follow_the_reagents() {
    let mut spec = demo_design().recipe;
    assert!(
        recipe_cautions(&spec, &[]).is_empty(),
        "two sodium phosphate salts"
    );
    switch_method(&mut spec, &[], "titrate");
    assert!(recipe_cautions(&spec, &[]).contains(&Caution::StrongBase));
}
