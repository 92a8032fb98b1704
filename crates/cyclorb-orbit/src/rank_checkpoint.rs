//! Checkpoints of a distributed enumeration: one file per rank, `BASE.rankR`, written by
//! every rank at the same finished layer (or at a stop), so that the job resumes to the
//! identical answer with the same number of ranks (each rank reads its own file) or with
//! another number (each rank reads every old file and keeps the lines it now owns: records
//! hold global indices, so nothing else changes with the owner map).
//!
//! Layout (integers little-endian unless said; "varint" is LEB128):
//!
//! | field | bytes |
//! | --- | --- |
//! | magic `CYCORBRK`, format version: 1 (memory store) or 2 (compact store) | 8 + u32 |
//! | length of the origin text (0: none), then its UTF-8 bytes (as in the one-process checkpoint) | u32 + bytes |
//! | conductor n, dimension d, degree φ(n), number of generators | 4 × u32 |
//! | content hash of generators and seed ([`OrbitProblem::content_hash`]) | u128 |
//! | ranks R, this rank r | 2 × u32 |
//! | lines of all ranks, global layer ends (count, then each) | u64 + u64 + … |
//! | this rank's lines N, frontier start, local layer ends (count, then each) | 3 × u64 + … |
//! | compute seconds so far | f64 bits as u64 |
//! | version 2 only: the window start W (the global index of the rank's first line with its key held, or the line count), this rank's part of B (a flag byte, then the length and the JSON array of its d² entries in the field's text syntax), its share of the record directory (count, then per record the parent u32 and the generator u8) | u64 + … |
//! | per line (version 1): its global index (varint), then the wire form of the `wire` module with the order key (parent's global index · 2¹⁶ + generator) and 0 for the fingerprint | … |
//! | per line (version 2): its global index (varint), then from index W on the wire form with the order key and the 62-bit fingerprint, before W the order key and the fingerprint alone (varints) | … |
//! | FNV-1a 128 of every byte above | u128 |
//!
//! A compact file holds the keys of its lines from W on, the global index of the first line
//! of the rank's window; a resume rebuilds the window from them (from the largest W of the
//! files when regrouping, so that the keys held are a suffix of every rank's lines), and an
//! older line is settled through its word as in the run (`distributed_compact`).
//!
//! Reading checks the checksum first, then that the header is this problem's, that the file
//! is this rank's of R (or, with another number of ranks, file r's of R for every r), and
//! for every line that the file's rank owns it (its fingerprint is
//! recomputed from the key where there is one, and must equal the stored one), that its
//! index grows and its record points to an earlier line with a generator of the set.

use std::io::Write;
use std::path::{Path, PathBuf};

use cyclorb_field::Fnv128;

use crate::checkpoint::{write_hashed, HashingWriter};
use crate::collective::owner;
use crate::compact::reserve_gently;
use crate::distributed::matrix_text;
use crate::distributed::DistributedOrbit;
use crate::distributed_compact::{CompactShare, LayerSums, RecordDirectory};
use crate::engine::Orbit;
use crate::error::OrbitError;
use crate::key::KeyNumbers;
use crate::problem::OrbitProblem;
use crate::set::Fetched;
use crate::set::{LineStore, StoreKind};
use crate::sparse_numerators::SparseNumerators;
use crate::store::KeyArena;
use crate::wire::{encode, put_varint, Reader};
use cyclorb_matrix::Matrix;

const MAGIC: &[u8; 8] = b"CYCORBRK";
/// The memory store's files: every line with its key.
const VERSION: u32 = 1;
/// The compact store's files: keys from the window start on, B's part, the directory.
const VERSION_COMPACT: u32 = 2;

/// The checkpoint file of `rank`: `BASE.rankR`.
pub fn rank_checkpoint_path(base: &Path, rank: usize) -> PathBuf {
    let mut name = base.as_os_str().to_owned();
    name.push(format!(".rank{rank}"));
    PathBuf::from(name)
}

