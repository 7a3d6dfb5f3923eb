//! Command-line entry: reads a design document and prints the result.
fn main() {}
