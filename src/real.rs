//! The scalar: one sealed trait, implemented for `f32` and `f64`.
//!
//! Every public type and function of the crate is generic over [`Real`]. The trait carries the
//! arithmetic operators, the mathematical functions (all through `libm`, so results are the same
//! on the host and on the chip), and the physical constants of [`consts`](crate::consts) rounded
//! once to the precision. It is sealed: only `f32` and `f64` implement it.
//!
//! # For firmware authors
//! The `f32` path never touches `f64` at run time: constants are converted at compile time, and
//! every function maps to its single-precision `libm` routine (`hypotf`, `sinf`, ...), except the
//! square root on hard-float Arm targets, which is the FPU's `vsqrt.f32` (correctly rounded like
//! libm's `sqrtf`, so the results are bit-identical).
//!
//! # Examples
//! ```
//! use fourforce::Real;
//! fn kinetic_over_rest<T: Real>(t: T, m: T) -> T { t / m }
//! assert_eq!(kinetic_over_rest(1.0_f32, 2.0), 0.5);
//! assert_eq!(<f32 as Real>::SPEED_OF_LIGHT, 299_792_448.0);
//! ```

use core::fmt::{Debug, Display, LowerExp};
use core::ops::{Add, AddAssign, Div, DivAssign, Mul, MulAssign, Neg, Sub, SubAssign};

use crate::consts;

mod private {
    pub trait Sealed {}
    impl Sealed for f32 {}
    impl Sealed for f64 {}
}

/// `defmt::Format` when the `defmt` feature is on, nothing otherwise.
///
/// # Examples
/// ```
/// fn log<T: fourforce::MaybeFormat>(_: &T) {}
/// log(&fourforce::Species::<f32>::PROTON); // every public type qualifies
/// ```
#[cfg(feature = "defmt")]
pub trait MaybeFormat: defmt::Format {}
#[cfg(feature = "defmt")]
impl<T: defmt::Format> MaybeFormat for T {}
/// `defmt::Format` when the `defmt` feature is on, nothing otherwise.
///
/// # Examples
/// ```
/// fn log<T: fourforce::MaybeFormat>(_: &T) {}
/// log(&fourforce::Species::<f32>::PROTON); // every public type qualifies
/// ```
#[cfg(not(feature = "defmt"))]
pub trait MaybeFormat {}
#[cfg(not(feature = "defmt"))]
impl<T> MaybeFormat for T {}

