//! The field tensor: components, contraction, invariants, the dual, read-back from SI, the limits it refuses.

mod exact {
    //! Exact-valued checks of the foundation's small operations, in both precisions: every operator,
    //! accessor and index of the four-vector, covector, field tensor and boost, on inputs whose
    //! results are exact in binary (small integers, halves, the 3-4-5 boost γ = 5/4, γβ = 3/4). They
    //! pin each sign and each index of the formulas, so that a wrong operator cannot pass.
    //! Conventions of SOURCES.md §4: F^{i0} = Eⁱ/c, F^{ij} = −ε^{ijk}Bᵏ (Jackson 3rd ed. §11.9,
    //! from memory).
    #![allow(clippy::float_cmp)]

    use fourforce::{Error, FieldTensor, FourVector, Real, ThreeVector};
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
                        FieldTensor::try_pseudoscalar_invariant_of(
                            v(2.0, 3.0, 0.0),
                            v(0.5, 4.0, 1.0)
                        ),
                        Ok(13.0)
                    );
                    // E·B from the stored tensor: (E·cB)/c.
                    let t = FieldTensor::try_from_scaled(
                        v(2.0, 0.0, 0.0),
                        v(R::SPEED_OF_LIGHT, 0.0, 0.0),
                    )
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
            }
        };
    }

    exact!(f32);
    exact!(f64);
}

mod published {
    //! Published values for the four-force, the field boost and the field invariants, in both
    //! precisions, and the two extremes that must work in f32: a 1 eV electron and a 100 TeV proton.
    //!
    //! Reference values: 50-digit mpmath values from CODATA 2018 ([mpmath] in
    //! `checks/tests/reference/SOURCES.md`); the formulas are Jackson 3rd ed. §11.9-11.10 and
    //! §12.1-12.3 (from memory). Each check names its source beside it. Bars are in eps of the format:
    //! 8 eps where the inputs are exact decimals (0.6 c is not exact in binary: 1 eps for that; the
    //! stable formulas measure about 3 eps at worst). Where the reference
    //! table prints 12 digits, the value beside the check carries 17 to 20: recomputed here with
    //! mpmath at 40 digits from the same inputs and formulas, and equal to the published one to its
    //! printed digits, so that the f64 bar can be tight.
    // Reference values are typed with all their digits; tests compare floats exactly on purpose.
    #![allow(clippy::excessive_precision, clippy::float_cmp)]

    // Reference values are typed with all their digits; tests compare floats exactly on purpose.

    use crate::tolerance::*;
    use fourforce::{Boost, FieldTensor, Real, ThreeVector};
    macro_rules! published {
        ($r:ty, $name:ident) => {
            mod $name {
                use super::*;
                type R = $r;

                fn v(x: f64, y: f64, z: f64) -> ThreeVector<R> {
                    v3::<R>(x, y, z)
                }

                #[test]
                fn field_invariants() {
                    // [mpmath] from CODATA 2018: F_μν F^μν = 2(B² − E²/c²) = 0.0949999885921079 T², E·B = 0
                    // [Jackson 3rd ed. §11.9-11.10, from memory].
                    let e = v(0.0, 134_906_608.0, 0.0);
                    let b = v(0.0, 0.0, 0.5);
                    let f = FieldTensor::try_from_fields(e, b).unwrap();
                    assert!(eps_rel(f.scalar_invariant(), 0.094_999_988_592_107_864) <= 4.0);
                    assert!(
                        eps_rel(
                            FieldTensor::try_scalar_invariant_of(e, b).unwrap(),
                            0.094_999_988_592_107_864
                        ) <= 2.0
                    );
                    assert_eq!(f.pseudoscalar_invariant(), 0.0);
                    // Both invariants survive the boost into the drift frame.
                    let g = Boost::try_from_velocity(v(269_813_216.0, 0.0, 0.0))
                        .unwrap()
                        .apply_field(&f);
                    assert!(eps_rel(g.scalar_invariant(), 0.094_999_988_592_107_864) <= 16.0);
                    assert!(
                        g.pseudoscalar_invariant().abs().to_f64() <= 1e-9 * 134_906_608.0 * 0.5
                    );
                }

                #[test]
                fn near_null_invariant_keeps_its_digits() {
                    // precision trap ([IEEE 754] single precision against [mpmath]): E ⟂ B, E = cB(1 − 1e-6) rounded to f32 =
                    // 149896080 V/m, B = 0.5 T: 2(B² − E²/c²) = 9.940205097e-7 T² [mp]; the plain f32
                    // formula gives 9.5367e-7 (−4 %), the stable one 1.1 eps. Exact value of these
                    // inputs: 9.9402050965161521880756e-7 (mpmath, 50 digits).
                    let e = v(0.0, 149_896_080.0, 0.0);
                    let b = v(0.0, 0.0, 0.5);
                    let s = FieldTensor::try_scalar_invariant_of(e, b).unwrap();
                    let err = eps_rel(s, 9.940_205_096_516_152e-7);
                    println!("near-null invariant, {}: {err:.3} eps", stringify!($r));
                    assert!(err <= NEAR_NULL_INVARIANT.of::<R>(), "{err}");
                    let naive =
                        R::TWO * (b.z * b.z - e.y * e.y / (R::SPEED_OF_LIGHT * R::SPEED_OF_LIGHT));
                    if R::MANTISSA_DIGITS == 24 {
                        assert!(eps_rel(naive, 9.940_205_096_516_152e-7) > 1e5); // the trap is real
                    }
                }
            }
        };
    }

