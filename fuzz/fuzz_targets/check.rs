//! Door: the plausibility checks from outside numbers (`EnergyWindow::try_new`, `try_around`,
//! the four `check_*` verdicts, `MovingWindow::try_push`, mean, spread, slope, drift, trend).
#![no_main]

use fourforce::check::{EnergyWindow, MovingWindow, Trend, Verdict};
use fourforce::{Error, Motion, Species};
use fuzzkit::{Bits, Input, both_precisions};
use libfuzzer_sys::fuzz_target;

const N: usize = 5;

#[track_caller]
fn check_verdict<T: Bits>(w: &EnergyWindow<T>, v: Verdict<T>, allowed: &[Error]) {
    match v {
        Verdict::Impossible(e) => assert!(allowed.contains(&e), "impossible with {e:?}"),
        Verdict::Inside {
            kinetic_energy_ev: t,
            deviation,
        }
        | Verdict::Low {
            kinetic_energy_ev: t,
            deviation,
        }
        | Verdict::High {
            kinetic_energy_ev: t,
            deviation,
        } => {
            assert!(t.is_finite() && t >= T::ZERO, "verdict energy {t:?}");
            assert!(
                deviation.is_finite(),
                "deviation {deviation:?} for T {t:?} in {w:?}"
            );
            let (lo, hi) = (w.low(), w.high());
            match v {
                Verdict::Inside { .. } => assert!(lo <= t && t <= hi),
                Verdict::Low { .. } => assert!(t < lo),
                _ => assert!(t > hi),
            }
        }
    }
}

