//! Bufferwright solver: exact acid–base equilibrium for buffer design.
#![forbid(unsafe_code)]

pub mod error;
pub mod system;

pub use error::{Result, SolverError};
