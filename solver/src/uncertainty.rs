//! Uncertainty of a predicted pH or species fraction: a first-order budget (JCGM 100:2008, k = 2) and a Monte Carlo check (JCGM 101:2008).
//!
//! # Method
//!
//! The predicted pH is a function of the inputs: the pK of every step, the
//! activity model, the temperature, and for a recipe every weighed mass,
//! poured volume, stock molarity and the final volume. Each input `x_i` has
//! a standard uncertainty `u(x_i)`:
//!
//! - values entered as a ± figure (balance readability, glassware
//!   tolerance, temperature, stock molarity, pH meter) are half-widths of a
//!   rectangular distribution, `u = a/√3` (JCGM 100:2008, 4.3.7);
//! - pK uncertainties ([`pk_uncertainty`]) and the activity-model allowance
//!   are standard uncertainties of a normal distribution.
//!
//! The sensitivity `c_i = ∂pH/∂x_i` is a central difference through the
//! full solver (prepare the perturbed mixture, solve the charge balance with
//! the ionic strength iterated): the same engine that gives the pH. For a
//! strong-base titrant the result equals the analytic `1/β` of the solver
//! (checked in `tests/uncertainty.rs`); central differences are used
//! throughout so that every input, including masses of salts that change
//! both the buffer total and the ionic strength, goes through one path.
//! The activity allowance enters with `c = 1`.
//!
//! ```text
//! u_i(pH) = |c_i| u(x_i),   u_c(pH) = √Σ u_i²,   U95 = k u_c with k = 2
//! share_i = u_i² / u_c²
//! ```
//!
//! Inputs are taken as uncorrelated. [`recipe_monte_carlo`] and
//! [`mixture_monte_carlo`] draw every input at once from its distribution
//! (seeded SplitMix64, Box–Muller normals) and solve each draw: the spread
//! checks the first-order result where the model is not linear.

use crate::activity::ActivityModel;
use crate::equilibrium::solve;
use crate::error::{in_range, Result, SolverError};
use crate::field::{field_reading, FieldResult, FieldSpec};
use crate::library::find_form;
use crate::mixture::{lookup, prepare, MixtureSpec};
use crate::recipe::{RecipeResult, RecipeSpec};
use crate::system::AcidSystem;
use serde::{Deserialize, Serialize};

/// Coverage factor for the expanded uncertainty (about 95 %).
pub const COVERAGE_FACTOR: f64 = 2.0;

const SQRT3: f64 = 1.732_050_807_568_877_2;

// ------------------------------------------------------------ pK table

/// Standard uncertainty of one dissociation step's pK (25 °C, I = 0).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct PkUncertainty {
    /// System id.
    pub system: &'static str,
    /// Step, 1-based.
    pub step: usize,
    /// Standard uncertainty of the pK.
    pub u_pk: f64,
    /// Where the figure comes from, and whether it is an estimate.
    pub source: &'static str,
}

const EST_WELL: &str = "estimate (well-studied step; Goldberg, Kishore & Lennen 2002 and NIST \
     SRD 46 agree within 0.001–0.003; the compilation's per-entry figures were not re-read)";
const EST_GOOD: &str = "estimate (Good's buffer, one or two emf studies; of the size Goldberg, \
     Kishore & Lennen 2002 give, per-entry figures not re-read)";
const EST_FEW: &str = "estimate (few measurements; Goldberg, Kishore & Lennen 2002, per-entry \
     figures not re-read)";
const EST_FORMULA: &str =
    "estimate (system-specific formula; scatter of the fitted data, not re-read)";

/// Per-step pK uncertainties of the library systems.
pub const PK_UNCERTAINTY: &[PkUncertainty] = &[
    pk("acetate", 1, 0.003, EST_WELL),
    pk("formate", 1, 0.005, EST_WELL),
    pk("citrate", 1, 0.005, EST_WELL),
    pk("citrate", 2, 0.005, EST_WELL),
    pk("citrate", 3, 0.005, EST_WELL),
    pk("phosphate", 1, 0.005, EST_WELL),
    pk("phosphate", 2, 0.003, EST_WELL),
    pk(
        "phosphate",
        3,
        0.03,
        "estimate: Goldberg et al. (2002) 12.35 and NIST SRD 46 12.375 differ by 0.025",
    ),
    pk("carbonate", 1, 0.005, EST_FORMULA),
    pk("carbonate", 2, 0.005, EST_FORMULA),
    pk("borate", 1, 0.005, EST_FORMULA),
    pk("ammonium", 1, 0.005, EST_FORMULA),
    pk("tris", 1, 0.003, EST_FORMULA),
    pk("hepes", 1, 0.005, EST_GOOD),
    pk("mes", 1, 0.005, EST_GOOD),
    pk("mops", 1, 0.01, EST_FEW),
    pk(
        "pipes",
        1,
        0.1,
        "estimate: the value 2.67 itself is from memory, held constant",
    ),
    pk("pipes", 2, 0.01, EST_FEW),
    pk("bicine", 1, 0.01, EST_FEW),
    pk("tricine", 1, 0.01, EST_FEW),
    pk("glycine", 1, 0.005, EST_WELL),
    pk("glycine", 2, 0.005, EST_WELL),
    pk("succinate", 1, 0.01, EST_FEW),
    pk("succinate", 2, 0.01, EST_FEW),
    pk("imidazole", 1, 0.01, EST_FEW),
    pk("bistris", 1, 0.005, EST_GOOD),
    pk("aces", 1, 0.005, EST_FORMULA),
    pk("ches", 1, 0.005, EST_FORMULA),
    pk("caps", 1, 0.01, EST_FEW),
    pk("tes", 1, 0.005, EST_GOOD),
    pk("phthalate", 1, 0.01, EST_FEW),
    pk("phthalate", 2, 0.005, EST_WELL),
    pk(
        "hypochlorous",
        1,
        0.01,
        "estimate: Morris (1966) formula from memory",
    ),
    pk(
        "sulfide",
        1,
        0.02,
        "Millero (1988): ±0.02 as given, taken as a standard uncertainty",
    ),
];

