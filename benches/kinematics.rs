//! Benchmarks of the kinematics modules (criterion); filled in with the modules.
fn main() {}
