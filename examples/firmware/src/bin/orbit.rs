//! The demo's steering loop on an emulated Cortex-M4F (QEMU `mps2-an386`), in `f32`: the invented
//! 70 MeV line of `examples/steering_loop/line.rs` (8 monitors, 6 + 6 correctors), its response
//! computed on the chip from the transfer maps, steered from a misaligned start through a frozen
//! monitor, a corrector at its end stop and an energy step (the response rebuilt on the chip).
//!
//! Each iteration's `try_step` is counted between the plugin's markers and named after what it
//! did: `orbit` (no decomposition, no limit: one matrix–vector product per plane), `resolve` (the
//! iteration that decomposes again after the monitor was dropped), `decompose` (other
//! decompositions: the first, held correctors, the energy step) or `limited`. ci/firmware-orbit
//! turns them into the figures line. Every iteration's set points and outcome are then checked
//! against the `f64` run of the same scenario computed on the host by build.rs: the same outcome
//! (limits, monitors in use, decompositions) and set points within [`BOUND_TM`].
#![no_std]
#![no_main]

#[path = "../board.rs"]
#[allow(dead_code)] // Bench: this binary names its intervals after the call
mod board;
#[path = "../../../steering_loop/line.rs"]
mod line;

use board::{Out, bench_start, bench_stop};
use core::hint::black_box;
use cortex_m_rt::entry;
use fourforce::Error;
use fourforce::orbit::{Orbit, Outcome};
use line::{CORRECTORS, ITERATIONS, MONITORS, Plant};

/// The loop, all zero until set up: in .bss, neither in flash nor on the stack.
static mut ORBIT: Orbit<f32, MONITORS, CORRECTORS> = Orbit::new();

/// The simulated machine from the host's tables (flash): offsets = free orbit + truth · settings.
struct Tables {
    phase: usize,
}

impl Plant<f32> for Tables {
    fn try_set_phase(&mut self, phase: usize) -> Result<(), Error> {
        self.phase = phase;
        Ok(())
    }

    fn orbit(&self, settings: &[f32; CORRECTORS]) -> [[f32; 2]; MONITORS] {
        let truth = &TRUTH[usize::from(self.phase >= 2)];
        let mut b = FREE[self.phase.min(line::PHASES - 1)];
        for (column, s) in truth.iter().zip(settings) {
            for (p, plane) in column.iter().enumerate() {
                for (o, r) in b.iter_mut().zip(plane) {
                    o[p] += r * s;
                }
            }
        }
        b
    }
}

/// One iteration of the host's `f64` run: set points rounded to `f32`, and the outcome's masks.
struct Expected {
    settings: [f32; CORRECTORS],
    saturated: u32,
    rate_limited: u32,
    in_use: u32,
    decomposed: bool,
}

include!(concat!(env!("OUT_DIR"), "/orbit_cases.rs"));

/// Largest difference of an `f32` set point from the `f64` one, in T m: 64 ε₃₂ of the corrector
/// range (2.2 mT m). The solve's error is bounded by ε κ of the weighted response (κ ≈ 10 with
/// α = 0.1), and the loop contracts it; the host check in checks/tests/suite/orbit.rs measures
/// the same run.
const BOUND_TM: f32 = 64.0 * f32::EPSILON * 2.2e-3;

#[entry]
fn main() -> ! {
    board::paint_stack();
    let mut out = Out::open();
    // SAFETY: the only reference to ORBIT, taken once here, before any interrupt could run.
    let orbit = unsafe { &mut *core::ptr::addr_of_mut!(ORBIT) };
    if line::try_setup(orbit).is_err() {
        out.str("FAIL: loop setup").nl();
        board::exit(false)
    }
    // The markers alone: ci/firmware-orbit subtracts them from every interval.
    bench_start(1);
    bench_stop(1);
    out.str("bench 1 markers 1").nl();
    // The plugin numbers intervals in program order from 1; the markers' interval is 1.
    let mut interval = 1_u32;
    let ok = run(&mut out, orbit, &mut interval) && resolve(&mut out, orbit, &mut interval);
    out.str("stack ").u32(board::stack_high_water()).nl();
    out.str(if ok { "PASS" } else { "FAIL" }).nl();
    board::exit(ok)
}

