//! Activity coefficients: the Davies equation, and the ideal (γ = 1) model for comparison.
//!
//! Davies (1962), *Ion Association*, p. 41:
//!
//! ```text
//! log10 γ_z = −A z² ( √I / (1 + √I) − 0.3 I )
//! ```
//!
//! Because the bracket does not depend on the charge, every γ follows from the
//! one for a singly charged ion: `γ_z = γ₁^(z²)`. The engine uses this to
//! compute a single power per ionic-strength update.
//!
//! Common practice: the Davies equation is trusted to about I = 0.1–0.5 mol/L;
//! the engine warns beyond [`DAVIES_LIMIT`].

use serde::{Deserialize, Serialize};

/// Ionic strength (mol/L) past which results carry a warning.
pub const DAVIES_LIMIT: f64 = 0.5;

/// Which activity model the engine uses.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum ActivityModel {
    /// Davies equation with temperature-dependent A.
    #[default]
    Davies,
    /// All activity coefficients equal to one (textbook mode).
    Ideal,
}

/// `√I/(1+√I) − 0.3 I`, the charge-independent part of the Davies equation.
pub fn davies_bracket(ionic_strength: f64) -> f64 {
    let i = ionic_strength.max(0.0);
    let s = i.sqrt();
    s / (1.0 + s) - 0.3 * i
}

/// Activity coefficient of a singly charged ion.
///
/// `a_dh` is the Debye–Hückel A (log10 base, kg^½·mol^−½) at the working
/// temperature. Returns 1 for the ideal model.
///
/// # Example
///
/// ```
/// use solver::equilibrium::activity::{gamma1, ActivityModel};
/// // A = 0.5085 at 25 °C; I = 0.1 → log γ = −0.5085 × 0.2103 = −0.1069
/// let g = gamma1(ActivityModel::Davies, 0.5085, 0.1);
/// assert!((g.log10() + 0.1069).abs() < 1e-4);
/// assert_eq!(gamma1(ActivityModel::Ideal, 0.5085, 0.1), 1.0);
/// ```
pub fn gamma1(model: ActivityModel, a_dh: f64, ionic_strength: f64) -> f64 {
    match model {
        ActivityModel::Ideal => 1.0,
        ActivityModel::Davies => 10f64.powf(-a_dh * davies_bracket(ionic_strength)),
    }
}

/// `γ_z` from `γ₁`: `γ₁^(z²)`.
pub fn gamma_z(gamma1: f64, z: i32) -> f64 {
    gamma1.powi(z * z)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn davies_at_zero_is_one() {
        assert_eq!(gamma1(ActivityModel::Davies, 0.51, 0.0), 1.0);
    }

    #[test]
    fn divalent_is_square_of_monovalent_in_log() {
        let g1 = gamma1(ActivityModel::Davies, 0.5085, 0.05);
        let g2 = gamma_z(g1, 2);
        assert!((g2.log10() - 4.0 * g1.log10()).abs() < 1e-12);
    }

    #[test]
    fn negative_ionic_strength_is_clamped() {
        assert_eq!(gamma1(ActivityModel::Davies, 0.51, -1.0), 1.0);
    }
}
