//! The worst case of every library function the firmware's control cycle calls, and of the
//! cycle itself, on the emulated chip: one counted interval per call, over adversarial inputs.
//!
//! Inputs: the extremes of `f32` (zeros, the smallest subnormal and normal, 1, the largest value,
//! the infinities, NaN, negatives), the flight time of light over the machine's base and values
//! around it, the 34 readings of the firmware's run, and every `f32` the fuzz targets of these
//! functions would read from the committed fuzz corpus (`fuzz/corpus/{motion,check,orbit,field,
//! push}`, turned into bit patterns by `build.rs`). Error paths are included: an input that is
//! refused is counted like any other.
//!
//! Each call is measured alone (`Bench::worst`, `bench <id> <function> 1 worst`); ci/firmware
//! keeps the largest count per function, prints the table and fails when one grows by more than
//! 3 % over the committed table of docs/performance.md ("Worst case on the Cortex-M4F"). The
//! typical cost of the compensated and the plain Boris step (34 calls on the nominal beam) is
//! measured too.
#![no_std]
#![no_main]

#[allow(dead_code)] // shared by the binaries, each uses a part
#[path = "../board.rs"]
mod board;
#[allow(dead_code)] // the host-side helpers of the control cycle
#[path = "../control.rs"]
mod control;

use board::{Bench, Out};
use control::{LoopState, Machine, NOMINAL_KINETIC_EV, OUTPUTS, Reading};
use core::hint::black_box;
use cortex_m_rt::entry;
use fourforce::check::MovingWindow;
use fourforce::push::{Boris, Particle, Pusher, StepFactors};
use fourforce::{Error, FieldTensor, Motion, Species, ThreeVector};

/// One reading of the firmware's run and its expected result (only the readings are used).
#[allow(dead_code)]
struct Case {
    reading: Reading<f32>,
    expected: Result<[f32; OUTPUTS], Error>,
}

include!(concat!(env!("OUT_DIR"), "/cases.rs"));
include!(concat!(env!("OUT_DIR"), "/fuzz_values.rs"));

/// Extremes of `f32` and a few ordinary values.
const EXTREMES: [f32; 16] = [
    0.0,
    -0.0,
    1.0e-45, // the smallest subnormal
    1.175_494_4e-38,
    1.0e-30,
    1.0e-9,
    1.0,
    -1.0,
    2.5e6,
    1.0e12,
    1.0e30,
    f32::MAX,
    -f32::MAX,
    f32::INFINITY,
    f32::NEG_INFINITY,
    f32::NAN,
];

/// Every input value: the extremes, then the fuzz values.
fn values() -> impl Iterator<Item = f32> {
    EXTREMES
        .into_iter()
        .chain(FUZZ.iter().map(|&b| f32::from_bits(b)))
}

#[entry]
fn main() -> ! {
    let mut out = Out::open();
    let mut b = Bench::new();
    let Ok(machine) = Machine::try_injector(Species::<f32>::PROTON, NOMINAL_KINETIC_EV as f32)
    else {
        out.str("FAIL: machine").nl();
        board::exit(false)
    };
    b.measure(&mut out, "markers", 1, || ());
    let ok = FUZZ.len() > 100 && run(&mut out, &mut b, &machine);
    out.str("fuzz values ").u32(FUZZ.len() as u32).nl();
    out.str(if ok { "PASS" } else { "FAIL" }).nl();
    board::exit(ok)
}

/// Flight times: the extremes, the fuzz values, light's time over the base and values just
/// around it (the `FasterThanLight` edge and the slow branch at c/2), and the run's readings.
fn flight_times(machine: &Machine<f32>) -> impl Iterator<Item = f32> + '_ {
    let light = machine.flight_base_m / 299_792_458.0;
    values()
        .chain([
            light,
            light * 1.000_001,
            light * 0.999_999,
            light * 2.0,
            light * 2.000_001,
        ])
        .chain(CASES.iter().map(|c| c.reading.flight_time_s))
}

