//! The bench workflow: a buffer made at one temperature and used at another, made as a
//! concentrate, checked against published temperature dependences and by property tests.
#![allow(clippy::unwrap_used, clippy::expect_used, clippy::indexing_slicing)]

use proptest::prelude::*;
use solver::equilibrium::activity::ActivityModel;
use solver::mixture::{
    solve_mixture, what_if, Additive, AdditiveSpec, ComponentSpec, MixtureSpec, WhatIf,
};
use solver::recipe::{
    solve_recipe, suggest_pair, MeterSolution, Method, RecipeSpec, RecipeWarning,
};
use solver::system::library::library;

fn spec(system: &str, method: Method, target: f64, t: f64) -> RecipeSpec {
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

fn tris_pair() -> Method {
    Method::TwoForms {
        acid_form: "tris_hcl".into(),
        base_form: "tris_base".into(),
    }
}

fn tris_titrated() -> Method {
    Method::Titrate {
        form: "tris_base".into(),
        titrant: Additive::Hcl,
        titrant_m: 1.0,
    }
}

fn phosphate_stocks() -> Method {
    Method::TwoStocks {
        acid_form: "nah2po4_h2o".into(),
        acid_stock_m: 1.0,
        base_form: "na2hpo4_7h2o".into(),
        base_stock_m: 1.0,
    }
}

/// Bates & Hetzer (1961) J. Phys. Chem. 65, 667: pK = 2981.4/T − 3.5888 + 0.005571·T
/// (T in kelvin), confirmed (also in REFERENCE-DATA §3).
fn tris_pk_bates_hetzer(t_c: f64) -> f64 {
    let t = t_c + 273.15;
    2981.4 / t - 3.5888 + 0.005571 * t
}

/// Tris made to pH 8.00 for 25 °C and read at 37 °C reads lower by about
/// 12 K × 0.028 pH/K.
///
/// Sources: the common-practice slope −0.028 pH/K (Bates & Hetzer 1961,
/// J. Phys. Chem. 65, 667, dpK/dT ≈ −0.028 K⁻¹ near 25 °C): −0.336 ± 0.03,
/// the tolerance covering the slope's curvature over 12 K (the formula gives
/// −0.320) and activity terms. Computed check: the shift equals the change of
/// the Bates–Hetzer pK within 0.01 (a +1/0 pair: only γ(TrisH⁺) through A(T)
/// and the re-solved ionic strength move it further).
#[test]
fn tris_made_for_25c_reads_lower_at_37c() {
    for method in [tris_pair(), tris_titrated()] {
        let mut s = spec("tris", method, 8.00, 25.0);
        s.prepare_temperature_c = Some(37.0);
        let r = solve_recipe(&s, &[]).unwrap();
        assert!((r.equilibrium.ph - 8.00).abs() < 1e-6);
        assert_eq!(r.meter.temperature_c, 37.0);
        let shift = r.meter.ph - 8.00;
        assert!((shift - (-12.0 * 0.028)).abs() < 0.03, "shift {shift}");
        let dpk = tris_pk_bates_hetzer(37.0) - tris_pk_bates_hetzer(25.0);
        assert!((shift - dpk).abs() < 0.01, "shift {shift} vs ΔpK {dpk}");
        // The steps tell the technician what the meter reads where.
        let all = r.steps.join("\n");
        assert!(
            all.contains(&format!("pH {:.2} at 37.0 °C", r.meter.ph)),
            "{all}"
        );
        assert!(
            all.contains("pH 8.00 at the working temperature, 25.0 °C"),
            "{all}"
        );
        assert!(all.contains("bring to 37.0 °C"), "{all}");
    }
}

/// The titration method keeps its exact titrant volume and says to titrate to
/// the meter reading at the preparation temperature.
#[test]
fn titration_volume_is_the_exact_one_at_any_preparation_temperature() {
    let plain = solve_recipe(&spec("tris", tris_titrated(), 8.0, 25.0), &[]).unwrap();
    let mut s = spec("tris", tris_titrated(), 8.0, 25.0);
    s.prepare_temperature_c = Some(20.0);
    let warm = solve_recipe(&s, &[]).unwrap();
    assert_eq!(plain.ingredients, warm.ingredients);
    let titrate_step = warm
        .steps
        .iter()
        .find(|x| x.contains("HCl"))
        .unwrap()
        .clone();
    assert!(
        titrate_step.contains("until the meter reads"),
        "{titrate_step}"
    );
    assert!(
        titrate_step.contains(&format!("pH {:.2} at 20.0 °C", warm.meter.ph)),
        "{titrate_step}"
    );
    assert!(
        warm.meter.ph > 8.0,
        "tris reads higher when cooler: {}",
        warm.meter.ph
    );
}

/// pH(S) of the equimolal phosphate standard (0.025 mol/kg KH2PO4 + 0.025 mol/kg
/// Na2HPO4), Buck et al. (2002) Pure Appl. Chem. 74, 2169, Table of pH(S) values.
/// The 25 °C value 6.865 is confirmed (REFERENCE-DATA §1); the other
/// temperatures are from memory.
const PHOSPHATE_PHS: [(f64, f64); 8] = [
    (0.0, 6.984),
    (10.0, 6.923),
    (20.0, 6.881),
    (25.0, 6.865),
    (30.0, 6.853),
    (37.0, 6.844),
    (40.0, 6.838),
    (50.0, 6.833),
];

/// The phosphate standard made at one temperature and read at another follows
/// the published pH(S) temperature dependence: the change of the reading
/// matches the change of pH(S) within 0.012. The values other than 25 °C are
/// from memory; the model (Davies, molar ≈ molal) differs by up to 0.007 (at
/// 50 °C), so a slip of a unit or two in the third decimal does not break the
/// check, while a missing or wrong-signed pK(T) would (pH(S) moves 0.15 over
/// 0–50 °C).
#[test]
fn phosphate_standard_follows_published_temperature_dependence() {
    let standard = |t: f64| MixtureSpec {
        temperature_c: t,
        activity: ActivityModel::Davies,
        components: vec![
            ComponentSpec {
                system: "phosphate".into(),
                form: Some("kh2po4".into()),
                conc_m: 0.025,
            },
            ComponentSpec {
                system: "phosphate".into(),
                form: Some("na2hpo4".into()),
                conc_m: 0.025,
            },
        ],
        additives: vec![],
        atmosphere: None,
    };
    for (t_work, phs_work) in [(25.0, 6.865), (37.0, 6.844), (20.0, 6.881)] {
        // The recipe whose composition is the standard: target = the model's
        // pH of the standard at the working temperature.
        let target = solve_mixture(&standard(t_work), &[])
            .unwrap()
            .equilibrium
            .ph;
        for (t_read, phs_read) in PHOSPHATE_PHS {
            let mut s = spec(
                "phosphate",
                Method::TwoForms {
                    acid_form: "kh2po4".into(),
                    base_form: "na2hpo4".into(),
                },
                target,
                t_work,
            );
            s.prepare_temperature_c = Some(t_read);
            let r = solve_recipe(&s, &[]).unwrap();
            // The recipe really is the equimolal standard.
            let (a, b) = (r.ingredients[0].mol, r.ingredients[1].mol);
            assert!((a / b - 1.0).abs() < 1e-6, "ratio {}", a / b);
            assert!(((a + b) / 0.5 - 0.05).abs() < 1e-12);
            let model = r.meter.ph - target;
            let published = phs_read - phs_work;
            assert!(
                (model - published).abs() < 0.012,
                "made for {t_work} °C, read at {t_read} °C: model {model:+.4}, published {published:+.4}"
            );
        }
    }
}

/// Diluting the concentrate N-fold with water returns the target within 0.001 pH
/// (internal consistency), for every method, with a salt.
#[test]
fn concentrate_dilution_returns_the_target() {
    for (system, method, target, t) in [
        ("tris", tris_pair(), 8.0, 25.0),
        ("tris", tris_titrated(), 7.8, 30.0),
        ("phosphate", phosphate_stocks(), 7.2, 20.0),
    ] {
        for n in [2.0, 5.0, 10.0] {
            let mut s = spec(system, method.clone(), target, t);
            s.salts = vec![AdditiveSpec {
                additive: Additive::Nacl,
                conc_m: 0.1,
            }];
            s.concentrate_factor = n;
            let r = solve_recipe(&s, &[]).unwrap();
            let c = r.concentrate.unwrap();
            assert_eq!(c.factor, n);
            // The concentrate as weighed: every amount over the final volume.
            let mut conc = r.mixture.clone();
            for comp in &mut conc.components {
                comp.conc_m *= n;
            }
            for a in &mut conc.additives {
                a.conc_m *= n;
            }
            let weighed: f64 = r.ingredients.iter().map(|i| i.mol).sum::<f64>() / s.volume_l;
            let in_conc: f64 = conc.components.iter().map(|x| x.conc_m).sum::<f64>()
                + conc.additives.iter().map(|x| x.conc_m).sum::<f64>();
            assert!(
                (weighed / in_conc - 1.0).abs() < 1e-12,
                "{weighed} vs {in_conc}"
            );
            let own = solve_mixture(&conc, &[]).unwrap().equilibrium;
            assert!((own.ionic_strength - c.ionic_strength).abs() < 1e-12);
            // Its own pH is given only within the Davies range (0.5 M).
            match c.ph {
                Some(ph) => assert!((own.ph - ph).abs() < 1e-9 && own.ionic_strength <= 0.5),
                None => assert!(own.ionic_strength > 0.5, "{}", own.ionic_strength),
            }
            let w = WhatIf {
                dilution_factor: n,
                ..WhatIf::default()
            };
            let diluted = what_if(&conc, &[], &w).unwrap().diluted_ph;
            assert!(
                (diluted - target).abs() < 0.001,
                "{system} ×{n}: {diluted} vs {target}"
            );
            let last = r.steps.last().unwrap();
            assert!(last.starts_with("Before use, dilute 1 + "), "{last}");
        }
    }
}

#[test]
fn dilution_step_reads_like_the_bench() {
    let mut s = spec("tris", tris_pair(), 8.0, 25.0);
    s.volume_l = 1.0;
    s.concentrate_factor = 10.0;
    let r = solve_recipe(&s, &[]).unwrap();
    let last = r.steps.last().unwrap();
    assert!(
        last.contains("dilute 1 + 9 with water: 100 mL of concentrate made up to 1 L"),
        "{last}"
    );
    assert!(last.contains("this batch makes 10 L"), "{last}");
}

/// A 10× phosphate concentrate (ionic strength about 1.3 M) is past the
/// Davies range. Common practice (no source: widely reported at the bench) is
/// that such a concentrate reads several tenths of a pH unit below its 1×
/// buffer, while Davies predicts it above: so no pH is given for it, the
/// concentrate is never to be adjusted by the meter, and the check moves to a
/// portion diluted to working strength, whose reading is the working buffer's.
#[test]
fn a_concentrate_past_the_activity_model_gets_no_reading_and_a_diluted_check() {
    let mut s = spec(
        "phosphate",
        Method::TwoForms {
            acid_form: "nah2po4_h2o".into(),
            base_form: "na2hpo4_7h2o".into(),
        },
        7.4,
        37.0,
    );
    s.prepare_temperature_c = Some(22.0);
    s.concentrate_factor = 10.0;
    let r = solve_recipe(&s, &[]).unwrap();
    let c = r.concentrate.unwrap();
    assert!(c.ionic_strength > 0.5, "{}", c.ionic_strength);
    assert_eq!(c.ph, None);
    assert_eq!(r.meter.solution, MeterSolution::DilutedPortion);
    // The diluted portion is the working buffer read at 22 °C: the same as a
    // 1× recipe made at 22 °C, which reads above its 37 °C target because
    // phosphate's pK₂ falls as it warms (about −0.003 per K; common practice).
    let mut one = s.clone();
    one.concentrate_factor = 1.0;
    let r1 = solve_recipe(&one, &[]).unwrap();
    assert_eq!(r1.meter.solution, MeterSolution::WorkingBuffer);
    assert!(
        (r.meter.ph - r1.meter.ph).abs() < 1e-9,
        "{} vs {}",
        r.meter.ph,
        r1.meter.ph
    );
    assert!(r.meter.ph > 7.4, "{}", r.meter.ph);
    let w = r
        .warnings
        .iter()
        .find(|w| matches!(w, RecipeWarning::ConcentrateBeyondModel { .. }))
        .unwrap();
    let text = w.message();
    assert!(
        text.contains("not predicted") && text.contains("do not adjust the concentrate"),
        "{text}"
    );
    let all = r.steps.join("\n");
    assert!(
        all.contains(
            "Check: dilute a portion 1 + 9 with water (for example 10 mL made up to 100 mL)"
        ),
        "{all}"
    );
    assert!(!all.contains("for the 10× concentrate"), "{all}");
    // Within the model's range the concentrate has its own reading and no
    // such warning.
    s.concentrate_factor = 2.0;
    let r = solve_recipe(&s, &[]).unwrap();
    assert!(r.concentrate.unwrap().ph.is_some());
    assert_eq!(r.meter.solution, MeterSolution::Concentrate);
    assert!(!r
        .warnings
        .iter()
        .any(|w| matches!(w, RecipeWarning::ConcentrateBeyondModel { .. })));
    assert!(r.steps.join("\n").contains("for the 2× concentrate"));
}

/// A titrated concentrate past the model's range: the titrant is added as
/// computed, never titrated to a meter reading of the concentrate.
#[test]
fn a_titrated_concentrate_past_the_model_is_not_titrated_by_the_meter() {
    let mut s = spec("tris", tris_titrated(), 7.8, 25.0);
    s.salts = vec![AdditiveSpec {
        additive: Additive::Nacl,
        conc_m: 0.15,
    }];
    s.concentrate_factor = 10.0;
    let r = solve_recipe(&s, &[]).unwrap();
    assert_eq!(r.meter.solution, MeterSolution::DilutedPortion);
    let all = r.steps.join("\n");
    assert!(
        all.contains("do not titrate the concentrate by the meter"),
        "{all}"
    );
    assert!(!all.contains("titrating until the meter reads"), "{all}");
}

#[test]
fn out_of_range_bench_inputs_are_refused_by_name() {
    // Tris data cover 0–50 °C (Bates & Hetzer's range): 55 °C is refused.
    let mut s = spec("tris", tris_pair(), 8.0, 25.0);
    s.prepare_temperature_c = Some(55.0);
    let e = solve_recipe(&s, &[]).unwrap_err().to_string();
    assert!(e.starts_with("prepare_temperature_c"), "{e}");
    s.prepare_temperature_c = Some(f64::NAN);
    assert!(solve_recipe(&s, &[]).is_err());
    let mut s = spec("tris", tris_pair(), 8.0, 25.0);
    for bad in [0.5, 0.0, 51.0, f64::INFINITY, -3.0] {
        s.concentrate_factor = bad;
        let e = solve_recipe(&s, &[]).unwrap_err().to_string();
        assert!(e.starts_with("concentrate_factor"), "{bad}: {e}");
    }
    // 0.5 M Tris × 12 = 6 M: above the 5 mol/L bound.
    let mut s = spec("tris", tris_pair(), 8.0, 25.0);
    s.total_conc_m = 0.5;
    s.concentrate_factor = 12.0;
    let e = solve_recipe(&s, &[]).unwrap_err().to_string();
    assert!(
        e.starts_with("concentrate_factor") && e.contains("above 5 mol/L"),
        "{e}"
    );
    // The salt counts too.
    let mut s = spec("tris", tris_pair(), 8.0, 25.0);
    s.salts = vec![AdditiveSpec {
        additive: Additive::Nacl,
        conc_m: 0.15,
    }];
    s.concentrate_factor = 40.0;
    let e = solve_recipe(&s, &[]).unwrap_err().to_string();
    assert!(e.contains("NaCl") && e.contains("above 5 mol/L"), "{e}");
}

#[test]
fn out_of_range_bench_inputs_in_a_document_name_the_path() {
    use solver::document::{demo_design, parse_design, to_json};
    let mut d = demo_design();
    d.recipe.prepare_temperature_c = Some(75.0);
    let e = parse_design(&to_json(&d)).unwrap_err().to_string();
    assert!(e.starts_with("recipe.prepare_temperature_c"), "{e}");
    let mut d = demo_design();
    d.recipe.concentrate_factor = 80.0;
    let e = parse_design(&to_json(&d)).unwrap_err().to_string();
    assert!(e.starts_with("recipe.concentrate_factor"), "{e}");
    // Both fields round-trip, and stay out of documents that do not use them.
    let mut d = demo_design();
    d.recipe.prepare_temperature_c = None;
    assert!(!to_json(&d).contains("prepare_temperature_c"));
    assert!(!to_json(&d).contains("concentrate_factor"));
    d.recipe.prepare_temperature_c = Some(22.0);
    d.recipe.concentrate_factor = 5.0;
    assert_eq!(parse_design(&to_json(&d)).unwrap(), d);
}

fn random_recipe(si: usize, offset: f64, t: f64, lc: f64, method: usize) -> Option<RecipeSpec> {
    let sys = &library()[si % library().len()];
    let pks = solver::system::thermo::system_pks(sys, t).ok()?;
    let pk = pks.iter().copied().find(|p| (2.5..11.5).contains(p))?;
    let target = pk + offset;
    let (acid, base) = suggest_pair(&sys.id, target, t, &[]).ok()?;
    let m = match method {
        0 => Method::TwoForms {
            acid_form: acid,
            base_form: base,
        },
        1 => Method::Titrate {
            form: acid,
            titrant: Additive::Naoh,
            titrant_m: 1.0,
        },
        _ => Method::TwoStocks {
            acid_form: acid,
            acid_stock_m: 2.0,
            base_form: base,
            base_stock_m: 2.0,
        },
    };
    let mut s = spec(&sys.id, m, target, t);
    s.total_conc_m = 10f64.powf(lc);
    s.volume_l = 1.0;
    Some(s)
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 200, ..ProptestConfig::default() })]

    /// Preparing at the working temperature is today's recipe, exactly.
    #[test]
    fn prepare_at_working_temperature_is_todays_recipe(si in 0usize..25, offset in -0.8f64..0.8,
            t in 15.0f64..35.0, lc in -3.0f64..-1.0, method in 0usize..3) {
        let Some(base) = random_recipe(si, offset, t, lc, method) else { return Ok(()); };
        let Ok(today) = solve_recipe(&base, &[]) else { return Ok(()); };
        let mut s = base.clone();
        s.prepare_temperature_c = Some(t);
        let same = solve_recipe(&s, &[]).unwrap();
        prop_assert_eq!(&same, &today);
        prop_assert_eq!(today.meter.temperature_c, t);
        prop_assert_eq!(today.meter.ph, today.equilibrium.ph);
        prop_assert!(today.concentrate.is_none());
    }

    /// Another preparation temperature changes what the meter reads, never the amounts.
    #[test]
    fn preparation_temperature_never_changes_the_amounts(si in 0usize..25, offset in -0.8f64..0.8,
            t in 15.0f64..35.0, tp in 15.0f64..35.0, lc in -3.0f64..-1.0, method in 0usize..3) {
        let Some(base) = random_recipe(si, offset, t, lc, method) else { return Ok(()); };
        let Ok(today) = solve_recipe(&base, &[]) else { return Ok(()); };
        let mut s = base.clone();
        s.prepare_temperature_c = Some(tp);
        let r = solve_recipe(&s, &[]).unwrap();
        prop_assert_eq!(&r.ingredients, &today.ingredients);
        prop_assert_eq!(&r.equilibrium, &today.equilibrium);
        prop_assert_eq!(r.meter.temperature_c, tp);
        // The meter reading is the same composition solved at tp.
        let mut at_tp = r.mixture.clone();
        at_tp.temperature_c = tp;
        let direct = solve_mixture(&at_tp, &[]).unwrap().equilibrium.ph;
        prop_assert!((direct - r.meter.ph).abs() < 1e-9, "{direct} vs {}", r.meter.ph);
    }

    /// Factor 1 is today's recipe exactly; factor N scales every amount by N.
    #[test]
    fn concentrate_scales_every_amount(si in 0usize..25, offset in -0.8f64..0.8,
            t in 15.0f64..35.0, lc in -3.0f64..-1.3, method in 0usize..3, n in 1.0f64..20.0) {
        let Some(base) = random_recipe(si, offset, t, lc, method) else { return Ok(()); };
        let Ok(today) = solve_recipe(&base, &[]) else { return Ok(()); };
        let mut one = base.clone();
        one.concentrate_factor = 1.0;
        prop_assert_eq!(&solve_recipe(&one, &[]).unwrap(), &today);
        let mut s = base.clone();
        s.concentrate_factor = n;
        // Refusals (stocks or titrant too dilute for the concentrate, more than
        // 5 mol/L) are errors; every success scales.
        let Ok(r) = solve_recipe(&s, &[]) else { return Ok(()); };
        prop_assert_eq!(r.ingredients.len(), today.ingredients.len());
        let close = |a: Option<f64>, b: Option<f64>| match (a, b) {
            (Some(x), Some(y)) => (x - n * y).abs() <= 1e-12 * (n * y).abs().max(1e-300),
            (None, None) => true,
            _ => false,
        };
        for (c, w) in r.ingredients.iter().zip(&today.ingredients) {
            prop_assert!(close(Some(c.mol), Some(w.mol)), "{} {} vs {}", c.formula, c.mol, w.mol);
            prop_assert!(close(c.grams, w.grams), "{} grams", c.formula);
            prop_assert!(close(c.ml, w.ml), "{} mL", c.formula);
        }
        // The working buffer is unchanged.
        prop_assert_eq!(&r.mixture, &today.mixture);
        prop_assert_eq!(&r.equilibrium, &today.equilibrium);
    }
}

