//! Host-side check of firmware math: the control cycle the firmware example runs on the chip
//! (examples/firmware/src/control.rs, generic over the scalar), run here in `f32` and in `f64`
//! from the same inputs over a sweep of species and energies.
//!
//! `cargo run --release --example f32_vs_f64`
//!
//! Prints the worst deviation of each `f32` output from the `f64` one, in eps = 2⁻²³ relative,
//! next to the documented bound (`control::BOUNDS_EPS`), and exits non-zero above a bound or
//! when one precision refuses a cycle the other accepts. A firmware team can copy this pattern
//! into its own CI: write the math once, generic over `fourforce::Real`, and compare.

#[path = "firmware/src/control.rs"]
#[allow(dead_code)] // the firmware's nominal energy is not used here
mod control;

use control::{
    BOUNDS_EPS, LoopState, Machine, OUTPUT_NAMES, OUTPUTS, Reading, cycle, deviation_eps,
    test_readback,
};
use fourforce::{Motion, Species};
use std::process::ExitCode;

/// Kinetic energies of the sweep: 1 keV to 10 GeV, 40 per decade.
fn energies() -> impl Iterator<Item = f64> {
    (120..=400).map(|i| 10f64.powf(f64::from(i) / 40.0))
}

/// Beam offsets at the monitor, m (none zero: the deviations are relative).
const OFFSETS: [f64; 4] = [-2.0e-3, -0.1e-3, 0.35e-3, 1.7e-3];

fn main() -> ExitCode {
    let species: [(&str, Species<f32>); 7] = [
        ("electron", Species::ELECTRON),
        ("positron", Species::POSITRON),
        ("muon", Species::MUON),
        ("proton", Species::PROTON),
        ("deuteron", Species::DEUTERON),
        ("helion", Species::HELION),
        ("alpha", Species::ALPHA),
    ];
    let mut worst = [0u32; OUTPUTS];
    let mut worst_at = [("", 0.0f64); OUTPUTS];
    let (mut cycles, mut refused, mut mismatches) = (0u32, 0u32, 0u32);
    for (name, s) in species {
        for t_ev in energies() {
            // The machine around this energy: the injector's geometry, a window of ±20 %.
            let Ok(machine32) = Machine::try_injector(s, t_ev as f32) else {
                println!("{name} at {t_ev:e} eV: no machine");
                return ExitCode::FAILURE;
            };
            let Ok(machine64) = machine32.try_to::<f64>() else {
                println!("{name} at {t_ev:e} eV: no f64 machine");
                return ExitCode::FAILURE;
            };
            let Ok(m) = Motion::try_from_kinetic_energy(machine64.window.species(), t_ev) else {
                println!("{name} at {t_ev:e} eV: no state of motion");
                return ExitCode::FAILURE;
            };
            // Both loops start empty and see the same readings.
            let (mut state32, mut state64) = (LoopState::default(), LoopState::default());
            let sign = f64::from(s.charge()).signum();
            let Ok(brho) = m.try_magnetic_rigidity() else {
                println!("{name}: no rigidity");
                return ExitCode::FAILURE;
            };
            for offset in OFFSETS {
                // The instruments' readings, rounded to f32 once; both precisions start from them.
                // The read-back setting lies on the side the step moves to (no cancellation).
                let reading32 = Reading {
                    flight_time_s: m.flight_time(machine64.flight_base_m) as f32,
                    offset_m: offset as f32,
                    readback_tm: test_readback(brho, sign, offset, machine64.steering.drift())
                        as f32,
                };
                let reading64 = Reading {
                    flight_time_s: f64::from(reading32.flight_time_s),
                    offset_m: f64::from(reading32.offset_m),
                    readback_tm: f64::from(reading32.readback_tm),
                };
                match (
                    cycle(&machine32, &mut state32, reading32),
                    cycle(&machine64, &mut state64, reading64),
                ) {
                    (Ok(a), Ok(b)) => {
                        cycles += 1;
                        for (i, (x, y)) in a.outputs().into_iter().zip(b.outputs()).enumerate() {
                            let d = deviation_eps(f64::from(x), y);
                            if let (Some(w), Some(at)) = (worst.get_mut(i), worst_at.get_mut(i)) {
                                if d > *w {
                                    *w = d;
                                    *at = (name, t_ev);
                                }
                            }
                        }
                    }
                    (Err(a), Err(b)) if a == b => refused += 1,
                    (a, b) => {
                        mismatches += 1;
                        println!("{name} at {t_ev:e} eV, offset {offset}: f32 {a:?}, f64 {b:?}");
                    }
                }
            }
        }
    }
    println!("{cycles} cycles compared, {refused} refused alike by both precisions");
    println!("| output | worst f32 deviation (eps) | at | bound (eps) |");
    println!("| --- | --- | --- | --- |");
    let mut ok = mismatches == 0;
    for (((name, w), (sp, t)), bound) in
        OUTPUT_NAMES.iter().zip(worst).zip(worst_at).zip(BOUNDS_EPS)
    {
        println!("| {name} | {w} | {sp} {t:.3e} eV | {bound} |");
        ok &= w <= bound;
    }
    if ok {
        println!("f32_vs_f64: every output within its bound");
        ExitCode::SUCCESS
    } else {
        println!("f32_vs_f64: FAILED ({mismatches} mismatched verdicts, or a bound exceeded)");
        ExitCode::FAILURE
    }
}
