//! The steering loop of an invented proton transfer line, in `f32`: many monitors and
//! correctors, a failing monitor, a saturating corrector, an energy step, and a wrong energy
//! reading that the plausibility checks catch.
//!
//! Run: `cargo run --release --example steering_loop [path/to/trace.svg]`
//!
//! The line and the run are described in `line.rs` (the same code runs on the emulated
//! Cortex-M4F, see `ci/firmware`). Beside the loop, every iteration fuses three independent
//! witnesses of the energy (`fourforce::witness`), each with its standard uncertainty: the energy
//! the accelerator's control system reports (0.1 %), a time of flight over 5.000 m (20 ps) and the
//! field that centres the beam in a 1.6 m-radius spectrometer dipole (0.02 %); they must agree
//! (χ² at α = 10⁻³) and their fused energy must lie in the expected window. From iteration 36 to
//! 41 the control system reports 80 MeV (a stale set point): the witnesses must disagree and name
//! the readback as the outlier, and the loop must not rebuild its response for it.
//!
//! The process exits with status 1 if the orbit was not corrected within the bounds below, if a
//! failure was not handled (the stuck monitor not dropped, the saturated corrector not reported,
//! the set points not rescaled at the energy step) or if the wrong reading was missed. It prints
//! a short log and a summary and writes an SVG (orbit along the line before and after, rms
//! offset per iteration), naming its path.
//!
//! Caution: this computes set points. Interlocks and machine protection are separate, certified
//! systems.

mod line;

use std::fmt::Write as _;
use std::process::ExitCode;

use fourforce::check::EnergyWindow;
use fourforce::orbit::{Orbit, State};
use fourforce::witness::{Alpha, Reading, Watch};
use fourforce::{Error, Motion, Species};
use line::{
    CORRECTORS, ENERGY_AT, ITERATIONS, MONITORS, PER_PLANE, Record, SHIFT_AT, STUCK_MONITOR,
};

const FAULT: core::ops::Range<usize> = 36..42;
const FAULTY_EV: f32 = 80.0e6;
const TOF_BASELINE_M: f32 = 5.0;
const SPECTROMETER_RADIUS_M: f32 = 1.6;
/// Standard uncertainties of the witnesses: readback (relative), flight time (s), field (relative).
const READBACK_SIGMA: f32 = 1.0e-3;
const TOF_SIGMA_S: f32 = 20.0e-12;
const FIELD_SIGMA: f32 = 2.0e-4;
/// Bounds on the true orbit (all monitors, both planes): rms after settling, before each event
/// and at the end; largest offset at any time after the first correction.
const SETTLED_RMS_M: f32 = 0.4e-3;
const MAX_ABS_M: f32 = 3.5e-3;
const SETTLE: usize = 8;

fn rms(b: &[[f32; 2]; MONITORS]) -> f32 {
    (b.as_flattened().iter().map(|x| x * x).sum::<f32>() / (2 * MONITORS) as f32).sqrt()
}

fn max_abs(b: &[[f32; 2]; MONITORS]) -> f32 {
    b.as_flattened().iter().fold(0.0, |a, x| a.max(x.abs()))
}

fn main() -> ExitCode {
    match run() {
        Ok(code) => code,
        Err(e) => {
            eprintln!("steering_loop: {e}");
            ExitCode::FAILURE
        }
    }
}

