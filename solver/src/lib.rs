//! Bufferwright solver: exact acid–base equilibrium for buffer design.
#![forbid(unsafe_code)]

pub mod activity;
pub mod carbonate_field;
pub mod cli;
pub mod csv;
pub mod design;
pub mod docpath;
pub mod equilibrium;
pub mod error;
pub mod field;
pub mod field_limit;
pub mod field_log;
pub mod field_plot;
pub mod formula;
pub mod grid;
pub mod library;
pub mod mixture;
pub mod order;
pub mod reagent;
pub mod recipe;
pub mod salvage;
pub mod seawater;
pub mod selfcheck;
pub mod system;
pub mod thermo;
pub mod uncertainty;
pub mod water;
pub mod workloads;

pub use error::{Result, SolverError};
