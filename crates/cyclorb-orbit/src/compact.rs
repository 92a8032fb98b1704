//! The compact store: per line a Schreier record and a 62-bit fingerprint, keys only for a
//! window of recent layers.
//!
//! A line costs its parent (4 bytes), its generator (1 byte), its fingerprint (8 bytes, two
//! random linear forms of the line reduced modulo a prime, [`crate::fingerprint`]) and a
//! slot of an
//! open-addressing table of element indices (4 bytes at a load between 0.53 and 0.8, so
//! 5 to 7.5 bytes per line): 18 to 21 bytes, plus an eighth of slack while the record
//! vectors grow. The table is split into [`SHARDS`] tables by fingerprint ([`shard_of`]),
//! each growing on its own, so that threads index a chunk's new lines side by side
//! (`crate::insert`). The keys (the exact lines) are kept only for the last [`WINDOW_LAYERS`]
//! breadth-first layers: the layer being built, the frontier being expanded (its keys are
//! the sources of the next layer anyway) and the three before it. A fingerprint match with
//! an older line is settled by recomputing that line from its word (the parent chain back
//! to the seed), so every equality is still decided exactly and the answer cannot depend on
//! which lines happen to share a fingerprint.
//!
//! Why three older layers: on Ising at genus 3 the known images of a frontier line fall in
//! the layer being built (73 %), the frontier (9 %), the layer before it (6 %), two before
//! (1.4 %) and three before (11 %: a twist whose fourth power fixes the line sends the line
//! X³·v back to v); only about 0.06 % fall further back (measured on the first 1.5·10⁶
//! lines), and those are recomputed.

use std::collections::VecDeque;
use std::path::{Path, PathBuf};

use crate::insert::{shard_of, SHARDS};
use crate::key::KeyNumbers;
use crate::sparse_numerators::SparseNumerators;
use crate::store::{KeyArena, StoredKey, Width};

/// Layers whose keys the compact store keeps: the one being built, the frontier and three
/// before it.
pub(crate) const WINDOW_LAYERS: usize = 5;

/// Largest load of an index table before it grows by half.
const MAX_LOAD: (usize, usize) = (4, 5);

/// Slots of a shard's table when it is created.
const FIRST_SLOTS: usize = 16;

/// One shard of the index table: open addressing with linear probing, element index + 1 in
/// a slot, 0 for an empty one.
#[derive(Debug, Clone)]
pub(crate) struct ShardTable {
    slots: Vec<u32>,
    filled: usize,
}

impl ShardTable {
    fn new() -> ShardTable {
        ShardTable {
            slots: vec![0; FIRST_SLOTS],
            filled: 0,
        }
    }

    /// The element of this shard with this fingerprint for which `same(index)` holds.
    fn find(
        &self,
        fingerprint: u64,
        fingerprints: &[u64],
        mut same: impl FnMut(usize) -> bool,
    ) -> Option<u32> {
        let slots = self.slots.len();
        let mut at = home(fingerprint, slots);
        loop {
            let entry = self.slots[at];
            if entry == 0 {
                return None;
            }
            let index = (entry - 1) as usize;
            if fingerprints[index] == fingerprint && same(index) {
                return Some(index as u32);
            }
            at = if at + 1 == slots { 0 } else { at + 1 };
        }
    }

    /// Index element `index` (whose fingerprint is `fingerprints[index]`), growing the table
    /// by half first when the load would pass [`MAX_LOAD`].
    pub(crate) fn place(&mut self, index: usize, fingerprints: &[u64]) {
        if (self.filled + 1) * MAX_LOAD.1 > self.slots.len() * MAX_LOAD.0 {
            let mut slots = vec![0u32; self.slots.len() + self.slots.len() / 2];
            for &entry in self.slots.iter().filter(|&&e| e != 0) {
                let i = (entry - 1) as usize;
                put(&mut slots, fingerprints[i], i);
            }
            self.slots = slots;
        }
        put(&mut self.slots, fingerprints[index], index);
        self.filled += 1;
    }
}

/// Put element `index` in the first free slot of its probe sequence.
fn put(table: &mut [u32], fingerprint: u64, index: usize) {
    let slots = table.len();
    let mut at = home(fingerprint, slots);
    while table[at] != 0 {
        at = if at + 1 == slots { 0 } else { at + 1 };
    }
    table[at] = index as u32 + 1;
}

/// The keys of one layer, from element `start` on.
#[derive(Debug)]
struct LayerKeys {
    start: usize,
    keys: KeyArena,
}

/// Records, fingerprints, the index table and the window of recent keys.
#[derive(Debug)]
pub(crate) struct CompactSet {
    blocks: usize,
    phi: usize,
    pub(crate) parents: Vec<u32>,
    pub(crate) generators: Vec<u8>,
    fingerprints: Vec<u64>,
    /// The index table, one per shard of fingerprints.
    tables: Vec<ShardTable>,
    window: VecDeque<LayerKeys>,
    /// Where finished layers' keys go (`None`: they stay in memory).
    spill: Option<PathBuf>,
    /// Whether `parents` are global indices (a rank's share of a distributed orbit): then a
    /// line past the window is not recomputed here ([`crate::distributed_compact`]).
    pub(crate) parents_are_global: bool,
}

