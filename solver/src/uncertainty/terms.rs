//! The words of an uncertainty budget: the coverage factor, the distribution of an input,
//! a budget row, the warnings drawn from a budget, and the uncertainty of a predicted pH.

use serde::{Deserialize, Serialize};

/// Coverage factor for the expanded uncertainty (about 95 %).
pub const COVERAGE_FACTOR: f64 = 2.0;

pub(crate) const SQRT3: f64 = 1.732_050_807_568_877_2;

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
                crate::fmt::sig(readability_g * 1000.0, 2),
                crate::fmt::format_mass(*grams)
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
