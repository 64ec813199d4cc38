//! Door: the orbit correction from outside numbers (`Response::try_new`, `Monitor::try_new`,
//! `Corrector::try_new`, `Tuning::try_new`, `Orbit::try_new`, a few `Orbit::try_step` with any
//! readings and set points, `Orbit::try_set_response`, `orbit::try_single_step`,
//! `Calibration::try_new`, `try_setting`,
//! `try_drive`) in both precisions: no panic; after a correcting step every set point within its
//! corrector's range (so finite); a failed step leaves the set points alone; a hold moves
//! nothing.
#![no_main]

use fourforce::Error;
use fourforce::orbit::{
    Calibration, Corrector, Monitor, Orbit, Response, State, Tuning, try_single_step,
};
use fuzzkit::{Bits, Input, both_precisions};
use libfuzzer_sys::fuzz_target;

const M: usize = 3;
const C: usize = 4;

/// Bit for bit (a NaN set point stays the same NaN).
fn same<T: Bits>(a: &[T; C], b: &[T; C]) -> bool {
    a.iter()
        .zip(b)
        .all(|(x, y)| x.to_bits_u64() == y.to_bits_u64())
}

fn run<T: Bits>(input: &mut Input<'_>) {
    let mut per_kick = [[[T::ZERO; M]; 2]; C];
    for x in per_kick.as_flattened_mut().as_flattened_mut() {
        *x = input.real::<T>();
    }
    let mut kappa = [T::ZERO; C];
    for k in &mut kappa {
        *k = input.real::<T>();
    }
    let Ok(response) = Response::try_new(per_kick, kappa) else {
        return;
    };
    let Ok(monitor) = Monitor::try_new(
        input.real::<T>(),
        input.real::<T>(),
        input.real::<T>(),
    ) else {
        return;
    };
    let (lo, hi, rate) = (input.real::<T>(), input.real::<T>(), input.real::<T>());
    let corrector = match Corrector::try_new(lo, hi, rate) {
        Ok(c) => c,
        Err(e) => {
            assert!(matches!(
                e,
                Error::NonFinite | Error::InvalidRange | Error::NegativeMagnitude
            ));
            return;
        }
    };
    let Ok(tuning) = Tuning::try_new(input.real::<T>(), input.real::<T>(), input.real::<T>())
    else {
        return;
    };
    let Ok(mut orbit) = Orbit::<T, M, C>::try_new(response, [monitor; M], [corrector; C], tuning)
    else {
        return;
    };
    let mut settings = [T::ZERO; C];
    for s in &mut settings {
        *s = input.real::<T>();
    }
    for _ in 0..(input.u8() % 6) {
        let mut readings = [[T::ZERO; 2]; M];
        for x in readings.as_flattened_mut() {
            *x = input.real::<T>();
        }
        let before = settings;
        match orbit.try_step(&readings, &mut settings) {
            Ok(out) => match out.state() {
                State::Hold { .. } => assert!(same(&settings, &before), "a hold moved a corrector"),
                State::Correcting => {
                    for s in &settings {
                        let inside = *s >= corrector.min() && *s <= corrector.max();
                        assert!(inside, "set point {s:?} outside the range");
                    }
                }
            },
            Err(_) => assert!(
                same(&settings, &before),
                "a failed step changed the set points"
            ),
        }
        if input.u8() % 4 == 0 {
            let mut kappa2 = kappa;
            for k in &mut kappa2 {
                *k *= input.real::<T>();
            }
            if let Ok(r) = Response::try_new(per_kick, kappa2) {
                let before = settings;
                match orbit.try_set_response(&r, &mut settings) {
                    Ok(_) => assert!(settings.iter().all(|s| s.is_finite())),
                    Err(_) => assert!(same(&settings, &before)),
                }
            }
        }
    }
    // the one-corrector closed form: within the range after a correcting step
    let (r, x, s0) = (input.real::<T>(), input.real::<T>(), input.real::<T>());
    if let Ok((s, out)) = try_single_step(&corrector, &tuning, r, x, s0) {
        match out.state() {
            State::Correcting => assert!(s >= corrector.min() && s <= corrector.max(), "{s:?}"),
            State::Hold { .. } => assert!(r == T::ZERO),
        }
    }
    let drive = [input.real::<T>(), input.real::<T>(), input.real::<T>()];
    let setting = [input.real::<T>(), input.real::<T>(), input.real::<T>()];
    if let Ok(cal) = Calibration::try_new(drive, setting) {
        let x = input.real::<T>();
        if let Ok(s) = cal.try_setting(x) {
            assert!(s.is_finite() && s >= setting[0] && s <= setting[2]);
        }
        if let Ok(d) = cal.try_drive(x) {
            assert!(d.is_finite() && d >= drive[0] && d <= drive[2]);
        }
    }
}

fuzz_target!(|data: &[u8]| both_precisions!(data, run));
