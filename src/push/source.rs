//! Field sources: where the pushers read E and B.
//!
//! A [`FieldSource`] answers one question: the electric field (V/m) and the magnetic flux density
//! (T) at a position (m) and a time (s). It is implemented for
//! - closures `Fn(ThreeVector<T>, T) -> LocalField<T>` (a measured map, an analytic model),
//! - [`UniformField`] (and [`LocalField`] itself, which is a uniform field),
//! - [`SumOfFields`] of any two sources (build it with [`FieldSource::plus`]) and arrays
//!   `[S; N]` of one kind of source, whose fields add (superposition).
//!
//! Everything is generic: the pushers are monomorphised for the source, so the inner loop has no
//! dynamic dispatch and no allocation.
//!
//! # Examples
//! ```
//! use fourforce::ThreeVector;
//! use fourforce::push::{FieldSource, LocalField, UniformField};
//! let solenoid = UniformField::try_new(ThreeVector::ZERO, ThreeVector::new(0.0_f32, 0.0, 0.5))?;
//! let ramp = |x: ThreeVector<f32>, _t: f32| {
//!     LocalField::new(ThreeVector::new(1.0e3 * x.x, 0.0, 0.0), ThreeVector::ZERO)
//! };
//! let total = solenoid.plus(ramp);
//! let f = total.field_at(ThreeVector::new(2.0, 0.0, 0.0), 0.0);
//! assert_eq!(f.electric.x, 2.0e3);
//! assert_eq!(f.magnetic.z, 0.5);
//! # Ok::<(), fourforce::Error>(())
//! ```

use crate::{Error, Real, ThreeVector};

/// The electric field `E` (V/m) and magnetic flux density `B` (T) at one point and time.
///
/// # Examples
/// ```
/// use fourforce::ThreeVector;
/// use fourforce::push::LocalField;
/// let f = LocalField::new(ThreeVector::new(1.0e5_f64, 0.0, 0.0), ThreeVector::ZERO);
/// assert_eq!(f.electric.x, 1.0e5);
/// ```
#[derive(Clone, Copy, Debug, Default, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct LocalField<T: Real> {
    /// Electric field `E` in V/m.
    pub electric: ThreeVector<T>,
    /// Magnetic flux density `B` in T.
    pub magnetic: ThreeVector<T>,
}

impl<T: Real> LocalField<T> {
    /// No field at all: `E = 0`, `B = 0`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::push::LocalField;
    /// assert_eq!(LocalField::<f32>::ZERO.magnetic.norm(), 0.0);
    /// ```
    pub const ZERO: Self = Self::new(ThreeVector::ZERO, ThreeVector::ZERO);

    /// Builds the pair (`E` in V/m, `B` in T) without checks.
    ///
    /// # Examples
    /// ```
    /// use fourforce::ThreeVector;
    /// use fourforce::push::LocalField;
    /// const DIPOLE: LocalField<f32> =
    ///     LocalField::new(ThreeVector::ZERO, ThreeVector::new(0.0, 0.8, 0.0));
    /// assert_eq!(DIPOLE.magnetic.y, 0.8);
    /// ```
    #[must_use]
    #[inline]
    pub const fn new(electric: ThreeVector<T>, magnetic: ThreeVector<T>) -> Self {
        Self { electric, magnetic }
    }

    /// True when all six components are finite.
    ///
    /// # Examples
    /// ```
    /// use fourforce::ThreeVector;
    /// use fourforce::push::LocalField;
    /// let bad = LocalField::new(ThreeVector::new(f32::NAN, 0.0, 0.0), ThreeVector::ZERO);
    /// assert!(!bad.is_finite());
    /// ```
    #[must_use]
    #[inline]
    pub fn is_finite(&self) -> bool {
        self.electric.is_finite() && self.magnetic.is_finite()
    }
}

impl<T: Real> core::ops::Add for LocalField<T> {
    type Output = Self;
    #[inline]
    fn add(self, other: Self) -> Self {
        Self::new(
            self.electric + other.electric,
            self.magnetic + other.magnetic,
        )
    }
}

