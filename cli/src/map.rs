//! `fourforce map`: the first-order transfer map of a beam line read from standard input.

use std::io::{self, BufWriter, Write};
use std::process::ExitCode;

use fourforce::beamline::Element;
use fourforce::transfer::{Envelope, Twiss};
use fourforce::{Motion, Species};

use crate::input;
use crate::precision::{Float, Precision, sci};
use crate::species;

const LONG_ABOUT: &str = "\
The first-order transfer map of a beam line, in (x [m], x' [rad], y [m], y' [rad], dt [s],
delta = dp/p0), dt the arrival time relative to the reference particle (positive = later).

INPUT (standard input)
    One element per line, comma-separated, SI units:
        drift,L                 length L (m, >= 0)
        quad,L,G                magnetic quadrupole: length (m, > 0), gradient dBy/dx (T/m);
                                k = sign(Q) G/(B rho), k > 0 focuses in x
        thinquad,GL             thin magnetic quadrupole: integrated gradient (T)
        equad,L,V,a             electrostatic quadrupole: length (m), electrode voltage (V),
                                aperture radius (m); k = sign(Q) 2V/(a^2 E rho)
        bend,L,theta,e1,e2      sector dipole: arc length (m), bending angle (rad, x points away
                                from the centre of curvature for theta > 0), pole-face rotations
                                at entrance and exit (rad, |e| < pi/2)
        solenoid,L,B            solenoid: length (m), axial field (T); K = sign(Q) B/(2 B rho)
        gap,V                   thin accelerating gap: the reference gains Q V (eV)
    Blank lines and lines starting with # are skipped. The reference energy flows along the line:
    each element's map is taken at the energy after the gaps before it.

OUTPUT (standard output)
    The 6x6 map R (final = R initial) as six lines of six comma-separated values, rows and columns
    in the order x, x', y, y', dt, delta; 17 significant digits with --f64, 9 with --f32.
    With --twiss, then a blank line and a CSV table of the optics at the start and after every
    element (header below).

ERRORS
    A bad line (unknown element, wrong field count, a value that is not a finite number, a
    length or aperture that is not positive, a pole face at 90 degrees or more, a gap that takes
    more than the kinetic energy, a map that does not fit the precision) stops the map: nothing is
    printed on standard output, every bad line is reported on standard error as `line N: reason`.

EXIT CODES
    0 the map was printed; 1 a bad input line; 2 a bad option or unreadable standard input.";

const TWISS_HEADER: &str =
    "element,line,beta_x_m,alpha_x,beta_y_m,alpha_y,D_x_m,D_x_slope,D_y_m,D_y_slope,kinetic_MeV";

/// The first-order transfer map of a beam line read as CSV on standard input.
#[derive(clap::Args)]
#[command(long_about = LONG_ABOUT)]
pub struct Args {
    #[command(flatten)]
    precision: Precision,
    /// The species: a name (electron, proton, alpha, ...) or custom:<rest_energy_MeV>:<charge_in_e>.
    #[arg(long, value_name = "NAME")]
    species: String,
    /// The reference kinetic energy at the start of the line, in MeV (parsed straight into the
    /// chosen precision, then multiplied by 1e6 into eV).
    #[arg(long, value_name = "T")]
    kinetic_mev: String,
    /// Also print the Twiss parameters and dispersion at the start and after every element, from
    /// the initial values beta_x,alpha_x,beta_y,alpha_y[,D_x,D_x',D_y,D_y'] (m, rad), or from the
    /// periodic solution of the line with `periodic`.
    #[arg(long, value_name = "VALUES")]
    twiss: Option<String>,
}

/// `x` with a negative zero made positive (an entry that is exactly zero prints as `0`).
fn unsigned<T: Float>(x: T) -> T {
    x + T::ZERO
}

