//! The two stores behind one interface: every key in memory ([`OrbitSet`]) or records and
//! fingerprints with a window of recent keys ([`CompactSet`]).
//!
//! Both decide equality exactly; they differ in what a line costs and in how a stored line
//! is read back. The engine asks [`OrbitProblem::fetch`] for a stored key: the memory store
//! always has it, the compact store has it when the line is in its window and otherwise
//! the line is recomputed from its word (the generators along its Schreier records, applied
//! to the seed).

use std::borrow::Cow;
use std::ops::Range;
use std::path::Path;

use hashbrown::HashTable;
use num_bigint::BigInt;
use serde::{Deserialize, Serialize};

use crate::compact::{CompactSet, ShardTable};
use crate::error::OrbitError;
use crate::insert::shard_of;
use crate::key::KeyNumbers;
use crate::problem::OrbitProblem;
use crate::sparse_numerators::SparseNumerators;
use crate::step::Workspace;
use crate::store::{place, KeyArena, OrbitSet, Slot, StoredKey, Width};

/// Which store holds the lines of an enumeration (the answer never depends on it).
#[derive(Debug, Clone, Copy, Default, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum StoreKind {
    /// Every line's exact key in memory (about 90 bytes per line on Ising at genus 3):
    /// lookups never recompute anything.
    #[default]
    Memory,
    /// Per line a Schreier record and a 62-bit fingerprint (about 20 bytes), exact keys for
    /// a window of recent layers only; an older line is recomputed from its word when its
    /// fingerprint matches.
    Compact,
}

impl StoreKind {
    /// The name used on the command line and in reports.
    pub fn name(self) -> &'static str {
        match self {
            StoreKind::Memory => "memory",
            StoreKind::Compact => "compact",
        }
    }
}

/// The lines found so far, in one of the two stores.
#[derive(Debug)]
pub(crate) enum LineStore {
    Memory(OrbitSet),
    Compact(CompactSet),
}

/// A contiguous range of shards of a store's lookup table, lent to one thread that places
/// (indexes) the elements of those shards that were appended without being indexed.
pub(crate) enum ShardGroup<'a> {
    Memory {
        first: usize,
        tables: &'a mut [HashTable<Slot>],
    },
    Compact {
        first: usize,
        tables: &'a mut [ShardTable],
        fingerprints: &'a [u64],
    },
}

impl ShardGroup<'_> {
    /// Index element `index`, whose fingerprint (in one of this group's shards) is given.
    pub(crate) fn place(&mut self, index: u32, fingerprint: u64) {
        match self {
            ShardGroup::Memory { first, tables } => place(
                &mut tables[shard_of(fingerprint) - *first],
                index,
                fingerprint as u32,
            ),
            ShardGroup::Compact {
                first,
                tables,
                fingerprints,
            } => tables[shard_of(fingerprint) - *first].place(index as usize, fingerprints),
        }
    }
}

/// Split `tables` into the contiguous groups of shards `groups` (which cover them in order).
fn split_groups<'a, T>(mut tables: &'a mut [T], groups: &[Range<usize>]) -> Vec<&'a mut [T]> {
    let mut parts = Vec::with_capacity(groups.len());
    for group in groups {
        let (head, rest) = std::mem::take(&mut tables).split_at_mut(group.len());
        parts.push(head);
        tables = rest;
    }
    parts
}

/// A stored key as read back: machine words in the caller's buffer, or big numbers; or
/// not held here: a rank's compact store past its window, whose word runs through other
/// ranks' records (the distributed enumeration settles such a line at the end of the layer).
pub(crate) enum Fetched<'a> {
    Small,
    Big(Cow<'a, [BigInt]>),
    NotHeld,
}

impl LineStore {
    pub(crate) fn new(kind: StoreKind, blocks: usize, phi: usize) -> LineStore {
        match kind {
            StoreKind::Memory => LineStore::Memory(OrbitSet::new(blocks, phi)),
            StoreKind::Compact => LineStore::Compact(CompactSet::new(blocks, phi)),
        }
    }

    /// The store of a rank's share of a distributed orbit, whose records hold global parent
    /// indices: the compact store then reads only its window back
    /// ([`Self::parents_are_global`]); the memory store holds every key anyway.
    pub(crate) fn with_global_parents(mut self) -> LineStore {
        if let LineStore::Compact(s) = &mut self {
            s.parents_are_global = true;
        }
        self
    }

    pub(crate) fn kind(&self) -> StoreKind {
        match self {
            LineStore::Memory(_) => StoreKind::Memory,
            LineStore::Compact(_) => StoreKind::Compact,
        }
    }

    /// Whether fingerprints are the wide (62-bit) ones: the compact store compares nothing
    /// else before it recomputes a line.
    pub(crate) fn wide(&self) -> bool {
        matches!(self, LineStore::Compact(_))
    }