#[inline(never)]
fn run(out: &mut Out, orbit: &mut Orbit<f32, MONITORS, CORRECTORS>, interval: &mut u32) -> bool {
    let mut previous_in_use = MONITORS as u32;
    let mut failures = 0_u32;
    let mut worst = 0.0_f32;
    let mut differ = 0_u64;
    let result = line::try_run(
        orbit,
        &mut Tables { phase: 0 },
        |orbit, readings, settings| {
            *interval += 1;
            bench_start(*interval);
            let r = step(black_box(orbit), black_box(readings), black_box(settings));
            bench_stop(*interval);
            let name = match &r {
                Ok(o) if o.decomposed() && o.monitors_in_use() < previous_in_use => "drop",
                Ok(o) if o.decomposed() => "decompose",
                Ok(o) if o.limited() => "limited",
                Ok(_) => "orbit",
                Err(_) => "error",
            };
            if let Ok(o) = &r {
                previous_in_use = o.monitors_in_use();
            }
            out.str("bench ")
                .u32(*interval)
                .str(" ")
                .str(name)
                .str(" 1")
                .nl();
            r
        },
        |record| {
            let Some(want) = EXPECTED.get(record.iteration) else {
                failures += 1;
                return;
            };
            if !same_outcome(&record.outcome, want) {
                differ |= 1 << record.iteration;
                failures += 1;
            }
            for (got, want) in record.settings.iter().zip(&want.settings) {
                let d = (got - want).abs();
                worst = worst.max(d);
                let within = d <= BOUND_TM; // false for NaN
                if !within {
                    failures += 1;
                }
            }
        },
    );
    if let Err(e) = result {
        out.str("FAIL: ").str(error_name(e)).nl();
        return false;
    }
    // Integers only (float formatting costs flash): the worst deviation in units of 2^-40 T m.
    out.str("iterations ")
        .u32(ITERATIONS as u32)
        .str(", worst set-point deviation from f64: ")
        .u32((worst * 1.099_511_6e12) as u32)
        .str(" x 2^-40 T m (bound ")
        .u32((BOUND_TM * 1.099_511_6e12) as u32)
        .str(")")
        .nl();
    for i in 0..ITERATIONS {
        if differ & (1 << i) != 0 {
            out.str("iteration ")
                .u32(i as u32)
                .str(": outcome differs from f64")
                .nl();
        }
    }
    if failures > 0 {
        out.str("failures ").u32(failures).nl();
    }
    failures == 0
}

/// The cost of a monitor failure alone: the loop set up afresh and converged on a small orbit
/// (no limit acts), then monitor 3 reads NaN: that iteration (`resolve`) drops it and computes
/// the decomposition again. The steady iterations before it are counted as `orbit` too.
#[inline(never)]
fn resolve(
    out: &mut Out,
    orbit: &mut Orbit<f32, MONITORS, CORRECTORS>,
    interval: &mut u32,
) -> bool {
    if line::try_setup(orbit).is_err() {
        out.str("FAIL: second setup").nl();
        return false;
    }
    let plant = Tables { phase: 0 };
    let mut settings = [0.0_f32; CORRECTORS];
    let mut ok = true;
    for k in 0..8 {
        let mut readings = plant.orbit(&settings);
        for (r, f) in readings.iter_mut().zip(&FREE[0]) {
            // a hundredth of the free orbit: no corrector near a limit
            r[0] -= 0.99 * f[0];
            r[1] -= 0.99 * f[1];
        }
        if k == 7 {
            readings[3] = [f32::NAN, f32::NAN];
        }
        *interval += 1;
        bench_start(*interval);
        let r = step(
            black_box(orbit),
            black_box(&readings),
            black_box(&mut settings),
        );
        bench_stop(*interval);
        let name = match (k, &r) {
            (0, Ok(o)) if o.decomposed() && !o.limited() => "decompose",
            (7, Ok(o)) if o.decomposed() && !o.limited() && o.monitors_in_use() == 7 => "resolve",
            (1..=6, Ok(o)) if !o.decomposed() && !o.limited() => "orbit",
            _ => {
                ok = false;
                "unexpected"
            }
        };
        out.str("bench ")
            .u32(*interval)
            .str(" ")
            .str(name)
            .str(" 1")
            .nl();
    }
    ok
}

/// One iteration, in a frame of its own (beside the energy step's rebuild, not on top of it).
#[inline(never)]
fn step(
    orbit: &mut Orbit<f32, MONITORS, CORRECTORS>,
    readings: &[[f32; 2]; MONITORS],
    settings: &mut [f32; CORRECTORS],
) -> Result<Outcome, Error> {
    orbit.try_step(readings, settings)
}

fn same_outcome(got: &Outcome, want: &Expected) -> bool {
    let mask = |f: &dyn Fn(usize) -> bool, n: usize| {
        (0..n).fold(0_u32, |m, j| if f(j) { m | 1 << j } else { m })
    };
    mask(&|j| got.saturated(j), CORRECTORS) == want.saturated
        && mask(&|j| got.rate_limited(j), CORRECTORS) == want.rate_limited
        && mask(&|i| got.monitor_in_use(i), MONITORS) == want.in_use
        && got.decomposed() == want.decomposed
}

fn error_name(e: Error) -> &'static str {
    match e {
        Error::NotConverged => "decomposition did not converge",
        Error::Overflow => "overflow",
        Error::NonFinite => "non-finite",
        _ => "error",
    }
}
