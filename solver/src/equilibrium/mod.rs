//! The exact charge balance: pH of a mixture of acid systems and spectator ions.
//!
//! # Model
//!
//! pH is the activity scale, `pH = −log10 a(H⁺)`. An acid system with total
//! concentration `C`, fully protonated charge `z₀` and thermodynamic constants
//! `K₁ … Kₙ` has species `j = 0 … n` (j protons removed) with charge
//! `z_j = z₀ − j`. With activity coefficients `γ_z` the concentration ratios are
//!
//! ```text
//! [A_j] / [A_{j−1}] = K_j γ_{z_{j−1}} / (a_H γ_{z_j})
//! ```
//!
//! The charge balance solved for `a_H` is
//!
//! ```text
//! F(pH) = [H⁺] − [OH⁻] + Σ_k C_k (z₀,k − n̄_k) + S = 0
//! [H⁺] = a_H / γ₁,   [OH⁻] = K_w / (a_H γ₁)
//! ```
//!
//! where `n̄_k` is the mean number of protons removed from system `k` and `S`
//! the net charge of the spectator ions (Na⁺, K⁺, Cl⁻ from salts, strong acids
//! and bases). Its derivative is
//!
//! ```text
//! dF/dpH = −ln 10 ( [H⁺] + [OH⁻] + Σ_k C_k Var_k(j) ) = −β
//! ```
//!
//! so `F` is strictly decreasing: the root is unique, and Newton steps with a
//! bisection safeguard inside a sign-checked bracket always converge. The
//! ionic strength
//!
//! ```text
//! I = ½ ( [H⁺] + [OH⁻] + Σ_k C_k Σ_j z_j² α_j + Σ spectators z² c )
//! ```
//!
//! is solved together with the pH: Newton's method on (pH, I) with the
//! analytic Jacobian (derivatives in g = ln γ₁ are covariances of the
//! protonation moments, like the pH derivatives). If that ever fails, a
//! bisection-safeguarded Newton in pH nested in a fixed-point loop on I takes
//! over. Nothing in the iteration allocates.
//!
//! An acid marked [`Acid::open`] is held by a gas instead of weighed in: its
//! neutral species stays at a fixed concentration and its total follows the
//! pH (the same balance with the sums of [`open`]); used for CO₂ over a
//! solution, with the gas in [`gas`].

pub mod acid;
pub mod activity;

use crate::error::{Result, SolverError};
use crate::system::MAX_STEPS;
pub use acid::{fractions_into, Acid};
use activity::{gamma1, ActivityModel, DAVIES_LIMIT};
use serde::{Deserialize, Serialize};

const LN10: f64 = std::f64::consts::LN_10;
/// Lowest pH the bracket search starts from.
pub const PH_LO: f64 = -3.0;
/// Highest pH the bracket search starts from.
pub const PH_HI: f64 = 17.0;

/// Everything the charge balance needs, resolved at one temperature.
#[derive(Debug, Clone, PartialEq)]
pub struct Composition {
    /// Acid systems present.
    pub acids: Vec<Acid>,
    /// Net charge of spectator ions, Σ z c (mol/L).
    pub spectator_charge: f64,
    /// Σ z² c of spectator ions (mol/L), twice their share of I.
    pub spectator_z2: f64,
    /// Ionic product of water at the temperature.
    pub kw: f64,
    /// Debye–Hückel A at the temperature.
    pub a_dh: f64,
    /// Activity model.
    pub activity: ActivityModel,
}

/// Non-fatal conditions a result carries.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Warning {
    /// Ionic strength beyond the range the Davies equation is trusted in.
    IonicStrengthBeyondModel,
    /// pH outside 0–14: the solution is extreme and the model is rough there.
    ExtremePh,
}

