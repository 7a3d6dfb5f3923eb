//! Number parsing and display helpers for inputs (being written).
