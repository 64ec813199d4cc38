//! `Motion` against the 50-digit mpmath reference vectors of tests/reference/ (written by
//! tests/reference/generate_kinematics.py from CODATA 2018 and the exact c and e of the SI 2019),
//! in both precisions.
//!
//! Asserts the promise of the crate: every quantity within 8 eps (relative error <= 8 * 2^-23 in
//! f32, 8 * 2^-52 in f64) for every species and every kinetic energy from 1 eV to 100 TeV, and
//! for states built from any other quantity given exactly in the precision. The only allowance:
//! a state built from the total energy inherits the rounding of the rest energy, amplified by
//! m/T (the conditioning of the input, which no formula removes); that term is added
//! to its bound and printed.
//!
//! `cargo test -p fourforce-checks --test suite -- kinematics::reference_vectors:: --nocapture` prints the worst case per quantity,
//! ours beside the naive textbook formulas (reference/naive.rs).
#![allow(clippy::unwrap_used, clippy::float_cmp)]

use crate::reference as support;
use crate::tolerance::MOTION;

use fourforce::{Motion, Real, Species};
use support::{Exact, QUANTITIES, naive, parse, read, species};

/// Every quantity of every state within this many eps (the promise of `Motion`).
const BOUND: f64 = MOTION.f32;
const _: () = assert!(MOTION.f32 == MOTION.f64);

#[derive(Clone, Default)]
struct Worst {
    eps: f64,
    at: String,
}

impl Worst {
    fn see(&mut self, eps: f64, at: impl FnOnce() -> String) {
        let eps = if eps.is_nan() { f64::INFINITY } else { eps };
        if eps > self.eps || self.at.is_empty() {
            self.eps = eps;
            self.at = at();
        }
    }
}

fn build<T: Real>(from: &str, s: Species<T>, x: T) -> Result<Motion<T>, fourforce::Error> {
    match from {
        "total_energy" => Motion::try_from_total_energy(s, x),
        "gamma" => Motion::try_from_gamma(s, x),
        "beta" => Motion::try_from_beta(s, x),
        "beta_gamma" => Motion::try_from_beta_gamma(s, x),
        "momentum" => Motion::try_from_momentum(s, x),
        "magnetic_rigidity" => Motion::try_from_magnetic_rigidity(s, x),
        "electric_rigidity" => Motion::try_from_electric_rigidity(s, x),
        "speed" => Motion::try_from_speed(s, x),
        "flight_time" => Motion::try_from_flight_time(s, T::from_f64(support::TOF_LENGTH), x),
        other => panic!("unknown constructor {other}"),
    }
}

fn naive_kinetic<T: Real>(from: &str, s: Species<T>, x: T) -> T {
    let (m, q) = (s.rest_energy(), s.charge());
    match from {
        "total_energy" => naive::kinetic_from_total_energy(m, x),
        "gamma" => naive::kinetic_from_gamma(m, x),
        "beta" => naive::kinetic_from_beta(m, x),
        "beta_gamma" => naive::kinetic_from_beta_gamma(m, x),
        "momentum" => naive::kinetic_from_momentum(m, x),
        "magnetic_rigidity" => naive::kinetic_from_magnetic_rigidity(m, q, x),
        "electric_rigidity" => naive::kinetic_from_electric_rigidity(m, q, x),
        "speed" => naive::kinetic_from_speed(m, x),
        "flight_time" => naive::kinetic_from_flight_time(m, T::from_f64(support::TOF_LENGTH), x),
        other => panic!("unknown constructor {other}"),
    }
}

fn label<T: Real>() -> &'static str {
    if T::MANTISSA_DIGITS == 24 {
        "f32"
    } else {
        "f64"
    }
}

/// States from the kinetic energy: every quantity of every grid row.
fn forward<T: Real>() {
    let rows = support::forward();
    assert!(rows.len() > 2900, "reference file truncated");
    let mut ours = vec![Worst::default(); QUANTITIES.len()];
    let mut textbook = vec![Worst::default(); QUANTITIES.len()];
    for row in &rows {
        let s = species::<T>(&row.species, &row.rest_energy_ev);
        let t: T = parse(&row.kinetic_ev);
        assert_eq!(
            t.to_f64(),
            row.kinetic_ev.parse::<f64>().unwrap(),
            "grid not exact"
        );
        let m = Motion::try_from_kinetic_energy(s, t).unwrap();
        let got = read(&m);
        let plain = naive::all(s.rest_energy(), s.charge(), t);
        for (i, want) in row.values.iter().enumerate() {
            let at = || format!("{} T = {} eV", row.species, row.kinetic_ev);
            ours[i].see(want.eps_error(got[i]), at);
            textbook[i].see(want.eps_error(plain[i]), at);
        }
    }
    println!(
        "\n{} from kinetic energy, {} states, worst relative error in eps of the format:",
        label::<T>(),
        rows.len()
    );
    println!(
        "{:<20} {:>8} {:>12}   where (ours)",
        "quantity", "ours", "naive"
    );
    for (i, q) in QUANTITIES.iter().enumerate() {
        println!(
            "{q:<20} {:>8.2} {:>12.3e}   {}",
            ours[i].eps, textbook[i].eps, ours[i].at
        );
    }
    for (i, q) in QUANTITIES.iter().enumerate() {
        assert!(
            ours[i].eps <= BOUND,
            "{}: {q} {:.2} eps at {}",
            label::<T>(),
            ours[i].eps,
            ours[i].at
        );
    }
}

