//! Plots of species, buffer capacity and titration: solver data, backend-generic drawing, the HiDPI canvas.
//!
//! - [`data`]: the solver's curves for the plotted composition, table rows and readout values (plain Rust).
//! - [`draw`]: `draw_species`, `draw_capacity`, `draw_titration`, generic over the plotters backend,
//!   so the page's canvas and the native SVG tests run the same code.
//! - [`canvas`]: the `PlotCanvas` component (backing store = CSS size × devicePixelRatio).
//! - [`co2`]: pH against CO₂ % of a solution under a gas, the target marked.

pub mod canvas;
pub mod co2;
pub mod data;
pub mod draw;
pub mod field;
