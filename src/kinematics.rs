//! One state of motion of a particle, built from any one measured quantity and read as all of them.
//!
//! A [`Motion`] holds, for one [`Species`], the kinetic energy and every quantity derived from it
//! (`γ`, `γ − 1`, `β`, `1 − β`, `βγ`, `pc`, total energy), each computed once, at construction, by
//! a formula free of cancellation. Build it from whichever quantity the instrument gives: kinetic
//! or total energy, `γ`, `β`, `βγ`, momentum, magnetic rigidity `Bρ`, electric rigidity `Eρ`,
//! speed, or a time of flight over a known length. Read any of the others without loss.
//!
//! # Units
//! Energies and momenta in eV (momentum as `pc` in eV, so "eV/c"), with `_kev`, `_mev`, `_gev`
//! helpers; `Bρ` in T m; `Eρ` in V; speed in m/s; time in s; lengths in m. The charge `Q` of the
//! species is in units of `e`; rigidities use `|Q|` and are positive.
//!
//! # Precision
//! Every formula adds positive terms only (`γ − 1 = T/m`, `pc = √(T(T + 2m))`,
//! `1 − β = (m/E)(m/(E + pc))`, ...), never `γ − 1` from a stored `γ` nor `1 − β` by
//! subtraction. A speed in m/s is compared with `c` held as the exact two-part sum
//! `C_HI + C_LO` (`c` itself is 10 m/s off in `f32`), and a flight time uses an exact product
//! `c·t` before subtracting the length.
//!
//! The promise: every quantity within 8 eps of the exact value (relative error, eps = `2⁻²³`
//! for `f32`, `2⁻⁵²` for `f64`), for every species and every kinetic energy from 1 eV to
//! 100 TeV, when the input is exact in the precision. It is checked two ways: against 50-digit
//! mpmath references (`checks/tests/reference/`, CODATA 2018: the ten named species and three
//! custom ions, 16 kinetic energies per decade, and states built from every other quantity), and,
//! for `f32`, against the `f64` path on every 1024th `f32` input of each constructor for an
//! electron, a proton and an alpha (`ci/exhaustive`). The measured figures are in
//! `docs/accuracy.md`.
//!
//! Conditioning that no formula removes: a state built from `γ`, `β`, a speed or a flight time
//! is exact for the value given, but an error already in that value (a rounded measurement) is
//! amplified by `γ/(γ − 1)` (from `γ`) or `β²γ²` (from `β` and speed) in the energies. A state
//! built from the total energy inherits the rounding of the rest energy itself, amplified by
//! `m/T`: exact for `T ≳ m`, noisy for `T ≪ m` (there, give the kinetic energy).
//!
//! # For firmware authors
//! Construction costs one or two square roots and a handful of divisions; every accessor is a
//! field read (the rigidities and the speed cost one or two multiplications). Build the state
//! once per set point and read it many times. In `f32` keep the state and read what you need: a
//! relativistic `β` rounds to 1 in `f32` long before `1 − β` loses a digit here.
//!
//! # Examples
//! ```
//! use fourforce::{Motion, Species};
//! // A 250 MeV proton of an invented therapy line: B rho = 2.4321284387 T m (mpmath, CODATA 2018).
//! let p = Motion::try_from_kinetic_energy(Species::<f32>::PROTON, 250.0e6)?;
//! assert!((p.try_magnetic_rigidity()? / 2.432_128_4 - 1.0).abs() < 4.0 * f32::EPSILON);
//! // The same state from the rigidity the magnet was set to.
//! let q = Motion::try_from_magnetic_rigidity(Species::<f32>::PROTON, p.try_magnetic_rigidity()?)?;
//! assert!((q.kinetic_energy() / 250.0e6 - 1.0).abs() < 8.0 * f32::EPSILON);
//! # Ok::<(), fourforce::Error>(())
//! ```

use crate::compensated::two_prod;
use crate::real::fits;
use crate::{Error, FourVector, Real, Species, ThreeVector};

/// The state of motion of one particle of a [`Species`]: kinetic energy and everything derived.
///
/// Every field is computed once by a cancellation-free formula; the accessors read them. All
/// constructors check their input and return a typed [`Error`]; none panics and none lets a NaN
/// through.
///
/// # Examples
/// ```
/// use fourforce::{Motion, Species};
/// let e = Motion::try_from_kinetic_energy(Species::<f64>::ELECTRON, 1.0e6)?;
/// assert!((e.beta() - 0.941_079_228_027_340_13).abs() < 1e-15); // mpmath, CODATA 2018
/// # Ok::<(), fourforce::Error>(())
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Motion<T: Real> {
    species: Species<T>,
    kinetic: T,
    gamma_minus_one: T,
    gamma: T,
    total: T,
    momentum: T,
    beta_gamma: T,
    beta: T,
    one_minus_beta: T,
}

/// `x · c` with `c = C_HI + C_LO` (exact in both parts), so `f32` is not 10 m/s off.
#[inline]
fn times_c<T: Real>(x: T) -> T {
    x * T::C_HI + x * T::C_LO
}

/// `x / c` as `x · (1/c)`; `1/c` is within 0.2 eps of exact in both precisions.
#[inline]
fn over_c<T: Real>(x: T) -> T {
    x * T::INV_SPEED_OF_LIGHT
}

/// `x ≤ 0` for a finite `x`, from its bits (a floating-point comparison is a library call on a
/// chip without an FPU).
#[inline(always)]
fn not_positive<T: Real>(x: T) -> bool {
    x.is_sign_negative() || x.to_bits_u64() == 0
}

/// `c·t` with one rounding (and a relative error below 2⁻³⁵ besides), cheaper than the exact
/// product: `c = C_A + C_B` with `C_A` of at most half the significand's bits (12 of 24 in
/// `f32`, 26 of 53 in `f64`), `t = t_hi + t_lo` with `t_hi` the leading 12 (26) bits of `t`, cut
/// from its bits, and `t_lo = t − t_hi` exact, so that `C_A·t_hi` and `C_A·t_lo` are exact and only
/// the small `C_B·t` (2⁻¹³ of `c t` in `f32`, 2⁻²⁷ in `f64`) rounds before the one rounding of the
/// sum. For a finite `t ≥ 0`.
#[inline]
fn c_times_rounded_once<T: Real>(t: T) -> T {
    let (c_a, c_b, low_bits) = if T::MANTISSA_DIGITS <= 24 {
        (T::from_f64(299_761_664.0), T::from_f64(30_794.0), 12)
    } else {
        (T::from_f64(299_792_456.0), T::from_f64(2.0), 27)
    };
    let hi = T::from_bits_u64(t.to_bits_u64() & !((1_u64 << low_bits) - 1));
    c_a * hi + (c_a * (t - hi) + c_b * t)
}

