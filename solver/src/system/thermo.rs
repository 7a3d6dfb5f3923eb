//! Temperature dependence of pK: van 't Hoff with ΔrCp°, and published pK(T) formulas.
//!
//! # Van 't Hoff with constant heat capacity
//!
//! Goldberg, Kishore & Lennen (2002) J. Phys. Chem. Ref. Data 31, 231, eq. (5):
//!
//! ```text
//! ln K(T) = ln K(θ) − (ΔrH°/R)(1/T − 1/θ) + (ΔrCp°/R)(θ/T − 1 + ln(T/θ))
//! θ = 298.15 K,  R = 8.314462618 J/(K·mol),  pK = −ln K / ln 10
//! ```
//!
//! # Published formulas (T in kelvin)
//!
//! | Formula | Equation | Source |
//! |---|---|---|
//! | Tris | pK = 2981.4/T − 3.5888 + 0.005571·T | Bates & Hetzer (1961) J. Phys. Chem. 65, 667 |
//! | boric acid | pK = 2237.94/T + 0.016883·T − 3.305 | Manov, DeLollis & Acree (1944) J. Res. NBS 33, 287 |
//! | ACES | pK = 2548.60/T − 20.03159 + 3.2172·ln T | Roy et al. (1997) J. Chem. Eng. Data 42, 41 |
//! | CHES | pK = 1917.66/T + 5.7940 − 0.4971·ln T | Roy et al. (1997) |
//! | carbonic K1, K2 | log K = a + bT + c/T + d·log₁₀T + e/T² | Plummer & Busenberg (1982) Geochim. Cosmochim. Acta 46, 1011 |
//! | ammonium | pK = 0.09018 + 2729.92/T | Emerson, Russo, Lund & Thurston (1975) J. Fish. Res. Board Can. 32, 2379 |
//! | hypochlorous | pK = 3000.00/T − 10.0686 + 0.0253·T (from memory) | Morris (1966) J. Phys. Chem. 70, 3798 |
//! | H₂S first step | ln K = 225.8375 − 13275.324/T − 34.64354·ln T | Millero (1988), freshwater |

use crate::error::{finite, in_range, Result, SolverError};
use crate::system::acid::{AcidSystem, PkFormula, Step, TempModel, MAX_STEPS};
use crate::system::formula::molar_mass;
use crate::water::{KELVIN, T_MAX_C, T_MIN_C};

/// Gas constant, J/(K·mol) (CODATA 2018, exact).
pub const R: f64 = 8.314_462_618;
/// Reference temperature θ, K.
pub const THETA: f64 = 298.15;

/// Carbonic acid K1, Plummer & Busenberg (1982): (a, b, c, d, e).
const PB_K1: [f64; 5] = [-356.3094, -0.060_919_64, 21_834.37, 126.8339, -1_684_915.0];
/// Carbonic acid K2, Plummer & Busenberg (1982): (a, b, c, d, e).
const PB_K2: [f64; 5] = [-107.8871, -0.032_528_49, 5151.79, 38.925_61, -563_713.9];

/// Highest |ΔrH°| accepted for a user-defined step, kJ/mol.
const MAX_DH_KJ: f64 = 200.0;
/// Highest |ΔrCp°| accepted for a user-defined step, J/(K·mol).
const MAX_DCP_J: f64 = 2000.0;
/// pK values accepted for a user-defined step.
const PK_MIN: f64 = -3.0;
/// pK values accepted for a user-defined step.
const PK_MAX: f64 = 20.0;
/// A formula-based step's `pk25` must agree with the formula at 25 °C within this.
const FORMULA_PK25_TOL: f64 = 0.01;

impl PkFormula {
    /// pK at temperature `t_k` (kelvin) by the published formula.
    pub fn pk_at_kelvin(self, t_k: f64) -> f64 {
        let t = t_k;
        match self {
            PkFormula::TrisBatesHetzer => 2981.4 / t - 3.5888 + 0.005_571 * t,
            PkFormula::BoricManov => 2237.94 / t + 0.016_883 * t - 3.305,
            PkFormula::AcesRoy => 2548.60 / t - 20.031_59 + 3.2172 * t.ln(),
            PkFormula::ChesRoy => 1917.66 / t + 5.7940 - 0.4971 * t.ln(),
            PkFormula::CarbonicK1PlummerBusenberg => -plummer_busenberg(&PB_K1, t),
            PkFormula::CarbonicK2PlummerBusenberg => -plummer_busenberg(&PB_K2, t),
            PkFormula::AmmoniumEmerson => 0.090_18 + 2729.92 / t,
            PkFormula::HypochlorousMorris => 3000.00 / t - 10.0686 + 0.0253 * t,
            PkFormula::SulfideMillero => {
                -(225.8375 - 13_275.324 / t - 34.643_54 * t.ln()) / std::f64::consts::LN_10
            }
        }
    }