/// A floating-point scalar: `f32` or `f64`, nothing else (the trait is sealed).
///
/// Constants are the values of [`consts`](crate::consts) rounded once to `Self`. Functions are
/// `libm`'s, with `libm`'s accuracy (correctly rounded for `sqrt`, within about 1 ulp for the
/// others), except the `f32` [`sin_cos`](Real::sin_cos) (the crate's own, see there) and the
/// `f32` `sqrt` on hard-float Arm (the FPU's `vsqrt.f32`, also correctly rounded).
///
/// # Examples
/// ```
/// use fourforce::Real;
/// fn hyp<T: Real>(a: T, b: T) -> T { a.hypot(b) }
/// assert_eq!(hyp(3.0_f64, 4.0), 5.0);
/// ```
pub trait Real:
    private::Sealed
    + Copy
    + Default
    + PartialEq
    + PartialOrd
    + Debug
    + Display
    + LowerExp
    + MaybeFormat
    + Add<Output = Self>
    + Sub<Output = Self>
    + Mul<Output = Self>
    + Div<Output = Self>
    + Neg<Output = Self>
    + AddAssign
    + SubAssign
    + MulAssign
    + DivAssign
    + Send
    + Sync
    + 'static
{
    /// 0.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(<f32 as Real>::ZERO, 0.0);
    /// ```
    const ZERO: Self;
    /// 1.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(<f32 as Real>::ONE, 1.0);
    /// ```
    const ONE: Self;
    /// 2.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(<f64 as Real>::TWO, 2.0);
    /// ```
    const TWO: Self;
    /// 1/2.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(<f64 as Real>::HALF, 0.5);
    /// ```
    const HALF: Self;
    /// -1.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(<f32 as Real>::NEG_ONE, -1.0);
    /// ```
    const NEG_ONE: Self;
    /// π.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(<f32 as Real>::PI, core::f32::consts::PI);
    /// ```
    const PI: Self;
    /// Machine epsilon, `2⁻²³` for `f32` and `2⁻⁵²` for `f64`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(<f32 as Real>::EPSILON, 2.0_f32.powi(-23));
    /// ```
    const EPSILON: Self;
    /// The largest finite value.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(<f64 as Real>::MAX, f64::MAX);
    /// ```
    const MAX: Self;
    /// The smallest positive normal value.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(<f32 as Real>::MIN_POSITIVE, 2.0_f32.powi(-126));
    /// ```
    const MIN_POSITIVE: Self;
    /// Positive infinity.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert!(!Real::is_finite(<f32 as Real>::INFINITY));
    /// ```
    const INFINITY: Self;
    /// Number of significand bits, including the implicit one (24 or 53).
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!((<f32 as Real>::MANTISSA_DIGITS, <f64 as Real>::MANTISSA_DIGITS), (24, 53));
    /// ```
    const MANTISSA_DIGITS: u32;

    /// Speed of light `c` in m/s, rounded to `Self` (299 792 448 in `f32`).
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(<f32 as Real>::SPEED_OF_LIGHT, 299_792_448.0);
    /// ```
    const SPEED_OF_LIGHT: Self;
    /// High part of `c` in m/s: `c = C_HI + C_LO` exactly (`C_LO = 0` in `f64`).
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(f64::from(<f32 as Real>::C_HI) + f64::from(<f32 as Real>::C_LO), 299_792_458.0);
    /// ```
    const C_HI: Self;
    /// Low part of `c` in m/s: 10 in `f32`, 0 in `f64`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!((<f32 as Real>::C_LO, <f64 as Real>::C_LO), (10.0, 0.0));
    /// ```
    const C_LO: Self;
    /// `1/c` in s/m, correctly rounded to `Self`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(<f64 as Real>::INV_SPEED_OF_LIGHT, 1.0 / 299_792_458.0);
    /// ```
    const INV_SPEED_OF_LIGHT: Self;
    /// Elementary charge `e` in C.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(<f64 as Real>::ELEMENTARY_CHARGE, fourforce::consts::ELEMENTARY_CHARGE);
    /// ```
    const ELEMENTARY_CHARGE: Self;
    /// Electron rest energy in eV (CODATA 2018).
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(<f32 as Real>::ELECTRON_REST_ENERGY, fourforce::consts::ELECTRON_REST_ENERGY as f32);
    /// ```
    const ELECTRON_REST_ENERGY: Self;
    /// Proton rest energy in eV (CODATA 2018).
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(<f32 as Real>::PROTON_REST_ENERGY, fourforce::consts::PROTON_REST_ENERGY as f32);
    /// ```
    const PROTON_REST_ENERGY: Self;
    /// Neutron rest energy in eV (CODATA 2018).
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(<f32 as Real>::NEUTRON_REST_ENERGY, fourforce::consts::NEUTRON_REST_ENERGY as f32);
    /// ```
    const NEUTRON_REST_ENERGY: Self;
    /// Muon rest energy in eV (CODATA 2018).
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(<f32 as Real>::MUON_REST_ENERGY, fourforce::consts::MUON_REST_ENERGY as f32);
    /// ```
    const MUON_REST_ENERGY: Self;
    /// Deuteron rest energy in eV (CODATA 2018).
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(<f32 as Real>::DEUTERON_REST_ENERGY, fourforce::consts::DEUTERON_REST_ENERGY as f32);
    /// ```
    const DEUTERON_REST_ENERGY: Self;
    /// Triton rest energy in eV (CODATA 2018).
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(<f32 as Real>::TRITON_REST_ENERGY, fourforce::consts::TRITON_REST_ENERGY as f32);
    /// ```
    const TRITON_REST_ENERGY: Self;
    /// Helion rest energy in eV (CODATA 2018).
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(<f32 as Real>::HELION_REST_ENERGY, fourforce::consts::HELION_REST_ENERGY as f32);
    /// ```
    const HELION_REST_ENERGY: Self;
    /// Alpha-particle rest energy in eV (CODATA 2018).
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(<f32 as Real>::ALPHA_REST_ENERGY, fourforce::consts::ALPHA_REST_ENERGY as f32);
    /// ```
    const ALPHA_REST_ENERGY: Self;
    /// Atomic mass constant energy equivalent in eV (CODATA 2018).
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(<f64 as Real>::ATOMIC_MASS_UNIT_ENERGY, fourforce::consts::ATOMIC_MASS_UNIT_ENERGY);
    /// ```
    const ATOMIC_MASS_UNIT_ENERGY: Self;
    /// Electron mass in atomic mass units (CODATA 2018).
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(<f64 as Real>::ELECTRON_RELATIVE_MASS, fourforce::consts::ELECTRON_RELATIVE_MASS);
    /// ```
    const ELECTRON_RELATIVE_MASS: Self;

    /// Rounds an `f64` to `Self`; meant for literals and constants, which fold at compile time.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(<f32 as Real>::from_f64(0.1), 0.1_f32);
    /// ```
    fn from_f64(x: f64) -> Self;
    /// Widens (or keeps) to `f64`; for host-side comparisons, not for the `f32` hot path.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(Real::to_f64(0.5_f32), 0.5_f64);
    /// ```
    fn to_f64(self) -> f64;
    /// Converts a step count or other integer exactly where it fits in the significand.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(<f32 as Real>::from_u32(16_777_216), 16_777_216.0);
    /// ```
    fn from_u32(n: u32) -> Self;
    /// Converts a signed integer, rounding where it does not fit in the significand.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(<f64 as Real>::from_i32(-3), -3.0);
    /// ```
    fn from_i32(n: i32) -> Self;
    /// Square root, correctly rounded; NaN below zero.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(Real::sqrt(2.25_f32), 1.5);
    /// assert!(Real::sqrt(-1.0_f32).is_nan());
    /// ```
    fn sqrt(self) -> Self;
    /// `sqrt(self² + other²)` without undue overflow or underflow.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(Real::hypot(3.0e30_f32, 4.0e30), 5.0e30);
    /// ```
    fn hypot(self, other: Self) -> Self;
    /// Absolute value.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(Real::abs(-2.5_f32), 2.5);
    /// ```
    fn abs(self) -> Self;
    /// Fused multiply-add `self * a + b` with one rounding.
    ///
    /// Through `libm::fmaf`/`fma`: on a Cortex-M, `fmaf` computes in software `f64`, which pulls
    /// soft-double code into an `f32` image. The crate itself never calls it on an `f32` path
    /// (exact products use Dekker's splitting instead; see the firmware check).
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(Real::mul_add(2.0_f64, 3.0, 1.0), 7.0);
    /// ```
    fn mul_add(self, a: Self, b: Self) -> Self;
    /// Sine (radians).
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(Real::sin(0.0_f64), 0.0);
    /// ```
    fn sin(self) -> Self;
    /// Cosine (radians).
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(Real::cos(0.0_f32), 1.0);
    /// ```
    fn cos(self) -> Self;
    /// Tangent (radians).
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert!((Real::tan(core::f64::consts::FRAC_PI_4) - 1.0).abs() < 1e-15);
    /// ```
    fn tan(self) -> Self;
    /// Sine and cosine together (radians), in the working precision only: in `f32` a reduction
    /// by `π/2` held in three `f32` parts (Cody and Waite) and polynomials on `[−π/4, π/4]`
    /// (S. L. Moshier's Cephes `sinf`/`cosf` coefficients), within 2 ulp for `|x| ≤ 8192` and
    /// `(NaN, NaN)` beyond, where the reduction would lose the phase; libm's `sinf`/`cosf`
    /// compute in `f64`, which a single-precision FPU emulates in software. In `f64`, libm's
    /// `sin` and `cos`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// // sin 0.5 = 0.479425538604203, cos 0.5 = 0.8775825618903728 (Python's math module, f64)
    /// let (s, c) = Real::sin_cos(0.5_f32);
    /// assert!((f64::from(s) / 0.479_425_538_604_203 - 1.0).abs() <= 2.0 * f64::from(f32::EPSILON));
    /// assert!((f64::from(c) / 0.877_582_561_890_372_8 - 1.0).abs() <= 2.0 * f64::from(f32::EPSILON));
    /// assert!(Real::sin_cos(1.0e4_f32).0.is_nan()); // beyond 8192 rad
    /// ```
    fn sin_cos(self) -> (Self, Self);
    /// Arcsine, in radians.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(Real::asin(1.0_f64), core::f64::consts::FRAC_PI_2);
    /// ```
    fn asin(self) -> Self;
    /// Arccosine, in radians.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(Real::acos(1.0_f32), 0.0);
    /// ```
    fn acos(self) -> Self;
    /// Arctangent, in radians.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(Real::atan(1.0_f64), core::f64::consts::FRAC_PI_4);
    /// ```
    fn atan(self) -> Self;
    /// Four-quadrant arctangent of `self / x`, in radians.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(Real::atan2(1.0_f64, -1.0), 3.0 * core::f64::consts::FRAC_PI_4);
    /// ```
    fn atan2(self, x: Self) -> Self;
    /// Hyperbolic sine.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(Real::sinh(0.0_f32), 0.0);
    /// ```
    fn sinh(self) -> Self;
    /// Hyperbolic cosine.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(Real::cosh(0.0_f32), 1.0);
    /// ```
    fn cosh(self) -> Self;
    /// Hyperbolic tangent.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(Real::tanh(f64::INFINITY), 1.0);
    /// ```
    fn tanh(self) -> Self;
    /// Inverse hyperbolic tangent.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(Real::atanh(0.0_f64), 0.0);
    /// ```
    fn atanh(self) -> Self;
    /// `eˣ`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(Real::exp(0.0_f32), 1.0);
    /// ```
    fn exp(self) -> Self;
    /// `eˣ - 1`, accurate near 0.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(Real::exp_m1(1.0e-20_f64), 1.0e-20);
    /// ```
    fn exp_m1(self) -> Self;
    /// Natural logarithm.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(Real::ln(1.0_f32), 0.0);
    /// ```
    fn ln(self) -> Self;
    /// `ln(1 + x)`, accurate near 0.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(Real::ln_1p(1.0e-20_f64), 1.0e-20);
    /// ```
    fn ln_1p(self) -> Self;
    /// Round half away from zero.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!((Real::round(2.5_f32), Real::round(-2.5_f32)), (3.0, -3.0));
    /// ```
    fn round(self) -> Self;
    /// Largest integer not above `self`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(Real::floor(-0.5_f64), -1.0);
    /// ```
    fn floor(self) -> Self;
    /// `|self|` with the sign of `sign`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(Real::copysign(2.0_f32, -0.0), -2.0);
    /// ```
    fn copysign(self, sign: Self) -> Self;
    /// True unless infinite or NaN.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert!(Real::is_finite(f32::MAX) && !Real::is_finite(f32::NAN));
    /// ```
    fn is_finite(self) -> bool;
    /// True for NaN.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert!(Real::is_nan(f64::NAN) && !Real::is_nan(f64::INFINITY));
    /// ```
    fn is_nan(self) -> bool;
    /// True when the sign bit is set (also for -0.0 and negative NaN).
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert!(Real::is_sign_negative(-0.0_f32) && !Real::is_sign_negative(0.0_f32));
    /// ```
    fn is_sign_negative(self) -> bool;
    /// The smaller of two values (the other if one is NaN).
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(Real::min(f32::NAN, 1.0), 1.0);
    /// ```
    fn min(self, other: Self) -> Self;
    /// The larger of two values (the other if one is NaN).
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(Real::max(2.0_f64, f64::NAN), 2.0);
    /// ```
    fn max(self, other: Self) -> Self;
    /// The raw bits, widened to `u64`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(Real::to_bits_u64(1.0_f32), 0x3f80_0000);
    /// ```
    fn to_bits_u64(self) -> u64;
    /// The float with the raw bits `bits` (for `f32` their low 32), the inverse of
    /// [`to_bits_u64`](Self::to_bits_u64).
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(<f32 as Real>::from_bits_u64(0x3f80_0000), 1.0);
    /// assert_eq!(<f64 as Real>::from_bits_u64(2.5_f64.to_bits()), 2.5);
    /// ```
    fn from_bits_u64(bits: u64) -> Self;
    /// The binary exponent `e` with `2^e ≤ |self| < 2^(e+1)` (`libm::ilogbf`/`ilogb`; subnormals
    /// included; `i32::MIN` for 0 and NaN, `i32::MAX` for the infinities).
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!((Real::ilogb(8.0_f32), Real::ilogb(0.75_f64)), (3, -1));
    /// ```
    fn ilogb(self) -> i32;
    /// `self · 2^n`, exact unless the result overflows or falls into the subnormals
    /// (`libm::scalbnf`/`scalbn`).
    ///
    /// # Examples
    /// ```
    /// use fourforce::Real;
    /// assert_eq!(Real::scalbn(1.5_f32, 4), 24.0);
    /// ```
    fn scalbn(self, n: i32) -> Self;
}

