//! The sweep: a batch of runs over theories × genera (`cyclorb sweep PLAN`, and
//! `cyclorb.sweep` in Python). This module reads and checks the plan ([`plan`]), orders its
//! runs smallest first ([`schedule`]) and computes each run ([`run`]: the orbit under caps
//! with a checkpoint ([`orbit_stage`]), the Poincaré sum, the certified answers
//! ([`answers`]), the counted orbit of `dw:` theories) into a [`RunResult`]. Storing the
//! results, the summaries, the plot and the display are the host's.
//!
//! # The plan (TOML)
//!
//! ```toml
//! name = "small"                # optional; default: the file's stem
//! answers = ["orbit", "commutant", "image", "witness"]   # default: all four
//! set = "humphries"             # generating set: humphries (2g+1) or lickorish (3g-1)
//! threads = 2                   # default: every core; --threads overrides
//! checkpoint_seconds = 30       # periodic checkpoints of a running orbit (default 30)
//!
//! [limits]                      # caps of every run (default: none); an entry may override
//! lines = 100000                # stop the orbit after this many lines
//! memory_mib = 1024             # … or once its store holds this many MiB
//! seconds = 60                  # … or after this much enumeration time (all attempts)
//!
//! [witness]                     # search for a word of infinite projective order
//! depth = 4                     # every Lyndon word up to this length (default 4)
//! tries = 100                   # then this many seeded random words (default 100)
//!
//! [image]                       # image-order certificates
//! max_lines = 20000             # Schreier–Sims on orbits up to this size (default 20000)
//! enumeration_cap = 50000       # else enumerate up to this many elements (default 50000)
//!
//! [[theory]]                    # one entry per theory
//! spec = "ising"                # a built-in spec (see `cyclorb theories`) …
//! genera = [1, 2]
//!
//! [[theory]]
//! file = "../theories/z3.json"  # … or a theory file, relative to the plan's folder
//! label = "Z3"                  # name in ids and tables (default: the spec or file stem)
//! genera = [1]
//! answers = ["orbit"]           # per-entry answers, set and limits override the defaults
//! limits = { lines = 5000 }
//!
//! [[theory]]
//! spec = "dw:S3"
//! genera = [3]
//! method = "structure"          # count the orbit without listing it (untwisted dw: only;
//!                               # default "enumerate"; may also be set for the whole plan)
//! ```
//!
//! A malformed plan is refused before anything runs, with `PLAN:LINE:COLUMN: reason` and
//! the line quoted: TOML syntax, unknown keys, wrong types, genus 0, unknown answers or
//! generating sets, zero caps, and theories that cannot be read or lack the data for a
//! genus (naming the entry).
//!
//! # Runs
//! Each (theory, genus) is a run with id `<label>-g<genus>`; runs go smallest first (by
//! dim V_g, then the field degree φ(n), then plan order). Each has a run hash of everything
//! its answer depends on (theory data, genus, set, method, answers, caps, bounds), so a host
//! can reuse a stored result made for the same run.

pub mod answers;
mod hash;
pub mod orbit_stage;
pub mod plan;
pub mod result;
pub mod run;
pub mod schedule;

pub use plan::{parse_plan, read_plan, Answer, Limits, Plan, PlanError};
pub use result::{CommutantAnswer, ImageAnswer, RunResult, WitnessAnswer};
pub use run::{execute, RunEnd, SweepObserver, SweepSettings};
pub use schedule::{schedule, PlannedRun, RunSpace, Schedule};
