//! The orbit's storage: packed keys in one flat arena, Schreier records, and the hash
//! table from fingerprints to element indices.
//!
//! A key (d blocks of φ numerators, see [`crate::key`]) is encoded sparsely: a bit mask of
//! its non-zero blocks (⌈d/8⌉ bytes), then for each non-zero block a bit mask of its non-zero
//! coefficients (⌈φ/8⌉ bytes) followed by those coefficients. Every coefficient of a store
//! uses one width (1, 2, 4 or 8 bytes, little-endian two's complement); the width grows, and
//! the arena is re-encoded, the first time a key needs more. A key with a numerator beyond
//! `i64` is kept as big integers beside the arena (its encoding is the empty block mask, which
//! no real key has). Keys are addressed by 32-bit offsets from a base per segment of keys.
//!
//! The arena and the record vectors grow by an eighth at a time (not by doubling), so the
//! store stays close to its payload. A table slot holds an element index and its 32-bit
//! fingerprint, so a probe compares fingerprints before it touches a key. The table is split
//! into [`SHARDS`] tables by fingerprint ([`shard_of`]), so that threads can index the new
//! lines of a chunk at the same time, each in its own shards (`crate::insert`).

use std::path::Path;
use std::sync::Arc;

use hashbrown::{HashMap, HashTable};
use num_bigint::BigInt;

use crate::fingerprint::bucket_hash;
use crate::insert::{shard_of, SHARDS};
use crate::key::KeyNumbers;
use crate::numerators::Numerators;
use crate::spill::SpillFile;

/// Bytes per stored numerator.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord)]
pub(crate) enum Width {
    /// i8.
    W1 = 1,
    /// i16.
    W2 = 2,
    /// i32.
    W4 = 4,
    /// i64.
    W8 = 8,
}

impl Width {
    /// The narrowest width holding every number.
    fn needed(numbers: &[i64]) -> Width {
        let m = numbers.iter().fold(0i64, |m, &x| m.max(x).max(-(x + 1)));
        if m <= i8::MAX as i64 {
            Width::W1
        } else if m <= i16::MAX as i64 {
            Width::W2
        } else if m <= i32::MAX as i64 {
            Width::W4
        } else {
            Width::W8
        }
    }

    /// From a byte count (checkpoint files).
    pub(crate) fn from_bytes(b: u8) -> Option<Width> {
        match b {
            1 => Some(Width::W1),
            2 => Some(Width::W2),
            4 => Some(Width::W4),
            8 => Some(Width::W8),
            _ => None,
        }
    }
}

/// Grow a vector by at least an eighth when it is full (realloc of large blocks is cheap).
fn reserve_gently<T>(v: &mut Vec<T>, additional: usize) {
    if v.capacity() - v.len() < additional {
        v.reserve_exact(additional.max(v.len() / 8).max(64));
    }
}

/// A stored key, as read back.
pub(crate) enum StoredKey<'a> {
    /// Machine-word numerators (in the caller's buffer).
    Small,
    /// Big numerators.
    Big(&'a [BigInt]),
}

/// Packed keys of d blocks of φ numerators.
#[derive(Debug, Clone)]
pub(crate) struct KeyArena {
    blocks: usize,
    phi: usize,
    width: Width,
    bytes: Vec<u8>,
    /// Offset of key i from `bases[i >> shift]`.
    offsets: Vec<u32>,
    bases: Vec<u64>,
    shift: u32,
    big: HashMap<u32, Box<[BigInt]>>,
    /// Estimated heap bytes of `big`, kept as keys are added so that the size is known in
    /// constant time (it is read after every chunk).
    big_bytes: usize,
    /// The encoded keys when they were moved to a file (`bytes` is then empty).
    spilled: Option<Arc<SpillFile>>,
}

/// Estimated heap bytes of one big key.
fn big_key_bytes(key: &[BigInt]) -> usize {
    key.iter().map(|x| 32 + x.bits() as usize / 8).sum()
}

impl KeyArena {
    pub(crate) fn new(blocks: usize, phi: usize) -> KeyArena {
        // the longest key must fit 2^shift times in 32 bits of offset
        let longest = blocks.div_ceil(8) + blocks * (phi.div_ceil(8) + 8 * phi);
        let shift = (u32::MAX as usize / longest.max(1)).max(1).ilog2().min(16);
        KeyArena {
            blocks,
            phi,
            width: Width::W1,
            bytes: Vec::new(),
            offsets: Vec::new(),
            bases: Vec::new(),
            shift,
            big: HashMap::new(),
            big_bytes: 0,
            spilled: None,
        }
    }