// The `f32` square root: the FPU's `vsqrt.f32` on hard-float Arm targets (through the crate
// `fourforce-fpu`, which holds the one inline-assembly block so that this crate stays free of
// `unsafe`), the integer routine `sqrtf_integer` on the other Arm targets (software floats: libm's
// `sqrtf` multiplies 64-bit integers there, about 580 instructions on a Cortex-M0 against about
// 75), `libm::sqrtf` everywhere else. All three are correctly rounded, so the results are
// bit-identical (checked on the emulated Cortex-M4F and Cortex-M0 by the firmware example, and
// against libm on the host by the tests below).
#[cfg(all(target_arch = "arm", target_abi = "eabihf"))]
use fourforce_fpu::sqrtf;
#[cfg(not(target_arch = "arm"))]
use libm::sqrtf;
#[cfg(all(target_arch = "arm", not(target_abi = "eabihf")))]
use sqrtf_integer as sqrtf;

/// First guesses of `1/√f` for `f = i/32`, `i = 32 .. 128` (`f` in [1, 4)), at the middle of each
/// interval, in units of 2⁻¹⁵: `round(2¹⁵ / √((i + ½)/32)) = round(√(2³⁶ / (2i + 1)))`.
// Evaluated at compile time: an index out of range would fail the build, never panic on a chip.
#[allow(clippy::indexing_slicing)]
const RSQRT_GUESS: [u16; 96] = {
    let mut table = [0u16; 96];
    let mut k = 0;
    while k < 96 {
        // ⌊√(2³⁸ / (2i + 1))⌋ by integer Newton from above, then halved with rounding.
        let n = (1u64 << 38) / (2 * (k as u64 + 32) + 1);
        let mut r = n;
        let mut next = (r + n / r) / 2;
        while next < r {
            r = next;
            next = (r + n / r) / 2;
        }
        table[k] = r.div_ceil(2) as u16;
        k += 1;
    }
    table
};

