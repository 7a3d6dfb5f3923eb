//! In-browser timing of the solver, exported for the end-to-end benchmark (`window.wasmBindings.bench_engine`).
//!
//! Measures the same four workloads as `solver/benches/engine.rs`, with
//! `performance.now()`, inside the release bundle. Timing lives here, not in
//! a test assertion: the e2e run prints and records the figures.

use solver::activity::ActivityModel;
use solver::mixture::{
    prepare, species_curves, titration_curve, Additive, AdditiveSpec, ComponentSpec, MixtureSpec,
};
use solver::recipe::{solve_recipe, Method, RecipeSpec};
use wasm_bindgen::prelude::*;

fn now() -> f64 {
    web_sys::window()
        .and_then(|w| w.performance())
        .map(|p| p.now())
        .unwrap_or(0.0)
}

/// Mean time per call in microseconds over `n` calls of `f` (after one warm-up call).
fn time_us(n: u32, mut f: impl FnMut() -> bool) -> f64 {
    let _ = f();
    let t0 = now();
    let mut ok = true;
    for _ in 0..n {
        ok &= f();
    }
    let dt = now() - t0;
    if ok {
        dt * 1000.0 / f64::from(n.max(1))
    } else {
        f64::NAN
    }
}

/// Time the solver's four benchmark workloads; returns JSON with µs per call.
#[wasm_bindgen]
pub fn bench_engine() -> String {
    let c = |s: &str, f: &str, m: f64| ComponentSpec {
        system: s.into(),
        form: Some(f.into()),
        conc_m: m,
    };
    let spec = MixtureSpec {
        temperature_c: 25.0,
        activity: ActivityModel::Davies,
        components: vec![
            c("phosphate", "nah2po4", 0.02),
            c("phosphate", "na2hpo4", 0.03),
            c("tris", "tris_hcl", 0.02),
            c("acetate", "na_acetate", 0.01),
        ],
        additives: vec![AdditiveSpec {
            additive: Additive::Nacl,
            conc_m: 0.1,
        }],
    };
    let Ok(p) = prepare(&spec, &[]) else {
        return "{}".into();
    };
    let Ok(eq) = p.solve() else {
        return "{}".into();
    };
    let solve_us = time_us(20_000, || {
        solver::equilibrium::solve(&p.composition, f64::NAN).is_ok()
    });
    let curve_us = time_us(200, || {
        species_curves(&p, eq.ionic_strength, 0.0, 14.0, 1000).is_ok()
    });
    let titration_us = time_us(200, || titration_curve(&p, 0.1, 0.1, 200).is_ok());
    let recipe = RecipeSpec {
        system: "phosphate".into(),
        target_ph: 7.4,
        temperature_c: 37.0,
        total_conc_m: 0.05,
        volume_l: 0.5,
        salts: vec![AdditiveSpec {
            additive: Additive::Nacl,
            conc_m: 0.15,
        }],
        activity: ActivityModel::Davies,
        method: Method::TwoForms {
            acid_form: "nah2po4_h2o".into(),
            base_form: "na2hpo4_7h2o".into(),
        },
        tolerance_ph: 0.05,
        prepare_temperature_c: None,
        concentrate_factor: 1.0,
    };
    let recipe_us = time_us(2_000, || solve_recipe(&recipe, &[]).is_ok());
    format!(
        "{{\"solve_us\":{solve_us:.3},\"curve_1000_us\":{curve_us:.1},\"titration_200_us\":{titration_us:.1},\"recipe_us\":{recipe_us:.2}}}"
    )
}
