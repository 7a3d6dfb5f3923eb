//! Field readings of natural waters: from a measured pH and temperature to the share of each
//! species, with the ionic strength from conductivity, TDS or salinity.
//!
//! Layers, bottom to top: `csv`; `seawater`; `carbonate` and `limit` (optional parts of a
//! reading); `reading` (the reading itself); `plot`, `grid` and `log` (many readings at once).

pub mod carbonate;
pub mod csv;
pub mod grid;
pub mod limit;
pub mod log;
pub mod plot;
pub mod reading;
pub mod seawater;

pub use reading::{
    basis_mass, beyond_davies_warning, field_reading, field_reading_cached, ionic_from,
    ionic_from_salinity, reporting_bases, reporting_basis, target_species, total_to_molar,
    validate_field, AtTemperature, BasisAmount, FieldCache, FieldResult, FieldSample, FieldSpec,
    FieldSpecies, IonicSource, TotalUnit,
};
