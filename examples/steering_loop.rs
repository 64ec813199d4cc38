//! The steering loop of an invented machine, in `f32`, with plausibility checks and one injected
//! fault.
//!
//! Run: `cargo run --release --example steering_loop [path/to/trace.svg]`
//!
//! The scenario (all of it invented for this demo): the *Brantholm 12 MeV proton test line*
//! carries a 12 MeV proton beam from its linac exit through 3.0 m of drift to a horizontal
//! corrector (HC1, ±4 mT m, at most 0.05 mT m change per 1 ms loop step), then 2.4 m of drift to
//! a beam-position monitor (BPM1, 15 µm rms noise). Downstream, a time-of-flight cell (two
//! pickups 4.000 m apart, 25 ps rms jitter) and a spectrometer dipole that centres the beam on a
//! 1.25 m radius (field readback 2·10⁻⁴ rms) give two independent energy readings; the
//! accelerator's control system also reports the energy it believes it delivers.
//!
//! The beam entering the line drifts: its offset creeps by 1.5 mm over the run and its angle
//! wanders by ±0.05 mrad. The loop runs 400 iterations (0.4 s of machine time): each one reads BPM1,
//! checks the three energy readings against the expected window (12 MeV ± 1.5 %), picks a
//! plausible energy for the rigidity, and moves HC1 by one steering step toward x = 0 at BPM1.
//! From iteration 260 to 299 the control system's energy reading is wrong (15.2 MeV: a stale
//! set point); the checks must catch it and the loop must not use it.
//!
//! The pseudo-random noise is a seeded xorshift generator written below: the run is the same
//! every time. The process exits with status 1 if the loop did not converge, if it missed the
//! fault, or if a check raised a false alarm; it writes an SVG trace (beam offset and corrector
//! setting against iteration) and names its path in the log.

use std::fmt::Write as _;
use std::process::ExitCode;

use fourforce::beamline::{BeamLine, BeamState, Element, KickDirection};
use fourforce::check::{EnergyWindow, MovingWindow, Trend, Verdict};
use fourforce::steer::SteeringSetup;
use fourforce::{Error, Motion, Species};

const ITERATIONS: usize = 400;
const LOG_EVERY: usize = 25;
const FAULT: core::ops::Range<usize> = 260..300;
const FAULTY_READING_EV: f32 = 15.2e6;
const NOMINAL_EV: f32 = 12.0e6;
const TOF_BASELINE_M: f32 = 4.0;
const SPECTROMETER_RADIUS_M: f32 = 1.25;
const BPM_NOISE_M: f32 = 15.0e-6;
const TOF_JITTER_S: f32 = 25.0e-12;
const FIELD_NOISE: f32 = 2.0e-4;
const READBACK_NOISE_EV: f32 = 3.0e3;
/// After this many iterations the loop must have settled.
const SETTLE: usize = 60;
/// Convergence bars on the true offset at BPM1 after settling.
const MAX_RMS_M: f32 = 30.0e-6;
const MAX_ABS_M: f32 = 80.0e-6;

/// Seeded xorshift32 (G. Marsaglia, J. Stat. Softw. 8, 2003, from memory) and an approximately
/// normal deviate from the sum of twelve uniforms (Irwin-Hall; variance 1).
struct Noise(u32);

impl Noise {
    fn uniform(&mut self) -> f32 {
        let mut x = self.0;
        x ^= x << 13;
        x ^= x >> 17;
        x ^= x << 5;
        self.0 = x;
        (x >> 8) as f32 / (1u32 << 24) as f32
    }
    fn normal(&mut self) -> f32 {
        (0..12).map(|_| self.uniform()).sum::<f32>() - 6.0
    }
}

/// One iteration's record, for the log, the summary and the trace.
#[derive(Clone, Copy)]
struct Record {
    uncorrected_m: f32,
    true_offset_m: f32,
    measured_m: f32,
    setting_tm: f32,
    energy_used_ev: f32,
    readback: Verdict<f32>,
    tof: Verdict<f32>,
    dipole: Verdict<f32>,
    trend: Trend,
    rate_limited: bool,
}

