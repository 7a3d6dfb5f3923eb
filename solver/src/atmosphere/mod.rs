//! The CO₂ atmosphere room: a solution or field sample under a gas, above the flask, recipe and field rooms.
//!
//! The gas itself (the `atmosphere` key, K₀, water vapour) lives with the
//! charge balance in [`crate::equilibrium::gas`] and is re-exported here;
//! the open carbonate system is [`crate::equilibrium::open`]; the recipe
//! under a gas is [`crate::recipe::gas`]; a design's atmospheres are
//! checked and reported by `crate::document::gas`. This room holds what
//! compares one solution under several gases: [`what_if`] (room air,
//! another CO₂ %, pH against CO₂ %) and [`field`] (a field sample brought to
//! equilibrium with the air).

pub mod field;
pub mod what_if;

pub use crate::equilibrium::gas::{
    equilibrium_uatm, gas_at, hold_by_gas, k0_weiss, no_carbonate, validate, vapour_pressure_atm,
    Atmosphere, GasState, CARBONATE, PRESSURE_MAX_KPA, PRESSURE_MIN_KPA, ROOM_AIR_UATM,
    STANDARD_KPA, T_MAX_C, T_MIN_C,
};
