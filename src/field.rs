//! The electromagnetic field tensor: six components, E and cB, both in V/m.
//!
//! [`FieldTensor`] is the antisymmetric `F^μν` with both indices up, in the convention
//! `F^{i0} = Eⁱ/c`, `F^{ij} = −ε^{ijk}Bᵏ`. It stores only its six independent components, and
//! stores them scaled by c so that every one is a field in V/m: `E` and `cB`. Its components are
//! therefore those of `c F^μν`:
//!
//! ```text
//!            ⎛  0    −Eₓ    −E_y    −E_z ⎞
//! c F^μν  =  ⎜  Eₓ    0     −cB_z   cB_y ⎟      (V/m)
//!            ⎜  E_y   cB_z   0     −cB_x ⎟
//!            ⎝  E_z  −cB_y   cB_x   0    ⎠
//! ```
//!
//! With a four-velocity `u = γ(1, β)` in units of c, the contraction `c F^μ_ν u^ν` is
//! `γ(E·β, E + β × cB)` in V/m ([`FieldTensor::contract`], 12 multiplications); times the charge
//! in units of e it is the four-force in eV/m ([`FieldTensor::four_force`]).
//!
//! Lowering both indices gives [`CovariantFieldTensor`] (`F_{0i} = −F^{0i}`, `F_{ij} = F^{ij}`);
//! the dual swaps the roles of E and cB ([`FieldTensor::dual`]). The two invariants are
//! `F_μν F^μν = 2(B² − E²/c²)` ([`FieldTensor::scalar_invariant`]) and `E·B`
//! ([`FieldTensor::pseudoscalar_invariant`]); both are summed with exact products, and the
//! `*_of` forms take E and B in SI with c in two exact parts, which keeps the near-null case
//! (|E| ≈ c|B|) within 1.5 eps where the plain `f32` formula is off by 4 %.
//!
//! It is the crate's one field type: the pushers read a `FieldTensor` from their
//! [`FieldSource`](crate::push::FieldSource), and a `FieldTensor` is itself a uniform source.
//!
//! # Range
//! The checked constructors refuse any |E| or |cB| component above [`FieldTensor::limit`]
//! (4·10¹⁸ V/m in `f32`, 10¹⁵⁰ V/m in `f64`; the Schwinger field is 1.3·10¹⁸ V/m): within it, the
//! invariants never overflow.
//!
//! # For firmware authors
//! 24 bytes in `f32`; `const`-constructible. The contraction is 12 multiplications and 9 additions,
//! the same work as writing `γ(E·β, E + β×cB)` by hand.
//!
//! # Examples
//! ```
//! use fourforce::{FieldTensor, FourVector, ThreeVector};
//! let f = FieldTensor::try_from_fields(ThreeVector::new(0.0_f64, 1e5, 0.0), ThreeVector::new(0.0, 0.0, 0.01))?;
//! assert_eq!(f.e().y, 1e5);
//! assert!((f.b().z - 0.01).abs() < 1e-17);
//! assert_eq!(f.try_component(2, 0)?, 1e5); // c F^{20} = E_y
//! # Ok::<(), fourforce::Error>(())
//! ```

use core::ops::{Add, Mul, Neg, Sub};

use crate::compensated::Accumulator;
use crate::{Covector, Error, FourVector, Real, ThreeVector};

/// The electromagnetic field tensor `F^μν` (both indices up), stored as its six independent
/// components E and cB in V/m.
///
/// # Examples
/// ```
/// use fourforce::{FieldTensor, ThreeVector};
/// // An invented deflector: 2 MV/m along y, no magnetic field.
/// let f = FieldTensor::try_from_fields(ThreeVector::new(0.0_f32, 2e6, 0.0), ThreeVector::ZERO)?;
/// assert_eq!(f.try_component(0, 2)?, -2e6);
/// # Ok::<(), fourforce::Error>(())
/// ```
#[derive(Clone, Copy, Debug, Default, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct FieldTensor<T: Real> {
    e: ThreeVector<T>,
    cb: ThreeVector<T>,
}

