//! Four-vectors (upper index), covectors (lower index) and the Minkowski metric.
//!
//! A [`FourVector`] holds contravariant components `x^μ = (x⁰, x¹, x², x³)` with `x⁰ = ct`; a
//! [`Covector`] holds covariant components `k_μ`. They are distinct types: a contraction
//! `x^μ k_μ` needs one of each ([`FourVector::contract`]), and two upper indices can only meet
//! through the metric ([`FourVector::inner`]), so a forgotten metric does not compile:
//!
//! ```compile_fail
//! use fourforce::FourVector;
//! let a = FourVector::new(1.0_f32, 0.0, 0.0, 0.0);
//! let b = FourVector::new(1.0_f32, 0.5, 0.0, 0.0);
//! let _ = a.contract(b); // two upper indices: refused by the compiler
//! ```
//!
//! The metric is `g = diag(+1, −1, −1, −1)` ([`Metric`]): lowering flips the sign of the spatial
//! components, raising flips it back, both exactly.
//!
//! # Four-velocity in units of c
//! `u = γ(1, β)`, dimensionless, with `u·u = 1`. Build it from β ([`FourVector::try_four_velocity`]),
//! from a velocity in m/s ([`FourVector::try_four_velocity_from_velocity`]) or from a momentum
//! `pc` in eV and a [`Species`] ([`FourVector::try_four_velocity_from_momentum`]); the last works
//! in `f32` from a 1 eV electron to a 100 TeV proton, where β itself rounds to 1.
//! [`FourVector::four_velocity_deviation`] is the on-device sanity figure `(u·u − 1)/(u⁰)²`.
//!
//! # For firmware authors
//! A contraction or an inner product is 4 multiplications and 3 additions; lowering and raising
//! are sign flips. All types are `Copy`, 16 bytes in `f32`, and `const`-constructible.
//!
//! # Examples
//! ```
//! use fourforce::{FourVector, ThreeVector};
//! let u = FourVector::try_four_velocity(ThreeVector::new(0.6_f64, 0.0, 0.0))?;
//! assert!((u.time - 1.25).abs() < 1e-15);
//! assert!((u.inner(u) - 1.0).abs() < 1e-15);
//! assert_eq!(u.contract(u.lower()), u.inner(u));
//! # Ok::<(), fourforce::Error>(())
//! ```

use core::ops::{Add, Mul, Neg, Sub};

use crate::compensated::Accumulator;
use crate::{Error, Real, Species, ThreeVector};

/// A contravariant four-vector `x^μ = (x⁰, x)`: upper index, `x⁰` the time part (`ct` for an
/// event, `γ` for a four-velocity in units of c, `E` for a four-momentum in eV).
///
/// # Examples
/// ```
/// use fourforce::FourVector;
/// let event = FourVector::new(2.0_f32, 1.0, 0.0, 0.0);
/// assert_eq!(event.inner(event), 3.0); // timelike: positive with (+,−,−,−)
/// ```
#[derive(Clone, Copy, Debug, Default, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct FourVector<T: Real> {
    /// Time component `x⁰`.
    pub time: T,
    /// Spatial components `(x¹, x², x³)`.
    pub space: ThreeVector<T>,
}

/// A covariant four-vector (covector) `k_μ = (k₀, k₁, k₂, k₃)`: lower index.
///
/// The lowered form of a [`FourVector`] (`k_μ = g_μν x^ν`), or a gradient. Contracts with a
/// [`FourVector`], not with another covector.
///
/// # Examples
/// ```
/// use fourforce::{Covector, FourVector};
/// let k = Covector::new(1.0_f64, 2.0, 0.0, 0.0);
/// let x = FourVector::new(3.0_f64, 1.0, 0.0, 0.0);
/// assert_eq!(k.contract(x), 5.0); // k_μ x^μ = 1·3 + 2·1
/// ```
#[derive(Clone, Copy, Debug, Default, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Covector<T: Real> {
    /// Time component `k₀`.
    pub time: T,
    /// Spatial components `(k₁, k₂, k₃)`.
    pub space: ThreeVector<T>,
}