/// `β` from `pc/E`, or from `1 − (1 − β)` once `1 − β < 1/4`: there the subtraction is exact to
/// half an ulp, never reaches 1 through rounding, and is monotonic in the energy.
#[inline]
fn beta_from<T: Real>(ratio: T, one_minus_beta: T) -> T {
    if one_minus_beta < T::from_f64(0.25) {
        T::ONE - one_minus_beta
    } else {
        ratio
    }
}

/// Turns `-0.0` into `+0.0` so no negative zero leaks into the state.
#[inline]
fn unsigned_zero<T: Real>(x: T) -> T {
    if x == T::ZERO { T::ZERO } else { x }
}

impl<T: Real> Motion<T> {
    /// The state of a particle at rest, `const` so that a `static` can hold it.
    ///
    /// `T = 0`, `γ = 1`, `β = 0`, `1 − β = 1`, `pc = 0`, `E = m`; the flight times are `+∞`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// static SOURCE: Motion<f32> = Motion::at_rest(Species::PROTON);
    /// assert_eq!(SOURCE.gamma(), 1.0);
    /// assert_eq!(SOURCE.total_energy(), Species::<f32>::PROTON.rest_energy());
    /// ```
    #[must_use]
    pub const fn at_rest(species: Species<T>) -> Self {
        Self {
            species,
            kinetic: T::ZERO,
            gamma_minus_one: T::ZERO,
            gamma: T::ONE,
            total: species.rest_energy(),
            momentum: T::ZERO,
            beta_gamma: T::ZERO,
            beta: T::ZERO,
            one_minus_beta: T::ONE,
        }
    }

    /// Builds the state from the kinetic energy `T` in eV.
    ///
    /// The reference constructor: every quantity within 8 eps from 1 eV to 100 TeV (the
    /// [Precision](self#precision) promise).
    ///
    /// `γ − 1 = T/m`, `E = T + m`, `pc = √(T(T + 2m))`, `βγ = pc/m`, `β = pc/E`,
    /// `1 − β = (m/E)(m/(E + pc))`. `T = 0` is a particle at rest (`β = 0`, flight time
    /// infinite).
    ///
    /// # Errors
    /// [`Error::NonFinite`] for NaN or infinity; [`Error::NegativeEnergy`] for `T < 0`;
    /// [`Error::Overflow`] when `T(T + 2m)` does not fit the precision (above about 1.8e19 eV in
    /// `f32`).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, Motion, Species};
    /// let e = Motion::try_from_kinetic_energy(Species::<f32>::ELECTRON, 1.0)?;
    /// // gamma - 1 of a 1 eV electron: 1.9569511835591834e-6 (mpmath, CODATA 2018).
    /// assert!((e.gamma_minus_one() / 1.956_951_2e-6 - 1.0).abs() < 2.0 * f32::EPSILON);
    /// assert_eq!(
    ///     Motion::try_from_kinetic_energy(Species::<f32>::ELECTRON, -1.0),
    ///     Err(Error::NegativeEnergy)
    /// );
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_from_kinetic_energy(species: Species<T>, kinetic_ev: T) -> Result<Self, Error> {
        let t = unsigned_zero(crate::try_finite(kinetic_ev)?);
        if t < T::ZERO {
            return Err(Error::NegativeEnergy);
        }
        let m = species.rest_energy();
        let total = t + m;
        let momentum = fits((t * (t + (m + m))).sqrt())?;
        let gamma_minus_one = t / m;
        let one_minus_beta = (m / total) * (m / (total + momentum));
        Ok(Self {
            species,
            kinetic: t,
            gamma_minus_one,
            gamma: T::ONE + gamma_minus_one,
            total,
            momentum,
            beta_gamma: momentum / m,
            beta: beta_from(momentum / total, one_minus_beta),
            one_minus_beta,
        })
    }

    /// Builds the state from the kinetic energy in keV.
    ///
    /// Multiplies by 1000 (one rounding) and calls
    /// [`try_from_kinetic_energy`](Self::try_from_kinetic_energy).
    ///
    /// # Errors
    /// As [`try_from_kinetic_energy`](Self::try_from_kinetic_energy); [`Error::Overflow`] also
    /// when the energy in eV does not fit the precision.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// let e = Motion::try_from_kinetic_energy_kev(Species::<f64>::ELECTRON, 10.0)?;
    /// assert!((e.speed() - 58_455_214.927_781_732).abs() < 1e-6); // mpmath, CODATA 2018
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_from_kinetic_energy_kev(species: Species<T>, kinetic_kev: T) -> Result<Self, Error> {
        // A finite energy whose eV value overflows is too large, not non-finite.
        let t = crate::try_finite(kinetic_kev)?;
        Self::try_from_kinetic_energy(species, fits(t * T::from_f64(1.0e3))?)
    }

    /// Builds the state from the kinetic energy in MeV.
    ///
    /// Multiplies by 10⁶ (one rounding) and calls
    /// [`try_from_kinetic_energy`](Self::try_from_kinetic_energy).
    ///
    /// # Errors
    /// As [`try_from_kinetic_energy`](Self::try_from_kinetic_energy); [`Error::Overflow`] also
    /// when the energy in eV does not fit the precision.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// let p = Motion::try_from_kinetic_energy_mev(Species::<f64>::PROTON, 1000.0)?;
    /// assert!((p.gamma() - 2.065_788_924_789_451_7).abs() < 1e-15); // mpmath, CODATA 2018
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_from_kinetic_energy_mev(species: Species<T>, kinetic_mev: T) -> Result<Self, Error> {
        // A finite energy whose eV value overflows is too large, not non-finite.
        let t = crate::try_finite(kinetic_mev)?;
        Self::try_from_kinetic_energy(species, fits(t * T::from_f64(1.0e6))?)
    }

