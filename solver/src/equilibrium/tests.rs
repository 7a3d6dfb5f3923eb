//! Native tests of the equilibrium engine: balances, limits, derivatives, worked examples.
use super::*;

fn water(activity: ActivityModel) -> Composition {
    Composition {
        acids: vec![],
        spectator_charge: 0.0,
        spectator_z2: 0.0,
        kw: 1.0e-14,
        a_dh: 0.5085,
        activity,
    }
}

#[test]
fn pure_water_is_neutral() {
    let eq = solve(&water(ActivityModel::Davies), f64::NAN).unwrap();
    assert!((eq.ph - 7.0).abs() < 1e-9, "{}", eq.ph);
}

#[test]
fn dilute_hcl_is_not_ph_8() {
    // Hill, Petrucci et al., General Chemistry 4th ed., problem 15.109.
    let mut c = water(ActivityModel::Ideal);
    c.spectator_charge = -1e-8;
    c.spectator_z2 = 1e-8;
    let eq = solve(&c, f64::NAN).unwrap();
    let h = 10f64.powf(-eq.ph);
    assert!((h - 1.05e-7).abs() < 0.01e-7, "{h}");
}

#[test]
fn acetic_acid_exact_quadratic() {
    // 0.100 M acetic acid, pKa 4.756, ideal: quadratic gives pH 2.881 (computed).
    let mut c = water(ActivityModel::Ideal);
    c.acids.push(Acid::from_pks(0, &[4.756], 0.1));
    let eq = solve(&c, f64::NAN).unwrap();
    let ka = 10f64.powf(-4.756);
    let h = (-ka + (ka * ka + 4.0 * ka * 0.1).sqrt()) / 2.0;
    assert!((eq.ph + h.log10()).abs() < 1e-4, "{}", eq.ph);
    assert!((eq.ph - 2.881).abs() < 0.001);
}

#[test]
fn strong_base_extremes_bracket() {
    let mut c = water(ActivityModel::Davies);
    c.spectator_charge = 5.0;
    c.spectator_z2 = 5.0;
    let eq = solve(&c, f64::NAN).unwrap();
    assert!(eq.ph > 14.0);
    assert!(eq.warnings.contains(&Warning::IonicStrengthBeyondModel));
}

#[test]
fn addition_inverts_solve() {
    let mut c = water(ActivityModel::Davies);
    c.acids
        .push(Acid::from_pks(0, &[2.148, 7.198, 12.35], 0.05));
    let (x, _) = solve_addition(&c, 7.4, 1.0, 1.0).unwrap();
    c.spectator_charge += x;
    c.spectator_z2 += x;
    let eq = solve(&c, f64::NAN).unwrap();
    assert!((eq.ph - 7.4).abs() < 1e-8, "{}", eq.ph);
}

#[test]
fn bad_input_is_an_error_not_a_panic() {
    let mut c = water(ActivityModel::Davies);
    c.acids.push(Acid::from_pks(0, &[f64::NAN], 0.1));
    assert!(solve(&c, 7.0).is_err());
    let mut c = water(ActivityModel::Davies);
    c.acids.push(Acid::from_pks(0, &[4.0], -1.0));
    assert!(matches!(solve(&c, 7.0), Err(SolverError::Negative { .. })));
}