/// The Minkowski metric `g_μν = g^μν = diag(+1, −1, −1, −1)`.
///
/// Its signature and components; lowering, raising and the inner product are methods of
/// [`FourVector`] and [`Covector`] (`x.lower()`, `k.raise()`, `a.inner(b)`).
///
/// # Examples
/// ```
/// use fourforce::{FourVector, Metric};
/// let x = FourVector::new(1.0_f32, 2.0, 3.0, 4.0);
/// assert_eq!(x.lower().raise(), x);
/// assert_eq!(Metric::SIGNATURE, [1, -1, -1, -1]);
/// ```
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Metric;

impl Metric {
    /// The diagonal of the metric, `(+1, −1, −1, −1)`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Metric;
    /// assert_eq!(Metric::SIGNATURE.iter().sum::<i8>(), -2);
    /// ```
    pub const SIGNATURE: [i8; 4] = [1, -1, -1, -1];

    /// The component `g_μν` (equal to `g^μν`): ±1 on the diagonal, 0 elsewhere.
    ///
    /// # Errors
    /// [`Error::OutOfBounds`] if an index is above 3.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Metric;
    /// assert_eq!(Metric::try_component::<f32>(0, 0)?, 1.0);
    /// assert_eq!(Metric::try_component::<f32>(2, 2)?, -1.0);
    /// assert_eq!(Metric::try_component::<f32>(1, 2)?, 0.0);
    /// assert!(Metric::try_component::<f32>(4, 0).is_err());
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_component<T: Real>(mu: usize, nu: usize) -> Result<T, Error> {
        match (mu, nu) {
            (0, 0) => Ok(T::ONE),
            (1, 1) | (2, 2) | (3, 3) => Ok(T::NEG_ONE),
            (0..=3, 0..=3) => Ok(T::ZERO),
            _ => Err(Error::OutOfBounds),
        }
    }
}

impl<T: Real> FourVector<T> {
    /// The zero four-vector.
    ///
    /// # Examples
    /// ```
    /// use fourforce::FourVector;
    /// assert_eq!(FourVector::<f32>::ZERO.time, 0.0);
    /// ```
    pub const ZERO: Self = Self::new(T::ZERO, T::ZERO, T::ZERO, T::ZERO);

    /// The four-velocity of a particle at rest, `u = (1, 0, 0, 0)` (units of c).
    ///
    /// # Examples
    /// ```
    /// use fourforce::FourVector;
    /// assert_eq!(FourVector::<f64>::AT_REST.inner(FourVector::AT_REST), 1.0);
    /// ```
    pub const AT_REST: Self = Self::new(T::ONE, T::ZERO, T::ZERO, T::ZERO);

    /// Builds `(x⁰, x¹, x², x³)` without checks.
    ///
    /// Trusts its inputs (for `const` values and numbers already checked): a NaN or infinite
    /// component is kept, the infallible arithmetic of the type carries it into its results
    /// (IEEE rules), and every `try_` function given the four-vector refuses it with
    /// [`Error::NonFinite`]. For numbers from outside, use [`try_new`](Self::try_new).
    ///
    /// # Examples
    /// ```
    /// use fourforce::FourVector;
    /// const EVENT: FourVector<f32> = FourVector::new(1.0, 0.0, 0.0, 0.5);
    /// assert_eq!(EVENT.space.z, 0.5);
    /// ```
    #[must_use]
    #[inline]
    pub const fn new(time: T, x: T, y: T, z: T) -> Self {
        Self {
            time,
            space: ThreeVector::new(x, y, z),
        }
    }

    /// Builds `(x⁰, x)` from a time part and a three-vector, without checks (as
    /// [`new`](Self::new)).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FourVector, ThreeVector};
    /// let x = FourVector::from_parts(1.0_f32, ThreeVector::new(0.0, 2.0, 0.0));
    /// assert_eq!(x, FourVector::new(1.0, 0.0, 2.0, 0.0));
    /// ```
    #[must_use]
    #[inline]
    pub const fn from_parts(time: T, space: ThreeVector<T>) -> Self {
        Self { time, space }
    }

