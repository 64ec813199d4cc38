//! Lorentz boosts of four-vectors and fields, and general Lorentz transformations.
//!
//! A [`Boost`] is passive: it takes the components of a four-vector or of the field tensor
//! measured in the lab into those measured in a frame that moves with velocity `V = βc`
//! relative to the lab (Jackson 3rd ed. §11.3 and §11.10, from memory). It is held as the frame's
//! four-velocity `(γ, u)` with `u = γβ`, so that it stays exact in `f32` up to any γ (β alone
//! rounds to 1 in `f32` past γ ≈ 4096) and so that `γ − 1` is never formed by subtraction:
//!
//! ```text
//! x'⁰ = γx⁰ − u·x
//! x'  = x + u ((u·x)/(γ + 1) − x⁰)
//! E'  = γE + u × cB − u (u·E)/(γ + 1)   = E  + u × (cB + (E × u)/(γ + 1))
//! cB' = γcB − u × E − u (u·cB)/(γ + 1)  = cB + u × ((cB × u)/(γ + 1) − E)
//! ```
//!
//! (the last two are `E'∥ = E∥`, `E'⊥ = γ(E + V × B)⊥`, `B'⊥ = γ(B − V × E/c²)⊥` in vector form).
//!
//! Two boosts along different directions do not compose into a boost: their product is a boost
//! followed by a rotation (the Thomas–Wigner rotation). [`Boost::then`] therefore returns a
//! [`LorentzTransform`], a general 4×4 transformation `Λ^μ_ν` that applies to vectors,
//! covectors and fields, inverts exactly (`Λ⁻¹ = g Λᵀ g`), and splits into
//! [`LorentzTransform::try_boost_part`] and [`LorentzTransform::try_rotation_part`] with
//! `Λ = R·B` (first the boost B, then the rotation R).
//!
//! # For firmware authors
//! A boost of a four-vector costs 8 multiplications, of the field tensor 30; the
//! [`LorentzTransform`] forms cost 16 and 88 (a full 4×4 product and a half). A `Boost` is 20
//! bytes in `f32`; build it once per frame, outside the loop.
//!
//! # Examples
//! ```
//! use fourforce::{Boost, FieldTensor, ThreeVector};
//! // mpmath from CODATA 2018; Jackson 3rd ed. §11.10 (from memory): a pure E = 1000 V/m along y
//! // seen from a frame moving at 0.6 c along x is E' = 1250 V/m along y, B' = −2.501 730 713 99e-6 T along z.
//! let boost = Boost::try_from_beta(ThreeVector::new(0.6_f64, 0.0, 0.0))?;
//! let f = FieldTensor::try_from_fields(ThreeVector::new(0.0, 1000.0, 0.0), ThreeVector::ZERO)?;
//! let g = boost.apply_field(&f);
//! assert!((g.e().y - 1250.0).abs() < 1e-9);
//! assert!((g.b().z / -2.501_730_713_99e-6 - 1.0).abs() < 1e-11);
//! # Ok::<(), fourforce::Error>(())
//! ```

use crate::spacetime::gamma_of_velocity;
use crate::{Covector, Error, FieldTensor, FourVector, Real, ThreeVector};

/// A pure Lorentz boost into a frame moving with velocity `βc` relative to the lab (passive).
///
/// # Examples
/// ```
/// use fourforce::{Boost, FourVector, ThreeVector};
/// let b = Boost::try_from_beta(ThreeVector::new(0.6_f64, 0.0, 0.0))?;
/// // An event at (ct, x) = (1, 0) m happens at ct' = 1.25 m, x' = −0.75 m in the moving frame.
/// let x = b.apply(FourVector::new(1.0, 0.0, 0.0, 0.0));
/// assert!((x.time - 1.25).abs() < 1e-15 && (x.space.x + 0.75).abs() < 1e-15);
/// # Ok::<(), fourforce::Error>(())
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Boost<T: Real> {
    gamma: T,
    u: ThreeVector<T>,
    inv_gamma_plus_one: T,
}

/// A general Lorentz transformation `Λ^μ_ν` (rows μ, columns ν), passive like [`Boost`].
///
/// What [`Boost::then`] returns: the product of boosts, which in general is a boost followed by a
/// rotation.
///
/// # Examples
/// ```
/// use fourforce::{Boost, FourVector, LorentzTransform, ThreeVector};
/// let a = Boost::try_from_beta(ThreeVector::new(0.5_f64, 0.0, 0.0))?;
/// let b = Boost::try_from_beta(ThreeVector::new(0.0_f64, 0.5, 0.0))?;
/// let both: LorentzTransform<f64> = a.then(&b);
/// let x = FourVector::new(1.0, 0.2, 0.3, 0.4);
/// let d = both.apply(x) - b.apply(a.apply(x));
/// assert!(d.time.abs() < 1e-15 && d.space.norm() < 1e-15);
/// # Ok::<(), fourforce::Error>(())
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct LorentzTransform<T: Real> {
    m: [[T; 4]; 4],
}