const fn pk(system: &'static str, step: usize, u_pk: f64, source: &'static str) -> PkUncertainty {
    PkUncertainty {
        system,
        step,
        u_pk,
        source,
    }
}

/// Standard uncertainty assumed for a step not in [`PK_UNCERTAINTY`] (a
/// user-defined system).
pub const DEFAULT_U_PK: f64 = 0.02;

/// u(pK) and its source for a system's step (1-based). Steps not in the
/// table (user-defined systems) get [`DEFAULT_U_PK`], marked as an estimate.
pub fn pk_uncertainty(system: &str, step: usize) -> (f64, &'static str) {
    PK_UNCERTAINTY
        .iter()
        .find(|e| e.system == system && e.step == step)
        .map_or(
            (
                DEFAULT_U_PK,
                "estimate for a constant not in the library's table",
            ),
            |e| (e.u_pk, e.source),
        )
}

// ------------------------------------------------------------ inputs

/// What the user knows about the uncertainty of their inputs. Every ±
/// figure is a half-width (rectangular distribution, u = a/√3). Optional
/// in a design document; every field has a default.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields, default)]
pub struct UncertaintyInputs {
    /// Temperature, ± K (default 0.5: a lab thermometer, common practice).
    pub temperature_k: f64,
    /// Balance readability, ± mg per weighing (default 1 mg: a
    /// top-loading balance; 0.1 mg for an analytical balance).
    pub balance_mg: f64,
    /// Volumetric flask, ± mL; `None` suggests the class A tolerance for
    /// the volume ([`suggested_flask_ml`], ISO 1042, from memory).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub flask_ml: Option<f64>,
    /// Each poured volume, ± % of the volume; `None` suggests the class A
    /// pipette tolerance ([`suggested_pour_ml`], ISO 648, from memory).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub pour_percent: Option<f64>,
    /// Each stock's molarity, ± % (default 0.5, estimate for a stock made
    /// by weighing; a standardised titrant is better).
    pub stock_percent: f64,
    /// Each entered concentration of a mixture, ± % (default 0.5, estimate).
    pub concentration_percent: f64,
    /// pH meter, ± pH (default 0.02: two-point calibrated meter, common practice).
    pub ph_meter: f64,
    /// Include the activity-model allowance.
    pub activity_allowance: bool,
    /// Activity allowance at I = 0, pH (standard uncertainty; default 0.005, estimate).
    pub activity_base_ph: f64,
    /// Growth of the activity allowance with ionic strength, pH per mol/L
    /// (default 0.05, estimate: Davies against the Bates–Guggenheim pH(S)
    /// standards differs by up to about 0.012 at I ≈ 0.1).
    pub activity_per_ionic: f64,
}

impl Default for UncertaintyInputs {
    fn default() -> Self {
        Self {
            temperature_k: 0.5,
            balance_mg: 1.0,
            flask_ml: None,
            pour_percent: None,
            stock_percent: 0.5,
            concentration_percent: 0.5,
            ph_meter: 0.02,
            activity_allowance: true,
            activity_base_ph: 0.005,
            activity_per_ionic: 0.05,
        }
    }
}

impl UncertaintyInputs {
    /// Every input zero and no activity allowance: only the pK table is
    /// left (useful to see the data's own share).
    pub fn none() -> Self {
        Self {
            temperature_k: 0.0,
            balance_mg: 0.0,
            flask_ml: Some(0.0),
            pour_percent: Some(0.0),
            stock_percent: 0.0,
            concentration_percent: 0.0,
            ph_meter: 0.0,
            activity_allowance: false,
            activity_base_ph: 0.0,
            activity_per_ionic: 0.0,
        }
    }

    /// Whether these are the defaults (a design document then omits them).
    pub fn is_default(&self) -> bool {
        *self == Self::default()
    }

    /// Check every figure, naming the field (`uncertainty.balance_mg`...).
    ///
    /// # Errors
    ///
    /// A negative, non-finite or implausibly large figure.
    pub fn validate(&self) -> Result<()> {
        in_range("uncertainty.temperature_k", self.temperature_k, 0.0, 10.0)?;
        in_range("uncertainty.balance_mg", self.balance_mg, 0.0, 10_000.0)?;
        if let Some(f) = self.flask_ml {
            in_range("uncertainty.flask_ml", f, 0.0, 100.0)?;
        }
        if let Some(p) = self.pour_percent {
            in_range("uncertainty.pour_percent", p, 0.0, 50.0)?;
        }
        in_range("uncertainty.stock_percent", self.stock_percent, 0.0, 50.0)?;
        in_range(
            "uncertainty.concentration_percent",
            self.concentration_percent,
            0.0,
            50.0,
        )?;
        in_range("uncertainty.ph_meter", self.ph_meter, 0.0, 2.0)?;
        in_range(
            "uncertainty.activity_base_ph",
            self.activity_base_ph,
            0.0,
            1.0,
        )?;
        in_range(
            "uncertainty.activity_per_ionic",
            self.activity_per_ionic,
            0.0,
            1.0,
        )?;
        Ok(())
    }
}