/// A 10× of 100 mM phosphate kept in the cold room: about 0.76 M of
/// Na₂HPO₄ (as the heptahydrate) is far more than the roughly 17 g/L that
/// dissolves near 0–4 °C (handbook solubility about 1.7–2.5 g per 100 g
/// water, from memory) — warned with the figures at the storage
/// temperature, none where it is made at 37 °C... and none for the 1×
/// working buffer. Values: see `recipe/solubility.rs` (from memory).
#[test]
fn a_cold_stored_phosphate_concentrate_is_warned_it_will_crystallise() {
    let mut s = spec(
        "phosphate",
        Method::TwoForms {
            acid_form: "nah2po4_h2o".into(),
            base_form: "na2hpo4_7h2o".into(),
        },
        7.4,
        25.0,
    );
    s.total_conc_m = 0.1;
    s.concentrate_factor = 10.0;
    s.prepare_temperature_c = Some(37.0);
    s.store_temperature_c = Some(4.0);
    let r = solve_recipe(&s, &[]).unwrap();
    let sol: Vec<&RecipeWarning> = r
        .warnings
        .iter()
        .filter(|w| matches!(w, RecipeWarning::Solubility { .. }))
        .collect();
    assert_eq!(sol.len(), 1, "{sol:?}");
    let RecipeWarning::Solubility {
        formula,
        conc_m,
        needed_g_l,
        soluble_g_l,
        stored,
        ..
    } = sol[0]
    else {
        unreachable!()
    };
    assert_eq!(formula, "Na2HPO4·7H2O");
    assert!(*stored);
    // 0.1 M phosphate at pH 7.4, 25 °C is about 0.076 M HPO₄²⁻; ×10 = 0.76 M,
    // i.e. about 108 g/L as anhydrous Na₂HPO₄ (141.96 g/mol).
    assert!((conc_m - 0.76).abs() < 0.05, "{conc_m}");
    assert!((needed_g_l - conc_m * 141.96).abs() < 0.1);
    assert!(*soluble_g_l < 40.0, "{soluble_g_l}");
    let text = sol[0].message();
    assert!(
        text.contains("where it is kept") && text.contains("weaker stock"),
        "{text}"
    );
    // The same concentrate kept where it is made: no warning. The 1×: none.
    s.store_temperature_c = None;
    let r = solve_recipe(&s, &[]).unwrap();
    assert!(!r
        .warnings
        .iter()
        .any(|w| matches!(w, RecipeWarning::Solubility { .. })));
    s.concentrate_factor = 1.0;
    s.store_temperature_c = Some(4.0);
    let r = solve_recipe(&s, &[]).unwrap();
    assert!(!r
        .warnings
        .iter()
        .any(|w| matches!(w, RecipeWarning::Solubility { .. })));
}