impl<T: Real> Boost<T> {
    /// The identity (β = 0).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Boost, FourVector};
    /// let x = FourVector::new(1.0_f32, 2.0, 3.0, 4.0);
    /// assert_eq!(Boost::IDENTITY.apply(x), x);
    /// ```
    pub const IDENTITY: Self = Self {
        gamma: T::ONE,
        u: ThreeVector::ZERO,
        inv_gamma_plus_one: T::HALF,
    };

    /// The largest Lorentz factor a boost accepts, 10¹² (a 100 TeV electron has γ ≈ 2·10⁸).
    ///
    /// Above it, products such as `γ²` of a composition or `γx⁰` of a large event would approach
    /// the `f32` range; the constructors refuse such frames with [`Error::Overflow`].
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Boost, Error, ThreeVector};
    /// assert_eq!(Boost::<f32>::gamma_limit(), 1e12);
    /// let x = ThreeVector::new(1.0_f64, 0.0, 0.0);
    /// assert_eq!(Boost::try_from_rapidity(x, 40.0), Err(Error::Overflow)); // γ ≈ 1.2·10¹⁷
    /// ```
    #[must_use]
    #[inline]
    pub fn gamma_limit() -> T {
        T::from_f64(1e12)
    }

    /// Builds the boost from the frame's spatial four-velocity `u = γβ` (units of c).
    fn from_u(u: ThreeVector<T>) -> Result<Self, Error> {
        Self::from_gamma_u(T::ONE.hypot(u.norm()), u)
    }

    /// Builds the boost from a γ already known (to full accuracy) and `u = γβ`.
    fn from_gamma_u(gamma: T, u: ThreeVector<T>) -> Result<Self, Error> {
        if !gamma.is_finite() || gamma > Self::gamma_limit() || !u.is_finite() {
            return Err(Error::Overflow);
        }
        Ok(Self {
            gamma,
            u,
            inv_gamma_plus_one: T::ONE / (gamma + T::ONE),
        })
    }

    /// The boost into a frame moving with velocity `βc` (β dimensionless, any direction).
    ///
    /// `γ = 1/√(1 − |β|²)` with `1 − |β|²` summed exactly, as
    /// [`FourVector::try_four_velocity`] (γ within 4 eps of the exact value up to `γ = 10³` in
    /// `f32` and `10⁶` in `f64`), `u = γβ`. Edges: β = 0 gives the identity. In `f32`, β
    /// cannot carry γ much above 10³; build fast frames with
    /// [`try_from_four_velocity`](Self::try_from_four_velocity) or
    /// [`try_from_rapidity`](Self::try_from_rapidity).
    ///
    /// # Errors
    /// [`Error::NonFinite`] for a non-finite β; [`Error::SpeedNotBelowLight`] if `|β| ≥ 1`;
    /// [`Error::Overflow`] if γ exceeds [`gamma_limit`](Self::gamma_limit).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Boost, Error, ThreeVector};
    /// let b = Boost::try_from_beta(ThreeVector::new(0.0_f64, 0.8, 0.0))?;
    /// assert!((b.gamma() - 5.0 / 3.0).abs() < 1e-15);
    /// assert_eq!(Boost::try_from_beta(ThreeVector::new(1.0_f64, 0.0, 0.0)), Err(Error::SpeedNotBelowLight));
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_from_beta(beta: ThreeVector<T>) -> Result<Self, Error> {
        let u = FourVector::try_four_velocity(beta)?;
        Self::from_gamma_u(u.time, u.space)
    }

    /// The boost into a frame moving with velocity `v` in m/s.
    ///
    /// `γ = c/√(c² − |v|²)` with `c² − |v|²` summed exactly, as
    /// [`FourVector::try_four_velocity_from_velocity`] (γ within 4 eps of the exact value up to
    /// `γ = 10³` in `f32` and `10⁶` in `f64`).
    ///
    /// # Errors
    /// [`Error::NonFinite`] for a non-finite velocity; [`Error::SpeedNotBelowLight`] if
    /// `|v| ≥ c`; [`Error::Overflow`] if γ exceeds [`gamma_limit`](Self::gamma_limit).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Boost, ThreeVector};
    /// let b = Boost::try_from_velocity(ThreeVector::new(0.6 * 299_792_458.0_f64, 0.0, 0.0))?;
    /// assert!((b.gamma() - 1.25).abs() < 1e-15);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_from_velocity(v_m_per_s: ThreeVector<T>) -> Result<Self, Error> {
        let u = FourVector::try_four_velocity_from_velocity(v_m_per_s)?;
        Self::from_gamma_u(u.time, u.space)
    }

    /// The boost into a frame moving at `speed` (m/s) along `direction` (any length but zero).
    ///
    /// γ from the speed alone, `c/√(c² − v²)` summed exactly (within 4 eps of the exact value up
    /// to `γ = 10³` in `f32` and `10⁶` in `f64`), so that the rounding of the unit direction does
    /// not enter it; `u = n̂ γ v/c`.
    ///
    /// # Errors
    /// [`Error::NonFinite`] for non-finite input; [`Error::ZeroDirection`] for a zero direction;
    /// [`Error::SpeedNotBelowLight`] if `|speed| ≥ c`; [`Error::Overflow`] if γ exceeds
    /// [`gamma_limit`](Self::gamma_limit). A negative speed boosts along `−direction`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Boost, Error, ThreeVector};
    /// let b = Boost::try_from_speed(ThreeVector::new(0.0_f32, 0.0, 2.0), 1.5e8)?;
    /// assert!(b.beta().z > 0.5 && b.beta().z < 0.501);
    /// assert_eq!(Boost::try_from_speed(ThreeVector::<f32>::ZERO, 1.0), Err(Error::ZeroDirection));
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_from_speed(direction: ThreeVector<T>, speed_m_per_s: T) -> Result<Self, Error> {
        if !speed_m_per_s.is_finite() {
            return Err(Error::NonFinite);
        }
        let n = direction.try_unit()?;
        let gamma = gamma_of_velocity(ThreeVector::new(speed_m_per_s, T::ZERO, T::ZERO))?;
        Self::from_gamma_u(gamma, n * (speed_m_per_s * (gamma * T::INV_SPEED_OF_LIGHT)))
    }

    /// The boost along `direction` (any length but zero) with rapidity `η`: `γ = cosh η`,
    /// `|u| = sinh η`.
    ///
    /// Rapidities add along one axis. Edges: η = 0 gives the identity; a negative η boosts along
    /// `−direction`.
    ///
    /// # Errors
    /// [`Error::NonFinite`] for non-finite input; [`Error::ZeroDirection`] for a zero direction;
    /// [`Error::Overflow`] when γ = `cosh η` exceeds [`gamma_limit`](Self::gamma_limit) (|η| above
    /// about 28.3).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Boost, ThreeVector};
    /// let x = ThreeVector::new(1.0_f64, 0.0, 0.0);
    /// let b = Boost::try_from_rapidity(x, 0.5_f64.atanh())?; // β = 0.5
    /// assert!((b.beta().x - 0.5).abs() < 1e-15);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_from_rapidity(direction: ThreeVector<T>, rapidity: T) -> Result<Self, Error> {
        if !rapidity.is_finite() {
            return Err(Error::NonFinite);
        }
        let n = direction.try_unit()?;
        let s = rapidity.sinh();
        if !s.is_finite() {
            return Err(Error::Overflow);
        }
        Self::from_u(n * s)
    }

    /// The boost into the rest frame of a particle (or frame) with four-velocity `u` (units of c).
    ///
    /// Only the spatial part `u = γβ` is used; γ is recomputed as `√(1 + |u|²)`. This is the
    /// form that works in `f32` at any energy (for example a 100 TeV proton, built with
    /// [`FourVector::try_four_velocity_from_momentum`]).
    ///
    /// # Errors
    /// [`Error::NonFinite`] for a non-finite spatial part; [`Error::Overflow`] if γ exceeds
    /// [`gamma_limit`](Self::gamma_limit).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Boost, FourVector, ThreeVector};
    /// let u = FourVector::try_four_velocity(ThreeVector::new(0.3_f64, 0.0, 0.4))?;
    /// let rest = Boost::try_from_four_velocity(u)?.apply(u);
    /// assert!((rest.time - 1.0).abs() < 1e-15 && rest.space.norm() < 1e-15);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_from_four_velocity(u: FourVector<T>) -> Result<Self, Error> {
        if !u.space.is_finite() {
            return Err(Error::NonFinite);
        }
        Self::from_u(u.space)
    }

    /// The Lorentz factor γ of the frame.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Boost;
    /// assert_eq!(Boost::<f32>::IDENTITY.gamma(), 1.0);
    /// ```
    #[must_use]
    #[inline]
    pub const fn gamma(&self) -> T {
        self.gamma
    }

    /// The frame's `γβ` (spatial four-velocity, units of c).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Boost, ThreeVector};
    /// let b = Boost::try_from_beta(ThreeVector::new(0.6_f64, 0.0, 0.0))?;
    /// assert!((b.beta_gamma().x - 0.75).abs() < 1e-15);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn beta_gamma(&self) -> ThreeVector<T> {
        self.u
    }

    /// The frame's velocity β = u/γ (units of c).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Boost, ThreeVector};
    /// let b = Boost::try_from_beta(ThreeVector::new(0.0_f64, -0.25, 0.0))?;
    /// assert!((b.beta().y + 0.25).abs() < 1e-16);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub fn beta(&self) -> ThreeVector<T> {
        self.u / self.gamma
    }

    /// The rapidity `η = ln(γ + |u|)`, formed as `ln_1p(|u|²/(γ + 1) + |u|)` so that it is
    /// accurate for small boosts too.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Boost, ThreeVector};
    /// let b = Boost::try_from_beta(ThreeVector::new(0.5_f64, 0.0, 0.0))?;
    /// assert!((b.rapidity() - 0.5_f64.atanh()).abs() < 1e-15);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub fn rapidity(&self) -> T {
        let n = self.u.norm();
        (n * n * self.inv_gamma_plus_one + n).ln_1p()
    }

    /// The inverse boost (the lab seen from the moving frame: `u → −u`); exact.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Boost, FourVector, ThreeVector};
    /// let b = Boost::try_from_beta(ThreeVector::new(0.3_f64, 0.2, 0.1))?;
    /// let x = FourVector::new(1.0, 2.0, 3.0, 4.0);
    /// let back = b.inverse().apply(b.apply(x)) - x;
    /// assert!(back.time.abs() < 1e-14 && back.space.norm() < 1e-14);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub fn inverse(&self) -> Self {
        Self {
            gamma: self.gamma,
            u: -self.u,
            inv_gamma_plus_one: self.inv_gamma_plus_one,
        }
    }

    /// Applies the boost to a four-vector: `x'⁰ = γx⁰ − u·x`, `x' = x + u((u·x)/(γ+1) − x⁰)`;
    /// 8 multiplications.
    ///
    /// Accuracy up to γ = 10⁴ (checked on random cases in `f32`): each component within
    /// 2 eps × γ(|x⁰| + |x|). A vector nearly parallel to the frame's four-velocity (a particle
    /// boosted into its own rest frame) cancels to far below that scale: its rest-frame
    /// components carry an absolute error of about eps·γ².
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Boost, FourVector, ThreeVector};
    /// let b = Boost::try_from_beta(ThreeVector::new(0.6_f64, 0.0, 0.0))?;
    /// let u = FourVector::try_four_velocity(ThreeVector::new(0.6, 0.0, 0.0))?;
    /// let rest = b.apply(u); // the particle is at rest in the moving frame
    /// assert!((rest.time - 1.0).abs() < 1e-15 && rest.space.norm() < 1e-15);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub fn apply(&self, x: FourVector<T>) -> FourVector<T> {
        let ux = self.u.dot(x.space);
        FourVector::from_parts(
            self.gamma * x.time - ux,
            x.space + self.u * (ux * self.inv_gamma_plus_one - x.time),
        )
    }

    /// Applies the boost to a covector (so that `k'_μ x'^μ = k_μ x^μ`): lower, boost, raise.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Boost, Covector, FourVector, ThreeVector};
    /// let b = Boost::try_from_beta(ThreeVector::new(0.1_f64, 0.5, -0.2))?;
    /// let k = Covector::new(1.0, 0.5, 0.25, 2.0);
    /// let x = FourVector::new(3.0, -1.0, 0.5, 0.0);
    /// assert!((b.apply_covector(k).contract(b.apply(x)) - k.contract(x)).abs() < 1e-14);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub fn apply_covector(&self, k: Covector<T>) -> Covector<T> {
        self.apply(k.raise()).lower()
    }

    /// Applies the boost to the field tensor: E' and cB' in the moving frame; 30 multiplications.
    ///
    /// `E' = γE + u × cB − u(u·E)/(γ+1)`, `cB' = γcB − u × E − u(u·cB)/(γ+1)`, evaluated as
    /// `E' = E + u × (cB + (E × u)/(γ+1))` and `cB' = cB + u × ((cB × u)/(γ+1) − E)`, which keep
    /// the parallel components exact and lose less in `f32`. Accuracy up to γ = 10⁴ (checked on
    /// random cases in `f32`): each component within 2 eps × γ(|E| + |cB|). The
    /// invariants are unchanged to rounding.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Boost, FieldTensor, ThreeVector};
    /// // Into the E × B drift frame, E' = 0 and B' = B/γ (Jackson 3rd ed. §12.3, from memory):
    /// let f = FieldTensor::try_from_fields(ThreeVector::new(0.0_f64, 3e8 * 0.5, 0.0), ThreeVector::new(0.0, 0.0, 1.0))?;
    /// let drift = f.e().cross(f.b()) / f.b().norm_squared();
    /// let g = Boost::try_from_velocity(drift)?.apply_field(&f);
    /// assert!(g.e().norm() < 1e-6);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub fn apply_field(&self, f: &FieldTensor<T>) -> FieldTensor<T> {
        let (e, cb, u) = (f.e(), f.c_b(), self.u);
        let k = self.inv_gamma_plus_one;
        FieldTensor::from_scaled(
            e + u.cross(cb + e.cross(u) * k),
            cb + u.cross(cb.cross(u) * k - e),
        )
    }

    /// The composition "first `self`, then `next`": the transformation `Λ_next Λ_self`.
    ///
    /// For boosts along one line it is again a boost (rapidities add); for non-collinear boosts it
    /// is a boost followed by a rotation, which [`LorentzTransform`] holds without splitting it
    /// (see [`LorentzTransform::try_boost_part`]).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Boost, ThreeVector};
    /// let x = ThreeVector::new(1.0_f64, 0.0, 0.0);
    /// let a = Boost::try_from_rapidity(x, 0.25)?;
    /// let b = Boost::try_from_rapidity(x, 0.5)?;
    /// let ab = a.then(&b).try_boost_part()?;
    /// assert!((ab.rapidity() - 0.75).abs() < 1e-15);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub fn then(&self, next: &Self) -> LorentzTransform<T> {
        self.to_transform().then(&next.to_transform())
    }

    /// The boost as a general transformation matrix: `Λ⁰₀ = γ`, `Λ⁰ⱼ = Λʲ₀ = −uⱼ`,
    /// `Λⁱⱼ = δᵢⱼ + uᵢuⱼ/(γ+1)`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Boost, ThreeVector};
    /// let b = Boost::try_from_beta(ThreeVector::new(0.6_f64, 0.0, 0.0))?;
    /// let m = b.to_transform().to_matrix();
    /// assert!((m[0][1] + 0.75).abs() < 1e-15 && (m[1][1] - 1.25).abs() < 1e-15);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub fn to_transform(&self) -> LorentzTransform<T> {
        let (u, k, one, z) = (self.u, self.inv_gamma_plus_one, T::ONE, T::ZERO);
        // (uᵢuⱼ)k, in this order, keeps the matrix exactly symmetric.
        let row = |ui: T, e: [T; 3]| {
            [
                -ui,
                e[0] + ui * u.x * k,
                e[1] + ui * u.y * k,
                e[2] + ui * u.z * k,
            ]
        };
        LorentzTransform {
            m: [
                [self.gamma, -u.x, -u.y, -u.z],
                row(u.x, [one, z, z]),
                row(u.y, [z, one, z]),
                row(u.z, [z, z, one]),
            ],
        }
    }
}

