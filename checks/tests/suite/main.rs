//! fourforce's integration tests as one binary (one link, one run): a module per file.
//!
//! Run all: `cargo test -p fourforce-checks --all-features`; one module:
//! `cargo test -p fourforce-checks --all-features --test suite -- MODULE::`.
#![allow(clippy::unwrap_used)]

mod firmware_defmt;
mod firmware_fast;
mod foundation_common;
mod foundation_exact;
mod foundation_gamma;
mod foundation_nalgebra;
mod foundation_precision;
mod foundation_properties;
mod foundation_published;
mod kinematics_optics;
mod kinematics_properties;
mod kinematics_published;
mod kinematics_reference;
mod kinematics_support;
mod motion_beamline;
mod motion_check;
mod motion_push;
mod motion_steer;
mod orbit;
mod reliability_mutants;
mod reliability_regressions;
mod species;
mod transfer;
mod witness;