/// The solved state of a composition.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Equilibrium {
    /// pH (activity scale).
    pub ph: f64,
    /// Ionic strength, mol/L.
    pub ionic_strength: f64,
    /// Activity coefficient of singly charged ions.
    pub gamma1: f64,
    /// [H⁺], mol/L.
    pub h: f64,
    /// [OH⁻], mol/L.
    pub oh: f64,
    /// Buffer capacity β = dC_base/dpH, mol/(L·pH): the pH response to a
    /// small addition of strong base, with the ionic strength free to follow
    /// (analytic; equals the fixed-I form in the ideal model).
    pub capacity: f64,
    /// Charge-balance residual at the answer, mol/L.
    pub residual: f64,
    /// Charge-balance evaluations used.
    pub evaluations: u32,
    /// Warnings.
    pub warnings: Vec<Warning>,
}

/// Sums over one acid at one `a_H` and γ₁: Σt, Σ j t, Σ j² t (unnormalised).
///
/// The species-weight recurrence here is repeated, fused with different sums,
/// in `acid_moments4` and `fractions_into`. Sharing one weights array
/// measured 40–80 % slower on the solve benchmark, so the hot loops stay fused.
#[inline]
fn acid_moments(acid: &Acid, inv_h: f64, g1: f64) -> (f64, f64, f64) {
    // term_j = Π_{i≤j} K'_i / a_H, K'_i = K_i γ_{z_{i−1}} / γ_{z_i}
    // with γ_z = g1^(z²): γ_{z−1}… ratio exponent z_{i−1}² − z_i² = 2 z_i + 1.
    let mut term = 1.0;
    let mut s0 = 1.0;
    let mut s1 = 0.0;
    let mut s2 = 0.0;
    let ideal = g1 == 1.0;
    for (i, &k) in acid.ka.iter().take(acid.n).enumerate() {
        let j = (i + 1) as f64;
        let zj = acid.z0 - (i as i32 + 1);
        let corr = if ideal { 1.0 } else { g1.powi(2 * zj + 1) };
        term *= k * corr * inv_h;
        s0 += term;
        s1 += j * term;
        s2 += j * j * term;
    }
    (s0, s1, s2)
}

/// Charge balance, its pH-derivative (−β) and the ionic strength at one pH.
#[derive(Debug, Clone, Copy)]
struct Eval {
    f: f64,
    beta: f64,
    ionic: f64,
    h: f64,
    oh: f64,
}

#[inline]
fn evaluate(c: &Composition, ph: f64, g1: f64) -> Eval {
    let inv_h = (ph * LN10).exp();
    let a_h = 1.0 / inv_h;
    let h = a_h / g1;
    let oh = c.kw * inv_h / g1;
    let mut f = h - oh + c.spectator_charge;
    let mut var_sum = 0.0;
    let mut z2_sum = c.spectator_z2 + h + oh;
    for acid in &c.acids {
        let (s0, s1, s2) = acid_moments(acid, inv_h, g1);
        if acid.open {
            let (df, dvar, dz2) = open::contributions(acid.total, s1, s2);
            f += df;
            var_sum += dvar;
            z2_sum += dz2;
            continue;
        }
        let nbar = s1 / s0;
        let e2 = s2 / s0;
        let z0 = f64::from(acid.z0);
        f += acid.total * (z0 - nbar);
        var_sum += acid.total * (e2 - nbar * nbar).max(0.0);
        // Σ z_j² α_j = z0² − 2 z0 n̄ + E[j²]
        z2_sum += acid.total * (z0 * z0 - 2.0 * z0 * nbar + e2);
    }
    Eval {
        f,
        beta: LN10 * (h + oh + var_sum),
        ionic: 0.5 * z2_sum,
        h,
        oh,
    }
}

