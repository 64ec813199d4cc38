//! Ordinary three-vectors: positions, velocities, E and B fields.
//!
//! [`ThreeVector`] is a plain `(x, y, z)` triple with the operations the rest of the crate needs:
//! sums, scaling, dot and cross products, the length. It carries no unit; each use says which
//! (metres, β, V/m, T).
//!
//! # For firmware authors
//! A dot product is 3 multiplications and 2 additions, a cross product 6 and 3, a length one
//! `hypot`-free square root with scaling only where it is needed ([`ThreeVector::norm`]).
//!
//! # Examples
//! ```
//! use fourforce::ThreeVector;
//! let x = ThreeVector::new(1.0_f32, 0.0, 0.0);
//! let y = ThreeVector::new(0.0_f32, 1.0, 0.0);
//! assert_eq!(x.cross(y), ThreeVector::new(0.0, 0.0, 1.0));
//! ```

use core::ops::{Add, AddAssign, Div, Mul, Neg, Sub, SubAssign};

use crate::{Error, Real};

/// A Cartesian three-vector `(x, y, z)`.
///
/// # Examples
/// ```
/// use fourforce::ThreeVector;
/// let v = ThreeVector::new(3.0_f64, 4.0, 0.0);
/// assert_eq!(v.norm(), 5.0);
/// ```
#[derive(Clone, Copy, Debug, Default, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct ThreeVector<T: Real> {
    /// x component.
    pub x: T,
    /// y component.
    pub y: T,
    /// z component.
    pub z: T,
}

impl<T: Real> ThreeVector<T> {
    /// The zero vector.
    ///
    /// # Examples
    /// ```
    /// use fourforce::ThreeVector;
    /// assert_eq!(ThreeVector::<f32>::ZERO.norm(), 0.0);
    /// ```
    pub const ZERO: Self = Self::new(T::ZERO, T::ZERO, T::ZERO);

    /// Builds `(x, y, z)` without checks.
    ///
    /// Trusts its inputs (for `const` values and numbers already checked): a NaN or infinite
    /// component is kept, the infallible arithmetic of the type carries it into its results
    /// (IEEE rules), and every `try_` function given the vector refuses it with
    /// [`Error::NonFinite`]. For numbers from outside, use [`try_new`](Self::try_new).
    ///
    /// # Examples
    /// ```
    /// use fourforce::ThreeVector;
    /// const X: ThreeVector<f32> = ThreeVector::new(1.0, 0.0, 0.0);
    /// assert_eq!(X.x, 1.0);
    /// ```
    #[must_use]
    pub const fn new(x: T, y: T, z: T) -> Self {
        Self { x, y, z }
    }