    /// Builds `(x⁰, x¹, x², x³)`, refusing NaN or infinite components.
    ///
    /// # Errors
    /// [`Error::NonFinite`] if any component is NaN or infinite.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, FourVector};
    /// assert!(FourVector::try_new(1.0_f32, 0.0, 0.0, 0.0).is_ok());
    /// assert_eq!(FourVector::try_new(f32::NAN, 0.0, 0.0, 0.0), Err(Error::NonFinite));
    /// ```
    pub fn try_new(time: T, x: T, y: T, z: T) -> Result<Self, Error> {
        let v = Self::new(time, x, y, z);
        if v.is_finite() {
            Ok(v)
        } else {
            Err(Error::NonFinite)
        }
    }

    /// True when every component is finite.
    ///
    /// # Examples
    /// ```
    /// use fourforce::FourVector;
    /// assert!(!FourVector::new(0.0_f64, f64::INFINITY, 0.0, 0.0).is_finite());
    /// ```
    #[must_use]
    #[inline]
    pub fn is_finite(self) -> bool {
        self.time.is_finite() && self.space.is_finite()
    }

    /// The four-velocity `u = γ(1, β)` in units of c from a velocity `β = v/c`.
    ///
    /// `γ = 1/√(1 − βx² − βy² − βz²)` with each square split exactly into two parts and the
    /// parts summed with a compensated sum, so that no rounding of `|β|` enters `1 − |β|²`;
    /// `u = (γ, γβ)`. Bound: `γ` within 4 eps of the exact value for every β exact in the
    /// precision, any direction, up to `γ = 10³` in `f32` and `10⁶` in `f64`. Edges: β = 0 gives
    /// `(1, 0, 0, 0)`. In `f32`, β cannot carry γ much above 10³ along an axis (β rounds to 1
    /// past γ ≈ 4096): build fast particles from their momentum instead
    /// ([`try_four_velocity_from_momentum`](Self::try_four_velocity_from_momentum)).
    ///
    /// # Errors
    /// [`Error::NonFinite`] for a non-finite β; [`Error::SpeedNotBelowLight`] if `|β| ≥ 1`
    /// (`1 − |β|²` as summed in twice the precision is not positive).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, FourVector, ThreeVector};
    /// let u = FourVector::try_four_velocity(ThreeVector::new(0.0_f32, 0.6, 0.0))?;
    /// assert!((u.time - 1.25).abs() < 2.0 * f32::EPSILON);
    /// assert!((u.space.y - 0.75).abs() < 2.0 * f32::EPSILON);
    /// let too_fast = ThreeVector::new(0.8_f32, 0.6, 0.0);
    /// assert_eq!(FourVector::try_four_velocity(too_fast), Err(Error::SpeedNotBelowLight));
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_four_velocity(beta: ThreeVector<T>) -> Result<Self, Error> {
        let gamma = gamma_of_beta(beta)?;
        Ok(Self::from_parts(gamma, beta * gamma))
    }

