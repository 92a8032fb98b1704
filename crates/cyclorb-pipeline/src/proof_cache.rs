//! The machine's record of theory files already proved: one entry per data hash under
//! `$XDG_CACHE_HOME/cyclorb/verified/` (default `~/.cache/cyclorb/verified/`).
//!
//! An entry is trusted only when its seal holds: SHA-256 over a secret key, the data hash,
//! the program version and the list of checks. The key (32 bytes from the system's random
//! source) is created once, readable by its owner only, next to the entries. An entry that
//! was edited, copied from another machine or written by another program version does not
//! match and the file is simply verified again. The seal protects against accidents and
//! against anyone who cannot read the key; whoever can read the key can also replace the
//! program. Any failure of the cache (no home, a read-only disk) only means re-verifying:
//! it never refuses work and never counts as a proof.

use std::fs;
use std::io::{Read, Write};
use std::path::PathBuf;

use cyclorb_theory::{CheckId, Sha256};
use serde_json::{json, Value};

const KEY_FILE: &str = "seal-key";

fn cache_root() -> Option<PathBuf> {
    let base = std::env::var_os("XDG_CACHE_HOME")
        .filter(|v| !v.is_empty())
        .map(PathBuf::from)
        .or_else(|| std::env::var_os("HOME").map(|h| PathBuf::from(h).join(".cache")))?;
    Some(base.join("cyclorb"))
}

/// The secret key, created on first use (owner-only permissions).
fn key(root: &PathBuf) -> Option<Vec<u8>> {
    let path = root.join(KEY_FILE);
    if let Ok(bytes) = fs::read(&path) {
        return (bytes.len() == 32).then_some(bytes);
    }
    fs::create_dir_all(root).ok()?;
    let mut bytes = vec![0u8; 32];
    fs::File::open("/dev/urandom")
        .ok()?
        .read_exact(&mut bytes)
        .ok()?;
    let mut options = fs::OpenOptions::new();
    options.write(true).create_new(true);
    #[cfg(unix)]
    {
        use std::os::unix::fs::OpenOptionsExt;
        options.mode(0o600);
    }
    let mut file = options.open(&path).ok()?;
    file.write_all(&bytes).ok()?;
    Some(bytes)
}

fn checks() -> Vec<&'static str> {
    CheckId::ALL.iter().map(|c| c.name()).collect()
}

fn seal(key: &[u8], hash: &str) -> String {
    let mut h = Sha256::new();
    h.update(key);
    h.update(b"\ncyclorb proof cache 1\n");
    h.update(hash.as_bytes());
    h.update(b"\n");
    h.update(env!("CARGO_PKG_VERSION").as_bytes());
    h.update(b"\n");
    h.update(checks().join(",").as_bytes());
    h.finish_hex()
}

fn is_hash(text: &str) -> bool {
    text.len() == 64 && text.bytes().all(|b| b.is_ascii_hexdigit())
}

fn entry(root: &std::path::Path, hash: &str) -> PathBuf {
    root.join("verified").join(format!("{hash}.json"))
}

/// Whether the data hash has a sealed entry: a theory with this hash passed every check.
pub fn is_proved(hash: &str) -> bool {
    let Some(root) = cache_root() else {
        return false;
    };
    if !is_hash(hash) {
        return false;
    }
    let Some(key) = key(&root) else {
        return false;
    };
    let Ok(text) = fs::read_to_string(entry(&root, hash)) else {
        return false;
    };
    let Ok(value) = serde_json::from_str::<Value>(&text) else {
        return false;
    };
    value.get("data_hash").and_then(Value::as_str) == Some(hash)
        && value.get("seal").and_then(Value::as_str) == Some(seal(&key, hash).as_str())
}

/// Record that the theory with this data hash passed every check (best effort).
pub fn remember(hash: &str) {
    let Some(root) = cache_root() else {
        return;
    };
    if !is_hash(hash) {
        return;
    }
    let Some(key) = key(&root) else {
        return;
    };
    let path = entry(&root, hash);
    let Some(dir) = path.parent() else {
        return;
    };
    if fs::create_dir_all(dir).is_err() {
        return;
    }
    let value = json!({
        "data_hash": hash,
        "program": format!("cyclorb {}", env!("CARGO_PKG_VERSION")),
        "checks": checks(),
        "seal": seal(&key, hash),
    });
    let temp = path.with_extension(format!("tmp{}", std::process::id()));
    if fs::write(&temp, value.to_string()).is_ok() && fs::rename(&temp, &path).is_err() {
        fs::remove_file(&temp).ok();
    }
}
