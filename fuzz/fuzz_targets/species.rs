//! Door: a species from outside numbers (`Species::try_new`, `Species::try_from_atom`).
#![no_main]

use fourforce::{Error, Species};
use fuzzkit::{Bits, Input, both_precisions, refused, within};
use libfuzzer_sys::fuzz_target;

fn run<T: Bits>(input: &mut Input<'_>) {
    let rest = input.real::<T>();
    let charge = input.real::<T>();
    let valid = rest.is_finite() && charge.is_finite() && rest >= T::ONE;
    match Species::try_new(rest, charge) {
        Ok(s) => {
            assert!(valid, "try_new accepted rest={rest:?} charge={charge:?}");
            within(
                "rest energy",
                s.rest_energy(),
                T::MIN_POSITIVE * T::EPSILON,
                T::MAX,
            );
            assert_eq!(s.charge(), charge);
            let _ = s.charge_over_rest_energy();
        }
        Err(e) => {
            assert!(
                !valid,
                "try_new refused rest={rest:?} charge={charge:?} with {e:?}"
            );
            let expected = if !(rest.is_finite() && charge.is_finite()) {
                Error::NonFinite
            } else if rest <= T::ZERO {
                Error::NonPositiveMass
            } else {
                Error::RestEnergyTooSmall
            };
            assert_eq!(e, expected);
        }
    }

    let mass_u = input.real::<T>();
    let removed = input.u32();
    let binding = input.real::<T>();
    let r = Species::try_from_atom(mass_u, removed, binding);
    if !mass_u.is_finite() || !binding.is_finite() {
        refused("try_from_atom", r, &[Error::NonFinite]);
    } else if let Ok(s) = r {
        // Documented: a positive, finite rest energy and charge = electrons removed.
        within(
            "ion rest energy",
            s.rest_energy(),
            T::MIN_POSITIVE * T::EPSILON,
            T::MAX,
        );
        assert_eq!(s.charge(), T::from_u32(removed));
    } else {
        refused(
            "try_from_atom",
            r,
            &[
                Error::NonPositiveMass,
                Error::RestEnergyTooSmall,
                Error::Overflow,
            ],
        );
    }
}

fuzz_target!(|data: &[u8]| both_precisions!(data, run));
