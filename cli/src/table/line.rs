//! The line parser of `fourforce table`: one CSV line `species,kinetic_MeV` into a species and a
//! kinetic energy, in the chosen precision, or a reason why not.
//!
//! Free of clap and of I/O (it needs only `crate::species`) so that a fuzz target can include it
//! and call [`parse_line`] directly.

use core::fmt;
use core::str::FromStr;

use fourforce::{Real, Species};

use crate::species::{self, SpeciesError};

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
    /// The species field is not a species.
    Species(SpeciesError),
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
            Self::Species(e) => e.fmt(f),
            Self::NotANumber(s) => write!(f, "kinetic energy `{s}` is not a number"),
            Self::NegativeEnergy => write!(f, "kinetic energy is negative"),
            Self::NonFiniteEnergy => write!(f, "kinetic energy is not finite"),
        }
    }
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
    let species = species::parse(name).map_err(LineError::Species)?;
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
        let rest = parse_line::<f64>("electron,-0").unwrap().unwrap();
        assert!(rest.kinetic_mev == 0.0 && rest.kinetic_mev.is_sign_positive());
        assert_eq!(parse_line::<f64>("species,kinetic_MeV"), Ok(None));
        assert_eq!(parse_line::<f64>("# note"), Ok(None));
        assert_eq!(parse_line::<f64>("  "), Ok(None));
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
        assert_eq!(
            parse_line::<f64>("kaon,1"),
            Err(LineError::Species(SpeciesError::Unknown("kaon".to_owned())))
        );
        assert!(matches!(
            parse_line::<f64>("proton,abc"),
            Err(LineError::NotANumber(_))
        ));
        assert_eq!(
            parse_line::<f64>("custom:939.6:0,1"),
            Err(LineError::Species(SpeciesError::ZeroCharge))
        );
        assert_eq!(
            parse_line::<f64>("proton,1,2"),
            Err(LineError::FieldCount(3))
        );
        assert_eq!(
            parse_line::<f64>("kaon,1").unwrap_err().to_string(),
            "unknown species `kaon`"
        );
    }
}
