//! Door: first-order transfer maps and envelopes from outside numbers
//! (`TransferMap::try_drift`, `try_quadrupole`, `try_thin_quadrupole`,
//! `try_electrostatic_quadrupole`, `try_sector_dipole`, `try_solenoid`, `try_gap`, `then`,
//! `try_check`, `try_periodic`; `Twiss::try_new`, `Envelope::try_new`, `try_through`, sizes,
//! emittances, `try_twiss_x/y`; `BeamLine::try_map`, `try_map_of`, `envelopes`,
//! `check_aperture` with the linear-optics elements) in both precisions: no panic, every `Ok`
//! finite and in range, every impossible parameter its documented `Err`, and a line's map fails
//! exactly where one of its elements' maps fails (or its product overflows).
#![no_main]

use fourforce::beamline::{Aperture, ApertureVerdict, BeamLine, Element, KickDirection};
use fourforce::transfer::{Envelope, TransferMap, Twiss};
use fourforce::{Error, Motion, Species};
use fuzzkit::{Bits, Input, both_precisions};
use libfuzzer_sys::fuzz_target;

const CAPACITY: usize = 4;

/// A parameter: raw bits (NaN, infinities, subnormals, extremes) or, for one flag byte in two,
/// a modest number `k/16 · 10^e` so that the usual paths are reached as well.
fn param<T: Bits>(input: &mut Input<'_>) -> T {
    let flag = input.u8();
    if flag & 1 == 0 {
        input.real()
    } else {
        let k = f64::from(input.u8() as i8) / 16.0;
        let e = i32::from(flag >> 1) % 16 - 8;
        T::from_f64(k * 10f64.powi(e))
    }
}

fn species<T: Bits>(input: &mut Input<'_>) -> Option<Species<T>> {
    Some(match input.u8() % 6 {
        0 => Species::ELECTRON,
        1 => Species::PROTON,
        2 => Species::ALPHA,
        3 => Species::NEUTRON,
        4 => Species::try_new(param::<T>(input), param::<T>(input)).ok()?,
        _ => Species::try_new(T::PROTON_REST_ENERGY, T::NEG_ONE).ok()?,
    })
}

#[track_caller]
fn check_map<T: Bits>(what: &str, m: &TransferMap<T>) {
    let a = m.to_array();
    for (i, row) in a.iter().enumerate() {
        for (j, v) in row.iter().enumerate() {
            assert!(
                v.is_finite(),
                "{what}: R{}{} = {v:?} in {m:?}",
                i + 1,
                j + 1
            );
        }
    }
    assert_eq!(a[4][4], T::ONE, "{what}: R55");
    assert!(a[5][5] > T::ZERO, "{what}: R66 = {:?}", a[5][5]);
    assert_eq!(m.try_check(), Ok(*m), "{what}");
}

#[track_caller]
fn check_twiss<T: Bits>(what: &str, t: &Twiss<T>) {
    assert!(
        t.beta().is_finite() && t.beta() > T::ZERO,
        "{what}: beta {t:?}"
    );
    assert!(t.alpha().is_finite(), "{what}: alpha {t:?}");
    assert!(
        t.gamma().is_finite() && t.gamma() > T::ZERO,
        "{what}: gamma {:?} of {t:?}",
        t.gamma()
    );
}

#[track_caller]
fn check_envelope<T: Bits>(what: &str, e: &Envelope<T>) {
    for (name, v) in [
        ("size_x", e.size_x()),
        ("size_y", e.size_y()),
        ("emittance_x", e.emittance_x()),
        ("emittance_y", e.emittance_y()),
        ("momentum_spread", e.momentum_spread()),
    ] {
        assert!(
            v.is_finite() && v >= T::ZERO,
            "{what}: {name} = {v:?} in {e:?}"
        );
    }
    assert!(
        e.dispersion().iter().all(|d| d.is_finite()),
        "{what}: {e:?}"
    );
    for (plane, t) in [("twiss_x", e.try_twiss_x()), ("twiss_y", e.try_twiss_y())] {
        match t {
            Ok(t) => check_twiss(plane, &t),
            Err(err) => assert!(
                matches!(err, Error::NonPositiveEmittance | Error::Overflow),
                "{what}: {plane} refused with {err:?}"
            ),
        }
    }
}

