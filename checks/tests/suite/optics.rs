//! The beam-line functions of `fourforce::optics` against published and mpmath values, in both
//! precisions, and their typed errors.
//!
//! Sources: the gyration in uniform B (Jackson 3rd ed. §12.2, from memory; values mpmath 50 digits
//! from CODATA 2018) and the energy gain through a voltage (energy conservation); the flight-time differences were computed for this file with
//! mpmath at 50 digits from CODATA 2018 (m_e c^2, m_mu c^2, m_p c^2) and the exact c.
#![allow(clippy::unwrap_used, clippy::float_cmp, clippy::type_complexity)]
// Reference values are typed with all the digits their source prints.
#![allow(clippy::excessive_precision)]

use crate::tolerance::eps_rel;
use fourforce::{Error, Motion, Real, Species, optics};

fn state<T: Real>(s: Species<T>, t_ev: f64) -> Motion<T> {
    Motion::try_from_kinetic_energy(s, T::from_f64(t_ev)).unwrap()
}

fn gyration<T: Real>() {
    // [Jackson] §12.2, values [mpmath], pitch angle 90 degrees: (species, T eV, B T, radius m, omega rad/s).
    let rows: [(Species<T>, f64, f64, f64, f64); 3] = [
        (Species::PROTON, 10.0e6, 1.0, 0.458155375777, 94778196.0429),
        (
            Species::ELECTRON,
            1.0e3,
            0.01,
            0.0106688268839,
            1755384808.38,
        ),
        (Species::PROTON, 250.0e6, 1.5, 1.62141895915, 113453204.997),
    ];
    for (s, t, b, radius, omega) in rows {
        let m = state(s, t);
        let b = T::from_f64(b);
        // 12 significant digits published: compare to 1e-11 or 8 eps, whichever is larger.
        let tol = (8.0 * T::EPSILON.to_f64()).max(1e-11);
        let r = optics::try_bending_radius(&m, b).unwrap();
        assert!(
            ((r.to_f64() - radius) / radius).abs() <= tol,
            "{r} vs {radius}"
        );
        let f = optics::try_revolution_frequency(&m, b).unwrap().to_f64();
        let w = 2.0 * core::f64::consts::PI * f;
        assert!(((w - omega) / omega).abs() <= tol + 2e-16, "{w} vs {omega}");
    }
    // Gyroradius with pitch angle 30 degrees: r = pc sin(alpha)/(c |Q| B) = 0.0237159022429 m
    // for a 1 MeV electron in 0.1 T ([Jackson] §12.2, values [mpmath]).
    let e = state(Species::<T>::ELECTRON, 1.0e6);
    let r = optics::try_bending_radius(&e, T::from_f64(0.1)).unwrap() * T::HALF;
    assert!(((r.to_f64() - 0.0237159022429) / 0.0237159022429).abs() <= 1e-6);
}

#[test]
fn gyration_published_both_precisions() {
    gyration::<f32>();
    gyration::<f64>();
}

fn potential<T: Real>() {
    // Energy conservation across a gap, T = T0 + Q V (Jackson, Classical Electrodynamics, 3rd ed.,
    // from memory); beta after from mpmath, CODATA 2018.
    // (species, T0 eV, voltage V in the direction of travel, beta after).
    let rows: [(Species<T>, f64, f64, f64); 3] = [
        (Species::ELECTRON, 0.0, -1.0e5, 0.548220861952),
        (Species::PROTON, 1.0e6, 1.0e6, 0.0651886758890),
        (Species::ALPHA, 0.0, 1.0e5, 0.0103588302961),
    ];
    for (s, t0, voltage, beta) in rows {
        let after = optics::try_after_voltage(&state(s, t0), T::from_f64(voltage)).unwrap();
        let tol = (8.0 * T::EPSILON.to_f64()).max(1e-11);
        assert!(((after.beta().to_f64() - beta) / beta).abs() <= tol);
    }
    // A voltage that takes more than the kinetic energy: a typed error.
    let slow = state(Species::<T>::PROTON, 1.0e3);
    assert_eq!(
        optics::try_after_voltage(&slow, T::from_f64(-2.0e3)),
        Err(Error::NegativeEnergy)
    );
}