/// The field tensor with both indices down, `F_μν = g_μα g_νβ F^αβ`: `F_{0i} = Eⁱ/c`,
/// `F_{ij} = −ε^{ijk}Bᵏ`; stored, like [`FieldTensor`], as E and cB in V/m.
///
/// # Examples
/// ```
/// use fourforce::{FieldTensor, ThreeVector};
/// let f = FieldTensor::try_from_fields(ThreeVector::new(1.0_f32, 0.0, 0.0), ThreeVector::ZERO)?;
/// let low = f.lower();
/// assert_eq!(low.try_component(0, 1)?, -f.try_component(0, 1)?);
/// assert_eq!(low.raise(), f);
/// # Ok::<(), fourforce::Error>(())
/// ```
#[derive(Clone, Copy, Debug, Default, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct CovariantFieldTensor<T: Real> {
    e: ThreeVector<T>,
    cb: ThreeVector<T>,
}

/// `1/c²` in s²/m², correctly rounded to the precision.
#[inline(always)]
fn inv_c_squared<T: Real>() -> T {
    T::from_f64(1.0 / (299_792_458.0 * 299_792_458.0))
}

/// `c² F^μν` entries of an antisymmetric matrix from E and cB (upper indices).
#[inline]
fn upper_matrix<T: Real>(e: ThreeVector<T>, cb: ThreeVector<T>) -> [[T; 4]; 4] {
    let z = T::ZERO;
    [
        [z, -e.x, -e.y, -e.z],
        [e.x, z, -cb.z, cb.y],
        [e.y, cb.z, z, -cb.x],
        [e.z, -cb.y, cb.x, z],
    ]
}

/// Reads an entry of a 4×4 array by checked indices.
#[inline]
fn entry<T: Real>(m: &[[T; 4]; 4], mu: usize, nu: usize) -> Result<T, Error> {
    m.get(mu)
        .and_then(|row| row.get(nu))
        .copied()
        .ok_or(Error::OutOfBounds)
}

impl<T: Real> FieldTensor<T> {
    /// The zero field.
    ///
    /// # Examples
    /// ```
    /// use fourforce::FieldTensor;
    /// assert_eq!(FieldTensor::<f32>::ZERO.scalar_invariant(), 0.0);
    /// ```
    pub const ZERO: Self = Self::from_scaled(ThreeVector::ZERO, ThreeVector::ZERO);

    /// The largest |E| or |cB| component the checked constructors accept, in V/m: 4·10¹⁸ in
    /// `f32`, 10¹⁵⁰ in `f64`.
    ///
    /// Within it, every invariant and exact product of this module stays finite.
    ///
    /// # Examples
    /// ```
    /// use fourforce::FieldTensor;
    /// assert_eq!(FieldTensor::<f32>::limit(), 4.0e18);
    /// ```
    #[must_use]
    #[inline]
    pub fn limit() -> T {
        field_limit()
    }

    /// Builds the tensor from E (V/m) and cB (V/m), without checks.
    ///
    /// For `const` tables of trusted fields and for field sources in the pushers' hot loop: it
    /// trusts its inputs. Outside [`limit`](Self::limit) the invariants may not be finite; a NaN
    /// or infinite component is kept, the infallible methods carry it into their results, the
    /// pushers refuse it ([`Error::NonFinite`], particle unchanged) and
    /// [`try_four_force`](Self::try_four_force) refuses what it produces. For fields from outside,
    /// use [`try_from_scaled`](Self::try_from_scaled) or
    /// [`try_from_fields`](Self::try_from_fields).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FieldTensor, ThreeVector};
    /// // cB = 299 792 458 V/m is B = 1 T.
    /// const DIPOLE: FieldTensor<f64> =
    ///     FieldTensor::from_scaled(ThreeVector::ZERO, ThreeVector::new(0.0, 0.0, 299_792_458.0));
    /// assert_eq!(DIPOLE.b().z, 1.0);
    /// ```
    #[must_use]
    #[inline]
    pub const fn from_scaled(e_v_per_m: ThreeVector<T>, cb_v_per_m: ThreeVector<T>) -> Self {
        Self {
            e: e_v_per_m,
            cb: cb_v_per_m,
        }
    }

