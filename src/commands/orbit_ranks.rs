//! `cyclorb orbit` as one rank of a distributed enumeration (docs/orbits.md §6,
//! "Distributed saturation"), over any [`Collective`]: MPI_COMM_WORLD when the program was
//! built with the feature `mpi` and started by a launcher (`orbit_mpi`), or [`Alone`], one
//! rank in this process, which continues a job's rank files `BASE.rank0` … without MPI.
//!
//! Every rank builds the same problem, takes part in every collective call and owns the
//! lines whose fingerprint maps to it; rank 0 alone prints the report (one JSON object with
//! `--json`), with every rank's lines, store and peak memory under `ranks`.

use std::sync::atomic::AtomicBool;
use std::sync::Arc;
use std::time::Instant;

use cyclorb_orbit::{
    checkpoint_origin, first_rank_checkpoint, gather_numbers, rank_checkpoint_origin, Collective,
    OrbitOptions, Silent,
};
use cyclorb_pipeline::listing::{Listing, Origin};
use cyclorb_pipeline::OrbitMethod;
use serde_json::json;

use super::orbit::{options, origin_of, text_report, with_origin};
use super::output::{shell_word, Outcome, Report};
use super::progress::OrbitProgress;
use crate::cli::OrbitArgs;
use crate::runtime::{install_stop_handler, peak_memory_bytes};

/// One rank, this process: every collective call is answered by what it was given. A job's
/// rank files, read by one rank, are regrouped into one store (the owner map of one rank
/// gives it every line), so they continue here to the answer `mpirun` would give.
pub struct Alone;

impl Collective for Alone {
    fn rank(&self) -> usize {
        0
    }

    fn size(&self) -> usize {
        1
    }

    fn exchange(&self, outgoing: Vec<Vec<u8>>) -> Vec<Vec<u8>> {
        outgoing
    }

    fn all_gather(&self, mine: Vec<u8>) -> Vec<Vec<u8>> {
        vec![mine]
    }
}

/// The number of processes an MPI launcher started, when it says so (Open MPI's
/// `OMPI_COMM_WORLD_SIZE`; `PMI_SIZE` of MPICH's `mpiexec` and of Slurm's `srun` with PMI).
/// A build without the feature `mpi` refuses to be one of several: each process would
/// enumerate the whole orbit on its own and write the same files.
#[cfg(not(feature = "mpi"))]
pub fn launcher_size() -> Option<usize> {
    ["OMPI_COMM_WORLD_SIZE", "PMI_SIZE"]
        .iter()
        .find_map(|name| std::env::var(name).ok()?.trim().parse().ok())
}

/// Whether `--resume BASE` names rank files (`BASE.rank0` exists) rather than a one-process
/// checkpoint (a file `BASE`, which wins when both exist).
pub fn names_rank_files(args: &OrbitArgs) -> bool {
    args.resume
        .as_ref()
        .is_some_and(|base| !base.is_file() && first_rank_checkpoint(base).exists())
}

/// Continue a job's rank files in this process, as one rank (no MPI needed).
pub fn resume_alone(args: &OrbitArgs, as_json: bool, started: Instant) -> Outcome {
    run_rank(&Alone, args, as_json, started).for_rank(0)
}

/// How a rank's part ended: its outcome, and whether every rank says the same (an error in
/// the arguments or the problem, found by all), so that rank 0 alone says it.
pub struct RankOutcome {
    outcome: Outcome,
    shared: bool,
}

impl RankOutcome {
    /// What rank `rank` reports: rank 0 the outcome; another rank nothing on stdout, only
    /// the exit code, and on stderr (with its rank) an error that it alone met.
    pub fn for_rank(self, rank: usize) -> Outcome {
        match self.outcome {
            outcome if rank == 0 => outcome,
            Outcome::Invalid(message) => {
                if !self.shared {
                    eprintln!("cyclorb: rank {rank}: {message}");
                }
                Outcome::Quiet(1)
            }
            other => other,
        }
    }
}

fn refusal(args: &OrbitArgs) -> Option<&'static str> {
    if args.method != OrbitMethod::Enumerate {
        return Some("under MPI only the enumerating route runs (drop --method)");
    }
    if args.spill.is_some() && args.store.as_deref() == Some("memory") {
        return Some("only the compact store spills keys to disk (drop --store memory)");
    }
    if args.words > 0 {
        return Some("a distributed run does not print words (drop --words)");
    }
    None
}