/// Validate a composition before iterating.
fn check(c: &Composition) -> Result<()> {
    let num = |field: &str, v: f64| -> Result<()> {
        if !v.is_finite() {
            return Err(SolverError::NotFinite {
                field: field.to_string(),
            });
        }
        Ok(())
    };
    num("kw", c.kw)?;
    num("a_dh", c.a_dh)?;
    num("spectator_charge", c.spectator_charge)?;
    num("spectator_z2", c.spectator_z2)?;
    if c.kw <= 0.0 {
        return Err(SolverError::OutOfRange {
            field: "kw".into(),
            value: c.kw,
            min: f64::MIN_POSITIVE,
            max: 1.0,
        });
    }
    if c.spectator_z2 < 0.0 {
        return Err(SolverError::Negative {
            field: "spectator_z2".into(),
            value: c.spectator_z2,
        });
    }
    for (i, a) in c.acids.iter().enumerate() {
        if !a.total.is_finite() {
            return Err(SolverError::NotFinite {
                field: format!("acids[{i}].total"),
            });
        }
        if a.total < 0.0 {
            return Err(SolverError::Negative {
                field: format!("acids[{i}].total"),
                value: a.total,
            });
        }
        if a.open && a.z0 != 0 {
            return Err(SolverError::Infeasible {
                field: format!("acids[{i}].open"),
                reason: "only a system whose protonated species is neutral can be held by a gas"
                    .into(),
            });
        }
        if a.n > MAX_STEPS {
            return Err(SolverError::OutOfRange {
                field: format!("acids[{i}].n"),
                value: a.n as f64,
                min: 0.0,
                max: MAX_STEPS as f64,
            });
        }
        for (s, k) in a.ka.iter().take(a.n).enumerate() {
            if !(k.is_finite() && *k > 0.0) {
                return Err(SolverError::OutOfRange {
                    field: format!("acids[{i}].ka[{s}]"),
                    value: *k,
                    min: f64::MIN_POSITIVE,
                    max: f64::MAX,
                });
            }
        }
    }
    Ok(())
}

/// Solve the charge balance at a fixed γ₁: safeguarded Newton in a bracket.
fn solve_fixed_gamma(c: &Composition, g1: f64, guess: f64, evals: &mut u32) -> Result<Eval> {
    // Warm start: Newton inside the default bracket without evaluating its
    // ends. F is strictly decreasing, so if the root lies inside, bisection on
    // the assumed signs is valid; if the iterate ends on an edge the root is
    // outside and the checked search below takes over.
    if guess.is_finite() && guess > PH_LO && guess < PH_HI {
        if let Ok(e) = newton(c, g1, guess, PH_LO, PH_HI, evals) {
            let ph = -(e.h * g1).log10();
            if ph > PH_LO + 1e-6 && ph < PH_HI - 1e-6 {
                return Ok(e);
            }
        }
    }
    let mut lo = PH_LO;
    let mut hi = PH_HI;
    // Widen the bracket for extreme (very concentrated) inputs.
    let mut e_lo = evaluate(c, lo, g1);
    *evals += 1;
    while e_lo.f < 0.0 && lo > -10.0 {
        lo -= 3.0;
        e_lo = evaluate(c, lo, g1);
        *evals += 1;
    }
    let mut e_hi = evaluate(c, hi, g1);
    *evals += 1;
    while e_hi.f > 0.0 && hi < 24.0 {
        hi += 3.0;
        e_hi = evaluate(c, hi, g1);
        *evals += 1;
    }
    if !(e_lo.f >= 0.0 && e_hi.f <= 0.0) {
        return Err(SolverError::NoBracket { lo, hi });
    }
    let x = if guess.is_finite() && guess > lo && guess < hi {
        guess
    } else {
        0.5 * (lo + hi)
    };
    newton(c, g1, x, lo, hi, evals)
}

/// Safeguarded Newton iteration on F(pH) inside `[lo, hi]`, F(lo) ≥ 0 ≥ F(hi).
fn newton(c: &Composition, g1: f64, x0: f64, lo: f64, hi: f64, evals: &mut u32) -> Result<Eval> {
    let (mut lo, mut hi, mut x) = (lo, hi, x0);
    let mut last_f = f64::NAN;
    for _ in 0..200 {
        let e = evaluate(c, x, g1);
        *evals += 1;
        last_f = e.f;
        if e.f == 0.0 {
            return Ok(e);
        }
        if e.f > 0.0 {
            lo = x;
        } else {
            hi = x;
        }
        // Newton step: F' = −β.
        let step = if e.beta > 0.0 { e.f / e.beta } else { f64::NAN };
        if step.abs() < 1e-12 || (hi - lo) < 1e-13 {
            return Ok(e);
        }
        let newton = x + step;
        x = if newton.is_finite() && newton > lo && newton < hi {
            newton
        } else {
            0.5 * (lo + hi)
        };
    }
    Err(SolverError::NoConvergence {
        iterations: 200,
        residual: last_f,
    })
}