/// Where `rank` writes its next checkpoint, `BASE.rankR.next`, before every rank has
/// written its own and the files replace the old ones (module `distributed`,
/// `checkpoint_ranks`).
pub(crate) fn next_rank_checkpoint_path(base: &Path, rank: usize) -> PathBuf {
    let mut name = rank_checkpoint_path(base, rank).into_os_string();
    name.push(".next");
    PathBuf::from(name)
}

/// The file to read for `rank`: its new file `BASE.rankR.next` when `newest` and there is
/// one (a job stopped while the ranks replaced their files), else `BASE.rankR`.
pub(crate) fn rank_file(base: &Path, rank: usize, newest: bool) -> PathBuf {
    let next = next_rank_checkpoint_path(base, rank);
    if newest && next.exists() {
        next
    } else {
        rank_checkpoint_path(base, rank)
    }
}

/// Rank 0's checkpoint of a job, the newest there is: the file that records the problem
/// and the number of ranks (`BASE.rank0`, or `BASE.rank0.next` when only that is left).
pub fn first_rank_checkpoint(base: &Path) -> PathBuf {
    rank_file(base, 0, true)
}

fn error(path: &Path, reason: impl std::fmt::Display) -> OrbitError {
    OrbitError::Checkpoint {
        path: path.display().to_string(),
        reason: reason.to_string(),
    }
}

/// A cursor over the fixed-width fields of a checkpoint held in memory.
struct Fields<'a> {
    bytes: &'a [u8],
    at: usize,
}

impl Fields<'_> {
    fn take(&mut self, len: usize) -> Result<&[u8], String> {
        let end = self.at.checked_add(len).filter(|&e| e <= self.bytes.len());
        let end = end.ok_or_else(|| format!("truncated at byte {}", self.at))?;
        let part = &self.bytes[self.at..end];
        self.at = end;
        Ok(part)
    }

    fn u32(&mut self) -> Result<u32, String> {
        Ok(u32::from_le_bytes(
            self.take(4)?.try_into().expect("4 bytes"),
        ))
    }

    fn u64(&mut self) -> Result<u64, String> {
        Ok(u64::from_le_bytes(
            self.take(8)?.try_into().expect("8 bytes"),
        ))
    }

    /// A count or index no larger than `max`.
    fn count(&mut self, max: u64, what: &str) -> Result<usize, String> {
        let x = self.u64()?;
        if x > max {
            return Err(format!("{what} {x} is out of range"));
        }
        Ok(x as usize)
    }

    /// A non-decreasing list of at most `count` ends, each at most `max`.
    fn ends(&mut self, count: usize, max: usize, what: &str) -> Result<Vec<usize>, String> {
        let n = self.count(count as u64, what)?;
        let mut ends = Vec::with_capacity(n);
        for _ in 0..n {
            let e = self.count(max as u64, what)?;
            if ends.last().is_some_and(|&last| e < last) {
                return Err(format!("{what} decrease"));
            }
            ends.push(e);
        }
        Ok(ends)
    }
}

/// The origin text recorded in rank checkpoint `path` (`None` when none was recorded).
pub fn rank_checkpoint_origin(path: &Path) -> Result<Option<String>, OrbitError> {
    let bytes = checked_bytes(path)?;
    let mut f = Fields {
        bytes: &bytes,
        at: 0,
    };
    read_origin(&mut f)
        .map(|(_, origin)| origin)
        .map_err(|e| error(path, e))
}

/// The file's bytes before its checksum, after checking the checksum.
fn checked_bytes(path: &Path) -> Result<Vec<u8>, OrbitError> {
    let mut bytes = std::fs::read(path).map_err(|e| error(path, e))?;
    if bytes.len() < 16 {
        return Err(error(path, "too short to be a rank checkpoint"));
    }
    let tail = bytes.split_off(bytes.len() - 16);
    let mut hash = Fnv128::new();
    hash.write(&bytes);
    if hash.finish().to_le_bytes()[..] != tail[..] {
        return Err(error(path, "checksum mismatch: the file is damaged"));
    }
    Ok(bytes)
}