    pub(crate) fn len(&self) -> usize {
        match self {
            LineStore::Memory(s) => s.len(),
            LineStore::Compact(s) => s.len(),
        }
    }

    /// Whether the records hold global parent indices (a rank's share of a distributed
    /// compact store), so that a line past the window cannot be recomputed from them here.
    pub(crate) fn parents_are_global(&self) -> bool {
        matches!(self, LineStore::Compact(s) if s.parents_are_global)
    }

    /// The Schreier record of element i > 0: (parent, generator).
    pub(crate) fn record(&self, i: usize) -> (usize, usize) {
        match self {
            LineStore::Memory(s) => (s.parents[i] as usize, s.generators[i] as usize),
            LineStore::Compact(s) => (s.parents[i] as usize, s.generators[i] as usize),
        }
    }

    /// Key i when the store holds it (an error when a spilled key cannot be read).
    pub(crate) fn get<'a>(
        &'a self,
        i: usize,
        out: &mut SparseNumerators,
    ) -> Option<Result<StoredKey<'a>, OrbitError>> {
        match self {
            LineStore::Memory(s) => Some(Ok(s.keys.get(i, out))),
            LineStore::Compact(s) => s.get(i, out).map(|r| {
                r.map_err(|reason| OrbitError::Io {
                    path: "spilled keys".into(),
                    reason,
                })
            }),
        }
    }

    /// The element with this fingerprint for which `same(index)` holds.
    pub(crate) fn find(&self, fingerprint: u64, same: impl FnMut(usize) -> bool) -> Option<u32> {
        match self {
            LineStore::Memory(s) => s.find(fingerprint as u32, same),
            LineStore::Compact(s) => s.find(fingerprint, same),
        }
    }

    /// Append a new element (the caller has checked it is new).
    pub(crate) fn insert(
        &mut self,
        key: &KeyNumbers,
        fingerprint: u64,
        parent: u32,
        generator: u16,
    ) {
        match self {
            LineStore::Memory(s) => s.insert(key, fingerprint as u32, parent, generator),
            LineStore::Compact(s) => s.insert(key, fingerprint, parent, generator as u8),
        }
    }

    /// Encode a new key, ahead of [`Self::append`], for the arena it will go to (any thread
    /// may do this while the store is shared); `None` when it must be pushed as it is.
    pub(crate) fn encode(&self, key: &KeyNumbers, out: &mut Vec<u8>) -> Option<Width> {
        match self {
            LineStore::Memory(s) => s.keys.encode_detached(key, out),
            LineStore::Compact(s) => s.newest_keys()?.encode_detached(key, out),
        }
    }

    /// Append a new element (the caller has checked it is new) with its key, pre-encoded by
    /// [`Self::encode`] when `encoded` is given, without indexing it: [`Self::find`] sees it
    /// once a [`ShardGroup`] has placed it.
    pub(crate) fn append(
        &mut self,
        key: &KeyNumbers,
        encoded: Option<(Width, &[u8])>,
        fingerprint: u64,
        parent: u32,
        generator: u16,
    ) {
        match self {
            LineStore::Memory(s) => {
                let pushed =
                    encoded.is_some_and(|(width, bytes)| s.keys.push_encoded(width, bytes));
                if !pushed {
                    s.keys.push(key);
                }
                s.append_record(parent, generator);
            }
            LineStore::Compact(s) => s.append(key, encoded, fingerprint, parent, generator as u8),
        }
    }

    /// The lookup table's shards in the contiguous `groups` (which cover every shard in
    /// order), one mutable group per thread.
    pub(crate) fn shard_groups(&mut self, groups: &[Range<usize>]) -> Vec<ShardGroup<'_>> {
        match self {
            LineStore::Memory(s) => split_groups(s.tables_mut(), groups)
                .into_iter()
                .zip(groups)
                .map(|(tables, g)| ShardGroup::Memory {
                    first: g.start,
                    tables,
                })
                .collect(),
            LineStore::Compact(s) => {
                let (tables, fingerprints) = s.tables_mut();
                split_groups(tables, groups)
                    .into_iter()
                    .zip(groups)
                    .map(|(tables, g)| ShardGroup::Compact {
                        first: g.start,
                        tables,
                        fingerprints,
                    })
                    .collect()
            }
        }
    }

    /// The keys of the memory store (`None` for the compact store, which holds a window).
    pub(crate) fn memory_keys(&self) -> Option<&KeyArena> {
        match self {
            LineStore::Memory(s) => Some(&s.keys),
            LineStore::Compact(_) => None,
        }
    }

    /// A new breadth-first layer starts at element `start`.
    /// Append a compact-store element without its key (a line before a rank checkpoint's
    /// window); an error for the memory store or once a key is held.
    pub(crate) fn insert_record(
        &mut self,
        fingerprint: u64,
        parent: u32,
        generator: u16,
    ) -> Result<(), OrbitError> {
        let appended = match self {
            LineStore::Compact(s) => s.insert_record(fingerprint, parent, generator as u8),
            LineStore::Memory(_) => false,
        };
        if appended {
            Ok(())
        } else {
            Err(OrbitError::Invalid(
                "a line without its key follows lines with keys".into(),
            ))
        }
    }

    /// The first element from which the store holds every key (0 for the memory store).
    pub(crate) fn first_held(&self) -> usize {
        match self {
            LineStore::Compact(s) => s.window_start(),
            LineStore::Memory(_) => 0,
        }
    }

    /// The compact store's (wide) fingerprint of element i; `None` for the memory store,
    /// which keeps 32 bits of it in its table only.
    pub(crate) fn wide_fingerprint(&self, i: usize) -> Option<u64> {
        match self {
            LineStore::Compact(s) => Some(s.fingerprint(i)),
            LineStore::Memory(_) => None,
        }
    }

    pub(crate) fn open_layer(&mut self, start: usize) -> Result<(), OrbitError> {
        match self {
            LineStore::Compact(s) => s.open_layer(start).map_err(spill_error),
            LineStore::Memory(_) => Ok(()),
        }
    }

    /// Keep finished layers' keys in files in `dir` (the compact store; an error for the
    /// memory store, which keeps every key in memory by design).
    pub(crate) fn spill_to(&mut self, dir: &Path) -> Result<(), OrbitError> {
        match self {
            LineStore::Compact(s) => s.spill_to(dir).map_err(spill_error),
            LineStore::Memory(_) => Err(OrbitError::Invalid(
                "only the compact store spills keys to disk".into(),
            )),
        }
    }

    /// Bytes per numerator of the keys held (the widest, for the compact store's window).
    pub(crate) fn numerator_width(&self) -> usize {
        match self {
            LineStore::Memory(s) => s.keys.width() as usize,
            LineStore::Compact(s) => s.numerator_width(),
        }
    }

    /// Keys held with a numerator beyond `i64`.
    pub(crate) fn big_keys(&self) -> usize {
        match self {
            LineStore::Memory(s) => s.keys.big_keys().count(),
            LineStore::Compact(s) => s.big_keys(),
        }
    }

    /// Bytes held by the compact store's window of keys (0 for the memory store).
    pub(crate) fn window_bytes(&self) -> usize {
        match self {
            LineStore::Memory(_) => 0,
            LineStore::Compact(s) => s.window_bytes(),
        }
    }

    pub(crate) fn bytes_used(&self) -> usize {
        match self {
            LineStore::Memory(s) => s.bytes_used(),
            LineStore::Compact(s) => s.bytes_used(),
        }
    }
}