/// Charge balance, ionic strength and their partial derivatives in pH and in
/// g = ln γ₁, for the joint Newton iteration.
#[derive(Debug, Clone, Copy)]
struct Jac {
    e: Eval,
    /// ∂F/∂g.
    fg: f64,
    /// ∂I_out/∂pH.
    ix: f64,
    /// ∂I_out/∂g.
    ig: f64,
}

/// Moments Σ t j^k (k = 0…4) of one acid.
#[inline]
fn acid_moments4(acid: &Acid, inv_h: f64, g1: f64) -> [f64; 5] {
    let mut term = 1.0;
    let mut m = [1.0, 0.0, 0.0, 0.0, 0.0];
    for (i, &k) in acid.ka.iter().take(acid.n).enumerate() {
        let j = (i + 1) as f64;
        let zj = acid.z0 - (i as i32 + 1);
        term *= k * g1.powi(2 * zj + 1) * inv_h;
        let (j2, t) = (j * j, term);
        m[0] += t;
        m[1] += j * t;
        m[2] += j2 * t;
        m[3] += j2 * j * t;
        m[4] += j2 * j2 * t;
    }
    m
}

fn evaluate_jac(c: &Composition, ph: f64, g1: f64) -> Jac {
    // With g = ln γ₁ and γ_z = γ₁^(z²), species j of an acid carries the factor
    // exp(g·e_j), e_j = z₀² − z_j² = 2 z₀ j − j², so every derivative is a
    // covariance of j-moments, the same way the pH derivatives are.
    let inv_h = (ph * LN10).exp();
    let a_h = 1.0 / inv_h;
    let h = a_h / g1;
    let oh = c.kw * inv_h / g1;
    let mut f = h - oh + c.spectator_charge;
    let mut beta = LN10 * (h + oh);
    let mut fg = -h + oh;
    let mut z2 = c.spectator_z2 + h + oh;
    let mut ix = LN10 * (oh - h);
    let mut ig = -h - oh;
    for acid in &c.acids {
        let m = acid_moments4(acid, inv_h, g1);
        let [s0, s1, s2, s3, s4] = m;
        if acid.open {
            let o = open::jacobian(acid.total, [s1, s2, s3, s4]);
            f += o[0];
            beta += LN10 * o[1];
            fg += o[2];
            z2 += o[3];
            ix += LN10 * o[4];
            ig += o[5];
            continue;
        }
        let (m1, m2, m3, m4) = (s1 / s0, s2 / s0, s3 / s0, s4 / s0);
        let z0 = f64::from(acid.z0);
        let var = (m2 - m1 * m1).max(0.0);
        let c12 = m3 - m1 * m2; // Cov(j, j²)
        let cov_je = 2.0 * z0 * var - c12; // Cov(j, e)
        let cov_j2e = 2.0 * z0 * c12 - (m4 - m2 * m2); // Cov(j², e)
        let t = acid.total;
        f += t * (z0 - m1);
        beta += LN10 * t * var;
        fg -= t * cov_je;
        z2 += t * (z0 * z0 - 2.0 * z0 * m1 + m2);
        ix += LN10 * t * (-2.0 * z0 * var + c12);
        ig += t * (-2.0 * z0 * cov_je + cov_j2e);
    }
    Jac {
        e: Eval {
            f,
            beta,
            ionic: 0.5 * z2,
            h,
            oh,
        },
        fg,
        ix: 0.5 * ix,
        ig: 0.5 * ig,
    }
}

/// d(ln γ₁)/dI for the Davies equation.
fn dg_di(a_dh: f64, ionic: f64) -> f64 {
    let i = ionic.max(1e-12);
    let s = i.sqrt();
    -a_dh * LN10 * (1.0 / (2.0 * s * (1.0 + s) * (1.0 + s)) - 0.3)
}

