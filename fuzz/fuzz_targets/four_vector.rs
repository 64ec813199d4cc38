//! Door: four-vectors and covectors from outside numbers (`FourVector::try_new`,
//! `Covector::try_new`, the three four-velocity constructors, `four_velocity_deviation`).
#![no_main]

use fourforce::{Covector, Error, FourVector, Species, ThreeVector};
use fuzzkit::{Bits, Input, both_precisions, within};
use libfuzzer_sys::fuzz_target;

fn three<T: Bits>(input: &mut Input<'_>) -> ThreeVector<T> {
    ThreeVector::new(input.real(), input.real(), input.real())
}

/// An accepted four-velocity: finite, `u⁰ ≥ 1`, and normalised to within the documented 8 eps.
#[track_caller]
fn check_four_velocity<T: Bits>(what: &str, u: FourVector<T>) {
    assert!(u.is_finite(), "{what}: {u:?} not finite");
    within("u0", u.time, T::ONE, T::MAX);
    let d = u.four_velocity_deviation();
    assert!(
        d.abs() <= T::from_f64(8.0) * T::EPSILON,
        "{what}: {u:?} deviates by {d:?}"
    );
}

fn run<T: Bits>(input: &mut Input<'_>) {
    match input.u8() % 5 {
        0 => {
            let (t, v) = (input.real::<T>(), three::<T>(input));
            let finite = t.is_finite() && v.is_finite();
            match FourVector::try_new(t, v.x, v.y, v.z) {
                Ok(x) => {
                    assert!(finite);
                    assert_eq!(x.lower().raise(), x);
                    let _ = x.norm_squared();
                }
                Err(e) => {
                    assert!(!finite);
                    assert_eq!(e, Error::NonFinite);
                }
            }
            match Covector::try_new(t, v.x, v.y, v.z) {
                Ok(k) => assert!(finite && k.raise().lower() == k),
                Err(e) => assert!(!finite && e == Error::NonFinite),
            }
        }
        1 => {
            let beta = three::<T>(input);
            match FourVector::try_four_velocity(beta) {
                Ok(u) => {
                    assert!(
                        beta.is_finite() && beta.norm() < T::ONE,
                        "accepted beta {beta:?}"
                    );
                    check_four_velocity("from beta", u);
                }
                Err(e) => {
                    let want = if beta.is_finite() {
                        Error::SpeedNotBelowLight
                    } else {
                        Error::NonFinite
                    };
                    assert_eq!(e, want, "beta {beta:?}");
                }
            }
        }
        2 => {
            let v = three::<T>(input);
            match FourVector::try_four_velocity_from_velocity(v) {
                Ok(u) => {
                    assert!(
                        v.is_finite() && v.norm().to_f64() < 299_792_458.0,
                        "accepted v {v:?}"
                    );
                    check_four_velocity("from velocity", u);
                }
                Err(e) => {
                    let want = if v.is_finite() {
                        Error::SpeedNotBelowLight
                    } else {
                        Error::NonFinite
                    };
                    assert_eq!(e, want, "v {v:?}");
                }
            }
        }
        3 => {
            let (m, q, pc) = (input.real::<T>(), input.real::<T>(), three::<T>(input));
            let Ok(s) = Species::try_new(m, q) else {
                return;
            };
            match FourVector::try_four_velocity_from_momentum(s, pc) {
                Ok(u) => {
                    assert!(pc.is_finite() && m.is_finite() && m > T::ZERO);
                    check_four_velocity("from momentum", u);
                }
                Err(e) => {
                    let want = if !pc.is_finite() || !m.is_finite() {
                        Error::NonFinite
                    } else if m <= T::ZERO {
                        Error::NonPositiveMass
                    } else {
                        Error::Overflow
                    };
                    assert_eq!(e, want, "m {m:?}, pc {pc:?}");
                    if e == Error::Overflow {
                        // Only when |pc|/m truly does not fit.
                        let size = pc.x.abs().max(pc.y.abs()).max(pc.z.abs()).to_f64() / m.to_f64();
                        assert!(size > T::MAX.to_f64() / 4.0, "m {m:?}, pc {pc:?} refused");
                    }
                }
            }
        }
        _ => {
            // The deviation of any four-vector: finite and not negative-infinite, or +inf.
            let u = FourVector::new(input.real::<T>(), input.real(), input.real(), input.real());
            let d = u.four_velocity_deviation();
            assert!(!d.is_nan(), "deviation of {u:?} is NaN");
            if !u.is_finite() || u.time == T::ZERO {
                assert!(d == T::INFINITY);
            }
        }
    }
}

fuzz_target!(|data: &[u8]| both_precisions!(data, run));
