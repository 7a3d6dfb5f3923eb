//! Uncertainty budgets against closed forms, the solver's analytic β and a Monte Carlo check.
//!
//! Method and sources: tests/README.md, section `uncertainty.rs`. Specs are
//! built from JSON through the design document's serde types so that new
//! optional fields do not break these tests.
#![allow(clippy::unwrap_used, clippy::expect_used, clippy::indexing_slicing)]

use proptest::prelude::*;
use serde_json::json;
use solver::field::{field_reading, FieldSpec};
use solver::mixture::MixtureSpec;
use solver::recipe::{solve_recipe, suggest_pair, RecipeSpec};
use solver::uncertainty::{
    field_uncertainty, mixture_monte_carlo, mixture_uncertainty, pk_uncertainty,
    recipe_monte_carlo, recipe_uncertainty, suggested_flask_ml, UncertaintyInputs,
    UncertaintyWarning, PK_UNCERTAINTY,
};

const LOG10_E: f64 = std::f64::consts::LOG10_E;
const SQRT3: f64 = 1.732_050_807_568_877_2;

fn recipe(v: serde_json::Value) -> RecipeSpec {
    serde_json::from_value(v).unwrap()
}

fn mixture(v: serde_json::Value) -> MixtureSpec {
    serde_json::from_value(v).unwrap()
}

fn phosphate_two_forms() -> RecipeSpec {
    recipe(json!({
        "system": "phosphate", "target_ph": 7.4, "temperature_c": 37.0,
        "total_conc_m": 0.05, "volume_l": 0.5, "activity": "davies",
        "method": {"kind": "two_forms", "acid_form": "nah2po4_h2o", "base_form": "na2hpo4_7h2o"},
        "tolerance_ph": 0.05,
    }))
}

fn tris_titrate() -> RecipeSpec {
    recipe(json!({
        "system": "tris", "target_ph": 8.0, "temperature_c": 25.0,
        "total_conc_m": 0.05, "volume_l": 0.5, "activity": "davies",
        "method": {"kind": "titrate", "form": "tris_base", "titrant": "hcl", "titrant_m": 1.0},
        "tolerance_ph": 0.05,
    }))
}

fn acetate_stocks() -> RecipeSpec {
    recipe(json!({
        "system": "acetate", "target_ph": 4.8, "temperature_c": 20.0,
        "total_conc_m": 0.05, "volume_l": 0.5, "activity": "davies",
        "method": {"kind": "two_stocks", "acid_form": "acetic_acid", "acid_stock_m": 1.0,
                   "base_form": "na_acetate", "base_stock_m": 1.0},
        "tolerance_ph": 0.05,
    }))
}

/// Equimolar monoprotic buffer, ideal activity, only the pK uncertain:
/// pH = pK + log10(1) so ∂pH/∂pK = 1 and U95 = 2·u(pK) (computed).
#[test]
fn pk_alone_gives_twice_u_pk_for_an_equimolar_monoprotic_buffer() {
    let spec = mixture(json!({
        "temperature_c": 25.0, "activity": "ideal",
        "components": [
            {"system": "acetate", "form": "acetic_acid", "conc_m": 0.05},
            {"system": "acetate", "form": "na_acetate", "conc_m": 0.05}
        ],
    }));
    let u = mixture_uncertainty(&spec, &UncertaintyInputs::none(), &[], None).unwrap();
    let (u_pk, _) = pk_uncertainty("acetate", 1);
    assert_eq!(u.budget.len(), 1, "{:?}", u.budget);
    assert!(
        (u.u95_ph - 2.0 * u_pk).abs() < 0.01 * 2.0 * u_pk,
        "{} vs {}",
        u.u95_ph,
        2.0 * u_pk
    );
    assert!((u.budget[0].share - 1.0).abs() < 1e-12);
}