/// Made at the bench (22 °C) the same 10× needs warming: the warning says
/// from about which temperature it dissolves; a 40× would not dissolve at
/// any temperature of the table and is refused on the factor.
#[test]
fn a_phosphate_concentrate_made_cold_says_it_needs_warming_or_is_refused() {
    let mut s = spec(
        "phosphate",
        Method::TwoForms {
            acid_form: "nah2po4_h2o".into(),
            base_form: "na2hpo4_7h2o".into(),
        },
        7.4,
        25.0,
    );
    s.total_conc_m = 0.1;
    s.concentrate_factor = 10.0;
    s.prepare_temperature_c = Some(22.0);
    let r = solve_recipe(&s, &[]).unwrap();
    let w = r
        .warnings
        .iter()
        .find(|w| matches!(w, RecipeWarning::Solubility { stored: false, .. }))
        .unwrap();
    let text = w.message();
    assert!(text.contains("dissolves only above about"), "{text}");
    s.concentrate_factor = 40.0;
    let e = solve_recipe(&s, &[]).unwrap_err();
    assert_eq!(e.field(), Some("concentrate_factor"));
    assert!(
        e.to_string()
            .contains("more than dissolves at any temperature"),
        "{e}"
    );
}

#[test]
fn a_storage_temperature_outside_0_to_60_is_refused_by_name() {
    let mut s = spec("tris", tris_pair(), 8.0, 25.0);
    s.store_temperature_c = Some(-5.0);
    let e = solve_recipe(&s, &[]).unwrap_err();
    assert!(e.to_string().starts_with("store_temperature_c"), "{e}");
    let mut d = solver::document::demo_design();
    d.recipe.store_temperature_c = Some(70.0);
    let e = solver::document::parse_design(&solver::document::to_json(&d)).unwrap_err();
    assert!(
        e.to_string().starts_with("recipe.store_temperature_c"),
        "{e}"
    );
}
