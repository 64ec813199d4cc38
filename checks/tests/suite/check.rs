//! Plausibility checks and the moving window.
//!
//! Reference energies: [mpmath] (mpmath at 50 digits from
//! CODATA 2018). The window statistics are checked against a two-pass computation in f64 (the
//! textbook definition), and their stability against a large offset.
#![allow(clippy::float_cmp)]
// Reference values are typed with all their published digits.
#![allow(clippy::excessive_precision)]

use crate::tolerance::{C, eps, t};
use fourforce::check::{EnergyWindow, MovingWindow, Trend, Verdict};
use fourforce::{Error, Real, Species};
use proptest::prelude::*;

fn flight_time_gives_energy<T: Real>() {
    // alpha 5 MeV: beta = 0.051744192122256112 ([mpmath] from CODATA 2018); 1.5 m baseline.
    let tof = 1.5 / (0.051744192122256112 * C);
    let w = EnergyWindow::try_around(Species::<T>::ALPHA, t(5e6), t(0.01)).unwrap();
    let v = w.check_flight_time(t(1.5), t(tof));
    let e = (v.kinetic_energy().unwrap().to_f64() / 5e6 - 1.0).abs();
    // condition 2 (T ~ 1/t^2) on an input rounded once, plus the formula: 16 eps
    assert!(v.is_inside() && e < 16.0 * eps::<T>(), "{v:?} {e:e}");
    // proton 1 GeV: 3.8120493548822230 ns/m ([mpmath], CODATA 2018); condition gamma^3 beta^2/(gamma - 1) = 6.3
    let w = EnergyWindow::try_around(Species::<T>::PROTON, t(1e9), t(1e-3)).unwrap();
    let v = w.check_flight_time(t(10.0), t(38.120493548822230e-9));
    let e = (v.kinetic_energy().unwrap().to_f64() / 1e9 - 1.0).abs();
    assert!(v.is_inside() && e < 64.0 * eps::<T>(), "{v:?} {e:e}");
    // 2 % slower is Low, 2 % faster is High; the deviation carries the sign
    assert!(
        matches!(w.check_flight_time(t(10.0), t(38.9e-9)), Verdict::Low { deviation, .. } if deviation < T::ZERO)
    );
    assert!(
        matches!(w.check_flight_time(t(10.0), t(37.4e-9)), Verdict::High { deviation, .. } if deviation > T::ZERO)
    );
    // shorter than light needs: 10 m in 33 ns (light: 33.356 ns)
    assert_eq!(
        w.check_flight_time(t(10.0), t(33.0e-9)),
        Verdict::Impossible(Error::FasterThanLight)
    );
    assert_eq!(
        w.check_flight_time(t(10.0), T::ZERO),
        Verdict::Impossible(Error::NonPositiveLength)
    );
    assert_eq!(
        w.check_flight_time(t(f64::NAN), t(1e-6)),
        Verdict::Impossible(Error::NonFinite)
    );
}

fn centring_field_gives_energy<T: Real>() {
    // proton 250 MeV: B rho = 2.4321284387255044 T m ([mpmath] from CODATA 2018); rho = 2 m.
    let w = EnergyWindow::try_around(Species::<T>::PROTON, t(250e6), t(0.002)).unwrap();
    let v = w.check_centring_field(t(2.4321284387255044 / 2.0), t(2.0));
    let e = (v.kinetic_energy().unwrap().to_f64() / 250e6 - 1.0).abs();
    // condition (gamma + 1)/gamma = 1.8 on B and the product: 16 eps
    assert!(v.is_inside() && e < 16.0 * eps::<T>(), "{v:?} {e:e}");
    // a negative field centres the beam the other way: same energy
    assert!(
        w.check_centring_field(t(-2.4321284387255044 / 2.0), t(2.0))
            .is_inside()
    );
    assert!(matches!(
        w.check_centring_field(t(1.1), t(2.0)),
        Verdict::Low { .. }
    ));
    assert_eq!(
        w.check_centring_field(T::ZERO, t(2.0)),
        Verdict::Impossible(Error::ZeroField)
    );
    assert_eq!(
        w.check_centring_field(t(1.0), t(-2.0)),
        Verdict::Impossible(Error::NonPositiveLength)
    );
    let neutral = EnergyWindow::try_around(Species::<T>::NEUTRON, t(1e6), t(0.1)).unwrap();
    assert_eq!(
        neutral.check_centring_field(t(1.0), t(1.0)),
        Verdict::Impossible(Error::ZeroCharge)
    );
}