    /// The four-velocity `u = γ(1, v/c)` in units of c from a velocity in m/s.
    ///
    /// `γ = c/√(c² − vx² − vy² − vz²)`, the difference formed without cancellation: c in two
    /// exact parts (`C_HI + C_LO`, so that the `f32` rounding of c by 10 m/s does not enter),
    /// every square split exactly into two parts, the parts summed with a compensated sum;
    /// `u = (γ, γ v/c)`. Bound: `γ` within 4 eps of the exact value for every velocity exact in
    /// the precision, any direction, up to `γ = 10³` in `f32` and `10⁶` in `f64`.
    /// Edges: v = 0 gives `(1, 0, 0, 0)`.
    ///
    /// # Errors
    /// [`Error::NonFinite`] for a non-finite velocity; [`Error::SpeedNotBelowLight`] if
    /// `|v| ≥ c`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FourVector, ThreeVector};
    /// // An electron of 1 keV: v = 18 727 896.635 m/s, gamma = 1.001 956 951 (CODATA 2018 [mp]).
    /// let u = FourVector::try_four_velocity_from_velocity(ThreeVector::new(18_727_896.635_f64, 0.0, 0.0))?;
    /// assert!((u.time - 1.001_956_951_183_559).abs() < 1e-12);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_four_velocity_from_velocity(v_m_per_s: ThreeVector<T>) -> Result<Self, Error> {
        let gamma = gamma_of_velocity(v_m_per_s)?;
        Ok(Self::from_parts(
            gamma,
            v_m_per_s * (gamma * T::INV_SPEED_OF_LIGHT),
        ))
    }

    /// The four-velocity `u = (E, pc)/mc²` in units of c from a momentum `pc` (eV, a vector) and
    /// the species' rest energy.
    ///
    /// `u = pc/m` (spatial), `u⁰ = √(1 + |u|²)` through `hypot`, so nothing overflows or
    /// underflows in `f32` from a 1 eV electron (`|u| ≈ 2·10⁻³`) to a 100 TeV proton
    /// (`|u| ≈ 1.07·10⁵`). Accuracy: every component within 2 eps from 1 eV to 100 TeV
    /// (electron and proton). Edges: zero momentum gives
    /// `(1, 0, 0, 0)`. The charge of the species is not used.
    ///
    /// # Errors
    /// [`Error::NonFinite`] for a non-finite momentum; [`Error::Overflow`] when `pc/m` or `u⁰`
    /// does not fit the precision.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FourVector, Species, ThreeVector};
    /// // A proton of 1 GeV kinetic energy: pc = 1696.037 787 MeV, gamma = 2.065 788 925
    /// // (CODATA 2018 [mp]).
    /// let pc = ThreeVector::new(0.0, 0.0, 1_696_037_787.409_231_f64);
    /// let u = FourVector::try_four_velocity_from_momentum(Species::PROTON, pc)?;
    /// assert!((u.time / 2.065_788_924_789_451_7 - 1.0).abs() < 1e-15);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_four_velocity_from_momentum(
        species: Species<T>,
        pc_ev: ThreeVector<T>,
    ) -> Result<Self, Error> {
        if !pc_ev.is_finite() {
            return Err(Error::NonFinite);
        }
        // A species' rest energy is finite and at least 1 eV (its invariant).
        let u = pc_ev / species.rest_energy();
        // Every component may fit while |u|, and so u⁰, does not.
        let time = T::ONE.hypot(u.norm());
        if !u.is_finite() || !time.is_finite() {
            return Err(Error::Overflow);
        }
        Ok(Self::from_parts(time, u))
    }

    /// The normalisation deviation of a four-velocity, `(u·u − 1)/(u⁰)²`: an on-device sanity
    /// figure to compare with a tolerance.
    ///
    /// `u·u − 1` is summed with exact products and a compensated sum, so the figure measures the
    /// stored components and not the rounding of the check; dividing by `(u⁰)²` makes it a
    /// relative deviation at every energy. A four-velocity built by this crate reads within
    /// 3 eps from 1 eV to 100 TeV (electron and proton); a tolerance of 8 eps leaves a margin.
    /// Edges: `+∞` when a component is not finite, `u⁰ = 0`, or `u⁰` is so small (subnormal)
    /// that the figure overflows, so that it fails any tolerance. Finite for every finite `u⁰`
    /// of at least 1, up to `MAX`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FourVector, ThreeVector};
    /// let u = FourVector::try_four_velocity(ThreeVector::new(0.3_f32, 0.4, 0.0))?;
    /// assert!(u.four_velocity_deviation().abs() < 4.0 * f32::EPSILON);
    /// let bad = FourVector::new(1.0_f32, 0.5, 0.0, 0.0);
    /// assert!(bad.four_velocity_deviation() < -0.2); // u·u = 0.75
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub fn four_velocity_deviation(self) -> T {
        if !self.is_finite() || self.time == T::ZERO {
            return T::INFINITY;
        }
        // (u⁰ is finite and not 0 here, so e lies in the exponent range and −e cannot overflow.)
        // Scaled by 2^-e (exact) so that u⁰ lies in [1, 2): the squares cannot overflow however
        // large u⁰ is, and the figure is the unscaled one wherever no scaled product underflows.
        let e = self.time.ilogb();
        let [time, x, y, z] = self.to_array().map(|c| c.scalbn(-e));
        let one = T::ONE.scalbn(-e);
        let mut acc = Accumulator::new();
        acc.add_product(time, time);
        for c in [one, x, y, z] {
            acc.sub_product(c, c);
        }
        let d = acc.value() / time / time;
        if d.is_finite() { d } else { T::INFINITY }
    }

    /// Lowers the index: `x_μ = g_μν x^ν = (x⁰, −x)`; exact.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Covector, FourVector};
    /// let x = FourVector::new(1.0_f32, 2.0, 3.0, 4.0);
    /// assert_eq!(x.lower(), Covector::new(1.0, -2.0, -3.0, -4.0));
    /// ```
    #[must_use]
    #[inline]
    pub fn lower(self) -> Covector<T> {
        Covector::from_parts(self.time, -self.space)
    }

    /// The contraction `x^μ k_μ = x⁰k₀ + x¹k₁ + x²k₂ + x³k₃` with a covector (no metric).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Covector, FourVector};
    /// let x = FourVector::new(1.0_f32, 1.0, 0.0, 0.0);
    /// assert_eq!(x.contract(Covector::new(2.0, 3.0, 0.0, 0.0)), 5.0);
    /// ```
    #[must_use]
    #[inline]
    pub fn contract(self, k: Covector<T>) -> T {
        self.time * k.time + self.space.dot(k.space)
    }

    /// The Minkowski inner product `g_μν a^μ b^ν = a⁰b⁰ − a·b`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::FourVector;
    /// let a = FourVector::new(3.0_f64, 1.0, 2.0, 2.0);
    /// assert_eq!(a.inner(a), 0.0); // 9 − 9: null
    /// ```
    #[must_use]
    #[inline]
    pub fn inner(self, other: Self) -> T {
        self.time * other.time - self.space.dot(other.space)
    }

    /// The squared Minkowski norm `x·x = (x⁰)² − |x|²` (positive for timelike vectors).
    ///
    /// # Examples
    /// ```
    /// use fourforce::FourVector;
    /// assert_eq!(FourVector::new(2.0_f32, 1.0, 0.0, 0.0).norm_squared(), 3.0);
    /// ```
    #[must_use]
    #[inline]
    pub fn norm_squared(self) -> T {
        self.inner(self)
    }

    /// Multiplies every component by `k`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::FourVector;
    /// let x = FourVector::new(1.0_f32, 2.0, 3.0, 4.0);
    /// assert_eq!(x.scale(2.0), FourVector::new(2.0, 4.0, 6.0, 8.0));
    /// ```
    #[must_use]
    #[inline]
    pub fn scale(self, k: T) -> Self {
        Self::from_parts(self.time * k, self.space * k)
    }

    /// The components as an array `[x⁰, x¹, x², x³]`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::FourVector;
    /// assert_eq!(FourVector::new(1.0_f32, 2.0, 3.0, 4.0).to_array(), [1.0, 2.0, 3.0, 4.0]);
    /// ```
    #[must_use]
    #[inline]
    pub const fn to_array(self) -> [T; 4] {
        [self.time, self.space.x, self.space.y, self.space.z]
    }

    /// Builds a four-vector from `[x⁰, x¹, x², x³]`, without checks (as [`new`](Self::new)).
    ///
    /// # Examples
    /// ```
    /// use fourforce::FourVector;
    /// let x = FourVector::from_array([1.0_f64, 2.0, 3.0, 4.0]);
    /// assert_eq!(x.space.y, 3.0);
    /// ```
    #[must_use]
    #[inline]
    pub const fn from_array(a: [T; 4]) -> Self {
        let [t, x, y, z] = a;
        Self::new(t, x, y, z)
    }
}

