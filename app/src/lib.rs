//! Bufferwright page: Leptos components wired to the pure solver crate.
//!
//! Module owners while the first version is built (see DEVELOPERS.md):
//! shell/inputs/workspaces, plots/species, store/share/designs.

pub mod bench;
pub mod cautions;
pub mod designs_ws;
pub mod embed;
pub mod field_ws;
pub mod format;
pub mod inputs;
pub mod mixture_ws;
pub mod plots;
pub mod recipe_ws;
pub mod share;
pub mod shell;
pub mod species_ws;
pub mod state;
pub mod store;

/// Mount the application on the page body.
pub fn start() {
    console_error_panic_hook::set_once();
    leptos::mount::mount_to_body(shell::App);
}
