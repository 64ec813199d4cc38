//! Four-vectors, covectors and four-velocities: exact operators, published speeds, the extremes of f32, γ from a velocity against mpmath, edges.

mod exact {
    //! Exact-valued checks of the foundation's small operations, in both precisions: every operator,
    //! accessor and index of the four-vector, covector, field tensor and boost, on inputs whose
    //! results are exact in binary (small integers, halves, the 3-4-5 boost γ = 5/4, γβ = 3/4). They
    //! pin each sign and each index of the formulas, so that a wrong operator cannot pass.
    //! Conventions of SOURCES.md §4: F^{i0} = Eⁱ/c, F^{ij} = −ε^{ijk}Bᵏ (Jackson 3rd ed. §11.9,
    //! from memory).
    #![allow(clippy::float_cmp)]

    use fourforce::{Covector, Error, FourVector};
    macro_rules! exact {
        ($r:ident) => {
            mod $r {
                use super::*;
                type R = $r;

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
    use fourforce::{Boost, Error, FieldTensor, FourVector, Real, Species, ThreeVector};
    macro_rules! published {
        ($r:ty, $name:ident) => {
            mod $name {
                use super::*;
                type R = $r;

                fn v(x: f64, y: f64, z: f64) -> ThreeVector<R> {
                    v3::<R>(x, y, z)
                }

                #[test]
                fn four_velocity_from_published_speeds() {
                    // [mpmath] from CODATA 2018: electron 1 keV, v = 18727896.635170324 m/s,
                    // γ − 1 = 0.0019569511835591834; proton 1 GeV, v = 262326089.43513954 m/s,
                    // γ = 2.0657889247894517, βγ = 1.8076182898451650. γ from a speed has condition
                    // γ²β² (the measured f32 figures): 0.004 and 3.3 here, hence the bars.
                    let u = FourVector::try_four_velocity_from_velocity(v(
                        18_727_896.635_170_324,
                        0.0,
                        0.0,
                    ))
                    .unwrap();
                    assert!(eps_rel(u.time, 1.001_956_951_183_559_2) <= 2.0);
                    let u = FourVector::try_four_velocity_from_velocity(v(
                        0.0,
                        -262_326_089.435_139_54,
                        0.0,
                    ))
                    .unwrap();
                    assert!(eps_rel(u.time, 2.065_788_924_789_451_7) <= 8.0);
                    assert!(eps_rel(u.space.y, -1.807_618_289_845_165) <= 8.0);
                    assert!(u.four_velocity_deviation().abs() <= 4.0 * R::EPSILON);
                }

                #[test]
                fn one_ev_electron_works() {
                    // [mpmath], CODATA 2018: electron, T = 1 eV: pc = 1010.9396124398331 eV,
                    // γ − 1 = 1.9569511835591834e-6, βγ = pc/m = 0.0019783594710709936 [mp, CODATA 2018].
                    let pc = v(0.0, 0.0, 1_010.939_612_439_833_1);
                    let u = FourVector::try_four_velocity_from_momentum(Species::<R>::ELECTRON, pc)
                        .unwrap();
                    assert!(eps_rel(u.space.z, 0.001_978_359_471_070_993_6) <= 2.0);
                    assert!(eps_rel(u.time, 1.000_001_956_951_183_6) <= 1.0);
                    assert!(u.four_velocity_deviation().abs() <= 2.0 * R::EPSILON);
                    // In an invented 5 kV/m transverse field with 1 mT along the motion: K·u = 0, and
                    // the force is the f64 one to 2 eps of its scale.
                    let f = FieldTensor::try_from_fields(v(5000.0, 0.0, 0.0), v(0.0, 0.0, 1e-3))
                        .unwrap();
                    let k = f.four_force(-1.0, u);
                    let ku = k.inner(u).to_f64().abs();
                    let ku_scale = (k.time * u.time).to_f64().abs()
                        + wide3(k.space).norm() * wide3(u.space).norm();
                    assert!(ku <= 4.0 * R::EPSILON.to_f64() * ku_scale.max(1.0));
                    assert!(eps_rel(k.space.x, -5000.0 * 1.000_001_956_951_183_6) <= 2.0);
                    // Three-force in SI from the speed: 593 096.088 m/s ([mpmath], CODATA 2018).
                    let vel = v(0.0, 0.0, 593_096.087_979_861_74);
                    let fn_ = f.try_three_force_newtons(-1.0, vel).unwrap();
                    assert!(eps_rel(fn_.x, -1.602_176_634e-19 * 5000.0) <= 4.0);
                }

                #[test]
                fn hundred_tev_proton_works() {
                    // [mpmath], CODATA 2018: proton, T = 100 TeV: γ = 106579.89247894517,
                    // pc = 100000938267686.43 eV, βγ = 106579.89247425385 [mp, CODATA 2018].
                    let pc = v(100_000_938_267_686.43, 0.0, 0.0);
                    let u = FourVector::try_four_velocity_from_momentum(Species::<R>::PROTON, pc)
                        .unwrap();
                    assert!(eps_rel(u.time, 106_579.892_478_945_17) <= 2.0);
                    assert!(eps_rel(u.space.x, 106_579.892_474_253_85) <= 2.0);
                    assert!(u.four_velocity_deviation().abs() <= 2.0 * R::EPSILON);
                    // β from pc/E rounds to 1 in f32 ([IEEE 754] single precision against [mpmath]), so β is refused there;
                    // the momentum path above is the one to use.
                    if R::MANTISSA_DIGITS == 24 {
                        let beta = u.space.x / u.time;
                        assert_eq!(beta, 1.0);
                        assert_eq!(
                            FourVector::try_four_velocity(ThreeVector::new(beta, 0.0, 0.0)),
                            Err(Error::SpeedNotBelowLight)
                        );
                    }
                    // An invented 8 T dipole field across the motion: K = γQ(0, β × cB).
                    let f =
                        FieldTensor::try_from_fields(ThreeVector::ZERO, v(0.0, 8.0, 0.0)).unwrap();
                    let k = f.four_force(1.0, u);
                    assert_eq!(k.time, 0.0);
                    assert!(eps_rel(k.space.z, 106_579.892_474_253_85 * 8.0 * C) <= 4.0);
                    // The field in the proton's rest frame: E' = −γβ × cB, B' = γB (Jackson §11.10).
                    let g = Boost::try_from_four_velocity(u).unwrap().apply_field(&f);
                    assert!(eps_rel(g.b().y, 8.0 * 106_579.892_478_945_17) <= 4.0);
                    assert!(eps_rel(g.e().z, 8.0 * C * 106_579.892_474_253_85) <= 4.0);
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
                    fn raising_lowering_and_contractions_agree(e in vec3(1e7), b in vec3(2.0), u in vec3(50.0)) {
                        let (f, u) = (field(e, b), four_velocity(u));
                        prop_assert_eq!(f.lower().raise(), f);
                        prop_assert_eq!(u.lower().raise(), u);
                        prop_assert_eq!(f.contract_covector(u.lower()), f.contract(u));
                        prop_assert_eq!(f.lower().contract(u), f.contract(u).lower());
                        prop_assert_eq!(u.contract(u.lower()), u.inner(u));
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
    use fourforce::{FourVector, Species, ThreeVector};
    #[test]
    fn four_velocity_from_momentum_f32() {
        // From 1 eV to 100 TeV of kinetic energy, electron and proton: pc = √(T(T + 2m)) in f64,
        // rounded to f32 as the input; the f64 result from the same (widened) input is the reference.
        let mut worst = 0.0_f64;
        let mut worst_dev = 0.0_f64;
        for (s32, s64) in [
            (Species::<f32>::ELECTRON, Species::<f64>::ELECTRON),
            (Species::<f32>::PROTON, Species::<f64>::PROTON),
        ] {
            for i in 0..=1400 {
                let t = 10f64.powf(f64::from(i) / 100.0);
                let m = s64.rest_energy();
                let pc = (t * (t + 2.0 * m)).sqrt() as f32;
                let dir = ThreeVector::new(0.6_f32, 0.0, 0.8);
                let u = FourVector::try_four_velocity_from_momentum(s32, dir * pc).unwrap();
                let u64 =
                    FourVector::try_four_velocity_from_momentum(s64, wide3(dir * pc)).unwrap();
                // The f64 reference uses the f32 rest energy, so that only the arithmetic differs.
                let u64 = u64.scale(m / f64::from(s32.rest_energy()));
                let u64 = FourVector::from_parts(1.0_f64.hypot(u64.space.norm()), u64.space);
                for (g, w) in u.to_array().iter().zip(u64.to_array()) {
                    if w != 0.0 {
                        worst = worst.max(eps_rel(*g, w));
                    }
                }
                worst_dev = worst_dev
                    .max(f64::from(u.four_velocity_deviation().abs()) / f64::from(f32::EPSILON));
            }
        }
        println!(
            "four-velocity from momentum f32: worst component {worst:.3} eps32; worst |u.u - 1|/u0^2 {worst_dev:.3} eps32"
        );
        assert!(
            worst <= FOUR_VELOCITY_FROM_MOMENTUM.f32,
            "four-velocity: {worst}"
        );
        assert!(
            worst_dev <= FOUR_VELOCITY_DEVIATION.f32,
            "deviation: {worst_dev}"
        );
    }
}

mod regressions {
    //! Regressions: bugs that fuzzing, the f32 sweep and mutation testing found, each with the
    //! input that exposed it.
    #![allow(clippy::float_cmp)]

    use fourforce::{Error, ThreeVector};
    /// Found by the `four_vector` fuzz target: every component of `pc/m` finite but `|pc/m|` not
    /// (f32 pc = (-2.562126e38, -2.562126e38, -2.562126e38) eV, m = 1 eV) gave `Ok` with `u⁰ = +inf`.
    #[test]
    fn four_velocity_whose_time_part_overflows_is_refused() {
        use fourforce::{FourVector, Species};
        let m = Species::<f32>::try_new(1.0, 1.0).unwrap();
        let m32 = m;
        let pc = ThreeVector::new(-2.562_126e38_f32, -2.562_126e38, -2.562_126e38);
        assert_eq!(
            FourVector::try_four_velocity_from_momentum(m, pc),
            Err(Error::Overflow)
        );
        let m = Species::<f64>::try_new(1.0, 1.0).unwrap();
        let big = f64::MAX * 0.75;
        let pc = ThreeVector::new(big, big, big);
        assert_eq!(
            FourVector::try_four_velocity_from_momentum(m, pc),
            Err(Error::Overflow)
        );
        // The largest that fits is still accepted.
        let pc = ThreeVector::new(1.0e38_f32, 0.0, 0.0);
        let u = FourVector::try_four_velocity_from_momentum(m32, pc).unwrap();
        assert!(u.time.is_finite());
    }
    /// Found by the `four_vector` fuzz target: `four_velocity_deviation` was +inf for the
    /// four-velocity of a proton with pc = 1e30 eV in f32 (u⁰ ≈ 1.1e21, above √MAX ≈ 1.8e19), which
    /// `try_four_velocity_from_momentum` accepts: the squares overflowed. The components are now
    /// scaled by a power of two first.
    #[test]
    fn deviation_of_a_huge_four_velocity_is_finite() {
        use fourforce::{FourVector, Species};
        let u = FourVector::try_four_velocity_from_momentum(
            Species::<f32>::PROTON,
            ThreeVector::new(1.0e30, 2.0e29, -3.0e29),
        )
        .unwrap();
        assert!(u.time > 1.0e21);
        let d = u.four_velocity_deviation();
        assert!(d.abs() <= 8.0 * f32::EPSILON, "deviation {d}");
        // Up to f32::MAX: a stored u⁰ = MAX with |u| = MAX reads as normalised.
        let edge = FourVector::new(f32::MAX, f32::MAX, 0.0, 0.0);
        assert_eq!(edge.four_velocity_deviation(), 0.0);
        // And the ordinary range is the unscaled figure: (1.25² − 1 − 0.75²)/1.25² = 0.
        assert_eq!(
            FourVector::new(1.25_f32, 0.75, 0.0, 0.0).four_velocity_deviation(),
            0.0
        );
        assert_eq!(
            FourVector::new(2.0_f64, 1.0, 1.0, 0.0).four_velocity_deviation(),
            (4.0 - 1.0 - 2.0) / 4.0
        );
    }
}

mod mutants {
    //! Sharper tests that kill mutants cargo-mutants found surviving: each pins a result a wrong
    //! operator or a constant return would change; values exact in both precisions.
    #![allow(clippy::float_cmp)]

    use fourforce::{Species, ThreeVector};
    /// Survivors of the full run of 2026-12-02 (`ci/mutants`), one test per mutant or group.
    macro_rules! sharper_edges {
        ($t:ident, $name:ident) => {
            mod $name {
                use super::*;
                use fourforce::{Error, FourVector};

                /// Each non-finite input is refused on its own, and `u⁰ = 0` reads as +∞.
                #[test]
                fn four_velocity_edges() {
                    let pc = ThreeVector::new(1.0, 0.0, 0.0);
                    assert_eq!(Species::try_new(<$t>::INFINITY, 1.0), Err(Error::NonFinite));
                    assert!(
                        FourVector::try_four_velocity_from_momentum(Species::PROTON, pc).is_ok()
                    );
                    let nan = ThreeVector::new(<$t>::NAN, 0.0, 0.0);
                    assert_eq!(
                        FourVector::try_four_velocity_from_momentum(Species::PROTON, nan),
                        Err(Error::NonFinite)
                    );
                    let still = FourVector::<$t>::new(0.0, 0.0, 0.0, 0.0);
                    assert_eq!(still.four_velocity_deviation(), <$t>::INFINITY);
                    let nan_time = FourVector::<$t>::new(<$t>::NAN, 0.0, 0.0, 0.0);
                    assert_eq!(nan_time.four_velocity_deviation(), <$t>::INFINITY);
                }
            }
        };
    }

    sharper_edges!(f32, edges_f32);
    sharper_edges!(f64, edges_f64);
}
mod gamma_from_velocity {
    //! γ from an off-axis velocity (β or m/s) against 50-digit mpmath references.
    //!
    //! Source of every reference value: `checks/tests/reference/gamma_velocity.csv`, written by
    //! `checks/tests/reference/generate_gamma.py` with mpmath at 50 significant digits from the very inputs
    //! the library gets (each component exact in the precision; c = 299 792 458 m/s exact, SI 2019).
    //! Bound (the doc comments of `FourVector::try_four_velocity`,
    //! `FourVector::try_four_velocity_from_velocity` and the `Boost` constructors): γ within 4 eps of
    //! the exact value, any direction, up to γ = 10³ in `f32` and 10⁶ in `f64`.

    use crate::tolerance::GAMMA_FROM_VELOCITY;
    use fourforce::{Boost, FourVector, Real, ThreeVector};

    const BOUND_EPS: f64 = GAMMA_FROM_VELOCITY.f64;

    struct Row {
        prec: String,
        kind: String,
        bits: [u64; 3],
        gamma_hi: f64,
        gamma_lo: f64,
    }

    fn rows() -> Vec<Row> {
        let text = include_str!("../reference/gamma_velocity.csv");
        text.lines()
            .skip(1)
            .map(|line| {
                let f: Vec<&str> = line.split(',').collect();
                assert_eq!(f.len(), 7, "malformed line {line}");
                let bits = |s: &str| u64::from_str_radix(s, 16).unwrap();
                Row {
                    prec: f[0].to_string(),
                    kind: f[1].to_string(),
                    bits: [bits(f[2]), bits(f[3]), bits(f[4])],
                    gamma_hi: f[5].parse().unwrap(),
                    gamma_lo: f[6].parse().unwrap(),
                }
            })
            .collect()
    }

    /// |got − exact| / exact in eps of `T`, measured in f64 with the reference's two parts.
    fn err_eps<T: Real>(got: T, row: &Row) -> f64 {
        let d = (got.to_f64() - row.gamma_hi) - row.gamma_lo;
        (d / row.gamma_hi).abs() / T::EPSILON.to_f64()
    }

    /// Worst error in eps of every γ-from-velocity constructor over the rows of precision `T`.
    fn worst<T: Real>(prec: &str, from_bits: impl Fn(u64) -> T) -> Vec<(String, f64, f64)> {
        let mut out: Vec<(String, f64, f64)> = Vec::new();
        let mut note = |name: &str, e: f64, g: f64| match out.iter_mut().find(|(n, _, _)| n == name)
        {
            Some(w) if e > w.1 => {
                w.1 = e;
                w.2 = g;
            }
            Some(_) => {}
            None => out.push((name.to_string(), e, g)),
        };
        let mut count = 0;
        for row in rows().iter().filter(|r| r.prec == prec) {
            count += 1;
            let [x, y, z] = row.bits.map(&from_bits);
            let v = ThreeVector::new(x, y, z);
            let g = row.gamma_hi;
            match row.kind.as_str() {
                "beta" => {
                    let u = FourVector::try_four_velocity(v).unwrap();
                    note("FourVector::try_four_velocity", err_eps(u.time, row), g);
                    let b = Boost::try_from_beta(v).unwrap();
                    note("Boost::try_from_beta", err_eps(b.gamma(), row), g);
                }
                "velocity" => {
                    let u = FourVector::try_four_velocity_from_velocity(v).unwrap();
                    note(
                        "FourVector::try_four_velocity_from_velocity",
                        err_eps(u.time, row),
                        g,
                    );
                    let b = Boost::try_from_velocity(v).unwrap();
                    note("Boost::try_from_velocity", err_eps(b.gamma(), row), g);
                }
                "speed" => {
                    let b = Boost::try_from_speed(ThreeVector::new(T::ONE, y, z), x).unwrap();
                    note("Boost::try_from_speed", err_eps(b.gamma(), row), g);
                }
                k => panic!("unknown kind {k}"),
            }
        }
        assert!(count > 1000, "only {count} {prec} rows");
        out
    }

    fn check(prec: &str, worst: Vec<(String, f64, f64)>) {
        assert_eq!(worst.len(), 5, "every constructor is measured");
        for (name, e, g) in worst {
            println!("{prec} {name}: worst {e:.2} eps (at gamma {g:.4e}), bound {BOUND_EPS}");
            assert!(e <= BOUND_EPS, "{prec} {name}: {e} eps at gamma {g}");
        }
    }

    #[test]
    fn gamma_of_off_axis_velocities_within_4_eps_f32() {
        // Reference: mpmath, 50 digits (checks/tests/reference/gamma_velocity.csv), γ up to 10³.
        check("f32", worst::<f32>("f32", |b| f32::from_bits(b as u32)));
    }

    #[test]
    fn gamma_of_off_axis_velocities_within_4_eps_f64() {
        // Reference: mpmath, 50 digits (checks/tests/reference/gamma_velocity.csv), γ up to 10⁶.
        check("f64", worst::<f64>("f64", f64::from_bits));
    }
}
