//! The line parser of the table tool: one CSV line `species,kinetic_MeV` into a species and a
//! kinetic energy, in the chosen precision, or a reason why not.
//!
//! Kept free of I/O and of the rest of the tool so that a fuzz target can call [`parse_line`]
//! directly (`#[path = "../examples/table/parse.rs"] mod parse;`).

use core::fmt;
use core::str::FromStr;

use fourforce::{Real, Species};

/// What a good line holds.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Line<'a, T: Real> {
    /// The species field as written (trimmed), echoed in the output.
    pub name: &'a str,
    /// The species.
    pub species: Species<T>,
    /// The kinetic energy in MeV, parsed straight into `T`.
    pub kinetic_mev: T,
}

/// Why a line was refused.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum LineError {
    /// Not two comma-separated fields.
    FieldCount(usize),
    /// A species name that is neither a named species nor `custom:<MeV>:<charge>`.
    UnknownSpecies(String),
    /// A `custom:` species whose rest energy or charge is not a number.
    BadCustom(String),
    /// A `custom:` species with a zero charge: its rigidities do not exist.
    ZeroCharge,
    /// A `custom:` species with a rest energy that is zero, negative or not finite.
    BadRestEnergy,
    /// The kinetic energy is not a number.
    NotANumber(String),
    /// The kinetic energy is negative.
    NegativeEnergy,
    /// The kinetic energy is infinite or NaN.
    NonFiniteEnergy,
}

impl fmt::Display for LineError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            Self::FieldCount(n) => write!(f, "expected 2 fields `species,kinetic_MeV`, found {n}"),
            Self::UnknownSpecies(s) => write!(f, "unknown species `{s}`"),
            Self::BadCustom(s) => {
                write!(
                    f,
                    "bad custom species `{s}`: expected custom:<rest_energy_MeV>:<charge_in_e>"
                )
            }
            Self::ZeroCharge => write!(f, "zero charge: the rigidities need a charged species"),
            Self::BadRestEnergy => write!(f, "rest energy must be finite and at least 1 eV"),
            Self::NotANumber(s) => write!(f, "kinetic energy `{s}` is not a number"),
            Self::NegativeEnergy => write!(f, "kinetic energy is negative"),
            Self::NonFiniteEnergy => write!(f, "kinetic energy is not finite"),
        }
    }
}

fn named<T: Real>(name: &str) -> Option<Species<T>> {
    Some(match name {
        "electron" => Species::ELECTRON,
        "positron" => Species::POSITRON,
        "proton" => Species::PROTON,
        "antiproton" => Species::ANTIPROTON,
        "muon" => Species::MUON,
        "antimuon" => Species::ANTIMUON,
        "deuteron" => Species::DEUTERON,
        "triton" => Species::TRITON,
        "helion" => Species::HELION,
        "alpha" => Species::ALPHA,
        _ => return None,
    })
}

fn custom<T: Real + FromStr>(field: &str, spec: &str) -> Result<Species<T>, LineError> {
    let bad = || LineError::BadCustom(field.to_owned());
    let (rest, charge) = spec.split_once(':').ok_or_else(bad)?;
    let rest_mev: T = rest.trim().parse().map_err(|_| bad())?;
    let charge: T = charge.trim().parse().map_err(|_| bad())?;
    if !charge.is_finite() {
        return Err(bad());
    }
    if charge == T::ZERO {
        return Err(LineError::ZeroCharge);
    }
    let rest_ev = rest_mev * T::from_f64(1.0e6);
    if !rest_ev.is_finite() || rest_ev <= T::ZERO {
        return Err(LineError::BadRestEnergy);
    }
    Species::try_new(rest_ev, charge).map_err(|_| LineError::BadRestEnergy)
}

/// Parses one input line; `Ok(None)` for a line to skip (blank, `#` comment, or the header
/// `species,kinetic_MeV`).
pub fn parse_line<T: Real + FromStr>(line: &str) -> Result<Option<Line<'_, T>>, LineError> {
    let line = line.trim();
    if line.is_empty() || line.starts_with('#') || line == "species,kinetic_MeV" {
        return Ok(None);
    }
    let fields: Vec<&str> = line.split(',').collect();
    let [name, energy] = fields[..] else {
        return Err(LineError::FieldCount(fields.len()));
    };
    let name = name.trim();
    let species = match (named(name), name.strip_prefix("custom:")) {
        (Some(s), _) => s,
        (None, Some(spec)) => custom(name, spec)?,
        (None, None) => return Err(LineError::UnknownSpecies(name.to_owned())),
    };
    let energy = energy.trim();
    let kinetic_mev: T = energy
        .parse()
        .map_err(|_| LineError::NotANumber(energy.to_owned()))?;
    if !kinetic_mev.is_finite() {
        return Err(LineError::NonFiniteEnergy);
    }
    if kinetic_mev < T::ZERO {
        return Err(LineError::NegativeEnergy);
    }
    Ok(Some(Line {
        name,
        species,
        // -0 is a particle at rest: echo it as 0.
        kinetic_mev: if kinetic_mev == T::ZERO {
            T::ZERO
        } else {
            kinetic_mev
        },
    }))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn good_and_bad_lines() {
        let l = parse_line::<f32>(" proton , 250 ").unwrap().unwrap();
        assert_eq!((l.name, l.kinetic_mev), ("proton", 250.0));
        let c = parse_line::<f64>("custom:11174.864265448:6,4800")
            .unwrap()
            .unwrap();
        assert_eq!(c.species.charge(), 6.0);
        assert_eq!(parse_line::<f64>("species,kinetic_MeV"), Ok(None));
        assert_eq!(parse_line::<f64>("# note"), Ok(None));
        assert_eq!(
            parse_line::<f64>("electron,-1"),
            Err(LineError::NegativeEnergy)
        );
        assert_eq!(
            parse_line::<f64>("electron,inf"),
            Err(LineError::NonFiniteEnergy)
        );
        assert_eq!(
            parse_line::<f64>("electron,NaN"),
            Err(LineError::NonFiniteEnergy)
        );
        assert!(matches!(
            parse_line::<f64>("kaon,1"),
            Err(LineError::UnknownSpecies(_))
        ));
        assert!(matches!(
            parse_line::<f64>("proton,abc"),
            Err(LineError::NotANumber(_))
        ));
        assert_eq!(
            parse_line::<f64>("custom:939.6:0,1"),
            Err(LineError::ZeroCharge)
        );
        assert_eq!(
            parse_line::<f64>("custom:-1:1,1"),
            Err(LineError::BadRestEnergy)
        );
        assert!(matches!(
            parse_line::<f64>("custom:1,1"),
            Err(LineError::BadCustom(_))
        ));
        assert_eq!(
            parse_line::<f64>("proton,1,2"),
            Err(LineError::FieldCount(3))
        );
        assert_eq!(
            parse_line::<f32>("custom:1e40:1,1"),
            Err(LineError::BadRestEnergy)
        );
    }
}