/// Two weighed forms, ideal, only the balance uncertain: pH = pK + log10(m_b M_a / (m_a M_b))
/// so U95 = 2·log10(e)·√(u₁²/m₁² + u₂²/m₂²) with u = readability/√3 (computed).
/// The closed form ignores [H⁺] beside the buffer; at 0.1 M and pH ≥ 4.6 that
/// is under 0.2 % of β (at 0.02 M and pH 4.3 the exact model is 2 % lower).
#[test]
fn two_masses_follow_the_closed_form() {
    for (target, volume, balance_mg) in [(4.756, 0.1, 1.0), (5.2, 0.05, 10.0), (4.6, 0.25, 0.1)] {
        let spec = recipe(json!({
            "system": "acetate", "target_ph": target, "temperature_c": 25.0,
            "total_conc_m": 0.1, "volume_l": volume, "activity": "ideal",
            "method": {"kind": "two_forms", "acid_form": "acetic_acid", "base_form": "na_acetate_3h2o"},
            "tolerance_ph": 0.05,
        }));
        let r = solve_recipe(&spec, &[]).unwrap();
        let mut inputs = UncertaintyInputs::none();
        inputs.balance_mg = balance_mg;
        let u = recipe_uncertainty(&spec, &r, &inputs, &[]).unwrap();
        let ub = balance_mg / 1000.0 / SQRT3;
        let m: Vec<f64> = r.ingredients.iter().filter_map(|i| i.grams).collect();
        assert_eq!(m.len(), 2);
        let want = 2.0 * LOG10_E * ((ub / m[0]).powi(2) + (ub / m[1]).powi(2)).sqrt();
        // Mass rows only (the pK row is still in the budget).
        let mass_var: f64 = u
            .budget
            .iter()
            .filter(|b| b.input.starts_with("mass of"))
            .map(|b| b.u_ph * b.u_ph)
            .sum();
        let got = 2.0 * mass_var.sqrt();
        assert!(
            (got - want).abs() < 0.01 * want,
            "{target}: {got} vs {want}"
        );
    }
}

/// The titrant-volume sensitivity through the full solver equals the
/// solver's analytic capacity: dpH/dV = c_stock / (1000 V β) for NaOH (computed).
#[test]
fn titrant_sensitivity_matches_analytic_capacity() {
    let spec = recipe(json!({
        "system": "acetate", "target_ph": 4.9, "temperature_c": 25.0,
        "total_conc_m": 0.05, "volume_l": 0.5, "activity": "davies",
        "method": {"kind": "titrate", "form": "acetic_acid", "titrant": "naoh", "titrant_m": 1.0},
        "tolerance_ph": 0.05,
    }));
    let r = solve_recipe(&spec, &[]).unwrap();
    let u = recipe_uncertainty(&spec, &r, &UncertaintyInputs::default(), &[]).unwrap();
    let row = u
        .budget
        .iter()
        .find(|b| b.input == "volume of NaOH stock")
        .unwrap();
    let want = 1.0 / (1000.0 * 0.5 * r.equilibrium.capacity);
    assert!(
        (row.sensitivity - want).abs() < 1e-3 * want,
        "{} vs {want}",
        row.sensitivity
    );
}

/// JCGM 101:2008: Monte Carlo with every input drawn at once agrees with the
/// first-order U95 within 10 % on representative recipes and a mixture.
#[test]
fn monte_carlo_agrees_with_first_order() {
    // Also without the (normal, additive) activity allowance, so that the
    // rectangular bench inputs and the pK carry the whole spread.
    let bench_only = UncertaintyInputs {
        activity_allowance: false,
        balance_mg: 10.0,
        ..UncertaintyInputs::default()
    };
    for inputs in [UncertaintyInputs::default(), bench_only] {
        for (name, spec) in [
            ("phosphate", phosphate_two_forms()),
            ("tris", tris_titrate()),
            ("acetate", acetate_stocks()),
        ] {
            let r = solve_recipe(&spec, &[]).unwrap();
            let fo = recipe_uncertainty(&spec, &r, &inputs, &[]).unwrap();
            let mc = recipe_monte_carlo(&spec, &r, &inputs, &[], 3000, 20_261_202).unwrap();
            println!(
                "{name}: first order {:.5}, Monte Carlo {:.5}",
                fo.u95_ph, mc.u95_ph
            );
            assert_eq!(mc.draws, 3000);
            assert!(
                (mc.u95_ph - fo.u95_ph).abs() < 0.10 * fo.u95_ph,
                "{name}: {} vs {}",
                mc.u95_ph,
                fo.u95_ph
            );
            assert!(
                (mc.mean - r.equilibrium.ph).abs() < 0.2 * fo.u95_ph,
                "{name}"
            );
            assert!(mc.low < r.equilibrium.ph && mc.high > r.equilibrium.ph);
        }
    }
    let inputs = UncertaintyInputs::default();
    let spec = mixture(json!({
        "temperature_c": 20.0, "activity": "davies",
        "components": [
            {"system": "tris", "form": "tris_base", "conc_m": 0.02},
            {"system": "tris", "form": "tris_hcl", "conc_m": 0.03}
        ],
        "additives": [{"additive": "nacl", "conc_m": 0.15}],
    }));
    let fo = mixture_uncertainty(&spec, &inputs, &[], None).unwrap();
    let mc = mixture_monte_carlo(&spec, &inputs, &[], 3000, 7).unwrap();
    assert!((mc.u95_ph - fo.u95_ph).abs() < 0.10 * fo.u95_ph);
}

