//! The titration curve drawn from pH against its oracle, the curve solved
//! point by point: every point is exact (a forward solve at its amount gives
//! its pH) and the two curves describe the same function.
#![allow(clippy::unwrap_used, clippy::indexing_slicing)]

use proptest::prelude::*;
use solver::equilibrium::activity::ActivityModel;
use solver::mixture::{
    prepare, titration_curve, titration_curve_by_solves, Additive, AdditiveSpec, ComponentSpec,
    MixtureSpec,
};

fn spec(system: &str, conc: f64, salt: f64, activity: ActivityModel) -> MixtureSpec {
    MixtureSpec {
        components: vec![ComponentSpec {
            system: system.into(),
            form: None,
            conc_m: conc,
        }],
        additives: vec![AdditiveSpec {
            additive: Additive::Nacl,
            conc_m: salt,
        }],
        temperature_c: 25.0,
        activity,
        atmosphere: None,
    }
}

/// pH of the oracle curve at amount `x` (mmol/L), by linear interpolation.
fn oracle_at(xs: &[f64], ph: &[f64], x: f64) -> f64 {
    let i = xs.partition_point(|v| *v < x).clamp(1, xs.len() - 1);
    let (x0, x1, y0, y1) = (xs[i - 1], xs[i], ph[i - 1], ph[i]);
    if x1 == x0 {
        y0
    } else {
        y0 + (y1 - y0) * (x - x0) / (x1 - x0)
    }
}

fn check(m: &MixtureSpec, span: f64) {
    let p = prepare(m, &[]).unwrap();
    let fast = titration_curve(&p, span, span, 201).unwrap();
    let slow = titration_curve_by_solves(&p, span, span, 4001).unwrap();
    assert_eq!(fast.ph.len(), 201);
    // End points are the same full solves.
    assert!((fast.ph[0] - slow.ph[0]).abs() < 1e-9);
    assert!((fast.ph[200] - slow.ph[4000]).abs() < 1e-9);
    // Amounts rise with pH, and stay inside the requested span.
    for w in fast.added_mmol_per_l.windows(2) {
        assert!(w[1] >= w[0] - 1e-9, "not monotone: {w:?}");
    }
    // Every point is exact: a forward solve with that much acid or base gives its pH.
    for (x, ph) in fast.added_mmol_per_l.iter().zip(&fast.ph) {
        let one = titration_curve_by_solves(&p, (-x / 1000.0).max(0.0), (x / 1000.0).max(0.0), 2)
            .unwrap();
        let forward = if *x >= 0.0 { one.ph[1] } else { one.ph[0] };
        assert!(
            (forward - ph).abs() < 1e-6,
            "at {x} mmol/L: {forward} vs {ph}"
        );
        // And it lies on the oracle curve (dense, interpolated) where that curve is not steep.
        let o = oracle_at(&slow.added_mmol_per_l, &slow.ph, *x);
        let i = slow
            .added_mmol_per_l
            .partition_point(|v| v < x)
            .clamp(1, 4000);
        let slope = (slow.ph[i] - slow.ph[i - 1]).abs();
        if slope < 0.01 {
            assert!((o - ph).abs() < 0.01, "at {x}: oracle {o} vs {ph}");
        }
    }
}

#[test]
fn phosphate_curve_from_ph_matches_the_solved_curve() {
    check(&spec("phosphate", 0.05, 0.1, ActivityModel::Davies), 0.1);
}

#[test]
fn tris_and_acetate_ideal_and_real() {
    check(&spec("tris", 0.02, 0.0, ActivityModel::Davies), 0.05);
    check(&spec("acetate", 0.1, 0.0, ActivityModel::Ideal), 0.2);
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(24))]
    #[test]
    fn any_buffer_curve_points_are_exact(
        sys in prop::sample::select(vec!["phosphate", "tris", "citrate", "hepes", "borate", "carbonate", "ammonium"]),
        conc in 0.001f64..0.2,
        salt in 0.0f64..0.3,
        span in 0.001f64..0.3,
    ) {
        let m = spec(sys, conc, salt, ActivityModel::Davies);
        let p = prepare(&m, &[]).unwrap();
        let fast = titration_curve(&p, span, span, 41).unwrap();
        for (x, ph) in fast.added_mmol_per_l.iter().zip(&fast.ph) {
            let one = titration_curve_by_solves(&p, (-x / 1000.0).max(0.0), (x / 1000.0).max(0.0), 2).unwrap();
            let forward = if *x >= 0.0 { one.ph[1] } else { one.ph[0] };
            prop_assert!((forward - ph).abs() < 1e-6, "{sys} at {x}: {forward} vs {ph}");
        }
    }
}