/// Class A one-mark volumetric flasks, (nominal mL, ± mL): ISO 1042, from memory.
pub const FLASK_CLASS_A: &[(f64, f64)] = &[
    (5.0, 0.025),
    (10.0, 0.025),
    (20.0, 0.04),
    (25.0, 0.04),
    (50.0, 0.06),
    (100.0, 0.10),
    (200.0, 0.15),
    (250.0, 0.15),
    (500.0, 0.25),
    (1000.0, 0.40),
    (2000.0, 0.60),
];

/// Class A one-mark pipettes, (nominal mL, ± mL): ISO 648, from memory.
pub const PIPETTE_CLASS_A: &[(f64, f64)] = &[
    (1.0, 0.008),
    (2.0, 0.010),
    (5.0, 0.015),
    (10.0, 0.020),
    (20.0, 0.030),
    (25.0, 0.030),
    (50.0, 0.050),
    (100.0, 0.080),
];

/// Suggested ± mL of the flask for a final volume: the class A tolerance of
/// the smallest standard flask that holds it; above 2 L, 0.03 % (estimate).
pub fn suggested_flask_ml(volume_ml: f64) -> f64 {
    FLASK_CLASS_A
        .iter()
        .find(|(v, _)| *v >= volume_ml)
        .map_or(volume_ml * 3e-4, |(_, t)| *t)
}

/// Suggested ± mL for a poured volume: the class A pipette of the smallest
/// size that holds it; below 1 mL a micropipette at ±1 %, above 100 mL a
/// measuring cylinder at ±0.5 % (both common practice estimates).
pub fn suggested_pour_ml(volume_ml: f64) -> f64 {
    if volume_ml < 1.0 {
        return 0.01 * volume_ml;
    }
    PIPETTE_CLASS_A
        .iter()
        .find(|(v, _)| *v >= volume_ml)
        .map_or(0.005 * volume_ml, |(_, t)| *t)
}

// ------------------------------------------------------------ results

/// Distribution assumed for an input.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Distribution {
    /// Normal with the standard uncertainty as its standard deviation.
    Normal,
    /// Rectangular of half-width √3·u (a ± figure).
    Rectangular,
}

/// One line of an uncertainty budget.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct BudgetRow {
    /// What the input is (`pK2 of phosphate`, `mass of KH2PO4`...).
    pub input: String,
    /// Standard uncertainty of the input, in `unit`.
    pub u_input: f64,
    /// Unit of the input.
    pub unit: String,
    /// Sensitivity ∂pH/∂input, pH per `unit`.
    pub sensitivity: f64,
    /// Contribution to the standard uncertainty of the pH.
    pub u_ph: f64,
    /// Share of the combined variance (0–1).
    pub share: f64,
    /// Distribution assumed.
    pub distribution: Distribution,
    /// Where the input's uncertainty comes from.
    pub source: String,
}

/// A warning drawn from the budget.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
pub enum UncertaintyWarning {
    /// The pK data alone give a U95 larger than the tolerance window.
    PkExceedsTolerance {
        /// U95 from the pK rows alone, pH.
        u95_pk: f64,
        /// Tolerance half-width, pH.
        tolerance_ph: f64,
    },
    /// The balance's readability is a large part of a small mass.
    SmallMass {
        /// Formula of the ingredient.
        ingredient: String,
        /// Mass to weigh, g.
        grams: f64,
        /// Readability, g.
        readability_g: f64,
        /// Share of the pH variance from this weighing.
        share: f64,
    },
    /// The whole U95 is larger than the tolerance window.
    ExceedsTolerance {
        /// U95, pH.
        u95_ph: f64,
        /// Tolerance half-width, pH.
        tolerance_ph: f64,
    },
}

impl UncertaintyWarning {
    /// Plain text for the page and the command line.
    pub fn text(&self) -> String {
        match self {
            Self::PkExceedsTolerance {
                u95_pk,
                tolerance_ph,
            } => format!(
                "The pK uncertainty alone (±{u95_pk:.3} pH at 95 %) is larger than your \
                 tolerance window (±{tolerance_ph}); no care at the bench can make the \
                 prediction that good: measure the pH and adjust."
            ),
            Self::SmallMass {
                ingredient,
                grams,
                readability_g,
                ..
            } => format!(
                "Your balance readability (±{} mg) is a large share of this small mass \
                 ({} of {ingredient}); weigh more and dilute (make a stock).",
                crate::recipe::sig(readability_g * 1000.0, 2),
                crate::recipe::format_mass(*grams)
            ),
            Self::ExceedsTolerance {
                u95_ph,
                tolerance_ph,
            } => format!(
                "The predicted pH is uncertain by ±{u95_ph:.3} (95 %), more than your \
                 tolerance window (±{tolerance_ph}): measure the pH and adjust."
            ),
        }
    }
}

/// The uncertainty of a predicted pH.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Uncertainty {
    /// Expanded uncertainty U = k·u_c, k = 2 (about 95 %), pH.
    pub u95_ph: f64,
    /// Combined standard uncertainty u_c, pH.
    pub u_ph: f64,
    /// Coverage factor k.
    pub coverage_factor: f64,
    /// Budget rows, largest contribution first.
    pub budget: Vec<BudgetRow>,
    /// Warnings drawn from the budget.
    pub warnings: Vec<UncertaintyWarning>,
    /// The warnings as text, same order.
    pub notes: Vec<String>,
}

// ------------------------------------------------------------ the model

#[derive(Debug, Clone)]
enum Effect {
    /// pK of step `step` of acid `acid` (prepared order), delta in pK.
    Pk { acid: usize, step: usize },
    /// Temperature, delta in K.
    Temperature,
    /// Concentrations of these components and additives scale by 1 + δ/nominal.
    Scale {
        components: Vec<usize>,
        additives: Vec<usize>,
    },
    /// Final volume: every concentration scales by 1/(1 + δ/nominal).
    Volume,
    /// Added to the pH directly.
    Offset,
}

