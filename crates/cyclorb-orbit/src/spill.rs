//! Keys in files: the compact store's window on disk (`--spill DIR`).
//!
//! Each layer's packed keys (the encoding of the `store` module) go to a file of their own
//! in the chosen directory as the layer is built: they are appended in blocks of
//! [`crate::store::STREAM_BUFFER`] bytes, and only the offsets (4 bytes per key) and the
//! block not yet written stay in memory. A key is read back with one positioned read (the
//! operating system's page cache serves most of them; its pages are not the process's
//! resident memory). The file is removed when its layer leaves the window (or the store is
//! dropped). Nothing on disk is trusted beyond the run that wrote it: the files are private
//! scratch space, and a checkpoint never refers to them.

use std::fs::{File, OpenOptions};
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
    /// A new empty file in `dir`.
    pub(crate) fn create(dir: &Path) -> std::io::Result<SpillFile> {
        let n = NEXT.fetch_add(1, Ordering::Relaxed);
        let path = dir.join(format!("cyclorb-keys-{}-{n}.bin", std::process::id()));
        let file = OpenOptions::new()
            .read(true)
            .write(true)
            .create_new(true)
            .open(&path)
            .map_err(|e| named(&path, e))?;
        Ok(SpillFile { path, file, len: 0 })
    }

    /// Append `bytes` at the end of the file.
    pub(crate) fn append(&mut self, bytes: &[u8]) -> std::io::Result<()> {
        self.file
            .write_all_at(bytes, self.len)
            .map_err(|e| named(&self.path, e))?;
        self.len += bytes.len() as u64;
        Ok(())
    }

    /// The bytes `range` of the file into `buf`.
    pub(crate) fn read(&self, start: usize, end: usize, buf: &mut Vec<u8>) -> std::io::Result<()> {
        buf.clear();
        buf.resize(end - start, 0);
        self.file
            .read_exact_at(buf, start as u64)
            .map_err(|e| named(&self.path, e))
    }
}

/// An I/O error that names the file.
fn named(path: &Path, e: std::io::Error) -> std::io::Error {
    std::io::Error::new(e.kind(), format!("{}: {e}", path.display()))
}

impl Drop for SpillFile {
    fn drop(&mut self) {
        // scratch space: a file that cannot be removed is left behind, nothing else fails
        let _ = std::fs::remove_file(&self.path);
    }
}
