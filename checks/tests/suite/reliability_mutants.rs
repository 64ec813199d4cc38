//! Sharper tests written to kill the mutants that cargo-mutants (`ci/mutants`) found surviving:
//! each test pins a result that a wrong operator or a constant return would change. Written once
//! for f32 and f64; the values are exact in both precisions (small integers and powers of two).
#![allow(clippy::float_cmp)]

use fourforce::{Species, ThreeVector};

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

            #[test]
            fn charge_over_rest_energy_is_a_quotient() {
                let s = Species::<$t>::try_new(4.0, -2.0).unwrap();
                assert_eq!(s.charge_over_rest_energy(), -0.5);
            }
        }
    };
}

sharper!(f32);
sharper!(f64);

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

macro_rules! sharper_beamline {
    ($t:ident, $name:ident) => {
        /// A drift moves both planes: `y += L y'` as `x += L x'` (straight-line geometry). The
        /// values are exact in both precisions (powers of two).
        #[test]
        fn $name() {
            use fourforce::beamline::{BeamState, Element};
            let m =
                fourforce::Motion::try_from_kinetic_energy(Species::<$t>::PROTON, 1.0e6).unwrap();
            let start = BeamState::try_new(m, 0.25, 0.5, 0.125, 0.0625, 0.0).unwrap();
            let end = Element::Drift { length_m: 2.0 }.try_apply(&start).unwrap();
            assert_eq!((end.x(), end.x_slope()), (1.25, 0.5));
            assert_eq!((end.y(), end.y_slope()), (0.25, 0.0625));
        }
    };
}

sharper_beamline!(f32, drift_moves_both_planes_f32);
sharper_beamline!(f64, drift_moves_both_planes_f64);

macro_rules! sharper_gain {
    ($t:ident, $name:ident) => {
        /// The gain of a line of gaps is a compensated sum: its carry (the rounding error of the
        /// running sum) is added back when the kinetic energy is read. A proton from rest through
        /// +1 V, then +0.375 eps V: the running sum stays 1 and the carry holds 0.375 eps, so the
        /// energy reads `1 + 0.375 eps`, which rounds to 1; with the carry subtracted instead it
        /// would read `1 − 0.375 eps`, which rounds to the float below 1.
        #[test]
        fn $name() {
            use fourforce::beamline::{BeamState, Element};
            let rest =
                fourforce::Motion::try_from_kinetic_energy(Species::<$t>::PROTON, 0.0).unwrap();
            let small = 0.375 * <$t>::EPSILON;
            let s = Element::AcceleratingGap { voltage_v: 1.0 }
                .try_apply(&BeamState::on_axis(rest))
                .unwrap();
            let s = Element::AcceleratingGap { voltage_v: small }
                .try_apply(&s)
                .unwrap();
            assert_eq!(s.kinetic_energy(), 1.0);
            assert_eq!(s.energy_gain(), 1.0);
        }
    };
}

sharper_gain!(f32, gap_gain_carry_is_added_f32);
sharper_gain!(f64, gap_gain_carry_is_added_f64);

