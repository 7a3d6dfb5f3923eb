//! Canvas plots of species, capacity and titration (being written).