    /// Move the encoded keys to a file in `dir` (the arena is finished: keys are no longer
    /// added); they are read back one key at a time.
    pub(crate) fn spill(&mut self, dir: &Path) -> std::io::Result<()> {
        if self.spilled.is_none() {
            self.spilled = Some(Arc::new(SpillFile::write(dir, &self.bytes)?));
            self.bytes = Vec::new();
        }
        Ok(())
    }

    /// Key i, reading it from the file when the keys were spilled.
    pub(crate) fn get_spilled<'a>(
        &'a self,
        i: usize,
        out: &mut Numerators,
    ) -> Result<StoredKey<'a>, String> {
        let Some(file) = &self.spilled else {
            return Ok(self.get(i, out));
        };
        if let Some(k) = self.big.get(&(i as u32)) {
            return Ok(StoredKey::Big(k));
        }
        let end = if i + 1 < self.len() {
            self.start(i + 1)
        } else {
            file.len()
        };
        let mut bytes = Vec::new();
        file.read(self.start(i), end, &mut bytes)
            .map_err(|e| format!("{}: {e}", file.path().display()))?;
        self.decode_bytes(&bytes, out);
        Ok(StoredKey::Small)
    }

    /// Number of keys.
    pub(crate) fn len(&self) -> usize {
        self.offsets.len()
    }

    /// The current width.
    pub(crate) fn width(&self) -> Width {
        self.width
    }

    /// The encoded keys (checkpoint files).
    pub(crate) fn raw_bytes(&self) -> &[u8] {
        &self.bytes
    }

    /// The big keys by index (checkpoint files).
    pub(crate) fn big_keys(&self) -> impl Iterator<Item = (u32, &[BigInt])> {
        let mut keys: Vec<(u32, &[BigInt])> =
            self.big.iter().map(|(i, k)| (*i, k.as_ref())).collect();
        keys.sort_by_key(|(i, _)| *i);
        keys.into_iter()
    }

    /// Rebuild from checkpoint parts (`count` keys encoded in `bytes`); `None` when the bytes
    /// do not parse as exactly `count` keys or the big keys do not fit.
    pub(crate) fn from_parts(
        blocks: usize,
        phi: usize,
        width: Width,
        bytes: Vec<u8>,
        count: usize,
        big: Vec<(u32, Box<[BigInt]>)>,
    ) -> Option<KeyArena> {
        let mut arena = KeyArena::new(blocks, phi);
        arena.width = width;
        let mut at = 0usize;
        for i in 0..count {
            arena.record_offset(i, at as u64)?;
            at += arena.encoded_len(&bytes[at.min(bytes.len())..])?;
        }
        if at != bytes.len() {
            return None;
        }
        arena.bytes = bytes;
        let len = blocks * phi;
        for (i, k) in big {
            let empty = arena.block_mask_is_empty(i as usize);
            if i as usize >= count || k.len() != len || !empty {
                return None;
            }
            arena.big_bytes += big_key_bytes(&k);
            arena.big.insert(i, k);
        }
        let mut markers = (0..count).filter(|&i| arena.block_mask_is_empty(i));
        if markers.any(|i| !arena.big.contains_key(&(i as u32))) {
            return None;
        }
        Some(arena)
    }

    fn record_offset(&mut self, index: usize, at: u64) -> Option<()> {
        if index >> self.shift == self.bases.len() {
            self.bases.push(at);
        }
        let base = self.bases[index >> self.shift];
        reserve_gently(&mut self.offsets, 1);
        self.offsets.push(u32::try_from(at - base).ok()?);
        Some(())
    }

    /// Length of the encoding at the start of `bytes`, `None` when it runs past the end.
    fn encoded_len(&self, bytes: &[u8]) -> Option<usize> {
        let mask_len = self.blocks.div_ceil(8);
        let coefficient_mask = self.phi.div_ceil(8);
        let mut at = mask_len;
        let blocks_set: u32 = bytes.get(..mask_len)?.iter().map(|b| b.count_ones()).sum();
        for _ in 0..blocks_set {
            let set: u32 = bytes
                .get(at..at + coefficient_mask)?
                .iter()
                .map(|b| b.count_ones())
                .sum();
            at += coefficient_mask + set as usize * self.width as usize;
        }
        (at <= bytes.len()).then_some(at)
    }

    fn start(&self, i: usize) -> usize {
        (self.bases[i >> self.shift] + self.offsets[i] as u64) as usize
    }

    fn block_mask_is_empty(&self, i: usize) -> bool {
        let at = self.start(i);
        self.bytes[at..at + self.blocks.div_ceil(8)]
            .iter()
            .all(|&b| b == 0)
    }

    /// Bytes held (arena, offsets, big keys at an estimate of their heap size).
    pub(crate) fn bytes_used(&self) -> usize {
        self.bytes.capacity()
            + self.offsets.capacity() * 4
            + self.bases.capacity() * 8
            + self.big_bytes
    }

    /// Append a key.
    pub(crate) fn push(&mut self, key: &KeyNumbers) {
        let index = self.len();
        if let KeyNumbers::Small(numbers) = key {
            let needed = Width::needed(numbers);
            if needed > self.width {
                self.widen(needed);
            }
        }
        self.record_offset(index, self.bytes.len() as u64)
            .expect("offsets are sized for the longest key");
        match key {
            KeyNumbers::Small(numbers) => {
                encode_into(&mut self.bytes, self.width, self.phi, numbers);
            }
            KeyNumbers::Big(numbers) => {
                let mask_len = self.blocks.div_ceil(8);
                reserve_gently(&mut self.bytes, mask_len);
                self.bytes.resize(self.bytes.len() + mask_len, 0);
                self.big_bytes += big_key_bytes(numbers);
                self.big
                    .insert(index as u32, numbers.clone().into_boxed_slice());
            }
        }
    }

    /// Encode a machine-word key at the arena's present width into `out`, for
    /// [`Self::push_encoded`] later (another thread may do the encoding); `None` (nothing
    /// written) when the key is big or needs a wider width: then [`Self::push`] it.
    pub(crate) fn encode_detached(&self, key: &KeyNumbers, out: &mut Vec<u8>) -> Option<Width> {
        match key {
            KeyNumbers::Small(numbers) if Width::needed(numbers) <= self.width => {
                encode_into(out, self.width, self.phi, numbers);
                Some(self.width)
            }
            _ => None,
        }
    }

    /// Append a key that [`Self::encode_detached`] encoded at `width`; `false` (nothing
    /// appended) when the arena has been widened since, so the caller pushes the key itself.
    pub(crate) fn push_encoded(&mut self, width: Width, bytes: &[u8]) -> bool {
        if width != self.width {
            return false;
        }
        let index = self.len();
        self.record_offset(index, self.bytes.len() as u64)
            .expect("offsets are sized for the longest key");
        reserve_gently(&mut self.bytes, bytes.len());
        self.bytes.extend_from_slice(bytes);
        true
    }

    fn widen(&mut self, to: Width) {
        let mut key = Numerators::new(self.blocks * self.phi);
        let mut fresh = KeyArena {
            width: to,
            bytes: Vec::with_capacity(self.bytes.len() * (to as usize) / (self.width as usize)),
            offsets: Vec::with_capacity(self.offsets.len()),
            bases: Vec::new(),
            big: HashMap::new(),
            spilled: None,
            ..*self
        };
        for i in 0..self.len() {
            fresh
                .record_offset(i, fresh.bytes.len() as u64)
                .expect("offsets are sized for the longest key");
            if self.big.contains_key(&(i as u32)) {
                let mask_len = self.blocks.div_ceil(8);
                fresh.bytes.resize(fresh.bytes.len() + mask_len, 0);
            } else {
                self.decode_small(i, &mut key);
                encode_into(&mut fresh.bytes, to, self.phi, &key.dense);
            }
        }
        self.bytes = fresh.bytes;
        self.offsets = fresh.offsets;
        self.bases = fresh.bases;
        self.width = to;
    }

    /// Key i into `out` (which must be the zero vector or hold a previous key).
    fn decode_small(&self, i: usize, out: &mut Numerators) {
        self.decode_bytes(&self.bytes[self.start(i)..], out);
    }

    /// The key encoded at the start of `bytes` into `out`.
    fn decode_bytes(&self, bytes: &[u8], out: &mut Numerators) {
        out.clear();
        let mask_len = self.blocks.div_ceil(8);
        let coefficient_mask = self.phi.div_ceil(8);
        let w = self.width as usize;
        let mut at = mask_len;
        for (byte_index, &block_bits) in bytes[..mask_len].iter().enumerate() {
            let mut bits = block_bits;
            while bits != 0 {
                let block = byte_index * 8 + bits.trailing_zeros() as usize;
                bits &= bits - 1;
                let mask_at = at;
                at += coefficient_mask;
                for c in 0..coefficient_mask {
                    let mut coefficient_bits = bytes[mask_at + c];
                    while coefficient_bits != 0 {
                        let t = c * 8 + coefficient_bits.trailing_zeros() as usize;
                        coefficient_bits &= coefficient_bits - 1;
                        let v = &bytes[at..at + w];
                        let value = match self.width {
                            Width::W1 => v[0] as i8 as i64,
                            Width::W2 => i16::from_le_bytes([v[0], v[1]]) as i64,
                            Width::W4 => i32::from_le_bytes([v[0], v[1], v[2], v[3]]) as i64,
                            Width::W8 => i64::from_le_bytes(v.try_into().expect("8 bytes")),
                        };
                        at += w;
                        out.push(block * self.phi + t, value);
                    }
                }
            }
        }
    }

    /// Key i: machine words into `out`, or big.
    pub(crate) fn get<'a>(&'a self, i: usize, out: &mut Numerators) -> StoredKey<'a> {
        if !self.big.is_empty() {
            if let Some(k) = self.big.get(&(i as u32)) {
                return StoredKey::Big(k);
            }
        }
        self.decode_small(i, out);
        StoredKey::Small
    }

    /// Key i as owned numbers.
    pub(crate) fn key(&self, i: usize) -> KeyNumbers {
        let mut out = Numerators::new(self.blocks * self.phi);
        match self.get(i, &mut out) {
            StoredKey::Small => KeyNumbers::Small(out.dense),
            StoredKey::Big(b) => KeyNumbers::Big(b.to_vec()),
        }
    }
}