fn verdict_word(v: &Verdict<f32>) -> &'static str {
    match v {
        Verdict::Inside { .. } => "inside",
        Verdict::Low { .. } => "LOW",
        Verdict::High { .. } => "HIGH",
        Verdict::Impossible(_) => "IMPOSSIBLE",
    }
}

fn run() -> Result<ExitCode, Error> {
    let species = Species::<f32>::PROTON;
    let mut noise = Noise(0x2545_F491);

    // The machine: linac exit -> 3.0 m -> HC1 -> 2.4 m -> BPM1.
    let setup = SteeringSetup::try_new(2.4_f32, 0.5, 4.0e-3, 0.05e-3)?;
    let window = EnergyWindow::try_around(species, NOMINAL_EV, 0.015)?;
    let mut tof_energies = MovingWindow::<f32, 32>::new();

    let mut setting_tm = 0.0_f32;
    let mut last_good_ev = NOMINAL_EV;
    let mut records: Vec<Record> = Vec::with_capacity(ITERATIONS);

    println!("Brantholm 12 MeV proton test line: steering HC1 to centre the beam at BPM1");
    println!(
        "loop: {ITERATIONS} iterations, gain {}, HC1 ±{:.1} mT m, ≤{:.3} mT m/step; energy window {:.2}–{:.2} MeV",
        setup.gain(),
        setup.max_integrated_field_tm() * 1e3,
        setup.max_change_tm() * 1e3,
        window.low() * 1e-6,
        window.high() * 1e-6
    );
    println!(
        "fault: control-system energy reading {:.1} MeV during iterations {}..{}",
        FAULTY_READING_EV * 1e-6,
        FAULT.start,
        FAULT.end - 1
    );
    println!();
    println!(
        "{:>5} {:>10} {:>10} {:>9} {:>9} {:>9} {:>7} {:>7} {:>8}",
        "iter", "x true", "x meas", "HC1", "E used", "readback", "ToF", "dipole", "trend"
    );
    println!(
        "{:>5} {:>10} {:>10} {:>9} {:>9} {:>9} {:>7} {:>7} {:>8}",
        "", "(µm)", "(µm)", "(mT m)", "(MeV)", "", "", "", ""
    );

    for k in 0..ITERATIONS {
        let progress = k as f32 / ITERATIONS as f32;
        // The beam that really comes out of the linac: energy creeping up 0.3 %, offset drifting
        // 1.5 mm, angle wandering by ±0.05 mrad once over the run.
        let true_ev = NOMINAL_EV * (1.0 + 0.003 * progress);
        let beam = Motion::try_from_kinetic_energy(species, true_ev)?;
        let x0 = 1.2e-3 + 1.5e-3 * progress;
        let slope0 = 0.05e-3 * (core::f32::consts::TAU * progress).sin();
        let line = BeamLine::<f32, 4>::try_from_elements(&[
            Element::Drift { length_m: 3.0 },
            Element::MagneticKick {
                integrated_field_tm: setting_tm,
                direction: KickDirection::Horizontal,
            },
            Element::Drift { length_m: 2.4 },
        ])?;
        let at_bpm = line.try_transport(BeamState::try_new(beam, x0, slope0, 0.0, 0.0, 0.0)?)?;
        let true_offset = at_bpm.x();
        // where the beam would be with HC1 off, for the trace
        let uncorrected = Element::Drift { length_m: 5.4 }
            .try_apply(&BeamState::try_new(beam, x0, slope0, 0.0, 0.0, 0.0)?)?
            .x();
        let measured = true_offset + BPM_NOISE_M * noise.normal();

        // The three energy readings, each checked on its own.
        let readback_ev = if FAULT.contains(&k) {
            FAULTY_READING_EV
        } else {
            true_ev + READBACK_NOISE_EV * noise.normal()
        };
        let tof_s = beam.flight_time(TOF_BASELINE_M) + TOF_JITTER_S * noise.normal();
        let centring_t = beam.try_magnetic_rigidity()? / SPECTROMETER_RADIUS_M
            * (1.0 + FIELD_NOISE * noise.normal());
        let readback = window.check_kinetic_energy(readback_ev);
        let tof = window.check_flight_time(TOF_BASELINE_M, tof_s);
        let dipole = window.check_centring_field(centring_t, SPECTROMETER_RADIUS_M);
        if let Some(e) = tof.kinetic_energy() {
            tof_energies.try_push(e)?;
        }
        let trend = if tof_energies.len() >= 2 {
            // 1 % of the nominal energy across the 32-reading window is a trend worth a warning
            tof_energies.try_trend(0.01 * NOMINAL_EV)?
        } else {
            Trend::Steady
        };

        // The energy for the rigidity: the control system's reading when it is plausible and
        // agrees with the time of flight; else the time of flight; else the last good value.
        let energy_used = match (readback, tof) {
            (
                Verdict::Inside {
                    kinetic_energy_ev, ..
                },
                Verdict::Inside { .. },
            ) => kinetic_energy_ev,
            (
                _,
                Verdict::Inside {
                    kinetic_energy_ev, ..
                },
            ) => kinetic_energy_ev,
            _ => last_good_ev,
        };
        last_good_ev = energy_used;
        let believed = Motion::try_from_kinetic_energy(species, energy_used)?;
        let cmd = setup.try_next_setting(&believed, measured, 0.0, setting_tm)?;
        setting_tm = cmd.setting_tm();

        let record = Record {
            uncorrected_m: uncorrected,
            true_offset_m: true_offset,
            measured_m: measured,
            setting_tm,
            energy_used_ev: energy_used,
            readback,
            tof,
            dipole,
            trend,
            rate_limited: cmd.rate_limited(),
        };
        records.push(record);
        let fault_edge = k == FAULT.start || k == FAULT.end;
        if k % LOG_EVERY == 0 || fault_edge || k + 1 == ITERATIONS {
            println!(
                "{:>5} {:>10.1} {:>10.1} {:>9.4} {:>9.4} {:>9} {:>7} {:>7} {:>8}{}",
                k,
                true_offset * 1e6,
                measured * 1e6,
                setting_tm * 1e3,
                energy_used * 1e-6,
                verdict_word(&readback),
                verdict_word(&tof),
                verdict_word(&dipole),
                format!("{trend:?}").to_lowercase(),
                match (FAULT.contains(&k), cmd.rate_limited()) {
                    (true, _) => "  <- fault: readback rejected",
                    (false, true) => "  (rate limited)",
                    _ => "",
                }
            );
        }
    }

    // Verdicts of the run.
    let settled: Vec<f32> = records[SETTLE..].iter().map(|r| r.true_offset_m).collect();
    let rms = (settled.iter().map(|x| x * x).sum::<f32>() / settled.len() as f32).sqrt();
    let worst = settled.iter().fold(0.0_f32, |a, x| a.max(x.abs()));
    let caught = records[FAULT]
        .iter()
        .filter(|r| !r.readback.is_inside())
        .count();
    let used_fault = records[FAULT]
        .iter()
        .filter(|r| (r.energy_used_ev - FAULTY_READING_EV).abs() < 1.0e3)
        .count();
    let false_alarms = records
        .iter()
        .enumerate()
        .filter(|(k, r)| {
            let all_inside = r.readback.is_inside() && r.tof.is_inside() && r.dipole.is_inside();
            !FAULT.contains(k) && !all_inside
        })
        .count();
    let trend_warnings = records.iter().filter(|r| r.trend != Trend::Steady).count();
    let rate_limited = records.iter().filter(|r| r.rate_limited).count();
    let first_inside = records
        .iter()
        .position(|r| r.true_offset_m.abs() < 50.0e-6)
        .unwrap_or(ITERATIONS);
    let tof_mean = tof_energies.try_mean()?;
    let tof_spread = tof_energies.try_spread()?;
    let converged = rms < MAX_RMS_M && worst < MAX_ABS_M;
    let fault_caught = caught == FAULT.len() && used_fault == 0;

    let path = std::env::args()
        .nth(1)
        .unwrap_or_else(|| "target/steering_loop.svg".to_string());
    let svg = trace_svg(&records);
    let written = std::path::Path::new(&path)
        .parent()
        .map_or(Ok(()), std::fs::create_dir_all)
        .and_then(|()| std::fs::write(&path, svg));

    println!();
    println!("summary");
    println!("  {:<46} {:>14}", "quantity", "value");
    println!(
        "  {:<46} {:>14.1}",
        "initial offset at BPM1 (µm)",
        records[0].true_offset_m * 1e6
    );
    println!(
        "  {:<46} {:>14}",
        "first iteration within 50 µm", first_inside
    );
    println!(
        "  {:<46} {:>14}",
        "steps cut by the rate limit", rate_limited
    );
    println!(
        "  {:<46} {:>14.1}",
        format!(
            "rms offset after iteration {SETTLE} (µm, bar {})",
            MAX_RMS_M * 1e6
        ),
        rms * 1e6
    );
    println!(
        "  {:<46} {:>14.1}",
        format!(
            "largest offset after iteration {SETTLE} (µm, bar {})",
            MAX_ABS_M * 1e6
        ),
        worst * 1e6
    );
    println!(
        "  {:<46} {:>14.4}",
        "final HC1 setting (mT m)",
        setting_tm * 1e3
    );
    println!(
        "  {:<46} {:>14}",
        "faulty readings flagged",
        format!("{caught} of {}", FAULT.len())
    );
    println!(
        "  {:<46} {:>14}",
        "faulty readings used for the rigidity", used_fault
    );
    println!(
        "  {:<46} {:>14}",
        "false alarms outside the fault", false_alarms
    );
    println!(
        "  {:<46} {:>14}",
        "trend warnings (ToF energy window)", trend_warnings
    );
    println!(
        "  {:<46} {:>14}",
        "ToF energy, last 32: mean ± spread (MeV)",
        format!("{:.4} ± {:.4}", tof_mean * 1e-6, tof_spread * 1e-6)
    );
    match &written {
        Ok(()) => println!("  {:<46} {:>14}", "trace (SVG)", path),
        Err(e) => println!("  trace NOT written to {path}: {e}"),
    }
    println!();
    let ok = converged && fault_caught && false_alarms == 0 && written.is_ok();
    println!(
        "result: {} (converged: {}, fault caught: {}, false alarms: {})",
        if ok { "PASS" } else { "FAIL" },
        if converged { "yes" } else { "NO" },
        if fault_caught { "yes" } else { "NO" },
        false_alarms
    );
    Ok(if ok {
        ExitCode::SUCCESS
    } else {
        ExitCode::FAILURE
    })
}

