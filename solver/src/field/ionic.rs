//! Ionic strength of a field sample: given, zero, or estimated from conductivity, TDS or
//! practical salinity.
//!
//! Common practice rules of thumb for the ionic strength of natural waters:
//!
//! ```text
//! I ≈ 1.6×10⁻⁵ × specific conductance (µS/cm)     (Russell 1976)
//! I ≈ 2.5×10⁻⁵ × TDS (mg/L)                       (Langelier 1936)
//! ```
//!
//! From practical salinity S (Dickson, Sabine & Christian 2007, *Guide to
//! Best Practices for Ocean CO₂ Measurements*, PICES Special Publication 3,
//! chapter 5; mol/kg-H₂O, used here as mol/L, a difference of a few per cent
//! that is small beside the activity model's own error at these strengths):
//!
//! ```text
//! I = 19.924 S / (1000 − 1.005 S)
//! ```
//!

use crate::error::Result;
use crate::limits;
use serde::{Deserialize, Serialize};

/// Where the ionic strength of a field sample comes from.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(tag = "kind", rename_all = "snake_case", deny_unknown_fields)]
pub enum IonicSource {
    /// Take I = 0 (infinite dilution).
    Zero,
    /// A known ionic strength, mol/L.
    Direct {
        /// Ionic strength, mol/L.
        ionic_strength: f64,
    },
    /// Specific conductance, µS/cm (Russell 1976 rule of thumb).
    Conductivity {
        /// µS/cm.
        us_cm: f64,
    },
    /// Total dissolved solids, mg/L (Langelier 1936 rule of thumb).
    Tds {
        /// mg/L.
        mg_l: f64,
    },
    /// Practical salinity (PSS-78, numerically ‰), Dickson, Sabine &
    /// Christian (2007): I = 19.924 S / (1000 − 1.005 S).
    Salinity {
        /// Practical salinity, 0–50.
        psu: f64,
    },
}

/// Ionic strength from practical salinity, Dickson, Sabine & Christian
/// (2007) ch. 5: `I = 19.924 S / (1000 − 1.005 S)` (mol/kg-H₂O). No range
/// check (see [`ionic_from`]).
///
/// # Example
///
/// ```
/// # use solver::field::ionic_from_salinity;
/// assert!((ionic_from_salinity(35.0) - 0.7228).abs() < 1e-4);
/// ```
pub fn ionic_from_salinity(psu: f64) -> f64 {
    19.924 * psu / (1000.0 - 1.005 * psu)
}

/// Ionic strength from a field source (common-practice rules of thumb).
///
/// # Errors
///
/// Negative or non-finite readings.
pub fn ionic_from(source: &IonicSource) -> Result<f64> {
    Ok(match source {
        IonicSource::Zero => 0.0,
        IonicSource::Direct { ionic_strength } => limits::IONIC_STRENGTH.check(*ionic_strength)?,
        IonicSource::Conductivity { us_cm } => 1.6e-5 * limits::CONDUCTIVITY_US_CM.check(*us_cm)?,
        IonicSource::Tds { mg_l } => 2.5e-5 * limits::TDS_MG_L.check(*mg_l)?,
        IonicSource::Salinity { psu } => ionic_from_salinity(limits::SALINITY_PSU.check(*psu)?),
    })
}
