//! The open-system constraint: an acid system whose neutral species is held by a gas.
//!
//! For CO₂ over a solution, Henry's law fixes the dissolved gas,
//! `[CO₂(aq)] = c₀ = K₀ f(CO₂)` (see `crate::atmosphere`), and the rest of the
//! system follows the pH instead of a fixed total. With the same species
//! weights `t_j = [A_j]/[A_0]` the closed system uses (`t_0 = 1`,
//! `t_j = t_{j−1} K'_j / a_H`, `K'_j = K_j γ_{z_{j−1}}/γ_{z_j}`) and
//! `s_k = Σ_j j^k t_j`, a neutral protonated species (`z₀ = 0`) gives
//!
//! ```text
//! [A_j] = c₀ t_j,      total = c₀ s₀
//! charge:   Σ_j z_j [A_j]  = −c₀ s₁
//! −dF/dpH:  ln 10 · c₀ s₂                  (> 0: F stays strictly decreasing)
//! Σ z² c:   c₀ s₂
//! ```
//!
//! and, with `g = ln γ₁` and `∂t_j/∂g = −j² t_j` (species 0 is neutral),
//! `∂F/∂g = c₀ s₃`, `∂(Σz²c)/∂pH = ln 10 · c₀ s₃`, `∂(Σz²c)/∂g = −c₀ s₄`.
//! The charge balance, its bracket, the Davies loop and the joint Newton
//! iteration are the closed system's own; only these sums change, so one
//! solver serves both.

use super::acid::{fractions_into, Acid};
use crate::system::MAX_STEPS;

/// Charge, β/ln 10 share and Σz²c of an open acid from its moments s₁, s₂.
#[inline]
pub(super) fn contributions(neutral: f64, s1: f64, s2: f64) -> (f64, f64, f64) {
    (-neutral * s1, neutral * s2, neutral * s2)
}

/// The joint iteration's terms of an open acid from s₁…s₄:
/// `[F, β/ln10, ∂F/∂g, Σz²c, ∂(Σz²c)/∂pH / ln10, ∂(Σz²c)/∂g]`.
#[inline]
pub(super) fn jacobian(neutral: f64, s: [f64; 4]) -> [f64; 6] {
    let [s1, s2, s3, s4] = s;
    let c = neutral;
    [-c * s1, c * s2, c * s3, c * s2, c * s3, -c * s4]
}

/// Total concentration of an acid at a pH and γ₁: its fixed total when
/// closed; `c₀ s₀ = c₀ / α₀` when open (`c₀` the held neutral species).
pub fn system_total(acid: &Acid, ph: f64, g1: f64) -> f64 {
    if !acid.open {
        return acid.total;
    }
    let mut fr = [0.0; MAX_STEPS + 1];
    fractions_into(acid, ph, g1, &mut fr);
    match fr.first() {
        Some(&a0) if a0 > 0.0 => acid.total / a0,
        _ => f64::INFINITY,
    }
}