#[derive(Debug, Clone)]
struct Input {
    name: String,
    unit: String,
    u: f64,
    nominal: f64,
    dist: Distribution,
    source: String,
    effect: Effect,
    /// Mass to weigh (g), for the small-mass warning.
    grams: Option<(String, f64)>,
}

struct Model<'a> {
    base: MixtureSpec,
    custom: &'a [AcidSystem],
    inputs: Vec<Input>,
    ph0: f64,
}

impl Model<'_> {
    fn eval(&self, deltas: &[f64]) -> Result<f64> {
        let mut spec = self.base.clone();
        let mut offset = 0.0;
        let mut volume = 1.0;
        let mut pk_shift: Vec<(usize, usize, f64)> = Vec::new();
        for (inp, &d) in self.inputs.iter().zip(deltas) {
            if d == 0.0 {
                continue;
            }
            match &inp.effect {
                Effect::Temperature => spec.temperature_c += d,
                Effect::Offset => offset += d,
                Effect::Volume => volume *= 1.0 + d / inp.nominal,
                Effect::Pk { acid, step } => pk_shift.push((*acid, *step, d)),
                Effect::Scale {
                    components,
                    additives,
                } => {
                    let f = 1.0 + d / inp.nominal;
                    for i in components {
                        if let Some(c) = spec.components.get_mut(*i) {
                            c.conc_m *= f;
                        }
                    }
                    for i in additives {
                        if let Some(a) = spec.additives.get_mut(*i) {
                            a.conc_m *= f;
                        }
                    }
                }
            }
        }
        if volume != 1.0 {
            for c in &mut spec.components {
                c.conc_m /= volume;
            }
            for a in &mut spec.additives {
                a.conc_m /= volume;
            }
        }
        let mut p = prepare(&spec, self.custom)?;
        for (a, s, d) in pk_shift {
            if let Some(k) = p
                .composition
                .acids
                .get_mut(a)
                .and_then(|acid| acid.ka.get_mut(s))
            {
                *k *= 10f64.powf(-d);
            }
        }
        Ok(solve(&p.composition, self.ph0)?.ph + offset)
    }

    /// Central difference ∂pH/∂x_i; one-sided where a side leaves the
    /// data's range (temperature near its limit).
    fn sensitivity(&self, i: usize) -> Result<f64> {
        let Some(inp) = self.inputs.get(i) else {
            return Ok(0.0);
        };
        if matches!(inp.effect, Effect::Offset) {
            return Ok(1.0);
        }
        let h = match inp.effect {
            Effect::Pk { .. } => 1e-3,
            Effect::Temperature => 0.05,
            _ => 1e-4 * inp.nominal,
        };
        let at = |d: f64| {
            let mut v = vec![0.0; self.inputs.len()];
            if let Some(x) = v.get_mut(i) {
                *x = d;
            }
            self.eval(&v)
        };
        match (at(h), at(-h)) {
            (Ok(p), Ok(m)) => Ok((p - m) / (2.0 * h)),
            (Ok(p), Err(_)) => Ok((p - self.ph0) / h),
            (Err(_), Ok(m)) => Ok((self.ph0 - m) / h),
            (Err(e), Err(_)) => Err(e),
        }
    }

    fn budget(&self) -> Result<Vec<BudgetRow>> {
        let mut rows = Vec::with_capacity(self.inputs.len());
        for (i, inp) in self.inputs.iter().enumerate() {
            let c = self.sensitivity(i)?;
            rows.push(BudgetRow {
                input: inp.name.clone(),
                u_input: inp.u,
                unit: inp.unit.clone(),
                sensitivity: c,
                u_ph: (c * inp.u).abs(),
                share: 0.0,
                distribution: inp.dist,
                source: inp.source.clone(),
            });
        }
        Ok(rows)
    }
}

fn finish(
    model: &Model<'_>,
    mut rows: Vec<BudgetRow>,
    tolerance_ph: Option<f64>,
    balance_g: f64,
) -> Uncertainty {
    let var: f64 = rows.iter().map(|r| r.u_ph * r.u_ph).sum();
    for r in &mut rows {
        r.share = if var > 0.0 {
            r.u_ph * r.u_ph / var
        } else {
            0.0
        };
    }
    let u = var.sqrt();
    let mut warnings = Vec::new();
    if let Some(tol) = tolerance_ph {
        let pk_var: f64 = model
            .inputs
            .iter()
            .zip(&rows)
            .filter(|(inp, _)| matches!(inp.effect, Effect::Pk { .. }))
            .map(|(_, r)| r.u_ph * r.u_ph)
            .sum();
        let u95_pk = COVERAGE_FACTOR * pk_var.sqrt();
        if u95_pk > tol {
            warnings.push(UncertaintyWarning::PkExceedsTolerance {
                u95_pk,
                tolerance_ph: tol,
            });
        } else if COVERAGE_FACTOR * u > tol {
            warnings.push(UncertaintyWarning::ExceedsTolerance {
                u95_ph: COVERAGE_FACTOR * u,
                tolerance_ph: tol,
            });
        }
    }
    for (inp, r) in model.inputs.iter().zip(&rows) {
        if let Some((formula, grams)) = &inp.grams {
            // Readability at least 1 % of the mass, or this weighing carries
            // half the pH variance or more.
            if balance_g > 0.0 && (balance_g >= 0.01 * grams || r.share >= 0.5) {
                warnings.push(UncertaintyWarning::SmallMass {
                    ingredient: formula.clone(),
                    grams: *grams,
                    readability_g: balance_g,
                    share: r.share,
                });
            }
        }
    }
    rows.sort_by(|a, b| b.u_ph.total_cmp(&a.u_ph));
    let notes = warnings.iter().map(UncertaintyWarning::text).collect();
    Uncertainty {
        u95_ph: COVERAGE_FACTOR * u,
        u_ph: u,
        coverage_factor: COVERAGE_FACTOR,
        budget: rows,
        warnings,
        notes,
    }
}