/// Anything that gives `E` (V/m) and `B` (T) at a position (m) and a time (s).
///
/// Implement it for your own field model, or pass a closure. Implementations should be cheap and
/// must not panic; a non-finite value they return is caught by the pushers' `try_step`, which
/// then leaves the particle unchanged and returns [`Error::NonFinite`].
///
/// # Examples
/// ```
/// use fourforce::ThreeVector;
/// use fourforce::push::{FieldSource, LocalField};
/// struct Gap { field_v_per_m: f32, length_m: f32 }
/// impl FieldSource<f32> for Gap {
///     fn field_at(&self, x: ThreeVector<f32>, _t: f32) -> LocalField<f32> {
///         let e = if (0.0..self.length_m).contains(&x.z) { self.field_v_per_m } else { 0.0 };
///         LocalField::new(ThreeVector::new(0.0, 0.0, e), ThreeVector::ZERO)
///     }
/// }
/// let gap = Gap { field_v_per_m: 1.0e6, length_m: 0.1 };
/// assert_eq!(gap.field_at(ThreeVector::new(0.0, 0.0, 0.05), 0.0).electric.z, 1.0e6);
/// assert_eq!(gap.field_at(ThreeVector::new(0.0, 0.0, 0.15), 0.0).electric.z, 0.0);
/// ```
pub trait FieldSource<T: Real> {
    /// The fields at `position` (m) and `time` (s).
    ///
    /// # Examples
    /// ```
    /// use fourforce::ThreeVector;
    /// use fourforce::push::{FieldSource, LocalField};
    /// let f = LocalField::new(ThreeVector::ZERO, ThreeVector::new(0.0_f64, 0.0, 1.0));
    /// assert_eq!(f.field_at(ThreeVector::new(5.0, 5.0, 5.0), 1.0).magnetic.z, 1.0);
    /// ```
    fn field_at(&self, position: ThreeVector<T>, time: T) -> LocalField<T>;

    /// The superposition of this source and `other`: their fields add.
    ///
    /// # Examples
    /// ```
    /// use fourforce::ThreeVector;
    /// use fourforce::push::{FieldSource, LocalField};
    /// let a = LocalField::new(ThreeVector::new(1.0_f32, 0.0, 0.0), ThreeVector::ZERO);
    /// let b = LocalField::new(ThreeVector::new(2.0_f32, 0.0, 0.0), ThreeVector::ZERO);
    /// assert_eq!(a.plus(b).field_at(ThreeVector::ZERO, 0.0).electric.x, 3.0);
    /// ```
    #[must_use]
    #[inline]
    fn plus<S: FieldSource<T>>(self, other: S) -> SumOfFields<Self, S>
    where
        Self: Sized,
    {
        SumOfFields::new(self, other)
    }
}

impl<T: Real, F> FieldSource<T> for F
where
    F: Fn(ThreeVector<T>, T) -> LocalField<T>,
{
    #[inline]
    fn field_at(&self, position: ThreeVector<T>, time: T) -> LocalField<T> {
        self(position, time)
    }
}

impl<T: Real> FieldSource<T> for LocalField<T> {
    #[inline]
    fn field_at(&self, _position: ThreeVector<T>, _time: T) -> LocalField<T> {
        *self
    }
}

/// A field that is the same everywhere and at all times.
///
/// # Examples
/// ```
/// use fourforce::ThreeVector;
/// use fourforce::push::{FieldSource, UniformField};
/// let b = UniformField::try_new(ThreeVector::ZERO, ThreeVector::new(0.0_f32, 0.0, 1.2))?;
/// assert_eq!(b.field_at(ThreeVector::new(3.0, 0.0, 0.0), 7.0).magnetic.z, 1.2);
/// # Ok::<(), fourforce::Error>(())
/// ```
#[derive(Clone, Copy, Debug, Default, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct UniformField<T: Real> {
    field: LocalField<T>,
}

