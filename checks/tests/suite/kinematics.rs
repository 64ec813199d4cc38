//! Motion: 50-digit reference vectors, published worked examples and traps, properties over the whole range, unit accessors and edges.

mod properties;
mod published;
mod reference_vectors;

mod regressions {
    //! Regressions: bugs that fuzzing, the f32 sweep and mutation testing found, each with the
    //! input that exposed it.
    #![allow(clippy::float_cmp)]

    use fourforce::Error;
    /// Found by the `motion` fuzz target: the rigidities of a species of tiny charge (f64, Q = 1e-300)
    /// were `Ok(+inf)`, and a finite energy in keV whose eV value overflows (f32 1e36 keV) was refused
    /// as `NonFinite`. Both are `Overflow` now.
    #[test]
    fn rigidity_and_unit_overflows_are_refused_as_overflow() {
        use fourforce::{Motion, Species};
        let s = Species::<f64>::try_new(938.272e6, 1.0e-300).unwrap();
        let m = Motion::try_from_kinetic_energy(s, 1.0e9).unwrap();
        assert_eq!(m.try_magnetic_rigidity(), Err(Error::Overflow));
        assert_eq!(m.try_electric_rigidity(), Err(Error::Overflow));
        let p = Species::<f32>::PROTON;
        assert_eq!(
            Motion::try_from_kinetic_energy_kev(p, 1.0e36),
            Err(Error::Overflow)
        );
        assert_eq!(
            Motion::try_from_kinetic_energy_mev(p, 1.0e33),
            Err(Error::Overflow)
        );
        assert_eq!(
            Motion::try_from_kinetic_energy_gev(p, 1.0e30),
            Err(Error::Overflow)
        );
        assert_eq!(
            Motion::try_from_kinetic_energy_kev(p, f32::NAN),
            Err(Error::NonFinite)
        );
        // Ordinary values are untouched.
        assert!(
            Motion::try_from_kinetic_energy_mev(p, 250.0)
                .unwrap()
                .try_magnetic_rigidity()
                .unwrap()
                > 2.4
        );
    }
}

mod mutants {
    //! Sharper tests that kill mutants cargo-mutants found surviving: each pins a result a wrong
    //! operator or a constant return would change; values exact in both precisions.
    #![allow(clippy::float_cmp)]

    use fourforce::Species;
    /// `speed()` in f32 uses `c = C_HI + C_LO` (299 792 448 + 10 m/s, both exact in f32): over 4096
    /// values of β spread over (0, 1), the signed relative error against `β·c` in f64 averages to
    /// -0.173 eps (measured; IEEE arithmetic only, so the figure is the same on every platform). With
    /// the 10 m/s low part dropped or negated (the mutants of `times_c`) the mean moves to -0.274 and
    /// -0.375 eps, though each single speed stays within an ulp. Reference: c = 299 792 458 m/s
    /// exactly (SI 2019).
    #[test]
    fn f32_speed_uses_the_exact_two_part_c() {
        let n = 4096_u32;
        let mut sum = 0.0_f64;
        for k in 1..=n {
            let beta = k as f32 / (n + 1) as f32;
            let m = fourforce::Motion::try_from_beta(Species::<f32>::PROTON, beta).unwrap();
            let exact = f64::from(beta) * 299_792_458.0;
            sum += (f64::from(m.speed()) - exact) / exact / f64::from(f32::EPSILON);
        }
        let mean = sum / f64::from(n);
        assert!(mean > -0.22 && mean < 0.1, "mean signed error {mean} eps");
    }
    /// Survivors of the full run of 2026-12-02 (`ci/mutants`), one test per mutant or group.
    macro_rules! sharper_edges {
        ($t:ident, $name:ident) => {
            mod $name {
                use super::*;

                /// The unit accessors divide by their unit.
                #[test]
                fn unit_accessors_divide_by_their_unit() {
                    use fourforce::Motion;
                    let s = Motion::try_from_kinetic_energy(Species::<$t>::PROTON, 2.5e9).unwrap();
                    let close = |x: $t, want: $t| (x / want - 1.0).abs() <= 2.0 * <$t>::EPSILON;
                    assert!(
                        close(s.kinetic_energy_kev(), 2.5e6),
                        "{}",
                        s.kinetic_energy_kev()
                    );
                    assert!(
                        close(s.kinetic_energy_mev(), 2.5e3),
                        "{}",
                        s.kinetic_energy_mev()
                    );
                    assert!(
                        close(s.kinetic_energy_gev(), 2.5),
                        "{}",
                        s.kinetic_energy_gev()
                    );
                    assert!(
                        close(s.momentum_mev(), s.momentum() * 1.0e-6),
                        "{}",
                        s.momentum_mev()
                    );
                    assert!(s.momentum_mev() > 3000.0 && s.momentum_mev() < 3400.0);
                }

                /// The unit constructors scale by their unit (exact products in both precisions).
                #[test]
                fn unit_constructors_scale_by_their_unit() {
                    use fourforce::Motion;
                    let p = Species::<$t>::PROTON;
                    let kev = Motion::try_from_kinetic_energy_kev(p, 2.5).unwrap();
                    assert_eq!(kev.kinetic_energy(), 2500.0);
                    let gev = Motion::try_from_kinetic_energy_gev(p, 1.5).unwrap();
                    assert_eq!(gev.kinetic_energy(), 1.5e9);
                    // 1e-19 kg m/s is pc = 1e-19 · c/e eV, c/e = 1.871 157 347 061 897 0e27 from the
                    // exact c and e of SI 2019 (CODATA 2018).
                    let si = Motion::try_from_momentum_si(p, 1.0e-19).unwrap();
                    let want = 1.871_157_347_061_897e8;
                    let got = f64::from(si.momentum());
                    assert!(
                        (got / want - 1.0).abs() <= 4.0 * f64::from(<$t>::EPSILON),
                        "{got}"
                    );
                }
            }
        };
    }

