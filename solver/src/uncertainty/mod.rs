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

mod budget;
mod field;
mod inputs;
mod monte_carlo;
mod pk;

pub use budget::{mixture_uncertainty, recipe_uncertainty};
pub use field::{field_uncertainty, FieldUncertainty, FractionBudgetRow, SpeciesUncertainty};
pub use inputs::{
    suggested_flask_ml, suggested_pour_ml, UncertaintyInputs, FLASK_CLASS_A, PIPETTE_CLASS_A,
};
pub use monte_carlo::{mixture_monte_carlo, recipe_monte_carlo, MonteCarlo};
pub use pk::{pk_uncertainty, PkUncertainty, DEFAULT_U_PK, PK_UNCERTAINTY};

use serde::{Deserialize, Serialize};

/// Coverage factor for the expanded uncertainty (about 95 %).
pub const COVERAGE_FACTOR: f64 = 2.0;

const SQRT3: f64 = 1.732_050_807_568_877_2;

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
