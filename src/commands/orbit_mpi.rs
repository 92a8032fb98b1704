//! `cyclorb orbit` started by an MPI launcher (cargo feature `mpi`): the enumeration spread
//! over the ranks of MPI_COMM_WORLD (docs/orbits.md §6, "Distributed saturation").
//!
//! Every rank builds the same problem, takes part in every collective call and owns the
//! lines whose fingerprint maps to it; rank 0 alone prints the report (one JSON object with
//! `--json`), with every rank's lines, store and peak memory under `ranks`. The other ranks
//! print nothing on stdout and exit with the same code; an error found on one rank alone is
//! printed on stderr with its rank, before MPI is finished.

use std::time::Instant;

use cyclorb_orbit::Collective;
use mpi::datatype::{Partition, PartitionMut};
use mpi::topology::SimpleCommunicator;
use mpi::traits::*;
use mpi::{Count, Threading};

use super::orbit_ranks::run_rank;
use super::output::Outcome;
use crate::cli::OrbitArgs;

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

/// Run `cyclorb orbit` on this rank: MPI is started here, the report printed, then MPI
/// finished.
pub fn run(args: &OrbitArgs, as_json: bool, started: Instant) -> Outcome {
    let Some((universe, _)) = mpi::initialize_with_threading(Threading::Funneled) else {
        return Outcome::Invalid("MPI could not be initialised".into());
    };
    let world = World(universe.world());
    let rank = world.rank();
    let outcome = run_rank(&world, args, as_json, started).for_rank(rank);
    // printed while MPI runs: MPI_Finalize waits for every rank, so no rank exits (and
    // makes the launcher end the others) before rank 0 has said its part
    outcome.printed()
}