/// The slot a fingerprint's probe starts at (its high bits, scaled to the table).
fn home(fingerprint: u64, slots: usize) -> usize {
    let mixed = fingerprint.wrapping_mul(0x9E37_79B9_7F4A_7C15) ^ (fingerprint >> 29);
    ((mixed as u128 * slots as u128) >> 64) as usize
}

/// Grow a vector by an eighth when it is full.
pub(crate) fn reserve_gently<T>(v: &mut Vec<T>) {
    if v.capacity() == v.len() {
        v.reserve_exact((v.len() / 8).max(64));
    }
}

impl CompactSet {
    pub(crate) fn new(blocks: usize, phi: usize) -> CompactSet {
        CompactSet {
            blocks,
            phi,
            parents: Vec::new(),
            generators: Vec::new(),
            fingerprints: Vec::new(),
            tables: (0..SHARDS).map(|_| ShardTable::new()).collect(),
            window: VecDeque::new(),
            spill: None,
            parents_are_global: false,
        }
    }

    /// Keep the keys in files in `dir` from now on: finished layers' keys go there whole,
    /// the layer being built streams its keys there (up to [`crate::store::STREAM_BUFFER`]
    /// bytes of them in memory).
    pub(crate) fn spill_to(&mut self, dir: &Path) -> std::io::Result<()> {
        self.spill = Some(dir.to_path_buf());
        let building = self.window.len().saturating_sub(1);
        for (i, layer) in self.window.iter_mut().enumerate() {
            if i < building {
                layer.keys.spill(dir)?;
            } else {
                layer.keys.stream_to(dir)?;
            }
        }
        Ok(())
    }

    /// Number of elements.
    pub(crate) fn len(&self) -> usize {
        self.parents.len()
    }

    /// Where finished layers' keys go, when the store spills.
    pub(crate) fn spill_dir(&self) -> Option<&Path> {
        self.spill.as_deref()
    }

    /// Start a new layer of keys at element `start` (the next one inserted), dropping the
    /// keys of the layer that leaves the window; when the store spills, the finished layer's
    /// last keys go to its file and the new layer streams to a file of its own.
    pub(crate) fn open_layer(&mut self, start: usize) -> std::io::Result<()> {
        if self.window.back().is_some_and(|l| l.start == start) {
            return Ok(());
        }
        if let (Some(dir), Some(finished)) = (&self.spill, self.window.back_mut()) {
            finished.keys.spill(dir)?;
        }
        let mut keys = KeyArena::new(self.blocks, self.phi);
        if let Some(dir) = &self.spill {
            keys.stream_to(dir)?;
        }
        self.window.push_back(LayerKeys { start, keys });
        // a rank's share of a distributed orbit builds its layer apart (the window starts
        // at the frontier): one layer fewer gives the same reach back
        let kept = WINDOW_LAYERS - usize::from(self.parents_are_global);
        while self.window.len() > kept {
            self.window.pop_front();
        }
        Ok(())
    }

    /// First element whose key is kept (the window holds every key from there on).
    pub(crate) fn window_start(&self) -> usize {
        self.window.front().map_or(self.len(), |l| l.start)
    }

