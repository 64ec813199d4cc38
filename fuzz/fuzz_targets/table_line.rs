//! Door: the line parser of `fourforce table` (`cli/src/table/line.rs`, `parse_line`, with the
//! species names of `cli/src/species.rs`), on any text,
//! followed by what the tool computes from an accepted line (the state of motion and every
//! value of its output row, printed with the round-trip digits).
#![no_main]

#[path = "../../cli/src/table/line.rs"]
#[allow(dead_code)]
mod line;
#[path = "../../cli/src/species.rs"]
#[allow(dead_code)]
mod species;

use std::fmt::LowerExp;
use std::str::FromStr;

use fourforce::{Motion, Real, optics};
use libfuzzer_sys::fuzz_target;
use line::{LineError, parse_line};
use species::{NAMES, SpeciesError};

fn run<T: Real + FromStr + LowerExp>(text: &str) {
    match parse_line::<T>(text) {
        Ok(None) => {
            let t = text.trim();
            assert!(
                t.is_empty() || t.starts_with('#') || t == "species,kinetic_MeV",
                "skipped {text:?}"
            );
        }
        Ok(Some(line)) => {
            // What an accepted line holds: a known or custom species, charged, and an energy
            // that is a finite non-negative number.
            assert_eq!(line.name, line.name.trim());
            assert!(
                NAMES.contains(&line.name) || line.name.starts_with("custom:"),
                "{line:?}"
            );
            let s = line.species;
            assert!(
                s.rest_energy().is_finite() && s.rest_energy() > T::ZERO,
                "{line:?}"
            );
            assert!(s.charge().is_finite() && s.charge() != T::ZERO, "{line:?}");
            assert!(
                line.kinetic_mev.is_finite() && line.kinetic_mev >= T::ZERO,
                "{line:?}"
            );
            assert_eq!(text.matches(',').count(), 1, "{text:?}");
            // The row the tool prints: every value finite, and its printed digits read back
            // as the same number.
            let Ok(m) = Motion::try_from_kinetic_energy(s, line.kinetic_mev * T::from_f64(1.0e6))
            else {
                return;
            };
            let mut values = vec![
                line.kinetic_mev,
                m.gamma(),
                m.gamma_minus_one(),
                m.beta(),
                m.one_minus_beta(),
                m.beta_gamma(),
                m.momentum_mev(),
                m.speed(),
                m.flight_time_per_metre() * T::from_f64(1.0e9),
            ];
            let q = s.charge().abs().to_f64();
            let rigidities_fit = m.momentum().to_f64() / q < T::MAX.to_f64() / 4.0
                && m.kinetic_energy().to_f64() / q < T::MAX.to_f64() / 4.0;
            match (m.try_magnetic_rigidity(), m.try_electric_rigidity()) {
                (Ok(b), Ok(e)) => {
                    values.push(b);
                    values.push(e);
                }
                (b, e) => assert!(
                    !rigidities_fit
                        && [b, e]
                            .iter()
                            .all(|r| matches!(r, Ok(_) | Err(fourforce::Error::Overflow))),
                    "rigidities of a charged species refused: {b:?} {e:?}"
                ),
            }
            match optics::try_revolution_frequency(&m, T::ONE) {
                Ok(f) => values.push(f),
                Err(e) => assert_eq!(e, fourforce::Error::Overflow, "{line:?}"),
            }
            let at_rest = m.beta() == T::ZERO;
            for (i, v) in values.iter().enumerate() {
                if at_rest && i == 8 {
                    continue; // time of flight per metre of a particle at rest: +inf, documented
                }
                assert!(v.is_finite(), "value {i} of {text:?} is {v:?}");
                let printed = if T::MANTISSA_DIGITS == 24 {
                    format!("{v:.8e}")
                } else {
                    format!("{v:.16e}")
                };
                let back: T = printed
                    .parse()
                    .unwrap_or_else(|_| panic!("{printed} does not parse"));
                assert!(
                    back == *v,
                    "{v:?} printed as {printed} reads back as {back:?}"
                );
            }
        }
        Err(e) => {
            // Every refusal says why in one of the documented ways, and displays.
            let _ = e.to_string();
            match &e {
                LineError::FieldCount(n) => assert_ne!(*n, 2),
                LineError::Species(SpeciesError::Unknown(s)) => {
                    assert!(!NAMES.contains(&s.as_str()))
                }
                _ => {}
            }
        }
    }
}

fuzz_target!(|data: &[u8]| {
    let Some((&first, rest)) = data.split_first() else {
        return;
    };
    // Lines reach the tool as UTF-8 text without the line break.
    let Ok(text) = std::str::from_utf8(rest) else {
        return;
    };
    if text.contains('\n') {
        return;
    }
    if first & 1 == 0 {
        run::<f32>(text)
    } else {
        run::<f64>(text)
    }
});
