//! The gas over a solution: Henry's law for CO₂, the water vapour of a humidified gas, the `atmosphere` key.
//!
//! # Model
//!
//! A solution that has equilibrated with a gas of known CO₂ holds a fixed
//! dissolved CO₂ (Henry's law); the bicarbonate and carbonate then follow
//! from the exact charge balance ([`super::open`]), so the total
//! carbon is an answer, not an input:
//!
//! ```text
//! [CO₂(aq)] = K₀(T, S) · p(CO₂)                          (mol/L)
//! p(CO₂)    = x(CO₂) · (P − p_w(T, S))   for a percentage of a humidified gas
//! p(CO₂)    = the figure given           for a partial pressure in µatm
//! ```
//!
//! * K₀: Weiss, R. F. (1974) Mar. Chem. 2, 203–215, volumetric form
//!   (mol L⁻¹ atm⁻¹), fitted −1 to 40 °C, S 0 to 40:
//!   `ln K₀ = A₁ + A₂(100/T) + A₃ ln(T/100) + S[B₁ + B₂(T/100) + B₃(T/100)²]`,
//!   A₁ = −58.0931, A₂ = 90.5069, A₃ = 22.2940, B₁ = 0.027766,
//!   B₂ = −0.025888, B₃ = 0.0050578 (coefficients as widely quoted; checked
//!   in `solver/tests/it/atmosphere.rs` against measured solubilities).
//! * p_w: water vapour over the solution, Weiss, R. F. & Price, B. A. (1980)
//!   Mar. Chem. 8, 347–359:
//!   `ln(p_w/atm) = 24.4543 − 67.4509(100/T) − 4.8489 ln(T/100) − 0.000544 S`.
//!   An incubator's gas is humidified, so a percentage (of the dry gas, as
//!   a gas controller sets it) is a share of the pressure left beside the
//!   water vapour at the working temperature.
//! * The gas is ideal: the fugacity of CO₂ is taken as its partial pressure
//!   (the non-ideality is about 0.3 % at 1 atm, Weiss 1974; not applied).
//! * S: the flask and the recipe use S = 0 (fresh-water K₀; the salting-out
//!   by the solution's own salts, about 3 % of K₀ in a 150 mM saline, is
//!   not counted); a field reading given as a salinity uses that salinity.
//!
//! The carbonate system must be present in the solution (even at 0 mol/L,
//! for water open to the air): an atmosphere on a solution with no
//! carbonate is refused rather than adding carbonate silently.

use super::acid::Acid;
use crate::error::{finite, Result, SolverError};
use crate::water::KELVIN;
use serde::{Deserialize, Serialize};

/// Standard atmosphere, kPa: the default total pressure.
pub const STANDARD_KPA: f64 = 101.325;
/// Lowest total pressure accepted, kPa (about 5 500 m altitude is 50 kPa; [`crate::limits::PRESSURE_KPA`]).
pub const PRESSURE_MIN_KPA: f64 = crate::limits::PRESSURE_KPA.min;
/// Highest total pressure accepted, kPa (ideal-gas Henry's law beyond a few atm is rough).
pub const PRESSURE_MAX_KPA: f64 = crate::limits::PRESSURE_KPA.max;
/// Lowest temperature of the gas constants, °C (Weiss 1974 fitted from −1 °C; the water model starts at 0).
pub const T_MIN_C: f64 = crate::limits::GAS_TEMPERATURE_C.min;
/// Highest temperature of the gas constants, °C (the end of the Weiss 1974 fit).
pub const T_MAX_C: f64 = crate::limits::GAS_TEMPERATURE_C.max;
/// Room air, µatm of CO₂ (common practice: about 420 µatm in the mid-2020s;
/// indoor air is often higher, so the user's figure wins).
pub const ROOM_AIR_UATM: f64 = 420.0;
/// Id of the carbonate system in the library.
pub const CARBONATE: &str = "carbonate";

