//! Door: the state of motion from each quantity (`Motion::try_from_*`, all fourteen
//! constructors), for a named species or one built from raw bits, and every accessor of an
//! accepted state.
#![no_main]

use fourforce::{Error, Motion, Species};
use fuzzkit::{Bits, Input, both_precisions, check_motion, extreme};
use libfuzzer_sys::fuzz_target;

fn species<T: Bits>(input: &mut Input<'_>) -> Option<Species<T>> {
    Some(match input.u8() % 8 {
        0 => Species::ELECTRON,
        1 => Species::PROTON,
        2 => Species::ALPHA,
        3 => Species::ANTIMUON,
        4 => Species::NEUTRON,
        _ => Species::try_new(input.real(), input.real()).ok()?,
    })
}

fn run<T: Bits>(input: &mut Input<'_>) {
    let Some(s) = species::<T>(input) else { return };
    let door = input.u8() % 14;
    let x = input.real::<T>();
    let length = input.real::<T>();
    let m = s.rest_energy();
    let q = s.charge();
    // The input in the units the formulas use (eV, or kg m/s converted to eV).
    let unit = match door {
        1 => 1.0e3,
        2 => 1.0e6,
        3 => 1.0e9,
        9 => 1.871_157_347_061_897e27,
        _ => 1.0,
    };
    let magnitudes = [x.to_f64() * unit, m.to_f64(), q.to_f64(), length.to_f64()];
    let r = match door {
        0 => Motion::try_from_kinetic_energy(s, x),
        1 => Motion::try_from_kinetic_energy_kev(s, x),
        2 => Motion::try_from_kinetic_energy_mev(s, x),
        3 => Motion::try_from_kinetic_energy_gev(s, x),
        4 => Motion::try_from_total_energy(s, x),
        5 => Motion::try_from_gamma(s, x),
        6 => Motion::try_from_beta(s, x),
        7 => Motion::try_from_beta_gamma(s, x),
        8 => Motion::try_from_momentum(s, x),
        9 => Motion::try_from_momentum_si(s, x),
        10 => Motion::try_from_magnetic_rigidity(s, x),
        11 => Motion::try_from_electric_rigidity(s, x),
        12 => Motion::try_from_speed(s, x),
        _ => Motion::try_from_flight_time(s, length, x),
    };
    // What the documentation says each door refuses, in the order it checks.
    let rigidity = door == 10 || door == 11;
    let expected: Option<Error> = if !x.is_finite() || (door == 13 && !length.is_finite()) {
        Some(Error::NonFinite)
    } else if rigidity && q == T::ZERO {
        Some(Error::ZeroCharge)
    } else if door == 13 && (length <= T::ZERO || x <= T::ZERO) {
        Some(Error::NonPositiveLength)
    } else if x < T::ZERO {
        Some(match door {
            0..=3 => Error::NegativeEnergy,
            4 | 5 => Error::BelowRestEnergy,
            _ => Error::NegativeMagnitude,
        })
    } else if (door == 4 && x < m) || (door == 5 && x < T::ONE) {
        Some(Error::BelowRestEnergy)
    } else if door == 6 && x >= T::ONE {
        Some(Error::SpeedNotBelowLight)
    } else {
        None
    };
    match (r, expected) {
        (Ok(state), None) => {
            check_motion(&state, door, x, length);
        }
        (Ok(state), Some(e)) => {
            panic!("door {door}: accepted x = {x:?} (L = {length:?}), expected {e:?}: {state:?}")
        }
        (Err(e), Some(want)) => {
            // A unit conversion that overflows may refuse before the sign is looked at.
            let converted = matches!(door, 1..=3 | 9) && extreme::<T>(&magnitudes);
            let ok = e == want || (converted && e == Error::Overflow);
            assert!(
                ok,
                "door {door}: x = {x:?}, L = {length:?}: {e:?}, expected {want:?}"
            );
        }
        (Err(e), None) => {
            // Refusals the documentation names for valid-looking inputs: a speed at or above
            // c (its f32 value), a flight time faster than light, and Overflow where the
            // numbers are extreme.
            let ok = match e {
                Error::SpeedNotBelowLight => door == 12,
                Error::FasterThanLight => door == 13,
                Error::Overflow => extreme::<T>(&magnitudes),
                _ => false,
            };
            assert!(
                ok,
                "door {door}: refused x = {x:?} (L = {length:?}, m = {m:?}, Q = {q:?}) with {e:?}"
            );
        }
    }
}

fuzz_target!(|data: &[u8]| both_precisions!(data, run));
