//! Bufferwright solver: exact acid–base equilibrium for buffer design.
#![forbid(unsafe_code)]

pub mod activity;
pub mod design;
pub mod equilibrium;
pub mod error;
pub mod field;
pub mod formula;
pub mod library;
pub mod mixture;
pub mod recipe;
pub mod selfcheck;
pub mod system;
pub mod thermo;
pub mod uncertainty;
pub mod water;

pub use error::{Result, SolverError};