/// The format version and the recorded origin (`None` when none was recorded).
fn read_origin(f: &mut Fields<'_>) -> Result<(u32, Option<String>), String> {
    if f.take(8)? != MAGIC {
        return Err("not a rank checkpoint of cyclorb".into());
    }
    let version = f.u32()?;
    if version != VERSION && version != VERSION_COMPACT {
        return Err(format!(
            "rank checkpoint version {version}, expected {VERSION} or {VERSION_COMPACT}"
        ));
    }
    let len = f.u32()? as usize;
    let text = std::str::from_utf8(f.take(len)?).map_err(|_| "the origin is not UTF-8")?;
    Ok((version, (len > 0).then(|| text.to_string())))
}

impl OrbitProblem {
    /// Write this rank's state to `path` (through `path.tmp` and a rename).
    pub(crate) fn write_rank_checkpoint(
        &self,
        orbit: &DistributedOrbit,
        rank: usize,
        path: &Path,
    ) -> Result<(), OrbitError> {
        write_hashed(path, |w| self.write_rank_state(orbit, rank, w))
    }

    /// The header, then the lines one by one (nothing of the size of the state is built in
    /// memory).
    fn write_rank_state<W: Write>(
        &self,
        orbit: &DistributedOrbit,
        rank: usize,
        w: &mut HashingWriter<W>,
    ) -> std::io::Result<()> {
        let version = match orbit.compact {
            Some(_) => VERSION_COMPACT,
            None => VERSION,
        };
        let mut b = Vec::new();
        b.extend_from_slice(MAGIC);
        b.extend_from_slice(&version.to_le_bytes());
        let origin = self.origin.as_deref().unwrap_or("");
        b.extend_from_slice(&(origin.len() as u32).to_le_bytes());
        b.extend_from_slice(origin.as_bytes());
        for x in self.header() {
            b.extend_from_slice(&x.to_le_bytes());
        }
        b.extend_from_slice(&self.content_hash().to_le_bytes());
        b.extend_from_slice(&(orbit.ranks as u32).to_le_bytes());
        b.extend_from_slice(&(rank as u32).to_le_bytes());
        let put_ends = |b: &mut Vec<u8>, ends: &[usize]| {
            b.extend_from_slice(&(ends.len() as u64).to_le_bytes());
            for &e in ends {
                b.extend_from_slice(&(e as u64).to_le_bytes());
            }
        };
        b.extend_from_slice(&(orbit.total as u64).to_le_bytes());
        put_ends(&mut b, &orbit.layer_ends);
        b.extend_from_slice(&(orbit.local.len() as u64).to_le_bytes());
        b.extend_from_slice(&(orbit.local.processed as u64).to_le_bytes());
        put_ends(&mut b, &orbit.local.layer_ends);
        b.extend_from_slice(&orbit.local.compute_seconds.to_bits().to_le_bytes());
        // the global index from which this rank holds every key of its lines
        let start = orbit
            .global
            .get(orbit.local.set.first_held())
            .map_or(orbit.total, |&g| g as usize);
        if let Some(share) = &orbit.compact {
            b.extend_from_slice(&(start as u64).to_le_bytes());
            match &share.sums {
                Some(sums) => {
                    let text =
                        serde_json::to_vec(&matrix_text(sums.part())).expect("text serialises");
                    b.push(1);
                    b.extend_from_slice(&(text.len() as u64).to_le_bytes());
                    b.extend_from_slice(&text);
                }
                None => b.push(0),
            }
            let records: Vec<_> = share.directory.records().collect();
            b.extend_from_slice(&(records.len() as u64).to_le_bytes());
            for (_, parent, generator) in records {
                b.extend_from_slice(&parent.to_le_bytes());
                b.push(generator);
            }
        }
        w.put(&b)?;
        let mut buf = SparseNumerators::new(self.key_len());
        for (i, (index, parent, generator)) in orbit.local_records().enumerate() {
            b.clear();
            put_varint(&mut b, u64::from(index));
            let order = u64::from(parent) << 16 | u64::from(generator);
            match orbit.local.set.wide_fingerprint(i) {
                None => encode(
                    &mut b,
                    order,
                    0,
                    &self.held_key(&orbit.local.set, i, &mut buf)?,
                ),
                Some(fingerprint) if index as usize >= start => {
                    let key = self.held_key(&orbit.local.set, i, &mut buf)?;
                    encode(&mut b, order, fingerprint, &key);
                }
                Some(fingerprint) => {
                    put_varint(&mut b, order);
                    put_varint(&mut b, fingerprint);
                }
            }
            w.put(&b)?;
        }
        Ok(())
    }