#[test]
fn pk_larger_than_tolerance_is_warned() {
    let mut spec = phosphate_two_forms();
    spec.tolerance_ph = 0.004;
    let r = solve_recipe(&spec, &[]).unwrap();
    let u = recipe_uncertainty(&spec, &r, &UncertaintyInputs::default(), &[]).unwrap();
    assert!(u
        .warnings
        .iter()
        .any(|w| matches!(w, UncertaintyWarning::PkExceedsTolerance { .. })));
    assert!(u.notes.iter().any(|n| n.contains("pK uncertainty alone")));
    // A comfortable window: no warning.
    spec.tolerance_ph = 0.2;
    let r = solve_recipe(&spec, &[]).unwrap();
    let u = recipe_uncertainty(&spec, &r, &UncertaintyInputs::default(), &[]).unwrap();
    assert!(u.warnings.is_empty(), "{:?}", u.warnings);
}

#[test]
fn a_small_mass_on_a_coarse_balance_is_warned() {
    let mut spec = phosphate_two_forms();
    spec.volume_l = 0.01;
    spec.total_conc_m = 0.002;
    let r = solve_recipe(&spec, &[]).unwrap();
    let u = recipe_uncertainty(&spec, &r, &UncertaintyInputs::default(), &[]).unwrap();
    let w = u
        .warnings
        .iter()
        .find(|w| matches!(w, UncertaintyWarning::SmallMass { .. }))
        .unwrap();
    assert!(w.text().contains("weigh more and dilute"), "{}", w.text());
    // The same recipe at 1 L: masses of grams, no warning.
    spec.volume_l = 1.0;
    spec.total_conc_m = 0.05;
    let r = solve_recipe(&spec, &[]).unwrap();
    let u = recipe_uncertainty(&spec, &r, &UncertaintyInputs::default(), &[]).unwrap();
    assert!(!u
        .warnings
        .iter()
        .any(|w| matches!(w, UncertaintyWarning::SmallMass { .. })));
}

/// Un-ionized ammonia, f = 1/(1 + 10^(pKa − pH)): df/dpH = ln10·f(1−f), so the
/// pH-meter row is ln10·f(1−f)·0.02/√3 (computed; 0.02 is common practice).
#[test]
fn field_fraction_uncertainty_from_the_ph_meter() {
    let spec: FieldSpec = serde_json::from_value(json!({
        "system": "ammonium", "ph": 8.0, "temperature_c": 20.0,
        "total_unit": "mmol_per_l", "ionic": {"kind": "zero"},
    }))
    .unwrap();
    let r = field_reading(&spec, &[]).unwrap();
    let u = field_uncertainty(&spec, &r, &UncertaintyInputs::default(), &[]).unwrap();
    let nh3 = &u.species[1];
    let f = nh3.fraction;
    let row = nh3
        .budget
        .iter()
        .find(|b| b.input == "measured pH")
        .unwrap();
    let want = std::f64::consts::LN_10 * f * (1.0 - f) * 0.02 / SQRT3;
    assert!(
        (row.u_fraction - want).abs() < 1e-3 * want,
        "{} vs {want}",
        row.u_fraction
    );
    // pK row: ∂f/∂pK = −∂f/∂pH for a monoprotic system at fixed I.
    let pk = nh3
        .budget
        .iter()
        .find(|b| b.input.starts_with("pK1"))
        .unwrap();
    assert!((pk.sensitivity + row.sensitivity).abs() < 1e-3 * row.sensitivity.abs());
    assert!(nh3.budget.iter().any(|b| b.input == "temperature"));
    let sum: f64 = nh3.budget.iter().map(|b| b.share).sum();
    assert!((sum - 1.0).abs() < 1e-9);
}