    /// Builds the state from the kinetic energy in GeV.
    ///
    /// Multiplies by 10⁹ (one rounding) and calls
    /// [`try_from_kinetic_energy`](Self::try_from_kinetic_energy).
    ///
    /// # Errors
    /// As [`try_from_kinetic_energy`](Self::try_from_kinetic_energy); [`Error::Overflow`] also
    /// when the energy in eV does not fit the precision.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// let e = Motion::try_from_kinetic_energy_gev(Species::<f64>::ELECTRON, 10.0)?;
    /// // 1 - beta = 1.3054662135760086e-9 (mpmath, CODATA 2018)
    /// assert!((e.one_minus_beta() / 1.305_466_213_576_008_6e-9 - 1.0).abs() < 1e-15);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_from_kinetic_energy_gev(species: Species<T>, kinetic_gev: T) -> Result<Self, Error> {
        // A finite energy whose eV value overflows is too large, not non-finite.
        let t = crate::try_finite(kinetic_gev)?;
        Self::try_from_kinetic_energy(species, fits(t * T::from_f64(1.0e9))?)
    }

    /// Builds the state from the total energy `E = T + m` in eV.
    ///
    /// Accuracy: every quantity within 8 eps of the exact state from 1 eV to 100 TeV, for an
    /// input exact in the precision (the [Precision](self#precision) promise) beyond the inherited term below.
    ///
    /// `T = E − m` (exact in floating point for `E ≤ 2m`), then as
    /// [`try_from_kinetic_energy`](Self::try_from_kinetic_energy), keeping `γ = E/m`.
    /// Conditioning: the rest energy is itself rounded to the precision (up to 0.43 eps in
    /// `f32`), and `E − m` amplifies that by `m/T`; the result is within the bound for `T ≥ m/2`
    /// and loses digits below (give the kinetic energy there).
    ///
    /// # Errors
    /// [`Error::NonFinite`]; [`Error::BelowRestEnergy`] for `E < m`; [`Error::Overflow`] as for
    /// the kinetic energy.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, Motion, Species};
    /// // A proton of 7 TeV total energy: p c = 6999999.9371175346 MeV (mpmath, CODATA 2018).
    /// let p = Motion::try_from_total_energy(Species::<f64>::PROTON, 7.0e12)?;
    /// assert!((p.momentum() / 6_999_999.937_117_534_6e6 - 1.0).abs() < 4e-16);
    /// assert_eq!(
    ///     Motion::try_from_total_energy(Species::<f64>::PROTON, 1.0e6),
    ///     Err(Error::BelowRestEnergy)
    /// );
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_from_total_energy(species: Species<T>, total_ev: T) -> Result<Self, Error> {
        let e = crate::try_finite(total_ev)?;
        let m = species.rest_energy();
        if e < m {
            return Err(Error::BelowRestEnergy);
        }
        let mut state = Self::try_from_kinetic_energy(species, e - m)?;
        state.total = e;
        state.gamma = e / m;
        Ok(state)
    }

    /// Builds the state from the Lorentz factor `γ`.
    ///
    /// Accuracy: every quantity within 8 eps of the exact state from 1 eV to 100 TeV, for an
    /// input exact in the precision (the [Precision](self#precision) promise).
    ///
    /// `γ − 1` (exact in floating point for `γ ≤ 2`), `βγ = √((γ − 1)(γ + 1))`, `β = βγ/γ`,
    /// `1 − β = 1/(γ(γ + βγ))`, `T = (γ − 1) m`. Exact for the `γ` given; an error already in
    /// `γ` is amplified by `γ/(γ − 1)` in `T` (5e5 for a 1 eV electron), by `1/(β²)` in `β`.
    ///
    /// # Errors
    /// [`Error::NonFinite`]; [`Error::BelowRestEnergy`] for `γ < 1`; [`Error::Overflow`] when
    /// `(γ − 1)(γ + 1)` or `T` does not fit.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// let p = Motion::try_from_gamma(Species::<f64>::PROTON, 1.25)?;
    /// assert!((p.beta() - 0.6).abs() < 2e-16);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_from_gamma(species: Species<T>, gamma: T) -> Result<Self, Error> {
        let g = crate::try_finite(gamma)?;
        if g < T::ONE {
            return Err(Error::BelowRestEnergy);
        }
        let g1 = g - T::ONE;
        let bg = fits((g1 * (g + T::ONE)).sqrt())?;
        let one_minus_beta = T::ONE / g / (g + bg);
        Self::from_parts(
            species,
            g1,
            g,
            bg,
            beta_from(bg / g, one_minus_beta),
            one_minus_beta,
        )
    }

    /// Builds the state from `β = v/c`.
    ///
    /// Accuracy: every quantity within 8 eps of the exact state from 1 eV to 100 TeV, for an
    /// input exact in the precision (the [Precision](self#precision) promise).
    ///
    /// `d = 1 − β² = (1 − β)(1 + β)` (with `1 − β` exact in floating point for `β ≥ 1/2`, and
    /// `1 − β·β` below), `γ = 1/√d`, `γ − 1 = β²/(√d + d)`, `βγ = β γ`: no cancellation
    /// anywhere. Exact for the `β` given; an error already in `β`
    /// is amplified by `β²γ²` in `γ` (in `f32`, `β` cannot even tell apart the `γ` above 2896).
    ///
    /// # Errors
    /// [`Error::NonFinite`]; [`Error::NegativeMagnitude`] for `β < 0`;
    /// [`Error::SpeedNotBelowLight`] for `β ≥ 1`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, Motion, Species};
    /// let p = Motion::try_from_beta(Species::<f32>::PROTON, 0.6)?;
    /// assert!((p.gamma() - 1.25).abs() < 2.0 * f32::EPSILON);
    /// assert_eq!(Motion::try_from_beta(Species::<f32>::PROTON, 1.0), Err(Error::SpeedNotBelowLight));
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_from_beta(species: Species<T>, beta: T) -> Result<Self, Error> {
        let b = unsigned_zero(crate::try_finite(beta)?);
        if b < T::ZERO {
            return Err(Error::NegativeMagnitude);
        }
        if b >= T::ONE {
            return Err(Error::SpeedNotBelowLight);
        }
        Self::from_beta_parts(species, b, T::ONE - b)
    }

    /// The state from `β` and `1 − β`, both given accurately and `0 ≤ β < 1`.
    fn from_beta_parts(species: Species<T>, beta: T, one_minus_beta: T) -> Result<Self, Error> {
        // d = 1 − β² = (1 − β)(1 + β): from the exact 1 − β once β ≥ 1/2, else 1 − β·β (no
        // cancellation there). s = √d = 1/γ, and γ − 1 = β²/(s(1 + s)) = β²/(s + d): sums of
        // positive terms only.
        let bb = beta * beta;
        // β < ½ from the bits (β ≥ 0: their order is the values').
        if beta.to_bits_u64() < T::HALF.to_bits_u64() {
            let d = T::ONE - bb;
            let s = d.sqrt();
            let g1 = bb / (s + d);
            let gamma = T::ONE + g1;
            Self::from_parts(species, g1, gamma, beta * gamma, beta, one_minus_beta)
        } else {
            let d = one_minus_beta * (T::ONE + beta);
            let s = d.sqrt();
            let g1 = bb / (s + d);
            let gamma = T::ONE / s;
            Self::from_parts(species, g1, gamma, beta * gamma, beta, one_minus_beta)
        }
    }

    /// The state from `γ − 1`, `γ`, `βγ`, `β` and `1 − β`, each already free of cancellation;
    /// the energies follow by one multiplication by the rest energy each.
    fn from_parts(
        species: Species<T>,
        gamma_minus_one: T,
        gamma: T,
        beta_gamma: T,
        beta: T,
        one_minus_beta: T,
    ) -> Result<Self, Error> {
        let m = species.rest_energy();
        Ok(Self {
            species,
            kinetic: fits(gamma_minus_one * m)?,
            gamma_minus_one,
            gamma: fits(gamma)?,
            total: fits(gamma * m)?,
            momentum: fits(beta_gamma * m)?,
            beta_gamma,
            beta,
            one_minus_beta,
        })
    }

    /// Builds the state from `βγ = pc/m` (the spatial part of the four-velocity, in units of c).
    ///
    /// Accuracy: every quantity within 8 eps of the exact state from 1 eV to 100 TeV, for an
    /// input exact in the precision (the [Precision](self#precision) promise).
    ///
    /// `γ = √(1 + (βγ)²)`, `γ − 1 = βγ · βγ/(γ + 1)`, `β = βγ/γ`, `1 − β = 1/(γ(γ + βγ))`.
    /// Well conditioned everywhere (condition ≤ 1 for every quantity).
    ///
    /// # Errors
    /// [`Error::NonFinite`]; [`Error::NegativeMagnitude`] for `βγ < 0`; [`Error::Overflow`] when
    /// `(βγ)²` or the energies do not fit.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// let p = Motion::try_from_beta_gamma(Species::<f64>::PROTON, 0.75)?;
    /// assert!((p.gamma() - 1.25).abs() < 2e-16);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_from_beta_gamma(species: Species<T>, beta_gamma: T) -> Result<Self, Error> {
        let bg = unsigned_zero(crate::try_finite(beta_gamma)?);
        if bg < T::ZERO {
            return Err(Error::NegativeMagnitude);
        }
        let gamma = fits((T::ONE + bg * bg).sqrt())?;
        let g1 = bg * (bg / (gamma + T::ONE));
        let one_minus_beta = T::ONE / gamma / (gamma + bg);
        let beta = beta_from(bg / gamma, one_minus_beta);
        Self::from_parts(species, g1, gamma, bg, beta, one_minus_beta)
    }

    /// Builds the state from the momentum `pc` in eV (momentum in eV/c).
    ///
    /// Accuracy: every quantity within 8 eps of the exact state from 1 eV to 100 TeV, for an
    /// input exact in the precision (the [Precision](self#precision) promise).
    ///
    /// `E = √((pc)² + m²)`, `T = pc · pc/(E + m)`, `β = pc/E`, `1 − β = (m/E)(m/(E + pc))`.
    /// Well conditioned everywhere.
    ///
    /// # Errors
    /// [`Error::NonFinite`]; [`Error::NegativeMagnitude`] for `pc < 0`; [`Error::Overflow`] when
    /// `(pc)²` does not fit (above about 1.8e19 eV in `f32`).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// // A proton of momentum exactly 7 TeV/c: B rho = 23349.486663870643 T m (mpmath, CODATA 2018).
    /// let p = Motion::try_from_momentum(Species::<f64>::PROTON, 7.0e12)?;
    /// assert!((p.try_magnetic_rigidity()? / 23_349.486_663_870_643 - 1.0).abs() < 4e-16);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_from_momentum(species: Species<T>, momentum_ev: T) -> Result<Self, Error> {
        let pc = unsigned_zero(crate::try_finite(momentum_ev)?);
        if pc < T::ZERO {
            return Err(Error::NegativeMagnitude);
        }
        let m = species.rest_energy();
        let total = fits((pc * pc + m * m).sqrt())?;
        Self::from_momentum_and_total(species, pc, total)
    }

    /// The state from `pc` and `E = √((pc)² + m²)`, both accurate and finite.
    fn from_momentum_and_total(species: Species<T>, pc: T, total: T) -> Result<Self, Error> {
        let t = pc * (pc / (total + species.rest_energy()));
        Ok(Self::from_energies(species, t, total, pc))
    }

    /// The state from `T`, `E` and `pc`, all accurate and finite: `γ − 1 = T/m`; `γ = E/m` above
    /// `T = m`, else `1 + (γ − 1)` (the more accurate of the two there);
    /// `1 − β = (m/E)·(m/(E + pc))`.
    fn from_energies(species: Species<T>, t: T, total: T, pc: T) -> Self {
        let m = species.rest_energy();
        let g1 = t / m;
        let one_minus_beta = (m / total) * (m / (total + pc));
        Self {
            species,
            kinetic: t,
            gamma_minus_one: g1,
            gamma: if t > m { total / m } else { T::ONE + g1 },
            total,
            momentum: pc,
            beta_gamma: pc / m,
            beta: beta_from(pc / total, one_minus_beta),
            one_minus_beta,
        }
    }

    /// Builds the state from the momentum in SI units, kg m/s.
    ///
    /// `pc [eV] = p · (c/e)`, one multiplication by the folded constant
    /// `c/e = 1.871 157 e27` (exact `c` and `e`, SI 2019); nothing is squared in SI, so an `f32`
    /// momentum of a 1 eV electron (5.4e-25 kg m/s) neither underflows nor loses digits.
    ///
    /// # Errors
    /// As [`try_from_momentum`](Self::try_from_momentum).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// let e = Motion::try_from_kinetic_energy(Species::<f32>::ELECTRON, 1.0)?;
    /// let back = Motion::try_from_momentum_si(Species::<f32>::ELECTRON, e.momentum_si())?;
    /// assert!((back.kinetic_energy() - 1.0).abs() < 8.0 * f32::EPSILON);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_from_momentum_si(
        species: Species<T>,
        momentum_kg_m_per_s: T,
    ) -> Result<Self, Error> {
        let p = crate::try_finite(momentum_kg_m_per_s)?;
        // c / e in (eV/c) per (kg m/s), from exact c and e (SI 2019), mpmath 50 digits.
        Self::try_from_momentum(species, fits(p * T::from_f64(1.871_157_347_061_897_0e27))?)
    }

    /// Builds the state from the magnetic rigidity `Bρ = p/q` in T m.
    ///
    /// Accuracy: every quantity within 8 eps of the exact state from 1 eV to 100 TeV, for an
    /// input exact in the precision (the [Precision](self#precision) promise).
    ///
    /// `pc [eV] = Bρ · c · |Q|` (with `c = C_HI + C_LO` exact and the product with `C_HI` exact,
    /// so `pc` carries one rounding), then as
    /// [`try_from_momentum`](Self::try_from_momentum).
    ///
    /// # Errors
    /// [`Error::NonFinite`]; [`Error::ZeroCharge`] for a neutral species;
    /// [`Error::NegativeMagnitude`] for `Bρ < 0`; [`Error::Overflow`].
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, Motion, Species};
    /// let p = Motion::try_from_magnetic_rigidity(Species::<f64>::PROTON, 2.432_128_438_725_504_4)?;
    /// assert!((p.kinetic_energy() / 250.0e6 - 1.0).abs() < 1e-15); // mpmath, CODATA 2018
    /// let n = Species::try_new(939.565_420_52e6, 0.0)?;
    /// assert_eq!(Motion::try_from_magnetic_rigidity(n, 1.0), Err(Error::ZeroCharge));
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_from_magnetic_rigidity(species: Species<T>, brho_tm: T) -> Result<Self, Error> {
        let brho = crate::try_finite(brho_tm)?;
        let q = nonzero_charge(species)?;
        if brho < T::ZERO {
            return Err(Error::NegativeMagnitude);
        }
        // pc = (Bρ |Q|) · c with c = C_HI + C_LO and the product x · C_HI exact (Dekker), so pc
        // carries one rounding, not three.
        // (An overflowing product is caught by `fits`: two_prod's error term is 0, not NaN, then.)
        let x = brho * q;
        let (p, e) = two_prod(x, T::C_HI);
        Self::try_from_momentum(species, fits(p + (e + x * T::C_LO))?)
    }

    /// Builds the state from the electric rigidity `Eρ = pv/q` in V.
    ///
    /// Accuracy: every quantity within 8 eps of the exact state from 1 eV to 100 TeV, for an
    /// input exact in the precision (the [Precision](self#precision) promise).
    ///
    /// With `w = Eρ · |Q| = pc·β = (pc)²/E`, solved without cancellation:
    /// `E = (w + √(w² + 4m²))/2`, `pc = √(w E)`, `T = w E/(E + m)`. Well conditioned
    /// everywhere (`w ≈ 2T` at low energy, `≈ T` at high energy).
    ///
    /// # Errors
    /// [`Error::NonFinite`]; [`Error::ZeroCharge`]; [`Error::NegativeMagnitude`] for `Eρ < 0`;
    /// [`Error::Overflow`] when `w²` or `4m²` does not fit.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// // An alpha of 5 MeV: E rho = 4996650.9299730097 V (mpmath, CODATA 2018).
    /// let a = Motion::try_from_electric_rigidity(Species::<f64>::ALPHA, 4_996_650.929_973_009_7)?;
    /// assert!((a.kinetic_energy() / 5.0e6 - 1.0).abs() < 1e-15);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_from_electric_rigidity(species: Species<T>, erho_v: T) -> Result<Self, Error> {
        let erho = unsigned_zero(crate::try_finite(erho_v)?);
        let q = nonzero_charge(species)?;
        if erho < T::ZERO {
            return Err(Error::NegativeMagnitude);
        }
        let w = erho * q;
        let m = species.rest_energy();
        let two_m = m + m;
        let total = fits((w + (w * w + two_m * two_m).sqrt()) * T::HALF)?;
        let pc = fits((w * total).sqrt())?;
        Ok(Self::from_energies(
            species,
            w * (total / (total + m)),
            total,
            pc,
        ))
    }

    /// Builds the state from the speed `v` in m/s.
    ///
    /// Accuracy: every quantity within 8 eps of the exact state from 1 eV to 100 TeV, for an
    /// input exact in the precision (the [Precision](self#precision) promise).
    ///
    /// `c − v = (C_HI − v) + C_LO` (exact near `c`: `c` is held as an exact two-part sum, so
    /// `f32` is not 10 m/s off), `1 − β = (c − v)/c`, `β = v/c`, then as
    /// [`try_from_beta`](Self::try_from_beta). Exact for the speed given; an error already in
    /// `v` is amplified by `β²γ²` in `γ`.
    ///
    /// # Errors
    /// [`Error::NonFinite`]; [`Error::NegativeMagnitude`] for `v < 0`;
    /// [`Error::SpeedNotBelowLight`] for `v ≥ c` (in `f32` the largest accepted speed is
    /// 299 792 448 m/s, 10 m/s below `c`); [`Error::Overflow`] for a speed so small that `β = v/c`
    /// underflows to zero (below about 4e-37 m/s in `f32`).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// // v = 299792160 m/s (exact in f32): gamma = 709.2303786 (mpmath), the textbook f32 formula
    /// // gives 724.08.
    /// let e = Motion::try_from_speed(Species::<f32>::ELECTRON, 299_792_160.0)?;
    /// assert!((e.gamma() / 709.230_378_6 - 1.0).abs() < 4.0 * f32::EPSILON);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_from_speed(species: Species<T>, speed_m_per_s: T) -> Result<Self, Error> {
        let v = unsigned_zero(crate::try_finite(speed_m_per_s)?);
        if v < T::ZERO {
            return Err(Error::NegativeMagnitude);
        }
        let lag = (T::C_HI - v) + T::C_LO;
        if lag <= T::ZERO {
            return Err(Error::SpeedNotBelowLight);
        }
        let beta = over_c(v);
        if beta == T::ZERO && v > T::ZERO {
            // A moving particle whose β underflows: it cannot be held as moving.
            return Err(Error::Overflow);
        }
        Self::from_beta_parts(species, beta, over_c(lag))
    }

    /// Builds the state from the time of flight `t` (s) over a length `L` (m).
    ///
    /// Accuracy: every quantity within 8 eps of the exact state from 1 eV to 100 TeV, for an
    /// input exact in the precision (the [Precision](self#precision) promise).
    ///
    /// `u = 1/β − 1 = (c t − L)/L`, where `c t − L` is formed from the exact product `c t`
    /// (Dekker's two-product, no fused multiply-add needed), then `β = 1/(1 + u)`,
    /// `1 − β = u/(1 + u)` (below `c/2`, where nothing cancels, `β = L/(c t)` with `c t` rounded
    /// once) and as [`try_from_beta`](Self::try_from_beta). Exact for the times given; an error already in
    /// `t` is amplified by `γ³β²/(γ − 1)` in `T` (6.3 for a 1 GeV proton, about `γ²` near `c`):
    /// one ulp of a 1 µs flight time is about 0.1 ps in `f32`.
    ///
    /// # Errors
    /// [`Error::NonFinite`]; [`Error::NonPositiveLength`] for `L ≤ 0` or `t ≤ 0`;
    /// [`Error::FasterThanLight`] for `c t ≤ L`; [`Error::Overflow`] for a time so long that `β`
    /// underflows to 0 (or `c t` overflows).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, Motion, Species};
    /// // A 1 GeV proton needs 3.8120493548822230 ns per metre (mpmath, CODATA 2018).
    /// let p = Motion::try_from_flight_time(Species::<f64>::PROTON, 10.0, 38.120_493_548_822_230e-9)?;
    /// assert!((p.kinetic_energy() / 1.0e9 - 1.0).abs() < 1e-14);
    /// assert_eq!(
    ///     Motion::try_from_flight_time(Species::<f64>::PROTON, 10.0, 30.0e-9),
    ///     Err(Error::FasterThanLight)
    /// );
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_from_flight_time(
        species: Species<T>,
        length_m: T,
        time_s: T,
    ) -> Result<Self, Error> {
        let l = crate::try_finite(length_m)?;
        let t = crate::try_finite(time_s)?;
        if not_positive(l) || not_positive(t) {
            return Err(Error::NonPositiveLength);
        }
        // Below c/2 (u > 1, c t > 2L) nothing cancels: β = L/(c t), two roundings; a time so
        // long that β underflows (or c t overflows) is refused.
        let ct = c_times_rounded_once(t);
        if ct > l + l {
            let beta = l / ct;
            if beta.to_bits_u64() == 0 {
                return Err(Error::Overflow);
            }
            return Self::from_beta_parts(species, beta, T::ONE - beta);
        }
        // From c/2 up: c t − L from the exact product c t (an overflowing c t makes u infinite
        // and β zero: refused).
        let (p, e) = two_prod(T::C_HI, t);
        let excess = ((p - l) + e) + t * T::C_LO;
        if excess <= T::ZERO {
            return Err(Error::FasterThanLight);
        }
        let u = excess / l;
        let one_plus_u = T::ONE + u;
        let beta = T::ONE / one_plus_u;
        if beta.to_bits_u64() == 0 {
            return Err(Error::Overflow);
        }
        Self::from_beta_parts(species, beta, u / one_plus_u)
    }

    /// The species this state belongs to.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// let a = Motion::try_from_kinetic_energy(Species::<f32>::ALPHA, 5.0e6)?;
    /// assert_eq!(a.species(), Species::ALPHA);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn species(&self) -> Species<T> {
        self.species
    }

    /// Kinetic energy `T` in eV.
    ///
    /// Exact when the state was built from it; otherwise see the constructor's conditioning.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// let p = Motion::try_from_beta_gamma(Species::<f64>::PROTON, 0.75)?;
    /// assert!((p.kinetic_energy() / (0.25 * 938.272_088_16e6) - 1.0).abs() < 1e-15);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn kinetic_energy(&self) -> T {
        self.kinetic
    }

    /// Kinetic energy in keV (`T / 1000`, one rounding more).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// let e = Motion::try_from_kinetic_energy(Species::<f64>::ELECTRON, 2500.0)?;
    /// assert_eq!(e.kinetic_energy_kev(), 2.5);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub fn kinetic_energy_kev(&self) -> T {
        self.kinetic * T::from_f64(1.0e-3)
    }

    /// Kinetic energy in MeV (`T / 10⁶`, one rounding more).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// let e = Motion::try_from_kinetic_energy(Species::<f64>::ELECTRON, 2.5e6)?;
    /// assert_eq!(e.kinetic_energy_mev(), 2.5);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub fn kinetic_energy_mev(&self) -> T {
        self.kinetic * T::from_f64(1.0e-6)
    }

    /// Kinetic energy in GeV (`T / 10⁹`, one rounding more).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// let e = Motion::try_from_kinetic_energy(Species::<f64>::PROTON, 7.0e12)?;
    /// assert_eq!(e.kinetic_energy_gev(), 7000.0);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub fn kinetic_energy_gev(&self) -> T {
        self.kinetic * T::from_f64(1.0e-9)
    }

    /// Total energy `E = T + m` in eV.
    ///
    /// Accuracy: within 8 eps from 1 eV to 100 TeV (the [Precision](self#precision)
    /// promise).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// let e = Motion::try_from_kinetic_energy(Species::<f64>::ELECTRON, 1.0e6)?;
    /// assert_eq!(e.total_energy(), 1.0e6 + 510_998.95);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn total_energy(&self) -> T {
        self.total
    }

    /// Lorentz factor `γ = E/m = 1 + T/m`.
    ///
    /// Accuracy: within 8 eps from 1 eV to 100 TeV (the [Precision](self#precision)
    /// promise).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// let p = Motion::try_from_kinetic_energy(Species::<f64>::PROTON, 250.0e6)?;
    /// assert!((p.gamma() - 1.266_447_231_197_362_9).abs() < 4e-16); // mpmath, CODATA 2018
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn gamma(&self) -> T {
        self.gamma
    }

    /// `γ − 1 = T/m`, held without cancellation (never formed from a stored `γ`).
    ///
    /// Accuracy: within 8 eps from 1 eV to 100 TeV (the [Precision](self#precision)
    /// promise).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// let p = Motion::try_from_kinetic_energy(Species::<f32>::PROTON, 1000.0)?;
    /// // 1.0657889247894517e-6 (mpmath); the textbook (T + m)/m - 1 in f32 is 0.7 % off.
    /// assert!((p.gamma_minus_one() / 1.065_788_9e-6 - 1.0).abs() < 2.0 * f32::EPSILON);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn gamma_minus_one(&self) -> T {
        self.gamma_minus_one
    }

    /// `β = v/c = pc/E`, in `[0, 1)` (it may round to 1 in `f32` above `γ ≈ 4096`; use
    /// [`one_minus_beta`](Self::one_minus_beta) there).
    ///
    /// Computed as `pc/E`, or as `1 − (1 − β)` once `1 − β < 1/4` (exact to half an ulp there,
    /// and monotonic). Accuracy: within 8 eps from 1 eV to 100 TeV (the [Precision](self#precision)
    /// promise).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// let p = Motion::try_from_kinetic_energy(Species::<f64>::PROTON, 1.0e9)?;
    /// assert!((p.beta() - 0.875_025_646_693_018_33).abs() < 3e-16); // mpmath, CODATA 2018
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn beta(&self) -> T {
        self.beta
    }

    /// `1 − β = m²/(E(E + pc))`, held without cancellation.
    ///
    /// Accuracy: within 8 eps from 1 eV to 100 TeV (the [Precision](self#precision)
    /// promise).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// let p = Motion::try_from_kinetic_energy(Species::<f32>::PROTON, 100.0e12)?;
    /// // 4.4016899571534549e-11 (mpmath, CODATA 2018); the textbook 1 - pc/E in f32 is negative.
    /// assert!((p.one_minus_beta() / 4.401_69e-11 - 1.0).abs() < 4.0 * f32::EPSILON);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn one_minus_beta(&self) -> T {
        self.one_minus_beta
    }

    /// `βγ = pc/m`, the spatial four-velocity in units of c.
    ///
    /// Accuracy: within 8 eps from 1 eV to 100 TeV (the [Precision](self#precision)
    /// promise).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// let e = Motion::try_from_kinetic_energy(Species::<f64>::ELECTRON, 1.0e6)?;
    /// assert!((e.beta_gamma() - 2.782_725_337_138_406_1).abs() < 2e-15); // mpmath, CODATA 2018
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn beta_gamma(&self) -> T {
        self.beta_gamma
    }

    /// The four-velocity `u = (γ, βγ n̂)` in units of c of this state moving along `direction`
    /// (any length; `n̂ = direction/|direction|`).
    ///
    /// `γ` and `βγ` are the state's own (within the bound of [Precision](self#precision)); the
    /// unit vector adds one rounding to each spatial component.
    ///
    /// # Errors
    /// [`Error::NonFinite`] for a non-finite direction; [`Error::ZeroDirection`] for a zero one
    /// (also at rest: a direction is always required).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FourVector, Motion, Species, ThreeVector};
    /// let p = Motion::try_from_gamma(Species::<f64>::PROTON, 1.25)?;
    /// let u = p.try_four_velocity(ThreeVector::new(0.0, 0.0, 3.0))?;
    /// assert_eq!(u, FourVector::new(1.25, 0.0, 0.0, p.beta_gamma()));
    /// assert!((u.norm_squared() - 1.0).abs() < 4.0 * f64::EPSILON);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[inline(always)]
    pub fn try_four_velocity(&self, direction: ThreeVector<T>) -> Result<FourVector<T>, Error> {
        let n = direction.try_unit()?;
        Ok(FourVector::from_parts(self.gamma, n * self.beta_gamma))
    }

    /// Momentum as `pc` in eV (so the momentum in eV/c): `√(T(T + 2m))`.
    ///
    /// Accuracy: within 8 eps from 1 eV to 100 TeV (the [Precision](self#precision)
    /// promise).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// let p = Motion::try_from_kinetic_energy(Species::<f64>::PROTON, 250.0e6)?;
    /// assert!((p.momentum() / 729.133_762_817_221_35e6 - 1.0).abs() < 4e-16); // mpmath
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn momentum(&self) -> T {
        self.momentum
    }

    /// Momentum in MeV/c (`pc / 10⁶`, one rounding more).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// let p = Motion::try_from_momentum(Species::<f64>::PROTON, 7.0e12)?;
    /// assert_eq!(p.momentum_mev(), 7.0e6);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub fn momentum_mev(&self) -> T {
        self.momentum * T::from_f64(1.0e-6)
    }

    /// Momentum in SI units, kg m/s: `pc [eV] · e/c`.
    ///
    /// One multiplication by the folded constant `e/c = 5.344 286e-28` (exact `c` and `e`, SI
    /// 2019), so nothing is squared in SI units: the 5.4e-25 kg m/s of a 1 eV electron stays at
    /// full precision in `f32`. Accuracy: within 8 eps from 1 eV to 100 TeV (the [Precision](self#precision)
    /// promise).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// let e = Motion::try_from_kinetic_energy(Species::<f32>::ELECTRON, 1.0)?;
    /// // 5.4027504e-25 kg m/s (mpmath from 1.0109396124398331e-3 MeV/c).
    /// assert!((e.momentum_si() / 5.402_750_4e-25 - 1.0).abs() < 1e-6);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub fn momentum_si(&self) -> T {
        // e / c in (kg m/s) per (eV/c), from exact c and e (SI 2019), mpmath 50 digits.
        self.momentum * T::from_f64(5.344_285_992_678_308e-28)
    }

    /// Speed `v = β c` in m/s, with `c = C_HI + C_LO` (exact in `f32` too).
    ///
    /// Accuracy: within 8 eps from 1 eV to 100 TeV (the [Precision](self#precision)
    /// promise).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// let e = Motion::try_from_kinetic_energy(Species::<f64>::ELECTRON, 1.0)?;
    /// assert!((e.speed() - 593_096.087_979_861_74).abs() < 1e-9); // mpmath, CODATA 2018
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub fn speed(&self) -> T {
        times_c(self.beta)
    }

    /// Time of flight per metre, `1/(β c)` in s/m; `+∞` at rest.
    ///
    /// `(E/c)/pc`, or `(1 + (1 − β)/β)/c` above `β = 3/4` (monotonic in the energy there);
    /// finite for every moving particle whose `1/(βc)` fits the precision.
    /// Accuracy: within 8 eps from 1 eV to 100 TeV (the [Precision](self#precision)
    /// promise).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// let p = Motion::try_from_kinetic_energy(Species::<f64>::PROTON, 1.0e9)?;
    /// assert!((p.flight_time_per_metre() / 3.812_049_354_882_223e-9 - 1.0).abs() < 4e-16);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub fn flight_time_per_metre(&self) -> T {
        if self.one_minus_beta < T::from_f64(0.25) {
            over_c(T::ONE + self.one_minus_beta / self.beta)
        } else {
            // (E/c)/pc, not (E/pc)/c: E/pc alone overflows f32 for β below about 1e-30, where
            // 1/(βc) still fits.
            over_c(self.total) / self.momentum
        }
    }

    /// Time of flight over `length_m` metres, in s: `L/(β c)`; `+∞` at rest (for `L > 0`).
    ///
    /// `L = 0` gives 0 (also at rest); a negative `L` gives a negative time; only a NaN `L`
    /// gives NaN.
    ///
    /// Accuracy: that of [`flight_time_per_metre`](Self::flight_time_per_metre) plus half an
    /// ulp for the product with `L`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// let p = Motion::try_from_kinetic_energy(Species::<f64>::PROTON, 1.0e9)?;
    /// assert!((p.flight_time(10.0) / 38.120_493_548_822_23e-9 - 1.0).abs() < 6e-16);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub fn flight_time(&self, length_m: T) -> T {
        if length_m == T::ZERO {
            // No distance, no time, even at rest (avoids 0 · ∞).
            return T::ZERO;
        }
        length_m * self.flight_time_per_metre()
    }

    /// Magnetic rigidity `Bρ = p/|q| = pc/(c |Q|)` in T m (positive whatever the sign of the
    /// charge).
    ///
    /// Accuracy: within 8 eps from 1 eV to 100 TeV (the [Precision](self#precision)
    /// promise).
    ///
    /// # Errors
    /// [`Error::ZeroCharge`] for a neutral species; [`Error::Overflow`] when the rigidity does
    /// not fit the precision (a charge far below e).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// let p = Motion::try_from_kinetic_energy(Species::<f64>::PROTON, 7.0e12)?;
    /// // 23352.616192946796 T m (mpmath, CODATA 2018)
    /// assert!((p.try_magnetic_rigidity()? / 23_352.616_192_946_796 - 1.0).abs() < 4e-16);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_magnetic_rigidity(&self) -> Result<T, Error> {
        let q = nonzero_charge(self.species)?;
        // `fits`: a charge far below e can put the rigidity beyond the precision.
        fits(over_c(self.momentum / q))
    }

    /// Electric rigidity `Eρ = pv/|q| = pc·β/|Q|` in V, computed as `(T + T·m/E)/|Q|`.
    ///
    /// That form adds two positive terms (no cancellation) and uses `T` directly; it is `2T/|Q|`
    /// at low energy and `T/|Q|` at high energy.
    /// Accuracy: within 8 eps from 1 eV to 100 TeV (the [Precision](self#precision)
    /// promise); the plain `pc·β/Q` is up to 2.7 eps off where this form stays below 1 eps.
    ///
    /// # Errors
    /// [`Error::ZeroCharge`] for a neutral species; [`Error::Overflow`] when the rigidity does
    /// not fit the precision (a charge far below e).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// let e = Motion::try_from_kinetic_energy(Species::<f64>::ELECTRON, 1.0)?;
    /// // 1.9999980430526461 V (mpmath, CODATA 2018)
    /// assert!((e.try_electric_rigidity()? - 1.999_998_043_052_646_1).abs() < 1e-15);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_electric_rigidity(&self) -> Result<T, Error> {
        let q = nonzero_charge(self.species)?;
        let m = self.species.rest_energy();
        let t = self.kinetic;
        fits((t + t * (m / self.total)) / q)
    }
}

