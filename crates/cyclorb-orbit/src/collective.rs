//! The communication a distributed enumeration needs, as a trait: the crate knows no
//! message-passing library. The program implements it over MPI (cargo feature `mpi` of the
//! `cyclorb` package); the tests implement it with threads (tests/orbit/distributed.rs).
//!
//! Every rank makes the same collective calls in the same order (the enumeration is written
//! so that it does, whatever each rank holds), as MPI's collectives require.

/// Ranks 0..size exchanging byte buffers collectively.
pub trait Collective {
    /// This process's rank, 0 ≤ rank < size.
    fn rank(&self) -> usize;

    /// Number of ranks.
    fn size(&self) -> usize;

    /// All-to-all: `outgoing[r]` goes to rank r (`outgoing.len()` is the size); returns what
    /// every rank sent to this one, indexed by sender.
    fn exchange(&self, outgoing: Vec<Vec<u8>>) -> Vec<Vec<u8>>;

    /// Every rank's `mine`, indexed by rank, on every rank.
    fn all_gather(&self, mine: Vec<u8>) -> Vec<Vec<u8>>;
}

/// Every rank's list of numbers, indexed by rank, on every rank.
pub fn gather_numbers(comm: &dyn Collective, mine: &[u64]) -> Vec<Vec<u64>> {
    let bytes = mine.iter().flat_map(|x| x.to_le_bytes()).collect();
    comm.all_gather(bytes)
        .into_iter()
        .map(|b| {
            b.chunks_exact(8)
                .map(|c| u64::from_le_bytes(c.try_into().expect("8-byte chunks")))
                .collect()
        })
        .collect()
}

/// The rank that owns the line with this fingerprint among `ranks` ranks. The fingerprint
/// is a function of the line alone, so every rank names the same owner; the multiplier
/// mixes its bits apart from the hash the stores' tables use.
pub(crate) fn owner(fingerprint: u64, ranks: usize) -> usize {
    let mixed = fingerprint.wrapping_mul(0xD6E8_FEB8_6659_FD93);
    ((mixed >> 32) % ranks.max(1) as u64) as usize
}