    published!(f32, single);
    published!(f64, double);
}

mod properties {
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

    // Reference values are typed with all their digits; tests compare floats exactly on purpose.

    use crate::tolerance::*;
    use fourforce::{FieldTensor, Real};
    use proptest::prelude::*;
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

                }

            }
        };
    }

    properties!(f32, single);
    properties!(f64, double);
}

mod precision {
    //! f32 against f64, with stated tolerances: the f32 path computed from f32 inputs, the f64 path
    //! from the same inputs widened (exact), so the difference is the f32 rounding alone.
    //!
    //! Bars (measured in IEEE single precision against 50-digit values, with margin):
    //! - four-force: |K − K_exact| ≤ 1.6 eps32 × K_scale per component, K_scale = γ|q|(|E| + |v||B|);
    //! - field boost: |E' − E'_exact| ≤ 1.4 eps32 × γ_V(|E| + c|B|) there, with γ_V given exactly;
    //!   here γ_V and 1/(γ_V + 1) are computed in f32 from the frame's four-velocity, and the bar is
    //!   2 eps32 (the same for cB').
    //!
    //! Run with `cargo test -p fourforce-checks --release --test suite -- precision --nocapture` to print the worst measured
    //! deviations (`docs/accuracy.md` quotes them).
    // Reference values are typed with all their digits; tests compare floats exactly on purpose.
    #![allow(clippy::excessive_precision, clippy::float_cmp)]

    // Reference values are typed with all their digits; tests compare floats exactly on purpose.

    use crate::tolerance::*;
    use fourforce::{FieldTensor, ThreeVector};
    const CASES: usize = 20_000;
    /// A random field: |E| from 1 V/m to 1e8 V/m, |B| from 1e-6 T to 10 T, in f32.
    fn fields(rng: &mut Rng) -> (ThreeVector<f32>, ThreeVector<f32>) {
        (rng.vector(1.0, 1e8), rng.vector(1e-6, 10.0))
    }
    #[test]
    fn field_reads_back_what_it_was_given() {
        // B in T → cB (c in two exact parts) → B = cB/c: within 2 eps32 of the input; E exactly.
        let mut rng = Rng(0x5151_5151_aaaa_0001);
        let mut worst = 0.0_f64;
        for _ in 0..CASES {
            let (e, b) = fields(&mut rng);
            let f = FieldTensor::try_from_fields(e, b).unwrap();
            assert_eq!(f.e(), e);
            for (got, want) in f.b().to_array().iter().zip(b.to_array()) {
                worst = worst.max(eps_rel(*got, f64::from(want)));
            }
        }
        println!("field read-back f32: worst |B - B_in|/|B_in| = {worst:.3} eps32");
        assert!(worst <= FIELD_READBACK.f32, "B read-back: {worst}");
    }
}

