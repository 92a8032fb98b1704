//! The orbit's storage: packed keys in one flat arena, Schreier records, and the hash
//! table from fingerprints to element indices.
//!
//! A key (d blocks of φ numerators, see [`crate::key`]) is encoded sparsely: a bit mask of
//! its non-zero blocks (⌈d/8⌉ bytes), then for each non-zero block a bit mask of its non-zero
//! coefficients (⌈φ/8⌉ bytes) followed by those coefficients. Every coefficient of a store
//! uses one width (1, 2, 4 or 8 bytes, little-endian two's complement); the width grows, and
//! the arena is re-encoded, the first time a key needs more. An arena whose keys stream to a
//! file (the compact store's `--spill`) is never re-encoded: a wider key starts a new segment
//! of keys at the new width. A key with a numerator beyond
//! `i64` is kept as big integers beside the arena (its encoding is the empty block mask, which
//! no real key has). Keys are addressed by 32-bit offsets from a base per segment of keys.
//!
//! The arena and the record vectors grow by an eighth at a time (not by doubling), so the
//! store stays close to its payload. A table slot holds an element index and its 32-bit
//! fingerprint, so a probe compares fingerprints before it touches a key. The table is split
//! into [`SHARDS`] tables by fingerprint ([`shard_of`]), so that threads can index the new
//! lines of a chunk at the same time, each in its own shards (`crate::insert`).

use std::cell::RefCell;
use std::path::Path;

use hashbrown::{HashMap, HashTable};
use num_bigint::BigInt;

use crate::fingerprint::bucket_hash;
use crate::insert::{shard_of, SHARDS};
use crate::key::KeyNumbers;
use crate::sparse_numerators::SparseNumerators;
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

/// Bytes of encoded keys an arena that streams to a file keeps in memory before it appends
/// them to the file (4 MiB: reads of the newest keys, the most frequent, stay in memory).
pub(crate) const STREAM_BUFFER: usize = 4 << 20;

thread_local! {
    /// Scratch for keys read back from a file.
    static READ_BUFFER: RefCell<Vec<u8>> = const { RefCell::new(Vec::new()) };
}