    /// The key of local line i, which the store must hold (every key of the memory store;
    /// the compact store's from the window start on).
    fn held_key(
        &self,
        set: &LineStore,
        i: usize,
        buf: &mut SparseNumerators,
    ) -> std::io::Result<KeyNumbers> {
        match self.fetch(set, i, buf) {
            Ok(Fetched::Small) => Ok(KeyNumbers::Small(buf.dense.clone())),
            Ok(Fetched::Big(b)) => Ok(KeyNumbers::Big(b.into_owned())),
            Ok(Fetched::NotHeld) => Err(std::io::Error::other(format!(
                "the key of local line {i} is past the window"
            ))),
            Err(e) => Err(std::io::Error::other(e.to_string())),
        }
    }

    fn header(&self) -> [u32; 4] {
        [
            self.generators.conductor(),
            self.generators.dimension() as u32,
            self.kernel.degree() as u32,
            self.generators.operators().len() as u32,
        ]
    }

    /// Read rank `rank`'s checkpoint of a job of `ranks` ranks (its lines go straight
    /// into the store).
    pub(crate) fn read_rank_checkpoint(
        &self,
        path: &Path,
        ranks: usize,
        rank: usize,
    ) -> Result<DistributedOrbit, OrbitError> {
        let (mut head, built) = self.read_rank_file(
            path,
            |head| StoreBuilder::new(self, head.compact.is_some()),
            |builder, line| builder.push(line),
        )?;
        if (head.ranks, head.rank) != (ranks, rank) {
            return Err(error(
                path,
                format!(
                    "written by rank {} of {}, read as rank {rank} of {ranks}",
                    head.rank, head.ranks
                ),
            ));
        }
        let compact = match head.compact.take() {
            Some(section) => {
                let directory =
                    RecordDirectory::from_records(rank, ranks, section.records, head.total)
                        .map_err(|e| error(path, e))?;
                let sums = section.part.and_then(|b| LayerSums::resumed(self, b));
                Some(CompactShare { directory, sums })
            }
            None => None,
        };
        Ok(DistributedOrbit {
            local: Orbit {
                set: built.set,
                processed: head.processed,
                layer_ends: head.local_ends,
                stop: None,
                compute_seconds: head.compute_seconds,
            },
            global: built.global,
            layer_ends: head.layer_ends,
            total: head.total,
            ranks,
            saturated: false,
            stop: None,
            compact,
        })
    }

