//! Criterion benchmarks of the engine: one solve, curves, titration, recipe inversion.
#![allow(
    clippy::unwrap_used,
    clippy::expect_used,
    missing_docs,
    reason = "a benchmark binary: set-up failures should stop it, and criterion macros make undocumented items"
)]

use criterion::{black_box, criterion_group, criterion_main, Criterion};
use solver::mixture::{prepare, species_curves, titration_curve};
use solver::recipe::solve_recipe;
use solver::workloads::{phosphate_recipe, three_systems};

fn benches(cr: &mut Criterion) {
    let spec = three_systems();
    let p = prepare(&spec, &[]).unwrap();
    let eq = p.solve().unwrap();
    cr.bench_function("solve: phosphate+Tris+acetate+NaCl, Davies", |b| {
        b.iter(|| solver::equilibrium::solve(black_box(&p.composition), f64::NAN).unwrap())
    });
    cr.bench_function("curve: 1000-point speciation + capacity", |b| {
        b.iter(|| species_curves(black_box(&p), eq.ionic_strength, 0.0, 14.0, 1000).unwrap())
    });
    cr.bench_function("titration: 200 points, drawn from pH", |b| {
        b.iter(|| titration_curve(black_box(&p), 0.1, 0.1, 200).unwrap())
    });
    let recipe = phosphate_recipe();
    cr.bench_function("recipe: two forms, exact + HH + tolerance", |b| {
        b.iter(|| solve_recipe(black_box(&recipe), &[]).unwrap())
    });
}

criterion_group!(engine, benches);
criterion_main!(engine);
