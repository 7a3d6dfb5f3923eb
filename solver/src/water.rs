//! Water: ionic product pKw(T), density ρ(T) and the Debye–Hückel A(T), 0–60 °C.
//!
//! # Ionic product (Bandura & Lvov 2006; IAPWS R11-07)
//!
//! Bandura, A. V. & Lvov, S. N. (2006) J. Phys. Chem. Ref. Data 35, 15–30.
//! With T in kelvin and ρ the density of water in g/cm³:
//!
//! ```text
//! Q     = ρ · exp(α₀ + α₁/T + α₂ ρ^(2/3) / T²)
//! pKw   = −2n [ log₁₀(1 + Q) − Q/(Q + 1) · ρ (β₀ + β₁/T + β₂ ρ) ]
//!         + pKw^G + 2 log₁₀(Mw / 1000)
//! pKw^G = 0.61415 + 48251.33/T − 67707.93/T² + 10102100/T³
//! n = 6, α₀ = −0.864671, α₁ = 8659.19, α₂ = −22786.2,
//! β₀ = 0.642044, β₁ = −56.8534, β₂ = −0.375754, Mw = 18.015268 g/mol
//! ```
//!
//! Coefficients are as recalled in the project's reference data (from
//! memory) and verified by reproducing the published check point
//! (T = 300 K, ρ = 1 g/cm³ → 13.906565) and the CRC Handbook table at
//! 0.1 MPa (14.946 at 0 °C, 13.995 at 25 °C, 13.264 at 50 °C); see the tests.
//!
//! # Density (Kell 1975)
//!
//! Kell, G. S. (1975) J. Chem. Eng. Data 20, 97–105, air-free water at
//! 0.1 MPa, t in °C. **The coefficients are quoted from memory**; they are
//! checked against the well-known values 0.99984 g/cm³ at 0 °C, 0.99705 at
//! 25 °C, 0.98804 at 50 °C and the maximum near 4 °C:
//!
//! ```text
//! ρ/(kg/m³) = (999.83952 + 16.945176 t − 7.9870401e−3 t² − 46.170461e−6 t³
//!              + 105.56302e−9 t⁴ − 280.54253e−12 t⁵) / (1 + 16.879850e−3 t)
//! ```
//!
//! # Debye–Hückel A
//!
//! The confirmed table of A (log₁₀ basis, kg^½ mol^−½) at 0, 5, …, 40, 50,
//! 60 °C (a published hydrogeology table of Hem-style constants) is
//! interpolated with a monotone piecewise-cubic Hermite interpolant
//! (Fritsch & Carlson 1980, SIAM J. Numer. Anal. 17, 238): it passes through
//! every tabulated point, never overshoots between them and is C¹.

use crate::error::{in_range, Result};

/// Lowest temperature supported by the water model, °C.
pub const T_MIN_C: f64 = 0.0;
/// Highest temperature supported by the water model, °C.
pub const T_MAX_C: f64 = 60.0;
/// 0 °C in kelvin.
pub const KELVIN: f64 = 273.15;

/// Molar mass of water used by Bandura & Lvov, g/mol.
const MW: f64 = 18.015268;

/// Debye–Hückel A table: (t/°C, A).
const A_TABLE: [(f64, f64); 11] = [
    (0.0, 0.4883),
    (5.0, 0.4921),
    (10.0, 0.4960),
    (15.0, 0.5000),
    (20.0, 0.5042),
    (25.0, 0.5085),
    (30.0, 0.5130),
    (35.0, 0.5175),
    (40.0, 0.5221),
    (50.0, 0.5319),
    (60.0, 0.5425),
];

fn check_t(t_c: f64) -> Result<f64> {
    in_range("temperature_c", t_c, T_MIN_C, T_MAX_C)
}

/// pKw = −log₁₀ Kw (molal) at `t_c` °C and 0.1 MPa, Bandura & Lvov (2006)
/// with the Kell (1975) density.
///
/// # Errors
///
/// [`crate::SolverError::NotFinite`] or [`crate::SolverError::OutOfRange`]
/// (field `temperature_c`) outside 0–60 °C.
///
/// # Example
///
/// ```
/// # use solver::water::pkw;
/// assert!((pkw(25.0)? - 13.995).abs() < 0.005);
/// # Ok::<(), solver::SolverError>(())
/// ```
pub fn pkw(t_c: f64) -> Result<f64> {
    let t_c = check_t(t_c)?;
    Ok(pkw_at_density(t_c + KELVIN, water_density(t_c)))
}