    /// Key i when it is in the window (machine words into `out`, or big; an error when a
    /// spilled key cannot be read); `None` when it must be recomputed from its word.
    pub(crate) fn get<'a>(
        &'a self,
        i: usize,
        out: &mut SparseNumerators,
    ) -> Option<Result<StoredKey<'a>, String>> {
        let layer = self.window.iter().rev().find(|l| l.start <= i)?;
        Some(layer.keys.get_spilled(i - layer.start, out))
    }

    /// The element with this fingerprint for which `same(index)` holds.
    pub(crate) fn find(&self, fingerprint: u64, same: impl FnMut(usize) -> bool) -> Option<u32> {
        self.tables[shard_of(fingerprint)].find(fingerprint, &self.fingerprints, same)
    }

    /// Append a new element (the caller has checked it is new); its key goes to the newest
    /// layer of the window.
    pub(crate) fn insert(
        &mut self,
        key: &KeyNumbers,
        fingerprint: u64,
        parent: u32,
        generator: u8,
    ) {
        let index = self.len();
        self.append(key, None, fingerprint, parent, generator);
        self.tables[shard_of(fingerprint)].place(index, &self.fingerprints);
    }

    /// Append and index an element whose key is not kept (a line before the window, read
    /// back from a rank checkpoint); only before the first key, since the window holds a
    /// suffix of the elements. `false` (nothing appended) once a key is held.
    pub(crate) fn insert_record(&mut self, fingerprint: u64, parent: u32, generator: u8) -> bool {
        if !self.window.is_empty() {
            return false;
        }
        let index = self.len();
        self.push_record(fingerprint, parent, generator);
        self.tables[shard_of(fingerprint)].place(index, &self.fingerprints);
        true
    }

    /// Append an element's record and fingerprint (neither indexed nor with a key yet).
    fn push_record(&mut self, fingerprint: u64, parent: u32, generator: u8) {
        reserve_gently(&mut self.parents);
        reserve_gently(&mut self.generators);
        reserve_gently(&mut self.fingerprints);
        self.parents.push(parent);
        self.generators.push(generator);
        self.fingerprints.push(fingerprint);
    }

    /// The fingerprint of element i.
    pub(crate) fn fingerprint(&self, i: usize) -> u64 {
        self.fingerprints[i]
    }

    /// The keys of the layer being built, where the next key goes (`None` before the first).
    pub(crate) fn newest_keys(&self) -> Option<&KeyArena> {
        self.window.back().map(|l| &l.keys)
    }

    /// Append a new element's record, fingerprint and key (pre-encoded by
    /// [`KeyArena::encode_detached`] when `encoded` is given) without indexing it: it is not
    /// found by [`Self::find`] until it is placed in its shard's table ([`Self::tables_mut`]).
    pub(crate) fn append(
        &mut self,
        key: &KeyNumbers,
        encoded: Option<(Width, &[u8])>,
        fingerprint: u64,
        parent: u32,
        generator: u8,
    ) {
        let index = self.len();
        self.push_record(fingerprint, parent, generator);
        if self.window.is_empty() {
            self.window.push_back(LayerKeys {
                start: index,
                keys: KeyArena::new(self.blocks, self.phi),
            });
        }
        if let Some(layer) = self.window.back_mut() {
            let pushed =
                encoded.is_some_and(|(width, bytes)| layer.keys.push_encoded(width, bytes));
            if !pushed {
                layer.keys.push(key);
            }
        }
    }

    /// The shard tables and the fingerprints they index, for placing appended elements.
    pub(crate) fn tables_mut(&mut self) -> (&mut [ShardTable], &[u64]) {
        (&mut self.tables, &self.fingerprints)
    }

    /// The widest numerator of the keys held.
    pub(crate) fn numerator_width(&self) -> usize {
        self.window
            .iter()
            .map(|l| l.keys.width() as usize)
            .max()
            .unwrap_or(1)
    }

    /// Keys held with a numerator beyond `i64`.
    pub(crate) fn big_keys(&self) -> usize {
        self.window.iter().map(|l| l.keys.big_keys().count()).sum()
    }

    /// Bytes held: records, fingerprints, the table, and the keys of the window.
    pub(crate) fn bytes_used(&self) -> usize {
        self.parents.capacity() * 4
            + self.generators.capacity()
            + self.fingerprints.capacity() * 8
            + self
                .tables
                .iter()
                .map(|t| t.slots.capacity() * 4)
                .sum::<usize>()
            + self.window_bytes()
    }

    /// Bytes held by the keys of the window alone.
    pub(crate) fn window_bytes(&self) -> usize {
        self.window.iter().map(|l| l.keys.bytes_used()).sum()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn lookups_find_exactly_the_inserted_elements_across_growth() {
        // fingerprints chosen to collide in pairs: the `same` test decides
        let mut set = CompactSet::new(1, 1);
        for i in 0..1000u64 {
            set.insert(&KeyNumbers::Small(vec![i as i64]), i / 2, 0, 0);
        }
        for i in 0..1000u64 {
            let found = set.find(i / 2, |j| j as u64 == i);
            assert_eq!(found, Some(i as u32));
        }
        assert_eq!(set.find(5000, |_| true), None);
        let slots: usize = set.tables.iter().map(|t| t.slots.len()).sum();
        assert!(slots * 4 >= set.len() * 5);
    }

    #[test]
    fn the_window_keeps_the_last_layers_only() {
        let mut set = CompactSet::new(1, 1);
        let mut out = SparseNumerators::new(1);
        for layer in 0..8usize {
            set.open_layer(layer * 10).unwrap();
            for j in 0..10 {
                set.insert(
                    &KeyNumbers::Small(vec![(layer * 10 + j) as i64 + 1]),
                    0,
                    0,
                    0,
                );
            }
        }
        assert_eq!(set.window_start(), 30);
        assert!(set.get(29, &mut out).is_none());
        assert!(matches!(set.get(42, &mut out), Some(Ok(StoredKey::Small))));
        assert_eq!(out.dense, vec![43]);
    }

    #[test]
    fn spilled_layers_read_back_the_same_keys() {
        let dir = std::env::temp_dir();
        let mut set = CompactSet::new(2, 2);
        let mut out = SparseNumerators::new(4);
        set.spill_to(&dir).unwrap();
        let key = |i: usize| KeyNumbers::Small(vec![1, 0, (i % 7) as i64 - 3, 300 * i as i64]);
        for layer in 0..3usize {
            set.open_layer(layer * 50).unwrap();
            for j in 0..50 {
                set.insert(&key(layer * 50 + j), 0, 0, 0);
            }
        }
        set.open_layer(150).unwrap();
        assert!(set
            .window
            .iter()
            .take(3)
            .all(|l| l.keys.bytes_used() < 50 * 8));
        for i in 0..150 {
            assert!(matches!(set.get(i, &mut out), Some(Ok(StoredKey::Small))));
            assert_eq!(KeyNumbers::Small(out.dense.clone()), key(i));
        }
    }
}
