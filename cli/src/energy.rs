//! `fourforce energy`: several witnesses of one beam energy, their implied energies, the fused
//! energy, whether they agree, and which one does not ([`fourforce::witness`]).

use std::io::{self, BufWriter, Write};
use std::process::ExitCode;

use fourforce::Species;
use fourforce::witness::{Alpha, MAX_WITNESSES, Reading, Watch};

use crate::input;
use crate::precision::{Float, Precision, sci};
use crate::species;

const LONG_ABOUT: &str = "\
Is this energy right? Several witnesses of one beam energy, each with its standard uncertainty:
the kinetic energy each implies (first-order uncertainty), the inverse-variance weighted mean,
chi-square with n - 1 degrees of freedom, the verdict at the level alpha and the outlier.

INPUT (standard input), one reading per line, at most 16:
    kinetic,T_MeV,sigma_MeV                     the accelerator's energy readback
    tof,t_s,sigma_s,baseline_m                  a time of flight over a baseline
    dipole,B_T,sigma_T,radius_m                 the field of a dipole that centres the beam
    deflector,E_V_per_m,sigma_V_per_m,radius_m  the field of an electrostatic deflector
    speed,v_m_per_s,sigma_m_per_s               a speed
    Numbers are parsed straight into the chosen precision. Blank lines and lines starting with #
    are skipped; line numbers count every line.

OUTPUT (standard output), in input order:
    reading,<i>,<kind>,<T_MeV>,<sigma_MeV>      i from 1: the energy the reading implies
    then one line
    fused,<T_MeV>,<sigma_MeV>,<chi2>,<dof>,<consistent|inconsistent>,<outlier>
    outlier: the index of the witness whose removal leaves the smallest chi-square, when the
    witnesses disagree, there are at least three, and the others agree without it; else 0.
    Values have 17 significant digits with --f64, 9 with --f32. Implied and fused energies are
    within 16 eps of the exact values for the readings as parsed, sigmas within 64 eps.

CONSISTENCY
    Inconsistent when the upper-tail probability of chi-square with n - 1 degrees of freedom is
    below alpha, that is when chi-square exceeds the critical value. For alpha = 0.1, 0.05,
    0.025, 0.01, 0.001 (the default), 1e-4, 1e-5 and 1e-6 the critical value comes from the
    library's const table (what the firmware uses); for any other alpha in (0, 1) it is computed
    here in f64 by solving Q(k/2, x/2) = alpha (Q the regularized upper incomplete gamma
    function, in closed form for integer k) to 1e-12 relative, in either precision.

ERRORS
    A bad reading (unknown kind, wrong field count, not a number, or impossible: negative or
    too short time, speed >= c, zero or negative field, non-finite value, sigma <= 0, ...) is
    reported on standard error as `line N: reason`; every bad line is reported and nothing is
    fused or printed.

EXIT CODES
    0 the witnesses agree; 1 they do not; 2 bad input (a bad reading, no reading, more than 16,
    a bad option or an unreadable standard input).";

/// Fuses witnesses of one beam energy read as CSV on standard input and judges their agreement.
#[derive(clap::Args)]
#[command(long_about = LONG_ABOUT)]
pub struct Args {
    #[command(flatten)]
    precision: Precision,
    /// The species: a name or custom:<rest_energy_MeV>:<charge_in_e>.
    #[arg(long, value_name = "NAME", value_parser = species::name_arg)]
    species: String,
    /// Significance level of the consistency test, in (0, 1).
    #[arg(long, value_name = "A", default_value = "1e-3", value_parser = alpha_arg)]
    alpha: f64,
}

/// A value parser for `--alpha`: a number strictly between 0 and 1.
fn alpha_arg(text: &str) -> Result<f64, String> {
    match text.trim().parse::<f64>() {
        Ok(a) if a > 0.0 && a < 1.0 => Ok(a),
        _ => Err(format!("`{text}` is not a level between 0 and 1")),
    }
}