    /// Builds `(x, y, z)`, refusing NaN or infinite components.
    ///
    /// # Errors
    /// [`Error::NonFinite`] if any component is NaN or infinite.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, ThreeVector};
    /// assert!(ThreeVector::try_new(1.0_f32, 2.0, 3.0).is_ok());
    /// assert_eq!(ThreeVector::try_new(1.0_f32, f32::NAN, 3.0), Err(Error::NonFinite));
    /// ```
    pub fn try_new(x: T, y: T, z: T) -> Result<Self, Error> {
        let v = Self::new(x, y, z);
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
    /// use fourforce::ThreeVector;
    /// assert!(!ThreeVector::new(f64::INFINITY, 0.0, 0.0).is_finite());
    /// ```
    #[must_use]
    #[inline]
    pub fn is_finite(self) -> bool {
        self.x.is_finite() && self.y.is_finite() && self.z.is_finite()
    }

    /// Dot product `a·b = aₓbₓ + a_yb_y + a_zb_z`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::ThreeVector;
    /// let a = ThreeVector::new(1.0_f32, 2.0, 3.0);
    /// assert_eq!(a.dot(a), 14.0);
    /// ```
    #[must_use]
    #[inline]
    pub fn dot(self, other: Self) -> T {
        self.x * other.x + self.y * other.y + self.z * other.z
    }

    /// Cross product `a × b`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::ThreeVector;
    /// let z = ThreeVector::new(0.0_f64, 0.0, 1.0);
    /// let x = ThreeVector::new(1.0_f64, 0.0, 0.0);
    /// assert_eq!(z.cross(x), ThreeVector::new(0.0, 1.0, 0.0));
    /// ```
    #[must_use]
    #[inline]
    pub fn cross(self, other: Self) -> Self {
        Self::new(
            self.y * other.z - self.z * other.y,
            self.z * other.x - self.x * other.z,
            self.x * other.y - self.y * other.x,
        )
    }

    /// Squared length `a·a` (may overflow or underflow for extreme components; see [`norm`](Self::norm)).
    ///
    /// # Examples
    /// ```
    /// use fourforce::ThreeVector;
    /// assert_eq!(ThreeVector::new(1.0_f32, 2.0, 2.0).norm_squared(), 9.0);
    /// ```
    #[must_use]
    #[inline]
    pub fn norm_squared(self) -> T {
        self.dot(self)
    }

    /// Length `|a|`, scaled by the largest component so that it neither overflows nor underflows.
    ///
    /// Returns 0 for the zero vector; NaN if a component is NaN.
    ///
    /// # Examples
    /// ```
    /// use fourforce::ThreeVector;
    /// let v = ThreeVector::new(3e30_f32, 4e30, 0.0);
    /// assert!((v.norm() / 5e30 - 1.0).abs() < 1e-6);
    /// ```
    #[must_use]
    #[inline]
    pub fn norm(self) -> T {
        let s = self.x.abs().max(self.y.abs()).max(self.z.abs());
        if s == T::ZERO || !s.is_finite() {
            return s;
        }
        let r = self / s;
        s * r.norm_squared().sqrt()
    }

    /// The unit vector along `self`: `a/|a|`.
    ///
    /// Where `|a|²` neither overflows nor falls below 10⁻³⁰ (so no square loses bits to
    /// underflow), `a/√(a·a)` directly: every component within 1.5 ulps of exact, and `a` itself,
    /// unchanged, when `a·a` rounds to 1 (an axis, or a vector already of length 1). Outside that
    /// range, scaled by the largest component first, so every finite non-zero vector, subnormal or
    /// near `MAX`, gives a unit vector of length 1 within a few ulps.
    ///
    /// # Errors
    /// [`Error::ZeroDirection`] for the zero vector, [`Error::NonFinite`] for a non-finite one.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, ThreeVector};
    /// let u = ThreeVector::new(0.0_f32, 3.0, 4.0).try_unit()?;
    /// assert_eq!(u, ThreeVector::new(0.0, 0.6, 0.8));
    /// assert_eq!(ThreeVector::<f32>::ZERO.try_unit(), Err(Error::ZeroDirection));
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_unit(self) -> Result<Self, Error> {
        if !self.is_finite() {
            return Err(Error::NonFinite);
        }
        // Along an axis (two components ±0, told from their bits): the unit vector is the third
        // one's sign, exactly what a/|a| gives, without the norm.
        // (Pairs of magnitudes or-ed together: a single one compared with 0 would become a
        // floating-point comparison again.)
        let (x, y, z) = (
            self.x.abs().to_bits_u64(),
            self.y.abs().to_bits_u64(),
            self.z.abs().to_bits_u64(),
        );
        if x | y == 0 && z != 0 {
            return Ok(Self::new(self.x, self.y, T::ONE.copysign(self.z)));
        }
        if x | z == 0 && y != 0 {
            return Ok(Self::new(self.x, T::ONE.copysign(self.y), self.z));
        }
        if y | z == 0 && x != 0 {
            return Ok(Self::new(T::ONE.copysign(self.x), self.y, self.z));
        }
        // Compared as bits (a·a ≥ 0, so the order of the bits is the order of the values): no
        // floating-point comparison, which is a library call on a chip without an FPU.
        let n2 = self.norm_squared();
        let bits = n2.to_bits_u64();
        if bits >= T::from_f64(1.0e-30).to_bits_u64() && bits < T::INFINITY.to_bits_u64() {
            if bits == T::ONE.to_bits_u64() {
                return Ok(self);
            }
            return Ok(self / n2.sqrt());
        }
        let s = self.x.abs().max(self.y.abs()).max(self.z.abs());
        if s == T::ZERO {
            return Err(Error::ZeroDirection);
        }
        // Scale first: the largest component becomes ±1, so the length of `r` lies in [1, √3] and
        // neither overflows (huge vectors) nor loses bits (subnormal ones).
        let r = self / s;
        Ok(r / r.norm_squared().sqrt())
    }

    /// True when every component is zero (of either sign): a test of the bits, which costs no
    /// floating-point comparison on a chip without an FPU.
    #[inline(always)]
    pub(crate) fn is_zero(self) -> bool {
        self.x.abs().to_bits_u64() | self.y.abs().to_bits_u64() | self.z.abs().to_bits_u64() == 0
    }

    /// Multiplies every component by `k`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::ThreeVector;
    /// assert_eq!(ThreeVector::new(1.0_f32, 2.0, 3.0).scale(2.0), ThreeVector::new(2.0, 4.0, 6.0));
    /// ```
    #[must_use]
    #[inline]
    pub fn scale(self, k: T) -> Self {
        Self::new(self.x * k, self.y * k, self.z * k)
    }

    /// The components as an array `[x, y, z]`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::ThreeVector;
    /// assert_eq!(ThreeVector::new(1.0_f32, 2.0, 3.0).to_array(), [1.0, 2.0, 3.0]);
    /// ```
    #[must_use]
    #[inline]
    pub const fn to_array(self) -> [T; 3] {
        [self.x, self.y, self.z]
    }
}

impl<T: Real> Add for ThreeVector<T> {
    type Output = Self;
    #[inline]
    fn add(self, o: Self) -> Self {
        Self::new(self.x + o.x, self.y + o.y, self.z + o.z)
    }
}

impl<T: Real> Sub for ThreeVector<T> {
    type Output = Self;
    #[inline]
    fn sub(self, o: Self) -> Self {
        Self::new(self.x - o.x, self.y - o.y, self.z - o.z)
    }
}

impl<T: Real> AddAssign for ThreeVector<T> {
    #[inline]
    fn add_assign(&mut self, o: Self) {
        *self = *self + o;
    }
}

impl<T: Real> SubAssign for ThreeVector<T> {
    #[inline]
    fn sub_assign(&mut self, o: Self) {
        *self = *self - o;
    }
}

impl<T: Real> Neg for ThreeVector<T> {
    type Output = Self;
    #[inline]
    fn neg(self) -> Self {
        Self::new(-self.x, -self.y, -self.z)
    }
}

impl<T: Real> Mul<T> for ThreeVector<T> {
    type Output = Self;
    #[inline]
    fn mul(self, k: T) -> Self {
        self.scale(k)
    }
}

impl<T: Real> Div<T> for ThreeVector<T> {
    type Output = Self;
    #[inline]
    fn div(self, k: T) -> Self {
        Self::new(self.x / k, self.y / k, self.z / k)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    static ORIGIN: ThreeVector<f32> = ThreeVector::ZERO;

    #[test]
    fn a_static_holds_a_vector() {
        assert_eq!(ORIGIN.norm(), 0.0);
    }

    #[test]
    fn unit_along_an_axis_is_the_sign_and_elsewhere_a_over_its_norm() {
        let along = [
            (
                ThreeVector::new(0.0_f32, 0.0, -3.0),
                ThreeVector::new(0.0, 0.0, -1.0),
            ),
            (
                ThreeVector::new(0.0, 1e-40, -0.0),
                ThreeVector::new(0.0, 1.0, -0.0),
            ),
            (
                ThreeVector::new(-f32::MAX, 0.0, 0.0),
                ThreeVector::new(-1.0, 0.0, 0.0),
            ),
        ];
        for (v, unit) in along {
            assert_eq!(v.try_unit(), Ok(unit));
            assert_eq!(
                v.try_unit().map(|u| u.z.is_sign_negative()),
                Ok(v.z.is_sign_negative())
            );
        }
        let v = ThreeVector::new(1.0_f32, -2.0, 2.0);
        assert_eq!(
            v.try_unit(),
            Ok(ThreeVector::new(1.0 / 3.0, -2.0 / 3.0, 2.0 / 3.0))
        );
        let tiny = ThreeVector::new(3.0e-30_f32, 4.0e-30, 0.0)
            .try_unit()
            .unwrap();
        assert!(
            (tiny.x - 0.6).abs() < 2.0 * f32::EPSILON && (tiny.y - 0.8).abs() < 2.0 * f32::EPSILON
        );
    }

    #[test]
    fn norm_survives_f32_underflow_and_overflow() {
        let tiny = ThreeVector::new(3e-30_f32, 4e-30, 0.0);
        assert!((tiny.norm() / 5e-30 - 1.0).abs() < 2.0 * f32::EPSILON);
        let huge = ThreeVector::new(3e37_f32, 4e37, 0.0);
        assert!((huge.norm() / 5e37 - 1.0).abs() < 2.0 * f32::EPSILON);
    }

    #[test]
    fn cross_is_antisymmetric_and_orthogonal() {
        let a = ThreeVector::new(1.0_f64, -2.0, 0.5);
        let b = ThreeVector::new(0.25_f64, 3.0, -1.0);
        assert_eq!(a.cross(b), -b.cross(a));
        assert_eq!(a.cross(b).dot(a), 0.0);
    }
}