fn window_edges<T: Real>() {
    let w = EnergyWindow::try_new(Species::<T>::PROTON, t(9e6), t(10e6), t(11e6)).unwrap();
    assert!(w.check_kinetic_energy(t(9e6)).is_inside()); // bounds included
    assert!(w.check_kinetic_energy(t(11e6)).is_inside());
    assert_eq!(
        w.check_kinetic_energy(t(12e6)),
        Verdict::High {
            kinetic_energy_ev: t(12e6),
            deviation: t(0.2)
        }
    );
    assert_eq!(
        w.check_kinetic_energy(t(-1.0)),
        Verdict::Impossible(Error::NegativeEnergy)
    );
    assert_eq!(
        w.check_kinetic_energy(T::INFINITY),
        Verdict::Impossible(Error::NonFinite)
    );
    assert_eq!(
        EnergyWindow::try_new(Species::<T>::PROTON, t(-1.0), t(1.0), t(2.0)),
        Err(Error::NegativeEnergy)
    );
    assert_eq!(
        EnergyWindow::try_new(Species::<T>::PROTON, T::ZERO, T::ZERO, T::ZERO),
        Err(Error::InvalidRange)
    );
    assert_eq!(
        EnergyWindow::try_around(Species::<T>::PROTON, t(1e6), t(1.5)),
        Err(Error::InvalidRange)
    );
}

fn window_is_stable_at_a_large_offset<T: Real>() {
    // Readings 1e4 + k*0.01 pattern: a sum-of-squares formula loses everything in f32
    // (1e8 squared spacing is 8); the two-pass spread (mean first, then Σ(x − x̄)²) keeps it.
    let mut w = MovingWindow::<T, 16>::new();
    let pattern = [0.0, 0.01, -0.01, 0.02, -0.02, 0.0, 0.01, -0.01];
    let mut stored = [0.0_f64; 16];
    for k in 0..100 {
        let x: T = t(1.0e4 + pattern[k % 8]);
        w.try_push(x).unwrap();
        stored[k % 16] = x.to_f64();
    }
    let mean = stored.iter().sum::<f64>() / 16.0;
    let var = stored.iter().map(|x| (x - mean) * (x - mean)).sum::<f64>() / 15.0;
    let spread = w.try_spread().unwrap().to_f64();
    assert!((w.try_mean().unwrap().to_f64() - mean).abs() < 4.0 * eps::<T>() * 1e4);
    eprintln!(
        "spread at offset 1e4, {} digits: relative error {:.1e}",
        T::MANTISSA_DIGITS,
        (spread / var.sqrt() - 1.0).abs()
    );
    // measured 1.2e-8 (f32) and 0 (f64): the deviations from the mean are exact near the mean
    let bar = if T::MANTISSA_DIGITS == 24 {
        1e-5
    } else {
        1e-12
    };
    assert!(
        (spread / var.sqrt() - 1.0).abs() < bar,
        "{spread} vs {}",
        var.sqrt()
    );
    // the textbook one-pass formula (sum x^2 - n mean^2)/(n - 1) in the same precision fails
    let (mut sum, mut sum_sq) = (T::ZERO, T::ZERO);
    for &x in &stored {
        sum += t::<T>(x);
        sum_sq += t::<T>(x) * t::<T>(x);
    }
    let n: T = t(16.0);
    let naive = ((sum_sq - sum * sum / n) / t(15.0))
        .max(T::ZERO)
        .sqrt()
        .to_f64();
    if T::MANTISSA_DIGITS == 24 {
        assert!((naive / var.sqrt() - 1.0).abs() > 0.5, "naive {naive}");
    }
    assert_eq!(w.try_trend(t(0.05)).unwrap(), Trend::Steady);
}