fn spill_error(e: std::io::Error) -> OrbitError {
    OrbitError::Io {
        path: "spilled keys".into(),
        reason: e.to_string(),
    }
}

impl OrbitProblem {
    /// Stored key i: from the store, or recomputed from its word when the compact store no
    /// longer holds it (then machine words go to `out` as well).
    pub(crate) fn fetch<'a>(
        &self,
        set: &'a LineStore,
        i: usize,
        out: &mut SparseNumerators,
    ) -> Result<Fetched<'a>, OrbitError> {
        if let Some(stored) = set.get(i, out) {
            return Ok(match stored? {
                StoredKey::Small => Fetched::Small,
                StoredKey::Big(b) => Fetched::Big(Cow::Borrowed(b)),
            });
        }
        if set.parents_are_global() {
            return Ok(Fetched::NotHeld);
        }
        Ok(match self.recompute(set, i)? {
            KeyNumbers::Small(v) => {
                out.clear();
                for (at, &x) in v.iter().enumerate() {
                    if x != 0 {
                        out.push(at, x);
                    }
                }
                Fetched::Small
            }
            KeyNumbers::Big(b) => Fetched::Big(Cow::Owned(b)),
        })
    }

    /// The key of element i from its word: the generators of its Schreier records applied
    /// to the seed's key in turn, each image normalised to its key.
    pub(crate) fn recompute(&self, set: &LineStore, i: usize) -> Result<KeyNumbers, OrbitError> {
        let mut word = Vec::new();
        let mut at = i;
        while at != 0 {
            let (parent, generator) = set.record(at);
            word.push(generator);
            at = parent;
        }
        self.key_of_word(word.into_iter().rev())
    }

    /// The key of the line X_{w_k} ⋯ X_{w_1}·v₀ for the word w (generator indices in the
    /// order they are applied), each image normalised to its key (§1 of docs/orbits.md), so
    /// that the result is exactly the key the enumeration stored for the line.
    pub(crate) fn key_of_word(
        &self,
        word: impl IntoIterator<Item = usize>,
    ) -> Result<KeyNumbers, OrbitError> {
        let mut ws = Workspace::new(self);
        let mut key = self.seed_key.clone();
        for generator in word {
            ws.load_key(&key);
            key = self.image_key(&mut ws, generator)?;
        }
        Ok(key)
    }
}
