//! Breadth-first saturation spread over ranks (docs/orbits.md §6, "Distributed saturation").
//!
//! Rank r owns the lines whose fingerprint maps to r ([`crate::collective`]'s `owner`); the
//! fingerprint is a function of the line alone, so every rank names the same owner. A rank
//! keeps only the lines it owns (memory store, or compact store with the additions of
//! `distributed_compact`), each with its global index and its Schreier record (global
//! index of the parent, generator). Each layer:
//!
//! 1. every rank expands its part of the frontier in rounds of `chunk_size` elements (all
//!    ranks run the same number of rounds) and sends each image it does not already know
//!    to the image's owner, with the exact key and the order key (parent's global index,
//!    generator);
//! 2. the owner decides membership exactly (the key compared with the stored lines and
//!    with the layer's new lines, never the fingerprint alone) and keeps, for a line reached
//!    several times, the least order key;
//! 3. at the end of the layer a line's global index is the number of the layer's new lines
//!    with a smaller order key, plus the lines of the earlier layers: the order keys are
//!    ranked by slices of the parents' indices, one slice per rank (`rank_order_keys`).
//!
//! The one-process engine inserts a layer's lines in (parent, generator) order and keeps the
//! first record of each, so the global indices, records, words and layer sizes are the ones
//! it finds, for any number of ranks; a line limit keeps the first lines in that order, as
//! it does. B is a sum over the lines, exact, so its grouping by rank does not matter: each
//! rank sums its own lines and rank 0 adds the parts.
//!
//! Stops (the stop flag, the memory ceiling on a rank's store) are agreed between rounds:
//! every rank reports its state and all stop together, at the last finished layer. An error
//! on one rank stops every rank with an error.

use std::path::Path;
use std::time::Instant;

use cyclorb_matrix::Matrix;

use crate::collective::{gather_numbers, owner, Collective};
use crate::compact::reserve_gently;
use crate::distributed_compact::{words_of, CompactShare, LayerSums, RecordDirectory};
use crate::engine::{Orbit, OrbitOptions, Progress, ProgressObserver, StopReason};
use crate::error::OrbitError;
use crate::key::KeyNumbers;
use crate::poincare::PoincareSum;
use crate::problem::OrbitProblem;
use crate::rank_checkpoint::{
    first_rank_checkpoint, next_rank_checkpoint_path, rank_checkpoint_path, rank_checkpoint_ranks,
    rank_file,
};
use crate::regenerate::layer_ranges;
use crate::set::{LineStore, StoreKind};
use crate::sparse_numerators::SparseNumerators;
use crate::step::Workspace;
use crate::store::KeyArena;
use crate::wire::{encode, Reader, WireCandidate};

/// This rank's share of an orbit enumerated over several ranks, with the figures every
/// rank agrees on (global size, layers, saturation).
#[derive(Debug)]
pub struct DistributedOrbit {
    /// The lines this rank owns (records hold global parent indices); its layer ends are
    /// the local ends of the finished layers, `processed` the start of the frontier.
    pub(crate) local: Orbit,
    /// The global index of each local line.
    pub(crate) global: Vec<u32>,
    /// Global end index of every finished layer.
    pub(crate) layer_ends: Vec<usize>,
    pub(crate) total: usize,
    pub(crate) ranks: usize,
    pub(crate) saturated: bool,
    pub(crate) stop: Option<StopReason>,
    /// The record directory and the part of B, when the lines are in the compact store.
    pub(crate) compact: Option<CompactShare>,
}

impl DistributedOrbit {
    /// Number of distinct lines found by all ranks.
    pub fn len(&self) -> usize {
        self.total
    }

    /// Never true: the seed's line is always there.
    pub fn is_empty(&self) -> bool {
        self.total == 0
    }

    /// True when the orbit is proved closed under every generator.
    pub fn is_saturated(&self) -> bool {
        self.saturated
    }

    /// Why the run ended before saturation (`None` when saturated).
    pub fn stop_reason(&self) -> Option<StopReason> {
        if self.saturated {
            None
        } else {
            self.stop
        }
    }

    /// New lines at each breadth-first depth, as the one-process run reports them (the last
    /// entry may be a layer cut by the line limit).
    pub fn layer_sizes(&self) -> Vec<usize> {
        layer_ranges(&self.layer_ends, self.total)
            .iter()
            .map(|r| r.len())
            .collect()
    }