    /// This rank's share, among `ranks` ranks, of the state checkpointed by a job of
    /// `old_ranks` ranks in `base.rank0` … : every old file is read, the lines that this
    /// rank now owns are kept (their keys packed) and stored in order of their global
    /// indices, and the local layer ends and frontier start follow from those indices (the
    /// frontier is the last finished layer, and a local line lies in a layer exactly when
    /// its global index does). With the compact store the rank also keeps the records of
    /// the indices it now holds, and rank 0 the sum of every old part of B.
    pub(crate) fn read_regrouped_checkpoints(
        &self,
        base: &Path,
        newest: bool,
        old_ranks: usize,
        ranks: usize,
        rank: usize,
    ) -> Result<DistributedOrbit, OrbitError> {
        let mut kept: Vec<KeptLine> = Vec::new();
        let mut keys = KeyArena::new(self.dimension(), self.kernel.degree());
        let mut records = Vec::new();
        let mut parts = Vec::new();
        let mut keys_from = 0;
        let mut first: Option<RankHeader> = None;
        for r in 0..old_ranks {
            let path = rank_file(base, r, newest);
            let (mut head, ()) = self.read_rank_file(
                &path,
                |_| (),
                |(), line| {
                    if owner(line.fingerprint, ranks) == rank {
                        let key = line.key.map(|k| {
                            keys.push(k);
                            keys.len() as u32 - 1
                        });
                        kept.push(KeptLine {
                            index: line.index,
                            key,
                            fingerprint: line.fingerprint,
                            parent: line.parent,
                            generator: line.generator,
                            layer: line.layer as u32,
                        });
                    }
                    Ok(())
                },
            )?;
            if (head.ranks, head.rank) != (old_ranks, r) {
                return Err(error(
                    &path,
                    format!(
                        "written by rank {} of {}, expected rank {r} of {old_ranks}",
                        head.rank, head.ranks
                    ),
                ));
            }
            if let Some(section) = head.compact.take() {
                keys_from = keys_from.max(section.window_start);
                records.extend(
                    section
                        .records
                        .into_iter()
                        .filter(|&(index, ..)| index as usize % ranks == rank),
                );
                parts.push(section.part);
            }
            match &first {
                None => first = Some(head),
                Some(f) if (f.total, &f.layer_ends) != (head.total, &head.layer_ends) => {
                    return Err(error(
                        &path,
                        "written at another layer than the other ranks' files (a job killed \
                         while writing them); no common state to resume from",
                    ));
                }
                Some(_) => {}
            }
        }
        let first = first.ok_or_else(|| error(base, "no rank files (0 ranks)"))?;
        if !parts.is_empty() && parts.len() != old_ranks {
            return Err(error(
                base,
                "the rank files were written by runs in different stores",
            ));
        }
        kept.sort_unstable_by_key(|line| line.index);
        let mut builder = StoreBuilder::new(self, !parts.is_empty());
        for line in &kept {
            // keys from the largest window start of the files on: a suffix of the lines
            let key = line
                .key
                .filter(|_| line.index as usize >= keys_from)
                .map(|j| keys.key(j as usize));
            builder
                .push(LineRead {
                    index: line.index,
                    key: key.as_ref(),
                    fingerprint: line.fingerprint,
                    parent: line.parent,
                    generator: line.generator,
                    layer: line.layer as usize,
                })
                .map_err(|e| error(base, e))?;
        }
        drop(keys);
        let compact = match parts.is_empty() {
            true => None,
            false => {
                let directory = RecordDirectory::from_records(rank, ranks, records, first.total)
                    .map_err(|e| error(base, e))?;
                Some(CompactShare {
                    directory,
                    sums: self.regrouped_sums(parts, rank)?,
                })
            }
        };
        let mut orbit = share(
            builder.set,
            builder.global,
            first.layer_ends,
            first.total,
            first.compute_seconds,
            ranks,
        );
        orbit.compact = compact;
        Ok(orbit)
    }

    /// The part of B of new rank `rank` after regrouping: rank 0 takes the sum of the old
    /// parts (B is exact, so where its terms are counted does not matter), the others zero;
    /// `None` when the problem has no sum.
    fn regrouped_sums(
        &self,
        parts: Vec<Option<Matrix>>,
        rank: usize,
    ) -> Result<Option<LayerSums>, OrbitError> {
        let Some(mut sums) = LayerSums::new(self) else {
            return Ok(None);
        };
        if rank == 0 {
            for part in parts {
                let part = part.ok_or_else(|| {
                    OrbitError::Invalid("a rank file holds no part of B where others do".into())
                })?;
                sums.add_part(&self.field, &part)?;
            }
        }
        Ok(Some(sums))
    }

