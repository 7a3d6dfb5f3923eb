//! A titrated recipe's liquids fit the flask: the dissolving water and the titrant stay
//! below the final volume (the dissolving step shrinks, or the recipe is refused with the
//! titrant that would fit).
#![allow(
    clippy::unwrap_used,
    clippy::expect_used,
    clippy::indexing_slicing,
    clippy::panic
)]

use proptest::prelude::*;
use solver::equilibrium::activity::ActivityModel;
use solver::mixture::Additive;
use solver::recipe::{solve_recipe, Method, RecipeResult, RecipeSpec};
use solver::SolverError;

fn tris_titrated(total_m: f64, factor: f64, titrant_m: f64, target: f64) -> RecipeSpec {
    RecipeSpec {
        system: "tris".into(),
        target_ph: target,
        temperature_c: 25.0,
        total_conc_m: total_m,
        volume_l: 0.5,
        salts: vec![],
        activity: ActivityModel::Davies,
        method: Method::Titrate {
            form: "tris_hcl".into(),
            titrant: Additive::Naoh,
            titrant_m,
        },
        tolerance_ph: 0.05,
        prepare_temperature_c: None,
        concentrate_factor: factor,
        atmosphere: None,
        store_temperature_c: None,
    }
}

/// The mL of the "Dissolve in about … mL" step.
fn dissolving_ml(r: &RecipeResult) -> f64 {
    let step = r
        .steps
        .iter()
        .find(|s| s.starts_with("Dissolve in about "))
        .expect("a dissolving step");
    let rest = step.trim_start_matches("Dissolve in about ");
    rest.split(' ').next().unwrap().parse().unwrap()
}

fn titrant_ml(r: &RecipeResult) -> f64 {
    r.ingredients.iter().filter_map(|i| i.ml).sum()
}

#[test]
fn a_concentrate_whose_titrant_crowds_the_flask_dissolves_in_less_water() {
    // 50 mM Tris ×50 (2.5 mol/L), 500 mL, from Tris·HCl with 1 M NaOH: the titrant is a
    // third of a litre, so the usual 400 mL of dissolving water cannot be used.
    let r = solve_recipe(&tris_titrated(0.05, 50.0, 1.0, 7.6), &[]).unwrap();
    let t = titrant_ml(&r);
    assert!(t > 100.0, "titrant {t} mL");
    let d = dissolving_ml(&r);
    assert!(d + t <= 500.0, "{d} + {t} mL in a 500 mL flask");
    assert!(d >= 125.0, "{d}");
    let step = r.steps.iter().find(|s| s.starts_with("Dissolve")).unwrap();
    assert!(step.contains("less than the usual 400 mL"), "{step}");
    // 1 M Tris at 1×: the same rule.
    let r = solve_recipe(&tris_titrated(1.0, 1.0, 1.0, 7.6), &[]).unwrap();
    assert!(dissolving_ml(&r) + titrant_ml(&r) <= 500.0);
    // A working-strength recipe keeps the usual 80 %.
    let r = solve_recipe(&tris_titrated(0.05, 1.0, 1.0, 7.6), &[]).unwrap();
    assert_eq!(dissolving_ml(&r), 400.0);
}

#[test]
fn when_even_a_small_dissolving_volume_cannot_fit_a_stronger_titrant_is_named() {
    let e = solve_recipe(&tris_titrated(0.05, 50.0, 0.5, 7.6), &[]).unwrap_err();
    let SolverError::Infeasible { field, reason } = &e else {
        panic!("{e:?}")
    };
    assert_eq!(field, "method.titrant_m");
    assert!(
        reason.contains("use a stronger titrant (about "),
        "{reason}"
    );
    // The titrant it names fits beside the usual dissolving volume.
    let named: f64 = reason
        .split("(about ")
        .nth(1)
        .and_then(|s| s.split(' ').next())
        .unwrap()
        .parse()
        .unwrap();
    let r = solve_recipe(&tris_titrated(0.05, 50.0, named, 7.6), &[]).unwrap();
    assert_eq!(dissolving_ml(&r), 400.0, "{:?}", r.steps);
}

proptest! {
    /// Whatever the strength, concentrate and titrant, a titrated recipe that is not
    /// refused fits its liquids below the mark.
    #[test]
    fn the_liquids_before_make_up_never_exceed_the_final_volume(
        lc in -2.5f64..0.3, factor in 1.0f64..50.0, lt in -1.0f64..1.0, target in 7.0f64..9.0
    ) {
        let s = tris_titrated(10f64.powf(lc), factor, 10f64.powf(lt), target);
        if let Ok(r) = solve_recipe(&s, &[]) {
            let d = dissolving_ml(&r);
            let t = titrant_ml(&r);
            prop_assert!(d + t <= 500.0 * (1.0 + 1e-9), "{d} + {t}");
            prop_assert!(d >= 125.0);
        }
    }
}
