//! Properties over random inputs (proptest), in both precisions: antisymmetry, K·u = 0, the
//! invariants under any boost, boost then inverse, the covariant four-force against
//! γ(qE·v/c, q(E + v × B)), E'·B' = E·B, the dual, composition of boosts.
//!
//! The identities are textbook (Jackson 3rd ed. §11.3, §11.9-11.10, §12.1, from memory); the
//! tolerances are in eps of the format times the natural scale of each quantity, since a
//! component can cancel far below it. Case counts follow proptest's default (256) or the
//! `PROPTEST_CASES` environment variable.
// Reference values are typed with all their digits; tests compare floats exactly on purpose.
#![allow(clippy::excessive_precision, clippy::float_cmp)]

use super::foundation_common::*;

use fourforce::{Boost, FieldTensor, FourVector, Real};
use proptest::prelude::*;

const C: f64 = 299_792_458.0;

fn vec3(range: f64) -> impl Strategy<Value = (f64, f64, f64)> {
    (-range..range, -range..range, -range..range)
}

macro_rules! properties {
    ($r:ty, $name:ident) => {
        mod $name {
            use super::*;
            type R = $r;
            const EPS: f64 = <R as Real>::EPSILON as f64;

            fn field(e: (f64, f64, f64), b: (f64, f64, f64)) -> FieldTensor<R> {
                FieldTensor::try_from_fields(v3(e.0, e.1, e.2), v3(b.0, b.1, b.2)).unwrap()
            }

            fn four_velocity(u: (f64, f64, f64)) -> FourVector<R> {
                let s = v3::<R>(u.0, u.1, u.2);
                FourVector::from_parts(R::ONE.hypot(s.norm()), s)
            }

            fn boost(u: (f64, f64, f64)) -> Boost<R> {
                Boost::try_from_four_velocity(four_velocity(u)).unwrap()
            }

            proptest! {

                #[test]
                fn field_tensor_is_antisymmetric(e in vec3(1e7), b in vec3(2.0)) {
                    let f = field(e, b);
                    for mu in 0..4 {
                        for nu in 0..4 {
                            prop_assert_eq!(f.try_component(mu, nu).unwrap(), -f.try_component(nu, mu).unwrap());
                            prop_assert_eq!(
                                f.lower().try_component(mu, nu).unwrap(),
                                -f.lower().try_component(nu, mu).unwrap()
                            );
                        }
                    }
                }

                #[test]
                fn four_force_is_orthogonal_to_the_four_velocity(e in vec3(1e7), b in vec3(2.0), u in vec3(50.0), q in -3.0..3.0_f64) {
                    let (f, u) = (field(e, b), four_velocity(u));
                    let q = R::from_f64(q);
                    let k = wide4(f.four_force(q, u));
                    let scale = q.to_f64().abs() * (u.time.to_f64() * wide3(f.e()).norm()
                        + wide3(u.space).norm() * wide3(f.c_b()).norm());
                    let ku = k.inner(wide4(u)).abs();
                    prop_assert!(ku <= 4.0 * EPS * scale * (u.time.to_f64() + wide3(u.space).norm()) + f64::MIN_POSITIVE);
                }

                #[test]
                fn covariant_force_is_gamma_times_three_force_and_power(e in vec3(1e7), b in vec3(2.0), beta in vec3(0.57), q in -3.0..3.0_f64) {
                    // K = γ(qE·v/c, q(E + v × B)) [Jackson 3rd ed. §12.1, from memory].
                    let f = field(e, b);
                    let beta = v3::<R>(beta.0, beta.1, beta.2);
                    let q = R::from_f64(q);
                    let u = FourVector::try_four_velocity(beta).unwrap();
                    let k = f.four_force(q, u);
                    let g = u.time;
                    let expected = FourVector::from_parts(f.power(q, beta) * g, f.three_force(q, beta) * g);
                    let scale = g.to_f64() * q.to_f64().abs()
                        * (wide3(f.e()).norm() + wide3(beta).norm() * wide3(f.c_b()).norm());
                    prop_assert!(eps_four(k, wide4(expected).to_array(), scale) <= 8.0);
                    // The same in SI: N and W, with v = βc.
                    let vel = beta * R::SPEED_OF_LIGHT;
                    let k_n = f.try_four_force_newtons(q, u).unwrap();
                    let f_n = f.try_three_force_newtons(q, vel).unwrap();
                    let p_w = f.try_power_watts(q, vel).unwrap();
                    let e_c = 1.602_176_634e-19;
                    let expected_n = [p_w.to_f64() / C * g.to_f64(), f_n.x.to_f64() * g.to_f64(),
                        f_n.y.to_f64() * g.to_f64(), f_n.z.to_f64() * g.to_f64()];
                    prop_assert!(eps_four(k_n, expected_n, scale * e_c) <= 16.0);
                }

                #[test]
                fn invariants_are_unchanged_by_any_boost(e in vec3(1e7), b in vec3(2.0), w in vec3(5.0)) {
                    let f = field(e, b);
                    let bst = boost(w);
                    let g = bst.apply_field(&f);
                    let gamma = bst.gamma().to_f64();
                    let s = gamma * field_scale(&f);
                    // F_μν F^μν = 2(B² − E²/c²) on the scale 2 s²/c²; E·B on the scale s²/c.
                    let ds = (g.scalar_invariant().to_f64() - f.scalar_invariant().to_f64()).abs();
                    prop_assert!(ds <= 16.0 * EPS * 2.0 * s * s / (C * C));
                    let dp = (g.pseudoscalar_invariant().to_f64() - f.pseudoscalar_invariant().to_f64()).abs();
                    prop_assert!(dp <= 16.0 * EPS * s * s / C);
                }

                #[test]
                fn boost_then_inverse_is_the_identity(x in vec3(10.0), t in -10.0..10.0_f64, e in vec3(1e7), b in vec3(2.0), w in vec3(5.0)) {
                    let bst = boost(w);
                    let g2 = bst.gamma().to_f64().powi(2);
                    let x = FourVector::from_parts(R::from_f64(t), v3(x.0, x.1, x.2));
                    let back = bst.inverse().apply(bst.apply(x));
                    let scale = g2 * (t.abs() + wide3(x.space).norm());
                    prop_assert!(eps_four(back, wide4(x).to_array(), scale) <= 16.0);
                    let f = field(e, b);
                    let fb = bst.inverse().apply_field(&bst.apply_field(&f));
                    let fscale = g2 * field_scale(&f);
                    prop_assert!(eps_three(fb.e(), wide3(f.e()).to_array(), fscale) <= 16.0);
                    prop_assert!(eps_three(fb.c_b(), wide3(f.c_b()).to_array(), fscale) <= 16.0);
                }

                #[test]
                fn dual_swaps_the_fields_and_negates_the_scalar(e in vec3(1e7), b in vec3(2.0)) {
                    let f = field(e, b);
                    prop_assert_eq!(f.dual().dual(), -f);
                    let s = field_scale(&f);
                    let ds = (f.dual().scalar_invariant().to_f64() + f.scalar_invariant().to_f64()).abs();
                    prop_assert!(ds <= 4.0 * EPS * 2.0 * s * s / (C * C));
                    // F_μν F̃^μν = −4c E·B in the units of c F (Jackson 3rd ed. §11.9, from memory).
                    let full = f.lower().double_contract(&f.dual()).to_f64();
                    let expected = -4.0 * C * f.pseudoscalar_invariant().to_f64();
                    prop_assert!((full - expected).abs() <= 8.0 * EPS * s * s);
                }

                #[test]
                fn raising_lowering_and_contractions_agree(e in vec3(1e7), b in vec3(2.0), u in vec3(50.0)) {
                    let (f, u) = (field(e, b), four_velocity(u));
                    prop_assert_eq!(f.lower().raise(), f);
                    prop_assert_eq!(u.lower().raise(), u);
                    prop_assert_eq!(f.contract_covector(u.lower()), f.contract(u));
                    prop_assert_eq!(f.lower().contract(u), f.contract(u).lower());
                    prop_assert_eq!(u.contract(u.lower()), u.inner(u));
                }

                #[test]
                fn two_boosts_compose_into_a_boost_and_a_rotation(a in vec3(3.0), c in vec3(3.0), x in vec3(10.0), t in -10.0..10.0_f64) {
                    let (ba, bc) = (boost(a), boost(c));
                    let both = ba.then(&bc);
                    let x = FourVector::from_parts(R::from_f64(t), v3(x.0, x.1, x.2));
                    let g = (ba.gamma() * bc.gamma()).to_f64();
                    let scale = 2.0 * g * (t.abs() + wide3(x.space).norm());
                    prop_assert!(eps_four(both.apply(x), wide4(bc.apply(ba.apply(x))).to_array(), scale) <= 16.0);
                    // Opposite boosts compose to nearly the identity by cancelling from g to 1:
                    // the rounding stays on the scale g².
                    prop_assert!(both.metric_deviation().to_f64() <= 32.0 * EPS * g * g);
                    // Λ = R·B with R a rotation: R leaves time alone.
                    let r = both.try_rotation_part().unwrap().to_matrix();
                    prop_assert!((r[0][0].to_f64() - 1.0).abs() <= 64.0 * EPS * g * g);
                    for i in 1..4 {
                        prop_assert!(r[0][i].to_f64().abs() <= 64.0 * EPS * g * g);
                        prop_assert!(r[i][0].to_f64().abs() <= 64.0 * EPS * g * g);
                    }
                    let rebuilt = both.try_boost_part().unwrap().to_transform().then(&both.try_rotation_part().unwrap());
                    for (row, want) in rebuilt.to_matrix().iter().zip(both.to_matrix()) {
                        for (got, w) in row.iter().zip(want) {
                            // R = Λ B⁻¹ cancels from g² to 1, and R·B multiplies by g again.
                            prop_assert!((got.to_f64() - w.to_f64()).abs() <= 64.0 * EPS * g * g * g);
                        }
                    }
                }

                #[test]
                fn collinear_rapidities_add(a in -3.0..3.0_f64, c in -3.0..3.0_f64, d in vec3(1.0)) {
                    let dir = v3::<R>(d.0, d.1, d.2);
                    prop_assume!(dir.norm() > R::from_f64(0.1));
                    let ba = Boost::try_from_rapidity(dir, R::from_f64(a)).unwrap();
                    let bc = Boost::try_from_rapidity(dir, R::from_f64(c)).unwrap();
                    let sum = ba.then(&bc).try_boost_part().unwrap().rapidity().to_f64();
                    prop_assert!((sum - (a + c).abs()).abs() <= 64.0 * EPS * (1.0 + a.abs() + c.abs()) * (a + c).cosh());
                }

                #[test]
                fn four_velocities_are_normalised(beta in vec3(0.57), p in vec3(1e6)) {
                    let u = FourVector::try_four_velocity(v3::<R>(beta.0, beta.1, beta.2)).unwrap();
                    prop_assert!(u.four_velocity_deviation().to_f64().abs() <= 8.0 * EPS);
                    let pc = v3::<R>(p.0, p.1, p.2);
                    let u = FourVector::try_four_velocity_from_momentum(fourforce::Species::ELECTRON, pc).unwrap();
                    prop_assert!(u.four_velocity_deviation().to_f64().abs() <= 8.0 * EPS);
                }
            }

            #[cfg(feature = "approx")]
            mod with_approx {
                use super::*;
                use approx::{assert_relative_eq, relative_eq};
                use fourforce::ThreeVector;

                proptest! {

                    #[test]
                    fn boost_matrix_and_boost_agree(w in vec3(5.0), x in vec3(10.0), t in -10.0..10.0_f64, e in vec3(1e7), b in vec3(2.0)) {
                        let bst = boost(w);
                        let m = bst.to_transform();
                        let x = FourVector::from_parts(R::from_f64(t), v3(x.0, x.1, x.2));
                        let g = bst.gamma();
                        let tol = R::from_f64(16.0) * R::EPSILON * g * g;
                        let scale = R::from_f64(t.abs()) + x.space.norm();
                        prop_assert!(relative_eq!(m.apply(x), bst.apply(x), epsilon = tol * scale, max_relative = tol));
                        let f = field(e, b);
                        let fs = R::from_f64(field_scale(&f));
                        prop_assert!(relative_eq!(m.apply_field(&f), bst.apply_field(&f), epsilon = tol * fs, max_relative = tol));
                        prop_assert!(relative_eq!(m.inverse(), bst.inverse().to_transform(), epsilon = tol, max_relative = tol));
                    }
                }

                #[test]
                fn identity_and_static_values() {
                    let f = field((1.0, 2.0, 3.0), (0.1, 0.2, 0.3));
                    assert_relative_eq!(Boost::IDENTITY.apply_field(&f), f);
                    assert_relative_eq!(
                        Boost::<R>::IDENTITY.apply(FourVector::AT_REST),
                        FourVector::AT_REST
                    );
                    assert_relative_eq!(f.lower().raise(), f);
                    assert_relative_eq!(ThreeVector::<R>::ZERO, ThreeVector::ZERO);
                }
            }
        }
    };
}

properties!(f32, single);
properties!(f64, double);