fn run() -> Result<ExitCode, Error> {
    let svg_path = std::env::args()
        .nth(1)
        .unwrap_or_else(|| "target/steering_loop.svg".to_owned());
    println!("Harlow Brink 70 MeV proton transfer line (invented): 8 cells, {MONITORS} monitors,");
    println!(
        "{PER_PLANE} + {PER_PLANE} correctors; f32 loop, gain {}, alpha {}, cutoff {}; quadrupoles 3 % off the model.",
        line::GAIN,
        line::ALPHA,
        line::CUTOFF
    );
    println!("Caution: set points only; interlocks and machine protection are separate systems.");
    println!();
    println!(
        " it  energy    rms(true)  max|x,y|  monitors  limits          state      witnesses: fused energy, chi2 (2 dof), outlier"
    );
    let mut orbit = Orbit::new();
    line::try_setup::<f32>(&mut orbit)?;
    let mut machine = line::Machine::try_new()?;
    let cal = line::try_calibration::<f32>()?;
    let mut records: Vec<Record<f32>> = Vec::new();
    let mut failures: Vec<String> = Vec::new();
    let mut faults_caught = 0;
    let mut false_alarms = 0;
    let (mut plain_ns, mut plain_n, mut decomp_ns, mut decomp_n) = (0_u128, 0_u32, 0_u128, 0_u32);
    line::try_run(
        &mut orbit,
        &mut machine,
        |orbit, readings, settings| {
            let t = std::time::Instant::now();
            let out = orbit.try_step(readings, settings);
            let ns = t.elapsed().as_nanos();
            if out.is_ok_and(|o| o.decomposed()) {
                (decomp_ns, decomp_n) = (decomp_ns + ns, decomp_n + 1);
            } else {
                (plain_ns, plain_n) = (plain_ns + ns, plain_n + 1);
            }
            out
        },
        |r| records.push(*r),
    )?;
    for r in &records {
        // The energy checks of this iteration: the window follows the planned energy.
        let expected = r.kinetic_ev;
        let window = EnergyWindow::try_around(Species::PROTON, expected, 0.01)?;
        let beam = Motion::try_from_kinetic_energy(Species::PROTON, r.kinetic_ev)?;
        let readback_ev = if FAULT.contains(&r.iteration) {
            FAULTY_EV
        } else {
            r.kinetic_ev
        };
        // Three witnesses of the energy, fused; the readback is witness 0.
        let field = beam.try_magnetic_rigidity()? / SPECTROMETER_RADIUS_M;
        let mut watch = Watch::<f32, 3>::new();
        watch.try_push(Reading::Kinetic {
            kinetic_ev: readback_ev,
            sigma_ev: READBACK_SIGMA * readback_ev,
        })?;
        watch.try_push(Reading::FlightTime {
            time_s: beam.flight_time(TOF_BASELINE_M),
            sigma_s: TOF_SIGMA_S,
            baseline_m: TOF_BASELINE_M,
        })?;
        watch.try_push(Reading::Dipole {
            field_t: field,
            sigma_t: FIELD_SIGMA * field,
            radius_m: SPECTROMETER_RADIUS_M,
        })?;
        let witnesses = watch
            .try_assess(Species::PROTON, Alpha::OnePerMille)
            .map_err(|e| e.error())?;
        let fused = witnesses.fused();
        let plausible = window
            .check_kinetic_energy(fused.kinetic_energy())
            .is_inside();
        let caught = !witnesses.is_consistent() && witnesses.outlier() == Some(0);
        if FAULT.contains(&r.iteration) {
            if caught {
                faults_caught += 1;
            } else {
                failures.push(format!(
                    "iteration {}: the wrong energy reading was not caught",
                    r.iteration
                ));
            }
        } else if !witnesses.is_consistent() || !plausible {
            false_alarms += 1;
        }
        let mut limits = String::new();
        for j in 0..CORRECTORS {
            let name = corrector_name(j);
            if r.outcome.saturated(j) {
                let _ = write!(limits, "{name}:sat ");
            } else if r.outcome.rate_limited(j) {
                let _ = write!(limits, "{name}:rate ");
            }
        }
        let state = match r.outcome.state() {
            State::Correcting => "correcting".to_owned(),
            State::Hold { rank, correctors } => format!("HOLD {rank}/{correctors}"),
        };
        let event = if r.iteration == SHIFT_AT {
            "  <- entry angle +1.0 mrad; monitor M4 freezes"
        } else if r.iteration == ENERGY_AT {
            "  <- energy 70 -> 74 MeV: set points rescaled, response rebuilt"
        } else if r.iteration == FAULT.start {
            "  <- control system reports 80 MeV"
        } else if r.outcome.decomposed() && r.iteration > 0 {
            "  <- decomposed again"
        } else {
            ""
        };
        let quiet = r.iteration % 4 != 0 && event.is_empty() && limits.is_empty();
        if !quiet || r.iteration + 1 == ITERATIONS {
            println!(
                "{:3}  {:5.1} MeV {:7.1} um {:6.2} mm  {:2}/{MONITORS}      {:15} {:10} {:.3}({:.0}) MeV {:7.1} {}{event}",
                r.iteration,
                r.kinetic_ev / 1.0e6,
                rms(&r.true_orbit) * 1.0e6,
                max_abs(&r.true_orbit) * 1.0e3,
                r.outcome.monitors_in_use(),
                limits.trim_end(),
                state,
                fused.kinetic_energy() / 1.0e6,
                fused.uncertainty() / 1.0e3,
                witnesses.chi_squared(),
                match witnesses.outlier() {
                    Some(0) => "readback",
                    Some(1) => "tof",
                    Some(_) => "dipole",
                    None => "-",
                },
            );
        }
    }

    // --- the verdicts ---
    let first = &records[0];
    for &at in &[SHIFT_AT - 1, ENERGY_AT - 1, ITERATIONS - 1] {
        let r = &records[at];
        if rms(&r.true_orbit) > SETTLED_RMS_M {
            failures.push(format!(
                "iteration {at}: rms {:.1} um above the bound {:.0} um",
                rms(&r.true_orbit) * 1e6,
                SETTLED_RMS_M * 1e6
            ));
        }
    }
    for r in records.iter().skip(SETTLE) {
        if max_abs(&r.true_orbit) > MAX_ABS_M {
            failures.push(format!(
                "iteration {}: offset {:.2} mm above the bound {:.1} mm",
                r.iteration,
                max_abs(&r.true_orbit) * 1e3,
                MAX_ABS_M * 1e3
            ));
        }
    }
    let dropped_at = records
        .iter()
        .find(|r| !r.outcome.monitor_in_use(STUCK_MONITOR))
        .map(|r| r.iteration);
    match dropped_at {
        Some(i) if i > SHIFT_AT && i <= SHIFT_AT + 4 => {}
        other => failures.push(format!(
            "the frozen monitor was dropped at {other:?}, not within 4 iterations"
        )),
    }
    let saturated: Vec<usize> = records
        .iter()
        .filter(|r| (0..CORRECTORS).any(|j| r.outcome.saturated(j)))
        .map(|r| r.iteration)
        .collect();
    if !saturated
        .iter()
        .any(|&i| (SHIFT_AT..ENERGY_AT).contains(&i))
    {
        failures.push("no corrector reached its end stop after the shift".to_owned());
    }
    let before = &records[ENERGY_AT - 1].settings;
    let after_rescale = {
        // the settings the energy step started from: before × (Bρ_new / Bρ_old)
        let p0 = Motion::try_from_kinetic_energy(Species::<f32>::PROTON, line::NOMINAL_EV as f32)?;
        let p1 = Motion::try_from_kinetic_energy(Species::<f32>::PROTON, line::STEPPED_EV as f32)?;
        let ratio = p1.try_magnetic_rigidity()? / p0.try_magnetic_rigidity()?;
        println!();
        println!(
            "energy step: B rho {:.4} -> {:.4} T m, every set point x {ratio:.5}",
            p0.try_magnetic_rigidity()?,
            p1.try_magnetic_rigidity()?
        );
        before.map(|s| s * ratio)
    };
    if records[ENERGY_AT].rescale_held == 0 && !records[ENERGY_AT].outcome.decomposed() {
        failures.push("the response was not rebuilt at the energy step".to_owned());
    }
    if faults_caught != FAULT.len() {
        failures.push(format!(
            "wrong energy caught {faults_caught} of {} times",
            FAULT.len()
        ));
    }
    if false_alarms > 0 {
        failures.push(format!("{false_alarms} false alarms of the energy checks"));
    }
    let last = &records[ITERATIONS - 1];
    println!("summary:");
    println!(
        "  orbit rms {:.0} um at the start, {:.1} um before the shift, {:.1} um before the energy step, {:.1} um at the end",
        rms(&first.true_orbit) * 1e6,
        rms(&records[SHIFT_AT - 1].true_orbit) * 1e6,
        rms(&records[ENERGY_AT - 1].true_orbit) * 1e6,
        rms(&last.true_orbit) * 1e6
    );
    println!(
        "  monitor M{STUCK_MONITOR} frozen at {SHIFT_AT}, dropped at {} (stuck: its correctors should have moved it by more than it resolves); {} of {MONITORS} monitors in use at the end",
        dropped_at.map_or("never".to_owned(), |i| i.to_string()),
        last.outcome.monitors_in_use()
    );
    println!(
        "  a corrector at its end stop in iterations {}..={}",
        saturated.first().copied().unwrap_or(0),
        saturated.last().copied().unwrap_or(0)
    );
    println!("  final set points and supply currents (calibration, piecewise linear):");
    for j in 0..CORRECTORS {
        let s = last.settings[j];
        let current = cal
            .try_drive(s)
            .map_or("outside the table".to_owned(), |a| format!("{a:+.3} A"));
        println!(
            "    {:3} {:+.4} mT m  {current}  (rescaled at the step from {:+.4} to {:+.4} mT m)",
            corrector_name(j),
            s * 1e3,
            before[j] * 1e3,
            after_rescale[j] * 1e3
        );
    }
    println!(
        "  wrong energy reading caught {faults_caught} of {} times, false alarms {false_alarms}",
        FAULT.len()
    );
    println!(
        "  host time per iteration (f32, this machine, one run): {} ns without a decomposition ({plain_n}), {} ns with one ({decomp_n})",
        plain_ns / u128::from(plain_n.max(1)),
        decomp_ns / u128::from(decomp_n.max(1))
    );
    write_svg(&svg_path, &records)?;
    println!("  trace: {svg_path}");
    if failures.is_empty() {
        println!("result: PASS");
        Ok(ExitCode::SUCCESS)
    } else {
        for f in &failures {
            println!("  failure: {f}");
        }
        println!("result: FAIL");
        Ok(ExitCode::FAILURE)
    }
}

