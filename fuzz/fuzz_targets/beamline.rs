//! Door: beam-line elements and transport from outside numbers (`Element::try_check`,
//! `BeamLine::try_push`, `BeamState::try_new`, `try_transport`, `states`).
#![no_main]

use fourforce::beamline::{BeamLine, BeamState, Element, KickDirection};
use fourforce::{Error, Motion, Species};
use fuzzkit::{Bits, Input, both_precisions, check_motion, known};
use libfuzzer_sys::fuzz_target;

const CAPACITY: usize = 6;

fn direction<T: Bits>(input: &mut Input<'_>) -> KickDirection<T> {
    match input.u8() % 3 {
        0 => KickDirection::Horizontal,
        1 => KickDirection::Vertical,
        _ => KickDirection::Angle(input.real()),
    }
}

fn element<T: Bits>(input: &mut Input<'_>) -> Element<T> {
    match input.u8() % 5 {
        0 => Element::Drift {
            length_m: input.real(),
        },
        1 => Element::MagneticKick {
            integrated_field_tm: input.real(),
            direction: direction(input),
        },
        2 => Element::HardEdgeDipole {
            field_t: input.real(),
            length_m: input.real(),
        },
        3 => Element::AcceleratingGap {
            voltage_v: input.real(),
        },
        _ => Element::ElectrostaticKick {
            integrated_field_v: input.real(),
            direction: direction(input),
        },
    }
}

/// Whether an element's parameters are possible, by its documentation.
fn possible<T: Bits>(e: &Element<T>) -> bool {
    let dir_ok = |d: &KickDirection<T>| match d {
        KickDirection::Angle(phi) => phi.is_finite(),
        _ => true,
    };
    match e {
        Element::Drift { length_m } => length_m.is_finite() && *length_m >= T::ZERO,
        Element::MagneticKick {
            integrated_field_tm,
            direction,
        } => integrated_field_tm.is_finite() && dir_ok(direction),
        Element::HardEdgeDipole { field_t, length_m } => {
            field_t.is_finite() && length_m.is_finite() && *length_m > T::ZERO
        }
        Element::AcceleratingGap { voltage_v } => voltage_v.is_finite(),
        Element::ElectrostaticKick {
            integrated_field_v,
            direction,
        } => integrated_field_v.is_finite() && dir_ok(direction),
    }
}

#[track_caller]
fn check_state<T: Bits>(s: &BeamState<T>) {
    for (name, v) in [
        ("x", s.x()),
        ("x'", s.x_slope()),
        ("y", s.y()),
        ("y'", s.y_slope()),
        ("t", s.time()),
    ] {
        assert!(v.is_finite(), "{name} = {v:?} in {s:?}");
    }
    assert!(
        s.kinetic_energy().is_finite() && s.energy_gain().is_finite(),
        "{s:?}"
    );
    let m = s.motion();
    if !known::tiny_rest_energy(m.species().rest_energy()) {
        check_motion(&m, 0, m.kinetic_energy(), T::ONE);
    }
}

fn run<T: Bits>(input: &mut Input<'_>) {
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
    if known::tiny_rest_energy(species.rest_energy()) {
        return;
    }
    let Ok(motion) = Motion::try_from_kinetic_energy(species, input.real::<T>().abs()) else {
        return;
    };
    let (x, xs, y, ys, t) = (
        input.real::<T>(),
        input.real::<T>(),
        input.real::<T>(),
        input.real::<T>(),
        input.real::<T>(),
    );
    let start = match BeamState::try_new(motion, x, xs, y, ys, t) {
        Ok(s) => {
            assert!([x, xs, y, ys, t].iter().all(|v| v.is_finite()));
            s
        }
        Err(e) => {
            assert!(!([x, xs, y, ys, t].iter().all(|v| v.is_finite())) && e == Error::NonFinite);
            BeamState::on_axis(motion)
        }
    };
    let mut line = BeamLine::<T, CAPACITY>::new();
    let count = input.u8() % 9;
    for _ in 0..count {
        let e = element::<T>(input);
        let full = line.len() == CAPACITY;
        match line.try_push(e) {
            Ok(()) => assert!(possible(&e) && !full, "pushed {e:?}"),
            Err(err) => {
                if !possible(&e) {
                    assert!(
                        matches!(err, Error::NonFinite | Error::NonPositiveLength),
                        "{e:?}: {err:?}"
                    );
                } else {
                    assert!(
                        full && err == Error::CapacityFull,
                        "{e:?} refused with {err:?}"
                    );
                }
            }
        }
    }
    // Transport: Ok states finite and consistent; errors documented; the three ways agree.
    let result = line.try_transport(start);
    let documented = [
        Error::ZeroCharge,
        Error::AngleOutOfRange,
        Error::BelowRestEnergy,
        Error::Overflow,
        Error::NegativeEnergy,
        Error::NonFinite,
    ];
    match &result {
        Ok(end) => check_state(end),
        Err(e) => assert!(documented.contains(e), "transport refused with {e:?}"),
    }
    let mut last = Ok(start);
    let mut n = 0;
    for item in line.states(start) {
        match item {
            Ok((i, s)) => {
                assert_eq!(i, n);
                check_state(&s);
                last = Ok(s);
                n += 1;
            }
            Err(e) => {
                last = Err(e);
                break;
            }
        }
    }
    assert_eq!(last, result, "states() and try_transport disagree");
    assert!(line.states(start).nth(line.len()).is_none());
    // A single element applied alone agrees with try_check.
    let e = element::<T>(input);
    if let Err(err) = e.try_apply(&start) {
        assert!(
            documented.contains(&err) || err == Error::NonPositiveLength,
            "{e:?}: {err:?}"
        );
        if !possible(&e) {
            assert!(matches!(err, Error::NonFinite | Error::NonPositiveLength));
        }
    } else {
        assert!(possible(&e), "applied the impossible {e:?}");
    }
}

fuzz_target!(|data: &[u8]| both_precisions!(data, run));