/// Newton's method on both unknowns (pH and I) at once:
///
/// ```text
/// R₁ = F(pH, g(I)) = 0,   R₂ = I_out(pH, g(I)) − I = 0,   g = ln γ₁
/// ```
///
/// with the analytic Jacobian, so it converges quadratically from a warm
/// start. `None` if a step is implausibly large or it does not settle, and
/// the caller falls back to the nested bracketed iteration.
fn joint(c: &Composition, x0: f64, i0: f64, evals: &mut u32) -> Option<(Eval, f64, f64)> {
    let mut x = x0;
    let mut ionic = if i0.is_finite() && i0 >= 0.0 {
        i0
    } else {
        0.5 * c.spectator_z2
    };
    for _ in 0..40 {
        let g1 = gamma1(c.activity, c.a_dh, ionic);
        let jac = evaluate_jac(c, x, g1);
        *evals += 1;
        let gp = dg_di(c.a_dh, ionic);
        let (r1, r2) = (jac.e.f, jac.e.ionic - ionic);
        let (j11, j12) = (-jac.e.beta, jac.fg * gp);
        let (j21, j22) = (jac.ix, jac.ig * gp - 1.0);
        let det = j11 * j22 - j12 * j21;
        if !det.is_finite() || det == 0.0 {
            return None;
        }
        let dx = (-r1 * j22 + j12 * r2) / det;
        let di = (-j11 * r2 + r1 * j21) / det;
        if !(dx.is_finite() && di.is_finite()) || dx.abs() > 2.0 {
            return None;
        }
        if dx.abs() < 1e-11 && di.abs() <= 1e-14 + 1e-10 * ionic {
            return Some((jac.e, g1, x));
        }
        x += dx;
        ionic = if ionic + di > 0.0 {
            ionic + di
        } else {
            0.5 * ionic
        };
        if !(PH_LO..=PH_HI).contains(&x) {
            return None;
        }
    }
    None
}

/// Buffer capacity dC_base/dpH with the ionic strength free to change: the
/// response to adding strong base b (as Na⁺) of the coupled system
/// `F + b = 0`, `I_out + b/2 − I = 0`, from the same analytic Jacobian.
/// `None` in the ideal model (where it equals the fixed-I β).
fn total_capacity(c: &Composition, ph: f64, ionic: f64, g1: f64) -> Option<f64> {
    if c.activity == ActivityModel::Ideal {
        return None;
    }
    let jac = evaluate_jac(c, ph, g1);
    let gp = dg_di(c.a_dh, ionic);
    let (j11, j12) = (-jac.e.beta, jac.fg * gp);
    let (j21, j22) = (jac.ix, jac.ig * gp - 1.0);
    let det = j11 * j22 - j12 * j21;
    let dxdb = (-j22 + 0.5 * j12) / det;
    (dxdb.is_finite() && dxdb > 0.0).then(|| 1.0 / dxdb)
}

/// Solve for pH and ionic strength.
///
/// `guess` is a starting pH (use the previous answer along a curve, or
/// `f64::NAN` for none).
///
/// # Errors
///
/// [`SolverError::NotFinite`], [`SolverError::Negative`] or
/// [`SolverError::OutOfRange`] for a malformed composition (checked before
/// iterating); [`SolverError::NoBracket`] or [`SolverError::NoConvergence`]
/// if no root is found (not seen for physically valid input).
///
/// # Example
///
/// 1.0×10⁻⁸ M HCl in pure water (Kw = 1.0×10⁻¹⁴, ideal) has pH 6.98, not 8:
///
/// ```
/// use solver::equilibrium::{solve, Composition};
/// use solver::equilibrium::activity::ActivityModel;
/// let c = Composition {
///     acids: vec![],
///     spectator_charge: -1e-8, // Cl⁻ from HCl
///     spectator_z2: 1e-8,
///     kw: 1e-14,
///     a_dh: 0.5085,
///     activity: ActivityModel::Ideal,
/// };
/// let eq = solve(&c, f64::NAN)?;
/// assert!((eq.ph - 6.978).abs() < 0.001);
/// # Ok::<(), solver::SolverError>(())
/// ```
pub fn solve(c: &Composition, guess: f64) -> Result<Equilibrium> {
    solve_hinted(c, guess, f64::NAN)
}

