//! Browser component tests: each workspace mounted in a real page (wasm-bindgen-test in Chromium).
//!
//! Every test mounts a component into its own container with a fresh
//! `AppState` holding the demo design, types into inputs the way a browser
//! does (set the value, dispatch a bubbling `input` event), lets the reactive
//! system settle and reads what is on screen. Expected numbers come from the
//! solver called directly, formatted by the same helpers the page uses.
#![cfg(target_arch = "wasm32")]
#![allow(
    clippy::unwrap_used,
    clippy::expect_used,
    clippy::indexing_slicing,
    missing_docs
)]

use app::shell::Shell;
use app::state::AppState;
use app::widgets::format::{fmt_pct, fmt_ph};
use app::workspaces::field::FieldWorkspace;
use app::workspaces::flask::FlaskWorkspace;
use app::workspaces::recipe::RecipeWorkspace;
use leptos::prelude::*;
use solver::document::demo_design;
use wasm_bindgen::JsCast;
use wasm_bindgen_test::*;
use web_sys::HtmlInputElement;

wasm_bindgen_test_configure!(run_in_browser);

mod common;
use common::*;

// ------------------------------------------------------------------ recipe

#[wasm_bindgen_test]
async fn recipe_demo_predicts_target_ph_and_weighs_two_salts() {
    let state = AppState::new();
    let root = mount(state, || view! { <RecipeWorkspace /> });
    settle().await;
    assert_eq!(text(&root, "recipe-ph-exact").as_deref(), Some("7.40"));
    let expected = solver::recipe::solve_recipe(&demo_design().recipe, &[]).unwrap();
    let first = &expected.ingredients[0];
    assert_eq!(
        text(&root, "recipe-ingredient-0-amount"),
        Some(solver::fmt::format_mass(first.grams.unwrap()))
    );
    assert!(text(&root, "recipe-ingredient-1-amount").is_some());
    assert!(text(&root, "recipe-steps").unwrap().contains("Weigh"));
    assert!(text(&root, "recipe-hh").is_some());
    assert!(text(&root, "recipe-capacity").unwrap().contains("mM/pH"));
}

#[wasm_bindgen_test]
async fn recipe_ph_15_is_refused_inline_and_hides_the_result() {
    let state = AppState::new();
    let root = mount(state, || view! { <RecipeWorkspace /> });
    settle().await;
    type_into(&root, "recipe-ph", "15").await;
    assert_eq!(
        text(&root, "error-recipe-ph").as_deref(),
        Some("pH must be between 0 and 14.")
    );
    assert!(
        text(&root, "recipe-ph-exact").is_none(),
        "no stale number on screen"
    );
    assert!(text(&root, "recipe-stale").is_some());
    // The design kept the last valid value.
    assert_eq!(state.design.get_untracked().recipe.target_ph, 7.4);
    type_into(&root, "recipe-ph", "7,2").await;
    assert!(text(&root, "error-recipe-ph").is_none());
    assert_eq!(text(&root, "recipe-ph-exact").as_deref(), Some("7.20"));
    assert_eq!(state.design.get_untracked().recipe.target_ph, 7.2);
}

#[wasm_bindgen_test]
async fn recipe_empty_word_and_negative_inputs_get_messages() {
    let state = AppState::new();
    let root = mount(state, || view! { <RecipeWorkspace /> });
    settle().await;
    type_into(&root, "recipe-conc", "").await;
    assert_eq!(
        text(&root, "error-recipe-conc").as_deref(),
        Some("Enter a value.")
    );
    type_into(&root, "recipe-conc", "-5").await;
    assert_eq!(
        text(&root, "error-recipe-conc").as_deref(),
        Some("Must not be negative.")
    );
    type_into(&root, "recipe-volume", "lots").await;
    assert!(text(&root, "error-recipe-volume")
        .unwrap()
        .contains("not a number"));
    type_into(&root, "recipe-temp", "70").await;
    assert!(text(&root, "error-recipe-temp")
        .unwrap()
        .contains("0 and 60"));
    type_into(&root, "recipe-conc", "25").await;
    type_into(&root, "recipe-volume", "250").await;
    type_into(&root, "recipe-temp", "25").await;
    assert!(text(&root, "recipe-stale").is_none());
    let d = state.design.get_untracked().recipe;
    assert!((d.total_conc_m - 0.025).abs() < 1e-12, "25 in mM");
    assert!((d.volume_l - 0.25).abs() < 1e-12, "250 in mL");
    assert_eq!(text(&root, "recipe-ph-exact").as_deref(), Some("7.40"));
}