/// Survivors of the full run of 2026-12-02 (`ci/mutants`), one test per mutant or group.
macro_rules! sharper_edges {
    ($t:ident, $name:ident) => {
        mod $name {
            use super::*;
            use fourforce::{Boost, Error, FourVector};

            /// `γ > limit` refuses, `γ = limit` does not (`Boost::gamma_limit` is inclusive).
            #[test]
            fn boost_at_the_gamma_limit_is_accepted() {
                let limit = Boost::<$t>::gamma_limit();
                let at = FourVector::new(limit, limit, 0.0, 0.0);
                assert_eq!(
                    Boost::try_from_four_velocity(at).map(|b| b.gamma()),
                    Ok(limit)
                );
                let above = FourVector::new(limit, 2.0 * limit, 0.0, 0.0);
                assert_eq!(Boost::try_from_four_velocity(above), Err(Error::Overflow));
            }

            /// Each non-finite input is refused on its own, and `u⁰ = 0` reads as +∞.
            #[test]
            fn four_velocity_edges() {
                let pc = ThreeVector::new(1.0, 0.0, 0.0);
                assert_eq!(Species::try_new(<$t>::INFINITY, 1.0), Err(Error::NonFinite));
                assert!(FourVector::try_four_velocity_from_momentum(Species::PROTON, pc).is_ok());
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
                assert!(optics::try_motion_from_dipole(Species::PROTON, 1.0, 1.0, pi_2).is_ok());
                assert_eq!(
                    optics::try_motion_from_dipole(Species::PROTON, 1.0, 1.0, 1.6).err(),
                    Some(Error::AngleOutOfRange)
                );
            }

            /// The beam line's accessors and the window's bookkeeping say what they hold.
            #[test]
            fn containers_report_their_contents() {
                use fourforce::beamline::{BeamLine, Element};
                use fourforce::check::MovingWindow;
                let mut line = BeamLine::<$t, 3>::new();
                assert!(line.is_empty());
                assert_eq!(line.capacity(), 3);
                line.try_push(Element::Drift { length_m: 1.0 }).unwrap();
                assert!(!line.is_empty());
                let mut w = MovingWindow::<$t, 2>::new();
                assert!(w.is_empty() && !w.is_full());
                w.try_push(1.0).unwrap();
                assert!(!w.is_empty() && !w.is_full());
                w.try_push(2.0).unwrap();
                assert!(!w.is_empty() && w.is_full());
                w.clear();
                assert!(w.is_empty() && !w.is_full() && w.len() == 0);
                assert_eq!(w.try_mean(), Err(Error::Empty));
            }

            /// The energy window: its bounds, its ordering rule, and a reading of exactly 0 eV
            /// (possible: a particle at rest), with the deviation each verdict carries.
            #[test]
            fn energy_window_bounds_and_verdicts() {
                use fourforce::check::{EnergyWindow, Verdict};
                let p = Species::<$t>::PROTON;
                let w = EnergyWindow::try_around(p, 100.0, 0.25).unwrap();
                assert_eq!((w.low(), w.nominal(), w.high()), (75.0, 100.0, 125.0));
                assert_eq!(
                    EnergyWindow::try_new(p, 3.0, 2.0, 4.0),
                    Err(Error::InvalidRange)
                );
                assert_eq!(
                    EnergyWindow::try_new(p, 1.0, 5.0, 4.0),
                    Err(Error::InvalidRange)
                );
                let from_zero = EnergyWindow::try_new(p, 0.0, 1.0, 2.0).unwrap();
                assert_eq!(
                    from_zero.check_kinetic_energy(0.0),
                    Verdict::Inside {
                        kinetic_energy_ev: 0.0,
                        deviation: -1.0
                    }
                );
                assert_eq!(from_zero.check_kinetic_energy(0.0).deviation(), Some(-1.0));
                assert_eq!(from_zero.check_kinetic_energy(4.0).deviation(), Some(3.0));
                assert_eq!(from_zero.check_kinetic_energy(-1.0).deviation(), None);
            }

            /// A gap that brings the particle exactly to rest is allowed; one that would leave
            /// too little momentum for the slopes it carries is refused.
            #[test]
            fn gap_to_rest_and_gap_too_strong_for_the_slopes() {
                use fourforce::Motion;
                use fourforce::beamline::{BeamState, Element};
                let m = Motion::try_from_kinetic_energy(Species::<$t>::PROTON, 1.0e6).unwrap();
                let stop = Element::AcceleratingGap { voltage_v: -1.0e6 };
                let rest = stop.try_apply(&BeamState::on_axis(m)).unwrap();
                assert_eq!(rest.kinetic_energy(), 0.0);
                let steep = BeamState::try_new(m, 0.0, 1.0, 0.0, 0.0, 0.0).unwrap();
                let brake = Element::AcceleratingGap { voltage_v: -0.9e6 };
                assert_eq!(brake.try_apply(&steep), Err(Error::AngleOutOfRange));
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

/// The low part of the two-part c (`C_LO` = 10 m/s in f32) where it decides the result: a speed
/// 458 m/s below c, and a field 1e-6 from null. References: Python `decimal` at 50 digits, from
/// c = 299 792 458 m/s exact (CODATA 2018); the invariant is the one of
/// shared/reference/published-checks.md §6 (9.940 205 097e-7 T²).
#[test]
fn f32_results_near_c_use_the_low_part_of_c() {
    use fourforce::{FieldTensor, FourVector};
    let u =
        FourVector::try_four_velocity_from_velocity(ThreeVector::new(299_792_000.0_f32, 0.0, 0.0))
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

/// The beam state's time and energy gain are compensated sums: after 4096 equal drifts or gaps
/// in f32 they equal the exactly rounded total (N·τ and N·δ are exact in f64).
#[test]
fn f32_beam_state_sums_are_compensated() {
    use fourforce::Motion;
    use fourforce::beamline::{BeamState, Element};
    let m = Motion::try_from_kinetic_energy(Species::<f32>::PROTON, 1.0e6).unwrap();
    let drift = Element::Drift { length_m: 0.1 };
    let gap = Element::AcceleratingGap { voltage_v: 0.1 };
    let tau = f64::from(drift.try_apply(&BeamState::on_axis(m)).unwrap().time());
    let delta = f64::from(0.1_f32);
    let (mut s, mut g) = (BeamState::on_axis(m), BeamState::on_axis(m));
    for _ in 0..4096 {
        s = drift.try_apply(&s).unwrap();
        g = gap.try_apply(&g).unwrap();
    }
    assert_eq!(s.time(), (4096.0 * tau) as f32);
    assert_eq!(g.energy_gain(), (4096.0 * delta) as f32);
    assert_eq!(g.kinetic_energy(), (1.0e6 + 4096.0 * delta) as f32);
}

/// Every N readings the moving window recomputes its sums from the values it holds, so after
/// each full cycle its statistics are exactly those of a fresh window fed the same N values,
/// however long it has run.
#[test]
fn moving_window_resynchronises_every_cycle() {
    use fourforce::check::MovingWindow;
    const N: usize = 5;
    let reading = |i: u32| 1.0e4_f32 + ((i * 7919) % 1000) as f32 * 0.37;
    let mut long = MovingWindow::<f32, N>::new();
    for i in 0..(7 * N as u32) {
        long.try_push(reading(i)).unwrap();
        if (i as usize + 1) % N == 0 {
            let mut fresh = MovingWindow::<f32, N>::new();
            for j in (i + 1 - N as u32)..=i {
                fresh.try_push(reading(j)).unwrap();
            }
            assert_eq!(
                long.try_mean(),
                fresh.try_mean(),
                "after {} readings",
                i + 1
            );
            assert_eq!(
                long.try_spread(),
                fresh.try_spread(),
                "after {} readings",
                i + 1
            );
        }
    }
}

/// Pushers and their particle: each input refused on its own, the velocity, the compensated
/// time, the overflow of a half step, and the factors' own edges.
macro_rules! sharper_push {
    ($t:ident, $name:ident) => {
        mod $name {
            use super::*;
            use fourforce::Error;
            use fourforce::FieldTensor;
            use fourforce::push::{Boris, Particle, Pusher, StepFactors};

            #[test]
            fn particle_refuses_each_non_finite_part() {
                let (z, nan) = (ThreeVector::<$t>::ZERO, <$t>::NAN);
                let bad = ThreeVector::new(nan, 0.0, 0.0);
                assert_eq!(Particle::try_new(bad, z, 0.0), Err(Error::NonFinite));
                assert_eq!(Particle::try_new(z, bad, 0.0), Err(Error::NonFinite));
                assert_eq!(Particle::try_new(z, z, nan), Err(Error::NonFinite));
            }

            #[test]
            fn beta_is_beta_gamma_over_gamma() {
                let u = ThreeVector::new(0.75, 0.0, 0.0);
                let p = Particle::<$t>::try_new(ThreeVector::ZERO, u, 0.0).unwrap();
                assert_eq!(p.gamma(), 1.25);
                assert!((p.beta().x - 0.6).abs() <= <$t>::EPSILON);
            }

            /// |u| = √MAX/2 fits (|u|² = MAX/4), a half step that triples it does not.
            #[test]
            fn half_step_whose_gamma_overflows_is_refused() {
                let big = <$t>::MAX.sqrt() * 0.5;
                let pusher = Boris::try_new(Species::<$t>::PROTON, 1.0).unwrap();
                let u = ThreeVector::new(big, 0.0, 0.0);
                let p = Particle::try_new(ThreeVector::ZERO, u, 0.0).unwrap();
                // A half step adds ε = kick·E = 2 big.
                let e = 2.0 * big / pusher.factors().kick();
                // (beyond FieldTensor::limit: built unchecked, as a field source may return it)
                let field =
                    FieldTensor::from_scaled(ThreeVector::new(e, 0.0, 0.0), ThreeVector::ZERO);
                assert_eq!(
                    pusher.try_synchronised_beta_gamma(&p, &field),
                    Err(Error::Overflow)
                );
            }

            #[test]
            fn step_factors_edges() {
                // The shortest step: c Δt > Δt is not 0; the kick underflows to 0 (a step that
                // changes nothing, allowed).
                let tiny = <$t>::MIN_POSITIVE * <$t>::EPSILON;
                let f = StepFactors::try_new(Species::<$t>::PROTON, tiny).unwrap();
                assert!(f.c_dt() > 0.0 && f.kick() == 0.0 && f.rotation() == 0.0);
                // Δt = 1 s, m = 1 eV and Q = 4 MAX/c²: kick = Q c Δt/2m = 2 MAX/c fits,
                // rotation = kick·c = 2 MAX does not.
                let c: $t = 299_792_458.0;
                let q = 4.0 * (<$t>::MAX / c / c);
                let s = Species::try_new(1.0, q).unwrap();
                assert_eq!(StepFactors::try_new(s, 1.0), Err(Error::Overflow));
                assert!(StepFactors::try_new(s, 1.0e-20).is_ok());
            }

            #[test]
            fn steering_limits_of_zero_are_allowed_and_negative_ones_refused() {
                use fourforce::steer::SteeringSetup;
                assert!(SteeringSetup::<$t>::try_new(1.0, 0.5, 0.0, 0.0).is_ok());
                assert_eq!(
                    SteeringSetup::<$t>::try_new(1.0, 0.5, 1.0, -1.0).err(),
                    Some(Error::NegativeMagnitude)
                );
                assert_eq!(
                    SteeringSetup::<$t>::try_new(1.0, 0.5, -1.0, 1.0).err(),
                    Some(Error::NegativeMagnitude)
                );
            }

            /// A small correction within the rate limit is not reported as rate-limited.
            #[test]
            fn small_steering_change_is_not_rate_limited() {
                use fourforce::Motion;
                use fourforce::steer::SteeringSetup;
                let setup = SteeringSetup::<$t>::try_new(1.0, 0.5, 1.0, 1.0).unwrap();
                let p = Motion::try_from_kinetic_energy(Species::PROTON, 10.0e6).unwrap();
                let cmd = setup.try_next_setting(&p, 1.0e-3, 0.0, 0.0).unwrap();
                assert!(!cmd.rate_limited() && !cmd.saturated());
                assert!(cmd.setting() != 0.0);
            }

            /// A trend exactly at the threshold is steady; a threshold of 0 is allowed.
            #[test]
            fn trend_thresholds_are_inclusive() {
                use fourforce::check::{MovingWindow, Trend};
                let mut up = MovingWindow::<$t, 4>::new();
                let mut down = MovingWindow::<$t, 4>::new();
                for x in [1.0, 2.0, 3.0, 4.0] {
                    up.try_push(x).unwrap();
                    down.try_push(-x).unwrap();
                }
                let d = up.try_drift().unwrap();
                assert!(d > 0.0);
                assert_eq!(down.try_drift(), Ok(-d));
                assert_eq!(up.try_trend(d), Ok(Trend::Steady));
                assert_eq!(up.try_trend(d * 0.5), Ok(Trend::Rising));
                assert_eq!(down.try_trend(d), Ok(Trend::Steady));
                assert_eq!(down.try_trend(d * 0.5), Ok(Trend::Falling));
                assert_eq!(up.try_trend(0.0), Ok(Trend::Rising));
                let mut flat = MovingWindow::<$t, 4>::new();
                for _ in 0..4 {
                    flat.try_push(7.0).unwrap();
                }
                assert_eq!(flat.try_trend(0.0), Ok(Trend::Steady));
            }
        }
    };
}

sharper_push!(f32, push_f32);
sharper_push!(f64, push_f64);

/// The slope subtracts the mean before it multiplies: readings 1e7 + (0, 2, 4, 6) in f32 give a
/// slope of exactly 2 (every intermediate exact), where adding the mean would round at 2e7.
#[test]
fn f32_slope_of_offset_readings_is_exact() {
    use fourforce::check::MovingWindow;
    let mut w = MovingWindow::<f32, 4>::new();
    for x in [0.0, 2.0, 4.0, 6.0] {
        w.try_push(1.0e7 + x).unwrap();
    }
    assert_eq!(w.try_slope(), Ok(2.0));
}

/// c Δt in f32 over 20 000 steps Δt: worst 0.77 eps against the exact product (Δt·c is exact in
/// f64); the low part of c (10 m/s) is what keeps it below 1.
#[test]
fn f32_light_path_of_a_step_within_its_measured_bound() {
    use fourforce::push::StepFactors;
    let mut worst = 0.0_f64;
    for k in 1..20_000_u32 {
        let dt = (f64::from(k) * 1.37e-12) as f32;
        let f = StepFactors::try_new(Species::<f32>::PROTON, dt).unwrap();
        let exact = f64::from(dt) * 299_792_458.0;
        worst = worst.max((f64::from(f.c_dt()) / exact - 1.0).abs() / f64::from(f32::EPSILON));
    }
    assert!(worst <= 0.8, "c Δt: {worst} eps");
}

/// A particle's time is a compensated sum: 3000 steps of 1 ns in f32 end at the rounded exact
/// total (3000 times the f32 value of 1e-9 is exact in f64).
#[test]
fn f32_particle_time_is_a_compensated_sum() {
    use fourforce::FieldTensor;
    use fourforce::push::{Boris, Particle, Pusher};
    let pusher = Boris::try_new(Species::<f32>::ELECTRON, 1.0e-9).unwrap();
    let mut p = Particle::at_rest(ThreeVector::ZERO);
    pusher.try_run(&mut p, &FieldTensor::ZERO, 3000).unwrap();
    assert_eq!(p.time(), (3000.0 * f64::from(1.0e-9_f32)) as f32);
}

/// In a pure B field each scheme turns u⊥ by exactly 2·atan(|τ|/γ̃) per step, the rotation of the
/// published update equations with t = τ/γ̃: γ̃ = γ for Boris and Vay, and for Higuera-Cary the γ of
/// the mean momentum, γ̃² = 1 + u∥² + u⊥² cos²(θ/2) (solved here by fixed-point iteration). A
/// momentum with a component along B (u = (1, 0, 1), γ = √3) checks that the implicit γ of Vay and
/// Higuera-Cary counts (u·τ)².
#[test]
fn pure_b_step_turns_by_the_discrete_angle_with_a_parallel_component() {
    use fourforce::FieldTensor;
    use fourforce::push::{Boris, HigueraCary, Pusher, StepFactors, Vay};
    let f = StepFactors::try_new(Species::<f64>::PROTON, 1.0e-9).unwrap();
    let b = 0.5 / f.rotation(); // τ = 0.5
    let field =
        FieldTensor::try_from_fields(ThreeVector::ZERO, ThreeVector::new(0.0, 0.0, b)).unwrap();
    let u = ThreeVector::new(1.0, 0.0, 1.0);
    let gamma = 3.0_f64.sqrt();
    let turned = |(v, g): (ThreeVector<f64>, f64)| {
        assert!((g - gamma).abs() < 1e-15 && (v.z - 1.0).abs() < 1e-15);
        v.y.atan2(v.x).abs()
    };
    let boris_vay = 2.0 * (0.5 / gamma).atan();
    let mut higuera_cary = boris_vay;
    for _ in 0..200 {
        let mean_gamma = (2.0 + (higuera_cary / 2.0).cos().powi(2)).sqrt();
        higuera_cary = 2.0 * (0.5 / mean_gamma).atan();
    }
    for (got, want) in [
        (
            turned(Boris::from_factors(f).push_beta_gamma(u, gamma, &field)),
            boris_vay,
        ),
        (
            turned(Vay::from_factors(f).push_beta_gamma(u, gamma, &field)),
            boris_vay,
        ),
        (
            turned(HigueraCary::from_factors(f).push_beta_gamma(u, gamma, &field)),
            higuera_cary,
        ),
    ] {
        assert!((got - want).abs() < 1e-14, "turned {got}, want {want}");
    }
}
