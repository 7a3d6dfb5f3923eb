//! Saved designs in browser local storage (being written).
