//! Monte Carlo propagation of a recipe's or mixture's inputs (JCGM 101:2008), with a seeded generator.

use super::budget::{mixture_model, recipe_model, Model};
use super::inputs::UncertaintyInputs;
use super::terms::{Distribution, COVERAGE_FACTOR, SQRT3};
use crate::error::{in_range, Result, SolverError};
use crate::mixture::MixtureSpec;
use crate::recipe::{RecipeResult, RecipeSpec};
use crate::system::AcidSystem;
use serde::{Deserialize, Serialize};

/// Result of a Monte Carlo propagation (JCGM 101:2008).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct MonteCarlo {
    /// Draws that solved.
    pub draws: usize,
    /// Mean pH.
    pub mean: f64,
    /// Standard deviation of the pH.
    pub sd: f64,
    /// 2 × sd, comparable with the first-order U95.
    pub u95_ph: f64,
    /// 2.5th percentile.
    pub low: f64,
    /// 97.5th percentile.
    pub high: f64,
}

/// SplitMix64: a small, seeded generator (no system entropy).
#[derive(Debug, Clone)]
struct Rng(u64);

impl Rng {
    fn next_u64(&mut self) -> u64 {
        self.0 = self.0.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        z ^ (z >> 31)
    }
    /// Uniform on (0, 1).
    fn uniform(&mut self) -> f64 {
        ((self.next_u64() >> 11) as f64 + 0.5) / (1u64 << 53) as f64
    }
    fn normal(&mut self) -> f64 {
        let (u1, u2) = (self.uniform(), self.uniform());
        (-2.0 * u1.ln()).sqrt() * (std::f64::consts::TAU * u2).cos()
    }
}

fn monte_carlo(model: &Model<'_>, draws: usize, seed: u64) -> Result<MonteCarlo> {
    in_range("draws", draws as f64, 10.0, 1e6)?;
    let mut rng = Rng(seed);
    let mut out = Vec::with_capacity(draws);
    let mut deltas = vec![0.0; model.inputs.len()];
    for _ in 0..draws {
        for (d, inp) in deltas.iter_mut().zip(&model.inputs) {
            *d = match inp.dist {
                Distribution::Normal => inp.u * rng.normal(),
                Distribution::Rectangular => inp.u * SQRT3 * (2.0 * rng.uniform() - 1.0),
            };
        }
        if let Ok(ph) = model.eval(&deltas) {
            out.push(ph);
        }
    }
    if out.len() < 10 {
        return Err(SolverError::Infeasible {
            field: "draws".into(),
            reason: "too few draws could be solved".into(),
        });
    }
    let n = out.len() as f64;
    let mean = out.iter().sum::<f64>() / n;
    let sd = (out.iter().map(|x| (x - mean) * (x - mean)).sum::<f64>() / (n - 1.0)).sqrt();
    crate::order::sort_by(&mut out, f64::total_cmp);
    let q = |p: f64| {
        let i = ((out.len() - 1) as f64 * p).round() as usize;
        out.get(i).copied().unwrap_or(f64::NAN)
    };
    Ok(MonteCarlo {
        draws: out.len(),
        mean,
        sd,
        u95_ph: COVERAGE_FACTOR * sd,
        low: q(0.025),
        high: q(0.975),
    })
}

/// Monte Carlo propagation of the same inputs as [`recipe_uncertainty`](super::recipe_uncertainty):
/// every input drawn at once, each draw solved exactly.
///
/// # Errors
///
/// `draws` outside 10–1 000 000; bad inputs; solver failures.
pub fn recipe_monte_carlo(
    spec: &RecipeSpec,
    result: &RecipeResult,
    inputs: &UncertaintyInputs,
    custom: &[AcidSystem],
    draws: usize,
    seed: u64,
) -> Result<MonteCarlo> {
    monte_carlo(&recipe_model(spec, result, inputs, custom)?, draws, seed)
}

/// Monte Carlo propagation of the same inputs as [`mixture_uncertainty`](super::mixture_uncertainty).
///
/// # Errors
///
/// As [`recipe_monte_carlo`].
pub fn mixture_monte_carlo(
    spec: &MixtureSpec,
    inputs: &UncertaintyInputs,
    custom: &[AcidSystem],
    draws: usize,
    seed: u64,
) -> Result<MonteCarlo> {
    monte_carlo(&mixture_model(spec, inputs, custom)?, draws, seed)
}