/// The element of one input line, or the reason it is bad; `Ok(None)` for a line to skip.
fn parse_element<T: Float>(text: &str) -> Result<Option<Element<T>>, String> {
    let text = text.trim();
    if text.is_empty() || text.starts_with('#') {
        return Ok(None);
    }
    let mut fields = text.split(',').map(str::trim);
    let kind = fields.next().unwrap_or_default();
    let values = fields
        .map(|f| match f.parse::<T>() {
            Ok(v) if v.is_finite() => Ok(v),
            Ok(_) => Err(format!("`{f}` is not finite")),
            Err(_) => Err(format!("`{f}` is not a number")),
        })
        .collect::<Result<Vec<T>, String>>();
    let expected = match kind {
        "drift" | "thinquad" | "gap" => 1,
        "quad" | "solenoid" => 2,
        "equad" => 3,
        "bend" => 4,
        _ => {
            return Err(format!(
                "unknown element `{kind}` (expected drift, quad, thinquad, equad, bend, solenoid or gap)"
            ));
        }
    };
    let values = values?;
    let element = match (kind, values.as_slice()) {
        ("drift", &[length_m]) => Element::Drift { length_m },
        ("quad", &[length_m, gradient_t_per_m]) => Element::Quadrupole {
            length_m,
            gradient_t_per_m,
        },
        ("thinquad", &[integrated_gradient_t]) => Element::ThinQuadrupole {
            integrated_gradient_t,
        },
        ("equad", &[length_m, voltage_v, aperture_radius_m]) => Element::ElectrostaticQuadrupole {
            length_m,
            voltage_v,
            aperture_radius_m,
        },
        ("bend", &[length_m, angle_rad, entry_angle_rad, exit_angle_rad]) => {
            Element::SectorDipole {
                length_m,
                angle_rad,
                entry_angle_rad,
                exit_angle_rad,
            }
        }
        ("solenoid", &[length_m, field_t]) => Element::Solenoid { length_m, field_t },
        ("gap", &[voltage_v]) => Element::AcceleratingGap { voltage_v },
        _ => {
            return Err(format!(
                "`{kind}` takes {expected} value{}, found {}",
                if expected == 1 { "" } else { "s" },
                values.len()
            ));
        }
    };
    element
        .try_check()
        .map(Some)
        .map_err(|e| format!("{kind}: {e}"))
}

/// The initial optics of `--twiss`, or the reason it is bad.
enum Start<T: Float> {
    Given(Twiss<T>, Twiss<T>, [T; 4]),
    Periodic,
}

fn parse_twiss<T: Float>(text: &str) -> Result<Start<T>, String> {
    if text.trim() == "periodic" {
        return Ok(Start::Periodic);
    }
    let values = text
        .split(',')
        .map(|f| f.trim().parse::<T>().map_err(|_| format!("--twiss: `{f}` is not a number")))
        .collect::<Result<Vec<T>, String>>()?;
    let (bx, ax, by, ay, d) = match *values.as_slice() {
        [bx, ax, by, ay] => (bx, ax, by, ay, [T::ZERO; 4]),
        [bx, ax, by, ay, dx, dpx, dy, dpy] => (bx, ax, by, ay, [dx, dpx, dy, dpy]),
        _ => return Err("--twiss takes 4 or 8 values, or `periodic`".to_owned()),
    };
    let x = Twiss::try_new(bx, ax).map_err(|e| format!("--twiss x: {e}"))?;
    let y = Twiss::try_new(by, ay).map_err(|e| format!("--twiss y: {e}"))?;
    Ok(Start::Given(x, y, d))
}