/// pK, activity and temperature inputs common to recipes and mixtures.
fn common_inputs(
    spec: &MixtureSpec,
    custom: &[AcidSystem],
    inputs: &UncertaintyInputs,
    ph0: f64,
    ionic: f64,
) -> Result<Vec<Input>> {
    let p = prepare(spec, custom)?;
    let mut out = Vec::new();
    for (a, (acid, sys)) in p.composition.acids.iter().zip(&p.systems).enumerate() {
        for s in 0..acid.n {
            let (u, source) = if custom.iter().any(|c| c.id == sys.id) {
                (
                    DEFAULT_U_PK,
                    "estimate for a user-defined constant".to_string(),
                )
            } else {
                let (u, src) = pk_uncertainty(&sys.id, s + 1);
                (u, src.to_string())
            };
            out.push(Input {
                name: format!("pK{} of {}", s + 1, sys.name),
                unit: "pK".into(),
                u,
                nominal: 0.0,
                dist: Distribution::Normal,
                source,
                effect: Effect::Pk { acid: a, step: s },
                grams: None,
            });
        }
    }
    if inputs.activity_allowance {
        let (u, source) = match spec.activity {
            ActivityModel::Davies => (
                inputs.activity_base_ph + inputs.activity_per_ionic * ionic,
                format!(
                    "estimate: {} + {}·I pH (Davies against pH(S) standards)",
                    inputs.activity_base_ph, inputs.activity_per_ionic
                ),
            ),
            ActivityModel::Ideal => {
                let mut d = spec.clone();
                d.activity = ActivityModel::Davies;
                let davies = prepare(&d, custom)?.solve()?.ph;
                (
                    inputs.activity_base_ph + (davies - ph0).abs(),
                    "estimate: the ideal model's whole activity correction (Davies − ideal) \
                     plus the base allowance"
                        .to_string(),
                )
            }
        };
        out.push(Input {
            name: "activity model".into(),
            unit: "pH".into(),
            u,
            nominal: 0.0,
            dist: Distribution::Normal,
            source,
            effect: Effect::Offset,
            grams: None,
        });
    }
    out.push(Input {
        name: "temperature".into(),
        unit: "K".into(),
        u: inputs.temperature_k / SQRT3,
        nominal: spec.temperature_c,
        dist: Distribution::Rectangular,
        source: format!("±{} K as entered", inputs.temperature_k),
        effect: Effect::Temperature,
        grams: None,
    });
    Ok(out)
}

fn keep_nonzero(v: Vec<Input>) -> Vec<Input> {
    v.into_iter()
        .filter(|i| i.u > 0.0 && i.u.is_finite())
        .collect()
}

/// Formula of each component's form (`None` for a bare system).
fn component_formulas(spec: &MixtureSpec, custom: &[AcidSystem]) -> Result<Vec<Option<String>>> {
    spec.components
        .iter()
        .map(|c| {
            let sys = lookup(&c.system, custom)?;
            Ok(c.form
                .as_ref()
                .and_then(|f| find_form(sys, f))
                .map(|f| f.formula.clone()))
        })
        .collect()
}

fn recipe_model<'a>(
    spec: &RecipeSpec,
    result: &RecipeResult,
    inputs: &UncertaintyInputs,
    custom: &'a [AcidSystem],
) -> Result<Model<'a>> {
    inputs.validate()?;
    in_range("volume_l", spec.volume_l, 1e-6, 1000.0)?;
    let mix = &result.mixture;
    let ph0 = result.equilibrium.ph;
    let mut list = common_inputs(mix, custom, inputs, ph0, result.equilibrium.ionic_strength)?;
    let formulas = component_formulas(mix, custom)?;
    let balance_g = inputs.balance_mg / 1000.0;
    for ing in &result.ingredients {
        let components: Vec<usize> = formulas
            .iter()
            .enumerate()
            .filter(|(_, f)| f.as_deref() == Some(ing.formula.as_str()))
            .map(|(i, _)| i)
            .collect();
        let additives: Vec<usize> = mix
            .additives
            .iter()
            .enumerate()
            .filter(|(_, a)| a.additive.formula() == ing.formula)
            .map(|(i, _)| i)
            .collect();
        let scale = || Effect::Scale {
            components: components.clone(),
            additives: additives.clone(),
        };
        if let Some(g) = ing.grams.filter(|g| *g > 0.0) {
            list.push(Input {
                name: format!("mass of {}", ing.formula),
                unit: "g".into(),
                u: balance_g / SQRT3,
                nominal: g,
                dist: Distribution::Rectangular,
                source: format!("balance readability ±{} mg as entered", inputs.balance_mg),
                effect: scale(),
                grams: Some((ing.formula.clone(), g)),
            });
        } else if let Some(ml) = ing.ml.filter(|m| *m > 0.0) {
            let (tol, src) = match inputs.pour_percent {
                Some(p) => (p / 100.0 * ml, format!("±{p} % as entered")),
                None => (
                    suggested_pour_ml(ml),
                    "class A pipette (ISO 648, from memory), suggested".to_string(),
                ),
            };
            list.push(Input {
                name: format!("volume of {} stock", ing.formula),
                unit: "mL".into(),
                u: tol / SQRT3,
                nominal: ml,
                dist: Distribution::Rectangular,
                source: src,
                effect: scale(),
                grams: None,
            });
            if let Some(m) = ing.stock_m.filter(|m| *m > 0.0) {
                list.push(Input {
                    name: format!("molarity of {} stock", ing.formula),
                    unit: "mol/L".into(),
                    u: inputs.stock_percent / 100.0 * m / SQRT3,
                    nominal: m,
                    dist: Distribution::Rectangular,
                    source: format!("±{} % as entered (estimate)", inputs.stock_percent),
                    effect: scale(),
                    grams: None,
                });
            }
        }
    }
    let v_ml = spec.volume_l * 1000.0;
    let (tol, src) = match inputs.flask_ml {
        Some(t) => (t, format!("±{t} mL as entered")),
        None => (
            suggested_flask_ml(v_ml),
            "class A volumetric flask (ISO 1042, from memory), suggested".to_string(),
        ),
    };
    list.push(Input {
        name: "final volume (flask)".into(),
        unit: "mL".into(),
        u: tol / SQRT3,
        nominal: v_ml,
        dist: Distribution::Rectangular,
        source: src,
        effect: Effect::Volume,
        grams: None,
    });
    Ok(Model {
        base: mix.clone(),
        custom,
        inputs: keep_nonzero(list),
        ph0,
    })
}