/// A gas over the solution: its CO₂ as a percentage of the (dry) gas or as a
/// partial pressure, and the total pressure.
///
/// Exactly one of `co2_percent` and `co2_uatm` is given.
#[derive(Debug, Clone, Copy, PartialEq, Default, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Atmosphere {
    /// CO₂, % of the dry gas (a gas controller's setting), 0 to 100; the gas
    /// over the solution is taken as saturated with water vapour.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub co2_percent: Option<f64>,
    /// CO₂ partial pressure, µatm (room air is about [`ROOM_AIR_UATM`]).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub co2_uatm: Option<f64>,
    /// Total pressure, kPa; absent means [`STANDARD_KPA`].
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub pressure_kpa: Option<f64>,
}

impl Atmosphere {
    /// A gas of `percent` % CO₂ at standard pressure.
    pub fn percent(percent: f64) -> Self {
        Self {
            co2_percent: Some(percent),
            ..Self::default()
        }
    }

    /// A gas with `uatm` µatm CO₂ at standard pressure.
    pub fn uatm(uatm: f64) -> Self {
        Self {
            co2_uatm: Some(uatm),
            ..Self::default()
        }
    }
}

/// The gas resolved at a temperature.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct GasState {
    /// Temperature, °C.
    pub temperature_c: f64,
    /// Total pressure, kPa.
    pub pressure_kpa: f64,
    /// Water vapour pressure subtracted, kPa (0 for a partial pressure given in µatm).
    pub vapour_kpa: f64,
    /// CO₂ partial pressure, µatm.
    pub co2_uatm: f64,
    /// CO₂ as a percentage of the total pressure (after the water vapour).
    pub co2_percent_of_total: f64,
    /// Henry's constant K₀, mol/(L·atm).
    pub k0: f64,
    /// Dissolved CO₂ held by the gas (CO₂(aq) + H₂CO₃), mol/L.
    pub co2_aq_m: f64,
}

/// Henry's constant of CO₂, K₀ (mol L⁻¹ atm⁻¹), Weiss (1974), at `t_c` °C and salinity `s`.
pub fn k0_weiss(t_c: f64, s: f64) -> f64 {
    let t = (t_c + KELVIN) / 100.0;
    let ln = -58.0931
        + 90.5069 / t
        + 22.2940 * t.ln()
        + s * (0.027766 - 0.025888 * t + 0.0050578 * t * t);
    ln.exp()
}

/// Saturation vapour pressure of water over a solution of salinity `s`, atm,
/// Weiss & Price (1980), at `t_c` °C.
pub fn vapour_pressure_atm(t_c: f64, s: f64) -> f64 {
    let t = (t_c + KELVIN) / 100.0;
    (24.4543 - 67.4509 / t - 4.8489 * t.ln() - 0.000544 * s).exp()
}

fn bad(field: &str, reason: impl Into<String>) -> SolverError {
    SolverError::Infeasible {
        field: field.into(),
        reason: reason.into(),
    }
}

/// Check an atmosphere's own fields (no temperature needed): exactly one
/// CO₂ figure, in range, and a pressure in range. Fields are named
/// `atmosphere.…`.
///
/// # Errors
///
/// [`SolverError::OutOfRange`] for a percentage outside 0–100, a negative
/// partial pressure or a pressure outside [`PRESSURE_MIN_KPA`]–[`PRESSURE_MAX_KPA`];
/// [`SolverError::Infeasible`] when neither or both CO₂ figures are given, or
/// the partial pressure exceeds the total pressure.
pub fn validate(a: &Atmosphere) -> Result<()> {
    let p = match a.pressure_kpa {
        Some(p) => crate::limits::PRESSURE_KPA.check_as("atmosphere.pressure_kpa", p)?,
        None => STANDARD_KPA,
    };
    match (a.co2_percent, a.co2_uatm) {
        (Some(x), None) => {
            crate::limits::CO2_PERCENT.check_as("atmosphere.co2_percent", x)?;
        }
        (None, Some(u)) => {
            let u = finite("atmosphere.co2_uatm", u)?;
            let max = p / STANDARD_KPA * 1e6;
            if u < 0.0 {
                return Err(SolverError::OutOfRange {
                    field: "atmosphere.co2_uatm".into(),
                    value: u,
                    min: 0.0,
                    max,
                });
            }
            if u > max {
                return Err(bad(
                    "atmosphere.co2_uatm",
                    format!(
                        "a CO₂ partial pressure of {u} µatm is more than the total pressure \
                         ({} kPa = {} µatm): lower the CO₂ or raise the pressure",
                        p,
                        max.round()
                    ),
                ));
            }
        }
        (None, None) => {
            return Err(bad(
                "atmosphere.co2_percent",
                "give the CO₂ of the gas, as a percentage (co2_percent) or as a partial \
                 pressure in µatm (co2_uatm)",
            ))
        }
        (Some(_), Some(_)) => {
            return Err(bad(
                "atmosphere.co2_uatm",
                "give the CO₂ either as a percentage or as a partial pressure, not both",
            ))
        }
    }
    Ok(())
}

