//! `approx` comparisons (feature `approx`): `AbsDiffEq`, `RelativeEq` and `UlpsEq` for the
//! vectors, tensors and transformations of the crate.
//!
//! Every comparison is component by component, with the scalar's own rule and the same
//! tolerance for every component; two values are equal when all components are. The components
//! compared are the stored ones: `(x, y, z)` of a [`ThreeVector`]; `(x⁰, x¹, x², x³)` of a
//! [`FourVector`] or [`Covector`]; `(E, cB)` in V/m of a [`FieldTensor`] or
//! [`CovariantFieldTensor`]; `(γ, γβ)` of a [`Boost`]; the sixteen entries of a
//! [`LorentzTransform`]. Since components of one object can differ by orders of magnitude (a
//! force-free four-force, a field of 1 MV/m and 1 mT), a relative tolerance applies to each
//! component on its own scale: compare with an absolute tolerance where a component cancels.
//!
//! ```
//! # #[cfg(feature = "approx")] {
//! use approx::assert_relative_eq;
//! use fourforce::{FourVector, ThreeVector};
//! let u = FourVector::try_four_velocity(ThreeVector::new(0.6_f64, 0.0, 0.0)).unwrap();
//! assert_relative_eq!(u, FourVector::new(1.25, 0.75, 0.0, 0.0), epsilon = 1e-15, max_relative = 1e-15);
//! # }
//! ```

use approx::{AbsDiffEq, RelativeEq, UlpsEq};

use crate::{
    Boost, CovariantFieldTensor, Covector, FieldTensor, FourVector, LorentzTransform, Real,
    ThreeVector,
};

macro_rules! impl_approx {
    ($ty:ident, $n:expr, |$s:ident| $components:expr) => {
        #[cfg_attr(docsrs, doc(cfg(feature = "approx")))]
        impl<T: Real + AbsDiffEq<Epsilon = T>> AbsDiffEq for $ty<T> {
            type Epsilon = T;
            #[inline]
            fn default_epsilon() -> T {
                T::default_epsilon()
            }
            #[inline]
            fn abs_diff_eq(&self, other: &Self, epsilon: T) -> bool {
                let a: [T; $n] = {
                    let $s = self;
                    $components
                };
                let b: [T; $n] = {
                    let $s = other;
                    $components
                };
                a.iter()
                    .zip(b.iter())
                    .all(|(x, y)| x.abs_diff_eq(y, epsilon))
            }
        }

        #[cfg_attr(docsrs, doc(cfg(feature = "approx")))]
        impl<T: Real + RelativeEq<Epsilon = T>> RelativeEq for $ty<T> {
            #[inline]
            fn default_max_relative() -> T {
                T::default_max_relative()
            }
            #[inline]
            fn relative_eq(&self, other: &Self, epsilon: T, max_relative: T) -> bool {
                let a: [T; $n] = {
                    let $s = self;
                    $components
                };
                let b: [T; $n] = {
                    let $s = other;
                    $components
                };
                a.iter()
                    .zip(b.iter())
                    .all(|(x, y)| x.relative_eq(y, epsilon, max_relative))
            }
        }

        #[cfg_attr(docsrs, doc(cfg(feature = "approx")))]
        impl<T: Real + UlpsEq<Epsilon = T>> UlpsEq for $ty<T> {
            #[inline]
            fn default_max_ulps() -> u32 {
                T::default_max_ulps()
            }
            #[inline]
            fn ulps_eq(&self, other: &Self, epsilon: T, max_ulps: u32) -> bool {
                let a: [T; $n] = {
                    let $s = self;
                    $components
                };
                let b: [T; $n] = {
                    let $s = other;
                    $components
                };
                a.iter()
                    .zip(b.iter())
                    .all(|(x, y)| x.ulps_eq(y, epsilon, max_ulps))
            }
        }
    };
}

/// The six stored components `(E, cB)`.
#[inline]
fn six<T: Real>(e: ThreeVector<T>, cb: ThreeVector<T>) -> [T; 6] {
    [e.x, e.y, e.z, cb.x, cb.y, cb.z]
}

impl_approx!(ThreeVector, 3, |v| v.to_array());
impl_approx!(FourVector, 4, |v| v.to_array());
impl_approx!(Covector, 4, |v| v.to_array());
impl_approx!(FieldTensor, 6, |f| six(f.e(), f.c_b()));
impl_approx!(CovariantFieldTensor, 6, |f| six(f.e(), f.c_b()));
impl_approx!(Boost, 4, |b| {
    let u = b.beta_gamma();
    [b.gamma(), u.x, u.y, u.z]
});
impl_approx!(LorentzTransform, 16, |t| {
    let [a, b, c, d] = t.to_matrix();
    [
        a[0], a[1], a[2], a[3], b[0], b[1], b[2], b[3], c[0], c[1], c[2], c[3], d[0], d[1], d[2],
        d[3],
    ]
});

#[cfg(test)]
mod tests {
    use super::*;
    use approx::{assert_abs_diff_eq, assert_relative_ne, assert_ulps_eq};

    #[test]
    fn components_are_compared_one_by_one() {
        let a = FourVector::new(1.0_f32, 2.0, 3.0, 4.0);
        let b = FourVector::new(1.0_f32, 2.0, 3.0, 4.000_001);
        assert_ulps_eq!(a, b, max_ulps = 4);
        assert_relative_ne!(a, b, max_relative = 1e-9);
        let f = FieldTensor::from_scaled(ThreeVector::new(1.0_f64, 0.0, 0.0), ThreeVector::ZERO);
        let g = FieldTensor::from_scaled(ThreeVector::new(1.0_f64, 0.0, 1e-12), ThreeVector::ZERO);
        assert_abs_diff_eq!(f, g, epsilon = 1e-11);
        assert!(!f.abs_diff_eq(&g, 1e-13));
    }
}
