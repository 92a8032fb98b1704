//! Insertion of a chunk's new lines on several threads, sharded by fingerprint, with the
//! answer of a sequential insertion in (element, generator) order.
//!
//! The workers of a chunk ([`OrbitProblem::expand_parts`]) each return, for a contiguous
//! range of the frontier, the images that are neither in the store nor among their own
//! earlier finds, in (element, generator) order: the chunk order is the workers' lists one
//! after the other. A line can still be found by two workers; it must get the index and the
//! Schreier record (parent, generator) of its first candidate in chunk order. Insertion runs
//! in three phases, the first and the last on as many threads as the enumeration has:
//!
//! 1. **Keep** (one thread per group of shards, [`SHARDS`] shards by [`shard_of`] the
//!    fingerprint). Each thread walks every candidate in chunk order and takes those of its
//!    shards. It drops a candidate whose key equals, number by number, the key of an
//!    earlier candidate of the chunk: equal keys have equal fingerprints, hence one shard
//!    and one thread, so every repetition is seen, and a fingerprint alone never decides.
//!    The store itself need not be searched again: the workers searched it, and it has not
//!    changed since. The thread then encodes each key it keeps for the arena the key goes to.
//! 2. **Number** (one thread). The kept candidates in chunk order get the next indices; each
//!    appends its record and copies its encoded key to the arena, until the line limit.
//! 3. **Index** (one thread per group of shards). Each thread places its kept candidates in
//!    its own shards of the lookup table (the only part that is a hash table) and frees
//!    workers' candidate lists.
//!
//! So the store ends exactly as after a sequential insertion, whatever the number of threads;
//! which table holds which index does not change a lookup's answer, since the store holds
//! distinct lines and a lookup returns the one stored line equal to the query.

use std::ops::Range;

use hashbrown::HashTable;

use crate::engine::split;
use crate::error::{joined, OrbitError};
use crate::fingerprint::bucket_hash;
use crate::problem::OrbitProblem;
use crate::set::{LineStore, ShardGroup};
use crate::step::Candidate;
use crate::store::Width;

/// log₂ of the number of shards of a store's lookup table.
const SHARD_BITS: u32 = 8;

/// Shards of a store's lookup table: enough for 64 threads to take four each.
pub(crate) const SHARDS: usize = 1 << SHARD_BITS;

/// The shard of a fingerprint: high bits of a multiplicative hash, independent of the bits
/// that place it within its shard's table.
pub(crate) fn shard_of(fingerprint: u64) -> usize {
    (fingerprint.wrapping_mul(0xD6E8_FEB8_6659_FD93) >> (64 - SHARD_BITS)) as usize
}

/// A candidate kept in phase 1: where it is, its fingerprint, its encoded key, and (from
/// phase 2) its index.
#[derive(Debug)]
struct Kept {
    part: u32,
    item: u32,
    fingerprint: u64,
    encoded: Option<(Width, Range<usize>)>,
    index: u32,
}

/// One group of shards' work for a chunk, kept between chunks to reuse its buffers.
#[derive(Debug, Default)]
pub(crate) struct GroupWork {
    kept: Vec<Kept>,
    /// The kept candidates' keys, encoded one after the other.
    bytes: Vec<u8>,
    /// Positions in `kept`, by fingerprint.
    seen: HashTable<u32>,
}

/// Buffers for inserting chunks on `threads` threads.
#[derive(Debug)]
pub(crate) struct InsertScratch {
    groups: Vec<Range<usize>>,
    work: Vec<GroupWork>,
}

impl InsertScratch {
    pub(crate) fn new(threads: usize) -> InsertScratch {
        let groups = split(0..SHARDS, threads.max(1));
        let work = groups.iter().map(|_| GroupWork::default()).collect();
        InsertScratch { groups, work }
    }
}

