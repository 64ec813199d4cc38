//! Exhaustive f32 sweep of fourforce's state of motion against its f64 path (`ci/exhaustive`).
//!
//! For the electron, the proton and the alpha particle, and for each door of `Motion` (the
//! kinetic energy and every other quantity it can be built from), every f32 value of the door's
//! quantity between the values it takes at T = 1 eV and T = 100 TeV (the band) builds one state in
//! f32 and one in f64 from the same number, and every quantity of the two states is compared: the
//! f32 value's distance from the f64 value in units in the last place of f32 (the f64 path's own
//! error, a few f64 ulps, is 2^-29 of an f32 ulp). Then a wide pass takes every `wide-stride`-th
//! bit pattern of the whole u32 range (negatives, NaN, infinities, subnormals, the extremes) and
//! checks that the f32 state is refused exactly when the f64 one is, and that every accepted one
//! is finite and inside its documented range.
//!
//! Usage: `sweep [--stride N] [--wide-stride N] [--threads N] [--bound ULP]`. Exits 1 when a worst
//! case in the band exceeds the bound, when an accepted state holds a non-finite or out-of-range
//! quantity, or when f32 and f64 disagree on accepting an input.

use std::fmt::Write as _;
use std::sync::atomic::{AtomicU64, Ordering};
use std::time::Instant;

use fourforce::{Error, Motion, Species};

/// The quantities of a state, in report order.
const NAMES: [&str; N] = [
    "kinetic_energy",
    "total_energy",
    "gamma",
    "gamma_minus_one",
    "beta",
    "one_minus_beta",
    "beta_gamma",
    "momentum",
    "speed",
    "flight_time_per_metre",
    "flight_time(12.5 m)",
    "magnetic_rigidity",
    "electric_rigidity",
];
const N: usize = 13;

/// Length used for `flight_time(length)` and for the flight-time door: an invented 12.5 m
/// time-of-flight line.
const FLIGHT_LENGTH: f64 = 12.5;

/// Band of kinetic energies (eV) the exhaustive pass covers: 1 eV to 100 TeV.
const T_LOW: f64 = 1.0;
const T_HIGH: f64 = 1.0e14;

#[derive(Clone, Copy, Debug, PartialEq, Eq)]
enum Door {
    KineticEnergy,
    TotalEnergy,
    Gamma,
    Beta,
    BetaGamma,
    Momentum,
    MagneticRigidity,
    ElectricRigidity,
    Speed,
    FlightTime,
}

impl Door {
    fn name(self) -> &'static str {
        match self {
            Door::KineticEnergy => "try_from_kinetic_energy",
            Door::TotalEnergy => "try_from_total_energy",
            Door::Gamma => "try_from_gamma",
            Door::Beta => "try_from_beta",
            Door::BetaGamma => "try_from_beta_gamma",
            Door::Momentum => "try_from_momentum",
            Door::MagneticRigidity => "try_from_magnetic_rigidity",
            Door::ElectricRigidity => "try_from_electric_rigidity",
            Door::Speed => "try_from_speed",
            Door::FlightTime => "try_from_flight_time(12.5 m, t)",
        }
    }

    fn build32(self, s: Species<f32>, x: f32) -> Result<Motion<f32>, Error> {
        match self {
            Door::KineticEnergy => Motion::try_from_kinetic_energy(s, x),
            Door::TotalEnergy => Motion::try_from_total_energy(s, x),
            Door::Gamma => Motion::try_from_gamma(s, x),
            Door::Beta => Motion::try_from_beta(s, x),
            Door::BetaGamma => Motion::try_from_beta_gamma(s, x),
            Door::Momentum => Motion::try_from_momentum(s, x),
            Door::MagneticRigidity => Motion::try_from_magnetic_rigidity(s, x),
            Door::ElectricRigidity => Motion::try_from_electric_rigidity(s, x),
            Door::Speed => Motion::try_from_speed(s, x),
            Door::FlightTime => Motion::try_from_flight_time(s, FLIGHT_LENGTH as f32, x),
        }
    }

    fn build64(self, s: Species<f64>, x: f64) -> Result<Motion<f64>, Error> {
        match self {
            Door::KineticEnergy => Motion::try_from_kinetic_energy(s, x),
            Door::TotalEnergy => Motion::try_from_total_energy(s, x),
            Door::Gamma => Motion::try_from_gamma(s, x),
            Door::Beta => Motion::try_from_beta(s, x),
            Door::BetaGamma => Motion::try_from_beta_gamma(s, x),
            Door::Momentum => Motion::try_from_momentum(s, x),
            Door::MagneticRigidity => Motion::try_from_magnetic_rigidity(s, x),
            Door::ElectricRigidity => Motion::try_from_electric_rigidity(s, x),
            Door::Speed => Motion::try_from_speed(s, x),
            Door::FlightTime => Motion::try_from_flight_time(s, FLIGHT_LENGTH, x),
        }
    }

    /// The door's own quantity read back from a state (f64), to find the band's ends.
    fn read64(self, m: &Motion<f64>) -> f64 {
        match self {
            Door::KineticEnergy => m.kinetic_energy(),
            Door::TotalEnergy => m.total_energy(),
            Door::Gamma => m.gamma(),
            Door::Beta => m.beta(),
            Door::BetaGamma => m.beta_gamma(),
            Door::Momentum => m.momentum(),
            Door::MagneticRigidity => m.try_magnetic_rigidity().unwrap_or(f64::NAN),
            Door::ElectricRigidity => m.try_electric_rigidity().unwrap_or(f64::NAN),
            Door::Speed => m.speed(),
            Door::FlightTime => m.flight_time(FLIGHT_LENGTH),
        }
    }
}