/// [`solve`] with a starting ionic strength as well as a starting pH (the
/// previous point's answer along a curve), which saves most of the ionic
/// strength iterations.
///
/// # Errors
///
/// As [`solve`].
pub fn solve_hinted(c: &Composition, guess: f64, ionic_hint: f64) -> Result<Equilibrium> {
    check(c)?;
    let mut evals = 0u32;
    let mut ionic = 0.5 * c.spectator_z2;
    let mut g1 = gamma1(c.activity, c.a_dh, ionic);
    let mut e;
    let mut ph;
    // Fast path for activity models: one joint iteration that takes a Newton
    // step in pH and a fixed-point step in I together, from a warm start (or
    // from the answer at the spectator-only ionic strength). Falls back to the
    // nested iteration below if it does not settle quickly.
    let mut i0 = ionic_hint;
    let start = if guess.is_finite() && guess > PH_LO && guess < PH_HI {
        Some(guess)
    } else if c.activity != ActivityModel::Ideal {
        let e0 = solve_fixed_gamma(c, g1, f64::NAN, &mut evals)?;
        i0 = e0.ionic;
        Some(phx(&e0, g1))
    } else {
        None
    };
    let joint_result = match (c.activity, start) {
        (ActivityModel::Ideal, _) | (_, None) => None,
        (_, Some(x0)) => joint(c, x0, i0, &mut evals),
    };
    if let Some((je, jg, jx)) = joint_result {
        e = je;
        g1 = jg;
        ph = jx;
    } else {
        e = solve_fixed_gamma(c, g1, start.unwrap_or(guess), &mut evals)?;
        ph = phx(&e, g1);
    }
    if c.activity != ActivityModel::Ideal && joint_result.is_none() {
        let mut converged = false;
        for it in 0..100 {
            let new_i = e.ionic;
            // Damp late iterations in case of oscillation at high I.
            let next_i = if it < 20 {
                new_i
            } else {
                0.5 * (new_i + ionic)
            };
            let done = (next_i - ionic).abs() <= 1e-13 + 1e-10 * ionic;
            ionic = next_i;
            g1 = gamma1(c.activity, c.a_dh, ionic);
            e = solve_fixed_gamma(c, g1, ph, &mut evals)?;
            ph = phx(&e, g1);
            if done {
                converged = true;
                break;
            }
        }
        if !converged {
            return Err(SolverError::NoConvergence {
                iterations: 100,
                residual: e.ionic - ionic,
            });
        }
    }
    let mut warnings = Vec::new();
    if c.activity == ActivityModel::Davies && e.ionic > DAVIES_LIMIT {
        warnings.push(Warning::IonicStrengthBeyondModel);
    }
    if !(0.0..=14.0).contains(&ph) {
        warnings.push(Warning::ExtremePh);
    }
    Ok(Equilibrium {
        ph,
        ionic_strength: e.ionic,
        gamma1: g1,
        h: e.h,
        oh: e.oh,
        capacity: total_capacity(c, ph, e.ionic, g1).unwrap_or(e.beta),
        residual: e.f,
        evaluations: evals,
        warnings,
    })
}

/// Solve the charge balance with the ionic strength held at `ionic_strength`
/// (activity coefficients frozen). Returns the pH.
///
/// Used to check [`Equilibrium::capacity`], which is defined at fixed ionic
/// strength, against a finite difference.
///
/// # Errors
///
/// As [`solve`].
pub fn solve_at_ionic_strength(c: &Composition, ionic_strength: f64, guess: f64) -> Result<f64> {
    check(c)?;
    let g1 = gamma1(c.activity, c.a_dh, ionic_strength);
    let mut evals = 0;
    let e = solve_fixed_gamma(c, g1, guess, &mut evals)?;
    Ok(phx(&e, g1))
}