/// `√x` in `f32`, correctly rounded (round to nearest, ties to even: bit-identical to libm's
/// `sqrtf` on every input but the payload of a NaN), in 32-bit integer arithmetic only.
///
/// For chips without a floating-point unit, where every float operation is a software routine
/// and libm's `sqrtf` multiplies 64-bit integers (a library call on a Cortex-M0). With the
/// significand `a` in [2²⁴, 2²⁶) (the exponent made even), `q = ⌊√(a·2²⁴)⌋` has 25 bits and the
/// result's significand is `(q + 1)/2` rounded down (a tie is impossible: `a·2²⁴` is even, never an
/// odd square). `q` comes from a table of `1/√f` (7 bits), one Newton step for `1/√f` (14 bits),
/// `h ≈ √f` from it, and one Newton step for `√f` whose residual `16a − h²` is exact in 32 bits;
/// the last one or two units are settled by the exact remainder `a·2²⁴ − q²`, which is small
/// enough to be computed modulo 2³².
#[cfg_attr(
    not(all(target_arch = "arm", not(target_abi = "eabihf"))),
    allow(dead_code)
)]
fn sqrtf_integer(x: f32) -> f32 {
    let bits = x.to_bits();
    if bits.wrapping_sub(1) >= 0x7f7f_ffff {
        // ±0, negative numbers, infinity and NaN (`bits − 1` wraps for +0).
        return if bits & 0x7fff_ffff == 0 || bits == 0x7f80_0000 {
            x
        } else {
            f32::NAN
        };
    }
    // Positive, finite, non-zero: the significand m with its leading bit at 2²³, the exponent e.
    let mut exponent = (bits >> 23) as i32;
    let mut m = bits & 0x007f_ffff;
    if exponent == 0 {
        // Subnormal: normalise.
        let shift = m.leading_zeros() - 8;
        m <<= shift;
        exponent = 1 - shift as i32;
    } else {
        m |= 0x0080_0000;
    }
    // x = m · 2^(exponent − 150); with e = exponent − 127 odd, a = 4m and e − 1; else a = 2m.
    let e = exponent - 127;
    let a = if e & 1 == 0 { m << 1 } else { m << 2 };
    let half_e = e >> 1; // ⌊e/2⌋: the exponent of the result
    // f = a / 2²⁴ in [1, 4); fq = f in units of 2⁻¹⁴ (a's low ten bits dropped).
    let fq = a >> 10;
    let index = ((fq >> 9) as usize).wrapping_sub(32);
    let y0 = u32::from(RSQRT_GUESS.get(index).copied().unwrap_or(1 << 14));
    // One Newton step for y ≈ 1/√f (units of 2⁻¹⁵): y ← y (3 − f y²) / 2.
    let fy2 = fq * ((y0 * y0) >> 16); // f y² in units of 2⁻²⁸, near 2²⁸
    let y1 = (y0 * (((3 << 28) - fy2) >> 14)) >> 15;
    // h ≈ √f = f · (1/√f) in units of 2⁻¹⁴, then one Newton step for √f with the exact residual
    // f − h² (units of 2⁻²⁸; |16a − h²| < 2¹⁹) and 1/(2h) from y: q ≈ √(a·2²⁴) = √f · 2²⁴.
    let h = (fq * y1) >> 15;
    let residual = (a << 4) as i32 - (h * h) as i32;
    let correction = ((residual >> 4) * y1 as i32) >> 16;
    let mut q = ((h << 10) as i32 + correction) as u32;
    // The exact remainder a·2²⁴ − q² (|·| < 2²⁸, so modulo 2³² is exact), and the last units.
    let mut remainder = (a << 24).wrapping_sub(q.wrapping_mul(q)) as i32;
    while remainder < 0 {
        q -= 1;
        remainder += (2 * q + 1) as i32;
    }
    while remainder > (2 * q) as i32 {
        remainder -= (2 * q + 1) as i32;
        q += 1;
    }
    // Round: the significand (q + 1)/2 in [2²³, 2²⁴] (2²⁴ carries into the exponent).
    let significand = (q + 1) >> 1;
    f32::from_bits((((half_e + 126) as u32) << 23) + significand)
}

