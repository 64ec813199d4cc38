//! The one error type of the crate.
//!
//! Every fallible function returns `Result<_, Error>`. The variants name the physics that was
//! violated, not the code path. `Error` is `Copy`, small (four bytes, so that a `Result` of floats
//! moves without byte-wise copies), and implements `Display` and `core::error::Error`; with the
//! `defmt` feature it implements `defmt::Format`.
//!
//! # Examples
//! ```
//! use fourforce::Error;
//! assert_eq!(Error::SpeedNotBelowLight.to_string(), "speed is not below the speed of light");
//! ```

use core::fmt;

/// What was wrong with an input or a request.
///
/// # Examples
/// ```
/// use fourforce::Error;
/// let e: Error = Error::NonFinite;
/// assert_eq!(e, Error::NonFinite);
/// ```
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[non_exhaustive]
// Four bytes, like the f32 payloads beside it: with a one-byte error, the `?` of a `Result` with a
// payload of several floats leaves the payload at an offset of 2 in the compiler's temporaries,
// and every move of it becomes a byte-wise `memcpy` (measured: 1 200 of the firmware cycle's
// 2 646 instructions on the Cortex-M4F).
#[repr(u32)]
pub enum Error {
    /// An input was NaN or infinite.
    NonFinite,
    /// A speed was at or above the speed of light (|β| ≥ 1).
    SpeedNotBelowLight,
    /// A mass or rest energy was zero or negative where a positive one is needed.
    NonPositiveMass,
    /// A kinetic energy was negative.
    NegativeEnergy,
    /// A total energy was below the rest energy, or a Lorentz factor below 1.
    BelowRestEnergy,
    /// A momentum, rigidity or other magnitude that must be positive was negative.
    NegativeMagnitude,
    /// A charge was zero where the quantity needs one (a rigidity, a deflection).
    ZeroCharge,
    /// A field was zero where the quantity needs one (a bending radius, a revolution frequency).
    ZeroField,
    /// A time of flight was shorter than light needs over the same length.
    FasterThanLight,
    /// A length, duration or step was zero or negative where a positive one is needed.
    NonPositiveLength,
    /// A direction vector had zero length.
    ZeroDirection,
    /// An angle was outside the range the formula covers (for example a bend beyond 90°).
    AngleOutOfRange,
    /// A result does not fit in the working precision.
    Overflow,
    /// A fixed-capacity container was full.
    CapacityFull,
    /// An index was past the end of a sequence.
    OutOfBounds,
    /// A window or sequence was empty where at least one value is needed.
    Empty,
    /// A limit, bound or window was given with its lower end above its upper end.
    InvalidRange,
    // (new variants: add below, one block per area, with a Display arm in the same order)
    // --- motion ---
    /// A feedback gain was outside the range where the loop converges (0 < g < 2).
    GainOutOfRange,
    // --- species ---
    /// A rest energy was below 1 eV: far below any charged particle's, and where the states of
    /// motion would underflow.
    RestEnergyTooSmall,
    // --- orbit ---
    /// An iterative decomposition did not converge within its sweep limit.
    NotConverged,
    /// A value lies outside the range of a calibration table (no extrapolation).
    OutsideCalibration,
    /// Calibration points were not strictly increasing in both coordinates.
    NotMonotone,
    // --- witness ---
    /// A standard uncertainty was zero, negative or not finite.
    NonPositiveUncertainty,
    /// A speed was zero where a moving particle is needed (a speed witness of a beam at rest).
    ZeroSpeed,
    // --- transfer ---
    /// A periodic cell has no stable solution: `|trace| ≥ 2` in a plane, or it changes the energy.
    Unstable,
    /// A per-plane quantity was asked of a map that couples the planes (a solenoid).
    Coupled,
    /// An emittance was zero or negative, or a projected emittance rounded to zero.
    NonPositiveEmittance,
}

impl fmt::Display for Error {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(match self {
            Error::NonFinite => "input is not a finite number",
            Error::SpeedNotBelowLight => "speed is not below the speed of light",
            Error::NonPositiveMass => "mass is zero or negative",
            Error::NegativeEnergy => "kinetic energy is negative",
            Error::BelowRestEnergy => "energy is below the rest energy",
            Error::NegativeMagnitude => "magnitude is negative",
            Error::ZeroCharge => "charge is zero",
            Error::ZeroField => "field is zero",
            Error::FasterThanLight => "time of flight is shorter than light needs",
            Error::NonPositiveLength => "length or duration is zero or negative",
            Error::ZeroDirection => "direction has zero length",
            Error::AngleOutOfRange => "angle is outside the range of the formula",
            Error::Overflow => "result does not fit in the working precision",
            Error::CapacityFull => "fixed capacity is full",
            Error::OutOfBounds => "index is out of bounds",
            Error::Empty => "no values where at least one is needed",
            Error::InvalidRange => "lower bound is above upper bound",
            Error::GainOutOfRange => "feedback gain is outside (0, 2)",
            Error::RestEnergyTooSmall => "rest energy is below 1 eV",
            Error::NotConverged => "decomposition did not converge",
            Error::OutsideCalibration => "value is outside the calibration table",
            Error::NotMonotone => "calibration points are not strictly increasing",
            Error::NonPositiveUncertainty => "standard uncertainty is zero or negative",
            Error::ZeroSpeed => "speed is zero where a moving particle is needed",
            Error::Unstable => "cell has no stable periodic solution",
            Error::Coupled => "map couples the planes",
            Error::NonPositiveEmittance => "emittance is zero or negative",
        })
    }
}

impl core::error::Error for Error {}

#[cfg(test)]
mod tests {
    use super::Error;

    #[test]
    fn error_is_four_bytes() {
        // Four bytes, aligned like an f32 (see the repr): a Result<f32, Error> stays 8 bytes.
        assert_eq!(core::mem::size_of::<Error>(), 4);
        assert_eq!(core::mem::size_of::<Result<f32, Error>>(), 8);
    }

    // `Error` is `Copy`: checked when the tests build, not by a test that cannot fail.
    const _: () = {
        const fn copy<T: Copy>() {}
        copy::<Error>()
    };

    /// Every variant reads as its own sentence (a log line must say which rule was broken).
    #[test]
    fn every_variant_has_its_own_message() {
        extern crate std;
        use std::{string::ToString, vec::Vec};
        let all = [
            Error::NonFinite,
            Error::SpeedNotBelowLight,
            Error::NonPositiveMass,
            Error::NegativeEnergy,
            Error::BelowRestEnergy,
            Error::NegativeMagnitude,
            Error::ZeroCharge,
            Error::ZeroField,
            Error::FasterThanLight,
            Error::NonPositiveLength,
            Error::ZeroDirection,
            Error::AngleOutOfRange,
            Error::Overflow,
            Error::CapacityFull,
            Error::OutOfBounds,
            Error::Empty,
            Error::InvalidRange,
            Error::GainOutOfRange,
            Error::RestEnergyTooSmall,
            Error::NotConverged,
            Error::OutsideCalibration,
            Error::NotMonotone,
            Error::NonPositiveUncertainty,
            Error::ZeroSpeed,
            Error::Unstable,
            Error::Coupled,
            Error::NonPositiveEmittance,
        ];
        let messages: Vec<_> = all.iter().map(ToString::to_string).collect();
        for (i, m) in messages.iter().enumerate() {
            assert!(m.len() > 8, "{:?}: {m:?}", all[i]);
            assert!(!messages[..i].contains(m), "{:?} repeats {m:?}", all[i]);
        }
    }
}