/// Bandura & Lvov (2006) pKw at temperature `t_k` (K) and water density
/// `rho` (g/cm³); the formula in the module documentation. No range check:
/// callers pass validated values (the published check point is
/// `pkw_at_density(300.0, 1.0) = 13.906565`).
pub fn pkw_at_density(t_k: f64, rho: f64) -> f64 {
    const N: f64 = 6.0;
    const ALPHA0: f64 = -0.864671;
    const ALPHA1: f64 = 8659.19;
    const ALPHA2: f64 = -22786.2;
    const BETA0: f64 = 0.642044;
    const BETA1: f64 = -56.8534;
    const BETA2: f64 = -0.375754;
    let t = t_k;
    let q = rho * (ALPHA0 + ALPHA1 / t + ALPHA2 * rho.powf(2.0 / 3.0) / (t * t)).exp();
    let pkw_g = 0.61415 + 48251.33 / t - 67707.93 / (t * t) + 10_102_100.0 / (t * t * t);
    -2.0 * N * ((1.0 + q).log10() - q / (q + 1.0) * rho * (BETA0 + BETA1 / t + BETA2 * rho))
        + pkw_g
        + 2.0 * (MW / 1000.0).log10()
}

/// Density of air-free water at 0.1 MPa in g/cm³, Kell (1975) (coefficients
/// from memory, see the module documentation). Defined for any finite `t_c`
/// but meaningful only within 0–100 °C; the solver uses it within 0–60 °C.
pub fn water_density(t_c: f64) -> f64 {
    let t = t_c;
    let num = 999.839_52 + 16.945_176 * t - 7.987_040_1e-3 * t.powi(2) - 46.170_461e-6 * t.powi(3)
        + 105.563_02e-9 * t.powi(4)
        - 280.542_53e-12 * t.powi(5);
    num / (1.0 + 16.879_850e-3 * t) / 1000.0
}

/// Debye–Hückel A (log₁₀ basis, kg^½·mol^−½) at `t_c` °C, monotone cubic
/// interpolation of the confirmed 0–60 °C table.
///
/// # Errors
///
/// [`crate::SolverError::NotFinite`] or [`crate::SolverError::OutOfRange`]
/// (field `temperature_c`) outside 0–60 °C.
///
/// # Example
///
/// ```
/// # use solver::water::debye_huckel_a;
/// assert!((debye_huckel_a(25.0)? - 0.5085).abs() < 1e-12);
/// # Ok::<(), solver::SolverError>(())
/// ```
pub fn debye_huckel_a(t_c: f64) -> Result<f64> {
    let t_c = check_t(t_c)?;
    Ok(pchip(&A_TABLE, t_c))
}

