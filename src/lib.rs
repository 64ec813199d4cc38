//! Relativistic charged-particle kinematics for firmware: `no_std`, no allocation, `f32` and `f64`.
//!
//! (The crate manual is written here once the modules below are complete.)
#![cfg_attr(not(test), no_std)]
#![forbid(unsafe_code)]
#![deny(missing_docs)]
#![cfg_attr(docsrs, feature(doc_cfg))]
// Library code never panics: these lints hold for everything outside `#[cfg(test)]`.
#![cfg_attr(
    not(test),
    deny(
        clippy::unwrap_used,
        clippy::expect_used,
        clippy::panic,
        clippy::indexing_slicing,
        clippy::unreachable,
        clippy::todo,
        clippy::unimplemented
    )
)]
// Reference constants are typed with all their published digits.
#![allow(clippy::excessive_precision)]
// Physics formulas read better with the operator order of the textbook than with mul_add.
#![allow(clippy::suboptimal_flops)]

pub mod consts;
mod error;
mod real;
mod species;
mod vector;

// --- foundation: spacetime, field tensor, four-force, boosts ---

// --- kinematics: species, state of motion, beam-line quantities ---

// --- motion: pushers, beam line, checks, steering ---

// --- integrations and fast paths ---

pub use error::Error;
pub use real::{MaybeFormat, Real, finite};
pub use species::Species;
pub use vector::ThreeVector;