/// `(sin x, cos x)` in `f32` arithmetic only; see [`Real::sin_cos`].
fn sin_cos_f32(x: f32) -> (f32, f32) {
    // π/2 = P1 + P2 + P3: P1 with 8 significant bits and P2 with 11, so that j·P1 and j·P2 are
    // exact for j < 2¹³ (|x| ≤ 8192); their sum is π/2 to 2e-15.
    const P1: f32 = 1.570_312_5;
    const P2: f32 = 4.837_512_969_970_703e-4;
    const P3: f32 = 7.549_790_126_404_332e-8;
    // (NaN fails the comparison too)
    if x.abs()
        .partial_cmp(&8192.0)
        .is_none_or(core::cmp::Ordering::is_gt)
    {
        return (f32::NAN, f32::NAN);
    }
    let j = (x * core::f32::consts::FRAC_2_PI + libm::copysignf(0.5, x)) as i32;
    let jf = j as f32;
    let r = ((x - jf * P1) - jf * P2) - jf * P3;
    let z = r * r;
    // Cephes sinf and cosf (S. L. Moshier), minimax on [−π/4, π/4]
    let s = ((-1.951_529_589_1e-4 * z + 8.332_160_873_6e-3) * z - 1.666_665_461_1e-1) * z * r + r;
    let c = ((2.443_315_711_809_948e-5 * z - 1.388_731_625_493_765e-3) * z
        + 4.166_664_568_298_827e-2)
        * z
        * z
        - 0.5 * z
        + 1.0;
    match j & 3 {
        0 => (s, c),
        1 => (c, -s),
        2 => (-s, -c),
        _ => (-c, s),
    }
}