/// `a·b` of two rows of four.
#[inline(always)]
fn dot4<T: Real>(a: [T; 4], b: [T; 4]) -> T {
    a[0] * b[0] + a[1] * b[1] + a[2] * b[2] + a[3] * b[3]
}

/// The matrix product `a b`.
#[inline]
fn mat_mul<T: Real>(a: &[[T; 4]; 4], b: &[[T; 4]; 4]) -> [[T; 4]; 4] {
    a.map(|row| {
        let mut out = [T::ZERO; 4];
        for (aik, brow) in row.iter().zip(b.iter()) {
            for (o, bkj) in out.iter_mut().zip(brow.iter()) {
                *o += *aik * *bkj;
            }
        }
        out
    })
}

impl<T: Real> LorentzTransform<T> {
    /// The identity.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FourVector, LorentzTransform};
    /// let x = FourVector::new(1.0_f64, 2.0, 3.0, 4.0);
    /// assert_eq!(LorentzTransform::IDENTITY.apply(x), x);
    /// ```
    pub const IDENTITY: Self = Self {
        m: [
            [T::ONE, T::ZERO, T::ZERO, T::ZERO],
            [T::ZERO, T::ONE, T::ZERO, T::ZERO],
            [T::ZERO, T::ZERO, T::ONE, T::ZERO],
            [T::ZERO, T::ZERO, T::ZERO, T::ONE],
        ],
    };