    /// Number of ranks.
    pub fn ranks(&self) -> usize {
        self.ranks
    }

    /// Lines this rank owns.
    pub fn local_len(&self) -> usize {
        self.local.len()
    }

    /// Bytes held by this rank's store (keys, records, table, global indices, and with the
    /// compact store its share of the record directory).
    pub fn local_store_bytes(&self) -> usize {
        let directory = self
            .compact
            .as_ref()
            .map_or(0, |c| c.directory.bytes_used());
        self.local.store_bytes() + self.global.capacity() * 4 + directory
    }

    /// The store holding this rank's lines (the same on every rank).
    pub fn store_kind(&self) -> StoreKind {
        self.local.set.kind()
    }

    /// Bytes of this rank's compact store's window of keys (0 for the memory store).
    pub fn local_window_bytes(&self) -> usize {
        self.local.set.window_bytes()
    }

    /// Bytes per numerator of this rank's keys (1, 2, 4 or 8).
    pub fn numerator_width(&self) -> usize {
        self.local.numerator_width()
    }

    /// Seconds this rank spent enumerating.
    pub fn compute_seconds(&self) -> f64 {
        self.local.compute_seconds()
    }

    /// The Schreier records of this rank's lines: (global index, global parent, generator);
    /// the seed's parent and generator are `u32::MAX` and `u16::MAX`.
    pub fn local_records(&self) -> impl Iterator<Item = (u32, u32, u16)> + '_ {
        self.global.iter().enumerate().map(|(i, &g)| {
            let (parent, generator) = match &self.local.set {
                LineStore::Memory(s) => (s.parents[i], s.generators[i]),
                // the compact store keeps a generator in a byte: the seed's is u16::MAX
                LineStore::Compact(s) if s.parents[i] == u32::MAX => (u32::MAX, u16::MAX),
                LineStore::Compact(s) => (s.parents[i], s.generators[i] as u16),
            };
            (g, parent, generator)
        })
    }
}

/// A layer's new lines on their owner before their global indices are known: exact keys in
/// a store of their own, with the least order key seen for each.
struct NewLayer {
    lines: LineStore,
    orders: Vec<u64>,
    fingerprints: Vec<u64>,
    /// (new line, old local line): the new line's fingerprint matched an old line whose key
    /// the compact store no longer holds; settled at the end of the layer.
    pending: Vec<(u32, u32)>,
    /// New lines found equal to an old line when the pending ones were settled.
    known: Vec<bool>,
}

/// Status codes of the agreement between rounds.
const GOING: u8 = 0;
const MEMORY: u8 = 1;
const INTERRUPTED: u8 = 2;
const FAILED: u8 = 3;

impl OrbitProblem {
    /// Enumerate the orbit of the seed's line over the ranks of `comm` (every rank calls
    /// this with the same problem and options). Each rank keeps its lines in the store the
    /// options name (the compact one with its records filed by global index and B summed
    /// layer by layer, module `distributed_compact`, its window spilled to `DIR/rankR` with
    /// the option `spill`); the options' limit, memory ceiling, threads, chunk size and
    /// stop flag apply (the ceiling to each rank's store); a checkpoint plan writes one file
    /// per rank ([`rank_checkpoint_path`]) at finished layers and at a stop. `observer`
    /// hears the whole job after every layer.
    pub fn enumerate_distributed(
        &self,
        comm: &dyn Collective,
        options: &OrbitOptions,
        observer: &mut dyn ProgressObserver,
    ) -> Result<DistributedOrbit, OrbitError> {
        let ranks = comm.size();
        let mut local = Orbit {
            set: LineStore::new(options.store, self.dimension(), self.kernel.degree())
                .with_global_parents(),
            processed: 0,
            layer_ends: Vec::new(),
            stop: None,
            compute_seconds: 0.0,
        };
        self.check_store_fits(options.store)?;
        let mut compact = (options.store == StoreKind::Compact).then(|| CompactShare {
            directory: RecordDirectory::new(comm.rank(), ranks),
            sums: LayerSums::new(self),
        });
        let mut global = Vec::new();
        let seed_fingerprint = self.key_fingerprint(&self.seed_key, local.set.wide());
        if owner(seed_fingerprint, ranks) == comm.rank() {
            local
                .set
                .insert(&self.seed_key, seed_fingerprint, u32::MAX, u16::MAX);
            global.push(0);
            if let Some(sums) = compact.as_mut().and_then(|c| c.sums.as_mut()) {
                let mut seed = KeyArena::new(self.dimension(), self.kernel.degree());
                seed.push(&self.seed_key);
                sums.add(self, &seed, options.threads)?;
            }
        }
        local.layer_ends.push(local.set.len());
        let orbit = DistributedOrbit {
            local,
            global,
            layer_ends: vec![1],
            total: 1,
            ranks,
            saturated: false,
            stop: None,
            compact,
        };
        self.extend_distributed(orbit, comm, options, observer)
    }

