//! Property tests over random valid mixtures: balances close, fractions sum to one,
//! analytic β matches a finite difference, pH rises with base, recipes round-trip.
#![allow(clippy::unwrap_used, clippy::expect_used, clippy::indexing_slicing)]

use proptest::prelude::*;
use solver::equilibrium::activity::ActivityModel;
use solver::equilibrium::{capacity_at, charge_residual, solve, solve_at_ionic_strength};
use solver::mixture::{prepare, solve_mixture, Additive, AdditiveSpec, ComponentSpec, MixtureSpec};
use solver::recipe::{solve_recipe, suggest_pair, Method, RecipeSpec};
use solver::system::library::library;

fn component() -> impl Strategy<Value = ComponentSpec> {
    let n = library().len();
    (0..n, 0usize..16, -6.0f64..-0.5).prop_map(|(si, fi, lc)| {
        let sys = &library()[si];
        let form = sys
            .forms
            .get(fi % sys.forms.len().max(1))
            .map(|f| f.id.clone());
        ComponentSpec {
            system: sys.id.clone(),
            form,
            conc_m: 10f64.powf(lc),
        }
    })
}

fn additive() -> impl Strategy<Value = AdditiveSpec> {
    (0usize..5, -7.0f64..-1.0).prop_map(|(i, lc)| AdditiveSpec {
        additive: Additive::ALL[i],
        conc_m: 10f64.powf(lc),
    })
}

