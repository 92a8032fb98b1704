//! Command-line grammar: one struct per subcommand, shared output options.

use clap::{Args, Parser, Subcommand};

/// Exact orbits of mapping class groups on conformal blocks, over cyclotomic fields.
#[derive(Parser, Debug)]
#[command(name = "cyclorb", version, about, long_about = None)]
pub struct Cli {
    /// Print one JSON object on stdout and nothing else (no progress display).
    #[arg(long, global = true)]
    pub json: bool,
    /// The action to run.
    #[command(subcommand)]
    pub command: Command,
}

/// Every action of the program.
#[derive(Subcommand, Debug)]
pub enum Command {
    /// Arithmetic of one cyclotomic field: evaluate expressions exactly.
    Field(FieldArgs),
}

/// `cyclorb field`: exact evaluation in Q(ζ_n).
#[derive(Args, Debug)]
pub struct FieldArgs {
    /// Conductor n of Q(ζ_n).
    #[arg(long, short = 'n')]
    pub conductor: u32,
    /// Expressions to evaluate (syntax: integers, z, i, zeta(m), sqrt(r), + - * / ^, parentheses).
    #[arg(required = true)]
    pub expressions: Vec<String>,
}
