//! Bufferwright solver: exact acid–base equilibrium for buffer design.
#![forbid(unsafe_code)]

pub mod error;
pub mod activity;
pub mod equilibrium;
pub mod system;
pub mod formula;
pub mod water;
pub mod thermo;
pub mod library;
pub mod mixture;
pub mod recipe;
pub mod field;
pub mod design;

pub use error::{Result, SolverError};