/// Phase 1 for one group of shards: the candidates of those shards that repeat no earlier
/// candidate of the chunk (compared only when there are several parts: one worker never
/// returns a line twice), with their keys encoded for `store`.
fn keep(store: &LineStore, parts: &[Vec<Candidate>], shards: Range<usize>, work: &mut GroupWork) {
    work.kept.clear();
    work.bytes.clear();
    work.seen.clear();
    let compare = parts.iter().filter(|p| !p.is_empty()).count() > 1;
    for (p, part) in parts.iter().enumerate() {
        for (i, c) in part.iter().enumerate() {
            if !shards.contains(&shard_of(c.fingerprint)) {
                continue;
            }
            if compare {
                let kept = &work.kept;
                let hash = bucket_hash(c.fingerprint);
                let repeated = work.seen.find(hash, |&j| {
                    let k = &kept[j as usize];
                    k.fingerprint == c.fingerprint
                        && parts[k.part as usize][k.item as usize].key == c.key
                });
                if repeated.is_some() {
                    continue;
                }
                work.seen.insert_unique(hash, kept.len() as u32, |&j| {
                    bucket_hash(kept[j as usize].fingerprint)
                });
            }
            let start = work.bytes.len();
            let encoded = store
                .encode(&c.key, &mut work.bytes)
                .map(|width| (width, start..work.bytes.len()));
            work.kept.push(Kept {
                part: p as u32,
                item: i as u32,
                fingerprint: c.fingerprint,
                encoded,
                index: u32::MAX,
            });
        }
    }
}

/// Phase 3 for one group of shards: index its kept candidates that were numbered.
fn index(group: &mut ShardGroup<'_>, work: &GroupWork) {
    for k in work.kept.iter().filter(|k| k.index != u32::MAX) {
        group.place(k.index, k.fingerprint);
    }
}

impl OrbitProblem {
    /// Insert the workers' candidates of a chunk (`parts`, in chunk order) that are new, in
    /// chunk order, on the scratch's threads; `false` when the line limit stopped it.
    pub(crate) fn insert_parts(
        &self,
        set: &mut LineStore,
        parts: Vec<Vec<Candidate>>,
        scratch: &mut InsertScratch,
        limit: Option<usize>,
    ) -> Result<bool, OrbitError> {
        let InsertScratch { groups, work } = scratch;
        // phase 1: keep and encode, by groups of shards
        {
            let store = &*set;
            let parts = &parts[..];
            let (first, rest) = work.split_at_mut(1);
            std::thread::scope(|scope| {
                let handles: Vec<_> = groups[1..]
                    .iter()
                    .zip(rest.iter_mut())
                    .map(|(shards, w)| {
                        let shards = shards.clone();
                        scope.spawn(move || {
                            keep(store, parts, shards, w);
                            Ok(())
                        })
                    })
                    .collect();
                keep(store, parts, groups[0].clone(), &mut first[0]);
                handles.into_iter().try_for_each(joined)
            })?;
        }
        // phase 2: number the kept candidates in chunk order
        let mut starts = Vec::with_capacity(parts.len());
        let mut total = 0usize;
        for part in &parts {
            starts.push(total);
            total += part.len();
        }
        let mut order = vec![(u32::MAX, 0u32); total];
        for (g, w) in work.iter().enumerate() {
            for (j, k) in w.kept.iter().enumerate() {
                order[starts[k.part as usize] + k.item as usize] = (g as u32, j as u32);
            }
        }
        let mut complete = true;
        for &(g, j) in order.iter().filter(|(g, _)| *g != u32::MAX) {
            if limit.is_some_and(|l| set.len() >= l) {
                complete = false;
                break;
            }
            let GroupWork { kept, bytes, .. } = &mut work[g as usize];
            let k = &mut kept[j as usize];
            let c = &parts[k.part as usize][k.item as usize];
            let encoded = k
                .encoded
                .as_ref()
                .map(|(width, range)| (*width, &bytes[range.clone()]));
            k.index = set.len() as u32;
            set.append(&c.key, encoded, c.fingerprint, c.parent, c.generator);
        }
        // phase 3: index by groups of shards, and free the candidates
        let mut shard_groups = set.shard_groups(groups);
        let threads = shard_groups.len();
        let mut freed: Vec<Vec<Vec<Candidate>>> = (0..threads).map(|_| Vec::new()).collect();
        for (p, part) in parts.into_iter().enumerate() {
            freed[p % threads].push(part);
        }
        let (first_group, other_groups) = shard_groups.split_at_mut(1);
        let (first_work, other_work) = work.split_at(1);
        let mut freed = freed.into_iter();
        let first_freed = freed.next();
        std::thread::scope(|scope| {
            let handles: Vec<_> = other_groups
                .iter_mut()
                .zip(other_work)
                .zip(freed)
                .map(|((group, w), candidates)| {
                    scope.spawn(move || {
                        index(group, w);
                        drop(candidates);
                        Ok(())
                    })
                })
                .collect();
            index(&mut first_group[0], &first_work[0]);
            drop(first_freed);
            handles.into_iter().try_for_each(joined)
        })?;
        Ok(complete)
    }
}
