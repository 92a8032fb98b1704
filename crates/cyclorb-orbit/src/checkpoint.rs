//! Binary checkpoints: the whole state of a partial orbit, to resume to the identical answer.
//!
//! Layout (all integers little-endian):
//!
//! | field | bytes |
//! | --- | --- |
//! | magic `CYCORBCK` | 8 |
//! | format version (2 for the memory store, 3 for the compact store; version 1 had no origin) | u32 |
//! | length of the origin text (0: none), then its UTF-8 bytes: how the problem was built, so that `--resume FILE` alone can rebuild it (a hint only: the content hash below decides) | u32 + bytes |
//! | conductor n, dimension d, degree φ(n), number of generators | 4 × u32 |
//! | content hash of generators and seed ([`OrbitProblem::content_hash`]) | u128 |
//! | elements N, processed, number of layer ends L | 3 × u64 |
//! | layer ends | L × u64 |
//! | compute seconds so far | f64 bits as u64 |
//! | *versions 1 and 2 (memory store) only:* | |
//! | numerator width w (1, 2, 4, 8) | u8 |
//! | length A of the packed keys, then the keys (sparse encoding of the `store` module) | u64 + A |
//! | parents (u32::MAX for the seed) | N × u32 |
//! | generators (u16::MAX for the seed) | N × u16 |
//! | number of big keys B, then per key: index (u32) and d·φ numerators, each as a byte length (u32) and signed little-endian bytes | … |
//! | *version 3 (compact store) only:* | |
//! | parents (u32::MAX for the seed) | N × u32 |
//! | generators (u16::MAX for the seed) | N × u16 |
//! | FNV-1a 128 of every byte above | u128 |
//!
//! Fingerprints and the hash table are rebuilt when the file is read. A compact checkpoint
//! holds no keys (6 bytes per line): they are recomputed from the records layer by layer
//! (the `regenerate` module), which costs about what the enumeration spent on new lines. A file is refused when
//! its header does not match the problem (another field, dimension or generator set), when
//! the checksum fails, or when a record is out of range.

use std::fs::File;
use std::io::{BufReader, BufWriter, Read, Write};
use std::path::Path;

use num_bigint::BigInt;

use crate::engine::Orbit;
use crate::error::OrbitError;
use crate::problem::OrbitProblem;
use crate::set::LineStore;
use crate::store::{KeyArena, OrbitSet, Width};
use cyclorb_field::Fnv128;

const MAGIC: &[u8; 8] = b"CYCORBCK";
const VERSION: u32 = 2;
/// The version of a checkpoint of the compact store.
const COMPACT_VERSION: u32 = 3;

/// Longest origin text read from a file.
const MAX_ORIGIN: usize = 1 << 20;

/// A writer that hashes what it writes.
pub(crate) struct HashingWriter<W: Write> {
    inner: W,
    hash: Fnv128,
}

impl<W: Write> HashingWriter<W> {
    pub(crate) fn put(&mut self, bytes: &[u8]) -> std::io::Result<()> {
        self.hash.write(bytes);
        self.inner.write_all(bytes)
    }
}

/// A reader that never asks for more than the file holds (before its checksum).
struct BoundedReader<R: Read> {
    inner: R,
    remaining: u64,
}

impl<R: Read> BoundedReader<R> {
    fn take(&mut self, len: usize) -> Result<Vec<u8>, String> {
        if len as u64 > self.remaining {
            return Err("truncated file".into());
        }
        self.remaining -= len as u64;
        let mut buf = vec![0u8; len];
        self.inner
            .read_exact(&mut buf)
            .map_err(|_| "truncated file".to_string())?;
        Ok(buf)
    }

    fn u8(&mut self) -> Result<u8, String> {
        Ok(self.take(1)?[0])
    }

    fn u16(&mut self) -> Result<u16, String> {
        let b = self.take(2)?;
        Ok(u16::from_le_bytes([b[0], b[1]]))
    }

    fn u32(&mut self) -> Result<u32, String> {
        let b = self.take(4)?;
        Ok(u32::from_le_bytes(b.try_into().expect("4 bytes")))
    }

    fn u64(&mut self) -> Result<u64, String> {
        let b = self.take(8)?;
        Ok(u64::from_le_bytes(b.try_into().expect("8 bytes")))
    }