    /// Continue the distributed enumeration whose rank checkpoints are `base.rankR` to the
    /// identical answer. The number of ranks that wrote them is read from `base.rank0`; with
    /// another number of ranks every rank reads all the old files and keeps the lines it
    /// now owns. When there is no `base.rank0` but a file `base`, that is a one-process
    /// checkpoint (memory store), shared out in the same way. The run keeps the store of
    /// its checkpoints (the options' store is not used).
    pub fn resume_distributed(
        &self,
        base: &Path,
        comm: &dyn Collective,
        options: &OrbitOptions,
        observer: &mut dyn ProgressObserver,
    ) -> Result<DistributedOrbit, OrbitError> {
        let first = first_rank_checkpoint(base);
        if !first.exists() && base.is_file() {
            let read = self.read_single_checkpoint_as_rank(base, comm.size(), comm.rank());
            let orbit = self.agreed_state(comm, base, read)?;
            return self.extend_distributed(orbit, comm, options, observer);
        }
        // the newest files first (a job stopped while its ranks replaced their files has a
        // complete new set, some still named `.next`); when those are not one state, the
        // old files, which no rank replaces before every rank has written its new one
        // read once (it checks the whole file); an error goes through `agreed_state`
        let old_ranks = rank_checkpoint_ranks(&first);
        let read_files = |newest: bool| {
            old_ranks.clone().and_then(|old| {
                if old == comm.size() {
                    let path = rank_file(base, comm.rank(), newest);
                    self.read_rank_checkpoint(&path, comm.size(), comm.rank())
                } else {
                    self.read_regrouped_checkpoints(base, newest, old, comm.size(), comm.rank())
                }
            })
        };
        let newest = self.agreed_state(comm, base, read_files(true));
        let any_next = (0..*old_ranks.as_ref().unwrap_or(&0))
            .any(|r| next_rank_checkpoint_path(base, r).exists());
        let orbit = match newest {
            Ok(orbit) => orbit,
            Err(_) if any_next => self.agreed_state(comm, base, read_files(false))?,
            Err(e) => return Err(e),
        };
        self.extend_distributed(orbit, comm, options, observer)
    }

    /// This rank's state as read, once every rank has read its own and all are at the
    /// same layers; otherwise an error on every rank. Collective.
    fn agreed_state(
        &self,
        comm: &dyn Collective,
        base: &Path,
        read: Result<DistributedOrbit, OrbitError>,
    ) -> Result<DistributedOrbit, OrbitError> {
        let mine = match &read {
            Ok(o) => [1, o.total as u64, o.layer_ends.len() as u64],
            Err(_) => [0, 0, 0],
        };
        let all = gather_numbers(comm, &mine);
        let orbit = read?;
        if let Some(rank) = all.iter().position(|v| v[0] == 0) {
            return Err(OrbitError::Checkpoint {
                path: rank_checkpoint_path(base, rank).display().to_string(),
                reason: "rank could not read its checkpoint (its message is on stderr)".into(),
            });
        }
        if all.iter().any(|v| v[1..] != all[0][1..]) {
            return Err(OrbitError::Checkpoint {
                path: base.display().to_string(),
                reason: "the ranks' checkpoints were written at different layers; no common \
                         state to resume from"
                    .into(),
            });
        }
        Ok(orbit)
    }