    /// This rank's share, among `ranks` ranks, of the one-process checkpoint at `path`
    /// (memory store): a line's global index is its index there. The frontier becomes the
    /// whole last layer again; the lines of the next layer already found are the first of it
    /// in order-key order (their parents precede the unprocessed ones), so expanding the
    /// frontier again finds them known and numbers the others after them.
    pub(crate) fn read_single_checkpoint_as_rank(
        &self,
        path: &Path,
        ranks: usize,
        rank: usize,
    ) -> Result<DistributedOrbit, OrbitError> {
        let single = self.read_checkpoint(path)?;
        let LineStore::Memory(store) = &single.set else {
            return Err(error(
                path,
                "a one-process checkpoint of the compact store cannot be continued under MPI \
                 (a distributed run keeps every exact key); continue it in one process",
            ));
        };
        let mut set = LineStore::new(StoreKind::Memory, self.dimension(), self.kernel.degree());
        let mut global = Vec::new();
        for i in 0..single.set.len() {
            let key = store.keys.key(i);
            let fingerprint = self.key_fingerprint(&key, false);
            if owner(fingerprint, ranks) == rank {
                set.insert(&key, fingerprint, store.parents[i], store.generators[i]);
                global.push(i as u32);
            }
        }
        Ok(share(
            set,
            global,
            single.layer_ends,
            single.set.len(),
            single.compute_seconds,
            ranks,
        ))
    }

