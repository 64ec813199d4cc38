//! The steering step in closed loop against the beam line it models, its limits and its errors.
//!
//! The closed loop uses this crate's beam line (thin corrector + drift, validated against the
//! published rigidities in beamline.rs) as the machine. Convergence as (1 - g)^k for
//! a correct model is the textbook property of a proportional loop on a linear plant (common
//! practice).
#![allow(clippy::float_cmp)]
// Reference values are typed with all their published digits.
#![allow(clippy::excessive_precision)]

use crate::tolerance::t;
use fourforce::beamline::{BeamLine, BeamState, Element, KickDirection};
use fourforce::steer::SteeringSetup;
use fourforce::{Error, Motion, Real, Species};
use proptest::prelude::*;

/// The machine: an incoming offset and slope, a corrector, a drift of `true_drift` to the monitor.
fn monitor_reading<T: Real>(beam: Motion<T>, x0: T, slope0: T, setting: T, true_drift: T) -> T {
    let line = BeamLine::<T, 2>::try_from_elements(&[
        Element::MagneticKick {
            integrated_field_tm: setting,
            direction: KickDirection::Horizontal,
        },
        Element::Drift {
            length_m: true_drift,
        },
    ])
    .unwrap();
    let start = BeamState::try_new(beam, x0, slope0, T::ZERO, T::ZERO, T::ZERO).unwrap();
    line.try_transport(start).unwrap().x()
}

fn converges_geometrically<T: Real>(species: Species<T>, kinetic_ev: f64) {
    let beam = Motion::try_from_kinetic_energy(species, t(kinetic_ev)).unwrap();
    let gain = 0.5;
    let setup = SteeringSetup::try_new(t(2.0), t(gain), t(1.0), t(1.0)).unwrap();
    let (x0, s0, target) = (t::<T>(1.0e-3), t::<T>(0.5e-3), t::<T>(-0.2e-3));
    let mut setting = T::ZERO;
    let first = monitor_reading(beam, x0, s0, setting, t(2.0)) - target;
    for k in 1..=30 {
        let x = monitor_reading(beam, x0, s0, setting, t(2.0));
        setting = setup
            .try_next_setting(&beam, x, target, setting)
            .unwrap()
            .setting();
        let err = (monitor_reading(beam, x0, s0, setting, t(2.0)) - target).to_f64();
        let expected = first.to_f64() * (1.0_f64 - gain).powi(k);
        // (1 - g)^k with the model exact; rounding floor 1e-6 of the 2 mm offset in f32
        let floor = 2e-3 * 64.0 * T::EPSILON.to_f64();
        assert!(
            (err - expected).abs() < 1e-3 * expected.abs() + floor,
            "step {k}: {err:e} vs {expected:e}"
        );
    }
}

fn model_error_still_converges<T: Real>() {
    // the monitor is really 3 m away, the setup believes 2 m: the error shrinks by
    // |1 - g * 3/2| = 0.25 per step with g = 0.5
    let beam = Motion::try_from_kinetic_energy(Species::<T>::PROTON, t(50e6)).unwrap();
    let setup = SteeringSetup::try_new(t(2.0), t(0.5), t(1.0), t(1.0)).unwrap();
    let mut setting = T::ZERO;
    for _ in 0..20 {
        let x = monitor_reading(beam, t(2e-3), T::ZERO, setting, t(3.0));
        setting = setup
            .try_next_setting(&beam, x, T::ZERO, setting)
            .unwrap()
            .setting();
    }
    let x = monitor_reading(beam, t(2e-3), T::ZERO, setting, t(3.0)).to_f64();
    assert!(x.abs() < 2e-3 * 0.25_f64.powi(19), "{x:e}");
}

fn limits_act<T: Real>() {
    let beam = Motion::try_from_kinetic_energy(Species::<T>::PROTON, t(50e6)).unwrap();
    // rate limit 10 uT m per step, range 50 uT m
    let setup = SteeringSetup::try_new(t(2.0), t(1.0), t(50e-6), t(10e-6)).unwrap();
    let cmd = setup
        .try_next_setting(&beam, t(5e-3), T::ZERO, T::ZERO)
        .unwrap();
    assert!(cmd.rate_limited() && !cmd.saturated());
    assert_eq!(cmd.setting(), t(-10e-6));
    let cmd = setup
        .try_next_setting(&beam, t(5e-3), T::ZERO, t(-45e-6))
        .unwrap();
    assert!(cmd.rate_limited() && cmd.saturated());
    assert_eq!(cmd.setting(), t(-50e-6));
    assert_eq!(cmd.change(), t::<T>(-50e-6) - t::<T>(-45e-6));
    // a setting outside the range comes back inside first; on target nothing else moves
    let cmd = setup
        .try_next_setting(&beam, T::ZERO, T::ZERO, t(1.0))
        .unwrap();
    assert_eq!((cmd.setting(), cmd.change()), (t(50e-6), T::ZERO));
    // electrons: the sign flips
    let e = Motion::try_from_kinetic_energy(Species::<T>::ELECTRON, t(1e6)).unwrap();
    let cmd = setup
        .try_next_setting(&e, t(1e-5), T::ZERO, T::ZERO)
        .unwrap();
    assert!(cmd.setting() > T::ZERO);
}

