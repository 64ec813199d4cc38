//! `fourforce table`: kinematic quantities of species and kinetic energies read from CSV.
//! The line parser is [`line::parse_line`].

mod line;

use std::io::{self, BufWriter, Write};
use std::process::ExitCode;


use fourforce::{Motion, optics};

use crate::input;
use crate::precision::{Float, Precision, sci};

const HEADER: &str = "species,T_MeV,gamma,gamma_minus_1,beta,one_minus_beta,beta_gamma,\
p_MeV_per_c,brho_Tm,erho_V,v_m_per_s,tof_ns_per_m,cyclotron_Hz_per_T";

const LONG_ABOUT: &str = "\
Kinematic quantities of charged particles: one CSV row per input line.

INPUT (standard input)
    One line per state: species,kinetic_MeV
    species      electron positron proton antiproton muon antimuon deuteron triton helion alpha
                 (CODATA 2018 rest energies), or custom:<rest_energy_MeV>:<charge_in_e>, for
                 example custom:11174.864265448:6 for a bare carbon-12 ion
    kinetic_MeV  kinetic energy in MeV, >= 0, parsed straight into the chosen precision (then
                 multiplied by 1e6 into eV, one rounding)
    Blank lines, lines starting with # and a header line `species,kinetic_MeV` are skipped.

OUTPUT (standard output), CSV with this header:
    species,T_MeV,gamma,gamma_minus_1,beta,one_minus_beta,beta_gamma,p_MeV_per_c,brho_Tm,
    erho_V,v_m_per_s,tof_ns_per_m,cyclotron_Hz_per_T
    species             the species field as written
    T_MeV               the kinetic energy as parsed
    gamma, beta         Lorentz factor and v/c; gamma_minus_1 and one_minus_beta are computed
                        without cancellation (exact even where gamma rounds to 1 or beta to 1)
    beta_gamma          p/(m c)
    p_MeV_per_c         momentum
    brho_Tm, erho_V     magnetic rigidity (T m) and electric rigidity (V), for |charge|
    v_m_per_s           speed
    tof_ns_per_m        time of flight per metre, ns/m (inf for a particle at rest, T = 0)
    cyclotron_Hz_per_T  revolution frequency in a 1 T field, Hz
    Values have 17 significant digits with --f64, 9 with --f32. Every value is within 8 eps of
    the exact value for inputs exact in the precision.

ERRORS
    A bad line (unknown species, wrong field count, non-numeric, negative or non-finite energy,
    zero charge, non-positive rest energy, not UTF-8) is reported on standard error as
    `line N: reason` and skipped; the other lines are still processed.

EXIT CODES
    0 every line good; 1 at least one bad line; 2 a bad option or unreadable standard input.";

/// Kinematic quantities of species and kinetic energies read as CSV on standard input.
#[derive(clap::Args)]
#[command(long_about = LONG_ABOUT)]
pub struct Args {
    #[command(flatten)]
    precision: Precision,
}

/// One output row, or the reason the line is bad.
fn row<T: Float>(text: &str) -> Result<Option<String>, String> {
    let Some(l) = line::parse_line::<T>(text).map_err(|e| e.to_string())? else {
        return Ok(None);
    };
    let m = Motion::try_from_kinetic_energy(l.species, l.kinetic_mev * T::from_f64(1.0e6))
        .map_err(|e| e.to_string())?;
    let values = [
        l.kinetic_mev,
        m.gamma(),
        m.gamma_minus_one(),
        m.beta(),
        m.one_minus_beta(),
        m.beta_gamma(),
        m.momentum_mev(),
        m.try_magnetic_rigidity().map_err(|e| e.to_string())?,
        m.try_electric_rigidity().map_err(|e| e.to_string())?,
        m.speed(),
        m.flight_time_per_metre() * T::from_f64(1.0e9),
        optics::try_revolution_frequency(&m, T::ONE).map_err(|e| e.to_string())?,
    ];
    let mut out = String::from(l.name);
    for v in values {
        out.push(',');
        out.push_str(&sci(v));
    }
    Ok(Some(out))
}

/// Every row; `Ok(false)` when a line was bad.
fn rows<T: Float>() -> io::Result<bool> {
    let mut out = BufWriter::new(io::stdout().lock());
    let mut err = io::stderr().lock();
    writeln!(out, "{HEADER}")?;
    let mut all_good = true;
    input::for_each_line(|n, text| {
        match text.map_err(str::to_owned).and_then(row::<T>) {
            Ok(Some(r)) => writeln!(out, "{r}")?,
            Ok(None) => {}
            Err(reason) => {
                all_good = false;
                writeln!(err, "line {n}: {reason}")?;
            }
        }
        Ok::<(), io::Error>(())
    })?;
    out.flush()?;
    Ok(all_good)
}

/// Runs `fourforce table`.
pub fn run(args: &Args) -> ExitCode {
    let result = if args.precision.single() {
        rows::<f32>()
    } else {
        rows::<f64>()
    };
    match result {
        Ok(true) => ExitCode::SUCCESS,
        Ok(false) => ExitCode::from(1),
        Err(e) => {
            eprintln!("fourforce table: {e}");
            ExitCode::from(2)
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_row_and_a_refusal() {
        let r = row::<f64>("proton,250").unwrap().unwrap();
        assert!(r.starts_with("proton,2.5000000000000000e2,1.26"), "{r}");
        assert_eq!(r.split(',').count(), HEADER.split(',').count());
        assert_eq!(row::<f32>("# x"), Ok(None));
        assert_eq!(row::<f32>("kaon,1"), Err("unknown species `kaon`".to_owned()));
    }
}
