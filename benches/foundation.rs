//! Benchmarks of the foundation modules (criterion); filled in with the modules.
fn main() {}
