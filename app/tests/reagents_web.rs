//! Browser component tests of the reagent editor: every field's message as the user types, the molar mass shown as typed, adding to the design.
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
    clippy::panic,
    missing_docs
)]

use app::reagents::model::EditorModel;
use app::reagents::ReagentEditor;
use app::state::AppState;
use leptos::prelude::*;
use wasm_bindgen::JsCast;
use wasm_bindgen_test::*;
use web_sys::{Element, HtmlElement, HtmlInputElement};

wasm_bindgen_test_configure!(run_in_browser);

mod common;
use common::*;

fn message(root: &Element, key: &str) -> String {
    text(root, &format!("error-{key}")).unwrap_or_default()
}

/// The editor for a new system, mounted with the demo design; returns the container and state.
fn editor() -> (Element, AppState, RwSignal<EditorModel>) {
    let state = AppState::new();
    let model = RwSignal::new(EditorModel::new_system());
    let closed = RwSignal::new(None::<Option<String>>);
    let root = mount(state, move || {
        view! { <ReagentEditor model=model on_done=Callback::new(move |r| closed.set(Some(r))) /> }
    });
    (root, state, model)
}

#[wasm_bindgen_test]
async fn every_field_says_what_is_wrong_as_it_is_typed() {
    let (root, _state, _m) = editor();
    settle().await;
    // Before anything is typed: the name and the pK are marked.
    assert!(
        message(&root, "rg-name").contains("empty"),
        "{}",
        message(&root, "rg-name")
    );
    assert!(message(&root, "rg-step-0-pk").contains("Enter a value"));
    type_into(&root, "rg-name", "My amine").await;
    assert_eq!(message(&root, "rg-name"), "");
    // Half typed, ambiguous, then right.
    type_into(&root, "rg-step-0-pk", "8.").await;
    type_into(&root, "rg-step-0-pk", "8,500").await;
    assert!(
        message(&root, "rg-step-0-pk").contains("could be 8500 or 8.5"),
        "{}",
        message(&root, "rg-step-0-pk")
    );
    type_into(&root, "rg-step-0-pk", "8,5").await;
    assert_eq!(message(&root, "rg-step-0-pk"), "");
    // A second step below the first.
    click(&root, "rg-add-step").await;
    type_into(&root, "rg-step-1-pk", "3").await;
    assert!(
        message(&root, "rg-step-1-pk").contains("above the one before"),
        "{}",
        message(&root, "rg-step-1-pk")
    );
    click(&root, "rg-remove-step").await;
    // Temperature data out of range.
    type_into(&root, "rg-step-0-dh", "900").await;
    assert!(
        message(&root, "rg-step-0-dh").contains("outside"),
        "{}",
        message(&root, "rg-step-0-dh")
    );
    type_into(&root, "rg-step-0-dh", "40").await;
    assert_eq!(message(&root, "rg-step-0-dh"), "");
    type_into(&root, "rg-tmax", "80").await;
    assert!(
        message(&root, "rg-tmax").contains("outside"),
        "{}",
        message(&root, "rg-tmax")
    );
    type_into(&root, "rg-tmax", "45").await;
    // The charge: not a number, then one that does not fit the forms.
    type_into(&root, "rg-z0", "plus one").await;
    assert!(message(&root, "rg-z0").contains("whole number"));
    type_into(&root, "rg-z0", "1").await;
    // Forms: the formula, the molar mass as typed, units, counter-ions.
    type_into(&root, "rg-form-0-name", "hydrochloride").await;
    type_into(&root, "rg-form-0-formula", "C6H15NO3·HQl").await;
    assert!(
        message(&root, "rg-form-0-formula").contains("cannot read formula"),
        "{}",
        message(&root, "rg-form-0-formula")
    );
    type_into(&root, "rg-form-0-formula", "C6H15NO3·HCl").await;
    assert_eq!(message(&root, "rg-form-0-formula"), "");
    let hint = find(&root, "#rg-form-0-formula ~ .rg-hint")
        .map(|e| e.text_content().unwrap_or_default())
        .unwrap_or_default();
    assert!(hint.contains("185.648"), "{hint}");
    type_into(&root, "rg-form-0-units", "0").await;
    assert!(
        message(&root, "rg-form-0-units").contains("above 0"),
        "{}",
        message(&root, "rg-form-0-units")
    );
    type_into(&root, "rg-form-0-units", "1").await;
    type_into(&root, "rg-form-0-cl", "2").await;
    assert!(
        message(&root, "rg-form-0-ions").contains("charge"),
        "{}",
        message(&root, "rg-form-0-ions")
    );
    type_into(&root, "rg-form-0-cl", "1").await;
    assert_eq!(message(&root, "rg-form-0-ions"), "");
    assert_eq!(
        text(&root, "rg-summary").unwrap_or_default().trim(),
        "Every field is right."
    );
}

#[wasm_bindgen_test]
async fn species_names_follow_the_charge_and_a_valid_system_goes_into_the_design() {
    let (root, state, _m) = editor();
    settle().await;
    type_into(&root, "rg-name", "Lab amine").await;
    type_into(&root, "rg-z0", "1").await;
    let species = |i: usize| {
        find(&root, &format!("#rg-species-{i}"))
            .map(|e| e.unchecked_into::<HtmlInputElement>().value())
            .unwrap_or_default()
    };
    assert_eq!(
        (species(0), species(1)),
        ("HA⁺".to_string(), "A".to_string())
    );
    type_into(&root, "rg-species-1", "B").await;
    type_into(&root, "rg-step-0-pk", "8.5").await;
    type_into(&root, "rg-form-0-name", "free base").await;
    type_into(&root, "rg-form-0-formula", "C6H15NO3").await;
    let save: HtmlElement = find(&root, "[data-testid=\"rg-save\"]")
        .unwrap()
        .unchecked_into();
    assert!(!save
        .unchecked_ref::<web_sys::HtmlButtonElement>()
        .disabled());
    click(&root, "rg-save").await;
    let d = state.design.get_untracked();
    let s = d
        .custom_systems
        .iter()
        .find(|s| s.id == "user_lab_amine")
        .expect("added");
    assert_eq!(s.species, vec!["HA⁺".to_string(), "B".to_string()]);
    assert_eq!(s.z0, 1);
    // The design with it is a valid document.
    solver::document::parse_design(&solver::document::to_json(&d)).unwrap();
}