/// Append the sparse encoding of a key at a width that holds all of its numbers.
fn encode_into(bytes: &mut Vec<u8>, width: Width, phi: usize, numbers: &[i64]) {
    let blocks = numbers.len() / phi;
    let mask_len = blocks.div_ceil(8);
    let coefficient_mask = phi.div_ceil(8);
    let nonzero = numbers.iter().filter(|&&x| x != 0).count();
    reserve_gently(
        bytes,
        mask_len + blocks * coefficient_mask + nonzero * width as usize,
    );
    let mask_at = bytes.len();
    bytes.resize(bytes.len() + mask_len, 0);
    for (b, block) in numbers.chunks(phi).enumerate() {
        if block.iter().all(|&x| x == 0) {
            continue;
        }
        bytes[mask_at + b / 8] |= 1 << (b % 8);
        let at = bytes.len();
        bytes.resize(bytes.len() + coefficient_mask, 0);
        for (t, &x) in block.iter().enumerate() {
            if x == 0 {
                continue;
            }
            bytes[at + t / 8] |= 1 << (t % 8);
            match width {
                Width::W1 => bytes.push(x as i8 as u8),
                Width::W2 => bytes.extend_from_slice(&(x as i16).to_le_bytes()),
                Width::W4 => bytes.extend_from_slice(&(x as i32).to_le_bytes()),
                Width::W8 => bytes.extend_from_slice(&x.to_le_bytes()),
            }
        }
    }
}