/// This rank's problem and options; with `--resume BASE` alone the problem is the one the
/// checkpoint `BASE.rank0` records (every job of any number of ranks writes it), or, when
/// there is none, the one-process checkpoint `BASE`.
fn set_up(args: &OrbitArgs, stop: Arc<AtomicBool>) -> Result<(Listing, OrbitOptions), String> {
    if let Some(reason) = refusal(args) {
        return Err(reason.into());
    }
    let completed;
    let args = match &args.resume {
        Some(base) if args.spec.is_none() && args.matrices.is_none() => {
            let first = first_rank_checkpoint(base);
            // no rank files but a file BASE: a one-process checkpoint
            let (path, recorded) = if !first.exists() && base.is_file() {
                (base.clone(), checkpoint_origin(base))
            } else {
                (first.clone(), rank_checkpoint_origin(&first))
            };
            let place = path.display().to_string();
            let origin = recorded
                .map_err(|e| e.to_string())?
                .ok_or_else(|| format!("{place} records no problem; give SPEC --genus G"))?;
            completed = with_origin(args, Origin::from_recorded(&place, &origin)?);
            &completed
        }
        _ => args,
    };
    let listing = origin_of(args).and_then(|origin| Listing::new(&origin))?;
    install_stop_handler(&stop)
        .map_err(|e| format!("cannot install the interrupt handler: {e}"))?;
    Ok((listing, options(args, stop)))
}

/// This rank's part of `cyclorb orbit`: set up, enumerate, and (rank 0) the report.
pub fn run_rank(
    world: &dyn Collective,
    args: &OrbitArgs,
    as_json: bool,
    started: Instant,
) -> RankOutcome {
    let rank = world.rank();
    let set_up = set_up(args, Arc::new(AtomicBool::new(false)));
    // no rank goes on alone: the first collective call would wait for the others forever
    let ready = gather_numbers(world, &[u64::from(set_up.is_ok())]);
    let (listing, opts) = match set_up {
        Ok(x) if ready.iter().all(|r| r[0] == 1) => x,
        Ok(_) => {
            return RankOutcome {
                outcome: Outcome::Invalid(
                    "another rank could not start (its message is on stderr)".into(),
                ),
                shared: true,
            }
        }
        Err(e) => {
            return RankOutcome {
                outcome: Outcome::Invalid(e),
                shared: ready[0][0] == 0,
            }
        }
    };
    let result = if rank == 0 {
        let mut progress = OrbitProgress::new(as_json);
        let result = listing.run_distributed(world, &opts, args.resume.as_deref(), &mut progress);
        progress.finish();
        result
    } else {
        listing.run_distributed(world, &opts, args.resume.as_deref(), &mut Silent)
    };
    let orbit = match result {
        Ok(o) => o,
        Err(e) => {
            return RankOutcome {
                outcome: Outcome::Invalid(e),
                shared: false,
            }
        }
    };
    let answer = listing.answer_distributed(&orbit, world, opts.threads, started.elapsed());
    // rank 0 alone holds B and so the trace check: its exit code is everyone's
    let code = match &answer {
        Some(a) if a.poincare_sum.trace_check == Some(false) => 1,
        _ if !orbit.is_saturated() => 3,
        _ => 0,
    };
    let figures = gather_numbers(
        world,
        &[
            orbit.local_len() as u64,
            orbit.local_store_bytes() as u64,
            peak_memory_bytes().unwrap_or(0),
            code,
        ],
    );
    let Some(mut report) = answer else {
        return RankOutcome {
            outcome: Outcome::Quiet(figures[0][3] as u8),
            shared: true,
        };
    };
    report.peak_memory_bytes = peak_memory_bytes();
    let column = |k: usize| figures.iter().map(|f| f[k]).collect::<Vec<u64>>();
    let mut value = serde_json::to_value(&report).expect("reports serialise");
    value["ranks"] = json!({
        "count": orbit.ranks(),
        "lines": column(0),
        "store_bytes": column(1),
        "peak_memory_bytes": column(2),
    });
    let mut text = text_report(&report);
    let mib: Vec<String> = column(2)
        .iter()
        .map(|&b| format!("{:.1}", b as f64 / 1048576.0))
        .collect();
    let ranks = match orbit.ranks() {
        1 => "1 rank".to_string(),
        r => format!("{r} ranks"),
    };
    text.push_str(&format!(
        "distributed over {ranks}: lines {:?}, peak memory per rank [{}] MiB\n",
        column(0),
        mib.join(", ")
    ));
    if !orbit.is_saturated() {
        match &opts.checkpoint {
            Some(plan) => {
                let base = plan.path.display().to_string();
                // one rank's files continue in one process as well (`resume_alone`)
                let launcher = match orbit.ranks() {
                    1 => String::new(),
                    r => format!("mpirun -n {r} "),
                };
                let command = format!("{launcher}cyclorb orbit --resume {}", shell_word(&base));
                let files = match orbit.ranks() {
                    1 => format!("{base}.rank0"),
                    r => format!("{base}.rank0 … {base}.rank{}", r - 1),
                };
                text.push_str(&format!(
                    "checkpoint written to {files}\ncontinue with: {command}\n"
                ));
                value["checkpoint"] = json!(base);
                value["resume_command"] = json!(command);
            }
            None => text
                .push_str("no checkpoint written: give --checkpoint BASE for one file per rank\n"),
        }
    }
    let out = Report::new(value, text, as_json);
    let outcome = match code {
        1 => Outcome::CheckFailed(out),
        3 => Outcome::Stopped(out),
        _ => Outcome::Done(out),
    };
    RankOutcome {
        outcome,
        shared: true,
    }
}