#[inline(never)]
fn run(out: &mut Out, b: &mut Bench, machine: &Machine<f32>) -> bool {
    let species = machine.window.species();
    let Ok(nominal) = control::kinematics(machine, CASES[0].reading.flight_time_s) else {
        return false;
    };
    let axis = control::beam_axis::<f32>();

    // 1. Kinematics from a flight time.
    for t in flight_times(machine) {
        b.worst(out, "Motion::try_from_flight_time", || {
            black_box(control::kinematics(black_box(machine), black_box(t)).is_ok())
        });
    }

    // The states of motion the other functions get: every accepted flight time and every accepted
    // kinetic energy among the values.
    let motions = || {
        flight_times(machine)
            .filter_map(|t| control::kinematics(machine, t).ok())
            .chain(values().filter_map(|t| Motion::try_from_kinetic_energy(species, t).ok()))
    };

    // 2. Plausibility, rigidity, particle.
    for m in motions() {
        b.worst(out, "EnergyWindow::check_motion", || {
            black_box(black_box(&machine.window).check_motion(black_box(&m)));
        });
        b.worst(out, "Motion::try_magnetic_rigidity", || {
            black_box(black_box(&m).try_magnetic_rigidity().is_ok())
        });
        b.worst(out, "Particle::try_from_motion", || {
            black_box(
                Particle::try_from_motion(black_box(&m), black_box(axis), ThreeVector::ZERO)
                    .is_ok(),
            )
        });
    }

    // 3. The moving window: every value pushed in turn (a push stores it), and the mean (the sum
    // of the held values) after each.
    let mut window = MovingWindow::<f32, { control::WINDOW }>::new();
    for x in values() {
        b.worst(out, "MovingWindow::try_push", || {
            black_box(black_box(&mut window).try_push(black_box(x)).is_ok())
        });
        b.worst(out, "MovingWindow::try_mean", || {
            black_box(black_box(&window).try_mean().is_ok())
        });
    }

    // 4. The set point (the one-corrector case of the orbit correction, with the kick angle per
    // T m of the state of motion): each value as the offset and as the read-back, and every state
    // of motion with the run's first reading.
    let r0 = CASES[0].reading;
    let steer = |b: &mut Bench, out: &mut Out, m: &Motion<f32>, offset: f32, readback: f32| {
        b.worst(out, "orbit::try_single_step", || {
            let r = control::set_point(
                black_box(&machine.steering),
                black_box(m),
                black_box(offset),
                black_box(readback),
            );
            black_box(r.is_ok())
        });
    };
    for x in values() {
        steer(b, out, &nominal, x, r0.readback_tm);
        steer(b, out, &nominal, r0.offset_m, x);
    }
    for m in motions() {
        steer(b, out, &m, r0.offset_m, r0.readback_tm);
    }

    // 5. The corrector's field from each value as the set point.
    for x in values() {
        b.worst(out, "FieldTensor::try_from_fields", || {
            black_box(control::corrector_field(black_box(machine), black_box(x)).is_ok())
        });
    }

    // 6. The four-force: every accepted field on the nominal beam, the nominal field on every
    // particle, every value as the charge.
    let Ok(field) = control::corrector_field(machine, r0.readback_tm) else {
        return false;
    };
    let Ok(beam) = Particle::try_from_motion(&nominal, axis, ThreeVector::ZERO) else {
        return false;
    };
    let q = species.charge();
    let force = |b: &mut Bench, out: &mut Out, f: &FieldTensor<f32>, q: f32, p: &Particle<f32>| {
        b.worst(out, "FieldTensor::try_four_force", || {
            black_box(
                black_box(f)
                    .try_four_force(black_box(q), black_box(p.four_velocity()))
                    .is_ok(),
            )
        });
    };
    for x in values() {
        if let Ok(f) = control::corrector_field(machine, x) {
            force(b, out, &f, q, &beam);
        }
        force(b, out, &field, x, &beam);
    }
    for m in motions() {
        if let Ok(p) = Particle::try_from_motion(&m, axis, ThreeVector::ZERO) {
            force(b, out, &field, q, &p);
        }
    }

    // 7. The step factors over the corrector for every state of motion and over each value (m)
    // for the nominal beam, and one step, plain and compensated: pushers of every step Δt (each
    // value in s) on the nominal beam, and the nominal pusher on every particle and field.
    let length = machine.corrector_length_m;
    for m in motions() {
        b.worst(out, "StepFactors::try_over_length", || {
            black_box(StepFactors::try_over_length(black_box(&m), black_box(length)).is_ok())
        });
    }
    for x in values() {
        b.worst(out, "StepFactors::try_over_length", || {
            black_box(StepFactors::try_over_length(black_box(&nominal), black_box(x)).is_ok())
        });
    }
    let Ok(pusher) = StepFactors::try_over_length(&nominal, length).map(Boris::from_factors) else {
        return false;
    };
    let step = |b: &mut Bench,
                out: &mut Out,
                pusher: &Boris<f32>,
                p: Particle<f32>,
                f: &FieldTensor<f32>| {
        let mut plain = p;
        b.worst(out, "Boris::try_step_plain", || {
            black_box(
                black_box(pusher)
                    .try_step_plain(black_box(&mut plain), black_box(f))
                    .is_ok(),
            )
        });
        let mut compensated = p;
        b.worst(out, "Boris::try_step", || {
            black_box(
                black_box(pusher)
                    .try_step(black_box(&mut compensated), black_box(f))
                    .is_ok(),
            )
        });
    };
    for x in values() {
        if let Ok(p) = Boris::try_new(species, x) {
            step(b, out, &p, beam, &field);
        }
        if let Ok(f) = control::corrector_field(machine, x) {
            step(b, out, &pusher, beam, &f);
        }
    }
    for m in motions() {
        if let Ok(p) = Particle::try_from_motion(&m, axis, ThreeVector::ZERO) {
            step(b, out, &pusher, p, &field);
        }
    }

    // 8. The whole cycle: the run's readings, then each value as the flight time, the offset and
    // the read-back (a fresh loop state each, and one that has seen the whole run).
    let mut state = LoopState::default();
    for c in &CASES {
        b.worst(out, "control::cycle", || {
            black_box(control::cycle(black_box(machine), &mut state, black_box(c.reading)).is_ok())
        });
    }
    for x in values() {
        for reading in [
            Reading {
                flight_time_s: x,
                ..r0
            },
            Reading { offset_m: x, ..r0 },
            Reading {
                readback_tm: x,
                ..r0
            },
        ] {
            let mut fresh = LoopState::default();
            b.worst(out, "control::cycle", || {
                black_box(
                    control::cycle(black_box(machine), &mut fresh, black_box(reading)).is_ok(),
                )
            });
            b.worst(out, "control::cycle", || {
                black_box(
                    control::cycle(black_box(machine), &mut state, black_box(reading)).is_ok(),
                )
            });
        }
    }

    // Typical cost of one Boris step on the nominal beam, compensated and plain.
    let calls = CASES.len() as u32;
    let mut p = beam;
    b.measure(out, "push", calls, || {
        for _ in 0..calls {
            black_box(
                black_box(&pusher)
                    .try_step(black_box(&mut p), black_box(&field))
                    .is_ok(),
            );
        }
    });
    let mut p = beam;
    b.measure(out, "push_plain", calls, || {
        for _ in 0..calls {
            black_box(
                black_box(&pusher)
                    .try_step_plain(black_box(&mut p), black_box(&field))
                    .is_ok(),
            );
        }
    });
    true
}