mod against_nalgebra {
    //! An independent check against a general-purpose linear-algebra crate (nalgebra): full 4×4
    //! matrix products, built here from the textbook definitions, agree with the specialised code.
    //!
    //! - `F^μ_ν u^ν` as `(F η) u` with `F^{i0} = Eⁱ/c`, `F^{ij} = −ε^{ijk}Bᵏ` (in units of c F) and
    //!   `η = diag(1, −1, −1, −1)` against [`FieldTensor::contract`] (12 multiplications);
    //! - `Λ` of a boost from β, `Λ⁰₀ = γ`, `Λ⁰ᵢ = Λⁱ₀ = −γβᵢ`, `Λⁱⱼ = δᵢⱼ + (γ − 1)βᵢβⱼ/β²`
    //!   (Jackson 3rd ed. §11.3 eq. 11.98, from memory), against [`Boost::to_transform`], `Λx`
    //!   against [`Boost::apply`] and `Λ F Λᵀ` against [`Boost::apply_field`];
    //! - `Λ⁻¹` (nalgebra's general inverse) against [`LorentzTransform::inverse`], products against
    //!   [`LorentzTransform::then`], and `Λᵀ η Λ = η`.
    // Reference values are typed with all their digits; tests compare floats exactly on purpose.
    #![allow(clippy::excessive_precision, clippy::float_cmp)]

    // Reference values are typed with all their digits; tests compare floats exactly on purpose.

    use crate::tolerance::*;
    use fourforce::{FieldTensor, FourVector, ThreeVector};
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

                }
            }
        };
    }

    against_nalgebra!(f32, single);
    against_nalgebra!(f64, double);
}

mod regressions {
    //! Regressions: bugs that fuzzing, the f32 sweep and mutation testing found, each with the
    //! input that exposed it.
    #![allow(clippy::float_cmp)]

    use fourforce::{Error, ThreeVector};
    /// Found by the `field` fuzz target: a finite B whose cB overflows (f32 B = -1.847577e38 T) was
    /// refused with `NonFinite`; the documented refusal of a field above the limit is `Overflow`.
    #[test]
    fn finite_field_too_large_is_refused_as_overflow() {
        use fourforce::FieldTensor;
        let b = ThreeVector::new(-1.847_577e38_f32, 0.0, 0.0);
        assert_eq!(
            FieldTensor::try_from_fields(ThreeVector::ZERO, b),
            Err(Error::Overflow)
        );
        assert_eq!(
            FieldTensor::try_scalar_invariant_of(ThreeVector::ZERO, b),
            Err(Error::Overflow)
        );
        assert_eq!(
            FieldTensor::try_pseudoscalar_invariant_of(ThreeVector::ZERO, b),
            Err(Error::Overflow)
        );
        let nan = ThreeVector::new(f32::NAN, 0.0, 0.0);
        assert_eq!(
            FieldTensor::try_from_fields(ThreeVector::ZERO, nan),
            Err(Error::NonFinite)
        );
    }
}

mod mutants {
    //! Sharper tests that kill mutants cargo-mutants found surviving: each pins a result a wrong
    //! operator or a constant return would change; values exact in both precisions.
    #![allow(clippy::float_cmp)]

    use fourforce::ThreeVector;
    /// The low part of the two-part c (`C_LO` = 10 m/s in f32) where it decides the result: a speed
    /// 458 m/s below c, and a field 1e-6 from null. References: Python `decimal` at 50 digits, from
    /// c = 299 792 458 m/s exact (CODATA 2018); the invariant is the one of
    /// [mpmath] (9.940 205 097e-7 T²).
    #[test]
    fn f32_results_near_c_use_the_low_part_of_c() {
        use fourforce::{FieldTensor, FourVector};
        let u = FourVector::try_four_velocity_from_velocity(ThreeVector::new(
            299_792_000.0_f32,
            0.0,
            0.0,
        ))
        .unwrap();
        let eps = f64::from(f32::EPSILON);
        assert!(
            (f64::from(u.time) / 572.087_924_007_272_5 - 1.0).abs() <= 4.0 * eps,
            "{u:?}"
        );
        assert!(
            (f64::from(u.space.x) / 572.087_050_015_074_9 - 1.0).abs() <= 4.0 * eps,
            "{u:?}"
        );
        let s = FieldTensor::try_scalar_invariant_of(
            ThreeVector::new(0.0_f32, 149_896_080.0, 0.0),
            ThreeVector::new(0.0_f32, 0.0, 0.5),
        )
        .unwrap();
        assert!(
            (f64::from(s) / 9.940_205_096_516_152e-7 - 1.0).abs() <= 4.0 * eps,
            "{s}"
        );
    }
}