/// Uncertainty of a recipe's predicted pH: pK data, activity model,
/// temperature, each weighing, each poured volume and stock molarity, and
/// the flask. Warnings compare it with the recipe's tolerance window.
///
/// # Errors
///
/// Field-named errors for bad [`UncertaintyInputs`]; solver failures.
pub fn recipe_uncertainty(
    spec: &RecipeSpec,
    result: &RecipeResult,
    inputs: &UncertaintyInputs,
    custom: &[AcidSystem],
) -> Result<Uncertainty> {
    let model = recipe_model(spec, result, inputs, custom)?;
    let rows = model.budget()?;
    Ok(finish(
        &model,
        rows,
        Some(spec.tolerance_ph),
        inputs.balance_mg / 1000.0,
    ))
}

fn mixture_model<'a>(
    spec: &MixtureSpec,
    inputs: &UncertaintyInputs,
    custom: &'a [AcidSystem],
) -> Result<Model<'a>> {
    inputs.validate()?;
    let eq = prepare(spec, custom)?.solve()?;
    let mut list = common_inputs(spec, custom, inputs, eq.ph, eq.ionic_strength)?;
    let rel = inputs.concentration_percent / 100.0 / SQRT3;
    for (i, c) in spec.components.iter().enumerate() {
        if c.conc_m > 0.0 {
            list.push(Input {
                name: format!(
                    "concentration of {} ({})",
                    c.form.as_deref().unwrap_or(&c.system),
                    c.system
                ),
                unit: "mol/L".into(),
                u: rel * c.conc_m,
                nominal: c.conc_m,
                dist: Distribution::Rectangular,
                source: format!("±{} % as entered", inputs.concentration_percent),
                effect: Effect::Scale {
                    components: vec![i],
                    additives: vec![],
                },
                grams: None,
            });
        }
    }
    for (i, a) in spec.additives.iter().enumerate() {
        if a.conc_m > 0.0 {
            list.push(Input {
                name: format!("concentration of {}", a.additive.formula()),
                unit: "mol/L".into(),
                u: rel * a.conc_m,
                nominal: a.conc_m,
                dist: Distribution::Rectangular,
                source: format!("±{} % as entered", inputs.concentration_percent),
                effect: Effect::Scale {
                    components: vec![],
                    additives: vec![i],
                },
                grams: None,
            });
        }
    }
    Ok(Model {
        base: spec.clone(),
        custom,
        inputs: keep_nonzero(list),
        ph0: eq.ph,
    })
}

/// Uncertainty of a mixture's (flask's) pH: pK data, activity model,
/// temperature and each entered concentration. With a `tolerance_ph` the
/// same warnings as a recipe's are drawn.
///
/// # Errors
///
/// Field-named errors for bad inputs; solver failures.
pub fn mixture_uncertainty(
    spec: &MixtureSpec,
    inputs: &UncertaintyInputs,
    custom: &[AcidSystem],
    tolerance_ph: Option<f64>,
) -> Result<Uncertainty> {
    let model = mixture_model(spec, inputs, custom)?;
    let rows = model.budget()?;
    Ok(finish(&model, rows, tolerance_ph, 0.0))
}

// ------------------------------------------------------------ Monte Carlo

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
    out.sort_by(f64::total_cmp);
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

/// Monte Carlo propagation of the same inputs as [`recipe_uncertainty`]:
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

/// Monte Carlo propagation of the same inputs as [`mixture_uncertainty`].
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

// ------------------------------------------------------------ field readings

/// One line of a species fraction's budget.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct FractionBudgetRow {
    /// Input.
    pub input: String,
    /// Standard uncertainty of the input, in `unit`.
    pub u_input: f64,
    /// Unit of the input.
    pub unit: String,
    /// ∂fraction/∂input, per `unit`.
    pub sensitivity: f64,
    /// Contribution to the standard uncertainty of the fraction.
    pub u_fraction: f64,
    /// Share of the combined variance (0–1).
    pub share: f64,
    /// Where the input's uncertainty comes from.
    pub source: String,
}

/// Uncertainty of one species fraction of a field reading.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct SpeciesUncertainty {
    /// Species name.
    pub name: String,
    /// Fraction.
    pub fraction: f64,
    /// Expanded uncertainty of the fraction, k = 2.
    pub u95_fraction: f64,
    /// Budget, largest first.
    pub budget: Vec<FractionBudgetRow>,
}