#[test]
fn inputs_are_checked_and_read_with_defaults() {
    let bad = UncertaintyInputs {
        balance_mg: -1.0,
        ..UncertaintyInputs::default()
    };
    let spec = phosphate_two_forms();
    let r = solve_recipe(&spec, &[]).unwrap();
    let e = recipe_uncertainty(&spec, &r, &bad, &[])
        .unwrap_err()
        .to_string();
    assert!(e.contains("uncertainty.balance_mg"), "{e}");
    let d: UncertaintyInputs = serde_json::from_str("{}").unwrap();
    assert_eq!(d, UncertaintyInputs::default());
    assert!(serde_json::from_str::<UncertaintyInputs>("{\"balanse_mg\": 1}").is_err());
    let part: UncertaintyInputs = serde_json::from_str("{\"balance_mg\": 0.1}").unwrap();
    assert!((part.balance_mg - 0.1).abs() < 1e-15 && (part.temperature_k - 0.5).abs() < 1e-15);
}

#[test]
fn budget_json_shape_and_table() {
    let spec = phosphate_two_forms();
    let r = solve_recipe(&spec, &[]).unwrap();
    let u = recipe_uncertainty(&spec, &r, &UncertaintyInputs::default(), &[]).unwrap();
    let v = serde_json::to_value(&u).unwrap();
    assert!(v["u95_ph"].as_f64().unwrap() > 0.0);
    for key in ["input", "u_input", "unit", "u_ph", "share"] {
        assert!(v["budget"][0].get(key).is_some(), "{key}");
    }
    let names: Vec<&str> = u.budget.iter().map(|b| b.input.as_str()).collect();
    for want in [
        "pK2 of Phosphate",
        "activity model",
        "temperature",
        "mass of NaH2PO4·H2O",
        "mass of Na2HPO4·7H2O",
        "final volume (flask)",
    ] {
        assert!(names.contains(&want), "{want} in {names:?}");
    }
    // Largest first; U95 = 2·√Σu².
    assert!(u.budget.windows(2).all(|w| w[0].u_ph >= w[1].u_ph));
    let s: f64 = u.budget.iter().map(|b| b.u_ph * b.u_ph).sum();
    assert!((u.u95_ph - 2.0 * s.sqrt()).abs() < 1e-15);
    // Every library step has a table entry with a source.
    for sys in solver::system::library::library() {
        for k in 1..=sys.steps.len() {
            assert!(
                PK_UNCERTAINTY
                    .iter()
                    .any(|e| e.system == sys.id && e.step == k),
                "{} step {k}",
                sys.id
            );
        }
    }
    assert!((suggested_flask_ml(500.0) - 0.25).abs() < 1e-12);
}

