//! The stored results of a sweep: `runs/<id>/result.json` (the pipeline's `RunResult`, as
//! printed with `--json`) with the SHA-256 of its bytes beside it, written through a
//! temporary file and a rename, and read back only when intact and made for the same run.

use std::path::{Path, PathBuf};

use cyclorb_pipeline::sweep::RunResult;
use cyclorb_theory::Sha256;

use crate::commands::output::add_approximations;

/// Write `text` through `path.tmp` and a rename.
pub fn write_atomically(path: &Path, text: &str) -> Result<(), String> {
    let mut tmp = path.as_os_str().to_owned();
    tmp.push(".tmp");
    std::fs::write(&tmp, text).map_err(|e| format!("{}: {e}", Path::new(&tmp).display()))?;
    std::fs::rename(&tmp, path).map_err(|e| format!("{}: {e}", path.display()))
}

/// The digest file stored beside a result: `result.json.sha256`.
fn digest_path(path: &Path) -> PathBuf {
    let mut name = path.as_os_str().to_owned();
    name.push(".sha256");
    PathBuf::from(name)
}

fn sha256_hex(bytes: &[u8]) -> String {
    let mut h = Sha256::new();
    h.update(bytes);
    h.finish_hex()
}

/// Write a finished result, then the SHA-256 of its bytes beside it (both through a
/// temporary file and a rename). A result without a matching digest is never reused.
pub fn write_result(path: &Path, result: &RunResult) -> Result<(), String> {
    // as printed with --json: exact numbers with their float approximations beside them
    let mut value = serde_json::to_value(result).map_err(|e| e.to_string())?;
    add_approximations(&mut value);
    let text = serde_json::to_string_pretty(&value).map_err(|e| e.to_string())? + "\n";
    write_atomically(path, &text)?;
    write_atomically(&digest_path(path), &(sha256_hex(text.as_bytes()) + "\n"))
}

/// What is stored for a run.
pub enum Stored {
    /// No result yet.
    Missing,
    /// A result made for another description of the run (the plan changed): recomputed
    /// without comment.
    Stale,
    /// A result that cannot be trusted (edited, corrupt, or without its digest): recomputed,
    /// and the reason said.
    Untrusted(String),
    /// The result, intact and made for this run.
    Reusable(Box<RunResult>),
}

/// The stored result at `path`, checked against its digest and `run_hash`.
pub fn finished_result(path: &Path, run_hash: &str) -> Stored {
    let Ok(bytes) = std::fs::read(path) else {
        return Stored::Missing;
    };
    let recorded = std::fs::read_to_string(digest_path(path)).unwrap_or_default();
    if recorded.trim() != sha256_hex(&bytes) {
        let why = if recorded.is_empty() {
            "has no digest file beside it"
        } else {
            "does not match its digest (edited or corrupt)"
        };
        return Stored::Untrusted(format!("{} {why}", path.display()));
    }
    match serde_json::from_slice::<RunResult>(&bytes) {
        Ok(result) if result.run_hash == run_hash => Stored::Reusable(Box::new(result)),
        Ok(_) => Stored::Stale,
        Err(e) => Stored::Untrusted(format!("{} cannot be read: {e}", path.display())),
    }
}
