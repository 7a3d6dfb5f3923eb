//! Bufferwright solver: exact acid–base equilibrium for buffer design.
#![forbid(unsafe_code)]

pub mod error;
pub mod activity;
pub mod equilibrium;
pub mod system;

pub use error::{Result, SolverError};
