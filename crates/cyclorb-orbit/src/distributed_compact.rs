//! The compact store over ranks (docs/orbits.md §6, "The compact store over ranks").
//!
//! Each rank keeps its own lines as the compact store does (record, wide fingerprint, a
//! window of recent layers' keys), with global parent indices in the records. A line past
//! the window cannot be recomputed from the rank's records alone: its word runs through
//! lines that other ranks own. So:
//!
//! - every line's record is filed, by global index, with a *holder* rank (index i with rank
//!   i mod R, at position i / R: the [`RecordDirectory`]), known to every rank without
//!   asking;
//! - an image whose fingerprint matches an old line of its owner joins the layer as a
//!   candidate marked *pending*; at the end of the layer the old lines' words are followed
//!   from holder to holder back to the seed ([`words_of`]: one exchange per step of the
//!   longest word, for all pending lines of all ranks at once), the lines are recomputed
//!   from their words and compared exactly, and a candidate equal to its old line is
//!   dropped before the layer's indices are given;
//! - B = Σ v v† is summed layer by layer while the keys are held ([`LayerSums`]), since no
//!   rank can regenerate its lines afterwards.

use cyclorb_field::Cyc;
use cyclorb_matrix::Matrix;

use crate::collective::{gather_numbers, Collective};
use crate::compact::reserve_gently;
use crate::error::OrbitError;
use crate::problem::OrbitProblem;
use crate::store::KeyArena;

/// The Schreier records of all lines by global index, spread over the ranks: rank r holds
/// those of the indices i ≡ r (mod R), the record of i at position i / R, in 5 bytes (the
/// compact store has at most 255 generators). The seed (index 0, on rank 0) has parent
/// `u32::MAX` and generator `u8::MAX`.
#[derive(Debug)]
pub(crate) struct RecordDirectory {
    rank: usize,
    ranks: usize,
    parents: Vec<u32>,
    generators: Vec<u8>,
}

impl RecordDirectory {
    /// The directory of an orbit holding only the seed.
    pub(crate) fn new(rank: usize, ranks: usize) -> RecordDirectory {
        let mut directory = RecordDirectory {
            rank,
            ranks,
            parents: Vec::new(),
            generators: Vec::new(),
        };
        if rank == 0 {
            directory.parents.push(u32::MAX);
            directory.generators.push(u8::MAX);
        }
        directory
    }

    /// The share of rank `rank` of `ranks` rebuilt from records (global index, parent,
    /// generator) in any order; every index i ≡ rank (mod ranks) below `total` must be
    /// there once, and no other.
    pub(crate) fn from_records(
        rank: usize,
        ranks: usize,
        mut records: Vec<(u32, u32, u8)>,
        total: usize,
    ) -> Result<RecordDirectory, String> {
        records.sort_unstable();
        let expected = if rank < total {
            (total - rank).div_ceil(ranks)
        } else {
            0
        };
        if records.len() != expected {
            return Err(format!(
                "{} records for rank {rank} of {ranks}, {expected} expected",
                records.len()
            ));
        }
        let mut directory = RecordDirectory {
            rank,
            ranks,
            parents: Vec::with_capacity(records.len()),
            generators: Vec::with_capacity(records.len()),
        };
        for (at, (index, parent, generator)) in records.into_iter().enumerate() {
            if index as usize != rank + ranks * at {
                return Err(format!("no record of line {}", rank + ranks * at));
            }
            directory.parents.push(parent);
            directory.generators.push(generator);
        }
        Ok(directory)
    }

