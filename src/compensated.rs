//! Error-free products and compensated sums, for the few quantities that cancel.
//!
//! `u·u − 1` of a four-velocity and the field invariant `B² − E²/c²` near a null field subtract
//! nearly equal squares. Each square is split exactly into `hi + lo` (Dekker's product, with
//! Veltkamp's splitting: T. J. Dekker, Numer. Math. 18, 1971, from memory), the `hi` parts are
//! summed with Knuth's two-sum and the `lo` parts added at the end: the "Dot2" scheme of
//! T. Ogita, S. M. Rump, S. Oishi, SIAM J. Sci. Comput. 26 (2005), from memory. The result is as
//! accurate as if it had been computed in twice the working precision and then rounded.
//!
//! Dekker's product is used rather than `fma` because `libm`'s `fmaf` goes through `f64` on a
//! chip that lacks a hardware dispatch (every Cortex-M), which would pull soft-double code into an
//! `f32` firmware. It is exact for inputs whose magnitude stays below `√MAX / 4097` (`f32`) or
//! `√MAX / 134217729` (`f64`); the callers guarantee that range, and a non-finite error term is
//! dropped (so the result is never NaN from the compensation itself).

use crate::Real;

/// Veltkamp's splitting factor `2^⌈p/2⌉ + 1`: 4097 for `f32`, 134 217 729 for `f64`.
#[inline(always)]
fn split_factor<T: Real>() -> T {
    if T::MANTISSA_DIGITS <= 24 {
        T::from_f64(4097.0)
    } else {
        T::from_f64(134_217_729.0)
    }
}

/// Splits `a` into `hi + lo`, each with at most half the significand bits.
#[inline(always)]
fn split<T: Real>(a: T) -> (T, T) {
    let t = split_factor::<T>() * a;
    let hi = t - (t - a);
    (hi, a - hi)
}

/// `a·b = p + e` exactly (barring overflow or underflow); `e` is 0 when it would not be finite.
#[inline]
pub(crate) fn two_prod<T: Real>(a: T, b: T) -> (T, T) {
    let p = a * b;
    let (ah, al) = split(a);
    let (bh, bl) = split(b);
    let e = al * bl - (((p - ah * bh) - al * bh) - ah * bl);
    (p, if e.is_finite() { e } else { T::ZERO })
}

/// `a + b = s + e` exactly (Knuth's two-sum, no ordering needed).
#[inline]
pub(crate) fn two_sum<T: Real>(a: T, b: T) -> (T, T) {
    let (s, e) = two_sum_unguarded(a, b);
    (s, if e.is_finite() { e } else { T::ZERO })
}

/// [`two_sum`] without the guard on the error term: `e` is NaN when `a + b` overflows. For loops
/// that check their results anyway (the pushers' compensated step checks every carry).
#[inline(always)]
pub(crate) fn two_sum_unguarded<T: Real>(a: T, b: T) -> (T, T) {
    let s = a + b;
    let bb = s - a;
    (s, (a - (s - bb)) + (b - bb))
}

/// A running sum carried as `sum + correction`.
#[derive(Clone, Copy, Debug)]
pub(crate) struct Accumulator<T: Real> {
    sum: T,
    correction: T,
}

impl<T: Real> Accumulator<T> {
    /// An empty sum.
    #[inline]
    pub(crate) const fn new() -> Self {
        Self {
            sum: T::ZERO,
            correction: T::ZERO,
        }
    }

    /// Adds `x` exactly (its rounding error goes into the correction).
    #[inline]
    pub(crate) fn add(&mut self, x: T) {
        let (s, e) = two_sum(self.sum, x);
        self.sum = s;
        self.correction += e;
    }

    /// Adds `a·b` exactly.
    #[inline]
    pub(crate) fn add_product(&mut self, a: T, b: T) {
        let (p, e) = two_prod(a, b);
        self.add(p);
        self.correction += e;
    }

    /// Subtracts `a·b` exactly.
    #[inline]
    pub(crate) fn sub_product(&mut self, a: T, b: T) {
        self.add_product(-a, b);
    }

    /// Adds a small term to the correction only (for terms far below the sum's last bit).
    #[inline]
    pub(crate) fn add_small(&mut self, x: T) {
        self.correction += x;
    }

    /// The sum, rounded once.
    #[inline]
    pub(crate) fn value(self) -> T {
        self.sum + self.correction
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn two_prod_is_exact_in_f32() {
        let a = 299_792_448.0_f32;
        let b = 0.499_999_5_f32;
        let (p, e) = two_prod(a, b);
        assert_eq!(f64::from(p) + f64::from(e), f64::from(a) * f64::from(b));
    }

    #[test]
    fn two_sum_returns_the_lost_low_part_in_either_order() {
        let tiny = 2.0_f32.powi(-30);
        assert_eq!(two_sum(1.0_f32, tiny), (1.0, tiny));
        assert_eq!(two_sum(tiny, 1.0_f32), (1.0, tiny));
        assert_eq!(
            two_sum(1.0_f64, -2.0_f64.powi(-60)),
            (1.0, -2.0_f64.powi(-60))
        );
    }

    #[test]
    fn accumulator_keeps_a_term_below_the_last_bit() {
        // 1 + 2^-30 − 1 = 2^-30, all of which plain f32 loses.
        let tiny = 2.0_f32.powi(-30);
        let mut acc = Accumulator::new();
        acc.add(1.0);
        acc.add(tiny);
        acc.add(-1.0);
        assert_eq!(acc.value(), tiny);
        assert_eq!(1.0_f32 + tiny - 1.0, 0.0);
        let mut acc = Accumulator::new();
        acc.add_product(3.0_f32, 5.0);
        acc.sub_product(2.0, 4.0);
        acc.add_small(0.5);
        assert_eq!(acc.value(), 7.5);
    }

    #[test]
    fn accumulator_recovers_a_cancelled_difference() {
        // (1 + 2^-20)^2 - 1 - 2^-19 = 2^-40, lost entirely by plain f32 arithmetic.
        let x = 1.0_f32 + 2.0_f32.powi(-20);
        let mut acc = Accumulator::new();
        acc.add_product(x, x);
        acc.add(-1.0);
        acc.add(-(2.0_f32.powi(-19)));
        assert_eq!(acc.value(), 2.0_f32.powi(-40));
        assert_eq!(x * x - 1.0 - 2.0_f32.powi(-19), 0.0);
    }
}
