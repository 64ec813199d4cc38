//! Property tests of `Motion` (proptest), written once and run in both precisions: round trips
//! over the whole range, monotonicity, the mass-shell invariant in stable form, and bad input
//! that must give a typed error, never a panic or a NaN.
//!
//! Source of the relations: gamma^2 - (beta gamma)^2 = 1 and (gamma - 1)(gamma + 1) = (beta
//! gamma)^2 are identities of special relativity (Jackson 3rd ed. ch. 11, from memory).
#![allow(clippy::float_cmp, clippy::unwrap_used)]

use crate::tolerance::eps_apart;
use fourforce::{Error, Motion, Real, Species};
use proptest::prelude::*;

/// A species: one of the named ones, or a custom ion (rest energy 0.1 MeV .. 250 GeV, charge
/// -8 .. 92, not zero).
fn species<T: Real>(pick: u8, m_exp: f64, q: i32) -> Species<T> {
    match pick % 12 {
        0 => Species::ELECTRON,
        1 => Species::POSITRON,
        2 => Species::PROTON,
        3 => Species::ANTIPROTON,
        4 => Species::MUON,
        5 => Species::ANTIMUON,
        6 => Species::DEUTERON,
        7 => Species::TRITON,
        8 => Species::HELION,
        9 => Species::ALPHA,
        _ => {
            let q = if q == 0 { 1 } else { q };
            Species::try_new(T::from_f64(10f64.powf(m_exp)), T::from_i32(q)).unwrap()
        }
    }
}

/// Every accessor of a state: none may be NaN; all finite except the flight time at rest.
fn assert_sound<T: Real>(m: &Motion<T>) {
    let values = [
        m.kinetic_energy(),
        m.total_energy(),
        m.gamma(),
        m.gamma_minus_one(),
        m.beta(),
        m.one_minus_beta(),
        m.beta_gamma(),
        m.momentum(),
        m.speed(),
        m.momentum_si(),
    ];
    for v in values {
        assert!(v.is_finite() && v >= T::ZERO, "{m:?}");
    }
    assert!(!m.flight_time_per_metre().is_nan());
    assert!(m.beta() <= T::ONE && m.one_minus_beta() <= T::ONE);
    if m.species().charge() != T::ZERO {
        assert!(m.try_magnetic_rigidity().unwrap().is_finite());
        assert!(m.try_electric_rigidity().unwrap().is_finite());
    }
}

