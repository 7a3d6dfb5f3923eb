//! The user's own reagents in the page: the editor (a new acid system, or shelf forms added to
//! one), its plain-Rust model, the per-browser reagent shelf, and the notes result panels show.
//!
//! Everything is judged by the solver (`solver::document::reagent`): the editor never checks a value
//! the solver would not. A reagent goes into the design (`custom_systems`, `custom_forms`), so
//! it travels with exports and share links; the shelf only makes it easy to reuse.

pub mod conflict;
pub mod editor;
pub mod model;
pub mod shelf;

pub use editor::{add_to_design, ReagentEditor, ReagentPanel, UserReagentNote};