    /// Temperature range (°C) over which the formula was fitted, clipped to
    /// the solver's 0–60 °C water model. Ranges marked "from memory" in
    /// [`PkFormula::source`] are recalled, not re-read.
    pub fn range_c(self) -> (f64, f64) {
        match self {
            PkFormula::TrisBatesHetzer => (0.0, 50.0),
            PkFormula::BoricManov => (0.0, 60.0),
            PkFormula::AcesRoy | PkFormula::ChesRoy => (0.0, 50.0),
            // Plummer & Busenberg fitted 0–90 °C.
            PkFormula::CarbonicK1PlummerBusenberg | PkFormula::CarbonicK2PlummerBusenberg => {
                (0.0, 60.0)
            }
            PkFormula::AmmoniumEmerson => (0.0, 50.0),
            PkFormula::HypochlorousMorris => (5.0, 35.0),
            PkFormula::SulfideMillero => (0.0, 50.0),
        }
    }

    /// Citation of the formula.
    pub fn source(self) -> &'static str {
        match self {
            PkFormula::TrisBatesHetzer => "Bates & Hetzer (1961) J. Phys. Chem. 65, 667; 0–50 °C",
            PkFormula::BoricManov => {
                "Manov, DeLollis & Acree (1944) J. Res. NBS 33, 287; 0–60 °C"
            }
            PkFormula::AcesRoy => {
                "Roy et al. (1997) J. Chem. Eng. Data 42, 41; 0–50 °C (range from memory)"
            }
            PkFormula::ChesRoy => {
                "Roy et al. (1997) J. Chem. Eng. Data 42, 41; 0–50 °C (range from memory)"
            }
            PkFormula::CarbonicK1PlummerBusenberg | PkFormula::CarbonicK2PlummerBusenberg => {
                "Plummer & Busenberg (1982) Geochim. Cosmochim. Acta 46, 1011; fitted 0–90 °C, used 0–60 °C"
            }
            PkFormula::AmmoniumEmerson => {
                "Emerson, Russo, Lund & Thurston (1975) J. Fish. Res. Board Can. 32, 2379; 0–50 °C"
            }
            PkFormula::HypochlorousMorris => {
                "Morris (1966) J. Phys. Chem. 70, 3798; 5–35 °C (formula from memory)"
            }
            PkFormula::SulfideMillero => {
                "Millero (1988), freshwater H2S first step; 0–50 °C (range from memory)"
            }
        }
    }
}

/// log₁₀ K = a + bT + c/T + d·log₁₀ T + e/T² (Plummer & Busenberg 1982).
fn plummer_busenberg(k: &[f64; 5], t: f64) -> f64 {
    let [a, b, c, d, e] = *k;
    a + b * t + c / t + d * t.log10() + e / (t * t)
}

/// pK of one step at `t_c` °C. No range check (see [`system_pks`]);
/// a non-finite `t_c` gives a non-finite result.
///
/// - [`TempModel::VantHoff`] uses the Goldberg et al. (2002) equation above;
/// - [`TempModel::Constant`] returns `pk25`;
/// - [`TempModel::Formula`] uses the published formula (`pk25` is not used).
pub fn step_pk(step: &Step, t_c: f64) -> f64 {
    let t = t_c + KELVIN;
    match step.temp {
        TempModel::Constant => step.pk25,
        TempModel::VantHoff { dh_kj, dcp_j } => {
            let ln_k25 = -step.pk25 * std::f64::consts::LN_10;
            let dh = dh_kj * 1000.0;
            let ln_k = ln_k25 - dh / R * (1.0 / t - 1.0 / THETA)
                + dcp_j / R * (THETA / t - 1.0 + (t / THETA).ln());
            -ln_k / std::f64::consts::LN_10
        }
        TempModel::Formula { formula } => formula.pk_at_kelvin(t),
    }
}