#[test]
fn energy_gain_published_both_precisions() {
    potential::<f32>();
    potential::<f64>();
}

fn flight_differences<T: Real>() {
    // Computed with mpmath (50 digits, CODATA 2018, exact c). Inputs exact in both precisions.
    // Bound: 8 eps times the condition of the difference, (|x_a| + |x_b|)/|x_a - x_b| with x the
    // lag behind light of each state.
    let cases: [(Species<T>, f64, Species<T>, f64, f64, f64); 3] = [
        (
            Species::MUON,
            1.0e9,
            Species::ELECTRON,
            1.0e9,
            20.0,
            3.0670433903701499e-10,
        ),
        (
            Species::ELECTRON,
            1.0e10,
            Species::ELECTRON,
            2.0e10,
            100.0,
            3.2658692996737853e-16,
        ),
        (
            Species::PROTON,
            4096.0e9,
            Species::PROTON,
            8192.0e9,
            1000.0,
            6.5601863843856245e-14,
        ),
    ];
    for (sa, ta, sb, tb, l, want) in cases {
        let (a, b) = (state(sa, ta), state(sb, tb));
        let l = T::from_f64(l);
        let la = optics::try_lag_behind_light(&a, l).unwrap().to_f64();
        let lb = optics::try_lag_behind_light(&b, l).unwrap().to_f64();
        let cond = (la.abs() + lb.abs()) / (la - lb).abs();
        let dt = optics::try_flight_time_difference(&a, &b, l).unwrap();
        let err = eps_rel(dt, want);
        assert!(err <= 8.0 * cond, "{err} eps, condition {cond}");
        // The naive difference of two flight times in f32 loses everything for the electrons.
        if T::MANTISSA_DIGITS == 24 && sa == sb {
            let naive = a.flight_time(l) - b.flight_time(l);
            assert!(eps_rel(naive, want) > 1e3);
        }
    }
    // The lag of a 10 GeV electron over 100 m: 4.3545665691171279e-16 s ([IEEE 754] single precision against [mpmath]).
    let e = state(Species::<T>::ELECTRON, 1.0e10);
    assert!(
        eps_rel(
            optics::try_lag_behind_light(&e, T::from_f64(100.0)).unwrap(),
            4.3545665691171279e-16
        ) <= 8.0
    );
}

#[test]
fn flight_time_differences_both_precisions() {
    flight_differences::<f32>();
    flight_differences::<f64>();
}