    fn u128(&mut self) -> Result<u128, String> {
        let b = self.take(16)?;
        Ok(u128::from_le_bytes(b.try_into().expect("16 bytes")))
    }

    /// A count that must fit in memory sensibly (at most `max`).
    fn count(&mut self, max: u64, what: &str) -> Result<usize, String> {
        let c = self.u64()?;
        if c > max {
            return Err(format!("{what} {c} is out of range"));
        }
        Ok(c as usize)
    }
}

/// Check the trailing FNV-1a 128 of a checkpoint file; its size when it matches.
fn verify_checksum(path: &Path) -> Result<u64, OrbitError> {
    let file = File::open(path).map_err(|e| io_error(path, e))?;
    let size = file.metadata().map_err(|e| io_error(path, e))?.len();
    if size < 16 + 8 {
        return Err(io_error(path, "not a cyclorb orbit checkpoint (too short)"));
    }
    let mut reader = BufReader::new(file);
    let mut hash = Fnv128::new();
    let mut left = size - 16;
    let mut buf = vec![0u8; 1 << 16];
    while left > 0 {
        let take = left.min(buf.len() as u64) as usize;
        reader
            .read_exact(&mut buf[..take])
            .map_err(|e| io_error(path, e))?;
        hash.write(&buf[..take]);
        left -= take as u64;
    }
    let mut trailer = [0u8; 16];
    reader
        .read_exact(&mut trailer)
        .map_err(|e| io_error(path, e))?;
    if u128::from_le_bytes(trailer) != hash.finish() {
        let mut magic = [0u8; 8];
        let is_checkpoint = File::open(path)
            .and_then(|mut f| f.read_exact(&mut magic))
            .is_ok()
            && &magic == MAGIC;
        return Err(io_error(
            path,
            if is_checkpoint {
                "corrupt or truncated file (checksum mismatch)"
            } else {
                "not a cyclorb orbit checkpoint"
            },
        ));
    }
    Ok(size)
}

/// Read the magic, the version and the origin text (versions 1 to 3).
fn read_origin<R: Read>(r: &mut BoundedReader<R>) -> Result<(u32, Option<String>), String> {
    if r.take(8)? != MAGIC {
        return Err("not a cyclorb orbit checkpoint".into());
    }
    let version = r.u32()?;
    let origin = match version {
        1 => Ok(None),
        VERSION | COMPACT_VERSION => {
            let len = r.u32()? as usize;
            if len > MAX_ORIGIN {
                return Err(format!("origin of {len} bytes is out of range"));
            }
            let text = String::from_utf8(r.take(len)?)
                .map_err(|_| "the origin is not UTF-8 text".to_string())?;
            Ok((!text.is_empty()).then_some(text))
        }
        _ => Err(format!(
            "checkpoint version {version}; this program reads 1 to {COMPACT_VERSION}"
        )),
    }?;
    Ok((version, origin))
}

/// The origin text recorded in a checkpoint (see [`OrbitProblem::with_origin`]); `None`
/// when the writer recorded none. Only the header is read: the origin is a hint for
/// rebuilding the problem, and the whole file (checksum, content hash of the generators
/// and seed) is verified when the state is read, so a large checkpoint is not read twice.
pub fn checkpoint_origin(path: &Path) -> Result<Option<String>, OrbitError> {
    let file = File::open(path).map_err(|e| io_error(path, e))?;
    let size = file.metadata().map_err(|e| io_error(path, e))?.len();
    let mut r = BoundedReader {
        inner: BufReader::new(file),
        remaining: size.saturating_sub(16),
    };
    read_origin(&mut r)
        .map(|(_, origin)| origin)
        .map_err(|e| io_error(path, e))
}

fn io_error(path: &Path, e: impl std::fmt::Display) -> OrbitError {
    OrbitError::Checkpoint {
        path: path.display().to_string(),
        reason: e.to_string(),
    }
}

