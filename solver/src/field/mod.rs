//! Field readings of natural waters: from a measured pH and temperature to the share of each
//! species, with the ionic strength from conductivity, TDS or salinity.
//!
//! Layers, bottom to top (a file uses only those below it): `csv`, `ionic` → `seawater` →
//! `sample` → `carbonate`, `limit` → `reading` → `plot`, `log` → `grid`. This file only
//! names them.

pub mod carbonate;
pub mod csv;
pub mod grid;
pub mod ionic;
pub mod limit;
pub mod log;
pub mod plot;
pub mod reading;
pub mod sample;
pub mod seawater;

pub use ionic::{ionic_from, ionic_from_salinity, IonicSource};
pub use reading::{
    field_reading, field_reading_cached, reporting_bases, reporting_basis, total_to_molar,
    validate_field, BasisAmount, FieldResult, FieldSpec, FieldSpecies, TotalUnit,
};
pub use sample::{target_species, AtTemperature, FieldCache, FieldSample};