/// The output text, `Err(Some(lines))` for bad input lines (`line N: reason`), `Err(None)` after
/// an option error already reported.
fn compute<T: Float>(
    args: &Args,
    lines: &[(usize, Result<String, &'static str>)],
) -> Result<String, Option<Vec<String>>> {
    let option = |message: String| {
        eprintln!("fourforce map: {message}");
        None
    };
    let species: Species<T> = species::parse(args.species.trim()).map_err(|e| option(e.to_string()))?;
    let mev: T = args
        .kinetic_mev
        .trim()
        .parse()
        .map_err(|_| option(format!("--kinetic-mev `{}` is not a number", args.kinetic_mev)))?;
    let start = Motion::try_from_kinetic_energy(species, mev * T::from_f64(1.0e6))
        .map_err(|e| option(format!("--kinetic-mev: {e}")))?;
    let twiss = match &args.twiss {
        Some(text) => Some(parse_twiss::<T>(text).map_err(option)?),
        None => None,
    };
    let mut bad = Vec::new();
    let mut elements = Vec::new();
    for (n, text) in lines {
        match text.as_deref().map_err(|e| (*e).to_owned()).and_then(parse_element::<T>) {
            Ok(Some(e)) => elements.push((*n, e)),
            Ok(None) => {}
            Err(reason) => bad.push(format!("line {n}: {reason}")),
        }
    }
    if !bad.is_empty() {
        return Err(Some(bad));
    }
    // The map, element by element, the reference flowing through the gaps.
    let mut reference = start;
    let mut map = fourforce::transfer::TransferMap::IDENTITY;
    let mut maps = Vec::with_capacity(elements.len());
    for (n, element) in &elements {
        match element.try_map(&reference).and_then(|(m, after)| {
            let total = map.then(&m).try_check()?;
            Ok((m, after, total))
        }) {
            Ok((m, after, total)) => {
                maps.push((*n, m, after));
                map = total;
                reference = after;
            }
            Err(e) => return Err(Some(vec![format!("line {n}: {e}")])),
        }
    }
    let mut out = String::new();
    for row in map.to_array() {
        let cells: Vec<String> = row.iter().map(|&v| sci(unsigned(v))).collect();
        out.push_str(&cells.join(","));
        out.push('\n');
    }
    if let Some(start_optics) = twiss {
        let (x, y, d) = match start_optics {
            Start::Given(x, y, d) => (x, y, d),
            Start::Periodic => {
                let cell = map
                    .try_periodic()
                    .map_err(|e| Some(vec![format!("--twiss periodic: {e}")]))?;
                (cell.x, cell.y, cell.dispersion)
            }
        };
        let mut envelope = Envelope::try_lattice(x, y, d)
            .map_err(|e| Some(vec![format!("--twiss: {e}")]))?;
        out.push('\n');
        out.push_str(TWISS_HEADER);
        out.push('\n');
        let row = |index: String, line: String, e: &Envelope<T>, mev: T| -> Result<String, String> {
            let (tx, ty) = (e.try_twiss_x().map_err(|e| e.to_string())?, e.try_twiss_y().map_err(|e| e.to_string())?);
            let d = e.dispersion();
            let values = [tx.beta(), tx.alpha(), ty.beta(), ty.alpha(), d[0], d[1], d[2], d[3], mev];
            let cells: Vec<String> = values.iter().map(|&v| sci(unsigned(v))).collect();
            Ok(format!("{index},{line},{}", cells.join(",")))
        };
        let first = row("start".to_owned(), String::new(), &envelope, start.kinetic_energy_mev())
            .map_err(|e| Some(vec![format!("--twiss: {e}")]))?;
        out.push_str(&first);
        out.push('\n');
        for (i, (n, m, after)) in maps.iter().enumerate() {
            envelope = envelope
                .try_through(m)
                .map_err(|e| Some(vec![format!("line {n}: envelope: {e}")]))?;
            let r = row(i.to_string(), n.to_string(), &envelope, after.kinetic_energy_mev())
                .map_err(|e| Some(vec![format!("line {n}: envelope: {e}")]))?;
            out.push_str(&r);
            out.push('\n');
        }
    }
    Ok(out)
}

/// Runs `fourforce map`.
pub fn run(args: &Args) -> ExitCode {
    let mut lines = Vec::new();
    let read = input::for_each_line(|n, text| {
        lines.push((n, text.map(str::to_owned)));
        Ok::<(), io::Error>(())
    });
    if let Err(e) = read {
        eprintln!("fourforce map: {e}");
        return ExitCode::from(2);
    }
    let result = if args.precision.single() {
        compute::<f32>(args, &lines)
    } else {
        compute::<f64>(args, &lines)
    };
    match result {
        Ok(text) => {
            let mut out = BufWriter::new(io::stdout().lock());
            if out.write_all(text.as_bytes()).and_then(|()| out.flush()).is_err() {
                return ExitCode::from(2);
            }
            ExitCode::SUCCESS
        }
        Err(Some(bad)) => {
            for line in bad {
                eprintln!("{line}");
            }
            ExitCode::from(1)
        }
        Err(None) => ExitCode::from(2),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn args(species: &str, kinetic_mev: &str, twiss: Option<&str>) -> Args {
        Args {
            precision: Precision::default(),
            species: species.to_owned(),
            kinetic_mev: kinetic_mev.to_owned(),
            twiss: twiss.map(str::to_owned),
        }
    }

    /// The printed maps of the 119 reference lines of checks/tests/reference/transfer_maps.csv
    /// (50-digit mpmath, written by generate_transfer.py) within 4 eps S entry by entry, S the
    /// entry's rounding scale plus its sensitivity to the rounding of every input, in both
    /// precisions: the check `fourforce map` must pass, on its own output text.
    fn printed_maps_agree<T: Float>() -> f64 {
        let text = include_str!("../../checks/tests/reference/transfer_maps.csv");
        let mut worst = 0.0_f64;
        for row in text.lines().skip(1) {
            let (head, rest) = row.split_once(",\"").unwrap();
            let (line, numbers) = rest.split_once("\",").unwrap();
            let head: Vec<&str> = head.split(',').collect();
            let numbers: Vec<f64> = numbers.split(',').map(|x| x.parse().unwrap()).collect();
            let lines: Vec<(usize, Result<String, &'static str>)> = line
                .split(';')
                .enumerate()
                .map(|(i, l)| (i + 1, Ok(l.to_owned())))
                .collect();
            let out = compute::<T>(&args(head[1], head[2], None), &lines).unwrap();
            let printed: Vec<f64> = out
                .lines()
                .flat_map(|l| l.split(',').map(|x| x.parse::<f64>().unwrap()))
                .collect();
            assert_eq!(printed.len(), 36);
            for k in 0..36 {
                let error = (printed[k] - numbers[k]).abs();
                if error > 0.0 {
                    worst = worst.max(error / (T::EPSILON.to_f64() * numbers[36 + k]));
                }
            }
        }
        worst
    }

    #[test]
    fn printed_maps_agree_with_the_references() {
        let (single, double) = (printed_maps_agree::<f32>(), printed_maps_agree::<f64>());
        println!("printed maps, worst |R - R_exact| / (eps S): f32 {single:.3}, f64 {double:.3}");
        assert!(single <= 4.0 && double <= 4.0, "f32 {single}, f64 {double}");
    }

    #[test]
    fn a_bad_line_prints_no_map() {
        let lines = vec![
            (1, Ok("drift,1".to_owned())),
            (2, Ok("quad,0.2".to_owned())),
            (3, Err("not valid UTF-8")),
            (5, Ok("gap,-2e7".to_owned())),
        ];
        let bad = compute::<f64>(&args("proton", "10", None), &lines).unwrap_err().unwrap();
        assert_eq!(bad.len(), 2);
        assert!(bad[0].starts_with("line 2: ") && bad[1] == "line 3: not valid UTF-8", "{bad:?}");
        // a gap that takes more than the kinetic energy is found when the map is built
        let lines = vec![(1, Ok("drift,1".to_owned())), (4, Ok("gap,-2e7".to_owned()))];
        let bad = compute::<f32>(&args("proton", "10", None), &lines).unwrap_err().unwrap();
        assert_eq!(bad, ["line 4: energy is below the rest energy"]);
    }

    #[test]
    fn twiss_table_has_a_row_per_element() {
        let lines: Vec<_> = ["drift,1", "quad,0.2,1", "drift,1", "quad,0.2,-1"]
            .iter()
            .enumerate()
            .map(|(i, l)| (i + 1, Ok((*l).to_owned())))
            .collect();
        let out = compute::<f64>(&args("proton", "10", Some("periodic")), &lines).unwrap();
        let table: Vec<&str> = out.lines().skip(7).collect();
        assert_eq!(table[0], TWISS_HEADER);
        assert_eq!(table.len(), 6);
        // periodic: the end repeats the start
        let first: Vec<f64> = table[1].split(',').skip(2).map(|x| x.parse().unwrap()).collect();
        let last: Vec<f64> = table[5].split(',').skip(2).map(|x| x.parse().unwrap()).collect();
        for (a, b) in first.iter().zip(&last) {
            assert!((a - b).abs() < 1e-12 * (1.0 + a.abs()), "{first:?} {last:?}");
        }
    }

    #[test]
    fn elements_and_refusals() {
        assert_eq!(
            parse_element::<f64>("quad, 0.2, -3.5"),
            Ok(Some(Element::Quadrupole {
                length_m: 0.2,
                gradient_t_per_m: -3.5
            }))
        );
        assert_eq!(parse_element::<f32>("  # comment"), Ok(None));
        assert_eq!(parse_element::<f32>(""), Ok(None));
        assert!(parse_element::<f64>("sextupole,1,2").unwrap_err().contains("unknown element"));
        assert!(parse_element::<f64>("bend,1,0.1,0").unwrap_err().contains("takes 4 values"));
        assert!(parse_element::<f64>("drift,x").unwrap_err().contains("not a number"));
        assert!(parse_element::<f64>("drift,inf").unwrap_err().contains("not finite"));
        assert!(parse_element::<f64>("drift,-1").unwrap_err().contains("drift:"));
        assert!(parse_element::<f64>("bend,1,0.1,1.6,0").unwrap_err().contains("bend:"));
    }
}
