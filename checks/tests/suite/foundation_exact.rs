//! Exact-valued checks of the foundation's small operations, in both precisions: every operator,
//! accessor and index of the four-vector, covector, field tensor and boost, on inputs whose
//! results are exact in binary (small integers, halves, the 3-4-5 boost γ = 5/4, γβ = 3/4). They
//! pin each sign and each index of the formulas, so that a wrong operator cannot pass.
//! Conventions of published-checks §4: F^{i0} = Eⁱ/c, F^{ij} = −ε^{ijk}Bᵏ (Jackson 3rd ed. §11.9,
//! from memory).
#![allow(clippy::float_cmp)]

use fourforce::{Boost, Covector, Error, FieldTensor, FourVector, Real, ThreeVector};

macro_rules! exact {
    ($r:ident) => {
        mod $r {
            use super::*;
            type R = $r;

            fn v(x: R, y: R, z: R) -> ThreeVector<R> {
                ThreeVector::new(x, y, z)
            }
            fn f(e: ThreeVector<R>, cb: ThreeVector<R>) -> FieldTensor<R> {
                FieldTensor::try_from_scaled(e, cb).unwrap()
            }

            #[test]
            fn four_vector_and_covector_operators() {
                let a = FourVector::new(1.0 as R, 2.0, -3.0, 4.0);
                let b = FourVector::new(0.5 as R, -1.0, 2.0, 8.0);
                assert_eq!(a + b, FourVector::new(1.5, 1.0, -1.0, 12.0));
                assert_eq!(a - b, FourVector::new(0.5, 3.0, -5.0, -4.0));
                assert_eq!(-a, FourVector::new(-1.0, -2.0, 3.0, -4.0));
                assert_eq!(a * 2.0, FourVector::new(2.0, 4.0, -6.0, 8.0));
                assert_eq!(a.scale(-0.5), FourVector::new(-0.5, -1.0, 1.5, -2.0));
                assert_eq!(FourVector::from_array(a.to_array()), a);
                assert_eq!(a.to_array(), [1.0, 2.0, -3.0, 4.0]);
                assert_eq!(a.inner(b), 0.5 - (-2.0 - 6.0 + 32.0));
                assert_eq!(a.norm_squared(), 1.0 - 29.0);
                assert_eq!(a.lower(), Covector::new(1.0, -2.0, 3.0, -4.0));
                assert_eq!(a.lower().raise(), a);
                let k = Covector::new(2.0 as R, 1.0, 0.5, -1.0);
                assert_eq!(a.contract(k), 2.0 + 2.0 - 1.5 - 4.0);
                assert_eq!(k.contract(a), a.contract(k));
                assert_eq!(k + k, k.scale(2.0));
                assert_eq!(k - k, Covector::ZERO);
                assert_eq!(-k, k * -1.0);
                assert_eq!(k.to_array(), [2.0, 1.0, 0.5, -1.0]);
                assert_eq!(k.raise(), FourVector::new(2.0, -1.0, -0.5, 1.0));
                assert_eq!(
                    FourVector::try_new(1.0 as R, 2.0, 3.0, 4.0),
                    Ok(FourVector::new(1.0, 2.0, 3.0, 4.0))
                );
                assert_eq!(
                    FourVector::try_new(1.0 as R, 2.0, R::INFINITY, 4.0),
                    Err(Error::NonFinite)
                );
                assert_eq!(
                    Covector::try_new(R::NAN, 0.0, 0.0, 0.0),
                    Err(Error::NonFinite)
                );
                assert_eq!(
                    Covector::try_new(1.0 as R, 0.0, 0.0, 0.0),
                    Ok(Covector::new(1.0, 0.0, 0.0, 0.0))
                );
                assert!(k.is_finite() && a.is_finite());
                assert!(!FourVector::new(R::NAN, 0.0, 0.0, 0.0).is_finite());
                assert!(!Covector::new(0.0, 0.0, 0.0, R::INFINITY).is_finite());
            }

            #[test]
            fn field_tensor_components_one_by_one() {
                // E = (1, 2, 3), cB = (4, 5, 6): c F^{μν} by the convention.
                let t = f(v(1.0, 2.0, 3.0), v(4.0, 5.0, 6.0));
                let upper = [
                    [0.0, -1.0, -2.0, -3.0],
                    [1.0, 0.0, -6.0, 5.0],
                    [2.0, 6.0, 0.0, -4.0],
                    [3.0, -5.0, 4.0, 0.0],
                ];
                assert_eq!(t.to_matrix(), upper);
                for (mu, row) in upper.iter().enumerate() {
                    for (nu, x) in row.iter().enumerate() {
                        assert_eq!(t.try_component(mu, nu), Ok(*x));
                        // F_μν = g F g: the time-space entries change sign.
                        let s = if (mu == 0) != (nu == 0) { -1.0 } else { 1.0 };
                        assert_eq!(t.lower().try_component(mu, nu), Ok(s * x));
                        // F^μ_ν = F^μα g_αν: the spatial columns change sign.
                        let m = if nu == 0 { 1.0 } else { -1.0 };
                        assert_eq!(t.to_mixed_matrix()[mu][nu], m * x);
                    }
                }
                assert_eq!(t.try_component(0, 4), Err(Error::OutOfBounds));
                assert_eq!(t.lower().try_component(4, 0), Err(Error::OutOfBounds));
                assert_eq!(t.lower().e(), v(1.0, 2.0, 3.0));
                assert_eq!(t.lower().c_b(), v(4.0, 5.0, 6.0));
                // 2(cB·cB − E·E) = 2(77 − 14)
                assert_eq!(t.lower().double_contract(&t), 126.0);
                assert_eq!(t.lower().double_contract(&FieldTensor::ZERO), 0.0);
            }

            #[test]
            fn field_tensor_operators_and_contraction() {
                let a = f(v(1.0, 2.0, 3.0), v(4.0, 5.0, 6.0));
                let b = f(v(0.5, 0.0, -1.0), v(2.0, -2.0, 0.0));
                assert_eq!(a + b, f(v(1.5, 2.0, 2.0), v(6.0, 3.0, 6.0)));
                assert_eq!(a - b, f(v(0.5, 2.0, 4.0), v(2.0, 7.0, 6.0)));
                assert_eq!(-a, f(v(-1.0, -2.0, -3.0), v(-4.0, -5.0, -6.0)));
                assert_eq!(a * 2.0, f(v(2.0, 4.0, 6.0), v(8.0, 10.0, 12.0)));
                assert_eq!(a.dual(), f(v(4.0, 5.0, 6.0), v(-1.0, -2.0, -3.0)));
                // (E·u, E u⁰ + u × cB) with u = (2, 1, -1, 3): E·u = 1 − 2 + 9 = 8;
                // u × cB = (−1·6 − 3·5, 3·4 − 1·6, 1·5 − (−1)·4) = (−21, 6, 9).
                let u = FourVector::new(2.0 as R, 1.0, -1.0, 3.0);
                let k = a.contract(u);
                assert_eq!(k, FourVector::new(8.0, 2.0 - 21.0, 4.0 + 6.0, 6.0 + 9.0));
                assert_eq!(a.contract_covector(u.lower()), k);
                assert_eq!(a.lower().contract(u), k.lower());
                assert_eq!(a.four_force(-2.0, u), k * -2.0);
                assert_eq!(a.try_four_force(-2.0, u), Ok(k * -2.0));
                // Q(E + β × cB) and Q E·β with β = (1, -1, 3)/2 = (0.5, −0.5, 1.5).
                let beta = v(0.5, -0.5, 1.5);
                assert_eq!(
                    a.three_force(2.0, beta),
                    v(1.0 - 10.5, 2.0 + 3.0, 3.0 + 4.5) * 2.0
                );
                assert_eq!(a.power(2.0, beta), 2.0 * (0.5 - 1.0 + 4.5));
                assert!(a.is_finite());
            }

            #[test]
            fn field_tensor_rejects_what_it_cannot_hold() {
                let ok = v(1.0, 0.0, 0.0);
                let big = v(0.0, 0.0, FieldTensor::<R>::limit() * 2.0);
                assert_eq!(FieldTensor::try_from_scaled(big, ok), Err(Error::Overflow));
                assert_eq!(FieldTensor::try_from_scaled(ok, big), Err(Error::Overflow));
                assert_eq!(
                    FieldTensor::try_from_scaled(v(R::NAN, 0.0, 0.0), ok),
                    Err(Error::NonFinite)
                );
                assert!(
                    FieldTensor::try_from_scaled(v(FieldTensor::<R>::limit(), 0.0, 0.0), ok)
                        .is_ok()
                );
                assert_eq!(
                    FieldTensor::try_scalar_invariant_of(v(R::NAN, 0.0, 0.0), ok),
                    Err(Error::NonFinite)
                );
                assert_eq!(
                    FieldTensor::try_scalar_invariant_of(ok, v(R::NAN, 0.0, 0.0)),
                    Err(Error::NonFinite)
                );
                assert_eq!(
                    FieldTensor::try_pseudoscalar_invariant_of(ok, v(R::NAN, 0.0, 0.0)),
                    Err(Error::NonFinite)
                );
                assert_eq!(
                    FieldTensor::try_pseudoscalar_invariant_of(big, ok),
                    Err(Error::Overflow)
                );
                assert_eq!(
                    FieldTensor::try_pseudoscalar_invariant_of(v(2.0, 3.0, 0.0), v(0.5, 4.0, 1.0)),
                    Ok(13.0)
                );
                // E·B from the stored tensor: (E·cB)/c.
                let t =
                    FieldTensor::try_from_scaled(v(2.0, 0.0, 0.0), v(R::SPEED_OF_LIGHT, 0.0, 0.0))
                        .unwrap();
                assert!((t.pseudoscalar_invariant() - 2.0).abs() <= 2.0 * R::EPSILON * 2.0);
                let big_force =
                    FieldTensor::try_from_scaled(v(FieldTensor::<R>::limit(), 0.0, 0.0), ok)
                        .unwrap();
                let fast = FourVector::new(R::MAX / 4.0, 0.0, 0.0, 0.0);
                assert_eq!(big_force.try_four_force(1.0, fast), Err(Error::Overflow));
                assert_eq!(
                    big_force.try_four_force_newtons(1.0, fast),
                    Err(Error::Overflow)
                );
                assert_eq!(
                    big_force.try_four_force(1.0, FourVector::new(R::NAN, 0.0, 0.0, 0.0)),
                    Err(Error::NonFinite)
                );
                let vel = v(R::MAX / 4.0, 0.0, 0.0);
                assert_eq!(big_force.try_power_watts(1e30, vel), Err(Error::Overflow));
                assert_eq!(
                    FieldTensor::try_from_scaled(ok, v(0.0, 0.0, FieldTensor::<R>::limit()))
                        .unwrap()
                        .try_three_force_newtons(1e30, v(0.0, R::MAX / 4.0, 0.0)),
                    Err(Error::Overflow)
                );
                assert_eq!(
                    big_force.try_three_force_newtons(R::NAN, ok),
                    Err(Error::NonFinite)
                );
                // An unchecked tensor with a NaN in either half is not finite, and the checked
                // force methods refuse it.
                let nan_e = FieldTensor::from_scaled(v(R::NAN, 0.0, 0.0), ok);
                let nan_b = FieldTensor::from_scaled(ok, v(0.0, R::NAN, 0.0));
                assert!(!nan_e.is_finite() && !nan_b.is_finite());
                for t in [nan_e, nan_b] {
                    assert_eq!(
                        t.try_four_force(1.0, FourVector::AT_REST),
                        Err(Error::NonFinite)
                    );
                    assert_eq!(t.try_three_force_newtons(1.0, ok), Err(Error::NonFinite));
                    assert_eq!(t.try_power_watts(1.0, ok), Err(Error::NonFinite));
                }
            }

            #[test]
            fn boost_of_three_quarters_is_exact() {
                // u = γβ = 3/4 along each axis in turn: γ = 5/4 exactly, 1/(γ+1) = 4/9.
                for axis in 0..3 {
                    let mut dir = [0.0 as R; 3];
                    dir[axis] = 1.0;
                    let n = v(dir[0], dir[1], dir[2]);
                    let b = Boost::try_from_four_velocity(FourVector::from_parts(0.0, n * 0.75))
                        .unwrap();
                    assert_eq!(b.gamma(), 1.25);
                    assert_eq!(b.beta_gamma(), n * 0.75);
                    assert_eq!(b.beta(), n * 0.6);
                    // The event (ct, x) = (1, 0) → (5/4, −3/4 n); (0, n) → (−3/4, 5/4 n).
                    assert_eq!(
                        b.apply(FourVector::from_parts(1.0, ThreeVector::ZERO)),
                        FourVector::from_parts(1.25, n * -0.75)
                    );
                    let y = b.apply(FourVector::from_parts(0.0, n));
                    assert_eq!(y.time, -0.75);
                    assert!((y.space - n * 1.25).norm() <= 2.0 * R::EPSILON);
                    // A transverse spatial vector is unchanged.
                    let m = v(dir[1], dir[2], dir[0]);
                    assert_eq!(
                        b.apply(FourVector::from_parts(0.0, m)),
                        FourVector::from_parts(0.0, m)
                    );
                    assert_eq!(
                        b.inverse()
                            .apply(FourVector::from_parts(1.0, ThreeVector::ZERO)),
                        FourVector::from_parts(1.25, n * 0.75)
                    );
                    let k = b.apply_covector(Covector::from_parts(1.0, ThreeVector::ZERO));
                    assert_eq!(k, Covector::from_parts(1.25, n * 0.75));
                    // Rapidity ln(γ + γβ) = ln 2.
                    assert!(
                        (b.rapidity() - R::from_f64(core::f64::consts::LN_2)).abs()
                            <= 2.0 * R::EPSILON
                    );
                }
            }

            #[test]
            fn boost_constructors_agree() {
                let z = v(0.0, 0.0, 1.0);
                let from_beta = Boost::try_from_beta(z * 0.6).unwrap();
                let from_speed = Boost::try_from_speed(z * 3.0, 0.6 * R::SPEED_OF_LIGHT).unwrap();
                let backwards = Boost::try_from_speed(z, -0.6 * R::SPEED_OF_LIGHT).unwrap();
                let from_rapidity =
                    Boost::try_from_rapidity(z, R::from_f64(core::f64::consts::LN_2)).unwrap();
                for b in [from_beta, from_speed, from_rapidity] {
                    assert!((b.gamma() - 1.25).abs() <= 4.0 * R::EPSILON);
                    assert!((b.beta_gamma().z - 0.75).abs() <= 4.0 * R::EPSILON);
                }
                assert!((backwards.beta_gamma().z + 0.75).abs() <= 4.0 * R::EPSILON);
                assert_eq!(
                    Boost::try_from_velocity(v(0.0, R::NAN, 0.0)),
                    Err(Error::NonFinite)
                );
                assert_eq!(Boost::try_from_speed(z, R::NAN), Err(Error::NonFinite));
                assert_eq!(
                    Boost::try_from_rapidity(z, R::from_f64(30.0)),
                    Err(Error::Overflow)
                );
                assert!(Boost::try_from_rapidity(z, R::from_f64(27.0)).is_ok());
                assert_eq!(Boost::<R>::gamma_limit(), R::from_f64(1e12));
            }

            #[test]
            fn field_boost_along_each_axis() {
                // u = 3/4 along x: E = (1, 2, 4), cB = (8, 16, 32) (exact products with 5/4, 3/4).
                // E'∥ = E∥, E'⊥ = γE⊥ + (u × cB)⊥; cB'⊥ = γcB⊥ − (u × E)⊥.
                let t = f(v(1.0, 2.0, 4.0), v(8.0, 16.0, 32.0));
                let b =
                    Boost::try_from_four_velocity(FourVector::new(0.0, 0.75, 0.0, 0.0)).unwrap();
                let g = b.apply_field(&t);
                // u × cB = (0, −0.75·32, 0.75·16) = (0, −24, 12); u × E = (0, −3, 1.5)
                let close = |a: ThreeVector<R>, w: ThreeVector<R>| {
                    (a - w).norm() <= 8.0 * R::EPSILON * 64.0
                };
                assert!(close(g.e(), v(1.0, 2.5 - 24.0, 5.0 + 12.0)), "{:?}", g.e());
                assert!(
                    close(g.c_b(), v(8.0, 20.0 + 3.0, 40.0 - 1.5)),
                    "{:?}",
                    g.c_b()
                );
                let general = b.to_transform().apply_field(&t);
                assert!(close(general.e(), g.e()) && close(general.c_b(), g.c_b()));
            }
        }
    };
}

exact!(f32);
exact!(f64);