fn run<T: Bits>(input: &mut Input<'_>) {
    let selector = input.u8();
    let species = match selector % 4 {
        0 => Species::ELECTRON,
        1 => Species::PROTON,
        2 => Species::NEUTRON,
        _ => match Species::try_new(input.real::<T>(), input.real::<T>()) {
            Ok(s) => s,
            Err(_) => return,
        },
    };
    let (a, b, c) = (input.real::<T>(), input.real::<T>(), input.real::<T>());
    let window = if selector & 4 == 0 {
        let r = EnergyWindow::try_new(species, a, b, c);
        let valid = a.is_finite()
            && b.is_finite()
            && c.is_finite()
            && a >= T::ZERO
            && a <= b
            && b <= c
            && b > T::ZERO;
        match r {
            Ok(w) => {
                assert!(valid, "window ({a:?}, {b:?}, {c:?}) accepted");
                w
            }
            Err(e) => {
                assert!(!valid, "window ({a:?}, {b:?}, {c:?}) refused with {e:?}");
                assert!(matches!(
                    e,
                    Error::NonFinite | Error::NegativeEnergy | Error::InvalidRange
                ));
                return;
            }
        }
    } else {
        match EnergyWindow::try_around(species, a, b) {
            Ok(w) => {
                assert!(
                    a.is_finite() && a > T::ZERO && b >= T::ZERO && b <= T::ONE,
                    "around ({a:?}, {b:?})"
                );
                assert!(w.low() <= w.nominal() && w.nominal() <= w.high() && w.high().is_finite());
                w
            }
            Err(e) => {
                let valid =
                    a.is_finite() && a > T::ZERO && b.is_finite() && b >= T::ZERO && b <= T::ONE;
                // (within an ulp of MAX: the rounding of nominal (1 + tol) decides)
                let overflow =
                    a.to_f64() * (1.0 + b.to_f64()) > T::MAX.to_f64() * (1.0 - T::EPSILON.to_f64());
                let overflow_error = e == Error::Overflow;
                assert!(
                    !valid || (overflow && overflow_error),
                    "around ({a:?}, {b:?}) refused with {e:?}"
                );
                return;
            }
        }
    };
    let (d, e, f) = (input.real::<T>(), input.real::<T>(), input.real::<T>());
    check_verdict(
        &window,
        window.check_kinetic_energy(d),
        &[Error::NonFinite, Error::NegativeEnergy],
    );
    if d.is_finite() && d >= T::ZERO {
        assert!(!matches!(
            window.check_kinetic_energy(d),
            Verdict::Impossible(_)
        ));
    }
    if let Ok(m) = Motion::try_from_kinetic_energy(species, d.abs()) {
        check_verdict(&window, window.check_motion(&m), &[]);
    }
    check_verdict(
        &window,
        window.check_flight_time(e, f),
        &[
            Error::NonFinite,
            Error::NonPositiveLength,
            Error::FasterThanLight,
            Error::Overflow,
        ],
    );
    check_verdict(
        &window,
        window.check_centring_field(e, f),
        &[
            Error::NonFinite,
            Error::NonPositiveLength,
            Error::ZeroField,
            Error::ZeroCharge,
            Error::Overflow,
            Error::NegativeMagnitude,
        ],
    );

    // The moving window: pushes refuse non-finite readings and leave the window unchanged;
    // statistics of finite readings are finite where the readings' spread fits the precision.
    let mut mw = MovingWindow::<T, N>::new();
    let pushes = input.u8() % 12;
    let mut held: Vec<f64> = Vec::new();
    // The sliding update's rounding is relative to every reading since the last resync, not
    // only to those still held (a step from 8 down to 1e-33 leaves an error of eps·8).
    let mut seen = 0.0_f64;
    for _ in 0..pushes {
        let x = input.real::<T>();
        let before = mw;
        match mw.try_push(x) {
            Ok(()) => {
                assert!(x.is_finite());
                held.push(x.to_f64());
                seen = seen.max(x.to_f64().abs());
                if held.len() > N {
                    held.remove(0);
                }
            }
            Err(err) => {
                assert!(!x.is_finite() && err == Error::NonFinite);
                // (Debug text: a NaN inside, the statistics finding, is not equal to itself.)
                assert_eq!(format!("{mw:?}"), format!("{before:?}"));
            }
        }
        assert_eq!(mw.len(), held.len());
    }
    // Readings whose sums and squared deviations fit: every statistic finite, and close to f64.
    let fits = seen * seen * (N as f64) * 4.0 < T::MAX.to_f64();
    match mw.try_mean() {
        Ok(mean) => {
            assert!(!held.is_empty());
            assert!(mean.is_finite(), "mean {mean:?} of {held:?}");
            if fits {
                // (The reference sum is f64: compared only where it cannot overflow.)
                let want = held.iter().sum::<f64>() / held.len() as f64;
                let tol = 8.0 * T::EPSILON.to_f64() * seen * N as f64 + T::MIN_POSITIVE.to_f64();
                assert!(
                    (mean.to_f64() - want).abs() <= tol,
                    "mean {mean:?} vs {want} of {held:?}"
                );
            }
        }
        Err(err) => assert!(
            (held.is_empty() && err == Error::Empty) || (!fits && err == Error::Overflow),
            "mean refused with {err:?} for {held:?}"
        ),
    }
    match mw.try_spread() {
        Ok(s) => {
            assert!(s.is_finite() && s >= T::ZERO, "spread {s:?} of {held:?}");
        }
        Err(err) => assert!(
            (held.is_empty() && err == Error::Empty) || (!fits && err == Error::Overflow),
            "spread refused with {err:?} for {held:?}"
        ),
    }
    let threshold = input.real::<T>();
    match mw.try_trend(threshold) {
        Ok(trend) => {
            assert!(threshold.is_finite() && threshold >= T::ZERO && held.len() >= 2);
            let drift = mw.try_drift().unwrap();
            assert!(drift.is_finite(), "drift {drift:?} of {held:?}");
            match trend {
                Trend::Rising => assert!(drift > threshold),
                Trend::Falling => assert!(drift < -threshold),
                Trend::Steady => assert!(drift.abs() <= threshold),
            }
        }
        Err(err) => assert!(
            matches!(
                err,
                Error::Empty | Error::NonFinite | Error::NegativeMagnitude
            ) || (!fits && err == Error::Overflow),
            "trend refused with {err:?} for {held:?}"
        ),
    }
}

fuzz_target!(|data: &[u8]| both_precisions!(data, run));