fn corrector_name(j: usize) -> String {
    if j < PER_PLANE {
        format!("H{j}")
    } else {
        format!("V{}", j - PER_PLANE)
    }
}

/// Two panels: the true orbit along the line (x and y at the monitors) at the start and at the
/// end; the rms offset per iteration (log scale).
fn write_svg(path: &str, records: &[Record<f32>]) -> Result<(), Error> {
    let (w, h) = (820.0_f32, 560.0_f32);
    let mut s = String::new();
    let _ = writeln!(
        s,
        "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"{w}\" height=\"{h}\" font-family=\"sans-serif\" font-size=\"12\">"
    );
    let _ = writeln!(s, "<rect width=\"100%\" height=\"100%\" fill=\"white\"/>");
    // panel 1: orbit along the line
    let (x0, y0, pw, ph) = (70.0_f32, 40.0_f32, 700.0_f32, 200.0_f32);
    let s_max = line::monitor_s_m(MONITORS - 1) as f32 + 1.0;
    let lim = 3.0e-3_f32;
    let px = |sm: f32| x0 + pw * sm / s_max;
    let py = |v: f32| y0 + ph / 2.0 - (ph / 2.0) * (v / lim).clamp(-1.0, 1.0);
    let _ = writeln!(
        s,
        "<text x=\"{x0}\" y=\"25\">True orbit at the monitors along the line (±3 mm): before (dashed) and after (solid); x blue, y red</text>"
    );
    let _ = writeln!(
        s,
        "<rect x=\"{x0}\" y=\"{y0}\" width=\"{pw}\" height=\"{ph}\" fill=\"none\" stroke=\"black\"/>"
    );
    let _ = writeln!(
        s,
        "<line x1=\"{x0}\" y1=\"{}\" x2=\"{}\" y2=\"{}\" stroke=\"grey\"/>",
        py(0.0),
        x0 + pw,
        py(0.0)
    );
    for (rec, dash) in [
        (&records[0], " stroke-dasharray=\"5,4\""),
        (&records[records.len() - 1], ""),
    ] {
        for (p, colour) in [(0, "blue"), (1, "red")] {
            let pts: Vec<String> = (0..MONITORS)
                .map(|i| {
                    format!(
                        "{:.1},{:.1}",
                        px(line::monitor_s_m(i) as f32),
                        py(rec.true_orbit[i][p])
                    )
                })
                .collect();
            let _ = writeln!(
                s,
                "<polyline points=\"{}\" fill=\"none\" stroke=\"{colour}\"{dash}/>",
                pts.join(" ")
            );
        }
    }
    for i in 0..MONITORS {
        let _ = writeln!(
            s,
            "<text x=\"{:.1}\" y=\"{}\" text-anchor=\"middle\">M{i}</text>",
            px(line::monitor_s_m(i) as f32),
            y0 + ph + 15.0
        );
    }
    let _ = writeln!(
        s,
        "<text x=\"{}\" y=\"{}\" text-anchor=\"middle\">s (m), 0 to {s_max:.1}</text>",
        x0 + pw / 2.0,
        y0 + ph + 32.0
    );
    // panel 2: rms per iteration, log scale 1 um .. 10 mm
    let (y1, ph2) = (320.0_f32, 200.0_f32);
    let n = records.len() as f32;
    let qx = |i: usize| x0 + pw * i as f32 / (n - 1.0);
    let qy = |v: f32| {
        let l = (v.max(1.0e-6) / 1.0e-6).log10() / 4.0;
        y1 + ph2 - ph2 * l.clamp(0.0, 1.0)
    };
    let _ = writeln!(
        s,
        "<text x=\"{x0}\" y=\"{}\">rms true offset per iteration (log, 1 um to 10 mm); events: shift {SHIFT_AT}, energy step {ENERGY_AT}</text>",
        y1 - 15.0
    );
    let _ = writeln!(
        s,
        "<rect x=\"{x0}\" y=\"{y1}\" width=\"{pw}\" height=\"{ph2}\" fill=\"none\" stroke=\"black\"/>"
    );
    for at in [SHIFT_AT, ENERGY_AT] {
        let _ = writeln!(
            s,
            "<line x1=\"{0:.1}\" y1=\"{y1}\" x2=\"{0:.1}\" y2=\"{1}\" stroke=\"orange\"/>",
            qx(at),
            y1 + ph2
        );
    }
    let pts: Vec<String> = records
        .iter()
        .map(|r| format!("{:.1},{:.1}", qx(r.iteration), qy(rms(&r.true_orbit))))
        .collect();
    let _ = writeln!(
        s,
        "<polyline points=\"{}\" fill=\"none\" stroke=\"black\"/>",
        pts.join(" ")
    );
    for (v, label) in [(1.0e-6, "1 um"), (1.0e-4, "100 um"), (1.0e-2, "10 mm")] {
        let _ = writeln!(
            s,
            "<text x=\"{}\" y=\"{:.1}\" text-anchor=\"end\">{label}</text>",
            x0 - 4.0,
            qy(v) + 4.0
        );
    }
    let _ = writeln!(
        s,
        "<text x=\"{}\" y=\"{}\" text-anchor=\"middle\">iteration</text>",
        x0 + pw / 2.0,
        y1 + ph2 + 18.0
    );
    s.push_str("</svg>\n");
    if let Some(dir) = std::path::Path::new(path).parent() {
        let _ = std::fs::create_dir_all(dir);
    }
    std::fs::write(path, s).map_err(|_| Error::OutOfBounds)?;
    Ok(())
}
