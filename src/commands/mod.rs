//! One module per subcommand; each returns an `Outcome` that `dispatch` maps to an exit code.

mod budget;
mod certify;
mod check;
mod dw;
mod dw_count;
mod dw_describe;
mod envelope;
mod field;
mod orbit;
#[cfg(feature = "mpi")]
mod orbit_mpi;
mod orbit_ranks;
pub mod output;
mod product;
mod progress;
mod shell;
mod structure;
mod sweep;
mod theory;
mod twists;

use std::process::ExitCode;

use crate::cli::{Cli, Command};

/// Run the chosen subcommand and turn its outcome into the process exit code.
pub fn dispatch(cli: Cli) -> ExitCode {
    let json = cli.json;
    cyclorb_pipeline::proof::set_unverified(cli.unverified);
    budget::install(cli.memory_limit);
    let outcome = match &cli.command {
        Command::Field(a) => field::run(a, json),
        Command::Twists(a) => twists::run(a, json),
        Command::Orbit(a) => orbit::run(a, json),
        Command::Commutant(a) => certify::commutant(a, json),
        Command::Image(a) => certify::image(a, json),
        Command::Witness(a) => certify::witness(a, json),
        Command::Sweep(a) => sweep::run(a, json),
        Command::Check(a) => check::run(a, json),
        Command::Theories => theory::run_theories(json),
        Command::Describe(a) => theory::run_describe(a, json),
        Command::Verify(a) => theory::run_verify(a, json),
        Command::Completions(a) => shell::completions(a, json),
        Command::Manual(a) => shell::manual(a, json),
    };
    outcome.finish()
}