impl<T: Real> Covector<T> {
    /// The zero covector.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Covector;
    /// assert_eq!(Covector::<f32>::ZERO.time, 0.0);
    /// ```
    pub const ZERO: Self = Self::new(T::ZERO, T::ZERO, T::ZERO, T::ZERO);

    /// Builds `(k₀, k₁, k₂, k₃)` without checks.
    ///
    /// Trusts its inputs (for `const` values and numbers already checked): a NaN or infinite
    /// component is kept, the infallible arithmetic of the type carries it into its results
    /// (IEEE rules), and every `try_` function given the covector refuses it with
    /// [`Error::NonFinite`]. For numbers from outside, use [`try_new`](Self::try_new).
    ///
    /// # Examples
    /// ```
    /// use fourforce::Covector;
    /// const K: Covector<f32> = Covector::new(1.0, 0.0, 0.0, -1.0);
    /// assert_eq!(K.space.z, -1.0);
    /// ```
    #[must_use]
    #[inline]
    pub const fn new(time: T, x: T, y: T, z: T) -> Self {
        Self {
            time,
            space: ThreeVector::new(x, y, z),
        }
    }

    /// Builds `(k₀, k)` from a time part and a three-vector of lower components, without checks
    /// (as [`new`](Self::new)).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Covector, ThreeVector};
    /// let k = Covector::from_parts(1.0_f32, ThreeVector::new(0.0, -2.0, 0.0));
    /// assert_eq!(k, Covector::new(1.0, 0.0, -2.0, 0.0));
    /// ```
    #[must_use]
    #[inline]
    pub const fn from_parts(time: T, space: ThreeVector<T>) -> Self {
        Self { time, space }
    }