    /// Builds a transformation from its matrix `Λ^μ_ν` (rows μ), without checks.
    ///
    /// Trusts its input: the matrix should satisfy `Λᵀ g Λ = g`, and
    /// [`metric_deviation`](Self::metric_deviation) measures how far it is from that (`+∞` for a
    /// non-finite entry, so that it fails any tolerance). A NaN or infinite entry is carried into
    /// the results of [`apply`](Self::apply) and the other infallible methods;
    /// [`try_boost_part`](Self::try_boost_part) refuses it with [`Error::NonFinite`].
    ///
    /// # Examples
    /// ```
    /// use fourforce::LorentzTransform;
    /// // A passive rotation of the axes by 90° about z: x' = y, y' = −x.
    /// let r = LorentzTransform::from_matrix([
    ///     [1.0_f32, 0.0, 0.0, 0.0],
    ///     [0.0, 0.0, 1.0, 0.0],
    ///     [0.0, -1.0, 0.0, 0.0],
    ///     [0.0, 0.0, 0.0, 1.0],
    /// ]);
    /// assert_eq!(r.metric_deviation(), 0.0);
    /// ```
    #[must_use]
    #[inline]
    pub const fn from_matrix(m: [[T; 4]; 4]) -> Self {
        Self { m }
    }

    /// The matrix `Λ^μ_ν` (rows μ, columns ν).
    ///
    /// # Examples
    /// ```
    /// use fourforce::LorentzTransform;
    /// assert_eq!(LorentzTransform::<f32>::IDENTITY.to_matrix()[2][2], 1.0);
    /// ```
    #[must_use]
    #[inline]
    pub const fn to_matrix(&self) -> [[T; 4]; 4] {
        self.m
    }

