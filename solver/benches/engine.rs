//! Criterion benchmarks of the engine: one solve, curves, titration, recipe inversion.
#![allow(clippy::unwrap_used, clippy::expect_used, missing_docs)]

use criterion::{black_box, criterion_group, criterion_main, Criterion};
use solver::activity::ActivityModel;
use solver::mixture::{
    prepare, species_curves, titration_curve, Additive, AdditiveSpec, ComponentSpec, MixtureSpec,
};
use solver::recipe::{solve_recipe, Method, RecipeSpec};

fn three_systems() -> MixtureSpec {
    let c = |s: &str, f: &str, m: f64| ComponentSpec {
        system: s.into(),
        form: Some(f.into()),
        conc_m: m,
    };
    MixtureSpec {
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
    }
}

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
    cr.bench_function("titration: 200 points, one solve each", |b| {
        b.iter(|| titration_curve(black_box(&p), 0.1, 0.1, 200).unwrap())
    });
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
    cr.bench_function("recipe: two forms, exact + HH + tolerance", |b| {
        b.iter(|| solve_recipe(black_box(&recipe), &[]).unwrap())
    });
}

criterion_group!(engine, benches);
criterion_main!(engine);
