//! The precision of a computation (`--f32` or `--f64`) and the number format that round-trips it.

use std::fmt::LowerExp;
use std::str::FromStr;

use clap::Args;
use fourforce::Real;

/// `--f32` / `--f64`; the last one given wins, f64 when neither is.
#[derive(Args, Clone, Copy, Debug, Default)]
pub struct Precision {
    /// Compute in single precision, as firmware on a single-precision FPU would; values are
    /// printed with 9 significant digits, which round-trip an f32.
    #[arg(long, overrides_with = "f64")]
    f32: bool,
    /// Compute in double precision (the default); values are printed with 17 significant digits,
    /// which round-trip an f64.
    #[arg(long, overrides_with = "f32")]
    f64: bool,
}

impl Precision {
    /// Whether the computation is in f32.
    pub fn single(self) -> bool {
        self.f32
    }
}

/// A floating-point type the subcommands compute in: the crate's `Real`, parsed from text and
/// printed in exponent form.
pub trait Float: Real + FromStr + LowerExp {}

impl<T: Real + FromStr + LowerExp> Float for T {}

/// `x` with the digits that round-trip `T`: 9 significant for f32, 17 for f64, exponent form
/// (`1.23456789e2`).
pub fn sci<T: Float>(x: T) -> String {
    if T::MANTISSA_DIGITS == 24 {
        format!("{x:.8e}")
    } else {
        format!("{x:.16e}")
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn round_trip_digits() {
        assert_eq!(sci(0.1_f32), "1.00000001e-1");
        assert_eq!(sci(0.1_f64), "1.0000000000000001e-1");
        assert_eq!(sci(-250.0_f64), "-2.5000000000000000e2");
    }
}