#[wasm_bindgen_test]
async fn recipe_temperature_outside_system_data_shows_solver_message() {
    let state = AppState::new();
    let root = mount(state, || view! { <RecipeWorkspace /> });
    settle().await;
    choose(&root, "recipe-system", "tris").await;
    assert_eq!(state.design.get_untracked().recipe.system, "tris");
    type_into(&root, "recipe-temp", "58").await;
    let msg = text(&root, "error-recipe-temp").expect("message at the temperature field");
    assert!(msg.contains("No data for this system"), "{msg}");
    assert!(text(&root, "recipe-error").is_some());
}

#[wasm_bindgen_test]
async fn recipe_forms_follow_target_until_picked_by_hand() {
    let state = AppState::new();
    let root = mount(state, || view! { <RecipeWorkspace /> });
    settle().await;
    // Phosphate at pH 11.8: typing alone changes no form; leaving the field
    // moves the pair to the third step, keeping the heptahydrate, with a notice.
    type_into(&root, "recipe-ph", "11.8").await;
    let before = state.design.get_untracked().recipe.method;
    assert!(text(&root, "recipe-forms-offer").is_some());
    commit(&root, "recipe-ph").await;
    match state.design.get_untracked().recipe.method {
        solver::recipe::Method::TwoForms {
            acid_form,
            base_form,
        } => assert_eq!(
            (acid_form.as_str(), base_form.as_str()),
            ("na2hpo4_7h2o", "na3po4_12h2o")
        ),
        other => panic!("unexpected method {other:?}"),
    }
    assert!(text(&root, "recipe-forms-notice").unwrap().contains("→"));
    click(&root, "recipe-forms-undo").await;
    assert_eq!(state.design.get_untracked().recipe.method, before);
    // Pick a form by hand: a later target change keeps it.
    choose(&root, "recipe-acid-form", "kh2po4").await;
    type_into(&root, "recipe-ph", "7.0").await;
    match state.design.get_untracked().recipe.method {
        solver::recipe::Method::TwoForms { acid_form, .. } => assert_eq!(acid_form, "kh2po4"),
        other => panic!("unexpected method {other:?}"),
    }
}

#[wasm_bindgen_test]
async fn recipe_titration_method_pours_titrant() {
    let state = AppState::new();
    let root = mount(state, || view! { <RecipeWorkspace /> });
    settle().await;
    let radio: HtmlInputElement = find(&root, "#recipe-method-titrate")
        .unwrap()
        .unchecked_into();
    radio.set_checked(true);
    radio.dispatch_event(&bubbling("change")).unwrap();
    settle().await;
    assert_eq!(text(&root, "recipe-ph-exact").as_deref(), Some("7.40"));
    let amount = text(&root, "recipe-ingredient-1-amount").unwrap();
    assert!(amount.contains("mL") || amount.contains("µL"), "{amount}");
    assert!(text(&root, "recipe-cautions")
        .unwrap()
        .contains("Hydroxide"));
}

// ------------------------------------------------------------------ mixture

#[wasm_bindgen_test]
async fn mixture_shows_ph_and_follows_temperature() {
    let state = AppState::new();
    let root = mount(state, || view! { <FlaskWorkspace /> });
    settle().await;
    let mut spec = demo_design().mixture;
    let r = solver::mixture::solve_mixture(&spec, &[]).unwrap();
    assert_eq!(text(&root, "mixture-ph"), Some(fmt_ph(r.equilibrium.ph)));
    type_into(&root, "mixture-temp", "37").await;
    spec.temperature_c = 37.0;
    let r37 = solver::mixture::solve_mixture(&spec, &[]).unwrap();
    assert_eq!(text(&root, "mixture-ph"), Some(fmt_ph(r37.equilibrium.ph)));
    assert!(text(&root, "mixture-species-0").unwrap().contains('%'));
}