/// Fritsch–Carlson monotone cubic Hermite interpolation of `table` (x
/// strictly increasing) at `x`, clamped to the table's ends.
fn pchip(table: &[(f64, f64)], x: f64) -> f64 {
    let n = table.len();
    let (Some(&(x_first, y_first)), Some(&(x_last, y_last))) = (table.first(), table.last()) else {
        return f64::NAN;
    };
    if x <= x_first {
        return y_first;
    }
    if x >= x_last {
        return y_last;
    }
    // Interval k with table[k].0 <= x < table[k+1].0.
    let k = table
        .windows(2)
        .position(|w| matches!(w, [a, b] if a.0 <= x && x < b.0))
        .unwrap_or(0);
    let secant = |i: usize| -> f64 {
        match (table.get(i), table.get(i + 1)) {
            (Some(a), Some(b)) => (b.1 - a.1) / (b.0 - a.0),
            _ => 0.0,
        }
    };
    let width = |i: usize| -> f64 {
        match (table.get(i), table.get(i + 1)) {
            (Some(a), Some(b)) => b.0 - a.0,
            _ => 0.0,
        }
    };
    // Tangent at node i (Fritsch–Carlson with the Brodlie weighted harmonic mean).
    let tangent = |i: usize| -> f64 {
        if i == 0 {
            return end_tangent(width(0), width(1), secant(0), secant(1));
        }
        if i == n - 1 {
            return end_tangent(width(n - 2), width(n - 3), secant(n - 2), secant(n - 3));
        }
        let (d0, d1) = (secant(i - 1), secant(i));
        if d0 * d1 <= 0.0 {
            return 0.0;
        }
        let (h0, h1) = (width(i - 1), width(i));
        let w1 = 2.0 * h1 + h0;
        let w2 = h1 + 2.0 * h0;
        (w1 + w2) / (w1 / d0 + w2 / d1)
    };
    let (Some(&(x0, y0)), Some(&(x1, y1))) = (table.get(k), table.get(k + 1)) else {
        return f64::NAN;
    };
    let h = x1 - x0;
    let s = (x - x0) / h;
    let (m0, m1) = (tangent(k), tangent(k + 1));
    let h00 = (1.0 + 2.0 * s) * (1.0 - s) * (1.0 - s);
    let h10 = s * (1.0 - s) * (1.0 - s);
    let h01 = s * s * (3.0 - 2.0 * s);
    let h11 = s * s * (s - 1.0);
    h00 * y0 + h10 * h * m0 + h01 * y1 + h11 * h * m1
}

/// One-sided three-point end tangent, limited to keep monotonicity
/// (the end rule of Moler, "Numerical Computing with MATLAB", §3.6).
fn end_tangent(h0: f64, h1: f64, d0: f64, d1: f64) -> f64 {
    let m = ((2.0 * h0 + h1) * d0 - h0 * d1) / (h0 + h1);
    if m * d0 <= 0.0 {
        0.0
    } else if d0 * d1 <= 0.0 && m.abs() > 3.0 * d0.abs() {
        3.0 * d0
    } else {
        m
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::SolverError;

    #[test]
    fn bandura_lvov_check_point() {
        // Bandura & Lvov (2006), Table 3 check value (as quoted in REFERENCE-DATA §3).
        assert!((pkw_at_density(300.0, 1.0) - 13.906565).abs() < 1e-5);
    }

    #[test]
    fn pkw_matches_crc_table() {
        // CRC Handbook (Bandura & Lvov values at 0.1 MPa), confirmed.
        for (t, want) in [(0.0, 14.946), (25.0, 13.995), (50.0, 13.264)] {
            let got = pkw(t).unwrap();
            assert!((got - want).abs() < 0.005, "{t} °C: {got}");
        }
    }

    #[test]
    fn density_known_points() {
        // Common-practice values of the density of water, g/cm³.
        assert!((water_density(0.0) - 0.99984).abs() < 2e-5);
        assert!((water_density(25.0) - 0.99705).abs() < 2e-5);
        assert!((water_density(50.0) - 0.98804).abs() < 3e-5);
        assert!(water_density(4.0) > water_density(2.0));
        assert!(water_density(4.0) > water_density(6.0));
    }

    #[test]
    fn a_interpolation_hits_nodes_and_is_monotone() {
        for &(t, a) in &A_TABLE {
            assert!((debye_huckel_a(t).unwrap() - a).abs() < 1e-12, "{t}");
        }
        let mut prev = 0.0;
        for i in 0..=600 {
            let a = debye_huckel_a(f64::from(i) * 0.1).unwrap();
            assert!(a >= prev);
            prev = a;
        }
        let mid = debye_huckel_a(45.0).unwrap();
        assert!(mid > 0.5221 && mid < 0.5319);
    }

    #[test]
    fn out_of_range_names_the_field() {
        for t in [-0.1, 60.1, f64::NAN, f64::INFINITY] {
            let e = pkw(t).unwrap_err();
            match e {
                SolverError::OutOfRange { field, .. } | SolverError::NotFinite { field } => {
                    assert_eq!(field, "temperature_c");
                }
                other => panic!("{other:?}"),
            }
            assert!(debye_huckel_a(t).is_err());
        }
    }
}