    /// Builds `(k₀, k₁, k₂, k₃)`, refusing NaN or infinite components.
    ///
    /// # Errors
    /// [`Error::NonFinite`] if any component is NaN or infinite.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Covector, Error};
    /// assert_eq!(Covector::try_new(0.0_f64, f64::NAN, 0.0, 0.0), Err(Error::NonFinite));
    /// ```
    pub fn try_new(time: T, x: T, y: T, z: T) -> Result<Self, Error> {
        let k = Self::new(time, x, y, z);
        if k.is_finite() {
            Ok(k)
        } else {
            Err(Error::NonFinite)
        }
    }

    /// True when every component is finite.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Covector;
    /// assert!(Covector::new(0.0_f32, 1.0, 2.0, 3.0).is_finite());
    /// ```
    #[must_use]
    #[inline]
    pub fn is_finite(self) -> bool {
        self.time.is_finite() && self.space.is_finite()
    }

    /// Raises the index: `k^μ = g^μν k_ν = (k₀, −k)`; exact.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Covector, FourVector};
    /// assert_eq!(Covector::new(1.0_f32, 2.0, 0.0, 0.0).raise(), FourVector::new(1.0, -2.0, 0.0, 0.0));
    /// ```
    #[must_use]
    #[inline]
    pub fn raise(self) -> FourVector<T> {
        FourVector::from_parts(self.time, -self.space)
    }

    /// The contraction `k_μ x^μ` with a four-vector (no metric).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Covector, FourVector};
    /// let k = Covector::new(1.0_f32, 0.0, 0.0, 1.0);
    /// assert_eq!(k.contract(FourVector::new(2.0, 0.0, 0.0, 3.0)), 5.0);
    /// ```
    #[must_use]
    #[inline]
    pub fn contract(self, x: FourVector<T>) -> T {
        x.contract(self)
    }

    /// Multiplies every component by `k`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Covector;
    /// assert_eq!(Covector::new(1.0_f64, 0.0, 0.0, 0.0).scale(3.0).time, 3.0);
    /// ```
    #[must_use]
    #[inline]
    pub fn scale(self, k: T) -> Self {
        Self::from_parts(self.time * k, self.space * k)
    }

    /// The components as an array `[k₀, k₁, k₂, k₃]`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Covector;
    /// assert_eq!(Covector::new(1.0_f32, 2.0, 3.0, 4.0).to_array(), [1.0, 2.0, 3.0, 4.0]);
    /// ```
    #[must_use]
    #[inline]
    pub const fn to_array(self) -> [T; 4] {
        [self.time, self.space.x, self.space.y, self.space.z]
    }
}

