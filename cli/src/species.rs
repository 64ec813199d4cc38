//! Species names, one place for every subcommand: the ten named species (CODATA 2018 rest
//! energies, from the library) and `custom:<rest_energy_MeV>:<charge_in_e>`.
//!
//! Free of clap and of I/O so that the fuzz target of the table's line parser can include it.

use core::fmt;
use core::str::FromStr;

use fourforce::{Real, Species};

/// The named species, in the order `--help` lists them.
#[allow(dead_code)] // only the fuzz target of the table line and the tests read it
pub const NAMES: [&str; 10] = [
    "electron",
    "positron",
    "proton",
    "antiproton",
    "muon",
    "antimuon",
    "deuteron",
    "triton",
    "helion",
    "alpha",
];

/// The syntax of a custom species, as the help texts and error messages write it.
pub const CUSTOM_SYNTAX: &str = "custom:<rest_energy_MeV>:<charge_in_e>";

/// Why a species name was refused.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum SpeciesError {
    /// Neither a named species nor `custom:...`.
    Unknown(String),
    /// A `custom:` species whose rest energy or charge is not a number, or a charge that is not
    /// finite.
    BadCustom(String),
    /// A `custom:` species with a zero charge: its rigidities do not exist.
    ZeroCharge,
    /// A `custom:` species with a rest energy that is zero, negative or not finite.
    BadRestEnergy,
}

impl fmt::Display for SpeciesError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            Self::Unknown(s) => write!(f, "unknown species `{s}`"),
            Self::BadCustom(s) => {
                write!(f, "bad custom species `{s}`: expected {CUSTOM_SYNTAX}")
            }
            Self::ZeroCharge => write!(f, "zero charge: the rigidities need a charged species"),
            Self::BadRestEnergy => write!(f, "rest energy must be finite and at least 1 eV"),
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

fn custom<T: Real + FromStr>(field: &str, spec: &str) -> Result<Species<T>, SpeciesError> {
    let bad = || SpeciesError::BadCustom(field.to_owned());
    let (rest, charge) = spec.split_once(':').ok_or_else(bad)?;
    let rest_mev: T = rest.trim().parse().map_err(|_| bad())?;
    let charge: T = charge.trim().parse().map_err(|_| bad())?;
    if !charge.is_finite() {
        return Err(bad());
    }
    if charge == T::ZERO {
        return Err(SpeciesError::ZeroCharge);
    }
    let rest_ev = rest_mev * T::from_f64(1.0e6);
    if !rest_ev.is_finite() || rest_ev <= T::ZERO {
        return Err(SpeciesError::BadRestEnergy);
    }
    Species::try_new(rest_ev, charge).map_err(|_| SpeciesError::BadRestEnergy)
}

/// The species a (trimmed) name stands for, in precision `T`.
pub fn parse<T: Real + FromStr>(name: &str) -> Result<Species<T>, SpeciesError> {
    match (named(name), name.strip_prefix("custom:")) {
        (Some(s), _) => Ok(s),
        (None, Some(spec)) => custom(name, spec),
        (None, None) => Err(SpeciesError::Unknown(name.to_owned())),
    }
}

/// A value parser for a `--species NAME` option: accepts the name when it is good in both
/// precisions (so that a bad name is a usage error, exit code 2, before any input is read) and
/// returns it trimmed; the subcommand then calls [`parse`] in its precision.
#[allow(dead_code)] // unused where the fuzz target of the table line includes this file
pub fn name_arg(text: &str) -> Result<String, String> {
    let name = text.trim();
    parse::<f64>(name).map_err(|e| e.to_string())?;
    parse::<f32>(name).map_err(|e| e.to_string())?;
    Ok(name.to_owned())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn names_and_custom_species() {
        for name in NAMES {
            assert!(parse::<f64>(name).is_ok(), "{name}");
        }
        assert_eq!(
            parse::<f64>("custom:938:1"),
            Ok(Species::try_new(938.0e6, 1.0).unwrap())
        );
        assert_eq!(
            parse::<f64>("custom: 939.6 : 0"),
            Err(SpeciesError::ZeroCharge)
        );
        assert_eq!(
            parse::<f64>("custom:-1:1"),
            Err(SpeciesError::BadRestEnergy)
        );
        assert_eq!(
            parse::<f32>("custom:1e40:1"),
            Err(SpeciesError::BadRestEnergy)
        );
        assert!(matches!(
            parse::<f64>("custom:1"),
            Err(SpeciesError::BadCustom(_))
        ));
        assert!(matches!(
            parse::<f64>("custom:1:inf"),
            Err(SpeciesError::BadCustom(_))
        ));
        assert!(matches!(
            parse::<f64>("kaon"),
            Err(SpeciesError::Unknown(_))
        ));
        assert_eq!(name_arg(" alpha "), Ok("alpha".to_owned()));
        // Good in f64, too large a rest energy for f32.
        assert!(name_arg("custom:1e40:1").is_err());
    }
}
