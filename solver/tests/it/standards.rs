//! Reference suite: pH standard buffers, worked examples and recipe round trips against published values.
//!
//! Provenance of every value is in tests/README.md. Tolerances:
//! - pH(S) standards: ±0.02. pH(S) is defined with the Bates–Guggenheim
//!   convention (IUPAC, Buck et al. 2002) and molal units; the solver uses the
//!   Davies equation and treats molal ≈ molar, which differ by about 0.01 at
//!   I ≈ 0.1. A slip in a constant of 0.02 would still fail.
#![allow(clippy::unwrap_used, clippy::expect_used, clippy::indexing_slicing)]

use solver::equilibrium::activity::ActivityModel;
use solver::mixture::solve_mixture;
use solver::recipe::{solve_recipe, Method, RecipeSpec};

/// The pH(S) standards (Buck et al. 2002, Pure Appl. Chem. 74, 2169, and the
/// NBS papers it cites), their temperature series, 1e−8 M HCl (Hill, Petrucci
/// et al., problem 15.109), 0.1 M acetic acid and the Van Slyke capacity live
/// in ONE list, `solver::selfcheck::cases()`, with value, source, status and
/// tolerance each. The page's self-check and `bufferwright self-check` run
/// the same list; here the engine-level cases are run again by name so that
/// `cargo test --test it borax` still finds them.
fn run_cases(prefix: &str) {
    let list: Vec<_> = solver::selfcheck::cases()
        .into_iter()
        .filter(|c| c.id.starts_with(prefix))
        .collect();
    assert!(!list.is_empty(), "no case starts with {prefix}");
    for c in list {
        let r = solver::selfcheck::run_case(&c);
        println!("{} -> {:?} (published {})", r.id, r.computed, r.published);
        assert!(
            r.pass,
            "{}: {:?} vs {} ± {}",
            r.id, r.computed, r.published, r.tolerance
        );
    }
}

#[test]
fn potassium_hydrogen_phthalate_0_05() {
    run_cases("ph_standard_khp_");
}

#[test]
fn potassium_dihydrogen_citrate_0_05() {
    run_cases("ph_standard_kh2_citrate_");
}

#[test]
fn equimolal_phosphate_0_025() {
    run_cases("ph_standard_phosphate_equimolal_");
}

#[test]
fn physiological_phosphate_7_413() {
    run_cases("ph_standard_phosphate_physiological_");
}

#[test]
fn borax_0_01() {
    run_cases("ph_standard_borax_");
}

#[test]
fn carbonate_0_025() {
    run_cases("ph_standard_carbonate_");
}

#[test]
fn dilute_hcl_through_mixture_api() {
    run_cases("dilute_hcl_");
}

#[test]
fn acetic_acid_ideal_quadratic() {
    run_cases("acetic_acid_0_1_ideal");
}

#[test]
fn van_slyke_capacity_at_pka() {
    run_cases("van_slyke_acetate");
}

fn recipe(method: Method, system: &str, target: f64, t: f64) -> RecipeSpec {
    RecipeSpec {
        system: system.into(),
        target_ph: target,
        temperature_c: t,
        total_conc_m: 0.05,
        volume_l: 0.5,
        salts: vec![],
        activity: ActivityModel::Davies,
        method,
        tolerance_ph: 0.05,
        prepare_temperature_c: None,
        concentrate_factor: 1.0,
        atmosphere: None,
        store_temperature_c: None,
    }
}

/// Round trip: the recipe's finished solution solves back to the target.
#[test]
fn recipe_methods_round_trip() {
    let specs = [
        recipe(
            Method::TwoForms {
                acid_form: "nah2po4_h2o".into(),
                base_form: "na2hpo4_7h2o".into(),
            },
            "phosphate",
            7.4,
            37.0,
        ),
        recipe(
            Method::Titrate {
                form: "tris_base".into(),
                titrant: solver::mixture::Additive::Hcl,
                titrant_m: 1.0,
            },
            "tris",
            8.0,
            25.0,
        ),
        recipe(
            Method::TwoStocks {
                acid_form: "acetic_acid".into(),
                acid_stock_m: 1.0,
                base_form: "na_acetate".into(),
                base_stock_m: 1.0,
            },
            "acetate",
            4.8,
            20.0,
        ),
    ];
    for spec in specs {
        let r = solve_recipe(&spec, &[]).unwrap();
        let back = solve_mixture(&r.mixture, &[]).unwrap().equilibrium.ph;
        assert!(
            (back - spec.target_ph).abs() < 0.001,
            "{:?}: {back}",
            spec.method
        );
    }
}

/// Tris titrated with HCl to pH 8.0 at 25 °C: HCl needed is close to the
/// protonated share C/(1 + 10^(pH − pK′)); common practice check of sign and size.
#[test]
fn tris_titration_volume_is_plausible() {
    let spec = recipe(
        Method::Titrate {
            form: "tris_base".into(),
            titrant: solver::mixture::Additive::Hcl,
            titrant_m: 1.0,
        },
        "tris",
        8.0,
        25.0,
    );
    let r = solve_recipe(&spec, &[]).unwrap();
    let ml = r.ingredients[1].ml.unwrap();
    // 0.05 M × 0.5 L = 25 mmol Tris; roughly half to two-thirds protonated → 12–20 mL of 1 M HCl.
    assert!(ml > 12.0 && ml < 20.0, "{ml} mL");
}

#[test]
fn wrong_titrant_is_refused_with_reason() {
    let spec = recipe(
        Method::Titrate {
            form: "tris_base".into(),
            titrant: solver::mixture::Additive::Naoh,
            titrant_m: 1.0,
        },
        "tris",
        8.0,
        25.0,
    );
    let e = solve_recipe(&spec, &[]).unwrap_err().to_string();
    assert!(e.contains("method.titrant"), "{e}");
}
