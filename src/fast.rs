//! A fast, coarse `f32` path through micromath's square-root estimate (feature `micromath`).
//!
//! Every square root of the crate is correctly rounded: `libm::sqrtf`, a software routine on a chip
//! without an FPU square root (about 575 instructions on a Cortex-M0), or the FPU's `vsqrt.f32` on
//! hard-float Arm targets (on a Cortex-M4F the exact path is then already the cheaper one). This
//! module offers separately named functions that replace it with micromath's bit-level estimate
//! (one integer add and shift, always high, by at most 6.07 %) refined by one Newton step
//! `y ← (y + x / y) / 2`, which brings the error to at most 1.74e-3 relative (still high).
//! Everything else (the arithmetic, the formulas that avoid cancellation) is the same as in
//! [`Motion`](crate::Motion).
//!
//! # For firmware authors
//! Nothing here replaces or changes any other function of the crate: the feature only adds this
//! module, so enabling it anywhere in a dependency graph changes no existing result. You choose
//! the fast path by calling these functions by name. Use it where 0.2 % is enough (displays,
//! coarse interlocks, first guesses); keep [`Motion`](crate::Motion) for set points.
//!
//! Promised bounds, checked over a dense sweep against `f64` (every species constant, kinetic
//! energies from 1 meV to 1 PeV; `checks/tests/suite/fast.rs`), in `eps` = 2⁻²³ relative:
//!
//! | function | bound (eps) | bound (relative) |
//! | --- | --- | --- |
//! | [`sqrt`] | 14 600 | 1.74e-3 |
//! | [`try_momentum`] | 14 600 | 1.74e-3 |
//! | [`try_beta`] | 14 600 | 1.74e-3 |
//! | [`try_speed`] | 14 600 | 1.74e-3 |
//! | [`try_magnetic_rigidity`] | 14 600 | 1.74e-3 |
//! | [`try_flight_time`] | 14 600 | 1.74e-3 |
//!
//! The Lorentz factor needs no square root (`γ = 1 + T/m`): use
//! [`Motion::gamma`](crate::Motion::gamma).
//!
//! # Examples
//! ```
//! use fourforce::{Species, fast};
//! // A 2 MeV proton: β = 0.065 188 68 (mpmath, 50 digits, CODATA 2018 rest energy).
//! let beta = fast::try_beta(Species::<f32>::PROTON, 2.0e6)?;
//! assert!((beta / 0.065_188_68 - 1.0).abs() < 2.0e-3);
//! # Ok::<(), fourforce::Error>(())
//! ```

use micromath::F32Ext;

use crate::{Error, Real, Species};

/// Square root through micromath's estimate and one Newton step: at most 1.74e-3 high.
///
/// `x ≥ 0`; returns 0 for `x = 0`, NaN for `x < 0` or NaN, and infinity for infinity. The result
/// is high (never below the root by more than the last rounding, 1 eps) and `sqrt(x) ≤ 1` for
/// every `x ≤ 1`.
///
/// # Examples
/// ```
/// let r = fourforce::fast::sqrt(2.0);
/// assert!(r >= core::f32::consts::SQRT_2 && r < 1.0018 * core::f32::consts::SQRT_2);
/// ```
#[must_use]
#[inline]
pub fn sqrt(x: f32) -> f32 {
    if x > 0.0 {
        let y = F32Ext::sqrt(x);
        // One Newton step from above stays above the root and below `y`.
        0.5 * (y + x / y)
    } else if x == 0.0 {
        0.0
    } else {
        f32::NAN
    }
}

/// Checks the input shared by every function, a finite, non-negative kinetic energy (eV), and
/// returns it with the rest energy (a [`Species`] always has a finite one of at least 1 eV).
#[inline]
fn checked(species: Species<f32>, kinetic_energy_ev: f32) -> Result<(f32, f32), Error> {
    let t = crate::try_finite(kinetic_energy_ev)?;
    if t < 0.0 {
        return Err(Error::NegativeEnergy);
    }
    Ok((t, species.rest_energy()))
}

/// Momentum `pc = √(T (T + 2m))` in eV from the kinetic energy `T` (eV), fast and coarse.
///
/// At most 1.74e-3 high (see the module table); 0 at `T = 0`.
///
/// # Errors
/// [`Error::NonFinite`] for a NaN or infinite `T`; [`Error::NegativeEnergy`] for `T < 0`;
/// [`Error::Overflow`] when `T (T + 2m)` overflows `f32` (T above about 1.8e19 eV).
///
/// # Examples
/// ```
/// use fourforce::{Species, fast};
/// // A 1 MeV electron: pc = 1.421 970 MeV (mpmath, 50 digits, CODATA 2018 rest energy).
/// let pc = fast::try_momentum(Species::<f32>::ELECTRON, 1.0e6)?;
/// assert!((pc / 1.421_970e6 - 1.0).abs() < 2.0e-3);
/// # Ok::<(), fourforce::Error>(())
/// ```
#[inline]
pub fn try_momentum(species: Species<f32>, kinetic_energy_ev: f32) -> Result<f32, Error> {
    let (t, m) = checked(species, kinetic_energy_ev)?;
    let pc2 = t * (t + 2.0 * m);
    if !pc2.is_finite() {
        return Err(Error::Overflow);
    }
    Ok(sqrt(pc2))
}