fn quantities32(m: &Motion<f32>) -> [f32; N] {
    [
        m.kinetic_energy(),
        m.total_energy(),
        m.gamma(),
        m.gamma_minus_one(),
        m.beta(),
        m.one_minus_beta(),
        m.beta_gamma(),
        m.momentum(),
        m.speed(),
        m.flight_time_per_metre(),
        m.flight_time(FLIGHT_LENGTH as f32),
        m.try_magnetic_rigidity().unwrap_or(f32::NAN),
        m.try_electric_rigidity().unwrap_or(f32::NAN),
    ]
}

fn quantities64(m: &Motion<f64>) -> [f64; N] {
    [
        m.kinetic_energy(),
        m.total_energy(),
        m.gamma(),
        m.gamma_minus_one(),
        m.beta(),
        m.one_minus_beta(),
        m.beta_gamma(),
        m.momentum(),
        m.speed(),
        m.flight_time_per_metre(),
        m.flight_time(FLIGHT_LENGTH),
        m.try_magnetic_rigidity().unwrap_or(f64::NAN),
        m.try_electric_rigidity().unwrap_or(f64::NAN),
    ]
}

/// Why an accepted f32 state breaks its documented range, if it does.
fn out_of_range(q: &[f32; N], rest: f32) -> Option<&'static str> {
    let [t, e, g, gm1, b, omb, bg, pc, v, tpm, tof, brho, erho] = *q;
    // Documented: the flight times are +inf for a particle at rest, finite otherwise.
    let at_rest = b == 0.0 && tpm == f32::INFINITY && tof == f32::INFINITY;
    // flight_time(12.5 m) is +inf, IEEE overflow, where the exact 12.5 m/(βc) does not fit f32.
    let too_long = tof == f32::INFINITY && FLIGHT_LENGTH * f64::from(tpm) > f64::from(f32::MAX);
    let excused = |i: usize| (at_rest && (i == 9 || i == 10)) || (too_long && i == 10);
    if let Some(i) = (0..N).find(|&i| !q[i].is_finite() && !excused(i)) {
        return Some(NAMES[i]);
    }
    let c = 299_792_458.0_f32;
    let checks = [
        (t >= 0.0, "kinetic_energy < 0"),
        (e >= rest, "total_energy < rest energy"),
        (g >= 1.0, "gamma < 1"),
        (gm1 >= 0.0, "gamma_minus_one < 0"),
        ((0.0..=1.0).contains(&b), "beta outside [0, 1]"),
        (omb > 0.0 && omb <= 1.0, "one_minus_beta outside (0, 1]"),
        (bg >= 0.0, "beta_gamma < 0"),
        (pc >= 0.0, "momentum < 0"),
        ((0.0..=c).contains(&v), "speed outside [0, c]"),
        (tpm * c >= 1.0 - 1e-6, "flight_time_per_metre below 1/c"),
        (tof > 0.0, "flight_time <= 0"),
        (brho.abs() >= 0.0 && erho.abs() >= 0.0, "rigidity"),
    ];
    checks.iter().find(|(ok, _)| !ok).map(|(_, why)| *why)
}

