//! An independent check against a general-purpose linear-algebra crate (nalgebra): full 4×4
//! matrix products, built here from the textbook definitions, agree with the specialised code.
//!
//! - `F^μ_ν u^ν` as `(F η) u` with `F^{i0} = Eⁱ/c`, `F^{ij} = −ε^{ijk}Bᵏ` (in units of c F) and
//!   `η = diag(1, −1, −1, −1)` against [`FieldTensor::contract`] (12 multiplications);
//! - `Λ` of a boost from β, `Λ⁰₀ = γ`, `Λ⁰ᵢ = Λⁱ₀ = −γβᵢ`, `Λⁱⱼ = δᵢⱼ + (γ − 1)βᵢβⱼ/β²`
//!   (Jackson 3rd ed. §11.3 eq. 11.98, from memory), against [`Boost::to_transform`], `Λx`
//!   against [`Boost::apply`] and `Λ F Λᵀ` against [`Boost::apply_field`];
//! - `Λ⁻¹` (nalgebra's general inverse) against [`LorentzTransform::inverse`], products against
//!   [`LorentzTransform::compose`], and `Λᵀ η Λ = η`.
// Reference values are typed with all their digits; tests compare floats exactly on purpose.
#![allow(clippy::excessive_precision, clippy::float_cmp)]

use super::foundation_common::*;

use fourforce::{Boost, FieldTensor, FourVector, LorentzTransform, Real, ThreeVector};
use nalgebra::{Matrix4, Vector4};
use proptest::prelude::*;

fn vec3(range: f64) -> impl Strategy<Value = (f64, f64, f64)> {
    (-range..range, -range..range, -range..range)
}

/// The Levi-Civita symbol ε^{ijk} for i, j, k in 1..=3.
fn levi_civita(i: usize, j: usize, k: usize) -> f64 {
    match (i, j, k) {
        (1, 2, 3) | (2, 3, 1) | (3, 1, 2) => 1.0,
        (3, 2, 1) | (1, 3, 2) | (2, 1, 3) => -1.0,
        _ => 0.0,
    }
}