/// Past the Davies range (I > 0.5 mol/L) the activity allowance takes in the
/// whole electrostatic correction: a 0.5 M equimolar phosphate in 1 M NaCl
/// (I ≈ 2.3 mol/L) gets a half-width A·3·√I/(1+√I) ≈ 0.9 pH at 25 °C
/// (A = 0.5085, Davies 1962 form; phosphate's second step has
/// |z_B² − z_HA²| = 3), where the Davies equation itself has turned over and
/// differs from the ideal model by only a few hundredths. That the Davies
/// equation fails past I ≈ 0.5 is common practice (concentrated phosphate
/// reads several tenths below its dilute buffer at the bench). Within the
/// range, the allowance stays base + per-I.
#[test]
fn past_the_davies_range_the_whole_electrostatic_correction_is_allowed() {
    let flask = |nacl: f64, po4: f64| {
        mixture(json!({
            "temperature_c": 25.0, "activity": "davies",
            "components": [
                {"system": "phosphate", "form": "nah2po4_h2o", "conc_m": po4},
                {"system": "phosphate", "form": "na2hpo4", "conc_m": po4}
            ],
            "additives": [{"additive": "nacl", "conc_m": nacl}]
        }))
    };
    let term = |spec: &MixtureSpec| {
        mixture_uncertainty(spec, &UncertaintyInputs::default(), &[], None)
            .unwrap()
            .budget
            .into_iter()
            .find(|b| b.input == "activity model")
            .unwrap()
    };
    let high = flask(1.0, 0.25);
    let eq = solver::mixture::solve_mixture(&high, &[])
        .unwrap()
        .equilibrium;
    let i = eq.ionic_strength;
    assert!(i > 2.0, "{i}");
    let s = i.sqrt();
    let half = 0.5085 * 3.0 * s / (1.0 + s);
    assert!(half > 0.85, "{half}");
    let t = term(&high);
    let want = 0.005 + 0.05 * i + half / 3f64.sqrt();
    assert!((t.u_input - want).abs() < 2e-3, "{} vs {want}", t.u_input);
    assert!(t.source.contains("past the Davies range"), "{}", t.source);
    // A dilute flask keeps the usual allowance.
    let low = flask(0.0, 0.025);
    let i = solver::mixture::solve_mixture(&low, &[])
        .unwrap()
        .equilibrium
        .ionic_strength;
    assert!(i < 0.5);
    assert!((term(&low).u_input - (0.005 + 0.05 * i)).abs() < 1e-12);
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 24, ..ProptestConfig::default() })]

    /// More tolerance on any input never gives a smaller U95.
    #[test]
    fn more_tolerance_never_gives_less_u(
        t in 0.0f64..2.0, b in 0.0f64..20.0, f in 0.0f64..1.0, p in 0.0f64..2.0,
        s in 0.0f64..3.0, k in 1.0f64..4.0, which in 0usize..3,
    ) {
        let spec = [phosphate_two_forms(), tris_titrate(), acetate_stocks()][which].clone();
        let r = solve_recipe(&spec, &[]).unwrap();
        let a = UncertaintyInputs {
            temperature_k: t,
            balance_mg: b,
            flask_ml: Some(f),
            pour_percent: Some(p),
            stock_percent: s,
            ..UncertaintyInputs::default()
        };
        let mut more = a.clone();
        more.temperature_k *= k;
        more.balance_mg *= k;
        more.flask_ml = Some(f * k);
        more.pour_percent = Some(p * k);
        more.stock_percent *= k;
        let ua = recipe_uncertainty(&spec, &r, &a, &[]).unwrap().u95_ph;
        let ub = recipe_uncertainty(&spec, &r, &more, &[]).unwrap().u95_ph;
        prop_assert!(ub >= ua - 1e-12, "{} < {}", ub, ua);
    }
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 40, ..ProptestConfig::default() })]

    /// Any library system, a target near one of its pK, 5–45 °C, any ± figures in their
    /// accepted ranges: a finite, non-negative U95 whose shares add to one, or an error.
    #[test]
    fn budgets_are_finite_or_refused(
        si in 0usize..25, dpk in -0.8f64..0.8, t in 5.0f64..45.0, c in -3.0f64..-0.7,
        v in 0.001f64..2.0, bal in 0.0f64..100.0, temp in 0.0f64..5.0, ideal in any::<bool>(),
    ) {
        let lib = solver::system::library::library();
        let sys = &lib[si % lib.len()];
        let Ok(pks) = solver::system::thermo::system_pks(sys, t) else { return Ok(()) };
        let target = (pks[pks.len() / 2] + dpk).clamp(0.5, 13.5);
        let Ok((a, b)) = suggest_pair(&sys.id, target, t, &[]) else { return Ok(()) };
        let spec = recipe(json!({
            "system": sys.id, "target_ph": target, "temperature_c": t,
            "total_conc_m": 10f64.powf(c), "volume_l": v,
            "activity": if ideal { "ideal" } else { "davies" },
            "method": {"kind": "two_forms", "acid_form": a, "base_form": b},
            "tolerance_ph": 0.05,
        }));
        let Ok(r) = solve_recipe(&spec, &[]) else { return Ok(()) };
        let inputs = UncertaintyInputs {
            balance_mg: bal,
            temperature_k: temp,
            ..UncertaintyInputs::default()
        };
        if let Ok(u) = recipe_uncertainty(&spec, &r, &inputs, &[]) {
            prop_assert!(u.u95_ph.is_finite() && u.u95_ph >= 0.0, "{}", u.u95_ph);
            let s: f64 = u.budget.iter().map(|b| b.share).sum();
            prop_assert!(u.u95_ph == 0.0 || (s - 1.0).abs() < 1e-9, "{}", s);
        }
    }
}