/// `γ = 1/√(1 − |β|²)` of a velocity β (units of c), with `1 − |β|²` summed exactly
/// (exact squares, compensated sum).
///
/// # Errors
/// [`Error::NonFinite`] for a non-finite β; [`Error::SpeedNotBelowLight`] if `1 − |β|² ≤ 0`.
#[inline]
pub(crate) fn gamma_of_beta<T: Real>(beta: ThreeVector<T>) -> Result<T, Error> {
    if !beta.is_finite() {
        return Err(Error::NonFinite);
    }
    // Each |βᵢ| < 2 keeps the squares (and Dekker's splitting) far from overflow; a larger one is
    // faster than light anyway.
    let two = T::TWO;
    if beta.x.abs() >= two || beta.y.abs() >= two || beta.z.abs() >= two {
        return Err(Error::SpeedNotBelowLight);
    }
    let mut acc = Accumulator::new();
    acc.add(T::ONE);
    acc.sub_product(beta.x, beta.x);
    acc.sub_product(beta.y, beta.y);
    acc.sub_product(beta.z, beta.z);
    let d = acc.value();
    if d > T::ZERO {
        Ok(T::ONE / d.sqrt())
    } else {
        Err(Error::SpeedNotBelowLight)
    }
}

/// `γ = c/√(c² − |v|²)` of a velocity in m/s, with c in two exact parts and `c² − |v|²` summed
/// exactly (exact squares, compensated sum).
///
/// # Errors
/// [`Error::NonFinite`] for a non-finite velocity; [`Error::SpeedNotBelowLight`] if `|v| ≥ c`.
#[inline]
pub(crate) fn gamma_of_velocity<T: Real>(v: ThreeVector<T>) -> Result<T, Error> {
    if !v.is_finite() {
        return Err(Error::NonFinite);
    }
    // |vᵢ| < 2c keeps the squares (and Dekker's splitting) far from overflow.
    let limit = T::C_HI * T::TWO;
    if v.x.abs() >= limit || v.y.abs() >= limit || v.z.abs() >= limit {
        return Err(Error::SpeedNotBelowLight);
    }
    // c² = C_HI² + 2 C_HI C_LO + C_LO² (C_LO = 10 m/s in f32, 0 in f64; C_LO² = 100 m²/s² is
    // far below the sum's last bit and goes to the correction).
    let mut acc = Accumulator::new();
    acc.add_product(T::C_HI, T::C_HI);
    if T::C_LO != T::ZERO {
        acc.add_product(T::C_HI * T::TWO, T::C_LO);
        acc.add_small(T::C_LO * T::C_LO);
    }
    acc.sub_product(v.x, v.x);
    acc.sub_product(v.y, v.y);
    acc.sub_product(v.z, v.z);
    let d = acc.value();
    if d <= T::ZERO {
        // (d is finite: every component was below 2c.)
        return Err(Error::SpeedNotBelowLight);
    }
    let s = d.sqrt();
    let gamma = T::C_HI / s;
    // c/s = C_HI/s · (1 + C_LO/C_HI); the ratio folds to a constant.
    Ok(if T::C_LO == T::ZERO {
        gamma
    } else {
        gamma + gamma * (T::C_LO / T::C_HI)
    })
}

macro_rules! impl_linear_ops {
    ($ty:ident) => {
        impl<T: Real> Add for $ty<T> {
            type Output = Self;
            #[inline]
            fn add(self, o: Self) -> Self {
                Self::from_parts(self.time + o.time, self.space + o.space)
            }
        }
        impl<T: Real> Sub for $ty<T> {
            type Output = Self;
            #[inline]
            fn sub(self, o: Self) -> Self {
                Self::from_parts(self.time - o.time, self.space - o.space)
            }
        }
        impl<T: Real> Neg for $ty<T> {
            type Output = Self;
            #[inline]
            fn neg(self) -> Self {
                Self::from_parts(-self.time, -self.space)
            }
        }
        impl<T: Real> Mul<T> for $ty<T> {
            type Output = Self;
            #[inline]
            fn mul(self, k: T) -> Self {
                self.scale(k)
            }
        }
    };
}
impl_linear_ops!(FourVector);
impl_linear_ops!(Covector);