macro_rules! against_nalgebra {
    ($r:ty, $name:ident) => {
        mod $name {
            use super::*;
            type R = $r;
            const EPS: f64 = <R as Real>::EPSILON as f64;

            fn eta() -> Matrix4<R> {
                Matrix4::from_diagonal(&Vector4::new(1.0, -1.0, -1.0, -1.0))
            }

            /// `c F^μν` from E and cB by the definition, index by index.
            fn field_matrix(e: ThreeVector<R>, cb: ThreeVector<R>) -> Matrix4<R> {
                let (e, cb) = (e.to_array(), cb.to_array());
                let mut m = Matrix4::<R>::zeros();
                for i in 1..4 {
                    m[(i, 0)] = e[i - 1];
                    m[(0, i)] = -e[i - 1];
                    for j in 1..4 {
                        let mut s = 0.0;
                        for k in 1..4 {
                            s -= levi_civita(i, j, k) * f64::from(cb[k - 1]);
                        }
                        m[(i, j)] = s as R;
                    }
                }
                m
            }

            /// The boost matrix from β by the textbook formula.
            fn boost_matrix(beta: ThreeVector<R>) -> Matrix4<R> {
                let b = beta.to_array();
                let b2: R = beta.norm_squared();
                let g = 1.0 / (1.0 - b2).sqrt();
                let mut m = Matrix4::<R>::identity();
                m[(0, 0)] = g;
                for i in 1..4 {
                    m[(0, i)] = -g * b[i - 1];
                    m[(i, 0)] = -g * b[i - 1];
                    for j in 1..4 {
                        if b2 > 0.0 {
                            m[(i, j)] += (g - 1.0) * b[i - 1] * b[j - 1] / b2;
                        }
                    }
                }
                m
            }

            fn to_na(m: [[R; 4]; 4]) -> Matrix4<R> {
                Matrix4::from_fn(|i, j| m[i][j])
            }

            fn max_diff(a: &Matrix4<R>, b: &Matrix4<R>) -> f64 {
                a.iter().zip(b.iter()).map(|(x, y)| f64::from(*x - *y).abs()).fold(0.0, f64::max)
            }

            proptest! {

                #[test]
                fn contraction_matches_the_full_product(e in vec3(1e7), b in vec3(2.0), u in vec3(30.0)) {
                    let f = FieldTensor::try_from_fields(v3::<R>(e.0, e.1, e.2), v3(b.0, b.1, b.2)).unwrap();
                    let s = v3::<R>(u.0, u.1, u.2);
                    let u = FourVector::from_parts(1.0_f64.hypot(wide3(s).norm()) as R, s);
                    let full = field_matrix(f.e(), f.c_b()) * eta() * Vector4::from(u.to_array());
                    let mine = f.contract(u);
                    let scale = f64::from(u.time) * wide3(f.e()).norm() + wide3(u.space).norm() * wide3(f.c_b()).norm();
                    let want = [f64::from(full[0]), f64::from(full[1]), f64::from(full[2]), f64::from(full[3])];
                    prop_assert!(eps_four(mine, want, scale) <= 4.0);
                    // The mixed matrix of the crate is the same matrix.
                    prop_assert!(max_diff(&to_na(f.to_mixed_matrix()), &(field_matrix(f.e(), f.c_b()) * eta())) == 0.0);
                }

                #[test]
                fn boost_matches_the_full_products(beta in vec3(0.55), x in vec3(10.0), t in -10.0..10.0_f64, e in vec3(1e7), b in vec3(2.0)) {
                    let beta = v3::<R>(beta.0, beta.1, beta.2);
                    let bst = Boost::try_from_beta(beta).unwrap();
                    let lambda = boost_matrix(beta);
                    let g = f64::from(bst.gamma());
                    prop_assert!(max_diff(&to_na(bst.to_transform().to_matrix()), &lambda) <= 8.0 * EPS * g * g);
                    // Λ x
                    let x = FourVector::from_parts(t as R, v3(x.0, x.1, x.2));
                    let lx = lambda * Vector4::from(x.to_array());
                    let want = [f64::from(lx[0]), f64::from(lx[1]), f64::from(lx[2]), f64::from(lx[3])];
                    let scale = g * (t.abs() + wide3(x.space).norm());
                    prop_assert!(eps_four(bst.apply(x), want, scale) <= 8.0);
                    // Λ F Λᵀ
                    let f = FieldTensor::try_from_fields(v3::<R>(e.0, e.1, e.2), v3(b.0, b.1, b.2)).unwrap();
                    let fp = lambda * field_matrix(f.e(), f.c_b()) * lambda.transpose();
                    let g_field = bst.apply_field(&f);
                    let fscale = g * g * field_scale(&f);
                    let mine = field_matrix(g_field.e(), g_field.c_b());
                    prop_assert!(max_diff(&mine, &fp) <= 16.0 * EPS * fscale);
                    // and the general transform's own Λ F Λᵀ
                    let general = bst.to_transform().apply_field(&f);
                    prop_assert!(max_diff(&field_matrix(general.e(), general.c_b()), &fp) <= 16.0 * EPS * fscale);
                }

                #[test]
                fn inverse_composition_and_metric_match(a in vec3(0.55), c in vec3(0.55)) {
                    let ba = Boost::try_from_beta(v3::<R>(a.0, a.1, a.2)).unwrap();
                    let bc = Boost::try_from_beta(v3::<R>(c.0, c.1, c.2)).unwrap();
                    let both: LorentzTransform<R> = ba.then(&bc);
                    let na_both = to_na(bc.to_transform().to_matrix()) * to_na(ba.to_transform().to_matrix());
                    let g = f64::from(ba.gamma() * bc.gamma());
                    prop_assert!(max_diff(&to_na(both.to_matrix()), &na_both) <= 8.0 * EPS * g * g);
                    let inv = na_both.try_inverse().unwrap();
                    prop_assert!(max_diff(&to_na(both.inverse().to_matrix()), &inv) <= 64.0 * EPS * g * g * g);
                    let metric = na_both.transpose() * eta() * na_both;
                    prop_assert!(max_diff(&metric, &eta()) <= 16.0 * EPS * g * g);
                }
            }
        }
    };
}

against_nalgebra!(f32, single);
against_nalgebra!(f64, double);
