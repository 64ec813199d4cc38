//! `fourforce`: the host tool of the fourforce crate. Each subcommand reads CSV lines on standard
//! input and writes CSV on standard output, in f64 or in f32 (as the firmware computes).
//!
//! Layout: one file per subcommand (`table.rs`, ...), each with `pub struct Args` (its options and
//! `--help` text, `clap::Args`) and `pub fn run(&Args) -> ExitCode`; it is registered by one line
//! in [`subcommands!`] below. Shared pieces: [`precision`] (`--f32`/`--f64` and the round-trip
//! number format), [`species`] (species names and `custom:<rest_energy_MeV>:<charge_in_e>`),
//! [`input`] (numbered lines of standard input).

use std::process::ExitCode;

use clap::{Parser, Subcommand};

mod input;
mod precision;
mod species;

/// Declares the subcommands: `Variant => module` per line; `module.rs` provides `Args` and `run`.
macro_rules! subcommands {
    ($($variant:ident => $module:ident),+ $(,)?) => {
        $(mod $module;)+

        #[derive(Subcommand)]
        enum Command {
            $($variant($module::Args),)+
        }

        impl Command {
            fn run(&self) -> ExitCode {
                match self {
                    $(Self::$variant(args) => $module::run(args),)+
                }
            }
        }
    };
}

subcommands! {
    Table => table,
    Map => map,
    Energy => energy,
}

const ABOUT: &str = "Relativistic charged-particle kinematics on the host (the fourforce crate).";

const LONG_ABOUT: &str = "\
Relativistic charged-particle kinematics on the host, computed by the fourforce crate exactly as
firmware would compute it (--f32) or in double precision (--f64, the default).

Every subcommand reads comma-separated lines on standard input and writes comma-separated values
on standard output, 17 significant digits in f64 and 9 in f32 (each value round-trips). Blank
lines and lines starting with # are skipped. A bad input line is reported on standard error as
`line N: reason`.

Species, wherever one is named: electron positron proton antiproton muon antimuon deuteron triton
helion alpha (CODATA 2018 rest energies), or custom:<rest_energy_MeV>:<charge_in_e>, for example
custom:11174.864265448:6 for a bare carbon-12 ion.";

const EXIT_CODES: &str = "\
Exit codes: 0 success; 1 a bad input line (see the subcommand's --help); 2 a bad option or an
unreadable standard input. `fourforce <subcommand> --help` describes each subcommand's input,
output and errors.";

#[derive(Parser)]
#[command(name = "fourforce", version, about = ABOUT, long_about = LONG_ABOUT, after_help = EXIT_CODES)]
struct Cli {
    #[command(subcommand)]
    command: Command,
}

fn main() -> ExitCode {
    // clap prints --help/--version and exits 0; a usage error exits 2.
    Cli::parse().command.run()
}