fn trend_is_flagged<T: Real>() {
    let mut w = MovingWindow::<T, 32>::new();
    assert_eq!(w.try_mean(), Err(Error::Empty));
    w.try_push(t(1.0)).unwrap();
    assert_eq!(w.try_slope(), Err(Error::Empty));
    assert_eq!(w.try_spread().unwrap(), T::ZERO);
    w.clear();
    // a slow ramp of 0.002 per reading under a +-0.01 alternating noise
    for k in 0..64 {
        let noise = if k % 2 == 0 { 0.01 } else { -0.01 };
        w.try_push(t(5.0 + 0.002 * f64::from(k) + noise)).unwrap();
    }
    let drift = w.try_drift().unwrap().to_f64();
    // exact fitted drift over the last 32: 31 * 0.002 plus the noise's fit, |.| < 0.003
    assert!((drift - 0.062).abs() < 0.003, "{drift}");
    assert_eq!(w.try_trend(t(0.03)).unwrap(), Trend::Rising);
    assert_eq!(w.try_trend(t(0.1)).unwrap(), Trend::Steady);
    assert_eq!(w.try_trend(t(-1.0)), Err(Error::NegativeMagnitude));
    assert_eq!(w.try_push(T::INFINITY), Err(Error::NonFinite));
    assert_eq!(w.len(), 32);
}

