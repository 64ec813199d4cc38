//! Door: the steering step from outside numbers (`SteeringSetup::try_new`,
//! `SteeringSetup::try_next_setting` on a beam of any species and energy).
#![no_main]

use fourforce::steer::SteeringSetup;
use fourforce::{Error, Motion, Species};
use fuzzkit::{Bits, Input, both_precisions};
use libfuzzer_sys::fuzz_target;

fn run<T: Bits>(input: &mut Input<'_>) {
    let (drift, gain, max, rate) = (
        input.real::<T>(),
        input.real::<T>(),
        input.real::<T>(),
        input.real::<T>(),
    );
    let setup = match SteeringSetup::try_new(drift, gain, max, rate) {
        Ok(s) => {
            assert!(drift.is_finite() && drift > T::ZERO);
            assert!(gain > T::ZERO && gain < T::TWO);
            assert!(max.is_finite() && max >= T::ZERO && rate.is_finite() && rate >= T::ZERO);
            s
        }
        Err(e) => {
            let all_finite = [drift, gain, max, rate].iter().all(|x| x.is_finite());
            let want = if !all_finite {
                Error::NonFinite
            } else if drift <= T::ZERO {
                Error::NonPositiveLength
            } else if gain <= T::ZERO || gain >= T::TWO {
                Error::GainOutOfRange
            } else {
                Error::NegativeMagnitude
            };
            assert_eq!(e, want, "setup ({drift:?}, {gain:?}, {max:?}, {rate:?})");
            return;
        }
    };
    let species = match input.u8() % 5 {
        0 => Species::ELECTRON,
        1 => Species::PROTON,
        2 => Species::ALPHA,
        3 => Species::NEUTRON,
        _ => match Species::try_new(input.real::<T>(), input.real::<T>()) {
            Ok(s) => s,
            Err(_) => return,
        },
    };
    let Ok(beam) = Motion::try_from_kinetic_energy(species, input.real::<T>().abs()) else {
        return;
    };
    let (measured, target, current) = (input.real::<T>(), input.real::<T>(), input.real::<T>());
    match setup.try_next_setting(&beam, measured, target, current) {
        Ok(cmd) => {
            assert!(measured.is_finite() && target.is_finite() && current.is_finite());
            assert!(species.charge() != T::ZERO, "a neutral beam was steered");
            let (s, c) = (cmd.setting(), cmd.change());
            assert!(
                s.is_finite() && c.is_finite(),
                "setting {s:?}, change {c:?}"
            );
            assert!(s.abs() <= max, "setting {s:?} beyond ±{max:?}");
            // The change is within the rate limit up to the roundings of `current + change`
            // and `setting − current` (an ulp of the larger, subnormal spacing at least).
            let big = s.abs().max(current.abs()).to_f64();
            let tol = rate.to_f64() * (1.0 + 2.0 * T::EPSILON.to_f64())
                + 2.0 * T::EPSILON.to_f64() * big
                + (T::MIN_POSITIVE * T::EPSILON).to_f64();
            assert!(
                c.abs().to_f64() <= tol || cmd.saturated(),
                "change {c:?} beyond the rate {rate:?}"
            );
            // It moves the beam toward the target: sign(ΔB) = sign(Q) sign(target − measured).
            // (Signs, not a product, which could underflow.)
            let wanted_positive = (target > measured) == (species.charge() > T::ZERO);
            if c != T::ZERO && !cmd.saturated() && target != measured {
                assert!(
                    (c > T::ZERO) == wanted_positive,
                    "change {c:?} away from target ({measured:?} -> {target:?})"
                );
            }
            if measured == target {
                assert!(
                    c == T::ZERO || current.abs() > max,
                    "moved while on target: {cmd:?}"
                );
            }
        }
        Err(e) => {
            let want_finite = measured.is_finite() && target.is_finite() && current.is_finite();
            if !want_finite {
                assert_eq!(e, Error::NonFinite);
            } else if species.charge() == T::ZERO {
                assert_eq!(e, Error::ZeroCharge);
            } else {
                assert_eq!(e, Error::Overflow, "refused with {e:?}");
            }
        }
    }
}

fuzz_target!(|data: &[u8]| both_precisions!(data, run));
