//! A field sample brought to equilibrium with a gas: its pH there and the CO₂ it would lose or gain.
//!
//! CO₂ leaving or entering a water changes its dissolved carbon but not its
//! alkalinity, so the sample's measured alkalinity `TA` carries over:
//!
//! ```text
//! TA = [HCO₃⁻] + 2[CO₃²⁻] + [OH⁻] − [H⁺]      with [CO₂(aq)] = K₀ p(CO₂)
//! ```
//!
//! is the charge balance of an open carbonate system whose spectator charge
//! is `TA`: solved at the sample's own ionic strength (held, as measured) with
//! the field reading's constants. The sample's own CO₂ partial pressure is its
//! free CO₂ over K₀; the CO₂ it would gain (positive) or lose (negative) is
//! the change of dissolved inorganic carbon, as mg/L of CO₂.

use crate::equilibrium::activity::ActivityModel;
use crate::equilibrium::gas::{gas_at, no_carbonate, validate, GasState, CARBONATE};
use crate::equilibrium::{open::system_total, solve_at_ionic_strength, Acid, Composition};
use crate::error::{Result, SolverError};
use crate::field::carbonate::carbonate_from_alkalinity;
use crate::field::seawater::PkModel;
use crate::field::{ionic_from, FieldSample, FieldSpec, IonicSource};
use crate::mixture::lookup;
use crate::system::formula::basis_mass;
use crate::system::AcidSystem;
use serde::{Deserialize, Serialize};

/// The sample at equilibrium with the gas.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct FieldGas {
    /// The gas at the sample temperature.
    pub gas: GasState,
    /// The CO₂ partial pressure the sample itself is in balance with, µatm.
    pub sample_co2_uatm: f64,
    /// pH once equilibrated with the gas.
    pub equilibrium_ph: f64,
    /// Dissolved inorganic carbon of the sample as read, mmol/L.
    pub dic_sample_mmol_l: f64,
    /// Dissolved inorganic carbon at equilibrium, mmol/L.
    pub dic_equilibrium_mmol_l: f64,
    /// Free CO₂ at equilibrium (CO₂(aq) + H₂CO₃), mg/L as CO₂.
    pub free_co2_equilibrium_mg_l: f64,
    /// CO₂ the sample would take up (positive) or give off (negative), mg/L as CO₂.
    pub co2_change_mg_l: f64,
}

/// Check a field reading's atmosphere against the reading: the carbonate
/// system with a measured alkalinity. Fields are named `atmosphere…`.
///
/// # Errors
///
/// [`no_carbonate`] for another system; [`SolverError::Infeasible`] on
/// `atmosphere` without an alkalinity; the atmosphere's own errors.
pub fn validate_field_gas(spec: &FieldSpec, custom: &[AcidSystem]) -> Result<()> {
    let Some(a) = &spec.atmosphere else {
        return Ok(());
    };
    validate(a)?;
    if lookup(&spec.system, custom)?.id != CARBONATE {
        return Err(no_carbonate("atmosphere"));
    }
    if spec.alkalinity.is_none() {
        return Err(SolverError::Infeasible {
            field: "atmosphere".into(),
            reason: "the equilibrium with a gas needs the sample's alkalinity (it does not \
                     change when CO₂ leaves or enters): give the alkalinity"
                .into(),
        });
    }
    gas_at(a, spec.temperature_c, salinity(&spec.ionic))?;
    Ok(())
}

fn salinity(source: &IonicSource) -> f64 {
    match source {
        IonicSource::Salinity { psu } => *psu,
        _ => 0.0,
    }
}

/// The sample's equilibrium with its `atmosphere`; `None` when it has none.
///
/// # Errors
///
/// As [`validate_field_gas`]; the alkalinity's own errors (a pH that cannot
/// carry it); solver failures.
pub fn field_gas(spec: &FieldSpec, custom: &[AcidSystem]) -> Result<Option<FieldGas>> {
    validate_field_gas(spec, custom)?;
    let (Some(a), Some(alk)) = (&spec.atmosphere, &spec.alkalinity) else {
        return Ok(None);
    };
    let s = salinity(&spec.ionic);
    let gas = gas_at(a, spec.temperature_c, s)?;
    let ionic = ionic_from(&spec.ionic)?;
    let sys = lookup(&spec.system, custom)?;
    let sample = FieldSample::for_source(sys, spec.temperature_c, &spec.ionic)?;
    let ta = alk.to_eq_per_l()?;
    let read = carbonate_from_alkalinity(&sample, spec.ph, ta)?;
    let co2_mass = basis_mass("CO2").unwrap_or(44.009);
    let free_sample_m = read.free_co2_mg_l / co2_mass / 1000.0;
    let pks: Vec<f64> = sample
        .acid
        .ka
        .iter()
        .take(sample.acid.n)
        .map(|k| -k.log10())
        .collect();
    let activity = if sample.model == PkModel::Davies {
        ActivityModel::Davies
    } else {
        ActivityModel::Ideal
    };
    let acid = Acid::open_from_pks(&pks, gas.co2_aq_m);
    let c = Composition {
        acids: vec![acid],
        spectator_charge: ta,
        spectator_z2: 2.0 * ionic,
        kw: sample.kw,
        a_dh: sample.a_dh,
        activity,
    };
    let ph = solve_at_ionic_strength(&c, ionic, spec.ph)?;
    let dic_eq = system_total(&acid, ph, sample.gamma1);
    let dic_sample = read.dic_mmol_l / 1000.0;
    Ok(Some(FieldGas {
        sample_co2_uatm: free_sample_m / gas.k0 * 1e6,
        equilibrium_ph: ph,
        dic_sample_mmol_l: read.dic_mmol_l,
        dic_equilibrium_mmol_l: dic_eq * 1000.0,
        free_co2_equilibrium_mg_l: gas.co2_aq_m * co2_mass * 1000.0,
        co2_change_mg_l: (dic_eq - dic_sample) * co2_mass * 1000.0,
        gas,
    }))
}