#[cfg(test)]
mod tests {
    use super::*;

    static EVENT: FourVector<f32> = FourVector::new(1.0, 0.0, 0.0, 0.0);
    static GRADIENT: Covector<f64> = Covector::new(1.0, 0.0, 0.0, 0.0);

    #[test]
    fn statics_hold_vectors_and_covectors() {
        assert_eq!(EVENT.inner(EVENT), 1.0);
        assert_eq!(GRADIENT.raise().time, 1.0);
    }

    #[test]
    fn lowering_then_raising_is_exact() {
        let x = FourVector::new(1.5_f32, -2.25, 3.0, 1e-30);
        assert_eq!(x.lower().raise(), x);
        assert_eq!(x.contract(x.lower()), x.inner(x));
    }

    #[test]
    fn metric_components() {
        for mu in 0..4 {
            for nu in 0..4 {
                let g = Metric::try_component::<f64>(mu, nu).unwrap();
                let expected = if mu == nu {
                    f64::from(Metric::SIGNATURE[mu])
                } else {
                    0.0
                };
                assert_eq!(g, expected);
            }
        }
        assert_eq!(Metric::try_component::<f64>(0, 4), Err(Error::OutOfBounds));
    }

    #[test]
    fn four_velocity_edges() {
        assert_eq!(
            FourVector::try_four_velocity(ThreeVector::<f32>::ZERO),
            Ok(FourVector::AT_REST)
        );
        assert_eq!(
            FourVector::try_four_velocity(ThreeVector::new(1.0_f64, 0.0, 0.0)),
            Err(Error::SpeedNotBelowLight)
        );
        assert_eq!(
            FourVector::try_four_velocity_from_velocity(ThreeVector::new(0.0_f32, 3.0e8, 0.0)),
            Err(Error::SpeedNotBelowLight)
        );
        assert_eq!(
            FourVector::try_four_velocity_from_momentum(
                Species::PROTON,
                ThreeVector::new(f32::NAN, 0.0, 0.0)
            ),
            Err(Error::NonFinite)
        );
        assert_eq!(
            FourVector::<f32>::ZERO.four_velocity_deviation(),
            f32::INFINITY
        );
    }

    #[test]
    fn gamma_of_vectors_exact_cases_and_huge_components() {
        // |β|² = 3/4 exactly: γ = 2.
        let half = ThreeVector::new(0.5_f32, -0.5, 0.5);
        assert_eq!(FourVector::try_four_velocity(half).map(|u| u.time), Ok(2.0));
        for beta in [
            ThreeVector::new(0.0_f32, -1.0, 0.0),
            ThreeVector::new(f32::MAX, 0.0, 0.0),
            ThreeVector::new(0.0, 0.0, -3.0),
        ] {
            assert_eq!(
                FourVector::try_four_velocity(beta),
                Err(Error::SpeedNotBelowLight)
            );
        }
        for v in [
            ThreeVector::new(0.0_f32, 1.0e38, 0.0),
            ThreeVector::new(2.2e8, 2.1e8, 1.0),
        ] {
            assert_eq!(
                FourVector::try_four_velocity_from_velocity(v),
                Err(Error::SpeedNotBelowLight)
            );
        }
        // 299 792 448 m/s is the f32 value below c (c − v = 10 m/s): still below light.
        let v = ThreeVector::new(0.0_f32, 0.0, 299_792_448.0);
        let g = FourVector::try_four_velocity_from_velocity(v).unwrap().time;
        // γ = c/√((c − v)(c + v)) = 299 792 458/√(10 · 599 584 906) = 3871.643 468 864 353 5
        // (mpmath, 40 digits).
        assert!(
            (f64::from(g) / 3_871.643_468_864_353_5 - 1.0).abs() < 2.0 * f64::from(f32::EPSILON)
        );
        assert_eq!(
            FourVector::try_four_velocity_from_velocity(ThreeVector::new(
                0.0_f64,
                0.0,
                299_792_458.0
            )),
            Err(Error::SpeedNotBelowLight)
        );
    }
}
