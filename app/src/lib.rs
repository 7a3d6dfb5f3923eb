//! Bufferwright page: a buffer-making and water-reading calculator that runs
//! entirely in the browser.
//!
//! How data flows: the user types into a workspace's inputs; valid values are
//! written into one [`solver::document::Design`] held in [`state::AppState`]
//! (typed text that is not a value yet stays with its field and marks it
//! pending); each workspace derives its results with a `Memo` over the solver;
//! views and canvas plots show those results. Storage, share links and embeds
//! sit at the edge ([`designs`]): they read and write the same `Design` as
//! plain serde data with a schema version, never signals.
//!
//! The tree reads like the page:
//! - [`shell`]: the page frame, tabs and notes; [`state`]: the shared state.
//! - [`workspaces`]: one module per tab (Recipe, Flask, Species & capacity, Field reading).
//! - [`widgets`]: validated inputs, parsing and number formatting, cautions.
//! - [`plots`]: plot data, drawing generic over the plotters backend, the canvas.
//! - [`reagents`]: the user's own reagents: editor, per-browser shelf, notes in results.
//! - [`designs`]: saved designs, drafts and recovery, the designs panel, share links, embeds.
//! - [`offline`]: the footer's offline line (what this browser keeps).
//! - [`checks`]: "Check the engine", the solver's self-check run in the browser.
//! - [`bench`]: in-browser timing of the solver workloads (for `app/PERF.md`).

pub mod bench;
pub mod checks;
pub mod designs;
pub mod offline;
pub mod plots;
pub mod reagents;
pub mod shell;
pub mod state;
pub mod widgets;
pub mod workspaces;

/// Mount the application on the page body.
pub fn start() {
    console_error_panic_hook::set_once();
    leptos::mount::mount_to_body(shell::App);
}