/// Recover the pH of an evaluation from [H⁺] and γ₁.
fn phx(e: &Eval, g1: f64) -> f64 {
    -(e.h * g1).log10()
}

/// Net spectator charge the solution would need to sit at `ph` for a given
/// ionic strength: `S = −([H⁺] − [OH⁻] + Σ C (z₀ − n̄))`.
///
/// Also returns the ionic strength contributed by everything except the
/// spectator ions (`½ Σ z² c` of H⁺, OH⁻ and the acid species).
pub fn required_spectator_charge(c: &Composition, ph: f64, ionic_strength: f64) -> (f64, f64) {
    let g1 = gamma1(c.activity, c.a_dh, ionic_strength);
    let e = evaluate(c, ph, g1);
    (-(e.f - c.spectator_charge), e.ionic - 0.5 * c.spectator_z2)
}

/// Solve for the amount `x` (mol/L) of an addition that changes the spectator
/// charge by `dcharge·x` and Σz²c by `dz2·x`, such that the pH equals `ph`.
///
/// This is the one inverse used by recipes (which form ratio, how much
/// titrant) and by the tolerance budget (how much acid or base leaves the
/// window). The ionic strength is iterated to self-consistency, so the answer
/// is exact under the model, not a linearisation.
///
/// # Errors
///
/// [`SolverError::Infeasible`] when `dcharge` is zero;
/// [`SolverError::NoConvergence`] if the ionic strength does not settle.
pub fn solve_addition(c: &Composition, ph: f64, dcharge: f64, dz2: f64) -> Result<(f64, f64)> {
    check(c)?;
    if !ph.is_finite() {
        return Err(SolverError::NotFinite { field: "ph".into() });
    }
    if dcharge == 0.0 || !dcharge.is_finite() || !dz2.is_finite() {
        return Err(SolverError::Infeasible {
            field: "addition".into(),
            reason: "the addition carries no charge, so it cannot move the pH".into(),
        });
    }
    let mut ionic = 0.5 * c.spectator_z2;
    let mut x = 0.0;
    for _ in 0..200 {
        let (need, i_rest) = required_spectator_charge(c, ph, ionic);
        let new_x = (need - c.spectator_charge) / dcharge;
        let new_i = (i_rest + 0.5 * (c.spectator_z2 + dz2 * new_x)).max(0.0);
        let done = (new_i - ionic).abs() <= 1e-13 + 1e-10 * ionic
            && (new_x - x).abs() <= 1e-15 + 1e-10 * x.abs();
        x = new_x;
        ionic = new_i;
        if done || c.activity == ActivityModel::Ideal {
            return Ok((x, ionic));
        }
    }
    Err(SolverError::NoConvergence {
        iterations: 200,
        residual: x,
    })
}

/// Buffer capacity β (mol/(L·pH)) of a composition at any pH, at fixed
/// ionic strength, analytic:
///
/// ```text
/// β = ln 10 ( [H⁺] + [OH⁻] + Σ_k C_k ( Σ j² α_j − (Σ j α_j)² ) )
/// ```
pub fn capacity_at(c: &Composition, ph: f64, ionic_strength: f64) -> f64 {
    capacity_with_gamma(c, ph, gamma1(c.activity, c.a_dh, ionic_strength))
}

/// [`capacity_at`] with γ₁ already computed (for curves at one ionic strength).
pub fn capacity_with_gamma(c: &Composition, ph: f64, gamma1: f64) -> f64 {
    evaluate(c, ph, gamma1).beta
}

/// Charge-balance residual at a pH and ionic strength (for tests and checks).
pub fn charge_residual(c: &Composition, ph: f64, ionic_strength: f64) -> f64 {
    let g1 = gamma1(c.activity, c.a_dh, ionic_strength);
    evaluate(c, ph, g1).f
}

pub mod gas;
pub mod open;
#[cfg(test)]
mod tests;