fn mixture() -> impl Strategy<Value = MixtureSpec> {
    (
        prop::collection::vec(component(), 1..4),
        prop::collection::vec(additive(), 0..3),
        15.0f64..35.0,
        any::<bool>(),
    )
        .prop_map(|(components, additives, t, ideal)| MixtureSpec {
            temperature_c: t,
            activity: if ideal {
                ActivityModel::Ideal
            } else {
                ActivityModel::Davies
            },
            components,
            additives,
            atmosphere: None,
        })
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 300, ..ProptestConfig::default() })]

    #[test]
    fn balances_close_and_fractions_sum_to_one(spec in mixture()) {
        let r = solve_mixture(&spec, &[]).unwrap();
        let p = prepare(&spec, &[]).unwrap();
        let eq = &r.equilibrium;
        // Charge balance closes relative to the largest charge present.
        let scale: f64 = p.composition.acids.iter().map(|a| a.total * 3.0).sum::<f64>()
            + p.composition.spectator_z2 + eq.h + eq.oh;
        let res = charge_residual(&p.composition, eq.ph, eq.ionic_strength);
        prop_assert!(res.abs() <= 1e-9 * scale, "residual {res} scale {scale}");
        for (s, acid) in r.systems.iter().zip(p.composition.acids.iter()) {
            let fsum: f64 = s.species.iter().map(|x| x.fraction).sum();
            prop_assert!((fsum - 1.0).abs() < 1e-12, "fractions sum {fsum}");
            // Mass balance.
            let csum: f64 = s.species.iter().map(|x| x.conc).sum();
            prop_assert!((csum - acid.total).abs() <= 1e-12 * acid.total.max(1e-30) + 1e-300);
        }
    }

    #[test]
    fn analytic_capacity_matches_finite_difference(spec in mixture()) {
        // β = dC_base/dpH. The solver's β is analytic (from the Jacobian of the
        // coupled charge-balance / ionic-strength system); a central difference of
        // added NaOH, each side a full solve, must agree.
        let p = prepare(&spec, &[]).unwrap();
        let eq = p.solve().unwrap();
        // One-sided second-order difference, every step adding NaOH (adding HCl
        // instead would raise, not lower, the ionic strength).
        let db = (eq.capacity * 1e-4).max(1e-12);
        let f1 = solve(&p.with_strong(db).composition, eq.ph).unwrap().ph;
        let f2 = solve(&p.with_strong(2.0 * db).composition, eq.ph).unwrap().ph;
        let dph_db = (-3.0 * eq.ph + 4.0 * f1 - f2) / (2.0 * db);
        let fd = 1.0 / dph_db;
        prop_assert!(((fd - eq.capacity) / eq.capacity).abs() < 1e-3,
            "analytic {} fd {}", eq.capacity, fd);
    }

    #[test]
    fn fixed_ionic_strength_capacity_matches_finite_difference(spec in mixture()) {
        // The capacity curve over pH (capacity_at) holds the ionic strength fixed;
        // check it against a difference at the same frozen I.
        let p = prepare(&spec, &[]).unwrap();
        let eq = p.solve().unwrap();
        let i = eq.ionic_strength;
        let beta = capacity_at(&p.composition, eq.ph, i);
        let db = (beta * 1e-4).max(1e-12);
        let up = solve_at_ionic_strength(&p.with_strong(db).composition, i, eq.ph).unwrap();
        let dn = solve_at_ionic_strength(&p.with_strong(-db).composition, i, eq.ph).unwrap();
        let fd = 2.0 * db / (up - dn);
        prop_assert!(((fd - beta) / beta).abs() < 1e-3, "analytic {beta} fd {fd}");
    }

    #[test]
    fn ph_rises_with_added_base(spec in mixture(), steps in prop::collection::vec(1e-6f64..1e-2, 1..6)) {
        let p = prepare(&spec, &[]).unwrap();
        let mut last = p.solve().unwrap().ph;
        let mut added = 0.0;
        for s in steps {
            added += s;
            let ph = solve(&p.with_strong(added).composition, last).unwrap().ph;
            prop_assert!(ph >= last - 1e-9, "{ph} < {last}");
            last = ph;
        }
    }

    #[test]
    fn recipe_round_trips_to_target(si in 0usize..25, offset in -0.8f64..0.8, t in 15.0f64..35.0,
                                   lc in -3.0f64..-1.0, method in 0usize..3) {
        let sys = &library()[si % library().len()];
        let pks = solver::system::thermo::system_pks(sys, t).unwrap();
        // Target near one of the system's usable pKs (2 to 12).
        let Some(pk) = pks.iter().copied().find(|p| (2.5..11.5).contains(p)) else { return Ok(()); };
        let target = pk + offset;
        let Ok((acid, base)) = suggest_pair(&sys.id, target, t, &[]) else { return Ok(()); };
        let m = match method {
            0 => Method::TwoForms { acid_form: acid, base_form: base },
            1 => Method::Titrate { form: acid, titrant: Additive::Naoh, titrant_m: 1.0 },
            _ => Method::TwoStocks { acid_form: acid, acid_stock_m: 2.0, base_form: base, base_stock_m: 2.0 },
        };
        let spec = RecipeSpec {
            system: sys.id.clone(), target_ph: target, temperature_c: t,
            total_conc_m: 10f64.powf(lc), volume_l: 1.0, salts: vec![],
            activity: ActivityModel::Davies, method: m, tolerance_ph: 0.05,
            prepare_temperature_c: None, concentrate_factor: 1.0, store_temperature_c: None, atmosphere: None,
        };
        // Some targets are legitimately infeasible (e.g. beyond what the pair spans);
        // those must be errors, and every success must round-trip.
        if let Ok(r) = solve_recipe(&spec, &[]) {
            let back = solve_mixture(&r.mixture, &[]).unwrap().equilibrium.ph;
            prop_assert!((back - target).abs() < 0.001, "{} target {target} got {back}", sys.id);
        }
    }

    #[test]
    fn never_panics_on_garbage(t in -100.0f64..200.0, c in -1.0f64..10.0, ph in -5.0f64..20.0) {
        let spec = MixtureSpec {
            temperature_c: t,
            activity: ActivityModel::Davies,
            components: vec![ComponentSpec { system: "phosphate".into(), form: Some("na2hpo4".into()), conc_m: c }],
            additives: vec![],
            atmosphere: None,
        };
        let _ = solve_mixture(&spec, &[]);
        let mut r = RecipeSpec {
            system: "tris".into(), target_ph: ph, temperature_c: t, total_conc_m: c, volume_l: c,
            salts: vec![], activity: ActivityModel::Davies,
            method: Method::TwoForms { acid_form: "tris_hcl".into(), base_form: "tris_base".into() },
            tolerance_ph: 0.05,
            prepare_temperature_c: None,
            concentrate_factor: 1.0,
            atmosphere: None,
            store_temperature_c: None,
        };
        let _ = solve_recipe(&r, &[]);
        r.system = "no_such".into();
        prop_assert!(solve_recipe(&r, &[]).is_err());
    }
}