    /// The records held: (global index, parent, generator), by increasing index.
    pub(crate) fn records(&self) -> impl Iterator<Item = (u32, u32, u8)> + '_ {
        self.parents
            .iter()
            .zip(&self.generators)
            .enumerate()
            .map(|(at, (&p, &g))| ((self.rank + self.ranks * at) as u32, p, g))
    }

    /// The rank holding the record of global index `index`.
    fn holder(&self, index: u32) -> usize {
        index as usize % self.ranks
    }

    /// The record (parent, generator) of global index `index`, when this rank holds it.
    fn record(&self, index: u32) -> Option<(u32, u8)> {
        if self.holder(index) != self.rank {
            return None;
        }
        let at = index as usize / self.ranks;
        Some((*self.parents.get(at)?, *self.generators.get(at)?))
    }

    /// Bytes held (5 per record held, and an eighth of slack while the vectors grow).
    pub(crate) fn bytes_used(&self) -> usize {
        self.parents.capacity() * 4 + self.generators.capacity()
    }

    /// File the records of a layer's new lines: every rank passes its own kept new lines as
    /// (global index, order key = parent·2¹⁶ + generator); each record goes to its holder,
    /// which appends them in index order. Collective.
    pub(crate) fn file(
        &mut self,
        comm: &dyn Collective,
        new_lines: &[(u32, u64)],
    ) -> Result<(), OrbitError> {
        let mut outgoing = vec![Vec::new(); self.ranks];
        for &(index, order) in new_lines {
            let to = &mut outgoing[self.holder(index)];
            to.extend_from_slice(&index.to_le_bytes());
            to.extend_from_slice(&order.to_le_bytes());
        }
        let mut received: Vec<(u32, u64)> = comm
            .exchange(outgoing)
            .iter()
            .flat_map(|bytes| {
                bytes.chunks_exact(12).map(|c| {
                    let index = u32::from_le_bytes(c[..4].try_into().expect("4 bytes"));
                    let order = u64::from_le_bytes(c[4..].try_into().expect("8 bytes"));
                    (index, order)
                })
            })
            .collect();
        received.sort_unstable();
        for (index, order) in received {
            let expected = self.rank + self.ranks * self.parents.len();
            if index as usize != expected {
                return Err(OrbitError::Invalid(format!(
                    "rank {}: the record of line {index} arrived where line {expected} was due",
                    self.rank
                )));
            }
            reserve_gently(&mut self.parents);
            reserve_gently(&mut self.generators);
            self.parents.push((order >> 16) as u32);
            self.generators.push((order & 0xff) as u8);
        }
        Ok(())
    }
}

/// The words (generator indices in the order they are applied to the seed, a byte each as
/// the compact store records them) of the lines whose records are `records` (parent's
/// global index, generator; the seed's is (`u32::MAX`, `u8::MAX`)), followed back to the
/// seed through the holders' records. Collective: every rank calls it, with its own lines
/// (possibly none); the exchanges run until the longest word of any rank is complete.
pub(crate) fn words_of(
    comm: &dyn Collective,
    directory: &RecordDirectory,
    records: &[(u32, u8)],
) -> Result<Vec<Vec<u8>>, OrbitError> {
    let ranks = comm.size();
    // each word grows from the line back to the seed; `at` is the next line to look up
    // (0, the seed, when the word is complete; the seed's own record gives the empty word)
    let mut words: Vec<Vec<u8>> = records
        .iter()
        .map(|&(p, g)| if p == u32::MAX { vec![] } else { vec![g] })
        .collect();
    let mut at: Vec<u32> = records
        .iter()
        .map(|&(p, _)| if p == u32::MAX { 0 } else { p })
        .collect();
    let mut failure = None;
    loop {
        let active: Vec<usize> = (0..at.len()).filter(|&i| at[i] != 0).collect();
        let going = gather_numbers(comm, &[active.len() as u64]);
        if going.iter().all(|g| g[0] == 0) {
            break;
        }
        let mut outgoing = vec![Vec::new(); ranks];
        let mut asked = vec![Vec::new(); ranks];
        for &i in &active {
            let to = directory.holder(at[i]);
            outgoing[to].extend_from_slice(&at[i].to_le_bytes());
            asked[to].push(i);
        }
        let replies = comm
            .exchange(outgoing)
            .iter()
            .map(|bytes| {
                bytes
                    .chunks_exact(4)
                    .flat_map(|c| {
                        let index = u32::from_le_bytes(c.try_into().expect("4 bytes"));
                        // an index this rank does not hold is answered with the seed's
                        // record, which no asked line (never the seed) can have
                        let (parent, generator) =
                            directory.record(index).unwrap_or((u32::MAX, u8::MAX));
                        let mut reply = parent.to_le_bytes().to_vec();
                        reply.push(generator);
                        reply
                    })
                    .collect()
            })
            .collect();
        for (from, bytes) in comm.exchange(replies).iter().enumerate() {
            for (&i, c) in asked[from].iter().zip(bytes.chunks_exact(5)) {
                let parent = u32::from_le_bytes(c[..4].try_into().expect("4 bytes"));
                let generator = c[4];
                if parent == u32::MAX {
                    failure.get_or_insert_with(|| {
                        OrbitError::Invalid(format!(
                            "rank {from} holds no record of line {}",
                            at[i]
                        ))
                    });
                    at[i] = 0;
                    continue;
                }
                words[i].push(generator);
                at[i] = parent;
            }
        }
    }
    if let Some(e) = failure {
        return Err(e);
    }
    for word in &mut words {
        word.reverse();
    }
    Ok(words)
}