/// Write a file through `path.tmp` and a rename (a crash while writing leaves the previous
/// file intact): `body` writes the content, its FNV-1a 128 follows.
pub(crate) fn write_hashed(
    path: &Path,
    body: impl FnOnce(&mut HashingWriter<BufWriter<File>>) -> std::io::Result<()>,
) -> Result<(), OrbitError> {
    let mut tmp = path.as_os_str().to_owned();
    tmp.push(".tmp");
    let tmp = std::path::PathBuf::from(tmp);
    let file = File::create(&tmp).map_err(|e| io_error(&tmp, e))?;
    let mut w = HashingWriter {
        inner: BufWriter::new(file),
        hash: Fnv128::new(),
    };
    body(&mut w)
        .and_then(|()| {
            let checksum = w.hash.finish().to_le_bytes();
            w.inner.write_all(&checksum)?;
            w.inner.flush()
        })
        .map_err(|e| io_error(&tmp, e))?;
    drop(w);
    std::fs::rename(&tmp, path).map_err(|e| io_error(path, e))
}

impl OrbitProblem {
    /// Write the state of `orbit` to `path` (through `path.tmp` and a rename, so a crash
    /// while writing leaves the previous checkpoint intact).
    pub fn write_checkpoint(&self, orbit: &Orbit, path: &Path) -> Result<(), OrbitError> {
        write_hashed(path, |w| self.write_state(orbit, w))
    }

    fn write_state<W: Write>(
        &self,
        orbit: &Orbit,
        w: &mut HashingWriter<W>,
    ) -> std::io::Result<()> {
        let version = match orbit.set {
            LineStore::Memory(_) => VERSION,
            LineStore::Compact(_) => COMPACT_VERSION,
        };
        w.put(MAGIC)?;
        w.put(&version.to_le_bytes())?;
        let origin = self.origin.as_deref().unwrap_or("").as_bytes();
        w.put(&(origin.len() as u32).to_le_bytes())?;
        w.put(origin)?;
        for x in [
            self.generators.conductor(),
            self.generators.dimension() as u32,
            self.kernel.degree() as u32,
            self.generators.operators().len() as u32,
        ] {
            w.put(&x.to_le_bytes())?;
        }
        w.put(&self.content_hash().to_le_bytes())?;
        for x in [orbit.set.len(), orbit.processed, orbit.layer_ends.len()] {
            w.put(&(x as u64).to_le_bytes())?;
        }
        for &e in &orbit.layer_ends {
            w.put(&(e as u64).to_le_bytes())?;
        }
        w.put(&orbit.compute_seconds.to_bits().to_le_bytes())?;
        let set = match &orbit.set {
            LineStore::Memory(set) => set,
            LineStore::Compact(set) => {
                for &p in &set.parents {
                    w.put(&p.to_le_bytes())?;
                }
                for &g in &set.generators {
                    let g = if g == u8::MAX { u16::MAX } else { g as u16 };
                    w.put(&g.to_le_bytes())?;
                }
                return Ok(());
            }
        };
        w.put(&[set.keys.width() as u8])?;
        w.put(&(set.keys.raw_bytes().len() as u64).to_le_bytes())?;
        w.put(set.keys.raw_bytes())?;
        for &p in &set.parents {
            w.put(&p.to_le_bytes())?;
        }
        for &g in &set.generators {
            w.put(&g.to_le_bytes())?;
        }
        let big: Vec<(u32, &[BigInt])> = set.keys.big_keys().collect();
        w.put(&(big.len() as u64).to_le_bytes())?;
        for (index, numbers) in big {
            w.put(&index.to_le_bytes())?;
            for x in numbers {
                let bytes = x.to_signed_bytes_le();
                w.put(&(bytes.len() as u32).to_le_bytes())?;
                w.put(&bytes)?;
            }
        }
        Ok(())
    }

    /// Read a checkpoint written for this problem; the orbit can then be continued with
    /// [`OrbitProblem::extend`]. The checksum is verified in a first pass over the file, so
    /// a damaged file is reported as such before its contents are interpreted.
    pub fn read_checkpoint(&self, path: &Path) -> Result<Orbit, OrbitError> {
        let size = verify_checksum(path)?;
        let file = File::open(path).map_err(|e| io_error(path, e))?;
        let mut r = BoundedReader {
            inner: BufReader::new(file),
            remaining: size - 16,
        };
        let orbit = self.read_state(&mut r).map_err(|e| io_error(path, e))?;
        if r.remaining != 0 {
            return Err(io_error(path, "unexpected bytes after the state"));
        }
        Ok(orbit)
    }