/// Resolve an atmosphere at a temperature and salinity.
///
/// # Errors
///
/// As [`validate`]; [`SolverError::OutOfRange`] on `temperature_c` outside
/// [`T_MIN_C`]–[`T_MAX_C`] (the range of the gas constants).
///
/// # Example
///
/// ```
/// use solver::atmosphere::{gas_at, Atmosphere};
/// // 5 % CO₂, humidified, at 37 °C and 1 atm: about 35.6 mmHg (4.7 kPa).
/// let g = gas_at(&Atmosphere::percent(5.0), 37.0, 0.0)?;
/// let mmhg = g.co2_uatm * 1e-6 * 760.0;
/// assert!((mmhg - 35.6).abs() < 0.2);
/// # Ok::<(), solver::SolverError>(())
/// ```
pub fn gas_at(a: &Atmosphere, t_c: f64, salinity: f64) -> Result<GasState> {
    validate(a)?;
    let t = crate::limits::GAS_TEMPERATURE_C.check_as("temperature_c", t_c)?;
    let p_kpa = a.pressure_kpa.unwrap_or(STANDARD_KPA);
    let p_atm = p_kpa / STANDARD_KPA;
    let (pco2_atm, vapour_atm) = match (a.co2_percent, a.co2_uatm) {
        (Some(x), _) => {
            let w = vapour_pressure_atm(t, salinity);
            if w >= p_atm {
                return Err(bad(
                    "atmosphere.pressure_kpa",
                    "the total pressure is below the water vapour pressure at this temperature",
                ));
            }
            (x / 100.0 * (p_atm - w), w)
        }
        (_, Some(u)) => (u * 1e-6, 0.0),
        (None, None) => (0.0, 0.0),
    };
    let k0 = k0_weiss(t, salinity);
    Ok(GasState {
        temperature_c: t,
        pressure_kpa: p_kpa,
        vapour_kpa: vapour_atm * STANDARD_KPA,
        co2_uatm: pco2_atm * 1e6,
        co2_percent_of_total: pco2_atm / p_atm * 100.0,
        k0,
        co2_aq_m: k0 * pco2_atm,
    })
}

/// The refusal of an atmosphere over a solution with no carbonate.
pub fn no_carbonate(field: &str) -> SolverError {
    bad(
        field,
        "this solution holds no carbonate, so a CO₂ atmosphere changes nothing here and none is \
         added on its own: add the carbonate system (at 0 mol/L for plain water open to the \
         gas, or as NaHCO₃) or remove the atmosphere",
    )
}

/// Hold an acid system's neutral species (CO₂(aq) for carbonate) at the
/// gas's `co2_aq_m`: the system becomes open, the rest follows the charge balance.
pub fn hold_by_gas(acid: &mut Acid, gas: &GasState) {
    let pks: Vec<f64> = acid.ka.iter().take(acid.n).map(|k| -k.log10()).collect();
    *acid = Acid::open_from_pks(&pks, gas.co2_aq_m);
}

/// The CO₂ partial pressure (µatm) a closed solution at equilibrium would
/// be in balance with: `[CO₂(aq)] / K₀`.
pub fn equilibrium_uatm(co2_aq_m: f64, t_c: f64, salinity: f64) -> f64 {
    co2_aq_m / k0_weiss(t_c, salinity) * 1e6
}
