//! Plots of species, buffer capacity and titration: solver data, backend-generic drawing, the HiDPI canvas.
//!
//! - [`data`]: the solver's curves for the plotted composition, table rows and readout values (plain Rust).
//! - [`draw`]: `draw_species`, `draw_capacity`, `draw_titration`, generic over the plotters backend,
//!   so the page's canvas and the native SVG tests run the same code.
//! - [`canvas`]: the `PlotCanvas` component (backing store = CSS size × devicePixelRatio).
//! - [`backend`]: the plotters backend the canvas draws through (plotters-canvas's calls, batched).

pub mod backend;
pub mod canvas;
pub mod data;
pub mod draw;
pub mod field;