    fn extend_distributed(
        &self,
        mut orbit: DistributedOrbit,
        comm: &dyn Collective,
        options: &OrbitOptions,
        observer: &mut dyn ProgressObserver,
    ) -> Result<DistributedOrbit, OrbitError> {
        if let Some(dir) = &options.spill {
            // a directory of its own per rank: ranks on nodes sharing a file system never
            // meet in one directory
            let mine = dir.join(format!("rank{}", comm.rank()));
            let made = std::fs::create_dir_all(&mine)
                .map_err(|e| OrbitError::Io {
                    path: mine.display().to_string(),
                    reason: e.to_string(),
                })
                .and_then(|()| orbit.local.set.spill_to(&mine));
            agreed(comm, made, "could not spill its keys")?;
        }
        let started = Instant::now();
        let base_seconds = orbit.local.compute_seconds;
        let mut last_checkpoint = Instant::now();
        let ranks = comm.size();
        orbit.stop = None;
        let threads = options.threads.max(1);
        let mut workspaces: Vec<Workspace> = (0..threads).map(|_| Workspace::new(self)).collect();
        let chunk = self.chunk_len(options);
        loop {
            let start = orbit.local.processed;
            let end = *orbit.local.layer_ends.last().unwrap_or(&0);
            let rounds = gather_numbers(comm, &[(end - start).div_ceil(chunk) as u64])
                .iter()
                .map(|v| v[0])
                .max()
                .unwrap_or(0) as usize;
            let mut layer = NewLayer {
                lines: LineStore::new(StoreKind::Memory, self.dimension(), self.kernel.degree()),
                orders: Vec::new(),
                fingerprints: Vec::new(),
                pending: Vec::new(),
                known: Vec::new(),
            };
            let mut failure = None;
            for round in 0..=rounds {
                let status = match &failure {
                    Some(_) => FAILED,
                    None => match self.should_stop(&orbit.local, options, chunk).or_else(|| {
                        options
                            .memory_ceiling
                            .filter(|&c| orbit.local.store_bytes() + layer.lines.bytes_used() > c)
                            .map(|_| StopReason::Memory)
                    }) {
                        Some(StopReason::Interrupted) => INTERRUPTED,
                        Some(_) => MEMORY,
                        None => GOING,
                    },
                };
                let statuses = comm.all_gather(vec![status]);
                if statuses.iter().any(|s| s.first() == Some(&FAILED)) {
                    return Err(failure.unwrap_or_else(|| {
                        OrbitError::Invalid("another rank failed (its message is on stderr)".into())
                    }));
                }
                if let Some(s) = statuses
                    .iter()
                    .find_map(|s| s.first().filter(|&&s| s != GOING))
                {
                    orbit.stop = Some(match *s {
                        INTERRUPTED => StopReason::Interrupted,
                        _ => StopReason::Memory,
                    });
                    orbit.local.compute_seconds = base_seconds + started.elapsed().as_secs_f64();
                    self.checkpoint_ranks(comm, &orbit, options)?;
                    return Ok(orbit);
                }
                if round == rounds {
                    break;
                }
                let part = (start + round * chunk).min(end)..(start + (round + 1) * chunk).min(end);
                let outgoing = match self.send_images(&orbit, part, &mut workspaces, ranks) {
                    Ok(o) => o,
                    Err(e) => {
                        failure = Some(e);
                        vec![Vec::new(); ranks]
                    }
                };
                let incoming = comm.exchange(outgoing);
                if failure.is_none() {
                    if let Err(e) = self.receive(&orbit.local.set, &mut layer, &incoming) {
                        failure = Some(e);
                    }
                }
            }
            if let Some(share) = &orbit.compact {
                self.settle_pending(comm, &orbit.local.set, &share.directory, &mut layer)?;
            }
            let found = self.settle_layer(comm, &mut orbit, layer, options)?;
            orbit.local.compute_seconds = base_seconds + started.elapsed().as_secs_f64();
            let elapsed = started.elapsed();
            observer.progress(&Progress {
                layer: orbit.layer_ends.len(),
                lines: orbit.total,
                processed: orbit.layer_ends.last().copied().unwrap_or(0),
                layer_end: orbit.total,
                lines_per_second: orbit.total as f64 / elapsed.as_secs_f64().max(1e-9),
                store_bytes: orbit.local_store_bytes(),
                elapsed,
            });
            match found {
                LayerEnd::Closed => {
                    orbit.saturated = true;
                    return Ok(orbit);
                }
                LayerEnd::Cut => {
                    orbit.stop = Some(StopReason::Limit);
                    self.checkpoint_ranks(comm, &orbit, options)?;
                    return Ok(orbit);
                }
                LayerEnd::Grown => {}
            }
            // rank 0's clock decides, so that every rank writes at the same layer
            let due = options
                .checkpoint
                .as_ref()
                .is_some_and(|plan| last_checkpoint.elapsed() >= plan.every);
            if gather_numbers(comm, &[u64::from(due)])[0][0] == 1 {
                self.checkpoint_ranks(comm, &orbit, options)?;
                last_checkpoint = Instant::now();
            }
        }
    }