    sharper_edges!(f32, edges_f32);
    sharper_edges!(f64, edges_f64);
    /// The formula each branch of `Motion` picks is the more accurate one: over 2¹⁷ values of β in
    /// (0, 1) and of pc/m in (0, 4), f32 proton, the worst errors stay at their measured values
    /// (γ 0.95 and βγ 1.22 eps from β, γ 1.19 eps from pc); taking the other branch raises them to
    /// 1.37, 1.30 and 1.45. Reference: the same closed forms in f64 from the f32 inputs (β = k/2¹⁷
    /// makes 1 − β² exact in f64), whose error is negligible at f32 scale.
    #[test]
    fn motion_branches_pick_the_accurate_form() {
        use fourforce::Motion;
        let eps = f64::from(f32::EPSILON);
        let err = |x: f32, r: f64| ((f64::from(x) - r) / r).abs() / eps;
        let (mut gamma_b, mut beta_gamma_b, mut gamma_p) = (0.0_f64, 0.0_f64, 0.0_f64);
        let m = f64::from(Species::<f32>::PROTON.rest_energy());
        for k in 1..(1_u32 << 17) {
            let b = f64::from(k) / f64::from(1_u32 << 17);
            let s = Motion::try_from_beta(Species::<f32>::PROTON, b as f32).unwrap();
            let gamma = 1.0 / ((1.0 - b) * (1.0 + b)).sqrt();
            gamma_b = gamma_b.max(err(s.gamma(), gamma));
            beta_gamma_b = beta_gamma_b.max(err(s.beta_gamma(), b * gamma));
            let pc = (f64::from(k) / f64::from(1_u32 << 15) * m) as f32;
            let s = Motion::try_from_momentum(Species::<f32>::PROTON, pc).unwrap();
            let total = f64::from(pc).hypot(m);
            gamma_p = gamma_p.max(err(s.gamma(), total / m));
        }
        assert!(gamma_b <= 1.0, "γ from β: {gamma_b} eps");
        assert!(beta_gamma_b <= 1.25, "βγ from β: {beta_gamma_b} eps");
        assert!(gamma_p <= 1.25, "γ from pc: {gamma_p} eps");
    }
    /// Bρ → pc in f32 is correctly rounded: x·c with x an f32 (24 bits) and c = 299 792 458 m/s
    /// (29 bits, exact by the SI definition) is exact in f64, so its rounding to f32 is the reference.
    /// The low part of c (10 m/s) decides the last bit here.
    #[test]
    fn f32_momentum_from_rigidity_is_correctly_rounded() {
        use fourforce::Motion;
        let mut x = 0.01_f32;
        for _ in 0..4096 {
            let s = Motion::try_from_magnetic_rigidity(Species::<f32>::PROTON, x).unwrap();
            let want = (f64::from(x) * 299_792_458.0) as f32;
            assert_eq!(s.momentum(), want, "Bρ = {x} T m");
            x *= 1.0037;
        }
    }
    /// β from a flight time over 1 m, f32 proton, 2¹⁶ times from β = 0.005 to 0.995: worst 0.89 eps
    /// (measured). Reference: β = L/(c t) in f64, where c t is exact (24-bit t times the 29-bit c).
    /// Both branches (below and above c/2) and the low part of c in c·t each move it above 1.0.
    #[test]
    fn f32_beta_from_flight_time_within_its_measured_bound() {
        use fourforce::Motion;
        let c = 299_792_458.0_f64;
        let mut worst = 0.0_f64;
        for k in 0..(1_u32 << 16) {
            let beta_target = 0.005 + 0.99 * f64::from(k) / f64::from(1_u32 << 16);
            let t = (1.0 / (beta_target * c)) as f32;
            let s = Motion::try_from_flight_time(Species::<f32>::PROTON, 1.0, t).unwrap();
            let beta = 1.0 / (f64::from(t) * c);
            worst = worst.max((f64::from(s.beta()) / beta - 1.0).abs() / f64::from(f32::EPSILON));
        }
        assert!(worst <= 0.95, "β from a flight time: {worst} eps");
    }
}
