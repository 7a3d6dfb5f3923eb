//! The five workspaces, one module per tab and named after it: Recipe, Flask,
//! Species & capacity, Field reading, Meter bench. Each reads its part of the design,
//! writes it from input handlers, and shows one `Memo` over the solver.

pub mod field;
pub mod flask;
pub mod gas;
pub mod meter;
pub mod recipe;
pub mod species;