    /// Every rank writes its checkpoint (when the options ask for them) in two steps: each
    /// writes `BASE.rankR.next`; once all have, each renames it to `BASE.rankR`. A job
    /// stopped in between leaves either the old files whole or a whole new set (some still
    /// `.next`), and the resume finds one of them. An error on any rank is an error on all.
    fn checkpoint_ranks(
        &self,
        comm: &dyn Collective,
        orbit: &DistributedOrbit,
        options: &OrbitOptions,
    ) -> Result<(), OrbitError> {
        let Some(plan) = &options.checkpoint else {
            return Ok(());
        };
        let next = next_rank_checkpoint_path(&plan.path, comm.rank());
        let written = self.write_rank_checkpoint(orbit, comm.rank(), &next);
        agreed_or(comm, written, |rank| OrbitError::Checkpoint {
            path: next_rank_checkpoint_path(&plan.path, rank)
                .display()
                .to_string(),
            reason: "rank could not write its checkpoint (its message is on stderr)".into(),
        })?;
        let path = rank_checkpoint_path(&plan.path, comm.rank());
        let renamed = std::fs::rename(&next, &path).map_err(|e| OrbitError::Checkpoint {
            path: path.display().to_string(),
            reason: e.to_string(),
        });
        agreed_or(comm, renamed, |rank| OrbitError::Checkpoint {
            path: rank_checkpoint_path(&plan.path, rank).display().to_string(),
            reason: "rank could not replace its checkpoint (its message is on stderr)".into(),
        })
    }

    /// The images of the local elements `part` that this rank does not already know, as
    /// byte buffers for their owners.
    fn send_images(
        &self,
        orbit: &DistributedOrbit,
        part: std::ops::Range<usize>,
        workspaces: &mut [Workspace],
        ranks: usize,
    ) -> Result<Vec<Vec<u8>>, OrbitError> {
        let mut outgoing = vec![Vec::new(); ranks];
        if part.is_empty() {
            return Ok(outgoing);
        }
        for c in self.expand_chunk(&orbit.local.set, part, workspaces)? {
            let order = u64::from(orbit.global[c.parent as usize]) << 16 | u64::from(c.generator);
            encode(
                &mut outgoing[owner(c.fingerprint, ranks)],
                order,
                c.fingerprint,
                &c.key,
            );
        }
        Ok(outgoing)
    }

    /// Decide the received candidates exactly: known lines are dropped, a line already in
    /// the layer keeps the least order key, a new line joins the layer.
    fn receive(
        &self,
        known: &LineStore,
        layer: &mut NewLayer,
        incoming: &[Vec<u8>],
    ) -> Result<(), OrbitError> {
        let mut buf = SparseNumerators::new(self.key_len());
        let mut not_held = Vec::new();
        for (from, bytes) in incoming.iter().enumerate() {
            let mut reader = Reader::new(bytes, self.key_len(), format!("rank {from}"));
            while let Some(WireCandidate {
                order,
                fingerprint,
                key,
            }) = reader.next_candidate()?
            {
                not_held.clear();
                let found =
                    self.find_key_noting(known, &mut buf, fingerprint, &key, &mut not_held)?;
                if found.is_some() {
                    continue;
                }
                match self.find_key(&layer.lines, &mut buf, fingerprint, &key)? {
                    Some(i) => {
                        let o = &mut layer.orders[i as usize];
                        *o = (*o).min(order);
                    }
                    None => {
                        let new = layer.orders.len() as u32;
                        layer.lines.insert(&key, fingerprint, 0, 0);
                        layer.orders.push(order);
                        layer.fingerprints.push(fingerprint);
                        layer.known.push(false);
                        // a later candidate with this key finds this line in the layer:
                        // one pending entry per old line suffices
                        layer.pending.extend(not_held.iter().map(|&old| (new, old)));
                    }
                }
            }
        }
        Ok(())
    }

