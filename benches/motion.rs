//! Benchmarks of the motion modules (criterion); filled in with the modules.
fn main() {}