/// A reading from one line (`Ok(None)` for a blank or comment line); T and sigma in MeV become eV.
fn reading<T: Float>(text: &str) -> Result<Option<(Reading<T>, &'static str)>, String> {
    let text = text.trim();
    if text.is_empty() || text.starts_with('#') {
        return Ok(None);
    }
    let fields: Vec<&str> = text.split(',').map(str::trim).collect();
    let (kind, format) = match fields[0] {
        "kinetic" => ("kinetic", "kinetic,T_MeV,sigma_MeV"),
        "tof" => ("tof", "tof,t_s,sigma_s,baseline_m"),
        "dipole" => ("dipole", "dipole,B_T,sigma_T,radius_m"),
        "deflector" => ("deflector", "deflector,E_V_per_m,sigma_V_per_m,radius_m"),
        "speed" => ("speed", "speed,v_m_per_s,sigma_m_per_s"),
        other => {
            return Err(format!(
                "unknown witness `{other}`: expected kinetic, tof, dipole, deflector or speed"
            ));
        }
    };
    let wanted = format.split(',').count();
    if fields.len() != wanted {
        return Err(format!(
            "expected {wanted} fields `{format}`, found {}",
            fields.len()
        ));
    }
    let mut x = [T::ZERO; 3];
    for (slot, field) in x.iter_mut().zip(&fields[1..]) {
        *slot = field
            .parse::<T>()
            .map_err(|_| format!("`{field}` is not a number"))?;
    }
    let [a, b, c] = x;
    let mev = T::from_f64(1.0e6);
    let r = match kind {
        "kinetic" => Reading::Kinetic {
            kinetic_ev: a * mev,
            sigma_ev: b * mev,
        },
        "tof" => Reading::FlightTime {
            time_s: a,
            sigma_s: b,
            baseline_m: c,
        },
        "dipole" => Reading::Dipole {
            field_t: a,
            sigma_t: b,
            radius_m: c,
        },
        "deflector" => Reading::Deflector {
            field_v_per_m: a,
            sigma_v_per_m: b,
            radius_m: c,
        },
        _ => Reading::Speed {
            speed_m_per_s: a,
            sigma_m_per_s: b,
        },
    };
    Ok(Some((r, kind)))
}

/// Upper-tail probability `Q(k/2, x/2)` of chi-square with `k ≥ 1` degrees of freedom, in closed
/// form: `e^{-x/2} Σ_{i<k/2} (x/2)^i/i!` for even `k`; for odd `k`
/// `erfc(√(x/2)) + e^{-x/2} Σ_{i=1}^{(k-1)/2} (x/2)^{i-1/2}/Γ(i + 1/2)`. Sums of positive terms.
fn upper_tail(k: usize, x: f64) -> f64 {
    let h = x / 2.0;
    if k % 2 == 0 {
        let (mut term, mut sum) = (1.0, 1.0);
        for i in 1..k / 2 {
            term *= h / i as f64;
            sum += term;
        }
        (-h).exp() * sum
    } else {
        // Γ(3/2) = √π/2, Γ(i + 3/2) = (i + 1/2) Γ(i + 1/2).
        let mut term = h.sqrt() / (std::f64::consts::PI.sqrt() / 2.0);
        let mut sum = 0.0;
        for i in 1..=(k - 1) / 2 {
            if i > 1 {
                term *= h / (i as f64 - 0.5);
            }
            sum += term;
        }
        libm::erfc(h.sqrt()) + (-h).exp() * sum
    }
}

