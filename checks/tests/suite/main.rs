//! fourforce's integration tests as one binary: a module per library module (`spacetime`,
//! `kinematics`, `push`, ...), each holding every check of that module (exact values, published
//! values, properties, f32 against f64, cross-checks, regressions). `tolerance` is the one table of
//! error budgets and error measures; `reference` reads the 50-digit vectors of `../reference/`.
//!
//! Run all: `cargo test -p fourforce-checks --all-features`; one module:
//! `cargo test -p fourforce-checks --all-features --test suite -- kinematics::`.
#![allow(clippy::unwrap_used)]

// support
mod reference;
mod tolerance;

// one module per library module, lowest first
mod beamline;
mod boost;
mod check;
mod defmt;
mod fast;
mod field;
mod force;
mod kinematics;
mod optics;
mod orbit;
mod push;
mod spacetime;
mod species;
mod transfer;
mod vector;
mod witness;