macro_rules! both {
    ($($name:ident),*) => {
        mod f32_checks { $( #[test] fn $name() { super::$name::<f32>(); } )* }
        mod f64_checks { $( #[test] fn $name() { super::$name::<f64>(); } )* }
    };
}

both!(
    flight_time_gives_energy,
    centring_field_gives_energy,
    window_edges,
    window_is_stable_at_a_large_offset,
    trend_is_flagged
);

fn two_pass(xs: &[f64]) -> (f64, f64, f64) {
    let n = xs.len() as f64;
    let mean = xs.iter().sum::<f64>() / n;
    let m2: f64 = xs.iter().map(|x| (x - mean) * (x - mean)).sum();
    let c = (n - 1.0) / 2.0;
    let sxy: f64 = xs
        .iter()
        .enumerate()
        .map(|(i, x)| (i as f64 - c) * (x - mean))
        .sum();
    let sxx: f64 = (0..xs.len()).map(|i| (i as f64 - c).powi(2)).sum();
    (mean, (m2 / (n - 1.0)).sqrt(), sxy / sxx)
}

proptest! {
    // Invariant: after any sequence, the window's statistics are those of its last N values
    // (two-pass definition in f64).
    #[test]
    fn window_matches_its_last_values(xs in prop::collection::vec(-1.0e3_f64..1.0e3, 2..200)) {
        let mut w = MovingWindow::<f64, 12>::new();
        for &x in &xs {
            w.try_push(x).unwrap();
        }
        let tail = &xs[xs.len().saturating_sub(12)..];
        let (mean, spread, slope) = two_pass(tail);
        let scale = tail.iter().fold(1.0_f64, |a, x| a.max(x.abs()));
        prop_assert!((w.try_mean().unwrap() - mean).abs() <= 1e-12 * scale);
        prop_assert!((w.try_spread().unwrap() - spread).abs() <= 1e-9 * scale);
        prop_assert!((w.try_slope().unwrap() - slope).abs() <= 1e-12 * scale);
    }

    #[test]
    fn window_matches_its_last_values_f32(xs in prop::collection::vec(-1.0e3_f32..1.0e3, 2..200)) {
        let mut w = MovingWindow::<f32, 12>::new();
        for &x in &xs {
            w.try_push(x).unwrap();
        }
        let tail: Vec<f64> = xs[xs.len().saturating_sub(12)..].iter().map(|&x| f64::from(x)).collect();
        let (mean, spread, slope) = two_pass(&tail);
        let scale = tail.iter().fold(1.0_f64, |a, x| a.max(x.abs()));
        let e = f64::from(f32::EPSILON);
        prop_assert!((f64::from(w.try_mean().unwrap()) - mean).abs() <= 64.0 * e * scale);
        prop_assert!((f64::from(w.try_spread().unwrap()) - spread).abs() <= 2e-3 * scale);
        prop_assert!((f64::from(w.try_slope().unwrap()) - slope).abs() <= 64.0 * e * scale);
    }

    // A verdict is Inside exactly when the inferred energy lies in the window.
    #[test]
    fn verdict_agrees_with_the_window(t_ev in 0.0_f64..2.0e7) {
        let w = EnergyWindow::try_new(Species::<f64>::PROTON, 9.0e6, 10.0e6, 11.0e6).unwrap();
        let v = w.check_kinetic_energy(t_ev);
        let inside = (9.0e6..=11.0e6).contains(&t_ev);
        prop_assert_eq!(v.is_inside(), inside);
        prop_assert_eq!(v.kinetic_energy(), Some(t_ev));
    }
}

mod regressions {
    //! Regressions: bugs that fuzzing, the f32 sweep and mutation testing found, each with the
    //! input that exposed it.
    #![allow(clippy::float_cmp)]

    use fourforce::Error;
    /// Found by the `check` fuzz target: readings near `f32::MAX` overflowed the window's sums, and
    /// the statistics came back as `Ok`: readings (3e38, 3e38, -3e38, 1, 2) gave mean +inf, spread
    /// +inf, drift NaN and trend `Steady` (a corrupted register read as a steady beam); readings
    /// (-4.2505569e37, 3.5e-43, 0) gave spread +inf. All are `Overflow` now.
    #[test]
    fn window_statistics_that_overflow_are_refused() {
        use fourforce::check::MovingWindow;
        let mut w = MovingWindow::<f32, 5>::new();
        for x in [3.0e38_f32, 3.0e38, -3.0e38, 1.0, 2.0] {
            w.try_push(x).unwrap();
        }
        assert_eq!(w.try_mean(), Err(Error::Overflow));
        assert_eq!(w.try_spread(), Err(Error::Overflow));
        assert_eq!(w.try_drift(), Err(Error::Overflow));
        assert_eq!(w.try_trend(1.0), Err(Error::Overflow));
        let mut w = MovingWindow::<f32, 5>::new();
        for x in [-4.250_557e37_f32, 3.5e-43, 0.0] {
            w.try_push(x).unwrap();
        }
        assert_eq!(w.try_spread(), Err(Error::Overflow));
        // Ordinary readings are untouched.
        let mut w = MovingWindow::<f32, 4>::new();
        for x in [1.0_f32, 2.0, 6.0] {
            w.try_push(x).unwrap();
        }
        assert_eq!(w.try_mean(), Ok(3.0));
    }
    /// Found by the `check` fuzz target: an `EnergyWindow` around a subnormal nominal energy gave
    /// verdicts with a deviation of +inf (f32 nominal 1e-40 eV, reading 1 eV), and
    /// `EnergyWindow::try_around(3e38, 0.5)` said `NonFinite` where `nominal (1 + tol)` overflows.
    #[test]
    fn energy_window_edges_are_finite_or_overflow() {
        use fourforce::Species;
        use fourforce::check::{EnergyWindow, Verdict};
        let w = EnergyWindow::try_new(Species::<f32>::PROTON, 0.0, 1.0e-40, 2.0e-40).unwrap();
        match w.check_kinetic_energy(1.0) {
            Verdict::High { deviation, .. } => assert_eq!(deviation, f32::MAX),
            other => panic!("{other:?}"),
        }
        assert_eq!(
            EnergyWindow::try_around(Species::<f32>::PROTON, 3.0e38, 0.5),
            Err(Error::Overflow)
        );
        assert!(EnergyWindow::try_around(Species::<f32>::PROTON, 2.0e38, 0.5).is_ok());
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
            }
        };
    }

    sharper_edges!(f32, edges_f32);
    sharper_edges!(f64, edges_f64);
    /// The moving window computes its statistics from the values it holds, so after each full
    /// cycle they are exactly those of a fresh window fed the same N values, however long it has
    /// run.
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
}