/// Which of the documented errors an element constructor may give, and whether the parameters
/// themselves are impossible (then it must refuse).
fn element<T: Bits>(input: &mut Input<'_>) -> Element<T> {
    match input.u8() % 10 {
        0 => Element::Drift {
            length_m: param(input),
        },
        1 => Element::Quadrupole {
            length_m: param(input),
            gradient_t_per_m: param(input),
        },
        2 => Element::ThinQuadrupole {
            integrated_gradient_t: param(input),
        },
        3 => Element::ElectrostaticQuadrupole {
            length_m: param(input),
            voltage_v: param(input),
            aperture_radius_m: param(input),
        },
        4 => Element::SectorDipole {
            length_m: param(input),
            angle_rad: param(input),
            entry_angle_rad: param(input),
            exit_angle_rad: param(input),
        },
        5 => Element::Solenoid {
            length_m: param(input),
            field_t: param(input),
        },
        6 => Element::AcceleratingGap {
            voltage_v: param(input),
        },
        7 => Element::Monitor {
            id: u16::from(input.u8()),
        },
        8 => Element::MagneticKick {
            integrated_field_tm: param(input),
            direction: KickDirection::Vertical,
        },
        _ => Element::HardEdgeDipole {
            field_t: param(input),
            length_m: param(input),
        },
    }
}

/// The element's map and the reference after it, from `Element::try_map`, checked against its
/// `TransferMap` constructor (bit for bit) and the constructor's documentation.
fn constructor<T: Bits>(
    e: &Element<T>,
    r: &Motion<T>,
) -> Result<(TransferMap<T>, Motion<T>), Error> {
    let fin = |xs: &[T]| xs.iter().all(|x| x.is_finite());
    let neutral = r.species().charge() == T::ZERO;
    let half_pi = T::PI * T::HALF;
    // (result, impossible parameters, documented errors)
    let (result, impossible, allowed): (Result<TransferMap<T>, Error>, bool, &[Error]) = match *e {
        Element::Drift { length_m } => (
            TransferMap::try_drift(r, length_m),
            !fin(&[length_m]) || length_m < T::ZERO,
            &[Error::NonFinite, Error::NonPositiveLength, Error::Overflow],
        ),
        Element::Quadrupole {
            length_m,
            gradient_t_per_m,
        } => (
            TransferMap::try_quadrupole(r, length_m, gradient_t_per_m),
            !fin(&[length_m, gradient_t_per_m]) || length_m <= T::ZERO || neutral,
            &[
                Error::NonFinite,
                Error::NonPositiveLength,
                Error::ZeroCharge,
                Error::Overflow,
            ],
        ),
        Element::ThinQuadrupole {
            integrated_gradient_t,
        } => (
            TransferMap::try_thin_quadrupole(r, integrated_gradient_t),
            !fin(&[integrated_gradient_t]) || neutral,
            &[Error::NonFinite, Error::ZeroCharge, Error::Overflow],
        ),
        Element::ElectrostaticQuadrupole {
            length_m,
            voltage_v,
            aperture_radius_m,
        } => (
            TransferMap::try_electrostatic_quadrupole(r, length_m, voltage_v, aperture_radius_m),
            !fin(&[length_m, voltage_v, aperture_radius_m])
                || length_m <= T::ZERO
                || aperture_radius_m <= T::ZERO
                || neutral,
            &[
                Error::NonFinite,
                Error::NonPositiveLength,
                Error::ZeroCharge,
                Error::Overflow,
            ],
        ),
        Element::SectorDipole {
            length_m,
            angle_rad,
            entry_angle_rad,
            exit_angle_rad,
        } => (
            TransferMap::try_sector_dipole(r, length_m, angle_rad, entry_angle_rad, exit_angle_rad),
            !fin(&[length_m, angle_rad, entry_angle_rad, exit_angle_rad])
                || length_m <= T::ZERO
                || entry_angle_rad.abs() >= half_pi
                || exit_angle_rad.abs() >= half_pi,
            &[
                Error::NonFinite,
                Error::NonPositiveLength,
                Error::AngleOutOfRange,
                Error::Overflow,
            ],
        ),
        Element::Solenoid { length_m, field_t } => (
            TransferMap::try_solenoid(r, length_m, field_t),
            !fin(&[length_m, field_t]) || length_m <= T::ZERO || neutral,
            &[
                Error::NonFinite,
                Error::NonPositiveLength,
                Error::ZeroCharge,
                Error::Overflow,
            ],
        ),
        Element::AcceleratingGap { voltage_v } => {
            let result = TransferMap::try_gap(r, voltage_v);
            if let Ok((m, after)) = &result {
                check_map("gap", m);
                let gain = r.species().charge() * voltage_v;
                assert!(
                    after.species() == r.species() && after.kinetic_energy() >= T::ZERO,
                    "gap: {after:?}"
                );
                if gain == T::ZERO {
                    assert_eq!(after, r, "a gap of no gain changed the reference");
                }
            }
            (
                result.map(|(m, _)| m),
                !fin(&[voltage_v]),
                &[Error::NonFinite, Error::BelowRestEnergy, Error::Overflow],
            )
        }
        _ => return e.try_map(r),
    };
    match &result {
        Ok(m) => {
            assert!(!impossible, "accepted the impossible {e:?} at {r:?}");
            check_map("element", m);
        }
        Err(err) => assert!(allowed.contains(err), "{e:?} at {r:?} refused with {err:?}"),
    }
    // The element's own map agrees with its constructor, bit for bit.
    let mapped = e.try_map(r);
    assert_eq!(
        mapped.map(|(m, _)| m),
        result,
        "Element::try_map and the constructor of {e:?} disagree"
    );
    mapped
}