    /// Builds the tensor from E (V/m) and cB (V/m), checking both.
    ///
    /// # Errors
    /// [`Error::NonFinite`] for a non-finite component; [`Error::Overflow`] for a component above
    /// [`limit`](Self::limit) in magnitude.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, FieldTensor, ThreeVector};
    /// let cb = ThreeVector::new(0.0_f32, 0.0, 3.0e8);
    /// assert!(FieldTensor::try_from_scaled(ThreeVector::ZERO, cb).is_ok());
    /// let huge = ThreeVector::new(1e20_f32, 0.0, 0.0);
    /// assert_eq!(FieldTensor::try_from_scaled(huge, cb), Err(Error::Overflow));
    /// ```
    #[inline(always)]
    pub fn try_from_scaled(
        e_v_per_m: ThreeVector<T>,
        cb_v_per_m: ThreeVector<T>,
    ) -> Result<Self, Error> {
        check_field(e_v_per_m)?;
        check_field(cb_v_per_m)?;
        Ok(Self::from_scaled(e_v_per_m, cb_v_per_m))
    }

    /// Builds the tensor from E in V/m and B in T.
    ///
    /// `cB` is formed with c in two exact parts (`C_HI·B + C_LO·B`), within 0.5 eps plus the
    /// rounding of the sum.
    ///
    /// # Errors
    /// [`Error::NonFinite`] for a non-finite component; [`Error::Overflow`] for an |E| or |cB|
    /// component above [`limit`](Self::limit).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FieldTensor, ThreeVector};
    /// let f = FieldTensor::try_from_fields(ThreeVector::new(0.0_f64, 1000.0, 0.0), ThreeVector::new(0.0, 0.0, 1e-5))?;
    /// assert!((f.c_b().z - 2997.924_58).abs() < 1e-12);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[inline(always)]
    pub fn try_from_fields(e_v_per_m: ThreeVector<T>, b_t: ThreeVector<T>) -> Result<Self, Error> {
        if !b_t.is_finite() {
            return Err(Error::NonFinite);
        }
        Self::try_from_scaled(e_v_per_m, c_b_checked(b_t)?)
    }

    /// True when every component is finite.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FieldTensor, ThreeVector};
    /// assert!(FieldTensor::<f32>::ZERO.is_finite());
    /// ```
    #[must_use]
    #[inline]
    pub fn is_finite(&self) -> bool {
        self.e.is_finite() && self.cb.is_finite()
    }

