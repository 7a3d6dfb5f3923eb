//! What a recipe asks for (method, target, bench options) and what it returns (ingredients, meter reading, concentrate, warnings).

use crate::equilibrium::activity::{ActivityModel, DAVIES_LIMIT};
use crate::equilibrium::Equilibrium;
use crate::error::Result;
use crate::fmt::{sig, sig_trim};
use crate::mixture::{Additive, AdditiveSpec, MixtureSpec, Tolerance};
use crate::system::formula::molar_mass;
use serde::{Deserialize, Serialize};

/// How the buffer is made.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
#[serde(deny_unknown_fields)]
pub enum Method {
    /// Weigh two forms of the same system (for example NaH₂PO₄·H₂O and Na₂HPO₄·7H₂O).
    TwoForms {
        /// The more protonated form.
        acid_form: String,
        /// The less protonated form.
        base_form: String,
    },
    /// Weigh one form and titrate to the target with a strong acid or base stock.
    Titrate {
        /// The form weighed.
        form: String,
        /// Titrant (HCl, NaOH or KOH).
        titrant: Additive,
        /// Titrant stock molarity, mol/L.
        titrant_m: f64,
    },
    /// Mix two stock solutions, then water to volume.
    TwoStocks {
        /// Form in the acid stock.
        acid_form: String,
        /// Acid stock molarity (formula units), mol/L.
        acid_stock_m: f64,
        /// Form in the base stock.
        base_form: String,
        /// Base stock molarity (formula units), mol/L.
        base_stock_m: f64,
    },
}

/// Everything the technician enters for a recipe.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RecipeSpec {
    /// System id.
    pub system: String,
    /// Target pH at the working temperature.
    pub target_ph: f64,
    /// Working temperature, °C.
    pub temperature_c: f64,
    /// Total buffer concentration (system units), mol/L.
    pub total_conc_m: f64,
    /// Final volume, L.
    pub volume_l: f64,
    /// Inert salts (NaCl, KCl), each at most once; empty for none.
    #[serde(default)]
    pub salts: Vec<AdditiveSpec>,
    /// Activity model.
    #[serde(default)]
    pub activity: ActivityModel,
    /// Preparation method.
    pub method: Method,
    /// Tolerance window half-width, pH units.
    #[serde(default = "default_tolerance")]
    pub tolerance_ph: f64,
    /// Temperature at which the buffer is made and its pH read on the meter,
    /// °C; absent means the working temperature. Must lie in the system's
    /// data range. The amounts do not change: the target stays the pH at the
    /// working temperature; the result says what the meter reads here.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub prepare_temperature_c: Option<f64>,
    /// Make an N-fold concentrate (1 to 50; 1 = the working buffer itself):
    /// N times every amount in the same final volume, so that diluting it
    /// N-fold with water gives the target at the working temperature.
    #[serde(default = "default_factor", skip_serializing_if = "is_one")]
    pub concentrate_factor: f64,
    /// The CO₂ atmosphere the finished solution equilibrates with (a
    /// carbonate recipe for an incubator): the amount of the weighed
    /// carbonate form becomes the unknown. Absent: the closed recipe.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub atmosphere: Option<crate::equilibrium::gas::Atmosphere>,
    /// Temperature the solution (stock or concentrate) is kept at, °C, 0–60;
    /// absent means it is kept where it is made. Its salts are checked
    /// against their solubility there ([`crate::recipe::solubility`]).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub store_temperature_c: Option<f64>,
}

pub(crate) fn default_tolerance() -> f64 {
    0.05
}

pub(crate) fn default_factor() -> f64 {
    1.0
}

pub(crate) fn is_one(v: &f64) -> bool {
    *v == 1.0
}

/// Highest concentration of anything in a concentrate, mol/L: a
/// solubility-like sanity bound, not a solubility.
pub const CONCENTRATE_MAX_M: f64 = 5.0;

/// Highest concentrate factor.
pub const CONCENTRATE_FACTOR_MAX: f64 = crate::limits::CONCENTRATE_FACTOR.max;

/// A fact of the trade (common practice) to show beside a meter reading.
pub const METER_NOTE: &str = "A pH meter's automatic temperature compensation corrects the electrode's slope for temperature, not the buffer's chemistry: the buffer's own pH still changes with temperature, so compare the reading with the pH given for the temperature it is read at.";

