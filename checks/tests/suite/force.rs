//! The four-force K = q F u: published cases, orthogonality to u, the covariant form, f32 against f64.

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
    use fourforce::{FieldTensor, FourVector, Species, ThreeVector};
    macro_rules! published {
        ($r:ty, $name:ident) => {
            mod $name {
                use super::*;
                type R = $r;

                fn v(x: f64, y: f64, z: f64) -> ThreeVector<R> {
                    v3::<R>(x, y, z)
                }

                #[test]
                fn electron_at_rest_in_an_electric_field() {
                    // [mpmath] from CODATA 2018: K = (0, −1.60217663400e-13, 0, 0) N, power 0;
                    // q(E + v × B), K = γ(qE·v/c, q(E + v × B)) [Jackson 3rd ed. §12.1, from memory].
                    let f =
                        FieldTensor::try_from_fields(v(1e6, 0.0, 0.0), ThreeVector::ZERO).unwrap();
                    let q = Species::<R>::ELECTRON.charge();
                    let k = f.try_four_force_newtons(q, FourVector::AT_REST).unwrap();
                    assert_eq!(k.time, 0.0);
                    assert!(eps_rel(k.space.x, -1.602_176_634_00e-13) <= 1.0);
                    assert_eq!((k.space.y, k.space.z), (0.0, 0.0));
                    assert_eq!(f.try_power_watts(q, ThreeVector::ZERO).unwrap(), 0.0);
                }

                #[test]
                fn proton_at_six_tenths_c_in_a_magnetic_field() {
                    // [mpmath] from CODATA 2018: F = (0, −2.88192282754e-11, 0) N,
                    // K = (0, 0, −3.60240353443e-11, 0) N, γ = 1.25, power 0 [Jackson 3rd ed. §12.1].
                    let f =
                        FieldTensor::try_from_fields(ThreeVector::ZERO, v(0.0, 0.0, 1.0)).unwrap();
                    let q = Species::<R>::PROTON.charge();
                    let vel = v(0.6 * C, 0.0, 0.0);
                    let force = f.try_three_force_newtons(q, vel).unwrap();
                    assert!(eps_rel(force.y, -2.881_922_827_542_158_2e-11) <= 8.0);
                    assert_eq!((force.x, force.z), (0.0, 0.0));
                    let u = FourVector::try_four_velocity_from_velocity(vel).unwrap();
                    assert!(eps_rel(u.time, 1.25) <= 8.0);
                    let k = f.try_four_force_newtons(q, u).unwrap();
                    assert_eq!(k.time, 0.0);
                    assert!(eps_rel(k.space.y, -3.602_403_534_427_697_8e-11) <= 8.0);
                    assert_eq!(f.try_power_watts(q, vel).unwrap(), 0.0);
                }

                #[test]
                fn proton_at_six_tenths_c_in_an_electric_field() {
                    // [mpmath] from CODATA 2018: F = (1.60217663400e-13, 0, 0) N, power qE·v =
                    // 2.88192282754e-5 W, K⁰ = γ qE·v/c = 1.20163247550e-13 N [Jackson 3rd ed. §12.1].
                    let f =
                        FieldTensor::try_from_fields(v(1e6, 0.0, 0.0), ThreeVector::ZERO).unwrap();
                    let vel = v(0.6 * C, 0.0, 0.0);
                    let force = f.try_three_force_newtons(1.0, vel).unwrap();
                    assert!(eps_rel(force.x, 1.602_176_634_00e-13) <= 8.0);
                    let p = f.try_power_watts(1.0, vel).unwrap();
                    assert!(eps_rel(p, 2.881_922_827_542_158_2e-5) <= 8.0);
                    let u = FourVector::try_four_velocity_from_velocity(vel).unwrap();
                    let k = f.try_four_force_newtons(1.0, u).unwrap();
                    assert!(eps_rel(k.time, 1.201_632_475_50e-13) <= 8.0);
                    // The covariant form equals γ(P/c, F) (Jackson 3rd ed. §12.1, from memory).
                    assert!(eps_rel(k.space.x, 1.25 * 1.602_176_634_00e-13) <= 8.0);
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
    use fourforce::{FieldTensor, FourVector, Real};
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

                fn four_velocity(u: (f64, f64, f64)) -> FourVector<R> {
                    let s = v3::<R>(u.0, u.1, u.2);
                    FourVector::from_parts(R::ONE.hypot(s.norm()), s)
                }

                proptest! {

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
    use fourforce::{FieldTensor, FourVector, ThreeVector};
    const CASES: usize = 20_000;
    /// A random spatial four-velocity |u| from 1e-3 to 1e4 (γ up to 10⁴) and its f32 four-velocity.
    fn four_velocity(rng: &mut Rng) -> FourVector<f32> {
        let u = rng.vector(1e-3, 1e4);
        FourVector::from_parts(1.0_f32.hypot(u.norm()), u)
    }
    /// A random field: |E| from 1 V/m to 1e8 V/m, |B| from 1e-6 T to 10 T, in f32.
    fn fields(rng: &mut Rng) -> (ThreeVector<f32>, ThreeVector<f32>) {
        (rng.vector(1.0, 1e8), rng.vector(1e-6, 10.0))
    }
    #[test]
    fn four_force_f32_within_its_bar() {
        let mut rng = Rng(0x9e37_79b9_7f4a_7c15);
        let mut worst = 0.0_f64;
        let mut worst_ku = 0.0_f64;
        for _ in 0..CASES {
            let (e, b) = fields(&mut rng);
            let u = four_velocity(&mut rng);
            let q = if rng.next() < 0.5 { -1.0_f32 } else { 2.0 };
            let f32_field = FieldTensor::try_from_fields(e, b).unwrap();
            let f64_field = FieldTensor::try_from_fields(wide3(e), wide3(b)).unwrap();
            let k = f32_field.four_force(q, u);
            let exact = f64_field.four_force(f64::from(q), wide4(u));
            // K_scale = γ|q|(|E| + |v||B|) = |Q|(u⁰|E| + |u||cB|), in eV/m.
            let scale = f64::from(q).abs()
                * (f64::from(u.time) * wide3(e).norm()
                    + wide3(u.space).norm() * C * wide3(b).norm());
            worst = worst.max(eps_four(k, exact.to_array(), scale));
            // K·u = 0 to rounding: each component of K is off by up to 1.6 eps × K_scale, so K·u is
            // off by up to that times u⁰ + |u|.
            let k64 = wide4(k);
            let ku_scale = scale * (f64::from(u.time) + wide3(u.space).norm());
            worst_ku =
                worst_ku.max(k64.inner(wide4(u)).abs() / (ku_scale * f64::from(f32::EPSILON)));
        }
        println!("four-force f32: worst |K - K64| = {worst:.3} eps32 x K_scale over {CASES} cases");
        println!("four-force f32: worst |K.u| = {worst_ku:.3} eps32 x K_scale (u0 + |u|)");
        assert!(
            worst <= FOUR_FORCE.f32,
            "four-force: {worst} eps32 x K_scale"
        );
        assert!(worst_ku <= FORCE_ORTHOGONALITY.f32, "K.u: {worst_ku}");
    }
}