/// The trace: beam offset at BPM1 (measured and true) and the HC1 setting against iteration,
/// with the fault window shaded.
fn trace_svg(records: &[Record]) -> String {
    let (w, h) = (960.0_f32, 560.0_f32);
    let (left, right) = (80.0_f32, 30.0_f32);
    let top_panel = (60.0_f32, 300.0_f32); // y range of the offset panel
    let bottom_panel = (360.0_f32, 500.0_f32); // y range of the corrector panel
    let n = records.len().max(2) as f32;
    let x_of = |k: f32| left + (w - left - right) * k / (n - 1.0);
    let (off_lo, off_hi) = (-400.0_f32, 2800.0_f32); // µm
    let y_off = |um: f32| {
        let um = um.clamp(off_lo, off_hi);
        top_panel.1 - (top_panel.1 - top_panel.0) * (um - off_lo) / (off_hi - off_lo)
    };
    let (set_lo, set_hi) = (-0.8_f32, 0.2_f32); // mT m
    let y_set = |mtm: f32| {
        let mtm = mtm.clamp(set_lo, set_hi);
        bottom_panel.1 - (bottom_panel.1 - bottom_panel.0) * (mtm - set_lo) / (set_hi - set_lo)
    };
    let mut s = String::new();
    let _ = writeln!(
        s,
        r##"<svg xmlns="http://www.w3.org/2000/svg" width="{w}" height="{h}" viewBox="0 0 {w} {h}" font-family="sans-serif" font-size="13">"##
    );
    let _ = writeln!(s, r##"<rect width="100%" height="100%" fill="white"/>"##);
    let _ = writeln!(
        s,
        r##"<text x="{left}" y="28" font-size="17" font-weight="bold">Brantholm 12 MeV proton test line: steering HC1 to centre the beam at BPM1 (f32)</text>"##
    );
    // fault window
    let (fa, fb) = (x_of(FAULT.start as f32), x_of((FAULT.end - 1) as f32));
    for (y0, y1) in [top_panel, bottom_panel] {
        let _ = writeln!(
            s,
            r##"<rect x="{fa:.1}" y="{y0}" width="{:.1}" height="{:.1}" fill="#f4c7c3"/>"##,
            fb - fa,
            y1 - y0
        );
    }
    let _ = writeln!(
        s,
        r##"<text x="{:.1}" y="{:.1}" text-anchor="middle" fill="#a50e0e">wrong energy reading injected:</text>"##,
        0.5 * (fa + fb),
        top_panel.0 + 18.0
    );
    let _ = writeln!(
        s,
        r##"<text x="{:.1}" y="{:.1}" text-anchor="middle" fill="#a50e0e">caught, not used</text>"##,
        0.5 * (fa + fb),
        top_panel.0 + 34.0
    );
    // axes and grid
    for um in [
        -400.0_f32, 0.0, 400.0, 800.0, 1200.0, 1600.0, 2000.0, 2400.0, 2800.0,
    ] {
        let y = y_off(um);
        let colour = if um == 0.0 { "#555" } else { "#ddd" };
        let _ = writeln!(
            s,
            r##"<line x1="{left}" y1="{y:.1}" x2="{:.1}" y2="{y:.1}" stroke="{colour}"/><text x="{:.1}" y="{:.1}" text-anchor="end">{um}</text>"##,
            w - right,
            left - 6.0,
            y + 4.0
        );
    }
    for mtm in [-0.8_f32, -0.6, -0.4, -0.2, 0.0, 0.2] {
        let y = y_set(mtm);
        let colour = if mtm == 0.0 { "#555" } else { "#ddd" };
        let _ = writeln!(
            s,
            r##"<line x1="{left}" y1="{y:.1}" x2="{:.1}" y2="{y:.1}" stroke="{colour}"/><text x="{:.1}" y="{:.1}" text-anchor="end">{mtm:.1}</text>"##,
            w - right,
            left - 6.0,
            y + 4.0
        );
    }
    for k in (0..=records.len()).step_by(50) {
        let x = x_of(k as f32);
        let _ = writeln!(
            s,
            r##"<line x1="{x:.1}" y1="{}" x2="{x:.1}" y2="{}" stroke="#999"/><text x="{x:.1}" y="{}" text-anchor="middle">{k}</text>"##,
            bottom_panel.1,
            bottom_panel.1 + 5.0,
            bottom_panel.1 + 20.0
        );
    }
    let _ = writeln!(
        s,
        r##"<text x="{:.1}" y="{}" text-anchor="middle">loop iteration (1 ms each)</text>"##,
        0.5 * (left + w - right),
        bottom_panel.1 + 42.0
    );
    let _ = writeln!(
        s,
        r##"<text transform="translate(22,{:.1}) rotate(-90)" text-anchor="middle">beam offset at BPM1 (µm)</text>"##,
        0.5 * (top_panel.0 + top_panel.1)
    );
    let _ = writeln!(
        s,
        r##"<text transform="translate(22,{:.1}) rotate(-90)" text-anchor="middle">HC1 (mT m)</text>"##,
        0.5 * (bottom_panel.0 + bottom_panel.1)
    );
    // measured (dots), true (line), corrector (line)
    for (k, r) in records.iter().enumerate() {
        let _ = write!(
            s,
            r##"<circle cx="{:.1}" cy="{:.1}" r="1.6" fill="#8ab4f8"/>"##,
            x_of(k as f32),
            y_off(r.measured_m * 1e6)
        );
    }
    let _ = writeln!(s);
    let polyline = |values: &mut dyn Iterator<Item = (f32, f32)>, colour: &str| {
        let points: Vec<String> = values.map(|(x, y)| format!("{x:.1},{y:.1}")).collect();
        format!(
            r##"<polyline fill="none" stroke="{colour}" stroke-width="2" points="{}"/>"##,
            points.join(" ")
        )
    };
    let dashed = polyline(
        &mut records
            .iter()
            .enumerate()
            .map(|(k, r)| (x_of(k as f32), y_off(r.uncorrected_m * 1e6))),
        "#888",
    )
    .replace(
        "stroke-width=\"2\"",
        "stroke-width=\"1.5\" stroke-dasharray=\"6 4\"",
    );
    let _ = writeln!(s, "{dashed}");
    let _ = writeln!(
        s,
        "{}",
        polyline(
            &mut records
                .iter()
                .enumerate()
                .map(|(k, r)| (x_of(k as f32), y_off(r.true_offset_m * 1e6))),
            "#1a4fa3"
        )
    );
    let _ = writeln!(
        s,
        "{}",
        polyline(
            &mut records
                .iter()
                .enumerate()
                .map(|(k, r)| (x_of(k as f32), y_set(r.setting_tm * 1e3))),
            "#188038"
        )
    );
    // legend
    let lx = left + 120.0;
    let ly = top_panel.0 + 124.0;
    let _ = writeln!(
        s,
        r##"<rect x="{}" y="{}" width="330" height="86" fill="white" stroke="#bbb"/>"##,
        lx - 8.0,
        ly - 16.0
    );
    let _ = writeln!(
        s,
        r##"<circle cx="{}" cy="{}" r="3" fill="#8ab4f8"/><text x="{}" y="{}">BPM1 reading (15 µm rms noise)</text>"##,
        lx + 6.0,
        ly - 4.0,
        lx + 20.0,
        ly
    );
    let _ = writeln!(
        s,
        r##"<line x1="{lx}" y1="{}" x2="{}" y2="{}" stroke="#1a4fa3" stroke-width="2"/><text x="{}" y="{}">true beam offset at BPM1</text>"##,
        ly + 16.0,
        lx + 12.0,
        ly + 16.0,
        lx + 20.0,
        ly + 20.0
    );
    let _ = writeln!(
        s,
        r##"<line x1="{lx}" y1="{}" x2="{}" y2="{}" stroke="#188038" stroke-width="2"/><text x="{}" y="{}">HC1 setting (lower panel)</text>"##,
        ly + 36.0,
        lx + 12.0,
        ly + 36.0,
        lx + 20.0,
        ly + 40.0
    );
    let _ = writeln!(
        s,
        r##"<line x1="{lx}" y1="{}" x2="{}" y2="{}" stroke="#888" stroke-width="1.5" stroke-dasharray="6 4"/><text x="{}" y="{}">beam offset with HC1 off (the drift)</text>"##,
        ly + 56.0,
        lx + 12.0,
        ly + 56.0,
        lx + 20.0,
        ly + 60.0
    );
    let _ = writeln!(s, "</svg>");
    s
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