/// What the meter shows while the buffer is made.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct MeterReading {
    /// Preparation temperature, °C (the working temperature when none was given).
    pub temperature_c: f64,
    /// pH of the solution being made (the concentrate, when one is made) at
    /// that temperature: same total composition, pK(T), Kw(T) and
    /// Debye–Hückel A(T), ionic strength solved again.
    pub ph: f64,
    /// Which solution the reading is of: the buffer as made, the
    /// concentrate, or a portion of the concentrate diluted to working
    /// strength when the concentrate's own reading cannot be predicted.
    /// Absent in output saved before it existed: read as the buffer.
    #[serde(default)]
    pub solution: MeterSolution,
}

/// The solution a [`MeterReading`] is of.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum MeterSolution {
    /// The buffer as made (no concentrate).
    #[default]
    WorkingBuffer,
    /// The concentrate itself, within the activity model's range.
    Concentrate,
    /// A portion of the concentrate diluted N-fold with water: the
    /// concentrate's ionic strength is past the activity model's range, so
    /// its own reading is not predicted and the check is made on a dilution.
    DilutedPortion,
}

/// The concentrate itself, before dilution.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct ConcentrateResult {
    /// Concentrate factor N.
    pub factor: f64,
    /// Predicted pH of the concentrate at the working temperature; `None`
    /// (JSON `null`) when its ionic strength is past the activity model's
    /// range, where no pH is predicted rather than a wrong one.
    pub ph: Option<f64>,
    /// Ionic strength of the concentrate, mol/L.
    pub ionic_strength: f64,
}

/// One thing to weigh or pour.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Ingredient {
    /// Formula as on the label.
    pub formula: String,
    /// Display name.
    pub name: String,
    /// Amount, mol (in the final volume).
    pub mol: f64,
    /// Molar mass, g/mol, when it is weighed.
    pub molar_mass: Option<f64>,
    /// Mass to weigh, g.
    pub grams: Option<f64>,
    /// Volume to pour, mL.
    pub ml: Option<f64>,
    /// Stock molarity, when it is poured from a stock.
    pub stock_m: Option<f64>,
}

/// Conditions worth a warning on a recipe.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
pub enum RecipeWarning {
    /// The target is far from every pK: little buffer capacity.
    FarFromPk {
        /// Distance to the nearest pK, pH units.
        distance: f64,
        /// That pK.
        pk: f64,
    },
    /// Ionic strength past the Davies model's range.
    IonicStrengthBeyondModel {
        /// Ionic strength, mol/L.
        ionic_strength: f64,
    },
    /// The Henderson–Hasselbalch estimate misses the target noticeably.
    EstimateOff {
        /// Actual pH of the estimate minus the target.
        difference: f64,
    },
    /// The concentrate's ionic strength is past the Davies model's range:
    /// its own pH is not predicted; the meter check is made on a portion
    /// diluted to working strength, whose pH is exact.
    ConcentrateBeyondModel {
        /// Concentrate factor.
        factor: f64,
        /// Ionic strength of the concentrate, mol/L.
        ionic_strength: f64,
    },
    /// A salt of the solution made needs about as much as (or more than)
    /// dissolves at the temperature it is made or kept at (handbook
    /// solubility, from memory: see [`crate::recipe::solubility`]).
    Solubility {
        /// Formula weighed (`Na2HPO4·7H2O`).
        formula: String,
        /// Its concentration in the solution made, mol/L.
        conc_m: f64,
        /// g/L of the anhydrous salt needed.
        needed_g_l: f64,
        /// Estimated g/L of the anhydrous salt that dissolves there.
        soluble_g_l: f64,
        /// The temperature, °C.
        temperature_c: f64,
        /// `true` at the storage temperature, `false` where it is made.
        stored: bool,
        /// Lowest temperature of the table at which it would dissolve, °C.
        dissolves_above_c: Option<f64>,
    },
}