/// States from every other quantity, given exactly in the precision.
fn inverse<T: Real>() {
    let rows = support::inverse();
    let kinds = [
        "total_energy",
        "gamma",
        "beta",
        "beta_gamma",
        "momentum",
        "magnetic_rigidity",
        "electric_rigidity",
        "speed",
        "flight_time",
    ];
    let mut ours = vec![Worst::default(); kinds.len()];
    let mut kinetic = vec![Worst::default(); kinds.len()];
    let mut textbook = vec![Worst::default(); kinds.len()];
    let mut counted = vec![0_usize; kinds.len()];
    let mut skipped = vec![0_usize; kinds.len()];
    let mut failures = Vec::new();
    for row in &rows {
        if row.prec == "f64" && T::MANTISSA_DIGITS == 24 {
            continue;
        }
        let k = kinds.iter().position(|&k| k == row.from).unwrap();
        let s = species::<T>(&row.species, &row.rest_energy_ev);
        let x: T = parse(&row.input);
        assert_eq!(
            x.to_f64(),
            row.input.parse::<f64>().unwrap(),
            "input not exact"
        );
        let m = build(&row.from, s, x).unwrap();
        // The one inherited term: the rest energy's own rounding, times m/T, for a state from
        // the total energy (zero for the other constructors, whose condition in m is <= 1).
        let allowance = if row.from == "total_energy" {
            let exact_m = Exact::parse(&row.rest_energy_ev);
            let rel_m = exact_m.eps_error(s.rest_energy());
            rel_m * exact_m.hi / row.kinetic_ev.hi
        } else {
            0.0
        };
        let at = || format!("{} from {} = {}", row.species, row.from, row.input);
        if allowance > BOUND {
            // Ill-conditioned: the total energy cannot tell T from the rounding of m. Counted,
            // not asserted (documented on try_from_total_energy).
            skipped[k] += 1;
            continue;
        }
        let err_t = row.kinetic_ev.eps_error(m.kinetic_energy()) - allowance;
        counted[k] += 1;
        kinetic[k].see(err_t, at);
        let mut worst_row = err_t;
        for (i, want) in row.values.iter().enumerate() {
            let e = want.eps_error(read(&m)[i]);
            worst_row = worst_row.max(e);
        }
        let worst_row = worst_row - allowance;
        ours[k].see(worst_row, || format!("{} (allowance {allowance:.2})", at()));
        if worst_row > BOUND {
            failures.push(format!(
                "{}: {:.2} eps (allowance {allowance:.2})",
                at(),
                worst_row
            ));
        }
        textbook[k].see(row.kinetic_ev.eps_error(naive_kinetic(&row.from, s, x)), at);
    }
    println!(
        "\n{} from another quantity, worst relative error in eps (every quantity and T; \
         beyond the inherited allowance for total energy; rows where that allowance alone\n\
         exceeds the bound are skipped and counted):",
        label::<T>()
    );
    println!(
        "{:<18} {:>5} {:>5} {:>8} {:>8} {:>12}   where (ours)",
        "from", "rows", "skip", "all", "T", "naive T"
    );
    for (k, name) in kinds.iter().enumerate() {
        println!(
            "{name:<18} {:>5} {:>5} {:>8.2} {:>8.2} {:>12.3e}   {}",
            counted[k], skipped[k], ours[k].eps, kinetic[k].eps, textbook[k].eps, ours[k].at
        );
        assert!(counted[k] > 100, "{name}: too few rows");
    }
    assert!(failures.is_empty(), "{}", failures.join("\n"));
}

#[test]
fn from_kinetic_energy_f32() {
    forward::<f32>();
}

#[test]
fn from_kinetic_energy_f64() {
    forward::<f64>();
}

#[test]
fn from_other_quantities_f32() {
    inverse::<f32>();
}

#[test]
fn from_other_quantities_f64() {
    inverse::<f64>();
}
