//! ThreeVector: operators, unit vectors at the edges of the format.

mod regressions {
    //! Regressions: bugs that fuzzing, the f32 sweep and mutation testing found, each with the
    //! input that exposed it.
    #![allow(clippy::float_cmp)]

    use fourforce::{Error, ThreeVector};
    macro_rules! regressions {
        ($t:ident) => {
            mod $t {
                use super::*;

                fn squared_length(u: ThreeVector<$t>) -> $t {
                    u.x * u.x + u.y * u.y + u.z * u.z
                }

                /// Found by the `three_vector` fuzz target: a vector of subnormal components lost
                /// its low bits in `self / |self|` (f32 input (6.816e-42, 1.4e-44, 0) gave a "unit"
                /// vector of squared length 1.0000042).
                #[test]
                fn unit_of_a_subnormal_vector_has_length_one() {
                    let tiny = <$t>::MIN_POSITIVE / 1024.0 * 4864.0 / 1024.0;
                    let v = ThreeVector::new(tiny, <$t>::from_bits(10), 0.0);
                    let u = v.try_unit().unwrap();
                    assert!(
                        (squared_length(u) - 1.0).abs() <= 4.0 * <$t>::EPSILON,
                        "{u:?}"
                    );
                    let w = ThreeVector::new(<$t>::from_bits(1), <$t>::from_bits(1), 0.0);
                    let u = w.try_unit().unwrap();
                    assert!(
                        (u.x - core::$t::consts::FRAC_1_SQRT_2).abs() <= <$t>::EPSILON,
                        "{u:?}"
                    );
                }

                /// Found by reading `try_unit` for the fuzz target: a finite vector whose length
                /// overflows (every component MAX) gave `Ok` of the zero vector.
                #[test]
                fn unit_of_a_huge_vector_is_not_zero() {
                    let m = <$t>::MAX;
                    let u = ThreeVector::new(m, m, m).try_unit().unwrap();
                    assert!(
                        (squared_length(u) - 1.0).abs() <= 4.0 * <$t>::EPSILON,
                        "{u:?}"
                    );
                    let u = ThreeVector::new(-m, 0.0, m).try_unit().unwrap();
                    assert!(
                        (u.x + core::$t::consts::FRAC_1_SQRT_2).abs() <= <$t>::EPSILON,
                        "{u:?}"
                    );
                }

                #[test]
                fn unit_still_refuses_zero_and_non_finite() {
                    assert_eq!(
                        ThreeVector::<$t>::new(0.0, -0.0, 0.0).try_unit(),
                        Err(Error::ZeroDirection)
                    );
                    assert_eq!(
                        ThreeVector::<$t>::new(<$t>::NAN, 1.0, 0.0).try_unit(),
                        Err(Error::NonFinite)
                    );
                }
            }
        };
    }

    regressions!(f32);
    regressions!(f64);
}

mod mutants {
    //! Sharper tests that kill mutants cargo-mutants found surviving: each pins a result a wrong
    //! operator or a constant return would change; values exact in both precisions.
    #![allow(clippy::float_cmp)]

    use fourforce::ThreeVector;
    macro_rules! sharper {
        ($t:ident) => {
            mod $t {
                use super::*;

                fn v(x: $t, y: $t, z: $t) -> ThreeVector<$t> {
                    ThreeVector::new(x, y, z)
                }

                #[test]
                fn vector_operators_give_exact_componentwise_results() {
                    let a = v(1.0, -2.0, 4.0);
                    let b = v(8.0, 16.0, -0.5);
                    assert_eq!(a + b, v(9.0, 14.0, 3.5));
                    assert_eq!(a - b, v(-7.0, -18.0, 4.5));
                    assert_eq!(a * 3.0, v(3.0, -6.0, 12.0));
                    assert_eq!(a.scale(-0.5), v(-0.5, 1.0, -2.0));
                    assert_eq!(a / 2.0, v(0.5, -1.0, 2.0));
                    assert_eq!(-a, v(-1.0, 2.0, -4.0));
                    let mut c = a;
                    c += b;
                    assert_eq!(c, v(9.0, 14.0, 3.5));
                    c -= b;
                    assert_eq!(c, a);
                    c -= a;
                    assert_eq!(c, ThreeVector::ZERO);
                }

                #[test]
                fn cross_product_of_general_vectors() {
                    // (1, 2, 3) × (4, 5, 6) = (-3, 6, -3), by the determinant rule.
                    assert_eq!(v(1.0, 2.0, 3.0).cross(v(4.0, 5.0, 6.0)), v(-3.0, 6.0, -3.0));
                    assert_eq!(v(1.0, 2.0, 3.0).dot(v(4.0, 5.0, 6.0)), 32.0);
                }

                #[test]
                fn try_new_keeps_the_components() {
                    assert_eq!(
                        ThreeVector::try_new(1.0 as $t, 2.0, 3.0),
                        Ok(v(1.0, 2.0, 3.0))
                    );
                    assert_eq!(v(1.0, 2.0, 3.0).to_array(), [1.0, 2.0, 3.0]);
                }
            }
        };
    }

    sharper!(f32);
    sharper!(f64);
}