fn run<T: Bits>(input: &mut Input<'_>) {
    let Some(species) = species::<T>(input) else {
        return;
    };
    let Ok(reference) = Motion::try_from_kinetic_energy(species, param::<T>(input).abs()) else {
        return;
    };
    // Elements, each alone; their product.
    let mut line = BeamLine::<T, CAPACITY>::new();
    let mut product: Result<TransferMap<T>, Error> = Ok(TransferMap::IDENTITY);
    let mut r = reference;
    let count = input.u8() as usize % (CAPACITY + 1);
    for _ in 0..count {
        let e = element::<T>(input);
        let map = constructor(&e, &r);
        let pushed = line.try_push(e);
        if pushed.is_err() {
            // refused by try_check: its map is refused as well
            assert!(map.is_err(), "{e:?}: pushed {pushed:?} but mapped");
            continue;
        }
        product = product.and_then(|p| {
            let (m, after) = map?;
            r = after;
            Ok(p.then(&m))
        });
    }
    // The line's map: an element's error where one fails, else Ok or Overflow.
    let whole = line.try_map(&reference);
    match (&product, &whole) {
        (Err(a), Err(b)) => assert_eq!(a, b, "line and elements disagree"),
        (Ok(_), Ok((m, after))) => {
            check_map("line", m);
            assert_eq!(after.kinetic_energy(), r.kinetic_energy());
        }
        (Ok(p), Err(b)) => assert!(
            *b == Error::Overflow && p.try_check().is_err(),
            "line refused with {b:?}, its elements' product {p:?}"
        ),
        (Err(a), Ok(_)) => panic!("an element failed with {a:?}, the line did not"),
    }
    // A sub-range.
    let (i, j) = (input.u8() as usize % 8, input.u8() as usize % 8);
    match line.try_map_of(&reference, i..j) {
        Ok((m, _)) => {
            assert!(i <= j && j <= line.len(), "{i}..{j} of {}", line.len());
            check_map("range", &m);
        }
        Err(Error::OutOfBounds) => assert!(i > j || j > line.len()),
        Err(e) => assert!(
            matches!(
                e,
                Error::NonFinite
                    | Error::NonPositiveLength
                    | Error::ZeroCharge
                    | Error::AngleOutOfRange
                    | Error::BelowRestEnergy
                    | Error::Overflow
            ),
            "range refused with {e:?}"
        ),
    }
    // The periodic solution of the line's map.
    if let Ok((m, _)) = &whole {
        match m.try_periodic() {
            Ok(cell) => {
                check_twiss("periodic x", &cell.x);
                check_twiss("periodic y", &cell.y);
                assert!(cell.dispersion.iter().all(|d| d.is_finite()), "{cell:?}");
                for mu in [cell.phase_advance_x_rad, cell.phase_advance_y_rad] {
                    assert!(
                        mu.is_finite() && mu >= T::ZERO && mu <= T::PI + T::PI,
                        "phase advance {mu:?}"
                    );
                }
                assert!(!m.is_coupled());
            }
            Err(e) => assert!(
                matches!(e, Error::Coupled | Error::Unstable | Error::Overflow),
                "periodic refused with {e:?}"
            ),
        }
    }
    // Twiss and envelopes from outside numbers.
    let (beta, alpha) = (param::<T>(input), param::<T>(input));
    let twiss = match Twiss::try_new(beta, alpha) {
        Ok(t) => {
            assert!(beta.is_finite() && alpha.is_finite() && beta > T::ZERO);
            check_twiss("twiss", &t);
            t
        }
        Err(e) => {
            assert!(
                matches!(
                    e,
                    Error::NonFinite | Error::NonPositiveLength | Error::Overflow
                ),
                "twiss refused with {e:?}"
            );
            assert!(
                e == Error::Overflow || !beta.is_finite() || !alpha.is_finite() || beta <= T::ZERO,
                "twiss ({beta:?}, {alpha:?}) refused with {e:?}"
            );
            return;
        }
    };
    let dispersion = [param::<T>(input), T::ZERO, param::<T>(input), T::ZERO];
    let (ex, ey, spread) = (param::<T>(input), param::<T>(input), param::<T>(input));
    let start = match Envelope::try_new(twiss, twiss, dispersion, ex, ey, spread) {
        Ok(e) => {
            check_envelope("start", &e);
            e
        }
        Err(e) => {
            assert!(
                matches!(
                    e,
                    Error::NonFinite
                        | Error::NonPositiveEmittance
                        | Error::NegativeMagnitude
                        | Error::Overflow
                ),
                "envelope refused with {e:?}"
            );
            return;
        }
    };
    let mut n = 0;
    for step in line.envelopes(&reference, start) {
        match step {
            Ok((index, e, _)) => {
                assert_eq!(index, n);
                check_envelope("envelope", &e);
                n += 1;
            }
            Err(e) => {
                assert!(
                    matches!(
                        e,
                        Error::NonFinite
                            | Error::NonPositiveLength
                            | Error::ZeroCharge
                            | Error::AngleOutOfRange
                            | Error::BelowRestEnergy
                            | Error::Overflow
                    ),
                    "envelopes refused with {e:?}"
                );
                break;
            }
        }
    }
    assert!(n <= line.len());
    if let Ok((m, _)) = &whole {
        if let Ok(after) = start.try_through(m) {
            check_envelope("through the line", &after);
        }
    }
    // Apertures: one per element.
    let (w, h) = (param::<T>(input), param::<T>(input));
    let Ok(pipe) = Aperture::try_new(w, h) else {
        assert!(
            !(w > T::ZERO && h > T::ZERO),
            "aperture ({w:?}, {h:?}) refused"
        );
        return;
    };
    let apertures = [pipe; CAPACITY];
    match line.check_aperture(&reference, start, &apertures[..line.len()]) {
        ApertureVerdict::Fits { worst_fill } => {
            assert!(
                worst_fill.is_finite() && worst_fill >= T::ZERO && worst_fill <= T::ONE,
                "worst fill {worst_fill:?}"
            );
            assert_eq!(n, line.len(), "fits though an envelope failed");
        }
        ApertureVerdict::Exceeds {
            element,
            size_m,
            aperture_m,
            ..
        } => {
            assert!(element < line.len());
            assert!(
                size_m > aperture_m && size_m.is_finite(),
                "exceeds: {size_m:?} vs {aperture_m:?}"
            );
        }
        ApertureVerdict::Impossible(e) => {
            assert!(
                n < line.len(),
                "impossible ({e:?}) though every envelope exists"
            )
        }
    }
    assert_eq!(
        line.check_aperture(&reference, start, &apertures[..0]),
        if line.is_empty() {
            ApertureVerdict::Fits {
                worst_fill: T::ZERO,
            }
        } else {
            ApertureVerdict::Impossible(Error::OutOfBounds)
        }
    );
}

fuzz_target!(|data: &[u8]| both_precisions!(data, run));