/// Error of `x` against `reference` in the project's ulp measure: the relative error in units of
/// the f32 epsilon, `|x − ref| / (|ref| · 2⁻²³)` (an error of n such units is between n and 2n
/// true ulps); below the normal range the denominator is held at `MIN_POSITIVE · 2⁻²³`, the
/// subnormal spacing, so that rounding to a subnormal counts as at most one unit.
fn ulps32(x: f32, reference: f64) -> f64 {
    let x = f64::from(x);
    if x == reference {
        return 0.0;
    }
    if !x.is_finite() || !reference.is_finite() {
        return f64::INFINITY;
    }
    let scale = reference.abs().max(f64::from(f32::MIN_POSITIVE)) * f64::from(f32::EPSILON);
    (x - reference).abs() / scale
}

#[derive(Clone, Copy, Debug, Default)]
struct Worst {
    ulps: f64,
    input: f32,
    got: f32,
    want: f64,
}

#[derive(Clone, Debug, Default)]
struct Stats {
    tried: u64,
    both_ok: u64,
    both_err: u64,
    /// f32 refused an input that f64 accepted: (count, first input, error).
    err32_only: (u64, f32, Option<Error>),
    /// f32 accepted an input that f64 refused.
    ok32_only: (u64, f32, Option<Error>),
    /// f32 accepted and the state breaks its range: (count, input, what).
    bad_range: (u64, f32, &'static str),
    /// f32 and f64 disagree on accepting an input that lies between the f32 and the f64 value
    /// of the door's boundary (the rest energy for the total energy): the constant's rounding.
    rounding_mismatch: u64,
    worst: [Worst; N],
}

impl Stats {
    fn merge(&mut self, o: &Stats) {
        self.tried += o.tried;
        self.both_ok += o.both_ok;
        self.both_err += o.both_err;
        self.rounding_mismatch += o.rounding_mismatch;
        for (a, b) in [
            (&mut self.err32_only, &o.err32_only),
            (&mut self.ok32_only, &o.ok32_only),
        ] {
            if a.0 == 0 {
                a.1 = b.1;
                a.2 = b.2;
            }
            a.0 += b.0;
        }
        if self.bad_range.0 == 0 {
            self.bad_range.1 = o.bad_range.1;
            self.bad_range.2 = o.bad_range.2;
        }
        self.bad_range.0 += o.bad_range.0;
        for (a, b) in self.worst.iter_mut().zip(o.worst.iter()) {
            if b.ulps > a.ulps {
                *a = *b;
            }
        }
    }

