//! Command-line grammar: one struct per subcommand, shared output options.

use std::path::PathBuf;

use clap::{Args, Parser, Subcommand};
use cyclorb_pipeline::image::{self, ImageStrategy};
use cyclorb_pipeline::OrbitMethod;

use cyclorb_pipeline::runtime::MAX_THREADS;

/// A `--threads` value: 1 to [`MAX_THREADS`].
fn thread_count(text: &str) -> Result<usize, String> {
    match text.parse::<usize>() {
        Ok(n) if (1..=MAX_THREADS).contains(&n) => Ok(n),
        _ => Err(format!(
            "expected a number of threads from 1 to {MAX_THREADS}"
        )),
    }
}

/// Exact orbits of mapping class groups on conformal blocks, over cyclotomic fields.
#[derive(Parser, Debug)]
#[command(name = "cyclorb", version, about, long_about = None)]
pub struct Cli {
    /// Print one JSON object on stdout and nothing else (no progress display).
    #[arg(long, global = true)]
    pub json: bool,
    /// Use theory files without proving them first (every answer then says
    /// `verified: false`); raw generators are then not proved invertible either.
    #[arg(long, global = true)]
    pub unverified: bool,
    /// Memory budget in MiB (default: a quarter of the machine's memory). Sizes are
    /// estimated before they are allocated and refused past it; an orbit stops at it with a
    /// partial result (exit 3).
    #[arg(long, global = true, value_name = "MIB")]
    pub memory_limit: Option<u64>,
    /// The action to run.
    #[command(subcommand)]
    pub command: Command,
}

/// Every action of the program.
#[derive(Subcommand, Debug)]
pub enum Command {
    /// Arithmetic of one cyclotomic field: evaluate expressions exactly.
    Field(FieldArgs),
    /// The genus-G comb basis and Dehn-twist generators of a theory, exactly.
    Twists(TwistsArgs),
    /// The orbit of the vacuum line under the mapping class group, and its Poincaré sum.
    Orbit(OrbitArgs),
    /// The built-in theories and the spec syntax (products, conjugates, files).
    Theories,
    /// A theory's labels, fusion rules, dimensions, twists, c mod 8, conductor, S and T.
    Describe(DescribeArgs),
    /// Exact checks of a theory's data (pentagon, hexagons, ribbon, modularity).
    Verify(VerifyArgs),
    /// The dimension of the commutant of the generators (1 = irreducible), certified.
    Commutant(CertArgs),
    /// The order of the projective image of the mapping class group, with its certificate.
    Image(ImageArgs),
    /// A word of infinite projective order, with its exact certificate.
    Witness(WitnessArgs),
    /// A batch of runs over theories × genera, resumable, with summaries and a plot.
    Sweep(SweepArgs),
    /// Re-check a certificate file: rebuild its theory and generators and re-derive every
    /// claim by an independent computation (exit 1 at the first that fails).
    Check(CheckArgs),
    /// Shell completions (bash, zsh, fish, elvish, powershell), generated from this
    /// command-line definition.
    Completions(CompletionsArgs),
    /// The manual pages (roff), generated from this command-line definition.
    Manual(ManualArgs),
}

/// `cyclorb completions`: the completion script of one shell, on stdout.
#[derive(Args, Debug)]
pub struct CompletionsArgs {
    /// The shell: bash, zsh, fish, elvish or powershell.
    pub shell: clap_complete::Shell,
}

/// `cyclorb manual`: the manual page of the program on stdout, or one page per command.
#[derive(Args, Debug)]
pub struct ManualArgs {
    /// Write `cyclorb.1` and one `cyclorb-COMMAND.1` per command into this folder instead.
    #[arg(long, value_name = "DIR")]
    pub out: Option<PathBuf>,
}

/// `cyclorb describe`: the exact data of one theory (`--json` output is a theory file).
#[derive(Args, Debug)]
pub struct DescribeArgs {
    /// Theory: a built-in spec (see `cyclorb theories`) or a theory file.
    pub spec: String,
}