/// The critical value `x` with `Q(k/2, x/2) = alpha`, by bisection (the tail falls with `x`).
fn critical_value(k: usize, alpha: f64) -> f64 {
    let (mut lo, mut hi) = (0.0_f64, 1.0_f64);
    while upper_tail(k, hi) > alpha {
        hi *= 2.0;
    }
    for _ in 0..200 {
        let mid = 0.5 * (lo + hi);
        if mid <= lo || mid >= hi {
            break;
        }
        if upper_tail(k, mid) > alpha {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    0.5 * (lo + hi)
}

/// What one run produced: the output lines, or every bad line's report.
fn assess<T: Float>(species: Species<T>, alpha: f64, lines: &[(usize, String)]) -> Result<(Vec<String>, bool), Vec<String>> {
    let mut watch = Watch::<T, MAX_WITNESSES>::new();
    let mut kinds = Vec::new();
    let mut numbers = Vec::new();
    let mut bad = Vec::new();
    for (n, text) in lines {
        match reading::<T>(text) {
            Ok(None) => {}
            Ok(Some((r, kind))) => {
                if let Err(e) = r.try_estimate(species) {
                    bad.push(format!("line {n}: {kind}: {e}"));
                } else if watch.try_push(r).is_err() {
                    bad.push(format!("line {n}: more than {MAX_WITNESSES} readings"));
                } else {
                    kinds.push(kind);
                    numbers.push(*n);
                }
            }
            Err(reason) => bad.push(format!("line {n}: {reason}")),
        }
    }
    if watch.is_empty() && bad.is_empty() {
        bad.push("no reading on standard input".to_owned());
    }
    if !bad.is_empty() {
        return Err(bad);
    }
    let result = match Alpha::from_value(alpha) {
        Some(a) => watch.try_assess(species, a),
        None => watch.try_assess_with(species, |k| T::from_f64(critical_value(k, alpha))),
    };
    let a = result.map_err(|e| {
        let n = numbers.get(e.index()).copied().unwrap_or(0);
        vec![format!("line {n}: {}", e.error())]
    })?;
    let mev = T::from_f64(1.0e6);
    let mut out = Vec::new();
    for (i, (e, kind)) in a.estimates().iter().zip(&kinds).enumerate() {
        out.push(format!(
            "reading,{},{kind},{},{}",
            i + 1,
            sci(e.kinetic_energy() / mev),
            sci(e.uncertainty() / mev)
        ));
    }
    let f = a.fused();
    out.push(format!(
        "fused,{},{},{},{},{},{}",
        sci(f.kinetic_energy() / mev),
        sci(f.uncertainty() / mev),
        sci(a.chi_squared()),
        a.degrees_of_freedom(),
        if a.is_consistent() { "consistent" } else { "inconsistent" },
        a.outlier().map_or(0, |j| j + 1)
    ));
    Ok((out, a.is_consistent()))
}

fn run_in<T: Float>(args: &Args) -> io::Result<ExitCode> {
    let species = match species::parse::<T>(&args.species) {
        Ok(s) => s,
        Err(e) => {
            eprintln!("fourforce energy: {e}");
            return Ok(ExitCode::from(2));
        }
    };
    let mut lines = Vec::new();
    let mut bad = Vec::new();
    input::for_each_line(|n, text| {
        match text {
            Ok(t) => lines.push((n, t.to_owned())),
            Err(reason) => bad.push(format!("line {n}: {reason}")),
        }
        Ok::<(), io::Error>(())
    })?;
    let result = assess::<T>(species, args.alpha, &lines);
    let mut err = io::stderr().lock();
    match (bad.is_empty(), result) {
        (true, Ok((out, consistent))) => {
            let mut w = BufWriter::new(io::stdout().lock());
            for l in out {
                writeln!(w, "{l}")?;
            }
            w.flush()?;
            Ok(ExitCode::from(if consistent { 0 } else { 1 }))
        }
        (_, result) => {
            let mut reports = bad;
            if let Err(more) = result {
                reports.extend(more);
            }
            for r in reports {
                writeln!(err, "{r}")?;
            }
            Ok(ExitCode::from(2))
        }
    }
}

/// Runs `fourforce energy`.
pub fn run(args: &Args) -> ExitCode {
    let result = if args.precision.single() {
        run_in::<f32>(args)
    } else {
        run_in::<f64>(args)
    };
    result.unwrap_or_else(|e| {
        eprintln!("fourforce energy: {e}");
        ExitCode::from(2)
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn lines(text: &str) -> Vec<(usize, String)> {
        text.lines().enumerate().map(|(i, l)| (i + 1, l.to_owned())).collect()
    }

    #[test]
    fn the_tail_inverts_to_the_table() {
        for a in Alpha::ALL {
            for k in 1..MAX_WITNESSES {
                let table: f64 = a.critical_value(k).unwrap();
                let ours = critical_value(k, a.value());
                assert!((ours / table - 1.0).abs() < 1e-12, "{a:?} k = {k}: {ours} {table}");
            }
        }
        // Q(1/2, x/2) = erfc(sqrt(x/2)); Q(1, x/2) = exp(-x/2).
        assert!((upper_tail(2, 3.0) - (-1.5_f64).exp()).abs() < 1e-16);
        assert!((upper_tail(1, 3.841_458_820_694_124) - 0.05).abs() < 1e-15);
    }

    #[test]
    fn readings_outputs_and_refusals() {
        let p = Species::<f64>::PROTON;
        let (out, ok) = assess::<f64>(p, 1e-3, &lines("kinetic,10,0.01\n\n# x\nkinetic,10.01,0.01")).unwrap();
        assert!(ok);
        assert_eq!(out[0], "reading,1,kinetic,1.0000000000000000e1,1.0000000000000000e-2");
        assert_eq!(out.len(), 3);
        assert!(out[2].starts_with("fused,1.00050000000000") && out[2].ends_with(",1,consistent,0"), "{}", out[2]);
        let bad = assess::<f32>(Species::PROTON, 1e-3, &lines("tof,-1e-7,1e-10,3\nspeed,1,2,3\nfoo,1\nkinetic,x,1")).unwrap_err();
        assert_eq!(bad.len(), 4);
        assert!(bad[0].starts_with("line 1: tof: "), "{}", bad[0]);
        assert!(bad[1].starts_with("line 2: expected 3 fields"), "{}", bad[1]);
        assert!(bad[2].starts_with("line 3: unknown witness"), "{}", bad[2]);
        assert_eq!(bad[3], "line 4: `x` is not a number");
        assert_eq!(assess::<f64>(p, 1e-3, &lines("# nothing")).unwrap_err(), vec!["no reading on standard input"]);
        // A level off the table: computed here. chi^2 = 4.5 with 1 dof: p = 0.0339.
        let two = lines("kinetic,1,0.001\nkinetic,1.003,0.001");
        assert!(assess::<f64>(p, 0.03, &two).unwrap().1);
        assert!(!assess::<f64>(p, 0.04, &two).unwrap().1);
        assert_eq!(alpha_arg("0"), Err("`0` is not a level between 0 and 1".to_owned()));
        assert_eq!(alpha_arg("0.2"), Ok(0.2));
    }
}