    fn one(&mut self, door: Door, s32: Species<f32>, s64: Species<f64>, x: f32) {
        self.tried += 1;
        let r32 = door.build32(s32, x);
        let r64 = door.build64(s64, f64::from(x));
        match (r32, r64) {
            (Ok(m32), Ok(m64)) => {
                self.both_ok += 1;
                let q32 = quantities32(&m32);
                if let Some(why) = out_of_range(&q32, s32.rest_energy()) {
                    if self.bad_range.0 == 0 {
                        self.bad_range.1 = x;
                        self.bad_range.2 = why;
                    }
                    self.bad_range.0 += 1;
                }
                let q64 = quantities64(&m64);
                for i in 0..N {
                    let u = ulps32(q32[i], q64[i]);
                    if u > self.worst[i].ulps {
                        self.worst[i] = Worst {
                            ulps: u,
                            input: x,
                            got: q32[i],
                            want: q64[i],
                        };
                    }
                }
            }
            (Err(_), Err(_)) => self.both_err += 1,
            (Err(_), Ok(_)) | (Ok(_), Err(_)) if rounded_boundary(door, s64, x) => {
                self.rounding_mismatch += 1;
            }
            (Err(e), Ok(_)) => {
                if self.err32_only.0 == 0 {
                    self.err32_only.1 = x;
                    self.err32_only.2 = Some(e);
                }
                self.err32_only.0 += 1;
            }
            (Ok(m32), Err(e)) => {
                if self.ok32_only.0 == 0 {
                    self.ok32_only.1 = x;
                    self.ok32_only.2 = Some(e);
                }
                self.ok32_only.0 += 1;
                if let Some(why) = out_of_range(&quantities32(&m32), s32.rest_energy()) {
                    if self.bad_range.0 == 0 {
                        self.bad_range.1 = x;
                        self.bad_range.2 = why;
                    }
                    self.bad_range.0 += 1;
                }
            }
        }
    }
}

/// True when `x` lies within one f32 epsilon of the door's boundary, where the f32 and f64
/// values of the boundary constant (the rest energy) decide differently.
fn rounded_boundary(door: Door, s64: Species<f64>, x: f32) -> bool {
    let m = s64.rest_energy();
    door == Door::TotalEnergy && (f64::from(x) - m).abs() <= m * f64::from(f32::EPSILON)
}

/// Runs `one` on every `stride`-th u32 bit pattern in `[lo, hi]`, on `threads` threads.
fn sweep(
    door: Door,
    s32: Species<f32>,
    s64: Species<f64>,
    lo: u32,
    hi: u32,
    stride: u64,
    threads: usize,
) -> Stats {
    const CHUNK: u64 = 1 << 16;
    let count = (u64::from(hi) - u64::from(lo)) / stride + 1;
    let chunks = count.div_ceil(CHUNK);
    let next = AtomicU64::new(0);
    let mut total = Stats::default();
    std::thread::scope(|scope| {
        let handles: Vec<_> = (0..threads)
            .map(|_| {
                scope.spawn(|| {
                    let mut st = Stats::default();
                    loop {
                        let c = next.fetch_add(1, Ordering::Relaxed);
                        if c >= chunks {
                            break;
                        }
                        let first = c * CHUNK;
                        let last = ((c + 1) * CHUNK).min(count);
                        for k in first..last {
                            let bits = u64::from(lo) + k * stride;
                            st.one(door, s32, s64, f32::from_bits(bits as u32));
                        }
                    }
                    st
                })
            })
            .collect();
        for h in handles {
            total.merge(&h.join().expect("sweep thread panicked"));
        }
    });
    total
}

/// The f32 bit range of the door's quantity over the kinetic energies `[t_low, t_high]`.
fn band(door: Door, s64: Species<f64>, t_low: f64, t_high: f64) -> (u32, u32) {
    let at = |t: f64| {
        let m = Motion::try_from_kinetic_energy(s64, t).expect("band end");
        door.read64(&m)
    };
    let (a, b) = (at(t_low), at(t_high));
    let (lo, hi) = (a.min(b), a.max(b));
    // Round outwards so the band covers both ends.
    let mut lo32 = lo as f32;
    if f64::from(lo32) > lo {
        lo32 = f32::from_bits(lo32.to_bits() - 1);
    }
    let mut hi32 = hi as f32;
    if f64::from(hi32) < hi {
        hi32 = f32::from_bits(hi32.to_bits() + 1);
    }
    (lo32.to_bits(), hi32.to_bits())
}

/// One pass of the band: a door over a range of kinetic energies, held to the bound or only
/// reported (a range where the door's documentation states a conditioning loss).
struct Pass {
    door: Door,
    label: &'static str,
    /// Lower end of the kinetic-energy band for a rest energy `m` (eV).
    t_low: fn(f64) -> f64,
    t_high: fn(f64) -> f64,
    bounded: bool,
}

const PASSES: [Pass; 11] = [
    Pass::full(Door::KineticEnergy),
    Pass {
        door: Door::TotalEnergy,
        label: "T >= m/2",
        t_low: |m| m / 2.0,
        t_high: |_| T_HIGH,
        bounded: true,
    },
    Pass {
        door: Door::TotalEnergy,
        label: "T < m/2, documented conditioning m/T, not bounded",
        t_low: |_| T_LOW,
        t_high: |m| m / 2.0,
        bounded: false,
    },
    Pass::full(Door::Gamma),
    Pass::full(Door::Beta),
    Pass::full(Door::BetaGamma),
    Pass::full(Door::Momentum),
    Pass::full(Door::MagneticRigidity),
    Pass::full(Door::ElectricRigidity),
    Pass::full(Door::Speed),
    Pass::full(Door::FlightTime),
];

impl Pass {
    const fn full(door: Door) -> Self {
        Self {
            door,
            label: "",
            t_low: |_| T_LOW,
            t_high: |_| T_HIGH,
            bounded: true,
        }
    }
}

/// Findings already reported to the quantity's owner and not yet fixed: a failure whose text
/// ends with one of these is printed as KNOWN and does not fail the run. Remove each entry with
/// its fix.
const KNOWN: [(&str, &str); 0] = [];

fn arg(args: &[String], name: &str, default: u64) -> u64 {
    args.iter()
        .position(|a| a == name)
        .and_then(|i| args.get(i + 1))
        .map_or(default, |v| v.parse().expect("numeric argument"))
}

fn main() {
    let args: Vec<String> = std::env::args().collect();
    let stride = arg(&args, "--stride", 1).max(1);
    let wide_stride = arg(&args, "--wide-stride", 256).max(1);
    // The doors other than the kinetic energy (the inverse direction) may be sampled more
    // sparsely than the forward one when time is short.
    let inverse_stride = arg(&args, "--inverse-stride", stride).max(1);
    // --only-inverse: skip the kinetic-energy door (for a second run of the other doors).
    let only_inverse = args.iter().any(|a| a == "--only-inverse");
    let threads = arg(
        &args,
        "--threads",
        std::thread::available_parallelism().map_or(2, |n| n.get() as u64),
    ) as usize;
    let bound = arg(&args, "--bound", 8) as f64;
    let species: [(&str, Species<f32>, Species<f64>); 3] = [
        ("electron", Species::ELECTRON, Species::ELECTRON),
        ("proton", Species::PROTON, Species::PROTON),
        ("alpha", Species::ALPHA, Species::ALPHA),
    ];
    println!(
        "sweep: band T = {T_LOW} eV .. {T_HIGH:e} eV, stride {stride} (other doors: \
         {inverse_stride}); wide pass every {wide_stride}th u32; {threads} threads; bound {bound} \
         (relative error in units of the f32 epsilon 2^-23)"
    );

    let start = Instant::now();
    let mut failures: Vec<String> = Vec::new();
    let mut overall = [Worst::default(); N];
    let mut overall_where = [("", ""); N];
    let mut report = String::new();
    let (mut band_total, mut wide_total, mut rounding_total) = (0u64, 0u64, 0u64);
    for pass in &PASSES {
        let door = pass.door;
        if only_inverse && door == Door::KineticEnergy {
            continue;
        }
        let mut door_worst = [Worst::default(); N];
        for &(sname, s32, s64) in &species {
            let t0 = Instant::now();
            let m = s64.rest_energy();
            let (lo, hi) = band(door, s64, (pass.t_low)(m), (pass.t_high)(m));
            let door_stride = if door == Door::KineticEnergy {
                stride
            } else {
                inverse_stride
            };
            let st = sweep(door, s32, s64, lo, hi, door_stride, threads);
            band_total += st.tried;
            // The wide pass once per door (on its first, bounded pass).
            let wide = if pass.bounded {
                sweep(door, s32, s64, 0, u32::MAX, wide_stride, threads)
            } else {
                Stats::default()
            };
            wide_total += wide.tried;
            rounding_total += st.rounding_mismatch + wide.rounding_mismatch;
            println!(
                "{:<32} {:<8} band [{:e}, {:e}] {} inputs ({} both ok, {} both refused); wide {} \
                 inputs; {:.1} s {}",
                door.name(),
                sname,
                f32::from_bits(lo),
                f32::from_bits(hi),
                st.tried,
                st.both_ok,
                st.both_err,
                wide.tried,
                t0.elapsed().as_secs_f64(),
                pass.label,
            );
            let mut line = format!("  worst (stride {door_stride}):");
            for (name, w) in NAMES.iter().zip(st.worst.iter()) {
                let _ = write!(line, " {name}={:.2}", w.ulps);
            }
            println!("{line}");
            for (label, s, in_band) in [("band", &st, true), ("wide", &wide, false)] {
                if s.err32_only.0 > 0 {
                    let msg = format!(
                        "{} {sname} {label}: f32 refused {} inputs f64 accepted, first x = {:e} \
                         ({:#010x}) with {:?}",
                        door.name(),
                        s.err32_only.0,
                        s.err32_only.1,
                        s.err32_only.1.to_bits(),
                        s.err32_only.2
                    );
                    // Outside the band, f32 may refuse with Overflow what f64 still holds.
                    if in_band || s.err32_only.2 != Some(Error::Overflow) {
                        failures.push(msg);
                    } else {
                        println!("  (documented) {msg}");
                    }
                }
                if s.ok32_only.0 > 0 {
                    failures.push(format!(
                        "{} {sname} {label}: f32 accepted {} inputs f64 refused, first x = {:e} \
                         ({:#010x}), f64 said {:?}",
                        door.name(),
                        s.ok32_only.0,
                        s.ok32_only.1,
                        s.ok32_only.1.to_bits(),
                        s.ok32_only.2
                    ));
                }
                if s.bad_range.0 > 0 {
                    failures.push(format!(
                        "{} {sname} {label}: {} accepted states out of range, first x = {:e} \
                         ({:#010x}): {}",
                        door.name(),
                        s.bad_range.0,
                        s.bad_range.1,
                        s.bad_range.1.to_bits(),
                        s.bad_range.2
                    ));
                }
            }
            for i in 0..N {
                let w = st.worst[i];
                if w.ulps > door_worst[i].ulps {
                    door_worst[i] = w;
                }
                if !pass.bounded {
                    continue;
                }
                if w.ulps > overall[i].ulps {
                    overall[i] = w;
                    overall_where[i] = (door.name(), sname);
                }
                if w.ulps > bound {
                    failures.push(format!(
                        "{} {sname}: {} off by {:.2} ulp at x = {:e} ({:#010x}): f32 {:e}, f64 {:e}",
                        door.name(),
                        NAMES[i],
                        w.ulps,
                        w.input,
                        w.input.to_bits(),
                        w.got,
                        w.want
                    ));
                }
            }
        }
        let _ = writeln!(
            report,
            "\n{} {} (worst over the three species):",
            door.name(),
            pass.label
        );
        for i in 0..N {
            let w = door_worst[i];
            let _ = writeln!(
                report,
                "  {:<22} {:>10.2} ulp at x = {:e} ({:#010x})",
                NAMES[i],
                w.ulps,
                w.input,
                w.input.to_bits()
            );
        }
    }
    println!("{report}");
    println!("worst per quantity over every bounded door and species:");
    println!("| quantity | worst ulp | door | species | input x (f32) | f32 value | f64 value |");
    println!("| --- | --- | --- | --- | --- | --- | --- |");
    for i in 0..N {
        let w = overall[i];
        println!(
            "| {} | {:.2} | {} | {} | {:e} | {:e} | {:e} |",
            NAMES[i], w.ulps, overall_where[i].0, overall_where[i].1, w.input, w.got, w.want
        );
    }
    println!(
        "sweep: {band_total} band inputs and {wide_total} wide inputs in {:.1} s; {rounding_total} \
         inputs between the f32 and f64 rest energy decided differently (constant rounding)",
        start.elapsed().as_secs_f64()
    );
    let (known, failures): (Vec<String>, Vec<String>) = failures
        .into_iter()
        .partition(|f| KNOWN.iter().any(|(pattern, _)| f.ends_with(pattern)));
    for k in &known {
        let why = KNOWN
            .iter()
            .find(|(p, _)| k.ends_with(p))
            .map_or("", |(_, w)| w);
        println!("sweep: KNOWN (reported, not yet fixed: {why}): {k}");
    }
    if failures.is_empty() {
        println!(
            "sweep: every bounded worst case within {bound} ulp; every accepted state finite \
                  and in range; f32 and f64 agree on every refusal"
        );
    } else {
        println!("sweep: {} FAILURES:", failures.len());
        for f in &failures {
            println!("  {f}");
        }
        std::process::exit(1);
    }
}
