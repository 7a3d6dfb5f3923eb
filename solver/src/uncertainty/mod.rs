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
//! (checked in `tests/it/uncertainty.rs`); central differences are used
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
mod terms;

pub use budget::{mixture_uncertainty, recipe_uncertainty};
pub use field::{field_uncertainty, FieldUncertainty, FractionBudgetRow, SpeciesUncertainty};
pub use inputs::{
    suggested_flask_ml, suggested_pour_ml, UncertaintyInputs, FLASK_CLASS_A, PIPETTE_CLASS_A,
};
pub use monte_carlo::{mixture_monte_carlo, recipe_monte_carlo, MonteCarlo};
pub use pk::{pk_uncertainty, PkUncertainty, DEFAULT_U_PK, PK_UNCERTAINTY};
pub use terms::{BudgetRow, Distribution, Uncertainty, UncertaintyWarning, COVERAGE_FACTOR};