/// Uncertainty of a field reading's fractions.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct FieldUncertainty {
    /// One entry per species, most protonated first.
    pub species: Vec<SpeciesUncertainty>,
}

/// Uncertainty of each species fraction of a field reading, from the pH
/// meter, the temperature and the pK data (first order, k = 2).
///
/// pH and temperature sensitivities are central differences through
/// [`field_reading`] itself; pK sensitivities shift the constant in the
/// same engine at the reading's ionic strength.
///
/// # Errors
///
/// Bad inputs; the reading's own errors.
pub fn field_uncertainty(
    spec: &FieldSpec,
    result: &FieldResult,
    inputs: &UncertaintyInputs,
    custom: &[AcidSystem],
) -> Result<FieldUncertainty> {
    inputs.validate()?;
    let n = result.species.len();
    let fractions =
        |r: &FieldResult| -> Vec<f64> { r.species.iter().map(|s| s.fraction).collect() };
    let diff = |up: Result<FieldResult>, down: Result<FieldResult>, h: f64| -> Result<Vec<f64>> {
        let f0 = fractions(result);
        Ok(match (up, down) {
            (Ok(u), Ok(d)) => fractions(&u)
                .iter()
                .zip(fractions(&d))
                .map(|(a, b)| (a - b) / (2.0 * h))
                .collect(),
            (Ok(u), Err(_)) => fractions(&u)
                .iter()
                .zip(&f0)
                .map(|(a, b)| (a - b) / h)
                .collect(),
            (Err(_), Ok(d)) => f0
                .iter()
                .zip(fractions(&d))
                .map(|(a, b)| (a - b) / h)
                .collect(),
            (Err(e), Err(_)) => return Err(e),
        })
    };
    // (name, unit, u, source, d fraction / d input per species)
    let mut rows: Vec<(String, String, f64, String, Vec<f64>)> = Vec::new();
    if inputs.ph_meter > 0.0 {
        let h = 1e-3;
        let at = |d: f64| {
            let mut s = spec.clone();
            s.ph += d;
            field_reading(&s, custom)
        };
        rows.push((
            "measured pH".into(),
            "pH".into(),
            inputs.ph_meter / SQRT3,
            format!(
                "pH meter ±{} as entered (common practice 0.02)",
                inputs.ph_meter
            ),
            diff(at(h), at(-h), h)?,
        ));
    }
    if inputs.temperature_k > 0.0 {
        let h = 0.05;
        let at = |d: f64| {
            let mut s = spec.clone();
            s.temperature_c += d;
            field_reading(&s, custom)
        };
        rows.push((
            "temperature".into(),
            "K".into(),
            inputs.temperature_k / SQRT3,
            format!("±{} K as entered", inputs.temperature_k),
            diff(at(h), at(-h), h)?,
        ));
    }
    // pK: shift each constant in the engine at the reading's ionic strength.
    let sys = lookup(&spec.system, custom)?;
    let is_custom = custom.iter().any(|c| c.id == sys.id);
    let mix = MixtureSpec {
        temperature_c: spec.temperature_c,
        activity: ActivityModel::Davies,
        components: vec![crate::mixture::ComponentSpec {
            system: sys.id.clone(),
            form: None,
            conc_m: 1.0,
        }],
        additives: vec![],
    };
    let p = prepare(&mix, custom)?;
    let steps = p.composition.acids.first().map_or(0, |a| a.n);
    for s in 0..steps {
        let (u, src) = if is_custom {
            (DEFAULT_U_PK, "estimate for a user-defined constant")
        } else {
            pk_uncertainty(&sys.id, s + 1)
        };
        let h = 1e-3;
        let at = |d: f64| -> Vec<f64> {
            let mut q = p.clone();
            if let Some(k) = q
                .composition
                .acids
                .first_mut()
                .and_then(|a| a.ka.get_mut(s))
            {
                *k *= 10f64.powf(-d);
            }
            q.speciate(spec.ph, result.ionic_strength)
                .first()
                .map(|x| x.species.iter().map(|r| r.fraction).collect())
                .unwrap_or_default()
        };
        let (up, down) = (at(h), at(-h));
        let d: Vec<f64> = up
            .iter()
            .zip(&down)
            .map(|(a, b)| (a - b) / (2.0 * h))
            .collect();
        rows.push((
            format!("pK{} of {}", s + 1, sys.name),
            "pK".into(),
            u,
            src.to_string(),
            d,
        ));
    }
    let mut species = Vec::with_capacity(n);
    for (j, sp) in result.species.iter().enumerate() {
        let mut budget: Vec<FractionBudgetRow> = rows
            .iter()
            .map(|(name, unit, u, src, d)| {
                let c = d.get(j).copied().unwrap_or(0.0);
                FractionBudgetRow {
                    input: name.clone(),
                    u_input: *u,
                    unit: unit.clone(),
                    sensitivity: c,
                    u_fraction: (c * u).abs(),
                    share: 0.0,
                    source: src.clone(),
                }
            })
            .collect();
        let var: f64 = budget.iter().map(|r| r.u_fraction * r.u_fraction).sum();
        for r in &mut budget {
            r.share = if var > 0.0 {
                r.u_fraction * r.u_fraction / var
            } else {
                0.0
            };
        }
        budget.sort_by(|a, b| b.u_fraction.total_cmp(&a.u_fraction));
        species.push(SpeciesUncertainty {
            name: sp.name.clone(),
            fraction: sp.fraction,
            u95_fraction: COVERAGE_FACTOR * var.sqrt(),
            budget,
        });
    }
    Ok(FieldUncertainty { species })
}

