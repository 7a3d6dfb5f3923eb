//! Validated input widgets (being written).
