//! Acid systems: what one is (`acid`: steps, species, shelf forms, hazards), the built-in
//! library (`library`), formulas and molar masses (`formula`), pK against temperature
//! (`thermo`). Nothing here solves an equilibrium.

pub mod acid;
pub mod formula;
pub mod library;
pub mod thermo;

pub use acid::{
    AcidSystem, CustomForm, Hazard, Ion, PkFormula, ReagentForm, Step, TempModel, MAX_STEPS,
};