fn bad_inputs_are_typed_errors<T: Real>() {
    assert_eq!(
        SteeringSetup::try_new(t::<T>(1.0), T::ZERO, t(1.0), t(1.0)),
        Err(Error::GainOutOfRange)
    );
    assert_eq!(
        SteeringSetup::try_new(t::<T>(1.0), t(2.0), t(1.0), t(1.0)),
        Err(Error::GainOutOfRange)
    );
    assert_eq!(
        SteeringSetup::try_new(t::<T>(-1.0), t(0.5), t(1.0), t(1.0)),
        Err(Error::NonPositiveLength)
    );
    assert_eq!(
        SteeringSetup::try_new(t::<T>(1.0), t(0.5), t(-1.0), t(1.0)),
        Err(Error::NegativeMagnitude)
    );
    assert_eq!(
        SteeringSetup::try_new(t::<T>(1.0), t(f64::NAN), t(1.0), t(1.0)),
        Err(Error::NonFinite)
    );
    let setup = SteeringSetup::try_new(t(1.0), t(0.5), t(1.0), t(1.0)).unwrap();
    let beam = Motion::try_from_kinetic_energy(Species::<T>::PROTON, t(1e6)).unwrap();
    assert_eq!(
        setup.try_next_setting(&beam, T::INFINITY, T::ZERO, T::ZERO),
        Err(Error::NonFinite)
    );
    let neutral = Motion::try_from_kinetic_energy(Species::<T>::NEUTRON, t(1e6)).unwrap();
    assert_eq!(
        setup.try_next_setting(&neutral, t(1e-3), T::ZERO, T::ZERO),
        Err(Error::ZeroCharge)
    );
}

fn converges_for_three_species<T: Real>() {
    converges_geometrically::<T>(Species::PROTON, 50e6);
    converges_geometrically::<T>(Species::ELECTRON, 5e6);
    converges_geometrically::<T>(Species::ALPHA, 20e6);
}

macro_rules! both {
    ($($name:ident),*) => {
        mod f32_checks { $( #[test] fn $name() { super::$name::<f32>(); } )* }
        mod f64_checks { $( #[test] fn $name() { super::$name::<f64>(); } )* }
    };
}

both!(
    converges_for_three_species,
    model_error_still_converges,
    limits_act,
    bad_inputs_are_typed_errors
);

proptest! {
    // Invariant: whatever the readings, the command respects both limits.
    #[test]
    fn command_respects_limits(
        measured in -1.0_f32..1.0,
        target in -1.0e-2_f32..1.0e-2,
        current in -1.0_f32..1.0,
        max_field in 0.0_f32..1.0e-2,
        max_change in 0.0_f32..1.0e-3,
        gain in 0.01_f32..1.99,
        kinetic in 1.0e3_f32..1.0e10,
    ) {
        let setup = SteeringSetup::try_new(1.5, gain, max_field, max_change).unwrap();
        let beam = Motion::try_from_kinetic_energy(Species::PROTON, kinetic).unwrap();
        let cmd = setup.try_next_setting(&beam, measured, target, current).unwrap();
        prop_assert!(cmd.setting().abs() <= max_field);
        prop_assert!(cmd.change().abs() <= max_change * (1.0 + 2.0 * f32::EPSILON) + max_field * f32::EPSILON);
        prop_assert!(cmd.setting().is_finite() && cmd.change().is_finite());
    }
}

mod mutants {
    //! Sharper tests that kill mutants cargo-mutants found surviving: each pins a result a wrong
    //! operator or a constant return would change; values exact in both precisions.
    #![allow(clippy::float_cmp)]

    use fourforce::Species;
    /// Pushers and their particle: each input refused on its own, the velocity, the compensated
    /// time, the overflow of a half step, and the factors' own edges.
    macro_rules! sharper_push {
        ($t:ident, $name:ident) => {
            mod $name {
                use super::*;
                use fourforce::Error;

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
            }
        };
    }

    sharper_push!(f32, push_f32);
    sharper_push!(f64, push_f64);
}