/// `(sin x, cos x)` through libm; see [`Real::sin_cos`].
fn sin_cos_f64(x: f64) -> (f64, f64) {
    (libm::sin(x), libm::cos(x))
}

macro_rules! impl_real {
    ($t:ident, $bits:ty, $digits:expr, $c_hi:expr, $c_lo:expr, $sin_cos:path,
     $sqrt:path, $hypot:ident, $fabs:ident, $fma:ident, $sin:ident, $cos:ident, $tan:ident,
     $asin:ident, $acos:ident, $atan:ident, $atan2:ident, $sinh:ident, $cosh:ident,
     $tanh:ident, $atanh:ident, $exp:ident, $expm1:ident, $log:ident, $log1p:ident,
     $round:ident, $floor:ident, $copysign:ident, $fmin:ident, $fmax:ident, $ilogb:ident,
     $scalbn:ident) => {
        impl Real for $t {
            const ZERO: Self = 0.0;
            const ONE: Self = 1.0;
            const TWO: Self = 2.0;
            const HALF: Self = 0.5;
            const NEG_ONE: Self = -1.0;
            const PI: Self = core::$t::consts::PI;
            const EPSILON: Self = $t::EPSILON;
            const MAX: Self = $t::MAX;
            const MIN_POSITIVE: Self = $t::MIN_POSITIVE;
            const INFINITY: Self = $t::INFINITY;
            const MANTISSA_DIGITS: u32 = $digits;

            const SPEED_OF_LIGHT: Self = consts::SPEED_OF_LIGHT as $t;
            const C_HI: Self = $c_hi;
            const C_LO: Self = $c_lo;
            const INV_SPEED_OF_LIGHT: Self = (1.0 / consts::SPEED_OF_LIGHT) as $t;
            const ELEMENTARY_CHARGE: Self = consts::ELEMENTARY_CHARGE as $t;
            const ELECTRON_REST_ENERGY: Self = consts::ELECTRON_REST_ENERGY as $t;
            const PROTON_REST_ENERGY: Self = consts::PROTON_REST_ENERGY as $t;
            const NEUTRON_REST_ENERGY: Self = consts::NEUTRON_REST_ENERGY as $t;
            const MUON_REST_ENERGY: Self = consts::MUON_REST_ENERGY as $t;
            const DEUTERON_REST_ENERGY: Self = consts::DEUTERON_REST_ENERGY as $t;
            const TRITON_REST_ENERGY: Self = consts::TRITON_REST_ENERGY as $t;
            const HELION_REST_ENERGY: Self = consts::HELION_REST_ENERGY as $t;
            const ALPHA_REST_ENERGY: Self = consts::ALPHA_REST_ENERGY as $t;
            const ATOMIC_MASS_UNIT_ENERGY: Self = consts::ATOMIC_MASS_UNIT_ENERGY as $t;
            const ELECTRON_RELATIVE_MASS: Self = consts::ELECTRON_RELATIVE_MASS as $t;

            #[inline(always)]
            fn from_f64(x: f64) -> Self {
                x as $t
            }
            #[inline(always)]
            fn to_f64(self) -> f64 {
                self as f64
            }
            #[inline(always)]
            fn from_u32(n: u32) -> Self {
                n as $t
            }
            #[inline(always)]
            fn from_i32(n: i32) -> Self {
                n as $t
            }
            #[inline(always)]
            fn sqrt(self) -> Self {
                $sqrt(self)
            }
            #[inline(always)]
            fn hypot(self, other: Self) -> Self {
                libm::$hypot(self, other)
            }
            #[inline(always)]
            fn abs(self) -> Self {
                libm::$fabs(self)
            }
            #[inline(always)]
            fn mul_add(self, a: Self, b: Self) -> Self {
                libm::$fma(self, a, b)
            }
            #[inline(always)]
            fn sin(self) -> Self {
                libm::$sin(self)
            }
            #[inline(always)]
            fn cos(self) -> Self {
                libm::$cos(self)
            }
            #[inline(always)]
            fn tan(self) -> Self {
                libm::$tan(self)
            }
            #[inline(always)]
            fn sin_cos(self) -> (Self, Self) {
                $sin_cos(self)
            }
            #[inline(always)]
            fn asin(self) -> Self {
                libm::$asin(self)
            }
            #[inline(always)]
            fn acos(self) -> Self {
                libm::$acos(self)
            }
            #[inline(always)]
            fn atan(self) -> Self {
                libm::$atan(self)
            }
            #[inline(always)]
            fn atan2(self, x: Self) -> Self {
                libm::$atan2(self, x)
            }
            #[inline(always)]
            fn sinh(self) -> Self {
                libm::$sinh(self)
            }
            #[inline(always)]
            fn cosh(self) -> Self {
                libm::$cosh(self)
            }
            #[inline(always)]
            fn tanh(self) -> Self {
                libm::$tanh(self)
            }
            #[inline(always)]
            fn atanh(self) -> Self {
                libm::$atanh(self)
            }
            #[inline(always)]
            fn exp(self) -> Self {
                libm::$exp(self)
            }
            #[inline(always)]
            fn exp_m1(self) -> Self {
                libm::$expm1(self)
            }
            #[inline(always)]
            fn ln(self) -> Self {
                libm::$log(self)
            }
            #[inline(always)]
            fn ln_1p(self) -> Self {
                libm::$log1p(self)
            }
            #[inline(always)]
            fn round(self) -> Self {
                libm::$round(self)
            }
            #[inline(always)]
            fn floor(self) -> Self {
                libm::$floor(self)
            }
            #[inline(always)]
            fn copysign(self, sign: Self) -> Self {
                libm::$copysign(self, sign)
            }
            #[inline(always)]
            fn is_finite(self) -> bool {
                $t::is_finite(self)
            }
            #[inline(always)]
            fn is_nan(self) -> bool {
                $t::is_nan(self)
            }
            #[inline(always)]
            fn is_sign_negative(self) -> bool {
                $t::is_sign_negative(self)
            }
            #[inline(always)]
            fn min(self, other: Self) -> Self {
                libm::$fmin(self, other)
            }
            #[inline(always)]
            fn max(self, other: Self) -> Self {
                libm::$fmax(self, other)
            }
            #[inline(always)]
            fn to_bits_u64(self) -> u64 {
                self.to_bits() as u64
            }
            #[inline(always)]
            fn from_bits_u64(bits: u64) -> Self {
                $t::from_bits(bits as $bits)
            }
            #[inline(always)]
            fn ilogb(self) -> i32 {
                libm::$ilogb(self)
            }
            #[inline(always)]
            fn scalbn(self, n: i32) -> Self {
                libm::$scalbn(self, n)
            }
        }
    };
}

