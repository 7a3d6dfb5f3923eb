//! Browser component tests of the trust views: the engine self-check read from the page's own report, and the U95 beside the recipe and flask results.
//!
//! The shared harness (`common/`): each test mounts a component with a fresh
//! `AppState` (demo design), acts the way a browser does and reads the page.
//! Expected numbers come from the solver called directly.
#![cfg(target_arch = "wasm32")]
#![allow(
    clippy::unwrap_used,
    clippy::expect_used,
    clippy::indexing_slicing,
    missing_docs
)]

use app::checks::EngineCheck;
use app::state::AppState;
use app::widgets::uncertainty::ph_with_u;
use app::workspaces::flask::FlaskWorkspace;
use app::workspaces::recipe::RecipeWorkspace;
use leptos::prelude::*;
use solver::document::demo_design;
use wasm_bindgen_test::*;

wasm_bindgen_test_configure!(run_in_browser);

mod common;
use common::*;

#[wasm_bindgen_test]
async fn the_engine_check_runs_when_opened_and_reports_no_failure() {
    let root = mount(AppState::new(), || view! { <EngineCheck /> });
    settle().await;
    assert_eq!(
        text(&root, "selfcheck-summary"),
        None,
        "runs only when opened"
    );
    open_details(&root, "selfcheck").await;
    let summary = text(&root, "selfcheck-summary").expect("a summary once opened");
    let report = solver::selfcheck::run_self_check();
    assert!(summary.contains("0 failed"), "{summary}");
    assert!(
        summary.contains(&format!("{} passed", report.cases.len())),
        "{summary}"
    );
    assert!(summary.contains(&report.engine_version), "{summary}");
    // One row per case, each marked as passing, none failing.
    let rows = root
        .query_selector_all("[data-testid^=\"selfcheck-row-\"]")
        .unwrap();
    assert_eq!(rows.length() as usize, report.cases.len());
    let failing = root
        .query_selector_all("[data-testid^=\"selfcheck-row-\"][data-pass=\"false\"]")
        .unwrap();
    assert_eq!(failing.length(), 0);
    let first = &report.cases[0];
    let row = text(&root, &format!("selfcheck-row-{}", first.id)).unwrap();
    assert!(row.contains(&first.source), "{row}");
    assert!(row.contains("pass"), "{row}");
    assert!(find(&root, "[data-testid=\"selfcheck-csv\"]").is_some());
    assert!(find(&root, "[data-testid=\"selfcheck-print\"]").is_some());
}

#[wasm_bindgen_test]
async fn the_recipe_shows_the_solvers_u95_and_follows_the_balance() {
    let state = AppState::new();
    let root = mount(state, || view! { <RecipeWorkspace /> });
    settle().await;
    let d = demo_design();
    let r = solver::recipe::solve_recipe(&d.recipe, &d.custom_systems).unwrap();
    let u =
        solver::uncertainty::recipe_uncertainty(&d.recipe, &r, &d.uncertainty, &d.custom_systems)
            .unwrap();
    let shown = text(&root, "recipe-u95").expect("a U95 line");
    assert!(
        shown.contains(&ph_with_u(r.equilibrium.ph, u.u95_ph)),
        "{shown}"
    );
    assert!(shown.contains("k = 2"), "{shown}");
    assert!(find(&root, "[data-testid=\"recipe-u95-budget\"] tbody tr").is_some());
    // A coarse balance (±500 mg) makes the weighings dominate: U grows and
    // the page says so, with the solver's own numbers.
    type_into(&root, "recipe-u-balance", "500").await;
    let mut coarse = d.uncertainty.clone();
    coarse.balance_mg = 500.0;
    assert_eq!(
        state.design.with_untracked(|x| x.uncertainty.balance_mg),
        500.0
    );
    let u2 =
        solver::uncertainty::recipe_uncertainty(&d.recipe, &r, &coarse, &d.custom_systems).unwrap();
    assert!(u2.u95_ph > u.u95_ph);
    let shown2 = text(&root, "recipe-u95").unwrap();
    assert!(
        shown2.contains(&ph_with_u(r.equilibrium.ph, u2.u95_ph)),
        "{shown2}"
    );
    let warnings = text(&root, "recipe-u95-warnings").unwrap_or_default();
    for n in &u2.notes {
        assert!(warnings.contains(n.as_str()), "{warnings} lacks {n}");
    }
    // A refused figure marks the field and the recipe waits.
    type_into(&root, "recipe-u-balance", "-3").await;
    assert!(text(&root, "error-recipe-u-balance").is_some());
    assert!(text(&root, "recipe-stale").is_some());
}

#[wasm_bindgen_test]
async fn the_flask_shows_the_solvers_u95() {
    let root = mount(AppState::new(), || view! { <FlaskWorkspace /> });
    settle().await;
    let d = demo_design();
    let m = solver::mixture::solve_mixture(&d.mixture, &d.custom_systems).unwrap();
    let u = solver::uncertainty::mixture_uncertainty(
        &d.mixture,
        &d.uncertainty,
        &d.custom_systems,
        None,
    )
    .unwrap();
    let shown = text(&root, "mixture-u95").expect("a U95 line");
    assert!(
        shown.contains(&ph_with_u(m.equilibrium.ph, u.u95_ph)),
        "{shown}"
    );
}