/// pK of every step of `sys` at `t_c` °C.
///
/// # Errors
///
/// [`SolverError::NotFinite`] or [`SolverError::OutOfRange`] (field
/// `temperature_c`) when `t_c` is outside `[sys.t_min_c, sys.t_max_c]`.
///
/// # Example
///
/// ```
/// # use solver::system::{library::find_system, thermo::system_pks};
/// let tris = find_system("tris").ok_or(solver::SolverError::Unknown {
///     kind: "system".into(), name: "tris".into() })?;
/// let pk = system_pks(tris, 37.0)?;
/// assert!((pk[0] - 7.752).abs() < 0.005); // Bates & Hetzer at 310.15 K
/// assert!(system_pks(tris, 55.0).is_err());
/// # Ok::<(), solver::SolverError>(())
/// ```
pub fn system_pks(sys: &AcidSystem, t_c: f64) -> Result<Vec<f64>> {
    let t_c = in_range("temperature_c", t_c, sys.t_min_c, sys.t_max_c)?;
    Ok(sys.steps.iter().map(|s| step_pk(s, t_c)).collect())
}

fn out_of_range(field: String, value: f64, min: f64, max: f64) -> SolverError {
    SolverError::OutOfRange {
        field,
        value,
        min,
        max,
    }
}

fn document(field: String, reason: &str) -> SolverError {
    SolverError::Document {
        field,
        reason: reason.to_string(),
    }
}