/// `|Q|` of the species, or [`Error::ZeroCharge`].
#[inline]
fn nonzero_charge<T: Real>(species: Species<T>) -> Result<T, Error> {
    let q = species.charge().abs();
    if q.to_bits_u64() == 0 {
        Err(Error::ZeroCharge)
    } else {
        Ok(q)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    static AT_REST: [f32; 1] = [0.0];
    static HELD: [Motion<f64>; 2] = [
        Motion::at_rest(Species::ELECTRON),
        Motion::at_rest(Species::ALPHA),
    ];

    #[test]
    fn a_static_holds_states_and_at_rest_matches_the_constructor() {
        for m in HELD {
            assert_eq!(Ok(m), Motion::try_from_kinetic_energy(m.species(), 0.0));
        }
    }

    #[test]
    fn particle_at_rest() {
        let m = Motion::try_from_kinetic_energy(Species::<f32>::PROTON, AT_REST[0]).unwrap();
        assert_eq!(m.beta(), 0.0);
        assert_eq!(m.one_minus_beta(), 1.0);
        assert_eq!(m.gamma(), 1.0);
        assert_eq!(m.speed(), 0.0);
        assert!(m.flight_time_per_metre().is_infinite());
        let n = Motion::try_from_kinetic_energy(Species::<f32>::PROTON, -0.0).unwrap();
        assert!(!n.momentum().is_sign_negative());
    }
}
