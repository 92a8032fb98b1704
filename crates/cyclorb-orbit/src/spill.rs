//! Keys of finished layers in files: the compact store's window on disk (`--spill DIR`).
//!
//! A layer's packed keys (the encoding of the `store` module) are written once, when the
//! layer is finished and becomes the frontier, to a file of their own in the chosen
//! directory; the offsets stay in memory (4 bytes per key) and a key is read back with one
//! positioned read. The file is removed when its layer leaves the window (or the store is
//! dropped). Nothing on disk is trusted beyond the run that wrote it: the files are private
//! scratch space, and a checkpoint never refers to them.

use std::fs::{File, OpenOptions};
use std::io::Write;
use std::os::unix::fs::FileExt;
use std::path::{Path, PathBuf};
use std::sync::atomic::{AtomicU64, Ordering};

/// One layer's keys on disk; the file is removed on drop.
#[derive(Debug)]
pub(crate) struct SpillFile {
    path: PathBuf,
    file: File,
    len: u64,
}

/// Distinguishes the files of one process.
static NEXT: AtomicU64 = AtomicU64::new(0);

impl SpillFile {
    /// Write `bytes` to a new file in `dir`.
    pub(crate) fn write(dir: &Path, bytes: &[u8]) -> std::io::Result<SpillFile> {
        let n = NEXT.fetch_add(1, Ordering::Relaxed);
        let path = dir.join(format!("cyclorb-keys-{}-{n}.bin", std::process::id()));
        let named =
            |e: std::io::Error| std::io::Error::new(e.kind(), format!("{}: {e}", path.display()));
        let mut file = OpenOptions::new()
            .read(true)
            .write(true)
            .create_new(true)
            .open(&path)
            .map_err(named)?;
        let written = file
            .write_all(bytes)
            .and_then(|_| file.flush())
            .map_err(named);
        let spilled = SpillFile {
            path,
            file,
            len: bytes.len() as u64,
        };
        written.map(|_| spilled)
    }

    /// Bytes in the file.
    pub(crate) fn len(&self) -> usize {
        self.len as usize
    }

    /// The bytes `range` of the file into `buf`.
    pub(crate) fn read(&self, start: usize, end: usize, buf: &mut Vec<u8>) -> std::io::Result<()> {
        buf.clear();
        buf.resize(end - start, 0);
        self.file.read_exact_at(buf, start as u64)
    }

    /// The file's path (for error messages).
    pub(crate) fn path(&self) -> &Path {
        &self.path
    }
}

impl Drop for SpillFile {
    fn drop(&mut self) {
        // scratch space: a file that cannot be removed is left behind, nothing else fails
        let _ = std::fs::remove_file(&self.path);
    }
}