/// Packed keys of d blocks of φ numerators.
#[derive(Debug)]
pub(crate) struct KeyArena {
    blocks: usize,
    phi: usize,
    /// (first key, width) of each run of keys of one width, in order; one entry unless the
    /// arena streams to a file and a wider key came after some were written.
    widths: Vec<(u32, Width)>,
    /// The encoding from byte `in_file` on (all of it when there is no file).
    bytes: Vec<u8>,
    /// Offset of key i from `bases[i >> shift]`.
    offsets: Vec<u32>,
    bases: Vec<u64>,
    shift: u32,
    big: HashMap<u32, Box<[BigInt]>>,
    /// Estimated heap bytes of `big`, kept as keys are added so that the size is known in
    /// constant time (it is read after every chunk).
    big_bytes: usize,
    /// The file holding the first `in_file` bytes of the encoding, when the keys go to disk.
    file: Option<SpillFile>,
    in_file: usize,
    /// Bytes held before they are appended to the file ([`STREAM_BUFFER`]).
    buffer_limit: usize,
    /// The first failure to append to the file (the bytes then stay in memory; the failure
    /// is reported by the next [`KeyArena::stream_to`] or [`KeyArena::spill`]).
    write_error: Option<String>,
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
            widths: vec![(0, Width::W1)],
            bytes: Vec::new(),
            offsets: Vec::new(),
            bases: Vec::new(),
            shift,
            big: HashMap::new(),
            big_bytes: 0,
            file: None,
            in_file: 0,
            buffer_limit: STREAM_BUFFER,
            write_error: None,
        }
    }

    /// From now on keep the encoded keys in a new file in `dir`: what is held goes there
    /// now, and new keys are appended in blocks of [`STREAM_BUFFER`] bytes. An error from an
    /// earlier append is reported here.
    pub(crate) fn stream_to(&mut self, dir: &Path) -> std::io::Result<()> {
        if self.file.is_none() {
            self.file = Some(SpillFile::create(dir)?);
        }
        self.flush();
        match &self.write_error {
            Some(e) => Err(std::io::Error::other(e.clone())),
            None => Ok(()),
        }
    }

    /// Move every encoded key to a file in `dir` (the arena is finished: keys are no longer
    /// added); they are read back one key at a time.
    pub(crate) fn spill(&mut self, dir: &Path) -> std::io::Result<()> {
        self.stream_to(dir)?;
        self.bytes = Vec::new();
        Ok(())
    }

    /// Append the bytes held to the file (when there is one and no append failed before).
    fn flush(&mut self) {
        let Some(file) = &mut self.file else {
            return;
        };
        if self.write_error.is_some() || self.bytes.is_empty() {
            return;
        }
        match file.append(&self.bytes) {
            Ok(()) => {
                self.in_file += self.bytes.len();
                self.bytes.clear();
                self.bytes
                    .shrink_to(self.buffer_limit + self.buffer_limit / 8);
            }
            Err(e) => self.write_error = Some(e.to_string()),
        }
    }

    /// The width of key i.
    fn width_of(&self, i: usize) -> Width {
        self.widths
            .iter()
            .rev()
            .find(|(first, _)| *first as usize <= i)
            .map_or(Width::W1, |&(_, w)| w)
    }

    /// Key i, reading it from the file when it was written there.
    pub(crate) fn get_spilled<'a>(
        &'a self,
        i: usize,
        out: &mut SparseNumerators,
    ) -> Result<StoredKey<'a>, String> {
        let start = self.start(i);
        if start >= self.in_file {
            return Ok(self.get(i, out));
        }
        if let Some(k) = self.big.get(&(i as u32)) {
            return Ok(StoredKey::Big(k));
        }
        let Some(file) = &self.file else {
            return Err(format!("key {i} is in a file that is not open"));
        };
        // a key is appended whole, so a key that starts in the file ends there
        let end = if i + 1 < self.len() {
            self.start(i + 1)
        } else {
            self.in_file
        };
        READ_BUFFER.with_borrow_mut(|bytes| {
            file.read(start, end, bytes).map_err(|e| e.to_string())?;
            self.decode_bytes(bytes, self.width_of(i), out);
            Ok(StoredKey::Small)
        })
    }

    /// Number of keys.
    pub(crate) fn len(&self) -> usize {
        self.offsets.len()
    }

    /// The widest width of the keys held.
    pub(crate) fn width(&self) -> Width {
        self.widths
            .iter()
            .map(|&(_, w)| w)
            .max()
            .unwrap_or(Width::W1)
    }

    /// The encoded keys (checkpoint files; an arena kept in memory has one width).
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
        arena.widths = vec![(0, width)];
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
            at += coefficient_mask + set as usize * self.width() as usize;
        }
        (at <= bytes.len()).then_some(at)
    }

    fn start(&self, i: usize) -> usize {
        (self.bases[i >> self.shift] + self.offsets[i] as u64) as usize
    }

    fn block_mask_is_empty(&self, i: usize) -> bool {
        let at = self.start(i) - self.in_file;
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

    /// Append a key (to the file when the arena streams and its buffer is full).
    pub(crate) fn push(&mut self, key: &KeyNumbers) {
        let index = self.len();
        if let KeyNumbers::Small(numbers) = key {
            let needed = Width::needed(numbers);
            let current = self.current_width();
            if needed > current && self.file.is_some() {
                self.widths.push((index as u32, needed));
            } else if needed > current {
                self.widen(needed);
            }
        }
        let width = self.current_width();
        self.record_offset(index, (self.in_file + self.bytes.len()) as u64)
            .expect("offsets are sized for the longest key");
        match key {
            KeyNumbers::Small(numbers) => {
                encode_into(&mut self.bytes, width, self.phi, numbers);
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
        if self.file.is_some() && self.bytes.len() >= self.buffer_limit {
            self.flush();
        }
    }

    /// The width new keys are written at (the last run's).
    fn current_width(&self) -> Width {
        self.widths.last().map_or(Width::W1, |&(_, w)| w)
    }

    /// Encode a machine-word key at the arena's present width into `out`, for
    /// [`Self::push_encoded`] later (another thread may do the encoding); `None` (nothing
    /// written) when the key is big or needs a wider width: then [`Self::push`] it.
    pub(crate) fn encode_detached(&self, key: &KeyNumbers, out: &mut Vec<u8>) -> Option<Width> {
        let width = self.current_width();
        match key {
            KeyNumbers::Small(numbers) if Width::needed(numbers) <= width => {
                encode_into(out, width, self.phi, numbers);
                Some(width)
            }
            _ => None,
        }
    }

    /// Append a key that [`Self::encode_detached`] encoded at `width`; `false` (nothing
    /// appended) when the arena's width has changed since, so the caller pushes the key
    /// itself.
    pub(crate) fn push_encoded(&mut self, width: Width, bytes: &[u8]) -> bool {
        if width != self.current_width() {
            return false;
        }
        let index = self.len();
        self.record_offset(index, (self.in_file + self.bytes.len()) as u64)
            .expect("offsets are sized for the longest key");
        reserve_gently(&mut self.bytes, bytes.len());
        self.bytes.extend_from_slice(bytes);
        if self.file.is_some() && self.bytes.len() >= self.buffer_limit {
            self.flush();
        }
        true
    }

    /// Re-encode the keys (all in memory) at a wider width.
    fn widen(&mut self, to: Width) {
        let mut key = SparseNumerators::new(self.blocks * self.phi);
        let from = self.width();
        let mut fresh = KeyArena {
            widths: vec![(0, to)],
            bytes: Vec::with_capacity(self.bytes.len() * (to as usize) / (from as usize)),
            offsets: Vec::with_capacity(self.offsets.len()),
            bases: Vec::new(),
            big: HashMap::new(),
            file: None,
            in_file: 0,
            write_error: None,
            buffer_limit: self.buffer_limit,
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
        self.bytes = std::mem::take(&mut fresh.bytes);
        self.offsets = std::mem::take(&mut fresh.offsets);
        self.bases = std::mem::take(&mut fresh.bases);
        self.widths = vec![(0, to)];
    }

    /// Key i, held in memory, into `out` (which must be the zero vector or hold a previous
    /// key).
    fn decode_small(&self, i: usize, out: &mut SparseNumerators) {
        let at = self.start(i) - self.in_file;
        self.decode_bytes(&self.bytes[at..], self.width_of(i), out);
    }

    /// The key encoded at `width` at the start of `bytes` into `out`.
    fn decode_bytes(&self, bytes: &[u8], width: Width, out: &mut SparseNumerators) {
        out.clear();
        let mask_len = self.blocks.div_ceil(8);
        let coefficient_mask = self.phi.div_ceil(8);
        let w = width as usize;
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
                        let value = match width {
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

    /// Key i, held in memory (see [`KeyArena::get_spilled`] for keys in a file): machine
    /// words into `out`, or big.
    pub(crate) fn get<'a>(&'a self, i: usize, out: &mut SparseNumerators) -> StoredKey<'a> {
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
        let mut out = SparseNumerators::new(self.blocks * self.phi);
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
#[derive(Debug)]
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

    #[test]
    fn streamed_keys_read_back_across_flushes_and_widths() {
        // keys of growing width (segments of W1, W2, W4, W8) and one big key, appended to a
        // file in blocks of 40 bytes: every key reads back the same from memory or file
        let dir = std::env::temp_dir();
        let phi = 3;
        let key = |i: usize| -> KeyNumbers {
            if i == 77 {
                return KeyNumbers::Big(vec![BigInt::from(i64::MAX) * 4; 6]);
            }
            let scale: i64 = match i {
                0..=49 => 1,
                50..=99 => 300,
                100..=149 => 100_000,
                _ => 10_000_000_000,
            };
            let x = (i as i64 % 11 - 5) * scale;
            KeyNumbers::Small(vec![1, 0, x, 0, 0, if i % 3 == 0 { 0 } else { -x - 1 }])
        };
        let mut arena = KeyArena::new(2, phi);
        arena.buffer_limit = 40;
        arena.push(&key(0));
        arena.stream_to(&dir).unwrap();
        let mut out = SparseNumerators::new(2 * phi);
        let read = |arena: &KeyArena, i: usize, out: &mut SparseNumerators| -> KeyNumbers {
            match arena.get_spilled(i, out).unwrap() {
                StoredKey::Small => KeyNumbers::Small(out.dense.clone()),
                StoredKey::Big(b) => KeyNumbers::Big(b.to_vec()),
            }
        };
        for i in 1..200 {
            arena.push(&key(i));
            assert!(arena.bytes.len() < 40 + 64, "the buffer is flushed");
            for j in [0, i / 2, i.saturating_sub(1), i] {
                assert_eq!(read(&arena, j, &mut out), key(j), "key {j} after {i}");
            }
        }
        assert!(arena.in_file > 0);
        assert_eq!(arena.width(), Width::W8);
        assert_eq!(
            arena.widths.len(),
            4,
            "one segment per width, nothing re-encoded"
        );
        arena.spill(&dir).unwrap();
        assert!(arena.bytes.is_empty());
        for i in 0..200 {
            assert_eq!(read(&arena, i, &mut out), key(i));
        }
    }

    #[test]
    fn keys_encoded_apart_stream_like_pushed_ones() {
        // the sharded insertion encodes keys on other threads and appends the bytes: on a
        // streaming arena they flush and read back like pushed keys, and a key encoded
        // before the width changed is refused so that the caller pushes it
        let dir = std::env::temp_dir();
        let key = |i: i64| KeyNumbers::Small(vec![1, i % 100, 0, -(i % 7)]);
        let mut arena = KeyArena::new(2, 2);
        arena.buffer_limit = 32;
        arena.stream_to(&dir).unwrap();
        for i in 0..300 {
            let mut bytes = Vec::new();
            let width = arena.encode_detached(&key(i), &mut bytes).unwrap();
            assert!(arena.push_encoded(width, &bytes));
        }
        assert!(arena.in_file > 0 && arena.bytes.len() < 32 + 16);
        let mut stale = Vec::new();
        let w1 = arena.encode_detached(&key(1), &mut stale).unwrap();
        arena.push(&KeyNumbers::Small(vec![1, 1000, 0, 0]));
        assert!(!arena.push_encoded(w1, &stale));
        let mut out = SparseNumerators::new(4);
        for i in 0..300 {
            assert!(matches!(
                arena.get_spilled(i, &mut out),
                Ok(StoredKey::Small)
            ));
            assert_eq!(
                KeyNumbers::Small(out.dense.clone()),
                key(i as i64),
                "key {i}"
            );
        }
        assert!(matches!(
            arena.get_spilled(300, &mut out),
            Ok(StoredKey::Small)
        ));
        assert_eq!(out.dense, vec![1, 1000, 0, 0]);
    }
}
