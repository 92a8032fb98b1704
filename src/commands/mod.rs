//! One module per subcommand; each returns an [`Outcome`] that `dispatch` maps to an exit code.

mod field;
pub mod output;

use std::process::ExitCode;

use crate::cli::{Cli, Command};
pub use output::Outcome;

/// Run the chosen subcommand and turn its outcome into the process exit code.
pub fn dispatch(cli: Cli) -> ExitCode {
    let json = cli.json;
    let outcome = match &cli.command {
        Command::Field(a) => field::run(a, json),
    };
    outcome.finish()
}
