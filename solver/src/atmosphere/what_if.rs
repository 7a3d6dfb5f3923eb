//! What-ifs under a gas: the same solution in room air or at another CO₂ percentage, and pH against CO₂ %.

use crate::equilibrium::gas::{Atmosphere, ROOM_AIR_UATM};
use crate::equilibrium::solve_hinted;
use crate::error::{in_range, Result, SolverError};
use crate::mixture::{prepare, MixtureSpec, WhatIf};
use crate::system::AcidSystem;
use serde::{Deserialize, Serialize};

/// The pH of a solution under its own gas, in room air and at another CO₂ %.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct GasWhatIf {
    /// pH under the solution's own atmosphere.
    pub ph: f64,
    /// Room air used, µatm CO₂ (the user's figure or [`ROOM_AIR_UATM`]).
    pub room_air_uatm: f64,
    /// pH once equilibrated with room air (same total pressure).
    pub room_air_ph: f64,
    /// The other CO₂ percentage tried, if one was given.
    pub other_percent: Option<f64>,
    /// pH at that percentage.
    pub other_ph: Option<f64>,
}

fn atmosphere_of(mix: &MixtureSpec) -> Result<Atmosphere> {
    mix.atmosphere.ok_or_else(|| SolverError::Infeasible {
        field: "atmosphere".into(),
        reason: "the solution has no atmosphere: give one (a CO₂ percentage or partial pressure) \
                 for the gas what-ifs"
            .into(),
    })
}

fn ph_under(mix: &MixtureSpec, custom: &[AcidSystem], a: Atmosphere, guess: f64) -> Result<f64> {
    let mut m = mix.clone();
    m.atmosphere = Some(a);
    let p = prepare(&m, custom)?;
    Ok(solve_hinted(&p.composition, guess, f64::NAN)?.ph)
}

/// The same solution in room air and at another CO₂ percentage (both at the
/// solution's own total pressure and temperature).
///
/// # Errors
///
/// [`SolverError::Infeasible`] on `atmosphere` when the solution has none;
/// `what_if.room_co2_uatm` or `what_if.co2_percent` out of range; the
/// solution's own errors.
pub fn gas_what_if(mix: &MixtureSpec, custom: &[AcidSystem], w: &WhatIf) -> Result<GasWhatIf> {
    let own = atmosphere_of(mix)?;
    let room = match w.room_co2_uatm {
        Some(u) => crate::limits::ROOM_CO2_UATM.check_path(u)?,
        None => ROOM_AIR_UATM,
    };
    let other = match w.co2_percent {
        Some(x) => Some(crate::limits::WHAT_IF_CO2_PERCENT.check_path(x)?),
        None => None,
    };
    let ph = ph_under(mix, custom, own, f64::NAN)?;
    let air = Atmosphere {
        co2_percent: None,
        co2_uatm: Some(room),
        pressure_kpa: own.pressure_kpa,
    };
    let room_air_ph = ph_under(mix, custom, air, ph)?;
    let other_ph = match other {
        Some(x) => {
            let a = Atmosphere {
                co2_percent: Some(x),
                co2_uatm: None,
                pressure_kpa: own.pressure_kpa,
            };
            Some(ph_under(mix, custom, a, ph)?)
        }
        None => None,
    };
    Ok(GasWhatIf {
        ph,
        room_air_uatm: room,
        room_air_ph,
        other_percent: other,
        other_ph,
    })
}

/// pH against the CO₂ percentage of the gas at the solution's temperature
/// and pressure, for a plot, with the target marked.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Co2Curve {
    /// CO₂, % of the dry gas (humidified at the temperature).
    pub co2_percent: Vec<f64>,
    /// pH at each percentage.
    pub ph: Vec<f64>,
    /// Temperature, °C.
    pub temperature_c: f64,
    /// The target pH to mark, if one was given.
    pub target_ph: Option<f64>,
    /// The CO₂ percentage at which the solution reaches the target, if it
    /// does within 0–100 %.
    pub target_co2_percent: Option<f64>,
}

/// pH at `n` CO₂ percentages evenly from `max_percent`/40 to `max_percent`, and the
/// percentage that gives `target_ph` (bisection on the monotone curve: more
/// CO₂ never raises the pH).
///
/// # Errors
///
/// `max_percent` outside (0, 100], `n` outside 2..=1000, a target outside
/// 0–14; the solution's own errors (it must hold carbonate).
pub fn co2_curve(
    mix: &MixtureSpec,
    custom: &[AcidSystem],
    target_ph: Option<f64>,
    max_percent: f64,
    n: usize,
) -> Result<Co2Curve> {
    let hi = in_range("max_percent", max_percent, 1e-3, 100.0)?;
    in_range("points", n as f64, 2.0, 1000.0)?;
    if let Some(t) = target_ph {
        in_range("target_ph", t, 0.0, 14.0)?;
    }
    let pressure = mix.atmosphere.and_then(|a| a.pressure_kpa);
    let at = |x: f64, guess: f64| {
        let a = Atmosphere {
            co2_percent: Some(x),
            co2_uatm: None,
            pressure_kpa: pressure,
        };
        ph_under(mix, custom, a, guess)
    };
    let mut co2 = Vec::with_capacity(n);
    let mut ph = Vec::with_capacity(n);
    let mut guess = f64::NAN;
    // From 1/40 of the top: with no CO₂ at all every carbon would leave in
    // time and the pH would be that of the counter-ions alone.
    let lo = hi / 40.0;
    for i in 0..n {
        let x = lo + (hi - lo) * i as f64 / (n - 1) as f64;
        let y = at(x, guess)?;
        guess = y;
        co2.push(x);
        ph.push(y);
    }
    let target_co2_percent = match target_ph {
        Some(t) => {
            let (mut lo, mut up) = (0.0, 100.0);
            let (f_lo, f_up) = (at(lo, f64::NAN)?, at(up, f64::NAN)?);
            if f_lo >= t && f_up <= t {
                let mut g = f64::NAN;
                for _ in 0..60 {
                    let mid = 0.5 * (lo + up);
                    let y = at(mid, g)?;
                    g = y;
                    if y > t {
                        lo = mid;
                    } else {
                        up = mid;
                    }
                    if up - lo < 1e-7 {
                        break;
                    }
                }
                Some(0.5 * (lo + up))
            } else {
                None
            }
        }
        None => None,
    };
    Ok(Co2Curve {
        co2_percent: co2,
        ph,
        temperature_c: mix.temperature_c,
        target_ph,
        target_co2_percent,
    })
}