/// A hash-table slot: an element and its fingerprint.
#[derive(Debug, Clone, Copy)]
pub(crate) struct Slot {
    index: u32,
    fingerprint: u32,
}

/// Index element `index` in the shard table its fingerprint belongs to.
pub(crate) fn place(table: &mut HashTable<Slot>, index: u32, fingerprint: u32) {
    let slot = Slot { index, fingerprint };
    table.insert_unique(bucket_hash(fingerprint as u64), slot, |s| {
        bucket_hash(s.fingerprint as u64)
    });
}

/// The elements found so far: keys, Schreier records and the lookup table.
#[derive(Debug, Clone)]
pub(crate) struct OrbitSet {
    pub(crate) keys: KeyArena,
    /// Parent element of each element (u32::MAX for the seed).
    pub(crate) parents: Vec<u32>,
    /// Generator that maps the parent to the element (u16::MAX for the seed).
    pub(crate) generators: Vec<u16>,
    /// The lookup table, one per shard of fingerprints.
    tables: Vec<HashTable<Slot>>,
}

impl OrbitSet {
    pub(crate) fn new(blocks: usize, phi: usize) -> OrbitSet {
        OrbitSet {
            keys: KeyArena::new(blocks, phi),
            parents: Vec::new(),
            generators: Vec::new(),
            tables: (0..SHARDS).map(|_| HashTable::new()).collect(),
        }
    }

