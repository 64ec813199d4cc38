//! Field sources: where the pushers read the field.
//!
//! A [`FieldSource`] answers one question: the field tensor ([`FieldTensor`], E and cB in V/m) at
//! a position (m) and a time (s). It is implemented for
//! - closures `Fn(ThreeVector<T>, T) -> FieldTensor<T>` (a measured map, an analytic model),
//! - [`FieldTensor`] itself, which is a uniform field,
//! - [`SumOfFields`] of any two sources (build it with [`FieldSource::plus`]) and arrays
//!   `[S; N]` of one kind of source, whose fields add (superposition).
//!
//! Everything is generic: the pushers are monomorphised for the source, so the inner loop has no
//! dynamic dispatch and no allocation.
//!
//! # Examples
//! ```
//! use fourforce::{FieldTensor, ThreeVector};
//! use fourforce::push::FieldSource;
//! let solenoid = FieldTensor::try_from_fields(ThreeVector::ZERO, ThreeVector::new(0.0_f32, 0.0, 0.5))?;
//! let ramp = |x: ThreeVector<f32>, _t: f32| {
//!     FieldTensor::from_scaled(ThreeVector::new(1.0e3 * x.x, 0.0, 0.0), ThreeVector::ZERO)
//! };
//! let total = solenoid.plus(ramp);
//! let f = total.field_at(ThreeVector::new(2.0, 0.0, 0.0), 0.0);
//! assert_eq!(f.e().x, 2.0e3);
//! assert_eq!(f.c_b(), solenoid.c_b());
//! # Ok::<(), fourforce::Error>(())
//! ```

use crate::{FieldTensor, Real, ThreeVector};

/// Anything that gives the field tensor (E and cB in V/m) at a position (m) and a time (s).
///
/// Implement it for your own field model, or pass a closure. Implementations should be cheap and
/// must not panic; a non-finite value they return is caught by the pushers' `try_step`, which
/// then leaves the particle unchanged and returns [`Error::NonFinite`](crate::Error::NonFinite).
///
/// # Examples
/// ```
/// use fourforce::{FieldTensor, ThreeVector};
/// use fourforce::push::FieldSource;
/// struct Gap { field_v_per_m: f32, length_m: f32 }
/// impl FieldSource<f32> for Gap {
///     fn field_at(&self, x: ThreeVector<f32>, _t: f32) -> FieldTensor<f32> {
///         let e = if (0.0..self.length_m).contains(&x.z) { self.field_v_per_m } else { 0.0 };
///         FieldTensor::from_scaled(ThreeVector::new(0.0, 0.0, e), ThreeVector::ZERO)
///     }
/// }
/// let gap = Gap { field_v_per_m: 1.0e6, length_m: 0.1 };
/// assert_eq!(gap.field_at(ThreeVector::new(0.0, 0.0, 0.05), 0.0).e().z, 1.0e6);
/// assert_eq!(gap.field_at(ThreeVector::new(0.0, 0.0, 0.15), 0.0).e().z, 0.0);
/// ```
pub trait FieldSource<T: Real> {
    /// The field at `position` (m) and `time` (s).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FieldTensor, ThreeVector};
    /// use fourforce::push::FieldSource;
    /// let f = FieldTensor::try_from_fields(ThreeVector::ZERO, ThreeVector::new(0.0_f64, 0.0, 1.0))?;
    /// assert_eq!(f.field_at(ThreeVector::new(5.0, 5.0, 5.0), 1.0), f);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    fn field_at(&self, position: ThreeVector<T>, time: T) -> FieldTensor<T>;

    /// The superposition of this source and `other`: their fields add.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FieldTensor, ThreeVector};
    /// use fourforce::push::FieldSource;
    /// let a = FieldTensor::from_scaled(ThreeVector::new(1.0_f32, 0.0, 0.0), ThreeVector::ZERO);
    /// let b = FieldTensor::from_scaled(ThreeVector::new(2.0_f32, 0.0, 0.0), ThreeVector::ZERO);
    /// assert_eq!(a.plus(b).field_at(ThreeVector::ZERO, 0.0).e().x, 3.0);
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
    F: Fn(ThreeVector<T>, T) -> FieldTensor<T>,
{
    #[inline]
    fn field_at(&self, position: ThreeVector<T>, time: T) -> FieldTensor<T> {
        self(position, time)
    }
}

/// A field tensor is a uniform field: the same everywhere and at all times.
impl<T: Real> FieldSource<T> for FieldTensor<T> {
    #[inline]
    fn field_at(&self, _position: ThreeVector<T>, _time: T) -> FieldTensor<T> {
        *self
    }
}

/// The superposition of two sources: `E = E₁ + E₂`, `cB = cB₁ + cB₂`.
///
/// Nest it (`a.plus(b).plus(c)`) for more; each level is a generic type, so the sum is resolved
/// at compile time.
///
/// # Examples
/// ```
/// use fourforce::{FieldTensor, ThreeVector};
/// use fourforce::push::{FieldSource, SumOfFields};
/// let e = FieldTensor::try_from_fields(ThreeVector::new(0.0_f64, 1.0e5, 0.0), ThreeVector::ZERO)?;
/// let b = FieldTensor::try_from_fields(ThreeVector::ZERO, ThreeVector::new(0.0_f64, 0.0, 0.01))?;
/// let crossed = SumOfFields::new(e, b);
/// let f = crossed.field_at(ThreeVector::ZERO, 0.0);
/// assert_eq!((f.e().y, f.c_b().z), (1.0e5, b.c_b().z));
/// # Ok::<(), fourforce::Error>(())
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
    /// use fourforce::FieldTensor;
    /// use fourforce::push::SumOfFields;
    /// let s = SumOfFields::new(FieldTensor::<f32>::ZERO, FieldTensor::<f32>::ZERO);
    /// assert_eq!(s.first, FieldTensor::ZERO);
    /// ```
    #[must_use]
    pub const fn new(first: A, second: B) -> Self {
        Self { first, second }
    }
}

impl<T: Real, A: FieldSource<T>, B: FieldSource<T>> FieldSource<T> for SumOfFields<A, B> {
    #[inline]
    fn field_at(&self, position: ThreeVector<T>, time: T) -> FieldTensor<T> {
        self.first.field_at(position, time) + self.second.field_at(position, time)
    }
}

impl<T: Real, S: FieldSource<T>, const N: usize> FieldSource<T> for [S; N] {
    #[inline]
    fn field_at(&self, position: ThreeVector<T>, time: T) -> FieldTensor<T> {
        let mut total = FieldTensor::ZERO;
        for source in self {
            total = total + source.field_at(position, time);
        }
        total
    }
}