    /// The electric field E in V/m.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FieldTensor, ThreeVector};
    /// let e = ThreeVector::new(1.0_f32, 2.0, 3.0);
    /// assert_eq!(FieldTensor::try_from_fields(e, ThreeVector::ZERO)?.e(), e);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn e(&self) -> ThreeVector<T> {
        self.e
    }

    /// The magnetic field scaled by c, cB, in V/m (as stored).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FieldTensor, ThreeVector};
    /// let f = FieldTensor::try_from_scaled(ThreeVector::ZERO, ThreeVector::new(0.0_f32, 5.0, 0.0))?;
    /// assert_eq!(f.c_b().y, 5.0);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn c_b(&self) -> ThreeVector<T> {
        self.cb
    }

    /// The magnetic field B in T, `cB · (1/c)`: within 2 eps of the B given to
    /// [`try_from_fields`](Self::try_from_fields).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FieldTensor, ThreeVector};
    /// let b = ThreeVector::new(0.0_f32, 0.0, 1.5);
    /// let f = FieldTensor::try_from_fields(ThreeVector::ZERO, b)?;
    /// assert!((f.b().z - 1.5).abs() <= 2.0 * 1.5 * f32::EPSILON);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub fn b(&self) -> ThreeVector<T> {
        self.cb * T::INV_SPEED_OF_LIGHT
    }

    /// The component `c F^μν` in V/m (`μ, ν` from 0 to 3, 0 the time index).
    ///
    /// # Errors
    /// [`Error::OutOfBounds`] if an index is above 3.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FieldTensor, ThreeVector};
    /// let f = FieldTensor::try_from_scaled(ThreeVector::new(1.0_f32, 2.0, 3.0), ThreeVector::new(4.0, 5.0, 6.0))?;
    /// assert_eq!(f.try_component(1, 0)?, 1.0);  // E_x
    /// assert_eq!(f.try_component(1, 2)?, -6.0); // −cB_z
    /// assert_eq!(f.try_component(2, 1)?, 6.0);  // antisymmetric
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_component(&self, mu: usize, nu: usize) -> Result<T, Error> {
        entry(&self.to_matrix(), mu, nu)
    }

    /// The 4×4 array of `c F^μν` in V/m, rows `μ`, columns `ν`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FieldTensor, ThreeVector};
    /// let f = FieldTensor::try_from_scaled(ThreeVector::new(1.0_f64, 0.0, 0.0), ThreeVector::ZERO)?;
    /// assert_eq!(f.to_matrix()[1][0], 1.0);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub fn to_matrix(&self) -> [[T; 4]; 4] {
        upper_matrix(self.e, self.cb)
    }

    /// The 4×4 array of the mixed tensor `c F^μ_ν = c F^μα g_αν` in V/m, the matrix that
    /// [`contract`](Self::contract) applies.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FieldTensor, ThreeVector};
    /// let f = FieldTensor::try_from_scaled(ThreeVector::new(1.0_f64, 0.0, 0.0), ThreeVector::ZERO)?;
    /// let m = f.to_mixed_matrix();
    /// assert_eq!((m[0][1], m[1][0]), (1.0, 1.0)); // symmetric in its E part
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub fn to_mixed_matrix(&self) -> [[T; 4]; 4] {
        self.to_matrix().map(|[a, b, c, d]| [a, -b, -c, -d])
    }

    /// The contraction `c F^μ_ν u^ν = (E·u, E u⁰ + u × cB)` in V/m: 12 multiplications.
    ///
    /// For a four-velocity in units of c, `u = γ(1, β)`, this is `γ(E·β, E + β × cB)`, the
    /// four-force per unit charge in eV/m (see [`four_force`](Self::four_force)).
    /// Accuracy: each component within 1.6 eps × `(u⁰|E| + |u||cB|)` up to γ = 10⁴ (checked on
    /// random cases in `f32`); a component may cancel far below that scale.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FieldTensor, FourVector, ThreeVector};
    /// let f = FieldTensor::try_from_scaled(ThreeVector::ZERO, ThreeVector::new(0.0_f32, 0.0, 1.0))?;
    /// let u = FourVector::new(1.0_f32, 1.0, 0.0, 0.0);
    /// assert_eq!(f.contract(u), FourVector::new(0.0, 0.0, -1.0, 0.0)); // x̂ × ẑ = −ŷ
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub fn contract(&self, u: FourVector<T>) -> FourVector<T> {
        let (e, b, s, t) = (self.e, self.cb, u.space, u.time);
        FourVector::new(
            e.x * s.x + e.y * s.y + e.z * s.z,
            e.x * t + (s.y * b.z - s.z * b.y),
            e.y * t + (s.z * b.x - s.x * b.z),
            e.z * t + (s.x * b.y - s.y * b.x),
        )
    }

    /// The contraction `c F^μν k_ν = (−E·k, E k₀ − k × cB)` with a covector, in V/m.
    ///
    /// Equal to [`contract`](Self::contract) of the raised vector: `F^μν k_ν = F^μ_ν k^ν`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FieldTensor, FourVector, ThreeVector};
    /// let f = FieldTensor::try_from_scaled(ThreeVector::new(1.0_f64, 2.0, 0.0), ThreeVector::new(0.0, 0.5, 3.0))?;
    /// let u = FourVector::new(2.0_f64, 0.25, -1.0, 0.5);
    /// assert_eq!(f.contract_covector(u.lower()), f.contract(u));
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub fn contract_covector(&self, k: Covector<T>) -> FourVector<T> {
        self.contract(k.raise())
    }

    /// Lowers both indices: `F_μν`, with E changing sign and cB unchanged; exact.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FieldTensor, ThreeVector};
    /// let f = FieldTensor::try_from_scaled(ThreeVector::new(1.0_f32, 0.0, 0.0), ThreeVector::new(0.0, 2.0, 0.0))?;
    /// assert_eq!(f.lower().try_component(1, 0)?, -1.0);
    /// assert_eq!(f.lower().try_component(1, 3)?, 2.0);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn lower(&self) -> CovariantFieldTensor<T> {
        CovariantFieldTensor {
            e: self.e,
            cb: self.cb,
        }
    }

    /// The dual tensor `F̃^μν = ½ ε^μνρσ F_ρσ`: E → cB and cB → −E; exact.
    ///
    /// Its invariants are those of F with the scalar negated; the dual of the dual is `−F`.
    /// Convention as Jackson 3rd ed. §11.9 (from memory), with `ε^{0123} = +1`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FieldTensor, ThreeVector};
    /// let f = FieldTensor::try_from_scaled(ThreeVector::new(1.0_f32, 0.0, 0.0), ThreeVector::new(0.0, 2.0, 0.0))?;
    /// assert_eq!(f.dual().e(), ThreeVector::new(0.0, 2.0, 0.0));
    /// assert_eq!(f.dual().dual(), -f);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub fn dual(&self) -> Self {
        Self::from_scaled(self.cb, -self.e)
    }

    /// The scalar invariant `F_μν F^μν = 2(B² − E²/c²)` in T².
    ///
    /// Computed as `2(cB·cB − E·E)/c²` with exact products and a compensated sum: within about
    /// 1.5 eps of the value of the stored components even near a null field (|E| ≈ c|B|). For
    /// fields given in SI near the null case, the stored cB has already been rounded; use
    /// [`try_scalar_invariant_of`](Self::try_scalar_invariant_of) on the SI fields instead.
    /// Edges: 0 for the zero field.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FieldTensor, ThreeVector};
    /// // Jackson, Classical Electrodynamics, 3rd ed., §11.9 (from memory);
    /// // value mpmath: 0.094 999 988 592 107 9 T².
    /// let f = FieldTensor::try_from_fields(ThreeVector::new(0.0_f64, 134_906_608.0, 0.0), ThreeVector::new(0.0, 0.0, 0.5))?;
    /// assert!((f.scalar_invariant() / 0.094_999_988_592_107_9 - 1.0).abs() < 1e-15);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub fn scalar_invariant(&self) -> T {
        let mut acc = Accumulator::new();
        for (cb, e) in self.cb.to_array().into_iter().zip(self.e.to_array()) {
            acc.add_product(cb, cb);
            acc.sub_product(e, e);
        }
        T::TWO * acc.value() * inv_c_squared::<T>()
    }

    /// The scalar invariant `2(B² − E²/c²)` in T² from E in V/m and B in T, within 1.5 eps even
    /// near a null field.
    ///
    /// `cB` is split exactly with c in two parts (`C_HI + C_LO`) and exact products, and the six
    /// squares are summed with a compensated sum, the generalisation to vectors of
    /// `2(cB − E)(cB + E)/c²` with `cB − E = fma(C_HI, B, −E) + C_LO·B`. For E = cB(1 − 10⁻⁶),
    /// B = 0.5 T it stays within that bound, where the plain `f32` formula is off by 4 %.
    ///
    /// # Errors
    /// [`Error::NonFinite`] for a non-finite component; [`Error::Overflow`] for an |E| or |cB|
    /// component above [`limit`](Self::limit).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FieldTensor, ThreeVector};
    /// // E ⟂ B, E = cB (1 − 1e-6), B = 0.5 T: 9.940 205 097e-7 T² (mpmath).
    /// let e = ThreeVector::new(0.0_f32, 149_896_080.0, 0.0);
    /// let b = ThreeVector::new(0.0_f32, 0.0, 0.5);
    /// let s = FieldTensor::try_scalar_invariant_of(e, b)?;
    /// assert!((s / 9.940_205_097e-7 - 1.0).abs() < 2.0 * f32::EPSILON);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_scalar_invariant_of(
        e_v_per_m: ThreeVector<T>,
        b_t: ThreeVector<T>,
    ) -> Result<T, Error> {
        if !b_t.is_finite() {
            return Err(Error::NonFinite);
        }
        check_field(e_v_per_m)?;
        check_field(c_b_checked(b_t)?)?;
        let mut acc = Accumulator::new();
        for (b, e) in b_t.to_array().into_iter().zip(e_v_per_m.to_array()) {
            // cB = hi + lo exactly (to far below the last bit of hi): hi + pe + C_LO·B.
            let (hi, pe) = crate::compensated::two_prod(T::C_HI, b);
            let lo = pe + T::C_LO * b;
            acc.add_product(hi, hi);
            // (hi + lo)² = hi² + 2·hi·lo + lo²; lo² is left out: |lo/hi| < 2⁻ᵖ (C_LO/C_HI is
            // 3.3e-8 in f32, and pe is at most half an ulp of hi), so it lies below half an ulp
            // of 2·hi·lo.
            acc.add_small(T::TWO * hi * lo);
            acc.sub_product(e, e);
        }
        Ok(T::TWO * acc.value() * inv_c_squared::<T>())
    }

    /// The pseudoscalar invariant `E·B` in V·T/m (`−¼ c F_μν F̃^μν`).
    ///
    /// Computed as `(E·cB)/c` with exact products and a compensated sum: within about 1.5 eps of
    /// the stored components' value, and exactly 0 for perpendicular fields. Edges: 0 for the zero
    /// field.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FieldTensor, ThreeVector};
    /// let f = FieldTensor::try_from_fields(ThreeVector::new(3e5_f64, 0.0, 0.0), ThreeVector::new(0.25, 0.0, 0.0))?;
    /// assert!((f.pseudoscalar_invariant() - 75_000.0).abs() < 1e-10);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub fn pseudoscalar_invariant(&self) -> T {
        let mut acc = Accumulator::new();
        for (cb, e) in self.cb.to_array().into_iter().zip(self.e.to_array()) {
            acc.add_product(e, cb);
        }
        acc.value() * T::INV_SPEED_OF_LIGHT
    }

    /// The pseudoscalar invariant `E·B` in V·T/m from E in V/m and B in T, with exact products and
    /// a compensated sum (within 0.5 eps plus the conditioning of the sum).
    ///
    /// # Errors
    /// [`Error::NonFinite`] for a non-finite component; [`Error::Overflow`] for an |E| or |cB|
    /// component above [`limit`](Self::limit).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FieldTensor, ThreeVector};
    /// let e = ThreeVector::new(1.0_f32, 1.0, 0.0);
    /// let b = ThreeVector::new(1.0_f32, -1.0, 0.0);
    /// assert_eq!(FieldTensor::try_pseudoscalar_invariant_of(e, b)?, 0.0);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_pseudoscalar_invariant_of(
        e_v_per_m: ThreeVector<T>,
        b_t: ThreeVector<T>,
    ) -> Result<T, Error> {
        if !b_t.is_finite() {
            return Err(Error::NonFinite);
        }
        check_field(e_v_per_m)?;
        check_field(c_b_checked(b_t)?)?;
        let mut acc = Accumulator::new();
        for (b, e) in b_t.to_array().into_iter().zip(e_v_per_m.to_array()) {
            acc.add_product(e, b);
        }
        Ok(acc.value())
    }
}

