//! `cyclorb orbit` started by an MPI launcher (cargo feature `mpi`): the enumeration spread
//! over the ranks of MPI_COMM_WORLD (docs/orbits.md §6, "Distributed saturation").
//!
//! Every rank builds the same problem, takes part in every collective call and owns the
//! lines whose fingerprint maps to it; rank 0 alone prints the report (one JSON object with
//! `--json`), with every rank's lines, store and peak memory under `ranks`. The other ranks
//! print nothing on stdout and exit with the same code; an error found on one rank alone is
//! printed on stderr with its rank, before MPI is finished.

use std::sync::atomic::AtomicBool;
use std::sync::Arc;
use std::time::Instant;

use cyclorb_orbit::{
    checkpoint_origin, gather_numbers, rank_checkpoint_origin, rank_checkpoint_path, Collective,
    OrbitOptions, Silent,
};
use cyclorb_pipeline::listing::{Listing, Origin};
use cyclorb_pipeline::OrbitMethod;
use mpi::datatype::{Partition, PartitionMut};
use mpi::topology::SimpleCommunicator;
use mpi::traits::*;
use mpi::{Count, Threading};
use serde_json::json;

use super::orbit::{options, origin_of, text_report, with_origin};
use super::output::{shell_word, Outcome, Report};
use super::progress::OrbitProgress;
use crate::cli::OrbitArgs;
use crate::runtime::{install_stop_handler, peak_memory_bytes};

/// Whether this process was started by an MPI launcher (Open MPI's `mpirun`, a PMI or
/// PMIx launcher such as MPICH's `mpiexec` or Slurm's `srun`): then `cyclorb orbit` runs
/// distributed, with one rank or many.
pub fn launched() -> bool {
    ["OMPI_COMM_WORLD_SIZE", "PMI_SIZE", "PMI_RANK", "PMIX_RANK"]
        .iter()
        .any(|name| std::env::var_os(name).is_some())
}

/// MPI_COMM_WORLD as the enumeration's [`Collective`].
struct World(SimpleCommunicator);

/// A buffer length as MPI's count type; a message past 2 GiB is beyond what a round of the
/// enumeration sends (a few megabytes per chunk of the frontier).
fn count(len: usize) -> Count {
    Count::try_from(len).expect("an MPI message under 2 GiB")
}

/// A byte buffer of `len` zeros whose address is a real allocation even when `len` is 0:
/// an empty `Vec`'s dangling address is 1, which Open MPI reads as `MPI_IN_PLACE`.
fn buffer(len: usize) -> Vec<u8> {
    let mut b = Vec::with_capacity(len.max(1));
    b.resize(len, 0);
    b
}

/// `parts` one after another in a [`buffer`].
fn joined(parts: &[Vec<u8>]) -> Vec<u8> {
    let mut b = buffer(0);
    b.reserve(parts.iter().map(Vec::len).sum());
    for p in parts {
        b.extend_from_slice(p);
    }
    b
}

fn displacements(counts: &[Count]) -> Vec<Count> {
    counts
        .iter()
        .scan(0, |at, &c| {
            let here = *at;
            *at += c;
            Some(here)
        })
        .collect()
}

/// The received bytes cut into one buffer per rank.
fn split(bytes: &[u8], counts: &[Count]) -> Vec<Vec<u8>> {
    let mut at = 0usize;
    counts
        .iter()
        .map(|&c| {
            let part = bytes[at..at + c as usize].to_vec();
            at += c as usize;
            part
        })
        .collect()
}

impl Collective for World {
    fn rank(&self) -> usize {
        self.0.rank() as usize
    }

    fn size(&self) -> usize {
        self.0.size() as usize
    }

    fn exchange(&self, outgoing: Vec<Vec<u8>>) -> Vec<Vec<u8>> {
        let send_counts: Vec<Count> = outgoing.iter().map(|b| count(b.len())).collect();
        let mut recv_counts = vec![0 as Count; self.size()];
        self.0
            .all_to_all_into(&send_counts[..], &mut recv_counts[..]);
        let send = joined(&outgoing);
        let send_displs = displacements(&send_counts);
        let recv_displs = displacements(&recv_counts);
        let mut recv = buffer(recv_counts.iter().map(|&c| c as usize).sum());
        {
            let sending = Partition::new(&send[..], &send_counts[..], &send_displs[..]);
            let mut receiving =
                PartitionMut::new(&mut recv[..], &recv_counts[..], &recv_displs[..]);
            self.0.all_to_all_varcount_into(&sending, &mut receiving);
        }
        split(&recv, &recv_counts)
    }

    fn all_gather(&self, mine: Vec<u8>) -> Vec<Vec<u8>> {
        let mut counts = vec![0 as Count; self.size()];
        self.0.all_gather_into(&count(mine.len()), &mut counts[..]);
        let displs = displacements(&counts);
        let mine = joined(&[mine]);
        let mut recv = buffer(counts.iter().map(|&c| c as usize).sum());
        {
            let mut receiving = PartitionMut::new(&mut recv[..], &counts[..], &displs[..]);
            self.0.all_gather_varcount_into(&mine[..], &mut receiving);
        }
        split(&recv, &counts)
    }
}

/// How a rank's part ended: its outcome, and whether every rank says the same (an error in
/// the arguments or the problem, found by all), so that rank 0 alone says it.
struct RankOutcome {
    outcome: Outcome,
    shared: bool,
}

/// Run `cyclorb orbit` on this rank: MPI is started here, the report printed, then MPI
/// finished.
pub fn run(args: &OrbitArgs, as_json: bool, started: Instant) -> Outcome {
    let Some((universe, _)) = mpi::initialize_with_threading(Threading::Funneled) else {
        return Outcome::Invalid("MPI could not be initialised".into());
    };
    let world = World(universe.world());
    let rank = world.rank();
    let RankOutcome { outcome, shared } = run_rank(&world, args, as_json, started);
    // printed while MPI runs: MPI_Finalize waits for every rank, so no rank exits (and
    // makes the launcher end the others) before rank 0 has said its part
    match outcome {
        _ if rank == 0 => outcome.printed(),
        Outcome::Invalid(message) => {
            // now, before MPI is finished: the launcher may end this rank once rank 0 exits
            if !shared {
                eprintln!("cyclorb: rank {rank}: {message}");
            }
            Outcome::Quiet(1)
        }
        other => other,
    }
}

fn refusal(args: &OrbitArgs) -> Option<&'static str> {
    if args.method != OrbitMethod::Enumerate {
        return Some("under MPI only the enumerating route runs (drop --method)");
    }
    if args.store.is_some() || args.spill.is_some() {
        return Some(
            "a distributed run keeps each rank's lines in the memory store (drop --store/--spill)",
        );
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
            let first = rank_checkpoint_path(base, 0);
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

fn run_rank(world: &World, args: &OrbitArgs, as_json: bool, started: Instant) -> RankOutcome {
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
    text.push_str(&format!(
        "distributed over {} ranks: lines {:?}, peak memory per rank [{}] MiB\n",
        orbit.ranks(),
        column(0),
        mib.join(", ")
    ));
    if !orbit.is_saturated() {
        match &opts.checkpoint {
            Some(plan) => {
                let base = plan.path.display().to_string();
                let command = format!(
                    "mpirun -n {} cyclorb orbit --resume {}",
                    orbit.ranks(),
                    shell_word(&base)
                );
                text.push_str(&format!(
                    "checkpoint written to {base}.rank0 … {base}.rank{}\ncontinue with: {command}\n",
                    orbit.ranks() - 1
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
