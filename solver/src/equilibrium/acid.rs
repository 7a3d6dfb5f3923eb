//! One acid system resolved at a temperature ([`Acid`]: constants, total, open to a gas or
//! not) and its species fractions at a pH ([`fractions_into`]); the leaf the charge balance,
//! the open sums and the gas share.

use crate::system::MAX_STEPS;

const LN10: f64 = std::f64::consts::LN_10;

/// One acid system resolved at a temperature: constants and total concentration.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Acid {
    /// Charge of the fully protonated species.
    pub z0: i32,
    /// Number of dissociation steps in use (≤ [`MAX_STEPS`]).
    pub n: usize,
    /// Thermodynamic dissociation constants K₁…Kₙ at the working temperature.
    pub ka: [f64; MAX_STEPS],
    /// Total concentration of the system, mol/L; for an open system
    /// (`open`), the fixed concentration of the neutral, fully protonated
    /// species instead (CO₂(aq) held by a gas, see [`super::open`]).
    pub total: f64,
    /// Open to a gas phase: species 0 is held at `total` and the system's
    /// total follows the pH. Only for systems whose protonated species is
    /// neutral (`z0 == 0`).
    pub open: bool,
}

impl Acid {
    /// Build from pK values (at most [`MAX_STEPS`] are used).
    pub fn from_pks(z0: i32, pks: &[f64], total: f64) -> Self {
        let mut ka = [0.0; MAX_STEPS];
        let n = pks.len().min(MAX_STEPS);
        for (k, pk) in ka.iter_mut().zip(pks.iter()) {
            *k = 10f64.powf(-pk);
        }
        Self {
            z0,
            n,
            ka,
            total,
            open: false,
        }
    }

    /// An open system: the neutral species held at `neutral` mol/L by a gas.
    pub fn open_from_pks(pks: &[f64], neutral: f64) -> Self {
        Self {
            open: true,
            ..Self::from_pks(0, pks, neutral)
        }
    }
}

/// Species fractions of one acid at a pH and ionic strength, written into `out`
/// (most protonated first). Returns the number of species written.
pub fn fractions_into(acid: &Acid, ph: f64, g1: f64, out: &mut [f64; MAX_STEPS + 1]) -> usize {
    let inv_h = (ph * LN10).exp();
    let mut term = 1.0;
    let mut terms = [0.0; MAX_STEPS + 1];
    terms[0] = 1.0;
    let mut sum = 1.0;
    for (i, (&k, t)) in acid
        .ka
        .iter()
        .take(acid.n)
        .zip(terms.iter_mut().skip(1))
        .enumerate()
    {
        let zj = acid.z0 - (i as i32 + 1);
        let corr = if g1 == 1.0 { 1.0 } else { g1.powi(2 * zj + 1) };
        term *= k * corr * inv_h;
        *t = term;
        sum += term;
    }
    for (o, t) in out.iter_mut().zip(terms.iter()) {
        *o = t / sum;
    }
    acid.n + 1
}
