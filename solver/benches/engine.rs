//! Criterion benchmarks of the engine.
fn main() {}