macro_rules! properties {
    ($name:ident, $t:ty) => {
        mod $name {
            use super::*;
            type F = $t;

            proptest! {
                #![proptest_config(ProptestConfig::with_cases(cases(2000)))]

                #[test]
                fn round_trips(pick in 0u8..12, m_exp in 5.0f64..11.4, q in -8i32..92, x in 0.0f64..14.0) {
                    let s = species::<F>(pick, m_exp, q);
                    let t = F::from_f64(10f64.powf(x));
                    let base = Motion::try_from_kinetic_energy(s, t).unwrap();
                    assert_sound(&base);
                    let l = F::from_f64(2.5);
                    // From X, read X: the value read is the value given, to a few roundings.
                    let checks: [(Result<Motion<F>, Error>, fn(&Motion<F>) -> F, F, f64); 7] = [
                        (Motion::try_from_momentum(s, base.momentum()), |m| m.momentum(), base.momentum(), 0.0),
                        (Motion::try_from_total_energy(s, base.total_energy()), |m| m.total_energy(), base.total_energy(), 0.0),
                        (Motion::try_from_beta_gamma(s, base.beta_gamma()), |m| m.beta_gamma(), base.beta_gamma(), 0.0),
                        (Motion::try_from_gamma(s, base.gamma()), |m| m.gamma(), base.gamma(), 0.0),
                        (Motion::try_from_magnetic_rigidity(s, base.try_magnetic_rigidity().unwrap()), |m| m.try_magnetic_rigidity().unwrap(), base.try_magnetic_rigidity().unwrap(), 4.0),
                        (Motion::try_from_electric_rigidity(s, base.try_electric_rigidity().unwrap()), |m| m.try_electric_rigidity().unwrap(), base.try_electric_rigidity().unwrap(), 8.0),
                        (Motion::try_from_kinetic_energy(s, t), |m| m.kinetic_energy(), t, 0.0),
                    ];
                    for (i, (built, read, want, bound)) in checks.into_iter().enumerate() {
                        let m = built.unwrap();
                        assert_sound(&m);
                        let err = eps_apart(read(&m), want);
                        prop_assert!(err <= bound, "check {} {:?}: {} eps", i, s, err);
                    }
                    // The flight time read from an ultra-relativistic state may round to L/c or
                    // below; then the state cannot be rebuilt from it, and says so.
                    match Motion::try_from_flight_time(s, l, base.flight_time(l)) {
                        Ok(m) => {
                            assert_sound(&m);
                            let err = eps_apart(m.flight_time(l), base.flight_time(l));
                            prop_assert!(err <= 8.0, "flight time {:?}: {} eps", s, err);
                        }
                        Err(e) => {
                            prop_assert_eq!(e, Error::FasterThanLight);
                            prop_assert!(base.one_minus_beta() < F::from_f64(4.0) * F::EPSILON);
                        }
                    }
                    if base.beta() < F::ONE {
                        let m = Motion::try_from_beta(s, base.beta()).unwrap();
                        assert_sound(&m);
                        prop_assert_eq!(m.beta(), base.beta());
                        let v = base.speed();
                        if let Ok(m) = Motion::try_from_speed(s, v) {
                            assert_sound(&m);
                            prop_assert!(eps_apart(m.speed(), v) <= 4.0);
                        }
                    }
                }

                // A gamma or beta that was itself rounded (read from another state) carries its
                // rounding into T amplified by gamma/(gamma - 1) (from gamma) or
                // gamma^3 beta^2/(gamma - 1) (from beta). Where those stay near 2 (gamma >= 2;
                // beta <= 0.3), T still comes back within the 8 eps bound.
                #[test]
                fn rounded_gamma_and_beta_where_well_conditioned(pick in 0u8..12, m_exp in 5.0f64..11.4, q in -8i32..92, x in 0.0f64..14.0) {
                    let s = species::<F>(pick, m_exp, q);
                    let t = F::from_f64(10f64.powf(x));
                    let base = Motion::try_from_kinetic_energy(s, t).unwrap();
                    if base.gamma() >= F::TWO {
                        let m = Motion::try_from_gamma(s, base.gamma()).unwrap();
                        prop_assert!(eps_apart(m.kinetic_energy(), t) <= 8.0, "from gamma {:?}", base);
                    }
                    if base.beta() <= F::from_f64(0.3) {
                        let m = Motion::try_from_beta(s, base.beta()).unwrap();
                        prop_assert!(eps_apart(m.kinetic_energy(), t) <= 8.0, "from beta {:?}", base);
                    }
                }

                #[test]
                fn invariants(pick in 0u8..12, m_exp in 5.0f64..11.4, q in -8i32..92, x in 0.0f64..14.0) {
                    let s = species::<F>(pick, m_exp, q);
                    let m = Motion::try_from_kinetic_energy(s, F::from_f64(10f64.powf(x))).unwrap();
                    // gamma^2 - (beta gamma)^2 = 1 in the stable form gamma (1 - beta)(gamma + beta gamma).
                    let one = m.gamma() * m.one_minus_beta() * (m.gamma() + m.beta_gamma());
                    prop_assert!(eps_apart(one, F::ONE) <= 8.0, "{:?}", m);
                    // (gamma - 1)(gamma + 1) = (beta gamma)^2.
                    let lhs = m.gamma_minus_one() * (m.gamma() + F::ONE);
                    prop_assert!(eps_apart(lhs, m.beta_gamma() * m.beta_gamma()) <= 8.0);
                    // beta + (1 - beta) = 1 and beta gamma = beta * gamma.
                    prop_assert!(eps_apart(m.beta() + m.one_minus_beta(), F::ONE) <= 4.0);
                    prop_assert!(eps_apart(m.beta() * m.gamma(), m.beta_gamma()) <= 8.0);
                }

                #[test]
                // A relative step of at least 2.3e-4 in T: far above the few roundings by which two
                // formulas for one quantity may differ, so a failure is a real inversion.
                fn monotonic(pick in 0u8..12, m_exp in 5.0f64..11.4, q in -8i32..92, x in 0.0f64..14.0, dx in 1.0e-4f64..0.01) {
                    let s = species::<F>(pick, m_exp, q);
                    let a = Motion::try_from_kinetic_energy(s, F::from_f64(10f64.powf(x))).unwrap();
                    let b = Motion::try_from_kinetic_energy(s, F::from_f64(10f64.powf(x + dx))).unwrap();
                    prop_assert!(a.kinetic_energy() <= b.kinetic_energy());
                    prop_assert!(a.gamma() <= b.gamma());
                    prop_assert!(a.gamma_minus_one() <= b.gamma_minus_one());
                    prop_assert!(a.beta() <= b.beta());
                    prop_assert!(a.one_minus_beta() >= b.one_minus_beta());
                    prop_assert!(a.momentum() <= b.momentum());
                    prop_assert!(a.beta_gamma() <= b.beta_gamma());
                    prop_assert!(a.speed() <= b.speed());
                    prop_assert!(a.flight_time_per_metre() >= b.flight_time_per_metre());
                    prop_assert!(a.try_magnetic_rigidity().unwrap() <= b.try_magnetic_rigidity().unwrap());
                    prop_assert!(a.try_electric_rigidity().unwrap() <= b.try_electric_rigidity().unwrap());
                }

                #[test]
                fn any_input_gives_a_state_or_a_typed_error(pick in 0u8..12, m_exp in 5.0f64..11.4, q in -8i32..92, bits in any::<u64>(), len_bits in any::<u64>()) {
                    let s = species::<F>(pick, m_exp, q);
                    let x: F = F::from_f64(f64::from_bits(bits));
                    let l: F = F::from_f64(f64::from_bits(len_bits));
                    let all = [
                        Motion::try_from_kinetic_energy(s, x),
                        Motion::try_from_total_energy(s, x),
                        Motion::try_from_gamma(s, x),
                        Motion::try_from_beta(s, x),
                        Motion::try_from_beta_gamma(s, x),
                        Motion::try_from_momentum(s, x),
                        Motion::try_from_momentum_si(s, x),
                        Motion::try_from_magnetic_rigidity(s, x),
                        Motion::try_from_electric_rigidity(s, x),
                        Motion::try_from_speed(s, x),
                        Motion::try_from_flight_time(s, l, x),
                    ];
                    for r in all {
                        if let Ok(m) = r {
                            assert_sound(&m);
                        }
                    }
                }
            }

            #[test]
            fn edges_give_typed_errors() {
                let p = Species::<F>::PROTON;
                let n = Species::<F>::try_new(F::from_f64(939.565_420_52e6), 0.0).unwrap();
                assert_eq!(Motion::try_from_kinetic_energy(p, -1.0), Err(Error::NegativeEnergy));
                assert_eq!(Motion::try_from_kinetic_energy(p, F::NAN), Err(Error::NonFinite));
                assert_eq!(Motion::try_from_kinetic_energy(p, F::INFINITY), Err(Error::NonFinite));
                assert_eq!(Motion::try_from_kinetic_energy(p, F::MAX), Err(Error::Overflow));
                assert_eq!(Motion::try_from_total_energy(p, 1.0), Err(Error::BelowRestEnergy));
                assert_eq!(Motion::try_from_gamma(p, 0.999), Err(Error::BelowRestEnergy));
                assert_eq!(Motion::try_from_beta(p, 1.0), Err(Error::SpeedNotBelowLight));
                assert_eq!(Motion::try_from_beta(p, 1.5), Err(Error::SpeedNotBelowLight));
                assert_eq!(Motion::try_from_beta(p, -0.5), Err(Error::NegativeMagnitude));
                assert_eq!(Motion::try_from_beta_gamma(p, -0.5), Err(Error::NegativeMagnitude));
                assert_eq!(Motion::try_from_momentum(p, -1.0), Err(Error::NegativeMagnitude));
                assert_eq!(Motion::try_from_momentum(p, F::MAX), Err(Error::Overflow));
                assert_eq!(Motion::try_from_magnetic_rigidity(n, 1.0), Err(Error::ZeroCharge));
                assert_eq!(Motion::try_from_magnetic_rigidity(p, -1.0), Err(Error::NegativeMagnitude));
                assert_eq!(Motion::try_from_electric_rigidity(n, 1.0), Err(Error::ZeroCharge));
                assert_eq!(Motion::try_from_electric_rigidity(p, -1.0), Err(Error::NegativeMagnitude));
                assert_eq!(Motion::try_from_speed(p, 3.0e8), Err(Error::SpeedNotBelowLight));
                assert_eq!(Motion::try_from_speed(p, -3.0), Err(Error::NegativeMagnitude));
                let crawl = F::MIN_POSITIVE * F::EPSILON; // the smallest positive subnormal
                assert_eq!(Motion::try_from_speed(p, crawl), Err(Error::Overflow));
                assert_eq!(Motion::try_from_flight_time(p, 1.0, 3.0e-9), Err(Error::FasterThanLight));
                assert_eq!(Motion::try_from_flight_time(p, 0.0, 1.0), Err(Error::NonPositiveLength));
                assert_eq!(Motion::try_from_flight_time(p, 1.0, -1.0), Err(Error::NonPositiveLength));
                assert_eq!(Motion::try_from_flight_time(p, 1.0, F::NAN), Err(Error::NonFinite));
                let neutral = Motion::try_from_kinetic_energy(n, 1.0e6).unwrap();
                assert_eq!(neutral.try_magnetic_rigidity(), Err(Error::ZeroCharge));
                assert_eq!(neutral.try_electric_rigidity(), Err(Error::ZeroCharge));
                assert_sound(&neutral);
                // Barely moving (beta ~ 1e-38 after a subnormal beta gamma): the flight time per
                // metre 1/(beta c) fits, and is returned finite (it once overflowed through E/pc).
                let crawl = Motion::try_from_beta_gamma(p, F::from_f64(1.0e-37)).unwrap();
                assert!(crawl.flight_time_per_metre().is_finite());
                assert!(crawl.flight_time(2.0).is_finite());
                // At rest: a state, with zero speed and an infinite flight time, no NaN.
                let rest = Motion::try_from_electric_rigidity(p, 0.0).unwrap();
                assert_eq!(rest.kinetic_energy(), 0.0);
                assert_eq!(rest.speed(), 0.0);
                assert!(rest.flight_time_per_metre().is_infinite());
                assert_eq!(rest.flight_time(0.0), 0.0);
                assert_sound(&rest);
                for zero in [
                    Motion::try_from_beta(p, 0.0), Motion::try_from_beta_gamma(p, 0.0),
                    Motion::try_from_momentum(p, 0.0), Motion::try_from_gamma(p, 1.0),
                    Motion::try_from_speed(p, 0.0), Motion::try_from_total_energy(p, p.rest_energy()),
                    Motion::try_from_magnetic_rigidity(p, 0.0),
                ] {
                    let m = zero.unwrap();
                    assert_eq!(m.kinetic_energy(), 0.0);
                    assert_sound(&m);
                }
            }
        }
    };
}

properties!(in_f32, f32);
properties!(in_f64, f64);

/// The case count: `PROPTEST_CASES` when set (as for every other property test), else
/// `default`, this file's own count (higher than proptest's 256: the inputs span 14 decades).
fn cases(default: u32) -> u32 {
    std::env::var("PROPTEST_CASES")
        .ok()
        .and_then(|v| v.parse().ok())
        .unwrap_or(default)
}