    /// Settle the layer's pending lines (the compact store): the old lines they may equal
    /// are recomputed from their words, followed through the holders' records
    /// ([`words_of`]), and a new line equal to one of them is marked known. Collective.
    fn settle_pending(
        &self,
        comm: &dyn Collective,
        known: &LineStore,
        directory: &RecordDirectory,
        layer: &mut NewLayer,
    ) -> Result<(), OrbitError> {
        let mut old: Vec<u32> = layer.pending.iter().map(|&(_, o)| o).collect();
        old.sort_unstable();
        old.dedup();
        let records: Vec<(u32, u8)> = old
            .iter()
            .map(|&o| {
                let (parent, generator) = known.record(o as usize);
                (parent as u32, generator as u8)
            })
            .collect();
        // collective; an error (a record no holder has) comes after every exchange
        let words = words_of(comm, directory, &records);
        // one old line at a time: its key is recomputed, compared with the new lines pending
        // on it, and dropped (only the words, a byte a step, are held for all of them)
        layer.pending.sort_unstable_by_key(|&(_, o)| o);
        let decided = words.and_then(|words| {
            let lines = layer.lines.memory_keys().ok_or_else(held_in_memory)?;
            let mut pending = layer.pending.iter().peekable();
            for (&o, word) in old.iter().zip(&words) {
                let key = self.key_of_word(word.iter().map(|&g| usize::from(g)))?;
                while let Some(&&(new, _)) = pending.peek().filter(|&&&(_, p)| p == o) {
                    if lines.key(new as usize) == key {
                        layer.known[new as usize] = true;
                    }
                    pending.next();
                }
            }
            Ok(())
        });
        agreed(comm, decided, "could not settle its pending lines")
    }

    /// Give the layer's new lines their global indices (their rank among all ranks' new
    /// lines by order key), keep those within the line limit and store them in that order.
    fn settle_layer(
        &self,
        comm: &dyn Collective,
        orbit: &mut DistributedOrbit,
        layer: NewLayer,
        options: &OrbitOptions,
    ) -> Result<LayerEnd, OrbitError> {
        let limit = options.limit;
        let mut order: Vec<usize> = (0..layer.orders.len())
            .filter(|&i| !layer.known[i])
            .collect();
        order.sort_unstable_by_key(|&i| layer.orders[i]);
        let mine: Vec<u64> = order.iter().map(|&i| layer.orders[i]).collect();
        let (positions, new_lines) = self.rank_order_keys(comm, orbit, &mine);
        if new_lines == 0 {
            return Ok(LayerEnd::Closed);
        }
        let room = limit.map_or(usize::MAX, |l| l.saturating_sub(orbit.total));
        if orbit.total + new_lines.min(room) > u32::MAX as usize {
            return Err(OrbitError::Invalid(format!(
                "{} lines: a Schreier record holds a line's index in 32 bits",
                orbit.total + new_lines.min(room)
            )));
        }
        let lines = layer.lines.memory_keys().ok_or_else(held_in_memory)?;
        // the layer's keys start a layer of the compact store's window (a spilling store
        // writes the finished one to its file: an error there is every rank's)
        let opened = orbit.local.set.open_layer(orbit.local.set.len());
        agreed(comm, opened, "could not write its finished layer's keys")?;
        let mut filed = Vec::new();
        // B's terms come from the layer's keys, held in memory here whether or not the
        // store spills: all of them, less (B is exact) the terms of those found known or
        // cut by the limit, which are few but for a cut
        let summing = orbit.compact.as_ref().is_some_and(|c| c.sums.is_some());
        let mut left_out = KeyArena::new(self.dimension(), self.kernel.degree());
        if summing {
            for i in (0..layer.orders.len()).filter(|&i| layer.known[i]) {
                left_out.push(&lines.key(i));
            }
        }
        for ((&i, &key_order), &position) in order.iter().zip(&mine).zip(&positions) {
            if position >= room {
                if summing {
                    left_out.push(&lines.key(i));
                }
                continue;
            }
            let key: KeyNumbers = lines.key(i);
            orbit.local.set.insert(
                &key,
                layer.fingerprints[i],
                (key_order >> 16) as u32,
                (key_order & 0xffff) as u16,
            );
            let index = (orbit.total + position) as u32;
            reserve_gently(&mut orbit.global);
            orbit.global.push(index);
            filed.push((index, key_order));
        }
        if let Some(share) = &mut orbit.compact {
            // filing is collective; an error after it (or in the sum) is this rank's alone
            let filed = share.directory.file(comm, &filed);
            let summed = filed.and_then(|()| match &mut share.sums {
                Some(sums) => sums
                    .add(self, lines, options.threads)
                    .and_then(|()| sums.subtract(self, &left_out, options.threads)),
                None => Ok(()),
            });
            agreed(
                comm,
                summed,
                "could not file its records or add its part of B",
            )?;
        }
        let kept = new_lines.min(room);
        orbit.total += kept;
        if kept < new_lines {
            // the frontier stays unprocessed: a resumed run expands it again, finds the
            // kept lines known and gives the others the indices after them
            return Ok(LayerEnd::Cut);
        }
        orbit.local.processed = *orbit.local.layer_ends.last().unwrap_or(&0);
        orbit.layer_ends.push(orbit.total);
        orbit.local.layer_ends.push(orbit.local.set.len());
        Ok(LayerEnd::Grown)
    }

