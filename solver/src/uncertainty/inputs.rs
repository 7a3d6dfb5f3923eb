//! What the user knows about the uncertainty of their inputs: the ± figures, their defaults and validation, and suggested glassware tolerances.

use crate::error::Result;
use crate::limits;
use serde::{Deserialize, Serialize};

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
        limits::U_TEMPERATURE_K.check_path(self.temperature_k)?;
        limits::U_BALANCE_MG.check_path(self.balance_mg)?;
        if let Some(f) = self.flask_ml {
            limits::U_FLASK_ML.check_path(f)?;
        }
        if let Some(p) = self.pour_percent {
            limits::U_POUR_PERCENT.check_path(p)?;
        }
        limits::U_STOCK_PERCENT.check_path(self.stock_percent)?;
        limits::U_CONCENTRATION_PERCENT.check_path(self.concentration_percent)?;
        limits::U_PH_METER.check_path(self.ph_meter)?;
        limits::U_ACTIVITY_BASE_PH.check_path(self.activity_base_ph)?;
        limits::U_ACTIVITY_PER_IONIC.check_path(self.activity_per_ionic)?;
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