/// `c·B` with c in two exact parts.
#[inline]
fn c_times<T: Real>(b: ThreeVector<T>) -> ThreeVector<T> {
    b * T::C_HI + b * T::C_LO
}

/// `c·B` of a finite `B`; [`Error::Overflow`] when it does not fit the precision (so that a
/// finite field too large is refused as too large, not as non-finite).
#[inline(always)]
fn c_b_checked<T: Real>(b: ThreeVector<T>) -> Result<ThreeVector<T>, Error> {
    let cb = c_times(b);
    if cb.is_finite() {
        Ok(cb)
    } else {
        Err(Error::Overflow)
    }
}

/// See [`FieldTensor::limit`].
#[inline(always)]
fn field_limit<T: Real>() -> T {
    if T::MANTISSA_DIGITS <= 24 {
        T::from_f64(4.0e18)
    } else {
        T::from_f64(1.0e150)
    }
}

/// Checks that every component is finite and within [`FieldTensor::limit`].
#[inline]
fn check_field<T: Real>(v: ThreeVector<T>) -> Result<(), Error> {
    if !v.is_finite() {
        return Err(Error::NonFinite);
    }
    let m = v.x.abs().max(v.y.abs()).max(v.z.abs());
    if m > field_limit() {
        return Err(Error::Overflow);
    }
    Ok(())
}

