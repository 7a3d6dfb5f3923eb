//! Bufferwright solver: exact acid–base equilibrium for buffer design.
//!
//! The rooms, bottom to top: `error`, `order`, `water` (leaf physics); `system` (what an acid
//! system is, the library, formulas, pK(T), checks of user-made systems); `equilibrium` (charge
//! balance, capacity, the activity models, the open system and its gas); `mixture`; `recipe`;
//! `field` (readings of natural waters); `atmosphere` (one solution under several gases: room
//! air, another CO₂ %, a field sample brought to the air); `uncertainty`; `meter` (the pH meter
//! bench: standards, calibration); `document` (the design file, reagent files, the report);
//! `selfcheck`; `cli` (the commands without their IO); `workloads` (bench inputs).
#![doc = include_str!("../README.md")]
#![forbid(unsafe_code)]

pub mod atmosphere;
pub mod cli;
pub mod document;
pub mod equilibrium;
pub mod error;
pub mod field;
pub mod fmt;
pub mod limits;
pub mod meter;
pub mod mixture;
pub mod order;
pub mod recipe;
pub mod selfcheck;
pub mod system;
pub mod uncertainty;
pub mod water;
pub mod workloads;

pub use error::{Result, SolverError};
