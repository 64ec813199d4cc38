//! Instructions per call of the kinematics from a kinetic energy on the emulated chip: the
//! crate's exact path (through `Motion`; its square root is the FPU's on the M4F, libm's `sqrtf`
//! on the M0) against the micromath fast path (`fourforce::fast`). ci/firmware turns the counts
//! into the table of docs/performance.md. Also checks that the crate's square root equals libm's
//! `sqrtf` bit for bit (`sqrt.rs`).
#![no_std]
#![no_main]

#[allow(dead_code)] // shared by the binaries, each uses a part
#[path = "../board.rs"]
mod board;
#[path = "../sqrt.rs"]
mod sqrt;

use board::{Bench, Out};
use core::hint::black_box;
use cortex_m_rt::entry;
use fourforce::{Motion, Real, Species, fast};

/// Kinetic energies (eV) of the sweep: electrons and protons from 10 keV to 10 GeV.
const ENERGIES: [f32; 8] = [1.0e4, 5.6e4, 3.2e5, 1.8e6, 1.0e7, 5.6e7, 3.2e8, 1.0e10];
const CALLS: u32 = 2 * ENERGIES.len() as u32;
const LENGTH_M: f32 = 1.5;

/// Calls `f` for every (species, energy) of the sweep with the inputs through `black_box`, and
/// keeps every result alive.
#[inline(always)]
fn sweep(f: impl Fn(Species<f32>, f32) -> f32) -> f32 {
    let mut acc = 0.0;
    for s in [Species::ELECTRON, Species::PROTON] {
        for t in ENERGIES {
            acc += black_box(f(black_box(s), black_box(t)));
        }
    }
    acc
}

/// `x` when the call succeeded, 0 when it failed (the sweep has no failing input).
#[inline(always)]
fn ok(x: Result<f32, fourforce::Error>) -> f32 {
    x.unwrap_or(0.0)
}

#[entry]
fn main() -> ! {
    board::paint_stack();
    let mut out = Out::open();
    let mut b = Bench::new();
    b.measure(&mut out, "markers", 1, || ());
    let motion = |s, t| Motion::try_from_kinetic_energy(s, t);
    let mut sum = 0.0f32;
    // The sweep itself (loop, black_box, sum) around an identity: included in every count below.
    sum += b.measure(&mut out, "overhead", CALLS, || sweep(|_, t| t));
    sum += b.measure(&mut out, "libm_sqrt", CALLS, || sweep(|_, t| Real::sqrt(t)));
    sum += b.measure(&mut out, "fast_sqrt", CALLS, || sweep(|_, t| fast::sqrt(t)));
    sum += b.measure(&mut out, "libm_gamma", CALLS, || {
        sweep(|s, t| ok(motion(s, t).map(|m| m.gamma())))
    });
    sum += b.measure(&mut out, "libm_beta", CALLS, || {
        sweep(|s, t| ok(motion(s, t).map(|m| m.beta())))
    });
    sum += b.measure(&mut out, "fast_beta", CALLS, || {
        sweep(|s, t| ok(fast::try_beta(s, t)))
    });
    sum += b.measure(&mut out, "libm_pc", CALLS, || {
        sweep(|s, t| ok(motion(s, t).map(|m| m.momentum())))
    });
    sum += b.measure(&mut out, "fast_pc", CALLS, || {
        sweep(|s, t| ok(fast::try_momentum(s, t)))
    });
    sum += b.measure(&mut out, "libm_brho", CALLS, || {
        sweep(|s, t| ok(motion(s, t).and_then(|m| m.try_magnetic_rigidity())))
    });
    sum += b.measure(&mut out, "fast_brho", CALLS, || {
        sweep(|s, t| ok(fast::try_magnetic_rigidity(s, t)))
    });
    sum += b.measure(&mut out, "libm_v", CALLS, || {
        sweep(|s, t| ok(motion(s, t).map(|m| m.speed())))
    });
    sum += b.measure(&mut out, "fast_v", CALLS, || {
        sweep(|s, t| ok(fast::try_speed(s, t)))
    });
    sum += b.measure(&mut out, "libm_tof", CALLS, || {
        sweep(|s, t| ok(motion(s, t).map(|m| m.flight_time(LENGTH_M))))
    });
    sum += b.measure(&mut out, "fast_tof", CALLS, || {
        sweep(|s, t| ok(fast::try_flight_time(s, t, LENGTH_M)))
    });
    out.str("stack ").u32(board::stack_high_water()).nl();
    // Every result is finite and positive, so the sum is too.
    let ok = sqrt::check(&mut out) && sum.is_finite() && sum > 0.0;
    out.str(if ok { "PASS" } else { "FAIL" }).nl();
    board::exit(ok)
}