    /// The position of each of this rank's new order keys (`mine`, increasing) among all
    /// ranks' new order keys of the layer, and their number. The frontier's global indices
    /// are cut into R slices; the keys whose parent lies in slice s go to rank s, which
    /// sorts them and, knowing how many keys the slices before it hold, sends each key's
    /// position back. Memory and traffic per rank are about the layer's size / R.
    fn rank_order_keys(
        &self,
        comm: &dyn Collective,
        orbit: &DistributedOrbit,
        mine: &[u64],
    ) -> (Vec<usize>, usize) {
        let ranks = comm.size();
        let (lo, hi) = match orbit.layer_ends.as_slice() {
            [.., before, last] => (*before as u64, *last as u64),
            [last] => (0, *last as u64),
            [] => (0, 0),
        };
        let slice = |key: u64| {
            let parent = (key >> 16).saturating_sub(lo);
            ((parent * ranks as u64) / (hi - lo).max(1)).min(ranks as u64 - 1) as usize
        };
        let mut outgoing = vec![Vec::new(); ranks];
        for &key in mine {
            outgoing[slice(key)].extend_from_slice(&key.to_le_bytes());
        }
        let numbers = |bytes: &[u8]| -> Vec<u64> {
            bytes
                .chunks_exact(8)
                .map(|c| u64::from_le_bytes(c.try_into().expect("8-byte chunks")))
                .collect()
        };
        let lists: Vec<Vec<u64>> = comm.exchange(outgoing).iter().map(|b| numbers(b)).collect();
        let mut merged: Vec<u64> = lists.concat();
        merged.sort_unstable();
        let counts = gather_numbers(comm, &[merged.len() as u64]);
        let before: u64 = counts[..comm.rank()].iter().map(|c| c[0]).sum();
        let total: u64 = counts.iter().map(|c| c[0]).sum();
        let replies = lists
            .iter()
            .map(|list| {
                list.iter()
                    .flat_map(|&key| {
                        (before + merged.partition_point(|&k| k < key) as u64).to_le_bytes()
                    })
                    .collect()
            })
            .collect();
        // my keys went out slice by slice in increasing order: the replies, in rank order,
        // are their positions in the order of `mine`
        let positions = comm
            .exchange(replies)
            .iter()
            .flat_map(|b| numbers(b))
            .map(|p| p as usize)
            .collect();
        (positions, total as usize)
    }