impl_real!(
    f32,
    u32,
    24,
    consts::C_F32_HI,
    consts::C_F32_LO,
    sin_cos_f32,
    sqrtf,
    hypotf,
    fabsf,
    fmaf,
    sinf,
    cosf,
    tanf,
    asinf,
    acosf,
    atanf,
    atan2f,
    sinhf,
    coshf,
    tanhf,
    atanhf,
    expf,
    expm1f,
    logf,
    log1pf,
    roundf,
    floorf,
    copysignf,
    fminf,
    fmaxf,
    ilogbf,
    scalbnf
);
impl_real!(
    f64,
    u64,
    53,
    consts::SPEED_OF_LIGHT,
    0.0,
    sin_cos_f64,
    libm::sqrt,
    hypot,
    fabs,
    fma,
    sin,
    cos,
    tan,
    asin,
    acos,
    atan,
    atan2,
    sinh,
    cosh,
    tanh,
    atanh,
    exp,
    expm1,
    log,
    log1p,
    round,
    floor,
    copysign,
    fmin,
    fmax,
    ilogb,
    scalbn
);

/// Returns `Ok(x)` when `x` is finite, else [`Error::NonFinite`](crate::Error::NonFinite).
///
/// The common first check of every constructor that takes numbers from outside.
///
/// # Examples
/// ```
/// use fourforce::{try_finite, Error};
/// assert_eq!(try_finite(1.5_f32), Ok(1.5));
/// assert_eq!(try_finite(f32::NAN), Err(Error::NonFinite));
/// ```
#[inline]
pub fn try_finite<T: Real>(x: T) -> Result<T, crate::Error> {
    if x.is_finite() {
        Ok(x)
    } else {
        Err(crate::Error::NonFinite)
    }
}

