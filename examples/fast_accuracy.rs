//! Worst error of the `f32` kinematics from a kinetic energy, the exact path (`Motion`, libm's
//! `sqrtf`) against the micromath fast path (`fourforce::fast`), over a dense sweep against `f64`.
//!
//! `cargo run --release --example fast_accuracy --features micromath`
//!
//! Prints one line `accuracy <quantity> <libm worst eps> <micromath worst eps>` per quantity
//! (worst relative error in eps = 2⁻²³; ci/firmware joins them with the instruction counts of
//! the chip into the README table) and exits
//! non-zero if the fast path exceeds its documented bound (src/fast.rs) or the exact path exceeds
//! 8 eps. The reference is `Motion<f64>` built from the same `f32` inputs widened exactly (its own
//! error, about 1e-16, is 1e-9 eps of f32).

use fourforce::{Error, Motion, Real, Species, fast};
use std::process::ExitCode;

/// The fast path's documented bound, in eps of f32 (1.74e-3 relative).
const FAST_BOUND_EPS: f64 = 14_600.0;
/// What the exact path is held to here (its own per-accessor bounds are in `Motion`'s docs).
const EXACT_BOUND_EPS: f64 = 8.0;
const LENGTH_M: f32 = 1.5;

/// The same species in `f64`, from its `f32` values (exact).
fn to_f64(s: Species<f32>) -> Species<f64> {
    Species::try_new(s.rest_energy().into(), s.charge().into()).expect("a species stays one in f64")
}

fn species() -> [Species<f32>; 10] {
    [
        Species::ELECTRON,
        Species::POSITRON,
        Species::PROTON,
        Species::ANTIPROTON,
        Species::MUON,
        Species::ANTIMUON,
        Species::DEUTERON,
        Species::TRITON,
        Species::HELION,
        Species::ALPHA,
    ]
}

/// Relative error of `got` against `want` in eps of f32.
fn eps(got: f32, want: f64) -> f64 {
    ((f64::from(got) - want) / want).abs() / f64::from(f32::EPSILON)
}

type Quantity = (
    &'static str,
    fn(&Motion<f32>) -> Result<f32, Error>,
    fn(&Motion<f64>) -> Result<f64, Error>,
    fn(Species<f32>, f32) -> Result<f32, Error>,
);

fn main() -> ExitCode {
    let quantities: [Quantity; 5] = [
        ("beta", |m| Ok(m.beta()), |m| Ok(m.beta()), fast::try_beta),
        (
            "pc",
            |m| Ok(m.momentum()),
            |m| Ok(m.momentum()),
            fast::try_momentum,
        ),
        (
            "brho",
            Motion::try_magnetic_rigidity,
            Motion::try_magnetic_rigidity,
            fast::try_magnetic_rigidity,
        ),
        ("v", |m| Ok(m.speed()), |m| Ok(m.speed()), fast::try_speed),
        (
            "tof",
            |m| Ok(m.flight_time(LENGTH_M)),
            |m| Ok(m.flight_time(f64::from(LENGTH_M))),
            |s, t| fast::try_flight_time(s, t, LENGTH_M),
        ),
    ];
    let mut ok = true;

    // sqrt itself: every 3rd significand of [1, 4) (the pattern repeats with powers of four),
    // and decades from 1e-30 to 1e30.
    let (mut exact, mut approx) = (0.0f64, 0.0f64);
    let decades = (-300..=300).map(|i| 10f64.powf(f64::from(i) / 10.0) as f32);
    let significands = (1.0f32.to_bits()..4.0f32.to_bits())
        .step_by(3)
        .map(f32::from_bits);
    for x in significands.chain(decades) {
        let want = f64::from(x).sqrt();
        exact = exact.max(eps(Real::sqrt(x), want));
        approx = approx.max(eps(fast::sqrt(x), want));
    }
    println!("accuracy sqrt {exact:.2} {approx:.0}");
    ok &= exact <= 0.5 && approx <= FAST_BOUND_EPS;

    // gamma needs no root: the fast path has no function of its own.
    let mut gamma = 0.0f64;
    for s in species() {
        let s64 = to_f64(s);
        for i in -600..=3600 {
            let t = 10f64.powf(f64::from(i) / 200.0) as f32;
            if let (Ok(m32), Ok(m64)) = (
                Motion::try_from_kinetic_energy(s, t),
                Motion::try_from_kinetic_energy(s64, f64::from(t)),
            ) {
                gamma = gamma.max(eps(m32.gamma(), m64.gamma()));
            }
        }
    }
    // The fast path has no gamma of its own (no root in it): "-".
    println!("accuracy gamma {gamma:.2} -");
    ok &= gamma <= EXACT_BOUND_EPS;

    for (name, exact_of, reference_of, fast_of) in quantities {
        let (mut exact, mut approx) = (0.0f64, 0.0f64);
        for s in species() {
            let s64 = to_f64(s);
            // 1 meV to 1 PeV, 200 energies per decade; T = 0 has zero results (no relative error).
            for i in -600..=3600 {
                let t = 10f64.powf(f64::from(i) / 200.0) as f32;
                let m32 = Motion::try_from_kinetic_energy(s, t);
                let m64 = Motion::try_from_kinetic_energy(s64, f64::from(t));
                let (Ok(m32), Ok(m64)) = (m32, m64) else {
                    println!("{name}: {s:?} T = {t} eV refused: {m32:?} / {m64:?}");
                    ok = false;
                    continue;
                };
                match (exact_of(&m32), reference_of(&m64), fast_of(s, t)) {
                    (Ok(a), Ok(want), Ok(b)) => {
                        exact = exact.max(eps(a, want));
                        approx = approx.max(eps(b, want));
                    }
                    other => {
                        println!("{name}: {s:?} T = {t} eV: {other:?}");
                        ok = false;
                    }
                }
            }
        }
        println!("accuracy {name} {exact:.2} {approx:.0}");
        ok &= exact <= EXACT_BOUND_EPS && approx <= FAST_BOUND_EPS;
    }
    if ok {
        println!("fast_accuracy: every bound holds");
        ExitCode::SUCCESS
    } else {
        println!("fast_accuracy: a bound is exceeded (see above)");
        ExitCode::FAILURE
    }
}
