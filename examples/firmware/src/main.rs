//! A timing and steering loop with fourforce on an emulated Cortex-M4F (QEMU `mps2-an386`).
//!
//! Each cycle turns a measured time of flight into the beam's kinematics, checks that the energy
//! is plausible, computes the corrector set point through the orbit correction, the four-force in
//! the corrector and one push step through it (`control.rs`). The program measures the cost of
//! the pieces between markers counted by the QEMU plugin `insncount.c`, then checks every cycle
//! against the `f64` results that `build.rs` computed on the host from the same inputs, within
//! the bounds documented in `control.rs`, and exits through semihosting: status 0 when every
//! check holds, 1 otherwise.
//! It prints integers only: float formatting would cost about 16 KB of flash.
#![no_std]
#![no_main]

#[allow(dead_code)] // shared by the binaries, each uses a part
mod board;
#[allow(dead_code)] // `Machine::try_to` is for the host
mod control;

use board::{Bench, Out};
use control::{BOUNDS_EPS, LoopState, Machine, NOMINAL_KINETIC_EV, OUTPUT_NAMES, OUTPUTS, Reading};
use core::hint::black_box;
use cortex_m_rt::entry;
use fourforce::push::{Boris, Particle, Pusher, StepFactors};
use fourforce::{Error, Species};

/// One reading of the run and the `f64` result of its cycle, rounded to `f32`.
struct Case {
    reading: Reading<f32>,
    expected: Result<[f32; OUTPUTS], Error>,
}

include!(concat!(env!("OUT_DIR"), "/cases.rs"));

const CALLS: u32 = CASES.len() as u32;

#[entry]
fn main() -> ! {
    board::paint_stack();
    let mut out = Out::open();
    let mut bench = Bench::new();
    let Ok(machine) = Machine::try_injector(Species::<f32>::PROTON, NOMINAL_KINETIC_EV as f32)
    else {
        out.str("FAIL: machine").nl();
        board::exit(false)
    };
    // The markers alone: subtracted from every other interval.
    bench.measure(&mut out, "markers", 1, || ());
    // Each step in a function of its own, so that their frames do not add up on the stack.
    if let Err(what) = measure_parts(&mut out, &mut bench, &machine) {
        out.str("FAIL: ").str(what).nl();
        board::exit(false)
    }
    measure_cycle(&mut out, &mut bench, &machine);
    let ok = verify(&mut out, &machine);
    out.str("stack ").u32(board::stack_high_water()).nl();
    out.str(if ok { "PASS" } else { "FAIL" }).nl();
    board::exit(ok)
}

/// Counts each piece of the cycle on its own: kinematics, check, set point, four-force,
/// pusher construction, push step.
#[inline(never)]
fn measure_parts(
    out: &mut Out,
    bench: &mut Bench,
    machine: &Machine<f32>,
) -> Result<(), &'static str> {
    // Kinematics from the measured time of flight, one call per reading.
    bench.figure(out, "convert", CALLS, || {
        for case in &CASES {
            let m = control::kinematics(black_box(machine), black_box(case.reading.flight_time_s));
            black_box(m.ok());
        }
    });

    let nominal = control::kinematics(machine, CASES[0].reading.flight_time_s)
        .map_err(|_| "nominal kinematics")?;
    // The plausibility check of a state of motion.
    bench.measure(out, "check", CALLS, || {
        for _ in 0..CALLS {
            black_box(black_box(&machine.window).check_motion(black_box(&nominal)));
        }
    });
    // The set point: the one-monitor, one-corrector case of the orbit correction.
    bench.measure(out, "set_point", CALLS, || {
        for case in &CASES {
            let r = control::set_point(
                black_box(&machine.steering),
                black_box(&nominal),
                black_box(case.reading.offset_m),
                black_box(case.reading.readback_tm),
            );
            black_box(r.ok());
        }
    });

    // The four-force of the corrector's field on the nominal beam.
    let field = control::corrector_field(machine, -3.0e-3).map_err(|_| "corrector field")?;
    let axis = control::beam_axis();
    let u = nominal
        .try_four_velocity(axis)
        .map_err(|_| "four-velocity")?;
    let species = machine.window.species();
    let q = species.charge();
    bench.figure(out, "four_force", CALLS, || {
        for _ in 0..CALLS {
            black_box(black_box(&field).four_force(black_box(q), black_box(u)));
        }
    });

    // Building the pusher for the step through the corrector (once per cycle in
    // `control::cycle`).
    let length = machine.corrector_length_m;
    bench.measure(out, "pusher_new", CALLS, || {
        for _ in 0..CALLS {
            let factors = StepFactors::try_over_length(black_box(&nominal), black_box(length));
            black_box(factors.map(Boris::from_factors).is_ok());
        }
    });

    // One plain Boris step through the corrector, repeated: the step the cycle uses, which pushes
    // one step from a fresh particle (the compensated `try_step` is counted by the `worst`
    // binary).
    let pusher = StepFactors::try_over_length(&nominal, length)
        .map(Boris::from_factors)
        .map_err(|_| "pusher")?;
    let mut particle = Particle::try_from_motion(&nominal, axis, fourforce::ThreeVector::ZERO)
        .map_err(|_| "particle")?;
    bench.figure(out, "push_plain", CALLS, || {
        for _ in 0..CALLS {
            let r = black_box(&pusher).try_step_plain(black_box(&mut particle), black_box(&field));
            black_box(r.is_ok());
        }
    });
    Ok(())
}

/// Counts the whole cycle, one per reading.
#[inline(never)]
fn measure_cycle(out: &mut Out, bench: &mut Bench, machine: &Machine<f32>) {
    let mut state = LoopState::default();
    bench.figure(out, "cycle", CALLS, || {
        for case in &CASES {
            let r = control::cycle(black_box(machine), &mut state, black_box(case.reading));
            black_box(r.is_ok());
        }
    });
}

/// Checks every cycle against the host's `f64` results, from a fresh loop state as on the host;
/// prints the worst deviation of each output and returns whether every check held.
#[inline(never)]
fn verify(out: &mut Out, machine: &Machine<f32>) -> bool {
    let mut state = LoopState::default();
    let mut worst = [0u32; OUTPUTS];
    let mut failures = 0u32;
    for case in &CASES {
        match (
            control::cycle(machine, &mut state, case.reading),
            case.expected,
        ) {
            (Ok(got), Ok(want)) => {
                for (((w, got), want), bound) in worst
                    .iter_mut()
                    .zip(got.outputs())
                    .zip(want)
                    .zip(BOUNDS_EPS)
                {
                    let d = control::deviation_eps(got, want);
                    *w = (*w).max(d);
                    if d > bound {
                        failures += 1;
                    }
                }
            }
            (Err(got), Err(want)) if got == want => {}
            _ => failures += 1,
        }
    }
    out.str("cycles ")
        .u32(CALLS)
        .str(", worst deviation from f64 in eps (bound):");
    for ((name, w), bound) in OUTPUT_NAMES.iter().zip(worst).zip(BOUNDS_EPS) {
        out.str(" ")
            .str(name)
            .str("=")
            .u32(w)
            .str(" (")
            .u32(bound)
            .str(")");
    }
    out.nl();
    if failures > 0 {
        out.str("failures ").u32(failures).nl();
    }
    failures == 0
}