impl<T: Real> CovariantFieldTensor<T> {
    /// Raises both indices back to [`FieldTensor`]; exact.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FieldTensor, ThreeVector};
    /// let f = FieldTensor::try_from_scaled(ThreeVector::new(1.0_f64, 2.0, 3.0), ThreeVector::new(4.0, 5.0, 6.0))?;
    /// assert_eq!(f.lower().raise(), f);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn raise(&self) -> FieldTensor<T> {
        FieldTensor {
            e: self.e,
            cb: self.cb,
        }
    }

    /// The component `c F_μν` in V/m.
    ///
    /// # Errors
    /// [`Error::OutOfBounds`] if an index is above 3.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FieldTensor, ThreeVector};
    /// let f = FieldTensor::try_from_scaled(ThreeVector::new(1.0_f32, 0.0, 0.0), ThreeVector::ZERO)?;
    /// assert_eq!(f.lower().try_component(0, 1)?, 1.0); // c F_{01} = E_x
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_component(&self, mu: usize, nu: usize) -> Result<T, Error> {
        entry(&self.to_matrix(), mu, nu)
    }

    /// The 4×4 array of `c F_μν` in V/m.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FieldTensor, ThreeVector};
    /// let f = FieldTensor::try_from_scaled(ThreeVector::ZERO, ThreeVector::new(0.0_f64, 0.0, 1.0))?;
    /// assert_eq!(f.lower().to_matrix()[1][2], -1.0); // c F_{12} = −cB_z
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub fn to_matrix(&self) -> [[T; 4]; 4] {
        upper_matrix(-self.e, self.cb)
    }

    /// The contraction `c F_μν x^ν` (a covector) in V/m: the lowered form of
    /// [`FieldTensor::contract`].
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FieldTensor, FourVector, ThreeVector};
    /// let f = FieldTensor::try_from_scaled(ThreeVector::new(1.0_f32, 2.0, 0.0), ThreeVector::new(0.0, 0.5, 3.0))?;
    /// let u = FourVector::new(2.0_f32, 0.25, -1.0, 0.5);
    /// assert_eq!(f.lower().contract(u), f.contract(u).lower());
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub fn contract(&self, x: FourVector<T>) -> Covector<T> {
        self.raise().contract(x).lower()
    }

    /// The full contraction `c² F_μν G^μν = 2(cB_F·cB_G − E_F·E_G)` in V²/m², with exact products
    /// and a compensated sum.
    ///
    /// With `G = F` this is `c²` times the scalar invariant; with `G = F̃` it is `−4c E·B`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FieldTensor, ThreeVector};
    /// let f = FieldTensor::try_from_scaled(ThreeVector::new(3.0_f64, 0.0, 0.0), ThreeVector::new(0.0, 0.0, 5.0))?;
    /// assert_eq!(f.lower().double_contract(&f), 2.0 * (25.0 - 9.0));
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub fn double_contract(&self, g: &FieldTensor<T>) -> T {
        let mut acc = Accumulator::new();
        for ((fb, fe), (gb, ge)) in self
            .cb
            .to_array()
            .into_iter()
            .zip(self.e.to_array())
            .zip(g.cb.to_array().into_iter().zip(g.e.to_array()))
        {
            acc.add_product(fb, gb);
            acc.sub_product(fe, ge);
        }
        T::TWO * acc.value()
    }

    /// The electric field E in V/m of the tensor (not the sign-flipped `F_{i0}`).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FieldTensor, ThreeVector};
    /// let e = ThreeVector::new(1.0_f32, 0.0, 0.0);
    /// assert_eq!(FieldTensor::try_from_scaled(e, ThreeVector::ZERO)?.lower().e(), e);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn e(&self) -> ThreeVector<T> {
        self.e
    }

    /// The magnetic field scaled by c, cB, in V/m.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FieldTensor, ThreeVector};
    /// let cb = ThreeVector::new(0.0_f32, 1.0, 0.0);
    /// assert_eq!(FieldTensor::try_from_scaled(ThreeVector::ZERO, cb)?.lower().c_b(), cb);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn c_b(&self) -> ThreeVector<T> {
        self.cb
    }
}