fn kicks<T: Real>() {
    // 250 MeV proton, B rho = 2.4321284387255044 T m ([mpmath], CODATA 2018). A hard-edge dipole of
    // 0.5 T over 0.2 m: asin(0.1 / B rho) = 0.041127843262663984 rad; the small-angle form gives
    // 0.041116249622245476 rad (mpmath).
    let p = state(Species::<T>::PROTON, 250.0e6);
    let (b, l) = (T::from_f64(0.5), T::from_f64(0.2));
    let exact = optics::try_kick_angle_hard_edge(&p, b, l).unwrap();
    assert!(eps_rel(exact, 0.041127843262663984) <= 8.0);
    let small = optics::try_kick_angle(&p, b * l).unwrap();
    assert!(eps_rel(small, 0.041116249622245476) <= 8.0);
    // And back: the field for that angle, and the energy from that field.
    let field = optics::try_field_for_angle_hard_edge(&p, exact, l).unwrap();
    assert!(eps_rel(field, 0.5) <= 8.0);
    let back = optics::try_motion_from_dipole(Species::<T>::PROTON, b, l, exact).unwrap();
    assert!(eps_rel(back.kinetic_energy(), 250.0e6) <= 16.0); // condition of T in B rho: (gamma + 1)/gamma = 1.8
    let bl = optics::try_integrated_field_for_angle(&p, small).unwrap();
    assert!(eps_rel(bl, 0.1) <= 4.0);
    // A negative charge turns the other way.
    let e = state(Species::<T>::ELECTRON, 1.0e6);
    assert!(optics::try_kick_angle(&e, T::from_f64(1e-4)).unwrap() < T::ZERO);
    // Electrostatic deflector and its inverse: alpha 5 MeV, E rho = 4996650.9299730097 V.
    let a = state(Species::<T>::ALPHA, 5.0e6);
    let theta =
        optics::try_electrostatic_kick_angle(&a, T::from_f64(2.0e4), T::from_f64(0.5)).unwrap();
    assert!(eps_rel(theta, 1.0e4 / 4996650.9299730097) <= 8.0);
    let field = optics::try_deflector_field_for_angle(&a, theta, T::from_f64(0.5)).unwrap();
    assert!(eps_rel(field, 2.0e4) <= 8.0);
    let back = Motion::try_from_electric_rigidity(
        Species::<T>::ALPHA,
        field * T::from_f64(4996650.9299730097 / 2.0e4),
    )
    .unwrap();
    assert!(eps_rel(back.kinetic_energy(), 5.0e6) <= 16.0);
    // Electric bending radius: E rho / E.
    let r = optics::try_electric_bending_radius(&a, T::from_f64(2.0e4)).unwrap();
    assert!(eps_rel(r, 4996650.9299730097 / 2.0e4) <= 8.0);
    // Energy from a centring field: B rho = B rho.
    let c = Motion::try_from_magnetic_rigidity(
        Species::<T>::PROTON,
        T::from_f64(1.5) * T::from_f64(2.4321284387255044 / 1.5),
    )
    .unwrap();
    assert!(eps_rel(c.kinetic_energy(), 250.0e6) <= 16.0);
    // Energy from a flight time: 10 m at 3.8120493548822230 ns/m is a 1 GeV proton ([mpmath]).
    let f = Motion::try_from_flight_time(
        Species::<T>::PROTON,
        T::from_f64(10.0),
        T::from_f64(38.120493548822230e-9),
    )
    .unwrap();
    assert!(eps_rel(f.kinetic_energy(), 1.0e9) <= 64.0); // condition of T in t: gamma^3 beta^2/(gamma - 1) = 6.3, on the f32 input rounding
}

#[test]
fn kicks_and_inverse_problems_both_precisions() {
    kicks::<f32>();
    kicks::<f64>();
}

fn edges<T: Real>() {
    let p = state(Species::<T>::PROTON, 250.0e6);
    let rest = state(Species::<T>::PROTON, 0.0);
    let n = Motion::try_from_kinetic_energy(
        Species::<T>::try_new(T::from_f64(939.565_420_52e6), T::ZERO).unwrap(),
        T::ONE,
    )
    .unwrap();
    let (one, zero, nan) = (T::ONE, T::ZERO, T::from_f64(f64::NAN));
    assert_eq!(optics::try_bending_radius(&p, zero), Err(Error::ZeroField));
    assert_eq!(optics::try_bending_radius(&p, nan), Err(Error::NonFinite));
    assert_eq!(optics::try_bending_radius(&n, one), Err(Error::ZeroCharge));
    assert_eq!(optics::try_bending_radius(&rest, one), Ok(zero));
    assert_eq!(
        optics::try_electric_bending_radius(&p, zero),
        Err(Error::ZeroField)
    );
    assert_eq!(
        optics::try_revolution_frequency(&p, zero),
        Err(Error::ZeroField)
    );
    assert_eq!(
        optics::try_revolution_frequency(&n, one),
        Err(Error::ZeroCharge)
    );
    assert_eq!(
        optics::try_lag_behind_light(&p, zero),
        Err(Error::NonPositiveLength)
    );
    assert_eq!(
        optics::try_lag_behind_light(&rest, one),
        Err(Error::Overflow)
    );
    assert_eq!(
        optics::try_flight_time_difference(&p, &rest, one),
        Err(Error::Overflow)
    );
    assert_eq!(
        optics::try_energy_gain(Species::<T>::PROTON, nan),
        Err(Error::NonFinite)
    );
    assert_eq!(optics::try_kick_angle(&rest, one), Err(Error::Overflow));
    assert_eq!(optics::try_kick_angle(&n, one), Err(Error::ZeroCharge));
    assert_eq!(
        optics::try_kick_angle_hard_edge(&p, T::from_f64(30.0), one),
        Err(Error::AngleOutOfRange)
    );
    assert_eq!(
        optics::try_kick_angle_hard_edge(&p, one, -one),
        Err(Error::NonPositiveLength)
    );
    assert_eq!(
        optics::try_field_for_angle_hard_edge(&p, T::TWO, one),
        Err(Error::AngleOutOfRange)
    );
    assert_eq!(
        optics::try_electrostatic_kick_angle(&rest, one, one),
        Err(Error::Overflow)
    );
    assert_eq!(
        optics::try_deflector_field_for_angle(&p, one, zero),
        Err(Error::NonPositiveLength)
    );
    assert_eq!(
        optics::try_motion_from_dipole(Species::<T>::PROTON, one, one, zero),
        Err(Error::AngleOutOfRange)
    );
    assert_eq!(
        optics::try_motion_from_dipole(Species::<T>::PROTON, zero, one, one),
        Err(Error::ZeroField)
    );
    assert_eq!(optics::try_after_voltage(&p, nan), Err(Error::NonFinite));
}