// ------------------------------------------------------------ whole design

/// Uncertainty of every part of a design that has one; each part is a
/// result or the error message for that part.
#[derive(Debug, Clone, Serialize)]
pub struct DesignUncertainty {
    /// Inputs used.
    pub inputs: UncertaintyInputs,
    /// Recipe pH.
    pub recipe: std::result::Result<Uncertainty, String>,
    /// Mixture (flask) pH, with the recipe's tolerance window for warnings.
    pub mixture: std::result::Result<Uncertainty, String>,
    /// Field reading fractions.
    pub field: std::result::Result<FieldUncertainty, String>,
}

/// Uncertainty of the recipe, mixture and field reading of a design.
pub fn design_uncertainty(
    d: &crate::design::Design,
    inputs: &UncertaintyInputs,
) -> DesignUncertainty {
    let custom = &d.custom_systems;
    let s = |e: SolverError| e.to_string();
    let recipe = crate::recipe::solve_recipe(&d.recipe, custom)
        .and_then(|r| recipe_uncertainty(&d.recipe, &r, inputs, custom));
    let mixture = mixture_uncertainty(&d.mixture, inputs, custom, Some(d.recipe.tolerance_ph));
    let field = field_reading(&d.field, custom)
        .and_then(|r| field_uncertainty(&d.field, &r, inputs, custom));
    DesignUncertainty {
        inputs: inputs.clone(),
        recipe: recipe.map_err(s),
        mixture: mixture.map_err(s),
        field: field.map_err(s),
    }
}

/// Plain-text budget of one pH uncertainty (for the command line).
pub fn budget_text(title: &str, u: &Uncertainty) -> String {
    let mut out = format!(
        "{title}: U95 = ±{:.4} pH (k = 2, u_c = {:.4})\n",
        u.u95_ph, u.u_ph
    );
    for r in &u.budget {
        out.push_str(&format!(
            "  {:<34} u = {:<10} {:<6} u(pH) = {:.5}  {:>5.1} %\n",
            r.input,
            crate::recipe::sig(r.u_input, 3),
            r.unit,
            r.u_ph,
            r.share * 100.0
        ));
    }
    for n in &u.notes {
        out.push_str(&format!("  ! {n}\n"));
    }
    out
}

/// The `bufferwright uncertainty` command without its IO: the arguments
/// after `uncertainty`, and a reader for files (`-` is stdin). Returns
/// (text for stdout, text for stderr, exit code: 0 ok, 1 bad document or
/// inputs, 2 usage).
///
/// ```text
/// bufferwright uncertainty [--table] [--inputs FILE] [FILE|-]
/// ```
///
/// `--inputs` names a JSON file of [`UncertaintyInputs`] (every key
/// optional); without it the design's own `uncertainty` key is used.
pub fn uncertainty_command(
    args: &[String],
    read: &dyn Fn(&str) -> std::result::Result<String, String>,
) -> (String, String, u8) {
    const USAGE: &str = "usage: bufferwright uncertainty [--table] [--inputs FILE] [FILE|-]\n";
    let mut table = false;
    let mut inputs_path: Option<&str> = None;
    let mut path: Option<&str> = None;
    let mut it = args.iter();
    while let Some(a) = it.next() {
        match a.as_str() {
            "--table" => table = true,
            "--inputs" => match it.next() {
                Some(p) => inputs_path = Some(p),
                None => return (String::new(), format!("--inputs needs a file\n{USAGE}"), 2),
            },
            o if o.starts_with("--") => {
                return (String::new(), format!("unknown option {o}\n{USAGE}"), 2)
            }
            p => {
                if path.is_some() {
                    return (String::new(), format!("only one document\n{USAGE}"), 2);
                }
                path = Some(p);
            }
        }
    }
    let text = match read(path.unwrap_or("-")) {
        Ok(t) => t,
        Err(e) => return (String::new(), format!("{e}\n"), 1),
    };
    let design = match crate::design::parse_design(&text) {
        Ok(d) => d,
        Err(e) => return (String::new(), format!("invalid design: {e}\n"), 1),
    };
    let inputs = match inputs_path {
        None => design.uncertainty.clone(),
        Some(p) => {
            let parsed = read(p).and_then(|t| {
                serde_json::from_str::<UncertaintyInputs>(&t).map_err(|e| format!("{p}: {e}"))
            });
            match parsed {
                Ok(i) => i,
                Err(e) => return (String::new(), format!("invalid inputs: {e}\n"), 1),
            }
        }
    };
    if let Err(e) = inputs.validate() {
        return (String::new(), format!("invalid inputs: {e}\n"), 1);
    }
    let rep = design_uncertainty(&design, &inputs);
    if table {
        let mut out = String::new();
        for (title, part) in [("Recipe", &rep.recipe), ("Mixture", &rep.mixture)] {
            match part {
                Ok(u) => out.push_str(&budget_text(title, u)),
                Err(e) => out.push_str(&format!("{title}: error: {e}\n")),
            }
        }
        match &rep.field {
            Ok(f) => {
                for sp in &f.species {
                    out.push_str(&format!(
                        "Field {}: fraction {:.4} ± {:.4} (k = 2)\n",
                        sp.name, sp.fraction, sp.u95_fraction
                    ));
                }
            }
            Err(e) => out.push_str(&format!("Field: error: {e}\n")),
        }
        (out, String::new(), 0)
    } else {
        match serde_json::to_string_pretty(&rep) {
            Ok(s) => (s + "\n", String::new(), 0),
            Err(e) => (String::new(), format!("cannot serialise: {e}\n"), 1),
        }
    }
}
