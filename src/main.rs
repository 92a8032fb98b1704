//! `cyclorb`: exact mapping class group orbits of conformal blocks.
//!
//! The binary is thin: it parses arguments, builds the library objects, prints a report
//! (text, or one JSON object with `--json`) and maps outcomes to exit codes:
//! 0 done, 1 a check failed or the input is invalid, 2 usage error, 3 stopped by a limit
//! or an interrupt with a partial result written.

mod cli;
mod commands;
mod runtime;

use std::process::ExitCode;

use clap::Parser;

fn main() -> ExitCode {
    let args = cli::Cli::parse();
    commands::dispatch(args)
}