impl<T: Real> Add for FieldTensor<T> {
    type Output = Self;
    #[inline]
    fn add(self, o: Self) -> Self {
        Self::from_scaled(self.e + o.e, self.cb + o.cb)
    }
}

impl<T: Real> Sub for FieldTensor<T> {
    type Output = Self;
    #[inline]
    fn sub(self, o: Self) -> Self {
        Self::from_scaled(self.e - o.e, self.cb - o.cb)
    }
}

impl<T: Real> Neg for FieldTensor<T> {
    type Output = Self;
    #[inline]
    fn neg(self) -> Self {
        Self::from_scaled(-self.e, -self.cb)
    }
}

impl<T: Real> Mul<T> for FieldTensor<T> {
    type Output = Self;
    #[inline]
    fn mul(self, k: T) -> Self {
        Self::from_scaled(self.e * k, self.cb * k)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    static DIPOLE: FieldTensor<f32> =
        FieldTensor::from_scaled(ThreeVector::ZERO, ThreeVector::new(0.0, 0.0, 299_792_448.0));
    static LOWERED: CovariantFieldTensor<f64> = FieldTensor::ZERO.lower();

    #[test]
    fn statics_hold_tensors() {
        assert_eq!(DIPOLE.c_b().z, 299_792_448.0);
        assert_eq!(LOWERED.raise(), FieldTensor::ZERO);
    }

    #[test]
    fn matrix_is_antisymmetric_and_indices_are_checked() {
        let f = FieldTensor::from_scaled(
            ThreeVector::new(1.0_f64, 2.0, 3.0),
            ThreeVector::new(4.0, 5.0, 6.0),
        );
        for mu in 0..4 {
            for nu in 0..4 {
                assert_eq!(
                    f.try_component(mu, nu).unwrap(),
                    -f.try_component(nu, mu).unwrap()
                );
            }
        }
        assert_eq!(f.try_component(4, 0), Err(Error::OutOfBounds));
        assert_eq!(f.lower().try_component(0, 9), Err(Error::OutOfBounds));
    }

    #[test]
    fn bad_fields_are_refused() {
        let z = ThreeVector::<f32>::ZERO;
        let nan = ThreeVector::new(f32::NAN, 0.0, 0.0);
        assert_eq!(FieldTensor::try_from_fields(nan, z), Err(Error::NonFinite));
        assert_eq!(FieldTensor::try_from_fields(z, nan), Err(Error::NonFinite));
        let strong = ThreeVector::new(0.0, 2e10_f32, 0.0); // cB = 6e18 V/m
        assert_eq!(
            FieldTensor::try_from_fields(z, strong),
            Err(Error::Overflow)
        );
        assert_eq!(
            FieldTensor::try_scalar_invariant_of(z, strong),
            Err(Error::Overflow)
        );
    }
}