#[wasm_bindgen_test]
async fn mixture_rows_add_and_remove_and_what_ifs_show_changes() {
    let state = AppState::new();
    let root = mount(state, || view! { <FlaskWorkspace /> });
    settle().await;
    click(&root, "mixture-add-additive").await;
    assert_eq!(state.design.get_untracked().mixture.additives.len(), 2);
    choose(&root, "mixture-add-1-kind", "hcl").await;
    type_into(&root, "mixture-add-1-conc", "5").await; // 5 mM (unit chosen for 0.1 M is M)
    let adds = state.design.get_untracked().mixture.additives;
    assert_eq!(adds[1].additive, solver::mixture::Additive::Hcl);
    click(&root, "mixture-add-1-remove").await;
    assert_eq!(state.design.get_untracked().mixture.additives.len(), 1);
    // What-if: the dilution line shows a pH and a change.
    let line = text(&root, "whatif-dilution-result").unwrap();
    assert!(line.contains("pH") && line.contains("change"), "{line}");
    type_into(&root, "whatif-dilution", "0.5").await;
    assert!(text(&root, "error-whatif-dilution")
        .unwrap()
        .contains("1 or more"));
}

// ------------------------------------------------------------------ field

#[wasm_bindgen_test]
async fn field_reading_shows_unionized_ammonia() {
    let state = AppState::new();
    let root = mount(state, || view! { <FieldWorkspace /> });
    settle().await;
    let mut spec = demo_design().field;
    let r = solver::field::field_reading(&spec, &[]).unwrap();
    assert_eq!(
        text(&root, "field-fraction-1"),
        Some(fmt_pct(r.species[1].fraction))
    );
    assert!(text(&root, "field-conc-1").unwrap().contains("mg/L as N"));
    type_into(&root, "field-ph", "8,6").await;
    spec.ph = 8.6;
    let r2 = solver::field::field_reading(&spec, &[]).unwrap();
    assert_eq!(
        text(&root, "field-fraction-1"),
        Some(fmt_pct(r2.species[1].fraction))
    );
    type_into(&root, "field-ph", "abc").await;
    assert!(text(&root, "error-field-ph")
        .unwrap()
        .contains("not a number"));
    assert!(text(&root, "field-fraction-1").is_none());
}

#[wasm_bindgen_test]
async fn field_quick_buttons_switch_system_and_show_cautions() {
    let state = AppState::new();
    let root = mount(state, || view! { <FieldWorkspace /> });
    settle().await;
    click(&root, "field-quick-sulfide").await;
    assert_eq!(state.design.get_untracked().field.system, "sulfide");
    assert!(text(&root, "field-cautions")
        .unwrap()
        .contains("Never acidify"));
    click(&root, "field-quick-hypochlorous").await;
    let c = text(&root, "field-cautions").unwrap();
    assert!(c.contains("acids") && c.contains("ammonia"), "{c}");
}

// ------------------------------------------------------------------ shell

#[wasm_bindgen_test]
async fn shell_tabs_switch_workspaces_and_show_design_name() {
    let state = AppState::new();
    let root = mount(state, || view! { <Shell /> });
    settle().await;
    assert!(text(&root, "design-name").unwrap().contains("Hatchery lab"));
    assert!(text(&root, "ws-recipe").is_some());
    click(&root, "tab-field").await;
    assert!(text(&root, "ws-field").is_some());
    assert!(text(&root, "ws-recipe").is_none());
    let tab = find(&root, "[data-testid=\"tab-field\"]").unwrap();
    assert_eq!(tab.get_attribute("aria-selected").as_deref(), Some("true"));
    click(&root, "tab-mixture").await;
    assert!(text(&root, "mixture-ph").is_some());
}

#[wasm_bindgen_test]
async fn loading_a_design_resets_typed_text() {
    let state = AppState::new();
    let root = mount(state, || view! { <RecipeWorkspace /> });
    settle().await;
    type_into(&root, "recipe-ph", "99").await;
    assert!(text(&root, "error-recipe-ph").is_some());
    let mut d = demo_design();
    d.recipe.target_ph = 6.8;
    state.load(d);
    settle().await;
    assert!(text(&root, "error-recipe-ph").is_none());
    let input: HtmlInputElement = find(&root, "#recipe-ph").unwrap().unchecked_into();
    assert_eq!(input.value(), "6.8");
    assert_eq!(text(&root, "recipe-ph-exact").as_deref(), Some("6.80"));
}