    /// B = Σ v v† over a saturated distributed orbit: each rank sums its lines, rank 0 adds
    /// the parts and checks and reads the sum as [`Self::poincare_sum`] does. Every rank
    /// calls this; rank 0 gets `Some`, the others `None`.
    pub fn poincare_sum_distributed(
        &self,
        orbit: &DistributedOrbit,
        comm: &dyn Collective,
        threads: usize,
    ) -> Result<Option<PoincareSum>, OrbitError> {
        let g = self.generators.form_diagonal();
        let part = self.sum_part(orbit, threads, &g);
        let text = match &part {
            Ok((_, b)) => serde_json::to_string(&matrix_text(b)).expect("text serialises"),
            Err(_) => String::new(),
        };
        let parts = comm.all_gather(text.into_bytes());
        let (norm, mut b) = part?;
        if comm.rank() != 0 {
            return Ok(None);
        }
        for (rank, bytes) in parts.iter().enumerate().skip(1) {
            let entries: Vec<String> = serde_json::from_slice(bytes).map_err(|e| {
                OrbitError::Invalid(format!(
                    "rank {rank} sent no part of B (its error is above): {e}"
                ))
            })?;
            let other = self.matrix_from_text(&entries, rank)?;
            b = b.add(&self.field, &other)?;
        }
        self.conclude_sum(b, &g, norm, orbit.len()).map(Some)
    }

    /// This rank's part of B and the seed's norm; an error when the orbit is not saturated.
    fn sum_part(
        &self,
        orbit: &DistributedOrbit,
        threads: usize,
        g: &[cyclorb_field::Cyc],
    ) -> Result<(cyclorb_field::Cyc, Matrix), OrbitError> {
        if !orbit.is_saturated() {
            return Err(OrbitError::Invalid(
                "the Poincaré sum needs a saturated orbit".into(),
            ));
        }
        self.check_unitary()?;
        let norm = self.form_norm(&self.seed, g)?;
        if let Some(share) = &orbit.compact {
            // summed layer by layer during the enumeration (module `distributed_compact`)
            return share.sums.as_ref().map(LayerSums::parts).ok_or_else(|| {
                OrbitError::Invalid("the compact store's layer sums were not kept".into())
            });
        }
        let keys = orbit.local.set.memory_keys().ok_or_else(held_in_memory)?;
        let b =
            crate::sum::sum_matrix(self, keys, threads, g, &norm, crate::sum::Tuning::default())?;
        Ok((norm, b))
    }

    /// A d × d matrix from its entries in the field's text syntax, row by row (sent by
    /// rank `rank`, or read from its checkpoint).
    pub(crate) fn matrix_from_text(
        &self,
        entries: &[String],
        rank: usize,
    ) -> Result<Matrix, OrbitError> {
        let d = self.dimension();
        if entries.len() != d * d {
            return Err(OrbitError::Invalid(format!(
                "rank {rank} sent {} entries of B, not {}",
                entries.len(),
                d * d
            )));
        }
        let mut m = Matrix::zeros(&self.field, d, d);
        for (at, text) in entries.iter().enumerate() {
            m.set(at / d, at % d, self.field.parse(text)?);
        }
        Ok(m)
    }
}

/// A square matrix's entries in the field's text syntax (exact), row by row.
pub(crate) fn matrix_text(m: &Matrix) -> Vec<String> {
    (0..m.rows())
        .flat_map(|i| (0..m.rows()).map(move |j| m.get(i, j).to_string()))
        .collect()
}

/// A step that may fail on some ranks only: every rank learns whether all succeeded, so
/// that all return an error together (this rank's own, or one naming the failed rank)
/// instead of waiting for a collective call the failed rank never makes.
fn agreed(
    comm: &dyn Collective,
    mine: Result<(), OrbitError>,
    what: &str,
) -> Result<(), OrbitError> {
    agreed_or(comm, mine, |rank| {
        OrbitError::Invalid(format!("rank {rank} {what} (its message is on stderr)"))
    })
}

/// [`agreed`], with the error for a failed `rank` made by `failed`.
fn agreed_or(
    comm: &dyn Collective,
    mine: Result<(), OrbitError>,
    failed: impl FnOnce(usize) -> OrbitError,
) -> Result<(), OrbitError> {
    let all = gather_numbers(comm, &[u64::from(mine.is_ok())]);
    mine?;
    match all.iter().position(|v| v[0] == 0) {
        Some(rank) => Err(failed(rank)),
        None => Ok(()),
    }
}

fn held_in_memory() -> OrbitError {
    OrbitError::Invalid("a distributed orbit is held in the memory store".into())
}

/// How a layer ended.
enum LayerEnd {
    /// No new line anywhere: the orbit is closed.
    Closed,
    /// New lines, all kept.
    Grown,
    /// The line limit kept only the first of them.
    Cut,
}