/// Check a (user-defined) system before it is used.
///
/// Checks, with the field each error names:
/// - `system.id`, `system.name`: not empty;
/// - `system.steps`: 1 ..= [`MAX_STEPS`] steps;
/// - `system.steps[i].pk25`: finite, within −3…20, strictly increasing, and
///   for a formula step within 0.01 of the formula's 25 °C value;
/// - `system.steps[i].dh_kj` / `.dcp_j`: finite, |ΔrH°| ≤ 200 kJ/mol,
///   |ΔrCp°| ≤ 2000 J/(K·mol);
/// - `system.z0`: |z0| ≤ [`MAX_STEPS`];
/// - `system.species`: exactly steps + 1 names;
/// - `system.t_min_c`, `system.t_max_c`: finite, within the water model's
///   0–60 °C, min < max, and inside each formula step's fitted range;
/// - `system.forms[j].id`: not empty, unique; `.formula`: parsable;
///   `.units`: finite, 1e−6…100; `.counter_ions[k]`: count finite, 0…100.
///
/// # Errors
///
/// The first problem found, as [`SolverError::NotFinite`],
/// [`SolverError::OutOfRange`] or [`SolverError::Document`].
pub fn validate_system(sys: &AcidSystem) -> Result<()> {
    if sys.id.trim().is_empty() {
        return Err(document("system.id".into(), "must not be empty"));
    }
    if sys.name.trim().is_empty() {
        return Err(document("system.name".into(), "must not be empty"));
    }
    let n = sys.steps.len();
    if n == 0 || n > MAX_STEPS {
        return Err(out_of_range(
            "system.steps".into(),
            n as f64,
            1.0,
            MAX_STEPS as f64,
        ));
    }
    if sys.z0.unsigned_abs() as usize > MAX_STEPS {
        return Err(out_of_range(
            "system.z0".into(),
            f64::from(sys.z0),
            -(MAX_STEPS as f64),
            MAX_STEPS as f64,
        ));
    }
    if sys.species.len() != n + 1 {
        return Err(out_of_range(
            "system.species".into(),
            sys.species.len() as f64,
            (n + 1) as f64,
            (n + 1) as f64,
        ));
    }
    for (i, name) in sys.species.iter().enumerate() {
        if name.trim().is_empty() {
            return Err(document(
                format!("system.species[{i}]"),
                "must not be empty",
            ));
        }
    }
    let t_min = finite("system.t_min_c", sys.t_min_c)?;
    let t_max = finite("system.t_max_c", sys.t_max_c)?;
    in_range("system.t_min_c", t_min, T_MIN_C, T_MAX_C)?;
    in_range("system.t_max_c", t_max, T_MIN_C, T_MAX_C)?;
    if t_max <= t_min {
        return Err(document(
            "system.t_max_c".into(),
            &format!("the highest temperature ({t_max} °C) must be above the lowest ({t_min} °C)"),
        ));
    }
    let mut prev: Option<f64> = None;
    for (i, step) in sys.steps.iter().enumerate() {
        let field = format!("system.steps[{i}].pk25");
        let pk = finite(&field, step.pk25)?;
        let lo = prev.unwrap_or(PK_MIN);
        if !(PK_MIN..=PK_MAX).contains(&pk) || prev.is_some_and(|p| pk <= p) {
            return Err(out_of_range(field, pk, lo, PK_MAX));
        }
        prev = Some(pk);
        match step.temp {
            TempModel::Constant => {}
            TempModel::VantHoff { dh_kj, dcp_j } => {
                in_range(
                    &format!("system.steps[{i}].dh_kj"),
                    dh_kj,
                    -MAX_DH_KJ,
                    MAX_DH_KJ,
                )?;
                in_range(
                    &format!("system.steps[{i}].dcp_j"),
                    dcp_j,
                    -MAX_DCP_J,
                    MAX_DCP_J,
                )?;
            }
            TempModel::Formula { formula } => {
                let at25 = formula.pk_at_kelvin(THETA);
                in_range(&field, pk, at25 - FORMULA_PK25_TOL, at25 + FORMULA_PK25_TOL)?;
                let (lo_c, hi_c) = formula.range_c();
                in_range("system.t_min_c", t_min, lo_c, hi_c)?;
                in_range("system.t_max_c", t_max, lo_c, hi_c)?;
            }
        }
    }
    for (j, form) in sys.forms.iter().enumerate() {
        if form.id.trim().is_empty() {
            return Err(document(
                format!("system.forms[{j}].id"),
                "must not be empty",
            ));
        }
        if sys.forms.iter().take(j).any(|f| f.id == form.id) {
            return Err(document(
                format!("system.forms[{j}].id"),
                "duplicate form id in this system",
            ));
        }
        if let Err(e) = molar_mass(&form.formula) {
            return Err(SolverError::Document {
                field: format!("system.forms[{j}].formula"),
                reason: e.to_string(),
            });
        }
        in_range(&format!("system.forms[{j}].units"), form.units, 1e-6, 100.0)?;
        for (k, &(_, count)) in form.counter_ions.iter().enumerate() {
            in_range(
                &format!("system.forms[{j}].counter_ions[{k}]"),
                count,
                0.0,
                100.0,
            )?;
        }
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    fn vh(pk25: f64, dh_kj: f64, dcp_j: f64) -> Step {
        Step {
            pk25,
            temp: TempModel::VantHoff { dh_kj, dcp_j },
        }
    }

    #[test]
    fn van_t_hoff_is_exact_at_theta() {
        let s = vh(7.198, 3.6, -230.0);
        assert!((step_pk(&s, 25.0) - 7.198).abs() < 1e-12);
    }

    #[test]
    fn van_t_hoff_slope_matches_enthalpy() {
        // d pK/dT at θ = −ΔH/(R T² ln 10) (differentiate the equation above).
        let s = vh(8.0, 47.45, -59.0);
        let h = 1e-3;
        let slope = (step_pk(&s, 25.0 + h) - step_pk(&s, 25.0 - h)) / (2.0 * h);
        let want = -47_450.0 / (R * THETA * THETA * std::f64::consts::LN_10);
        assert!((slope - want).abs() < 1e-6, "{slope} vs {want}");
    }

    #[test]
    fn heat_capacity_term_is_second_order() {
        // With ΔH = 0 the Cp term vanishes at θ and has zero slope there.
        let s = vh(5.0, 0.0, -150.0);
        let d = step_pk(&s, 25.1) - step_pk(&s, 24.9);
        assert!(d.abs() < 1e-6);
        assert!(step_pk(&s, 60.0) > 5.0);
    }

    #[test]
    fn constant_ignores_temperature() {
        let s = Step {
            pk25: 5.408,
            temp: TempModel::Constant,
        };
        assert_eq!(step_pk(&s, 15.0), 5.408);
    }

    #[test]
    fn formulas_at_25() {
        let f = |formula| {
            step_pk(
                &Step {
                    pk25: 0.0,
                    temp: TempModel::Formula { formula },
                },
                25.0,
            )
        };
        assert!((f(PkFormula::TrisBatesHetzer) - 8.0719).abs() < 1e-3);
        assert!((f(PkFormula::BoricManov) - 9.2348).abs() < 1e-3);
        assert!((f(PkFormula::AcesRoy) - 6.8468).abs() < 1e-3);
        assert!((f(PkFormula::ChesRoy) - 9.3936).abs() < 1e-3);
        assert!((f(PkFormula::CarbonicK1PlummerBusenberg) - 6.3519).abs() < 1e-3);
        assert!((f(PkFormula::CarbonicK2PlummerBusenberg) - 10.3289).abs() < 1e-3);
        assert!((f(PkFormula::AmmoniumEmerson) - 9.2464).abs() < 1e-3);
        assert!((f(PkFormula::HypochlorousMorris) - 7.537).abs() < 2e-3);
        assert!((f(PkFormula::SulfideMillero) - 6.98).abs() < 0.02);
    }

    fn user_system() -> AcidSystem {
        use crate::system::{Ion, ReagentForm};
        AcidSystem {
            id: "user".into(),
            name: "User acid".into(),
            z0: 0,
            steps: vec![vh(4.0, 1.0, -100.0), constant(6.0)],
            species: vec!["H₂A".into(), "HA⁻".into(), "A²⁻".into()],
            t_min_c: 5.0,
            t_max_c: 40.0,
            forms: vec![ReagentForm {
                id: "na2a".into(),
                name: "disodium salt".into(),
                formula: "C4H4Na2O4".into(),
                units: 1.0,
                counter_ions: vec![(Ion::Na, 2.0)],
            }],
            source: "user".into(),
            hazards: vec![],
        }
    }

    fn constant(pk25: f64) -> Step {
        Step {
            pk25,
            temp: TempModel::Constant,
        }
    }

    fn field_of(e: SolverError) -> String {
        match e {
            SolverError::NotFinite { field }
            | SolverError::OutOfRange { field, .. }
            | SolverError::Document { field, .. } => field,
            other => panic!("unexpected {other:?}"),
        }
    }

    #[test]
    fn validate_accepts_a_sane_user_system() {
        validate_system(&user_system()).unwrap();
    }

    #[test]
    fn validate_names_the_field() {
        let check = |edit: &dyn Fn(&mut AcidSystem), want: &str| {
            let mut s = user_system();
            edit(&mut s);
            let e = validate_system(&s).expect_err(want);
            assert_eq!(field_of(e), want);
        };
        check(&|s| s.steps[1].pk25 = 3.0, "system.steps[1].pk25");
        check(&|s| s.steps[1].pk25 = f64::NAN, "system.steps[1].pk25");
        check(&|s| s.steps[0].pk25 = 25.0, "system.steps[0].pk25");
        check(&|s| s.steps.clear(), "system.steps");
        check(&|s| s.steps = vec![constant(1.0); 7], "system.steps");
        check(
            &|s| {
                s.species.pop();
            },
            "system.species",
        );
        check(&|s| s.species[1] = " ".into(), "system.species[1]");
        check(&|s| s.z0 = 9, "system.z0");
        check(&|s| s.t_min_c = -5.0, "system.t_min_c");
        check(&|s| s.t_max_c = 80.0, "system.t_max_c");
        check(&|s| s.t_max_c = 5.0, "system.t_max_c");
        check(&|s| s.t_max_c = f64::INFINITY, "system.t_max_c");
        check(
            &|s| s.steps[0] = vh(4.0, f64::NAN, 0.0),
            "system.steps[0].dh_kj",
        );
        check(&|s| s.steps[0] = vh(4.0, 1.0, 1e6), "system.steps[0].dcp_j");
        check(
            &|s| s.forms[0].formula = "Na2Xq".into(),
            "system.forms[0].formula",
        );
        check(&|s| s.forms[0].units = 0.0, "system.forms[0].units");
        check(&|s| s.forms[0].units = f64::NAN, "system.forms[0].units");
        check(
            &|s| s.forms[0].counter_ions[0].1 = -1.0,
            "system.forms[0].counter_ions[0]",
        );
        check(&|s| s.forms[0].id = String::new(), "system.forms[0].id");
        check(
            &|s| {
                let f = s.forms[0].clone();
                s.forms.push(f);
            },
            "system.forms[1].id",
        );
        check(&|s| s.id = String::new(), "system.id");
    }

    #[test]
    fn validate_formula_steps_against_their_range_and_value() {
        let mut s = user_system();
        s.steps = vec![Step {
            pk25: PkFormula::HypochlorousMorris.pk_at_kelvin(THETA),
            temp: TempModel::Formula {
                formula: PkFormula::HypochlorousMorris,
            },
        }];
        s.species.truncate(2);
        s.t_min_c = 5.0;
        s.t_max_c = 35.0;
        validate_system(&s).unwrap();
        s.t_max_c = 40.0; // beyond Morris' 5–35 °C
        assert_eq!(field_of(validate_system(&s).unwrap_err()), "system.t_max_c");
        s.t_max_c = 35.0;
        s.steps[0].pk25 = 7.6; // disagrees with the formula at 25 °C
        assert_eq!(
            field_of(validate_system(&s).unwrap_err()),
            "system.steps[0].pk25"
        );
    }

    #[test]
    fn system_pks_refuses_out_of_range_and_nan() {
        let s = user_system();
        assert!(system_pks(&s, 25.0).is_ok());
        for t in [4.9, 40.1, f64::NAN] {
            assert_eq!(field_of(system_pks(&s, t).unwrap_err()), "temperature_c");
        }
    }
}