#[test]
fn typed_errors_at_the_edges_both_precisions() {
    edges::<f32>();
    edges::<f64>();
}

mod properties {
    //! Round trips and symmetries of the optics functions over the whole range (proptest).
    use super::*;
    use proptest::prelude::*;

    macro_rules! optics_properties {
        ($name:ident, $t:ty) => {
            mod $name {
                use super::*;
                type F = $t;

                fn pick(i: u8) -> Species<F> {
                    [Species::ELECTRON, Species::PROTON, Species::MUON, Species::ALPHA, Species::ANTIPROTON][usize::from(i % 5)]
                }

                proptest! {
                    #![proptest_config(ProptestConfig::with_cases(cases(1000)))]

                    #[test]
                    fn centring_field_and_radius_invert(i in 0u8..5, x in 0.0f64..14.0, b in 0.01f64..10.0) {
                        let s = pick(i);
                        let m = state(s, 10f64.powf(x));
                        let b = F::from_f64(b);
                        let rho = optics::try_bending_radius(&m, b).unwrap();
                        let back = Motion::try_from_magnetic_rigidity(s, b * rho).unwrap();
                        // B rho = B * rho carries 3 roundings; T has condition <= 2 in B rho.
                        prop_assert!(eps_rel(back.momentum(), m.momentum().to_f64()) <= 8.0);
                    }

                    #[test]
                    fn hard_edge_angle_and_field_invert(i in 0u8..5, x in 3.0f64..14.0, frac in 0.001f64..0.9) {
                        let s = pick(i);
                        let m = state(s, 10f64.powf(x));
                        let l = F::from_f64(0.5);
                        let brho = m.try_magnetic_rigidity().unwrap();
                        let b = F::from_f64(frac) * brho / l;
                        let theta = optics::try_kick_angle_hard_edge(&m, b, l).unwrap();
                        prop_assert!(theta.abs() <= F::PI * F::HALF);
                        let back = optics::try_field_for_angle_hard_edge(&m, theta, l).unwrap();
                        // asin then sin: each within about 1 ulp (libm).
                        prop_assert!(eps_rel(back, b.to_f64()) <= 16.0, "{} vs {}", back, b);
                    }

                    #[test]
                    fn flight_time_difference_is_antisymmetric_and_consistent(i in 0u8..5, j in 0u8..5, x in 0.0f64..14.0, y in 0.0f64..14.0) {
                        let (a, b) = (state(pick(i), 10f64.powf(x)), state(pick(j), 10f64.powf(y)));
                        let l = F::from_f64(7.5);
                        let ab = optics::try_flight_time_difference(&a, &b, l).unwrap();
                        let ba = optics::try_flight_time_difference(&b, &a, l).unwrap();
                        prop_assert_eq!(ab, -ba);
                        // Against the plain difference of the two flight times, in f64, where that
                        // difference is well conditioned (at most 1/100 of cancellation).
                        let (ta, tb) = (a.flight_time(l).to_f64(), b.flight_time(l).to_f64());
                        if (ta - tb).abs() > 0.01 * ta.max(tb) {
                            let rel = ((ab.to_f64() - (ta - tb)) / (ta - tb)).abs();
                            prop_assert!(rel <= 400.0 * F::EPSILON.to_f64(), "{} vs {}", ab, ta - tb);
                        }
                    }

                    #[test]
                    fn kicks_scale_with_field_and_flip_with_charge(x in 0.0f64..14.0, bl in -1.0f64..1.0) {
                        let p = state(Species::<F>::PROTON, 10f64.powf(x));
                        let pbar = state(Species::<F>::ANTIPROTON, 10f64.powf(x));
                        let bl = F::from_f64(bl);
                        let k = optics::try_kick_angle(&p, bl).unwrap();
                        prop_assert_eq!(k, -optics::try_kick_angle(&pbar, bl).unwrap());
                        let need = optics::try_integrated_field_for_angle(&p, k).unwrap();
                        if bl != F::ZERO {
                            prop_assert!(eps_rel(need, bl.to_f64()) <= 4.0);
                        }
                    }
                }
            }
        };
    }