    /// Rebuild from stored keys and records, with the fingerprint of every key.
    pub(crate) fn from_parts(
        keys: KeyArena,
        parents: Vec<u32>,
        generators: Vec<u16>,
        fingerprints: Vec<u32>,
    ) -> OrbitSet {
        let mut counts = vec![0usize; SHARDS];
        for &fingerprint in &fingerprints {
            counts[shard_of(fingerprint as u64)] += 1;
        }
        let mut tables: Vec<HashTable<Slot>> =
            counts.into_iter().map(HashTable::with_capacity).collect();
        for (i, &fingerprint) in fingerprints.iter().enumerate() {
            place(
                &mut tables[shard_of(fingerprint as u64)],
                i as u32,
                fingerprint,
            );
        }
        OrbitSet {
            keys,
            parents,
            generators,
            tables,
        }
    }

    /// Number of elements.
    pub(crate) fn len(&self) -> usize {
        self.parents.len()
    }

    /// The element with this fingerprint for which `same(index)` holds.
    pub(crate) fn find(
        &self,
        fingerprint: u32,
        mut same: impl FnMut(usize) -> bool,
    ) -> Option<u32> {
        self.tables[shard_of(fingerprint as u64)]
            .find(bucket_hash(fingerprint as u64), |s| {
                s.fingerprint == fingerprint && same(s.index as usize)
            })
            .map(|s| s.index)
    }

    /// Append a new element (the caller has checked it is new).
    pub(crate) fn insert(
        &mut self,
        key: &KeyNumbers,
        fingerprint: u32,
        parent: u32,
        generator: u16,
    ) {
        let index = self.len() as u32;
        self.keys.push(key);
        self.append_record(parent, generator);
        place(
            &mut self.tables[shard_of(fingerprint as u64)],
            index,
            fingerprint,
        );
    }

    /// Append the Schreier record of an element whose key was just appended to `keys`; the
    /// element is not found by [`Self::find`] until it is placed in its shard's table.
    pub(crate) fn append_record(&mut self, parent: u32, generator: u16) {
        reserve_gently(&mut self.parents, 1);
        reserve_gently(&mut self.generators, 1);
        self.parents.push(parent);
        self.generators.push(generator);
    }

    /// The shard tables, for placing elements appended with [`Self::append_record`].
    pub(crate) fn tables_mut(&mut self) -> &mut [HashTable<Slot>] {
        &mut self.tables
    }

    /// Bytes held by the whole store.
    pub(crate) fn bytes_used(&self) -> usize {
        self.keys.bytes_used()
            + self.parents.capacity() * 4
            + self.generators.capacity() * 2
            + self
                .tables
                .iter()
                .map(HashTable::allocation_size)
                .sum::<usize>()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn keys_survive_encoding_widening_and_reparsing() {
        let phi = 4;
        let keys = [
            vec![0, 0, 0, 0, 5, 0, -1, 0, 0, 0, 0, 0],
            vec![3, 0, 0, 0, 0, 0, 0, 0, 0, -128, 127, 0],
            vec![1, 0, 0, 0, 0, 70000, 0, 0, 0, 0, 0, -2],
            vec![9, 0, 0, 0, 0, 0, 0, 0, i64::MIN + 1, 0, 0, 1],
        ];
        let mut arena = KeyArena::new(3, phi);
        let mut seen: Vec<KeyNumbers> = Vec::new();
        for k in &keys {
            arena.push(&KeyNumbers::Small(k.clone()));
            seen.push(KeyNumbers::Small(k.clone()));
            for (i, expect) in seen.iter().enumerate() {
                assert_eq!(&arena.key(i), expect);
            }
        }
        let big = KeyNumbers::Big(vec![BigInt::from(7); 12]);
        arena.push(&big);
        assert_eq!(arena.width(), Width::W8);
        let rebuilt = KeyArena::from_parts(
            3,
            phi,
            arena.width(),
            arena.raw_bytes().to_vec(),
            5,
            arena
                .big_keys()
                .map(|(i, k)| (i, k.to_vec().into_boxed_slice()))
                .collect(),
        )
        .unwrap();
        for (i, k) in keys.iter().enumerate() {
            assert_eq!(rebuilt.key(i), KeyNumbers::Small(k.clone()));
        }
        assert_eq!(rebuilt.key(4), big);
        let mut cut = arena.raw_bytes().to_vec();
        cut.pop();
        assert!(KeyArena::from_parts(3, phi, Width::W8, cut, 5, Vec::new()).is_none());
    }
}