/// `Ok(x)` for a finite computed `x`, else [`Error::Overflow`](crate::Error::Overflow): the check
/// on every computed result (an input is checked by [`try_finite`]).
#[inline]
pub(crate) fn fits<T: Real>(x: T) -> Result<T, crate::Error> {
    if x.is_finite() {
        Ok(x)
    } else {
        Err(crate::Error::Overflow)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The integer square root against libm's `sqrtf`, bit for bit. The routine depends on the
    /// significand and the parity of the exponent only (the exponent itself is halved), so
    /// [1, 4), two binades of every significand with both parities, covers every path of the
    /// normal numbers exhaustively; every subnormal, every 97th bit pattern over the whole range
    /// and the edges cover the rest.
    #[test]
    fn integer_sqrt_is_libms_bit_for_bit() {
        let check = |bits: u32| {
            let x = f32::from_bits(bits);
            let (got, want) = (sqrtf_integer(x), libm::sqrtf(x));
            assert!(
                got.to_bits() == want.to_bits() || (got.is_nan() && want.is_nan()),
                "sqrt({x:e}) = {got:e}, libm {want:e}"
            );
        };
        for bits in 1.0_f32.to_bits()..4.0_f32.to_bits() {
            check(bits);
        }
        for bits in 0..=0x0080_0000 {
            check(bits);
        }
        for bits in (0..=u32::MAX).step_by(97) {
            check(bits);
        }
        for x in [
            0.0,
            -0.0,
            f32::MAX,
            f32::INFINITY,
            -1.0,
            f32::NEG_INFINITY,
            f32::NAN,
        ] {
            check(x.to_bits());
        }
    }

    /// The f32 sine and cosine against libm's f64 ones at the same (exact) argument: within 2 ulp
    /// of the result, plus the reduction's 2e-15 per multiple of π/2 near the zeros; NaN beyond
    /// 8192 and for non-finite input.
    #[test]
    fn f32_sin_cos_within_two_ulp() {
        extern crate std;
        let mut worst: f64 = 0.0;
        let mut x = 1.0e-30_f32;
        let mut check = |x: f32| {
            for x in [x, -x] {
                let (s, c) = sin_cos_f32(x);
                let xd = f64::from(x);
                for (got, exact) in [(s, xd.sin()), (c, xd.cos())] {
                    let ulp = f64::from(f32::EPSILON) * exact.abs();
                    let reduction = 2.0e-15 * (xd.abs() / 1.5).ceil();
                    let ratio = ((f64::from(got) - exact).abs() - reduction).max(0.0) / ulp;
                    worst = worst.max(ratio);
                }
            }
        };
        while x < 8192.0 {
            check(x);
            x = f32::from_bits(x.to_bits() + 1009);
        }
        check(8192.0);
        std::println!("f32 sin_cos: worst {worst:.2} ulp");
        assert!(worst <= 2.0, "{worst}");
        assert!(sin_cos_f32(8192.1).0.is_nan() && sin_cos_f32(f32::NAN).1.is_nan());
        assert!(sin_cos_f32(f32::INFINITY).0.is_nan());
        assert_eq!(sin_cos_f32(0.0), (0.0, 1.0));
    }

    #[test]
    fn c_split_is_exact_in_both_precisions() {
        // SI 2019: c = 299 792 458 m/s exactly.
        assert_eq!(f64::from(f32::C_HI) + f64::from(f32::C_LO), 299_792_458.0);
        assert_eq!(f64::C_HI + f64::C_LO, 299_792_458.0);
        assert_eq!(f32::SPEED_OF_LIGHT, 299_792_448.0);
    }

    #[test]
    fn f32_constants_round_once() {
        // The nearest f32 values to the CODATA 2018 rest energies (rounded with mpmath).
        assert_eq!(f32::ELECTRON_REST_ENERGY, 510_998.94_f32);
        assert_eq!(f64::from(f32::PROTON_REST_ENERGY), 938_272_064.0);
    }
}