/// Speed `β = v/c = √(T (T + 2m)) / (T + m)` from the kinetic energy `T` (eV), fast and coarse.
///
/// Computed as the root of the ratio `T (T + 2m) / (T + m)²`, which is below 1, so `β ≤ 1`
/// always (`β` rounds to 1 far above the rest energy). At most 1.74e-3 high; 0 at `T = 0`.
///
/// # Errors
/// As [`try_momentum`].
///
/// # Examples
/// ```
/// use fourforce::{Species, fast};
/// // A 1 MeV electron: β = 0.941 079 (mpmath, 50 digits, CODATA 2018 rest energy).
/// let b = fast::try_beta(Species::<f32>::ELECTRON, 1.0e6)?;
/// assert!((b / 0.941_079 - 1.0).abs() < 2.0e-3 && b <= 1.0);
/// # Ok::<(), fourforce::Error>(())
/// ```
#[inline]
pub fn try_beta(species: Species<f32>, kinetic_energy_ev: f32) -> Result<f32, Error> {
    let (t, m) = checked(species, kinetic_energy_ev)?;
    let e = t + m;
    let ratio = (t / e) * ((t + 2.0 * m) / e);
    Ok(sqrt(ratio))
}

/// Speed `v = β c` in m/s from the kinetic energy `T` (eV), fast and coarse.
///
/// At most 1.74e-3 high, never above `c`; 0 at `T = 0`.
///
/// # Errors
/// As [`try_momentum`].
///
/// # Examples
/// ```
/// use fourforce::{Species, fast};
/// // A 2 MeV proton: v = 1.954 307e7 m/s (mpmath, 50 digits, CODATA 2018 rest energy).
/// let v = fast::try_speed(Species::<f32>::PROTON, 2.0e6)?;
/// assert!((v / 1.954_307e7 - 1.0).abs() < 2.0e-3);
/// # Ok::<(), fourforce::Error>(())
/// ```
#[inline]
pub fn try_speed(species: Species<f32>, kinetic_energy_ev: f32) -> Result<f32, Error> {
    // (The f32 constant c is 10 m/s short, 3e-8: far below this path's 1.7e-3.)
    Ok(try_beta(species, kinetic_energy_ev)? * <f32 as Real>::SPEED_OF_LIGHT)
}

/// Magnetic rigidity `Bρ = pc / (c |Q|)` in T m from the kinetic energy `T` (eV), fast and coarse.
///
/// The magnitude, whatever the sign of the charge. At most 1.74e-3 high; 0 at `T = 0`.
///
/// # Errors
/// As [`try_momentum`], and [`Error::ZeroCharge`] for a neutral species.
///
/// # Examples
/// ```
/// use fourforce::{Species, fast};
/// // A 2 MeV proton: Bρ = 0.204 458 T m (mpmath, 50 digits, CODATA 2018 rest energy).
/// let brho = fast::try_magnetic_rigidity(Species::<f32>::PROTON, 2.0e6)?;
/// assert!((brho / 0.204_458 - 1.0).abs() < 2.0e-3);
/// # Ok::<(), fourforce::Error>(())
/// ```
#[inline]
pub fn try_magnetic_rigidity(species: Species<f32>, kinetic_energy_ev: f32) -> Result<f32, Error> {
    let q = species.charge().abs();
    if q == 0.0 {
        return Err(Error::ZeroCharge);
    }
    let pc = try_momentum(species, kinetic_energy_ev)?;
    Ok(pc * <f32 as Real>::INV_SPEED_OF_LIGHT / q)
}

/// Time of flight `t = L / (β c)` in s over `length_m` metres from the kinetic energy `T` (eV),
/// fast and coarse.
///
/// At most 1.74e-3 short (β is high), and never shorter than light needs (`β ≤ 1`).
///
/// # Errors
/// As [`try_momentum`]; [`Error::NonFinite`] for a non-finite length; [`Error::NonPositiveLength`]
/// for `length_m ≤ 0`; [`Error::Overflow`] when the time does not fit in `f32`, which includes
/// `T = 0` (the particle never arrives).
///
/// # Examples
/// ```
/// use fourforce::{Species, fast};
/// // A 2 MeV proton over 1.5 m: t = 76.754 ns (mpmath, 50 digits, CODATA 2018 rest energy).
/// let t = fast::try_flight_time(Species::<f32>::PROTON, 2.0e6, 1.5)?;
/// assert!((t / 76.754e-9 - 1.0).abs() < 2.0e-3);
/// # Ok::<(), fourforce::Error>(())
/// ```
#[inline]
pub fn try_flight_time(
    species: Species<f32>,
    kinetic_energy_ev: f32,
    length_m: f32,
) -> Result<f32, Error> {
    let length = crate::try_finite(length_m)?;
    if length <= 0.0 {
        return Err(Error::NonPositiveLength);
    }
    let b = try_beta(species, kinetic_energy_ev)?;
    crate::real::fits(length * <f32 as Real>::INV_SPEED_OF_LIGHT / b)
}
