//! Reference suite: pH standard buffers, worked examples and recipe round trips against published values.
//!
//! Provenance of every value is in tests/README.md. Tolerances:
//! - pH(S) standards: ±0.02. pH(S) is defined with the Bates–Guggenheim
//!   convention (IUPAC, Buck et al. 2002) and molal units; the solver uses the
//!   Davies equation and treats molal ≈ molar, which differ by about 0.01 at
//!   I ≈ 0.1. A slip in a constant of 0.02 would still fail.
#![allow(clippy::unwrap_used, clippy::expect_used, clippy::indexing_slicing)]

use solver::activity::ActivityModel;
use solver::mixture::{solve_mixture, ComponentSpec, MixtureSpec};
use solver::recipe::{solve_recipe, Method, RecipeSpec};

fn mix(parts: &[(&str, &str, f64)]) -> MixtureSpec {
    MixtureSpec {
        temperature_c: 25.0,
        activity: ActivityModel::Davies,
        components: parts
            .iter()
            .map(|(s, f, c)| ComponentSpec {
                system: (*s).into(),
                form: Some((*f).into()),
                conc_m: *c,
            })
            .collect(),
        additives: vec![],
    }
}

fn ph(parts: &[(&str, &str, f64)]) -> f64 {
    let v = solve_mixture(&mix(parts), &[]).unwrap().equilibrium.ph;
    println!("{parts:?} -> pH {v:.4}");
    v
}

/// Hamer, Pinching & Acree (1946) J. Res. NBS 36, 47; Buck et al. (2002) Pure Appl. Chem. 74, 2169.
#[test]
fn potassium_hydrogen_phthalate_0_05() {
    let v = ph(&[("phthalate", "khp", 0.05)]);
    assert!((v - 4.005).abs() < 0.02, "KHP pH {v}");
}

/// J. Res. NBS 73A, 37 (1969); Buck et al. 2002.
#[test]
fn potassium_dihydrogen_citrate_0_05() {
    let v = ph(&[("citrate", "kh2_citrate", 0.05)]);
    assert!((v - 3.776).abs() < 0.02, "KH2citrate pH {v}");
}

/// IUPAC primary standard, Buck et al. 2002.
#[test]
fn equimolal_phosphate_0_025() {
    let v = ph(&[
        ("phosphate", "kh2po4", 0.025),
        ("phosphate", "na2hpo4", 0.025),
    ]);
    assert!((v - 6.865).abs() < 0.02, "phosphate 1:1 pH {v}");
}

/// Buck et al. 2002.
#[test]
fn physiological_phosphate_7_413() {
    let v = ph(&[
        ("phosphate", "kh2po4", 0.008695),
        ("phosphate", "na2hpo4", 0.03043),
    ]);
    assert!((v - 7.413).abs() < 0.02, "phosphate 1:3.5 pH {v}");
}

/// J. Res. NBS 73A, 37 (1969); Buck et al. 2002. Borax dissolves to 2 B(OH)3 + 2 B(OH)4⁻.
#[test]
fn borax_0_01() {
    let v = ph(&[("borate", "borax_10h2o", 0.01)]);
    assert!((v - 9.180).abs() < 0.02, "borax pH {v}");
}

/// J. Res. NBS 73A, 37 (1969); Buck et al. 2002.
#[test]
fn carbonate_0_025() {
    let v = ph(&[
        ("carbonate", "nahco3", 0.025),
        ("carbonate", "na2co3", 0.025),
    ]);
    assert!((v - 10.012).abs() < 0.02, "carbonate pH {v}");
}

/// Hill, Petrucci et al., General Chemistry 4th ed., problem 15.109: 1.0×10⁻⁸ M HCl → pH 6.98.
/// Here with the library's Kw at 25 °C (pKw 13.995) and activity; still 6.98 to two decimals.
#[test]
fn dilute_hcl_through_mixture_api() {
    let spec = MixtureSpec {
        temperature_c: 25.0,
        activity: ActivityModel::Davies,
        components: vec![],
        additives: vec![solver::mixture::AdditiveSpec {
            additive: solver::mixture::Additive::Hcl,
            conc_m: 1e-8,
        }],
    };
    let v = solve_mixture(&spec, &[]).unwrap().equilibrium.ph;
    assert!((v - 6.98).abs() < 0.006, "1e-8 M HCl pH {v}");
}

/// Computed: 0.100 M acetic acid, pKa 4.756, exact quadratic, ideal → pH 2.881.
#[test]
fn acetic_acid_ideal_quadratic() {
    let mut spec = mix(&[("acetate", "acetic_acid", 0.1)]);
    spec.activity = ActivityModel::Ideal;
    // The library's Kw at 25 °C differs negligibly from 1e-14 here.
    let v = solve_mixture(&spec, &[]).unwrap().equilibrium.ph;
    let ka = 10f64.powf(-4.756);
    let h = (-ka + (ka * ka + 4.0 * ka * 0.1).sqrt()) / 2.0;
    assert!((v + h.log10()).abs() < 1e-3, "{v}");
    assert!((v - 2.881).abs() < 0.001);
}

/// Computed (Van Slyke form): 0.1 M total acetate at pH = pKa, ideal:
/// β = ln(10)·C/4 = 0.0576 mol/(L·pH), plus the small water terms.
#[test]
fn van_slyke_capacity_at_pka() {
    // Equal acid and conjugate base; ideal; pH lands at pKa (4.756).
    let mut spec = mix(&[
        ("acetate", "acetic_acid", 0.05),
        ("acetate", "na_acetate", 0.05),
    ]);
    spec.activity = ActivityModel::Ideal;
    let eq = solve_mixture(&spec, &[]).unwrap().equilibrium;
    assert!((eq.ph - 4.756).abs() < 0.01, "{}", eq.ph);
    assert!((eq.capacity - 0.0576).abs() < 0.0005, "{}", eq.capacity);
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