impl RecipeWarning {
    /// Plain-language text of the warning, for pages and reports.
    pub fn message(&self) -> String {
        match self {
            Self::FarFromPk { distance, pk } => format!(
                "The target is {} pH units from the nearest pK ({pk:.2}): this buffer has little capacity there.",
                sig(*distance, 2)
            ),
            Self::IonicStrengthBeyondModel { ionic_strength } => format!(
                "Ionic strength {} M is beyond the range the Davies equation is trusted in (about {DAVIES_LIMIT} M): treat the predicted pH as approximate and check with a meter.",
                sig(*ionic_strength, 3)
            ),
            Self::EstimateOff { difference } => format!(
                "The Henderson–Hasselbalch estimate would miss the target by {difference:+.2} pH: weigh the exact amounts."
            ),
            Self::ConcentrateBeyondModel {
                factor,
                ionic_strength,
            } => format!(
                "The {}× concentrate's ionic strength, {} M, is beyond the range the Davies equation is trusted in (about {DAVIES_LIMIT} M): its own pH is not predicted, so do not adjust the concentrate by the meter; check a portion diluted to working strength instead (its pH is exact).",
                sig_trim(*factor, 3),
                sig(*ionic_strength, 3)
            ),
            Self::Solubility {
                formula,
                conc_m,
                needed_g_l,
                soluble_g_l,
                temperature_c,
                stored,
                dissolves_above_c,
            } => {
                let base = crate::system::formula::anhydrous(formula);
                let advice = match (stored, dissolves_above_c) {
                    (true, _) => "store it warmer (at room temperature) or make a weaker stock".to_string(),
                    (false, Some(t)) => format!(
                        "it dissolves only above about {} °C and may crystallise as it cools: make a weaker stock or warm it and keep it warm",
                        sig_trim(*t, 2)
                    ),
                    (false, None) => "make a weaker stock".to_string(),
                };
                format!(
                    "About {} M {formula} is needed ({} g/L as {base}); only about {} g/L of {base} dissolves at {} °C{} (handbook solubility, approximate): {advice}.",
                    sig(*conc_m, 2),
                    sig(*needed_g_l, 3),
                    sig(*soluble_g_l, 2),
                    sig_trim(*temperature_c, 3),
                    if *stored { ", where it is kept" } else { ", where it is made" },
                )
            }
        }
    }
}

/// The Henderson–Hasselbalch estimate beside the exact recipe.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Estimate {
    /// The pK used (thermodynamic, at the working temperature).
    pub pk: f64,
    /// Base-species share predicted by the estimate.
    pub base_fraction: f64,
    /// What the estimate says to weigh and pour.
    pub ingredients: Vec<Ingredient>,
    /// pH the estimate's recipe really gives (exact solve), if it can be made.
    pub actual_ph: Option<f64>,
}

/// A solved recipe.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct RecipeResult {
    /// What to weigh and pour.
    pub ingredients: Vec<Ingredient>,
    /// Step-by-step instructions.
    pub steps: Vec<String>,
    /// Forward solve of the finished recipe.
    pub equilibrium: Equilibrium,
    /// Tolerance budget around the target.
    pub tolerance: Tolerance,
    /// pK values of the system at the temperature.
    pub pks: Vec<f64>,
    /// Which step (1-based) buffers the target.
    pub step: usize,
    /// The Henderson–Hasselbalch estimate.
    pub estimate: Estimate,
    /// Warnings.
    pub warnings: Vec<RecipeWarning>,
    /// The finished solution as a mixture (for plots and what-ifs); with a
    /// concentrate, the diluted working buffer.
    pub mixture: MixtureSpec,
    /// What the meter reads while the buffer is made.
    pub meter: MeterReading,
    /// The concentrate, when one is made (factor above 1).
    pub concentrate: Option<ConcentrateResult>,
}

/// One weighed ingredient: `mol` of `formula`, its mass from the formula's molar mass.
pub(crate) fn weigh(formula: &str, name: &str, mol: f64) -> Result<Ingredient> {
    let mm = molar_mass(formula)?;
    Ok(Ingredient {
        formula: formula.into(),
        name: name.into(),
        mol,
        molar_mass: Some(mm),
        grams: Some(mol * mm),
        ml: None,
        stock_m: None,
    })
}

/// The name of a titrant or salt in the steps and the ingredient list.
pub(crate) fn titrant_name(a: Additive) -> &'static str {
    match a {
        Additive::Hcl => "hydrochloric acid",
        Additive::Naoh => "sodium hydroxide",
        Additive::Koh => "potassium hydroxide",
        Additive::Nacl => "sodium chloride",
        Additive::Kcl => "potassium chloride",
    }
}