/// `cyclorb verify`: every check, exit 1 naming the first failing equation.
#[derive(Args, Debug)]
pub struct VerifyArgs {
    /// Theory: a built-in spec (see `cyclorb theories`) or a theory file.
    pub spec: String,
    /// Leave out a check by name (repeatable), e.g. `--skip pentagon` for large theories.
    #[arg(long, value_name = "CHECK")]
    pub skip: Vec<String>,
    /// Check every F/R equation on the theory's own data, even for a product or a Galois
    /// conjugate (by default those are proved on the theories they are built from).
    #[arg(long)]
    pub direct: bool,
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

/// The block space a command works on: a theory, a genus and a generating set.
#[derive(Args, Debug)]
pub struct SpaceArgs {
    /// Theory: a built-in spec (see `cyclorb theories`) or a theory file.
    pub spec: String,
    /// Genus of the surface (≥ 1).
    #[arg(long, short = 'g')]
    pub genus: usize,
    /// Generating set of Dehn twists: humphries (2g+1 curves) or lickorish (3g−1 curves).
    #[arg(long, default_value = "humphries")]
    pub set: String,
}

/// `cyclorb twists`: the block space and its Dehn twists.
#[derive(Args, Debug)]
pub struct TwistsArgs {
    /// Theory, genus and generating set.
    #[command(flatten)]
    pub space: SpaceArgs,
    /// Verify the mapping class group relations and form invariance exactly.
    #[arg(long)]
    pub check: bool,
    /// Write the generators (exact, sparse) to this file; `cyclorb orbit --matrices` reads it.
    #[arg(long)]
    pub out: Option<PathBuf>,
}

/// `cyclorb orbit`: saturate the orbit of the seed line and sum it.
#[derive(Args, Debug, Clone)]
pub struct OrbitArgs {
    /// Theory: a built-in spec or a theory file (omit with --matrices, or with --resume
    /// alone: the checkpoint records it).
    #[arg(required_unless_present_any = ["matrices", "resume"], conflicts_with = "matrices")]
    pub spec: Option<String>,
    /// Genus of the surface (with SPEC).
    #[arg(long, short = 'g', required_unless_present_any = ["matrices", "resume"])]
    pub genus: Option<usize>,
    /// Generating set of Dehn twists: humphries or lickorish (with SPEC).
    #[arg(long, default_value = "humphries")]
    pub set: String,
    /// Raw mode: a generator-set file (as written by `cyclorb twists --out`).
    #[arg(long, requires = "seed")]
    pub matrices: Option<PathBuf>,
    /// Raw mode: the seed-vector file.
    #[arg(long, requires = "matrices")]
    pub seed: Option<PathBuf>,
    /// Stop unsaturated (exit 3) after this many lines.
    #[arg(long)]
    pub limit: Option<usize>,
    /// Worker threads (the answer does not depend on it; 1 to 256); default: every core.
    #[arg(long, value_parser = thread_count)]
    pub threads: Option<usize>,
    /// Write a resumable checkpoint here periodically and when stopped (default: a file
    /// `cyclorb-orbit-HASH.ckpt` in $XDG_CACHE_HOME/cyclorb or ~/.cache/cyclorb, removed
    /// when the orbit closes).
    #[arg(long)]
    pub checkpoint: Option<PathBuf>,
    /// Seconds between periodic checkpoints.
    #[arg(long, default_value_t = 120)]
    pub checkpoint_every: u64,
    /// Continue from this checkpoint (it keeps being updated unless --checkpoint names another
    /// file). Alone, it is enough: the checkpoint records the theory, genus and generating
    /// set (or the raw files).
    #[arg(long)]
    pub resume: Option<PathBuf>,
    /// Where the lines are kept: `compact` (a Schreier record and a 62-bit fingerprint per
    /// line, about 20 bytes, exact keys only for the last layers; older lines are recomputed
    /// from their words) or `memory` (every exact key, about 90 bytes per line on Ising at
    /// genus 3, no recomputation). The answer is the same. A resumed run keeps the store of
    /// its checkpoint. Default: memory.
    #[arg(long, value_parser = ["memory", "compact"])]
    pub store: Option<String>,
    /// With the compact store (implied): keep the keys of finished layers in files in this
    /// directory (removed as the run moves on), so that an orbit larger than
    /// --memory-limit can complete; only the layer being built stays in memory. Under MPI
    /// each rank uses a directory of its own, DIR/rank0, DIR/rank1, ….
    #[arg(long, value_name = "DIR")]
    pub spill: Option<PathBuf>,
    /// Print the word (in generator names) of this many orbit elements, farthest first.
    #[arg(long, default_value_t = 0)]
    pub words: usize,
    /// How to find the orbit.
    #[arg(long, value_enum, default_value_t = OrbitMethod::Enumerate)]
    pub method: OrbitMethod,
    /// With `--method structure`: write its certificate (JSON) to this file; `cyclorb check`
    /// re-checks it.
    #[arg(long)]
    pub out: Option<PathBuf>,
}

/// `cyclorb check`: re-derive every claim of a certificate file.
#[derive(Args, Debug)]
pub struct CheckArgs {
    /// A certificate written by `--out` (`image`, `witness`, `commutant`,
    /// `orbit --method structure`).
    pub file: PathBuf,
}

/// The theory, genus and generating set every certificate command reads.
#[derive(Args, Debug)]
pub struct CertArgs {
    /// Theory, genus and generating set.
    #[command(flatten)]
    pub space: SpaceArgs,
    /// Write the full certificate (JSON) to this file.
    #[arg(long)]
    pub out: Option<PathBuf>,
}

/// `cyclorb image`: the projective image order.
#[derive(Args, Debug)]
pub struct ImageArgs {
    /// Theory, genus, generating set, certificate file.
    #[command(flatten)]
    pub common: CertArgs,
    /// Largest image enumerated element by element (route `enumeration`, and the fallback of
    /// `auto` when no set of lines proves faithfulness within the orbit limit).
    #[arg(long, default_value_t = image::DEFAULT_ENUMERATION_CAP)]
    pub enumeration_cap: usize,
    /// Most lines stored for the Schreier–Sims route (the vacuum orbit and any orbits added
    /// to prove faithfulness); about 370 bytes per line at the peak (SU(2)_4 at genus 2:
    /// 1 228 800 lines, 450 MB).
    #[arg(long, default_value_t = image::DEFAULT_ORBIT_LIMIT)]
    pub orbit_limit: usize,
    /// Which route to take (`auto` tries them in turn, once the vacuum orbit passes 100 000
    /// lines unclosed with a witness search; the others take only the route named).
    #[arg(long, value_enum, default_value_t = ImageStrategy::Auto)]
    pub route: ImageStrategy,
}

/// `cyclorb witness`: search for an element of infinite projective order.
#[derive(Args, Debug)]
pub struct WitnessArgs {
    /// Theory, genus, generating set, certificate file.
    #[command(flatten)]
    pub common: CertArgs,
    /// Every word up to this length is tried (Lyndon words).
    #[arg(long, default_value_t = 6)]
    pub depth: usize,
    /// Then this many seeded random words.
    #[arg(long, default_value_t = 200)]
    pub tries: usize,
    /// Seed of the pseudo-random words (a number; not the seed vector of `orbit --seed`).
    #[arg(long, default_value_t = 1)]
    pub word_seed: u64,
}

/// `cyclorb sweep`: a plan of runs over theories × genera, resumable, with reports.
#[derive(Args, Debug)]
pub struct SweepArgs {
    /// The plan (TOML; see `fixtures/sweeps/small.toml` and the README).
    pub plan: PathBuf,
    /// Output folder (results, checkpoints, summaries, plot); default: PLAN's name + `-sweep`.
    #[arg(long)]
    pub out: Option<PathBuf>,
    /// Worker threads for every run (overrides the plan; answers do not depend on it; 1 to 256).
    #[arg(long, value_parser = thread_count)]
    pub threads: Option<usize>,
    /// List the runs in the order they would run, with their dimensions, and stop.
    #[arg(long)]
    pub dry_run: bool,
}