/// This rank's part of B = Σ v v† (docs/orbits.md §3), summed layer by layer over the
/// rank's own lines while their keys are held. B is exact, so the grouping by layer and
/// rank gives the same total as one sum over all lines.
#[derive(Debug)]
pub(crate) struct LayerSums {
    form: Vec<Cyc>,
    norm: Cyc,
    b: Matrix,
}

impl LayerSums {
    /// Zero, for a problem whose sum is defined (unitary generators and a seed of non-zero
    /// norm); `None` otherwise (the sum then reports the reason).
    pub(crate) fn new(problem: &OrbitProblem) -> Option<LayerSums> {
        problem.check_unitary().ok()?;
        let form = problem.generators.form_diagonal();
        let norm = problem.form_norm(&problem.seed, &form).ok()?;
        let d = problem.dimension();
        Some(LayerSums {
            b: Matrix::zeros(&problem.field, d, d),
            form,
            norm,
        })
    }

    /// Add the terms of the lines whose keys are `keys`.
    pub(crate) fn add(
        &mut self,
        problem: &OrbitProblem,
        keys: &KeyArena,
        threads: usize,
    ) -> Result<(), OrbitError> {
        match self.terms(problem, keys, threads)? {
            Some(part) => self.add_part(&problem.field, &part),
            None => Ok(()),
        }
    }

    /// Add a part of B summed elsewhere (another rank's, read from its checkpoint).
    pub(crate) fn add_part(
        &mut self,
        field: &cyclorb_field::CyclotomicField,
        part: &Matrix,
    ) -> Result<(), OrbitError> {
        self.b = self.b.add(field, part)?;
        Ok(())
    }

    /// Take away the terms of the lines whose keys are `keys` (added before with others).
    pub(crate) fn subtract(
        &mut self,
        problem: &OrbitProblem,
        keys: &KeyArena,
        threads: usize,
    ) -> Result<(), OrbitError> {
        if let Some(part) = self.terms(problem, keys, threads)? {
            self.b = self.b.sub(&problem.field, &part)?;
        }
        Ok(())
    }

    /// Σ v v† over `keys` (`None` for no keys).
    fn terms(
        &self,
        problem: &OrbitProblem,
        keys: &KeyArena,
        threads: usize,
    ) -> Result<Option<Matrix>, OrbitError> {
        if keys.len() == 0 {
            return Ok(None);
        }
        crate::sum::sum_matrix(
            problem,
            keys,
            threads,
            &self.form,
            &self.norm,
            crate::sum::Tuning::default(),
        )
        .map(Some)
    }

    /// The seed's norm and this rank's part of B.
    pub(crate) fn parts(&self) -> (Cyc, Matrix) {
        (self.norm.clone(), self.b.clone())
    }

    /// The part summed so far, as a checkpoint holds it.
    pub(crate) fn part(&self) -> &Matrix {
        &self.b
    }

    /// The sums of a resumed run, whose part so far is `b`.
    pub(crate) fn resumed(problem: &OrbitProblem, b: Matrix) -> Option<LayerSums> {
        LayerSums::new(problem).map(|sums| LayerSums { b, ..sums })
    }
}

/// What a rank keeps besides its lines when they are in the compact store: its share of
/// the record directory and its part of B.
#[derive(Debug)]
pub(crate) struct CompactShare {
    pub(crate) directory: RecordDirectory,
    /// `None` when the problem has no Poincaré sum (the sum says why).
    pub(crate) sums: Option<LayerSums>,
}
