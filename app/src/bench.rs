//! In-browser timing of the solver, exported for the end-to-end benchmark (`window.wasmBindings.bench_engine`).
//!
//! Measures the same four workloads as `solver/benches/engine.rs` (both take
//! them from `solver::workloads`), with
//! `performance.now()`, inside the release bundle. Timing lives here, not in
//! a test assertion: the e2e run prints and records the figures.

use solver::mixture::{prepare, species_curves, titration_curve};
use solver::recipe::solve_recipe;
use solver::workloads::{phosphate_recipe, three_systems};
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
    let spec = three_systems();
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
    let recipe = phosphate_recipe();
    let recipe_us = time_us(2_000, || solve_recipe(&recipe, &[]).is_ok());
    format!(
        "{{\"solve_us\":{solve_us:.3},\"curve_1000_us\":{curve_us:.1},\"titration_200_us\":{titration_us:.1},\"recipe_us\":{recipe_us:.2}}}"
    )
}
