//! Door: the beam-line quantities of `optics` (every function), on a state built from outside
//! numbers, with outside fields, lengths, angles and potentials.
#![no_main]

use fourforce::{Error, Motion, Species, optics};
use fuzzkit::{Bits, Input, both_precisions, check_motion};
use libfuzzer_sys::fuzz_target;

fn species<T: Bits>(input: &mut Input<'_>) -> Option<Species<T>> {
    Some(match input.u8() % 8 {
        0 => Species::ELECTRON,
        1 => Species::PROTON,
        2 => Species::ALPHA,
        3 => Species::ANTIPROTON,
        4 => Species::NEUTRON,
        _ => Species::try_new(input.real(), input.real()).ok()?,
    })
}

/// Checks the refusal of a function against what its documentation lists.
#[track_caller]
fn refusal(what: &str, e: Error, allowed: &[Error]) {
    assert!(
        allowed.contains(&e),
        "{what}: refused with {e:?}, documented {allowed:?}"
    );
}

fn run<T: Bits>(input: &mut Input<'_>) {
    let Some(s) = species::<T>(input) else { return };
    let Ok(m) = Motion::try_from_kinetic_energy(s, input.real::<T>().abs()) else {
        return;
    };
    let f = input.u8() % 15;
    let (a, b, c) = (input.real::<T>(), input.real::<T>(), input.real::<T>());
    let charged = s.charge() != T::ZERO;
    let finite_args = a.is_finite() && b.is_finite() && c.is_finite();
    use Error::*;
    match f {
        // Magnitudes: positive and finite when accepted.
        0..=2 => {
            let r = match f {
                0 => optics::try_bending_radius(&m, a),
                1 => optics::try_electric_bending_radius(&m, a),
                _ => optics::try_revolution_frequency(&m, a),
            };
            match r {
                Ok(v) => {
                    assert!(
                        charged && a.is_finite() && a != T::ZERO,
                        "f{f}: accepted field {a:?}"
                    );
                    assert!(
                        v.is_finite() && v >= T::ZERO,
                        "f{f}({a:?}) = {v:?} for {m:?}"
                    );
                }
                Err(e) => {
                    refusal(
                        "magnitude",
                        e,
                        &[ZeroCharge, ZeroField, NonFinite, Overflow],
                    );
                    if e == Overflow {
                        // Only when the quotient truly does not fit.
                        assert!(charged && a.is_finite() && a != T::ZERO);
                    }
                    if !charged {
                        assert!(e == ZeroCharge || e == ZeroField || e == NonFinite);
                    }
                }
            }
        }
        3 => match optics::try_lag_behind_light(&m, a) {
            Ok(v) => {
                assert!(a.is_finite() && a > T::ZERO, "lag accepted length {a:?}");
                assert!(
                    v.is_finite() && v >= T::ZERO,
                    "lag({a:?}) = {v:?} for {m:?}"
                );
            }
            Err(e) => refusal("lag", e, &[NonPositiveLength, NonFinite, Overflow]),
        },
        4 => {
            let Ok(m2) = Motion::try_from_kinetic_energy(s, b.abs()) else {
                return;
            };
            match optics::try_flight_time_difference(&m, &m2, a) {
                Ok(v) => {
                    assert!(a.is_finite() && a > T::ZERO);
                    assert!(v.is_finite(), "difference {v:?}");
                    // Positive when the first state is slower.
                    if m.kinetic_energy() < m2.kinetic_energy() {
                        assert!(v >= T::ZERO, "slower state arrives first: {v:?}");
                    }
                }
                Err(e) => refusal("difference", e, &[NonPositiveLength, NonFinite, Overflow]),
            }
        }
        5 => match optics::try_energy_gain(s, a) {
            Ok(v) => {
                assert!(a.is_finite());
                assert!(v.is_finite(), "try_energy_gain({a:?}) = {v:?}");
            }
            Err(e) => refusal("gain", e, &[NonFinite, Overflow]),
        },
        6 => match optics::try_after_voltage(&m, a) {
            Ok(next) => {
                assert!(a.is_finite());
                check_motion(&next, 0, next.kinetic_energy(), T::ONE);
            }
            Err(e) => refusal("after", e, &[NonFinite, NegativeEnergy, Overflow]),
        },
        7 => match optics::try_kick_angle(&m, a) {
            Ok(v) => {
                assert!(charged && a.is_finite());
                assert!(v.is_finite(), "kick {v:?}");
            }
            Err(e) => refusal("kick", e, &[ZeroCharge, NonFinite, Overflow]),
        },
        8 => match optics::try_kick_angle_hard_edge(&m, a, b) {
            Ok(v) => {
                assert!(charged && a.is_finite() && b.is_finite() && b > T::ZERO);
                within_half_pi(v);
            }
            Err(e) => refusal(
                "hard edge",
                e,
                &[
                    ZeroCharge,
                    NonFinite,
                    NonPositiveLength,
                    AngleOutOfRange,
                    Overflow,
                ],
            ),
        },
        9 => match optics::try_integrated_field_for_angle(&m, a) {
            Ok(v) => {
                assert!(charged && a.is_finite());
                assert!(v.is_finite(), "integrated field {v:?}");
            }
            Err(e) => refusal("integrated field", e, &[ZeroCharge, NonFinite, Overflow]),
        },
        10 => match optics::try_field_for_angle_hard_edge(&m, a, b) {
            Ok(v) => {
                assert!(charged && a.is_finite() && b > T::ZERO && a.abs() <= T::PI * T::HALF);
                assert!(v.is_finite());
            }
            Err(e) => refusal(
                "dipole field",
                e,
                &[
                    ZeroCharge,
                    NonFinite,
                    NonPositiveLength,
                    AngleOutOfRange,
                    Overflow,
                ],
            ),
        },
        11 => match optics::try_electrostatic_kick_angle(&m, a, b) {
            Ok(v) => {
                assert!(charged && a.is_finite() && b > T::ZERO);
                assert!(v.is_finite());
            }
            Err(e) => refusal(
                "deflector angle",
                e,
                &[ZeroCharge, NonFinite, NonPositiveLength, Overflow],
            ),
        },
        12 => match optics::try_deflector_field_for_angle(&m, a, b) {
            Ok(v) => {
                assert!(charged && a.is_finite() && b > T::ZERO);
                assert!(v.is_finite(), "deflector field {v:?}");
            }
            Err(e) => refusal(
                "deflector field",
                e,
                &[ZeroCharge, NonFinite, NonPositiveLength, Overflow],
            ),
        },
        13 => match Motion::try_from_flight_time(s, a, b) {
            Ok(next) => check_motion(&next, 13, b, a),
            Err(e) => refusal(
                "from flight time",
                e,
                &[NonFinite, NonPositiveLength, FasterThanLight, Overflow],
            ),
        },
        _ => match optics::try_motion_from_dipole(s, a, b, c) {
            Ok(next) => {
                assert!(charged && a != T::ZERO && b > T::ZERO && c > T::ZERO);
                check_motion(&next, 10, a, b);
            }
            Err(e) => refusal(
                "from dipole",
                e,
                &[
                    ZeroCharge,
                    ZeroField,
                    NonFinite,
                    NonPositiveLength,
                    AngleOutOfRange,
                    Overflow,
                ],
            ),
        },
    }
    // A non-finite argument the function reads is never accepted (checked above per function);
    // the remaining arguments are unused by some functions.
    let _ = finite_args;
}

#[track_caller]
fn within_half_pi<T: Bits>(v: T) {
    assert!(
        v.is_finite() && v.abs() <= T::PI * T::HALF + T::EPSILON,
        "angle {v:?}"
    );
}

fuzz_target!(|data: &[u8]| both_precisions!(data, run));