    fn read_state<R: Read>(&self, r: &mut BoundedReader<R>) -> Result<Orbit, String> {
        let (version, _) = read_origin(r)?;
        let header = [r.u32()?, r.u32()?, r.u32()?, r.u32()?];
        let ours = [
            self.generators.conductor(),
            self.generators.dimension() as u32,
            self.kernel.degree() as u32,
            self.generators.operators().len() as u32,
        ];
        let names = ["conductor", "dimension", "degree", "number of generators"];
        for ((theirs, mine), name) in header.iter().zip(ours).zip(names) {
            if *theirs != mine {
                return Err(format!(
                    "made for another problem: {name} {theirs}, this problem has {mine}"
                ));
            }
        }
        if r.u128()? != self.content_hash() {
            return Err("made for other generators or another seed (content hash differs)".into());
        }
        let count = r.count(u32::MAX as u64, "element count")?;
        if count == 0 {
            return Err("no elements".into());
        }
        let processed = r.count(count as u64, "processed count")?;
        let layers = r.count(count as u64 + 1, "layer count")?;
        let mut layer_ends = Vec::new();
        for _ in 0..layers {
            let e = r.count(count as u64, "layer end")?;
            if layer_ends.last().is_some_and(|&last| e <= last) || e == 0 {
                return Err("layer ends are not increasing".into());
            }
            layer_ends.push(e);
        }
        if layer_ends.is_empty() || processed > *layer_ends.last().unwrap_or(&0) {
            return Err("inconsistent layers".into());
        }
        let compute_seconds = f64::from_bits(r.u64()?);
        if version == COMPACT_VERSION {
            let (parents, generators) = self.read_records(r, count)?;
            let set = self
                .compact_from_records(&parents, &generators, &layer_ends)
                .map_err(|e| e.to_string())?;
            return Ok(Orbit {
                set,
                processed,
                layer_ends,
                stop: None,
                compute_seconds,
            });
        }
        let width = Width::from_bytes(r.u8()?).ok_or("bad numerator width")?;
        let len = self.key_len();
        let arena_len = r.count(u64::MAX, "key arena length")?;
        let bytes = r.take(arena_len)?;
        let (parents, generators) = self.read_records(r, count)?;
        let big_count = r.count(count as u64, "big key count")?;
        let mut big = Vec::new();
        for _ in 0..big_count {
            let index = r.u32()?;
            let mut numbers = Vec::new();
            for _ in 0..len {
                let n = r.u32()? as usize;
                if n > 1 << 24 {
                    return Err("a big numerator is implausibly long".into());
                }
                numbers.push(BigInt::from_signed_bytes_le(&r.take(n)?));
            }
            big.push((index, numbers.into_boxed_slice()));
        }
        let keys = KeyArena::from_parts(
            self.dimension(),
            self.kernel.degree(),
            width,
            bytes,
            count,
            big,
        )
        .ok_or("the packed keys do not parse")?;
        let fingerprints = (0..count)
            .map(|i| self.key_fingerprint(&keys.key(i), false) as u32)
            .collect();
        Ok(Orbit {
            set: LineStore::Memory(OrbitSet::from_parts(
                keys,
                parents,
                generators,
                fingerprints,
            )),
            processed,
            layer_ends,
            stop: None,
            compute_seconds,
        })
    }

    /// The parents and generators of `count` elements, each checked: the seed has none, every
    /// other element a parent found before it and a generator of the set.
    fn read_records<R: Read>(
        &self,
        r: &mut BoundedReader<R>,
        count: usize,
    ) -> Result<(Vec<u32>, Vec<u16>), String> {
        let mut parents = Vec::new();
        for i in 0..count {
            let p = r.u32()?;
            if (i == 0) != (p == u32::MAX) || (i > 0 && p as usize >= i) {
                return Err(format!("element {i}: bad parent {p}"));
            }
            parents.push(p);
        }
        let gens = self.generators.operators().len();
        let mut generators = Vec::new();
        for i in 0..count {
            let g = r.u16()?;
            if (i == 0) != (g == u16::MAX) || (i > 0 && g as usize >= gens) {
                return Err(format!("element {i}: bad generator {g}"));
            }
            generators.push(g);
        }
        Ok((parents, generators))
    }

    /// Read a checkpoint and continue the enumeration it holds.
    pub fn resume(
        &self,
        path: &Path,
        options: &crate::engine::OrbitOptions,
        observer: &mut dyn crate::engine::ProgressObserver,
    ) -> Result<Orbit, OrbitError> {
        let orbit = self.read_checkpoint(path)?;
        self.extend(orbit, options, observer)
    }
}