    /// The composition "first `self`, then `next`": `Λ_next Λ_self` (64 multiplications), the
    /// same order as [`Boost::then`].
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Boost, FourVector, ThreeVector};
    /// let a = Boost::try_from_beta(ThreeVector::new(0.5_f64, 0.0, 0.0))?.to_transform();
    /// let one = a.then(&a.inverse());
    /// assert!((one.to_matrix()[0][0] - 1.0).abs() < 1e-15);
    /// let r = Boost::try_from_beta(ThreeVector::new(0.0_f64, 0.3, 0.0))?.to_transform();
    /// let x = FourVector::new(1.0, 0.5, -0.25, 2.0);
    /// let d = a.then(&r).apply(x) - r.apply(a.apply(x));
    /// assert!(d.time.abs() < 1e-15 && d.space.norm() < 1e-15);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub fn then(&self, next: &Self) -> Self {
        Self {
            m: mat_mul(&next.m, &self.m),
        }
    }

    /// The inverse `Λ⁻¹ = g Λᵀ g`: the transpose with the time-space entries negated; exact.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Boost, ThreeVector};
    /// let b = Boost::try_from_beta(ThreeVector::new(0.2_f64, -0.3, 0.4))?;
    /// assert_eq!(b.to_transform().inverse(), b.inverse().to_transform());
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub fn inverse(&self) -> Self {
        let m = &self.m;
        let col = |j: usize| -> [T; 4] {
            let c = m.map(|row| row.get(j).copied().unwrap_or(T::ZERO));
            if j == 0 {
                [c[0], -c[1], -c[2], -c[3]]
            } else {
                [-c[0], c[1], c[2], c[3]]
            }
        };
        Self {
            m: [col(0), col(1), col(2), col(3)],
        }
    }

    /// Applies the transformation to a four-vector, `x'^μ = Λ^μ_ν x^ν` (16 multiplications).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Boost, FourVector, ThreeVector};
    /// let b = Boost::try_from_beta(ThreeVector::new(0.1_f64, 0.2, 0.3))?;
    /// let x = FourVector::new(1.0, -1.0, 0.5, 2.0);
    /// let d = b.to_transform().apply(x) - b.apply(x);
    /// assert!(d.time.abs() < 1e-15 && d.space.norm() < 1e-15);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub fn apply(&self, x: FourVector<T>) -> FourVector<T> {
        let a = x.to_array();
        FourVector::from_array(self.m.map(|row| dot4(row, a)))
    }

    /// Applies the transformation to a covector (lower, transform, raise).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Covector, FourVector, LorentzTransform};
    /// let k = Covector::new(1.0_f32, 2.0, 3.0, 4.0);
    /// assert_eq!(LorentzTransform::IDENTITY.apply_covector(k), k);
    /// ```
    #[must_use]
    #[inline]
    pub fn apply_covector(&self, k: Covector<T>) -> Covector<T> {
        self.apply(k.raise()).lower()
    }

    /// Applies the transformation to the field tensor, `F' = Λ F Λᵀ` (88 multiplications).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Boost, FieldTensor, ThreeVector};
    /// let b = Boost::try_from_beta(ThreeVector::new(0.3_f64, 0.0, 0.4))?;
    /// let f = FieldTensor::try_from_scaled(ThreeVector::new(1.0, 2.0, 3.0), ThreeVector::new(-1.0, 0.5, 2.0))?;
    /// let d = b.to_transform().apply_field(&f) - b.apply_field(&f);
    /// assert!(d.e().norm() < 1e-14 && d.c_b().norm() < 1e-14);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub fn apply_field(&self, f: &FieldTensor<T>) -> FieldTensor<T> {
        let lf = mat_mul(&self.m, &f.to_matrix());
        let [r0, r1, r2, r3] = self.m;
        let [_, m1, m2, m3] = lf;
        FieldTensor::from_scaled(
            ThreeVector::new(dot4(m1, r0), dot4(m2, r0), dot4(m3, r0)),
            ThreeVector::new(dot4(m3, r2), dot4(m1, r3), dot4(m2, r1)),
        )
    }

    /// The pure boost `B` of the decomposition `Λ = R·B`, R a rotation: the boost into the
    /// frame whose four-velocity in the lab is `(Λ⁰₀, −Λ⁰₁, −Λ⁰₂, −Λ⁰₃)`.
    ///
    /// # Errors
    /// As [`Boost::try_from_four_velocity`] (non-finite entries, overflow of γ).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Boost, ThreeVector};
    /// let b = Boost::try_from_beta(ThreeVector::new(0.2_f64, 0.1, 0.0))?;
    /// let part = b.to_transform().try_boost_part()?;
    /// assert!((part.beta() - b.beta()).norm() < 1e-15);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_boost_part(&self) -> Result<Boost<T>, Error> {
        let [[g, a, b, c], _, _, _] = self.m;
        Boost::try_from_four_velocity(FourVector::new(g, -a, -b, -c))
    }

    /// The rotation `R = Λ·B⁻¹` of the decomposition `Λ = R·B` (see
    /// [`boost_part`](Self::try_boost_part)); for two non-collinear boosts, the Thomas–Wigner
    /// rotation. Its entries are formed by a product that cancels from about `(Λ⁰₀)²` down to 1,
    /// so they carry an absolute error of a few eps × `(Λ⁰₀)²`.
    ///
    /// # Errors
    /// As [`boost_part`](Self::try_boost_part).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Boost, ThreeVector};
    /// let a = Boost::try_from_beta(ThreeVector::new(0.6_f64, 0.0, 0.0))?;
    /// let b = Boost::try_from_beta(ThreeVector::new(0.0_f64, 0.6, 0.0))?;
    /// let r = a.then(&b).try_rotation_part()?.to_matrix();
    /// assert!((r[0][0] - 1.0).abs() < 1e-15);       // leaves time alone
    /// assert!(r[1][2].abs() > 0.05);                // but turns x towards y
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_rotation_part(&self) -> Result<Self, Error> {
        let b = self.try_boost_part()?;
        Ok(b.inverse().to_transform().then(self))
    }

    /// The largest entry of `Λᵀ g Λ − g`, divided by `(Λ⁰₀)²`: 0 for an exact Lorentz
    /// transformation. An on-device sanity figure for long chains of compositions: after
    /// composing boosts of Lorentz factors γ₁, γ₂, …, expect a few eps × `(γ₁γ₂…)²/(Λ⁰₀)²` (the
    /// products cancel from that scale when the boosts nearly undo each other). `+∞` when an
    /// entry is not finite.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Boost, ThreeVector};
    /// let b = Boost::try_from_beta(ThreeVector::new(0.3_f32, 0.4, 0.5))?;
    /// assert!(b.then(&b.inverse()).metric_deviation() < 8.0 * f32::EPSILON);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub fn metric_deviation(&self) -> T {
        let [r0, r1, r2, r3] = self.m;
        // Columns of Λ as four-vectors: (Λᵀ g Λ)_{μν} = inner(column μ, column ν).
        let col = |j: usize| {
            FourVector::from_array([r0, r1, r2, r3].map(|r| r.get(j).copied().unwrap_or(T::ZERO)))
        };
        let cols = [col(0), col(1), col(2), col(3)];
        let mut worst = T::ZERO;
        for (i, a) in cols.iter().enumerate() {
            for (j, b) in cols.iter().enumerate() {
                let g = match (i, j) {
                    (0, 0) => T::ONE,
                    _ if i == j => T::NEG_ONE,
                    _ => T::ZERO,
                };
                let d = (a.inner(*b) - g).abs();
                if !d.is_finite() {
                    return T::INFINITY;
                }
                worst = worst.max(d);
            }
        }
        // Λ⁰₀² is 0 only if Λ⁰₀ is 0 or its square underflows; column 0 then misses its norm
        // by at least 1, and the quotient is +∞ as documented.
        worst / (r0[0] * r0[0])
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    static FRAME: Boost<f32> = Boost::IDENTITY;
    static CHAIN: LorentzTransform<f64> = LorentzTransform::IDENTITY;

    #[test]
    fn metric_deviation_without_a_time_component_is_infinite() {
        let zero = LorentzTransform::from_matrix([[0.0_f32; 4]; 4]);
        assert_eq!(zero.metric_deviation(), f32::INFINITY);
        // Λ⁰₀ = 1e-30: its square underflows in f32.
        let mut m = [[0.0_f32; 4]; 4];
        m[0][0] = 1e-30;
        for (i, row) in m.iter_mut().enumerate().skip(1) {
            row[i] = 1.0;
        }
        assert_eq!(
            LorentzTransform::from_matrix(m).metric_deviation(),
            f32::INFINITY
        );
        assert_eq!(CHAIN.metric_deviation(), 0.0);
    }

    #[test]
    fn statics_hold_boosts_and_transforms() {
        assert_eq!(FRAME.gamma(), 1.0);
        assert_eq!(CHAIN.metric_deviation(), 0.0);
    }

    #[test]
    fn bad_boosts_are_refused() {
        let x = ThreeVector::new(1.0_f32, 0.0, 0.0);
        assert_eq!(
            Boost::try_from_beta(ThreeVector::new(0.0, 1.5, 0.0)),
            Err(Error::SpeedNotBelowLight)
        );
        assert_eq!(
            Boost::try_from_beta(ThreeVector::new(f32::NAN, 0.0, 0.0)),
            Err(Error::NonFinite)
        );
        assert_eq!(
            Boost::try_from_speed(x, 3.0e8),
            Err(Error::SpeedNotBelowLight)
        );
        assert_eq!(
            Boost::try_from_speed(x, f32::INFINITY),
            Err(Error::NonFinite)
        );
        assert_eq!(
            Boost::try_from_rapidity(ThreeVector::ZERO, 1.0),
            Err(Error::ZeroDirection)
        );
        assert_eq!(Boost::try_from_rapidity(x, 200.0), Err(Error::Overflow));
        assert_eq!(Boost::try_from_rapidity(x, f32::NAN), Err(Error::NonFinite));
        assert_eq!(
            Boost::try_from_four_velocity(FourVector::new(1.0, f32::INFINITY, 0.0, 0.0)),
            Err(Error::NonFinite)
        );
    }

    #[test]
    fn metric_deviation_measures_a_wrong_matrix() {
        // 3·I is not a Lorentz transformation: Λᵀ g Λ − g = 8 g, largest entry 8, over (Λ⁰₀)² = 9.
        let three = LorentzTransform::from_matrix([
            [3.0_f64, 0.0, 0.0, 0.0],
            [0.0, 3.0, 0.0, 0.0],
            [0.0, 0.0, 3.0, 0.0],
            [0.0, 0.0, 0.0, 3.0],
        ]);
        assert_eq!(three.metric_deviation(), 8.0 / 9.0);
        let mut m = LorentzTransform::<f32>::IDENTITY.to_matrix();
        m[1][1] = f32::NAN;
        assert_eq!(
            LorentzTransform::from_matrix(m).metric_deviation(),
            f32::INFINITY
        );
    }

    #[test]
    fn general_transform_keeps_contractions() {
        let a = Boost::try_from_beta(ThreeVector::new(0.5_f64, 0.25, 0.0)).unwrap();
        let b = Boost::try_from_beta(ThreeVector::new(0.0_f64, -0.5, 0.5)).unwrap();
        let t = a.then(&b);
        let k = Covector::new(1.0, -2.0, 0.5, 3.0);
        let x = FourVector::new(2.0, 1.0, -1.0, 0.25);
        let kt = t.apply_covector(k);
        assert!((kt.contract(t.apply(x)) - k.contract(x)).abs() < 1e-13);
        let direct = b.apply_covector(a.apply_covector(k));
        assert!((kt - direct).time.abs() < 1e-14 && (kt - direct).space.norm() < 1e-14);
    }

    #[test]
    fn zero_rapidity_is_the_identity() {
        let b = Boost::try_from_rapidity(ThreeVector::new(0.0_f64, 0.0, 1.0), 0.0).unwrap();
        assert_eq!(b, Boost::IDENTITY);
        assert_eq!(b.to_transform(), LorentzTransform::IDENTITY);
    }
}
