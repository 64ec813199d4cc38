//! The energy check by four witnesses (`fourforce::witness`) on the emulated chip: the
//! accelerator's readback, a time of flight, a centring dipole and a pickup speed, fused and judged
//! at α = 10⁻³. A binary of its own so that the control loop's image keeps its flash budget.
//! Counted per assessment (the `witness` field of ci/firmware's figures line) and checked: a clean
//! set agrees and its fused energy is the true one, a set with one reading moved by 40 σ names that
//! reading. Exits through semihosting: status 0 when every check holds.
#![no_std]
#![no_main]

#[path = "../board.rs"]
mod board;

use core::hint::black_box;
use fourforce::witness::{Alpha, Reading, Watch};
use fourforce::{Motion, Species};

use board::{Bench, Out};
use cortex_m_rt::entry;

/// Kinetic energies of the invented proton line's sets, eV, and the witness moved by 40 σ (4: none).
const SETS: [(f32, usize); 8] = [
    (5.0e6, 4),
    (12.0e6, 0),
    (12.0e6, 4),
    (30.0e6, 1),
    (45.0e6, 4),
    (70.0e6, 2),
    (70.0e6, 4),
    (100.0e6, 3),
];
/// Flight-time baseline and dipole radius of the invented line, m.
const BASELINE_M: f32 = 4.0;
const RADIUS_M: f32 = 1.5;
/// Relative standard uncertainty of each reading: readback, flight time, field, speed.
const RELATIVE: [f32; 4] = [1.0e-3, 1.0e-4, 3.0e-4, 1.0e-4];

/// The four raw readings (readback eV, flight time s, field T, speed m/s) of a beam of kinetic
/// energy `t` (eV), the one at `fault` moved by 40 σ.
fn raw(t: f32, fault: usize) -> Result<[f32; 4], &'static str> {
    let m =
        Motion::try_from_kinetic_energy(Species::<f32>::PROTON, t).map_err(|_| "witness beam")?;
    let brho = m.try_magnetic_rigidity().map_err(|_| "witness rigidity")?;
    let mut x = [t, m.flight_time(BASELINE_M), brho / RADIUS_M, m.speed()];
    if let (Some(x), Some(rel)) = (x.get_mut(fault), RELATIVE.get(fault)) {
        *x += 40.0 * rel * *x;
    }
    Ok(x)
}

/// The check itself, as the firmware would run it on fresh readings: each with its uncertainty
/// into a watch, one assessment.
#[inline(never)]
fn check(x: &[f32; 4]) -> Option<(f32, bool, Option<usize>)> {
    let [t, tof, b, v] = *x;
    let [st, stof, sb, sv] = RELATIVE;
    let mut w = Watch::<f32, 4>::new();
    w.try_push(Reading::Kinetic {
        kinetic_ev: t,
        sigma_ev: st * t,
    })
    .ok()?;
    w.try_push(Reading::FlightTime {
        time_s: tof,
        sigma_s: stof * tof,
        baseline_m: BASELINE_M,
    })
    .ok()?;
    w.try_push(Reading::Dipole {
        field_t: b,
        sigma_t: sb * b,
        radius_m: RADIUS_M,
    })
    .ok()?;
    w.try_push(Reading::Speed {
        speed_m_per_s: v,
        sigma_m_per_s: sv * v,
    })
    .ok()?;
    let a = w.try_assess(Species::PROTON, Alpha::OnePerMille).ok()?;
    Some((a.fused().kinetic_energy(), a.is_consistent(), a.outlier()))
}

/// Counts the four-witness check and verifies its verdicts.
#[inline(never)]
fn measure(out: &mut Out, bench: &mut Bench) -> Result<(), &'static str> {
    let mut sets = [[0.0_f32; 4]; SETS.len()];
    for (slot, (t, fault)) in sets.iter_mut().zip(SETS) {
        *slot = raw(t, fault)?;
    }
    bench.figure(out, "witness", SETS.len() as u32, || {
        for r in &sets {
            black_box(check(black_box(r)));
        }
    });
    for (r, (t, fault)) in sets.iter().zip(SETS) {
        let (fused, consistent, outlier) = check(r).ok_or("witness check")?;
        let ok = if fault < 4 {
            !consistent && outlier == Some(fault)
        } else {
            // The exact readings of a clean set: the fused energy is the true one to a few eps.
            consistent && outlier.is_none() && ((fused - t) / t).abs() < 16.0 * f32::EPSILON
        };
        if !ok {
            return Err("witness verdict");
        }
    }
    Ok(())
}

#[entry]
fn main() -> ! {
    board::paint_stack();
    let mut out = Out::open();
    let mut bench = Bench::new();
    // The markers alone: subtracted from every other interval.
    bench.measure(&mut out, "markers", 1, || ());
    let result = measure(&mut out, &mut bench);
    if let Err(what) = result {
        out.str("FAIL: ").str(what).nl();
    }
    out.str("stack ").u32(board::stack_high_water()).nl();
    out.str(if result.is_ok() { "PASS" } else { "FAIL" }).nl();
    board::exit(result.is_ok())
}
