//! Relativistic charged-particle kinematics for firmware: `no_std`, no allocation, `f32` and `f64`.
//!
//! fourforce turns a particle's energy, or any other measured quantity of its motion, into the
//! numbers a beam controller acts on (speed, momentum, magnetic and electric rigidity, flight
//! time, the angle a corrector gives) without losing precision in `f32` at low energy or near the
//! speed of light; it carries four-vectors and the electromagnetic field tensor, the four-force
//! `K^μ = q F^μ_ν u^ν`, Lorentz boosts of vectors and fields, three published relativistic
//! pushers, first-order transfer maps, a fixed-capacity beam-line model, the steering of a whole
//! line, on-device plausibility checks and energy witnesses.
//!
//! # Conventions
//! - Metric signature (+,−,−,−), `x⁰ = ct`; four-velocity in units of c, `u = γ(1, β)`.
//! - Field tensor `F^{i0} = Eⁱ/c`, `F^{ij} = −ε^{ijk}Bᵏ`, so that `K = γ(qE·v/c, q(E + v×B))`.
//! - Inside, every quantity sits near 1 so `f32` neither underflows nor overflows: energies and
//!   momenta in eV (`pc` for momentum), speeds as β, fields in V/m (E and cB), lengths in m.
//!   SI is offered at the boundary (N, kg m/s, T, s).
//! - Charge `Q` in units of the elementary charge, with sign; angles in radians.
//! - Energy gains from voltages: a voltage `V` (a gap, an electrode pair, a potential step, taken
//!   in the direction of travel) gives a particle of charge `Q` the kinetic energy `ΔT = Q·V` in
//!   eV; `V > 0` accelerates positive charges. Every function that takes a voltage uses this sign
//!   ([`optics::try_energy_gain`], [`beamline::Element::AcceleratingGap`]).
//! - Units in names: the crate's base units are eV (every energy, and momentum as `pc`), m, s,
//!   rad, T, T·m, V, V/m and m/s; a method named after a quantity returns it in its base unit
//!   with no suffix, and carries a suffix for any other unit (`_kev`, `_mev`, `_gev`, `_si` for
//!   kg·m/s, `_newtons`, `_watts`). "Momentum" always means `pc` in eV; the dimensionless `γβ` is
//!   called `beta_gamma`. Arguments name their unit (`length_m`, `field_t`, `voltage_v`).
//! - Fallible functions are named `try_…` and return `Result<_, Error>`; no other function is.
//! - Constants: CODATA 2018 (see [`consts`]), rounded once to the working precision.
//!
//! # Errors and edges
//! No function panics on any input. Fallible operations return `Result<_, Error>`; each function
//! documents what it returns at the edges of its domain. Nothing returns NaN silently.
//!
//! # Features
//! | feature | adds |
//! | --- | --- |
//! | `defmt` | `defmt::Format` for every public type (defmt 1) |
//! | `approx` | `AbsDiffEq`, `RelativeEq`, `UlpsEq` for vectors and tensors (approx 0.5) |
//! | `micromath` | a separately named fast `f32` path; never changes an existing result |
//!
//! Features only add: Cargo unifies them across a dependency graph, so a feature that changed a
//! result would change it for every crate of a firmware. No feature pulls in `std`.
//!
//! # MSRV
//! The minimum supported Rust version is the `rust-version` of `Cargo.toml`; it is raised only in
//! a minor release, never in a patch release.
//!
//! # Caution
//! fourforce computes physics and is not a safety system. Beams can injure people and damage
//! equipment. Personnel protection and machine interlocks must be independent, certified systems
//! built to local regulations and licensed radiation-safety practice. Validate every set point on
//! your own machine.
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
#[cfg(feature = "approx")]
mod approx_eq;
pub mod boost;
mod compensated;
pub mod field;
pub mod force;
pub mod spacetime;
pub use boost::{Boost, LorentzTransform};
pub use field::{CovariantFieldTensor, FieldTensor};
pub use spacetime::{Covector, FourVector, Metric};

// --- kinematics: species, state of motion, beam-line quantities ---
pub mod kinematics;
pub use kinematics::Motion;
pub mod optics;
pub mod transfer;

// --- motion: pushers, beam line, checks, steering ---
pub mod beamline;
pub mod check;
pub mod orbit;
pub mod push;
mod svd;
pub mod witness;

// --- integrations and fast paths ---
#[cfg(feature = "micromath")]
#[cfg_attr(docsrs, doc(cfg(feature = "micromath")))]
pub mod fast;

pub use error::Error;
pub use real::{MaybeFormat, Real, try_finite};
pub use species::Species;
pub use vector::ThreeVector;

#[macro_use]
mod aliases;
/// Every public generic type in single precision, the firmware's working precision.
///
/// # Examples
/// ```
/// use fourforce::f32::{Motion, Species};
/// let m = Motion::try_from_kinetic_energy(Species::ELECTRON, 1.0e6)?;
/// assert!((m.beta() - 0.941_079_2).abs() < 1e-6);
/// # Ok::<(), fourforce::Error>(())
/// ```
pub mod f32 {
    aliases!(f32);
}
/// Every public generic type in double precision, the host's reference precision.
///
/// # Examples
/// ```
/// use fourforce::f64::{Motion, Species};
/// let m = Motion::try_from_kinetic_energy(Species::PROTON, 1.0e9)?;
/// assert!((m.beta() - 0.875_025_646_693_018_33).abs() < 1e-15); // mpmath, CODATA 2018
/// # Ok::<(), fourforce::Error>(())
/// ```
pub mod f64 {
    aliases!(f64);
}

/// The README's Rust examples, compiled and run as doctests so that they stay true.
#[cfg(doctest)]
#[doc = include_str!("../README.md")]
struct ReadmeDoctests;