impl<T: Real> UniformField<T> {
    /// A uniform field `E` (V/m), `B` (T), checked for finiteness.
    ///
    /// # Errors
    /// [`Error::NonFinite`] if a component is NaN or infinite.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, ThreeVector};
    /// use fourforce::push::UniformField;
    /// let bad = UniformField::try_new(ThreeVector::new(f64::INFINITY, 0.0, 0.0), ThreeVector::ZERO);
    /// assert_eq!(bad, Err(Error::NonFinite));
    /// ```
    pub fn try_new(electric: ThreeVector<T>, magnetic: ThreeVector<T>) -> Result<Self, Error> {
        let field = LocalField::new(electric, magnetic);
        if field.is_finite() {
            Ok(Self { field })
        } else {
            Err(Error::NonFinite)
        }
    }

    /// A uniform field built without checks, for `const` tables of trusted values.
    ///
    /// # Examples
    /// ```
    /// use fourforce::ThreeVector;
    /// use fourforce::push::UniformField;
    /// const GUIDE: UniformField<f32> =
    ///     UniformField::new(ThreeVector::ZERO, ThreeVector::new(0.0, 0.0, 0.3));
    /// assert_eq!(GUIDE.field().magnetic.z, 0.3);
    /// ```
    #[must_use]
    pub const fn new(electric: ThreeVector<T>, magnetic: ThreeVector<T>) -> Self {
        Self {
            field: LocalField::new(electric, magnetic),
        }
    }

    /// The field it holds.
    ///
    /// # Examples
    /// ```
    /// use fourforce::ThreeVector;
    /// use fourforce::push::UniformField;
    /// let u = UniformField::new(ThreeVector::new(5.0_f32, 0.0, 0.0), ThreeVector::ZERO);
    /// assert_eq!(u.field().electric.x, 5.0);
    /// ```
    #[must_use]
    #[inline]
    pub const fn field(&self) -> LocalField<T> {
        self.field
    }
}

impl<T: Real> FieldSource<T> for UniformField<T> {
    #[inline]
    fn field_at(&self, _position: ThreeVector<T>, _time: T) -> LocalField<T> {
        self.field
    }
}

/// The superposition of two sources: `E = E₁ + E₂`, `B = B₁ + B₂`.
///
/// Nest it (`a.plus(b).plus(c)`) for more; each level is a generic type, so the sum is resolved
/// at compile time.
///
/// # Examples
/// ```
/// use fourforce::ThreeVector;
/// use fourforce::push::{FieldSource, LocalField, SumOfFields};
/// let e = LocalField::new(ThreeVector::new(0.0_f64, 1.0e5, 0.0), ThreeVector::ZERO);
/// let b = LocalField::new(ThreeVector::ZERO, ThreeVector::new(0.0_f64, 0.0, 0.01));
/// let crossed = SumOfFields::new(e, b);
/// let f = crossed.field_at(ThreeVector::ZERO, 0.0);
/// assert_eq!((f.electric.y, f.magnetic.z), (1.0e5, 0.01));
/// ```
#[derive(Clone, Copy, Debug, Default, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct SumOfFields<A, B> {
    /// The first source.
    pub first: A,
    /// The second source.
    pub second: B,
}

impl<A, B> SumOfFields<A, B> {
    /// The sum of `first` and `second`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::push::{LocalField, SumOfFields};
    /// let s = SumOfFields::new(LocalField::<f32>::ZERO, LocalField::<f32>::ZERO);
    /// assert_eq!(s.first, LocalField::ZERO);
    /// ```
    #[must_use]
    pub const fn new(first: A, second: B) -> Self {
        Self { first, second }
    }
}

impl<T: Real, A: FieldSource<T>, B: FieldSource<T>> FieldSource<T> for SumOfFields<A, B> {
    #[inline]
    fn field_at(&self, position: ThreeVector<T>, time: T) -> LocalField<T> {
        self.first.field_at(position, time) + self.second.field_at(position, time)
    }
}

impl<T: Real, S: FieldSource<T>, const N: usize> FieldSource<T> for [S; N] {
    #[inline]
    fn field_at(&self, position: ThreeVector<T>, time: T) -> LocalField<T> {
        let mut total = LocalField::ZERO;
        for source in self {
            total = total + source.field_at(position, time);
        }
        total
    }
}