    optics_properties!(in_f32, f32);
    optics_properties!(in_f64, f64);
}

/// The case count: `PROPTEST_CASES` when set (as for every other property test), else
/// `default`, this file's own count (higher than proptest's 256: the inputs span 14 decades).
fn cases(default: u32) -> u32 {
    std::env::var("PROPTEST_CASES")
        .ok()
        .and_then(|v| v.parse().ok())
        .unwrap_or(default)
}

mod regressions {
    //! Regressions: bugs that fuzzing, the f32 sweep and mutation testing found, each with the
    //! input that exposed it.
    #![allow(clippy::float_cmp)]

    use fourforce::Error;
    /// Found by the `optics` fuzz target: the energy gain of an alpha from 2.5525757e38 V (f32) and
    /// the integrated field for 3e38 rad on a 1 TeV proton were `Ok(inf)`; both are `Overflow` now.
    #[test]
    fn optics_products_that_overflow_are_refused() {
        use fourforce::{Motion, Species, optics};
        assert_eq!(
            optics::try_energy_gain(Species::<f32>::ALPHA, 2.552_575_7e38),
            Err(Error::Overflow)
        );
        let p = Motion::try_from_kinetic_energy(Species::<f32>::PROTON, 1.0e12).unwrap();
        assert_eq!(
            optics::try_integrated_field_for_angle(&p, 3.0e38),
            Err(Error::Overflow)
        );
        assert_eq!(
            optics::try_energy_gain(Species::<f32>::ALPHA, 1.0e6),
            Ok(2.0e6)
        );
    }
}

mod mutants {
    //! Sharper tests that kill mutants cargo-mutants found surviving: each pins a result a wrong
    //! operator or a constant return would change; values exact in both precisions.
    #![allow(clippy::float_cmp)]

    use fourforce::Species;
    /// Survivors of the full run of 2026-12-02 (`ci/mutants`), one test per mutant or group.
    macro_rules! sharper_edges {
        ($t:ident, $name:ident) => {
            mod $name {
                use super::*;
                use fourforce::Error;

                /// The 90° limits of the hard-edge formulas are inclusive: sin θ = 1 is a kick of
                /// exactly π/2, and a dipole bending by exactly π/2 is a valid measurement.
                #[test]
                fn optics_accept_exactly_ninety_degrees() {
                    use fourforce::{Motion, optics};
                    let pi_2 = core::$t::consts::FRAC_PI_2;
                    let m = Motion::try_from_kinetic_energy(Species::<$t>::PROTON, 1.0e8).unwrap();
                    let brho = m.try_magnetic_rigidity().unwrap();
                    let kick = optics::try_kick_angle_hard_edge(&m, brho, 1.0).unwrap();
                    assert!((kick.abs() - pi_2).abs() <= 4.0 * <$t>::EPSILON, "{kick}");
                    assert!(optics::try_field_for_angle_hard_edge(&m, pi_2, 1.0).is_ok());
                    assert!(
                        optics::try_motion_from_dipole(Species::PROTON, 1.0, 1.0, pi_2).is_ok()
                    );
                    assert_eq!(
                        optics::try_motion_from_dipole(Species::PROTON, 1.0, 1.0, 1.6).err(),
                        Some(Error::AngleOutOfRange)
                    );
                }
            }
        };
    }

    sharper_edges!(f32, edges_f32);
    sharper_edges!(f64, edges_f64);
}