    /// Check and read the rank file at `path`: its header, from which `start` makes the
    /// reader's state, then each line handed to `line` with that state, in file order.
    fn read_rank_file<T>(
        &self,
        path: &Path,
        start: impl FnOnce(&RankHeader) -> T,
        mut line: impl FnMut(&mut T, LineRead<'_>) -> Result<(), String>,
    ) -> Result<(RankHeader, T), OrbitError> {
        let bytes = checked_bytes(path)?;
        let mut f = Fields {
            bytes: &bytes,
            at: 0,
        };
        let head = self.read_rank_header(&mut f).map_err(|e| error(path, e))?;
        let mut state = start(&head);
        self.read_rank_lines(&mut f, &head, |l| line(&mut state, l))
            .map_err(|e| error(path, e))?;
        Ok((head, state))
    }

    fn read_rank_header(&self, f: &mut Fields<'_>) -> Result<RankHeader, String> {
        let (version, _) = read_origin(f)?;
        let header = [f.u32()?, f.u32()?, f.u32()?, f.u32()?];
        if header != self.header() {
            return Err(format!(
                "written for another problem (conductor, dimension, degree, generators {header:?})"
            ));
        }
        let hash = u128::from_le_bytes(f.take(16)?.try_into().expect("16 bytes"));
        if hash != self.content_hash() {
            return Err("written for other generators or another seed".into());
        }
        let (ranks, rank) = (f.u32()? as usize, f.u32()? as usize);
        if ranks == 0 || rank >= ranks {
            return Err(format!("rank {rank} of {ranks} is out of range"));
        }
        let total = f.count(u64::from(u32::MAX), "line count")?;
        // a layer holds a line at least
        let layer_ends = f.ends(total, total, "global layer ends")?;
        let n = f.count(total as u64, "local line count")?;
        let processed = f.count(n as u64, "frontier start")?;
        // one end per global layer, though a rank may hold no line of some
        let local_ends = f.ends(layer_ends.len(), n, "local layer ends")?;
        if local_ends.last().is_some_and(|&e| e > n) || local_ends.last() < Some(&processed) {
            return Err("the frontier lies outside the local layers".into());
        }
        let compute_seconds = f64::from_bits(f.u64()?);
        let compact = match version {
            VERSION_COMPACT => Some(self.read_compact_section(f, rank, ranks, total)?),
            _ => None,
        };
        Ok(RankHeader {
            ranks,
            rank,
            total,
            lines: n,
            layer_ends,
            processed,
            local_ends,
            compute_seconds,
            compact,
        })
    }

    /// The lines after the header, each checked (index growing, record pointing back, owned
    /// by the file's rank, a held key matching its fingerprint) and handed to `line_at`.
    fn read_rank_lines(
        &self,
        f: &mut Fields<'_>,
        head: &RankHeader,
        mut line_at: impl FnMut(LineRead<'_>) -> Result<(), String>,
    ) -> Result<(), String> {
        let (n, total, rank, ranks) = (head.lines, head.total, head.rank, head.ranks);
        let compact = head.compact.is_some();
        // keys are held from here on (every key in a memory-store file)
        let keys_from = head.compact.as_ref().map_or(0, |c| c.window_start);
        let generators = self.generators.operators().len() as u64;
        let mut reader = Reader::new(&f.bytes[f.at..], self.key_len(), format!("rank {rank}"));
        let mut last: Option<u64> = None;
        for i in 0..n {
            let index = reader.varint().map_err(|e| e.to_string())?;
            let (order, fingerprint, key) = if index >= keys_from as u64 {
                let line = reader
                    .next_candidate()
                    .map_err(|e| e.to_string())?
                    .ok_or_else(|| format!("{n} lines announced, {i} found"))?;
                let fingerprint = self.key_fingerprint(&line.key, compact);
                if compact && fingerprint != line.fingerprint {
                    return Err(format!("line {i}: its fingerprint is not its key's"));
                }
                (line.order, fingerprint, Some(line.key))
            } else {
                let order = reader.varint().map_err(|e| e.to_string())?;
                let fingerprint = reader.varint().map_err(|e| e.to_string())?;
                (order, fingerprint, None)
            };
            let (parent, generator) = (order >> 16, order & 0xffff);
            let seed = index == 0 && parent == u64::from(u32::MAX) && generator == 0xffff;
            let grows = last.map_or(true, |last| index > last);
            if index >= total as u64
                || !grows
                || !(seed || parent < index && generator < generators)
            {
                return Err(format!(
                    "line {i}: bad index {index} or record ({parent}, {generator})"
                ));
            }
            if owner(fingerprint, ranks) != rank {
                return Err(format!("line {i} belongs to another rank"));
            }
            line_at(LineRead {
                index: index as u32,
                key: key.as_ref(),
                fingerprint,
                parent: parent as u32,
                generator: generator as u16,
                layer: head.layer_ends.partition_point(|&e| e <= index as usize),
            })?;
            last = Some(index);
        }
        if !reader.at_end() {
            return Err("unexpected bytes after the lines".into());
        }
        Ok(())
    }

    /// The compact file's section before its lines: window start, part of B, records.
    fn read_compact_section(
        &self,
        f: &mut Fields<'_>,
        rank: usize,
        ranks: usize,
        total: usize,
    ) -> Result<CompactSection, String> {
        let window_start = f.count(total as u64, "window start")?;
        let part = match f.take(1)?[0] {
            0 => None,
            1 => {
                let len = f.count(f.bytes.len() as u64, "length of B's part")?;
                let entries: Vec<String> = serde_json::from_slice(f.take(len)?)
                    .map_err(|e| format!("B's part is not a list of entries: {e}"))?;
                Some(
                    self.matrix_from_text(&entries, rank)
                        .map_err(|e| e.to_string())?,
                )
            }
            flag => return Err(format!("B's part has flag {flag}")),
        };
        let count = f.count(total as u64, "record count")?;
        let mut records = Vec::with_capacity(count);
        for at in 0..count {
            let parent = f.u32()?;
            let generator = f.take(1)?[0];
            records.push(((rank + ranks * at) as u32, parent, generator));
        }
        Ok(CompactSection {
            window_start,
            part,
            records,
        })
    }
}

/// A rank's state from its lines (`set`, with their increasing global indices `global`)
/// and the global figures: its local layer ends and frontier start are the numbers of its
/// lines below each global layer end and below the frontier's global start (the start of
/// the last finished layer), since a local line lies in a layer exactly when its global
/// index does.
fn share(
    set: LineStore,
    global: Vec<u32>,
    layer_ends: Vec<usize>,
    total: usize,
    compute_seconds: f64,
    ranks: usize,
) -> DistributedOrbit {
    let below = |end: usize| global.partition_point(|&g| (g as usize) < end);
    let local_ends: Vec<usize> = layer_ends.iter().map(|&e| below(e)).collect();
    let frontier = match layer_ends.as_slice() {
        [.., before, _] => *before,
        _ => 0,
    };
    let processed = below(frontier);
    DistributedOrbit {
        local: Orbit {
            set,
            processed,
            layer_ends: local_ends,
            stop: None,
            compute_seconds,
        },
        global,
        layer_ends,
        total,
        ranks,
        saturated: false,
        stop: None,
        // rank checkpoints hold the memory store
        compact: None,
    }
}

/// A line kept while regrouping: its key (when the file held it) is in an arena of packed
/// keys, at position `key`.
struct KeptLine {
    index: u32,
    key: Option<u32>,
    fingerprint: u64,
    parent: u32,
    generator: u16,
    layer: u32,
}

/// A rank's store built from its lines in increasing global index: the memory store, or
/// the compact one (records global; the lines with keys, a suffix, fill the window, one
/// window layer per global layer; the lines before them keep no key).
struct StoreBuilder {
    set: LineStore,
    global: Vec<u32>,
    /// The global layer of the window layer being filled.
    layer: Option<usize>,
}

impl StoreBuilder {
    fn new(problem: &OrbitProblem, compact: bool) -> StoreBuilder {
        let kind = if compact {
            StoreKind::Compact
        } else {
            StoreKind::Memory
        };
        StoreBuilder {
            set: LineStore::new(kind, problem.dimension(), problem.kernel.degree())
                .with_global_parents(),
            global: Vec::new(),
            layer: None,
        }
    }

    fn push(&mut self, line: LineRead<'_>) -> Result<(), String> {
        match line.key {
            Some(key) => {
                if self.layer != Some(line.layer) {
                    self.set
                        .open_layer(self.set.len())
                        .map_err(|e| e.to_string())?;
                    self.layer = Some(line.layer);
                }
                self.set
                    .insert(key, line.fingerprint, line.parent, line.generator);
            }
            None => self
                .set
                .insert_record(line.fingerprint, line.parent, line.generator)
                .map_err(|e| e.to_string())?,
        }
        reserve_gently(&mut self.global);
        self.global.push(line.index);
        Ok(())
    }
}

/// One line of a rank file as it is read.
struct LineRead<'a> {
    index: u32,
    /// The key, when the file holds it.
    key: Option<&'a KeyNumbers>,
    fingerprint: u64,
    parent: u32,
    generator: u16,
    /// The global layer of the line (the number of finished layers for a layer cut by the
    /// line limit).
    layer: usize,
}

/// The fixed fields of a rank file.
struct RankHeader {
    ranks: usize,
    rank: usize,
    total: usize,
    /// This rank's lines.
    lines: usize,
    layer_ends: Vec<usize>,
    processed: usize,
    local_ends: Vec<usize>,
    compute_seconds: f64,
    /// Present in a compact file.
    compact: Option<CompactSection>,
}

/// What a compact rank file holds besides its lines.
struct CompactSection {
    /// The first global index whose key the file holds.
    window_start: usize,
    /// The rank's part of B (`None` when the problem has no Poincaré sum).
    part: Option<Matrix>,
    /// The rank's share of the record directory: (global index, parent, generator).
    records: Vec<(u32, u32, u8)>,
}

/// The number of ranks of the job that wrote rank file `path`.
pub(crate) fn rank_checkpoint_ranks(path: &Path) -> Result<usize, OrbitError> {
    let bytes = checked_bytes(path)?;
    let mut f = Fields {
        bytes: &bytes,
        at: 0,
    };
    let ranks = (|| -> Result<usize, String> {
        read_origin(&mut f)?;
        f.take(4 * 4 + 16)?;
        Ok(f.u32()? as usize)
    })();
    ranks.map_err(|e| error(path, e))
}
