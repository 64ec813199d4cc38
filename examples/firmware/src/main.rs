//! A timing and steering loop with fourforce on an emulated Cortex-M4F (QEMU `mps2-an386`).
//!
//! Each cycle turns a measured time of flight into the beam's kinematics, checks that the energy
//! is plausible, computes the corrector set point, the four-force in the corrector and one push
//! step through it (`control.rs`). The program measures the cost of the pieces between markers
//! counted by the QEMU plugin `insncount.c`, then checks every cycle against the `f64` results
//! that `build.rs` computed on the host from the same inputs, within the bounds documented in
//! `control.rs`, and exits through semihosting: status 0 when every check holds, 1 otherwise.
//! It prints integers only: float formatting would cost about 16 KB of flash.
#![no_std]
#![no_main]

mod board;
#[allow(dead_code)] // `Machine::to` is for the host
mod control;

use board::{Bench, Out};
use control::{BOUNDS_EPS, Machine, OUTPUT_NAMES, OUTPUTS, Reading};
use core::hint::black_box;
use cortex_m_rt::entry;
use fourforce::Error;
use fourforce::push::{Boris, Particle, Pusher};

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
    let machine = Machine::<f32>::injector();

    // The markers alone: subtracted from every other interval.
    bench.measure(&mut out, "markers", 1, || ());

    // Kinematics from the measured time of flight, one call per reading.
    bench.measure(&mut out, "convert", CALLS, || {
        for case in &CASES {
            let m = control::kinematics(black_box(&machine), black_box(case.reading.flight_time_s));
            black_box(m.ok());
        }
    });

    // The four-force of the corrector's field on the nominal beam.
    let Ok(nominal) = control::kinematics(&machine, CASES[0].reading.flight_time_s) else {
        out.str("FAIL: nominal kinematics").nl();
        board::exit(false)
    };
    let Ok((tensor, source)) = control::corrector_field(&machine, 1.0e-4) else {
        out.str("FAIL: corrector field").nl();
        board::exit(false)
    };
    let u = control::four_velocity(&nominal);
    let q = machine.species.charge();
    bench.measure(&mut out, "four_force", CALLS, || {
        for _ in 0..CALLS {
            black_box(black_box(&tensor).four_force(black_box(q), black_box(u)));
        }
    });

    let dt = machine.corrector_length_m / nominal.speed();
    // Building the pusher for a step (once per cycle in `control::cycle`).
    bench.measure(&mut out, "pusher_new", CALLS, || {
        for _ in 0..CALLS {
            black_box(Boris::try_new(black_box(machine.species), black_box(dt)).is_ok());
        }
    });

    // One Boris step through the corrector, repeated.
    let (Ok(pusher), Ok(mut particle)) = (
        Boris::try_new(machine.species, dt),
        Particle::try_new(fourforce::ThreeVector::ZERO, u.space, 0.0),
    ) else {
        out.str("FAIL: pusher").nl();
        board::exit(false)
    };
    bench.measure(&mut out, "push", CALLS, || {
        for _ in 0..CALLS {
            let r = black_box(&pusher).try_step(black_box(&mut particle), black_box(&source));
            black_box(r.is_ok());
        }
    });

    // The whole cycle, one per reading.
    bench.measure(&mut out, "cycle", CALLS, || {
        for case in &CASES {
            black_box(control::cycle(black_box(&machine), black_box(case.reading)).is_ok());
        }
    });

    // Check every cycle against the host's f64 results.
    let mut worst = [0u32; OUTPUTS];
    let mut failures = 0u32;
    for case in &CASES {
        match (control::cycle(&machine, case.reading), case.expected) {
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
    out.str("stack ").u32(board::stack_high_water()).nl();
    let ok = failures == 0;
    if !ok {
        out.str("failures ").u32(failures).nl();
    }
    out.str(if ok { "PASS" } else { "FAIL" }).nl();
    board::exit(ok)
}
