//! Shared helpers of the CLI integration tests: run the binary, read its JSON.

#![allow(dead_code)]

use std::path::PathBuf;
use std::process::{Command, Output};

use serde_json::Value;

/// The cache folder the tests give the binary (`XDG_CACHE_HOME`), one per test process, so
/// that proofs remembered by one run of the suite never serve another.
pub fn test_cache() -> PathBuf {
    temp_path("cache")
}

/// `cyclorb` as a command with the test cache set.
pub fn command() -> Command {
    let mut c = Command::new(env!("CARGO_BIN_EXE_cyclorb"));
    c.env("XDG_CACHE_HOME", test_cache());
    c
}

/// Run `cyclorb ARGS` and capture everything.
pub fn cyclorb(args: &[&str]) -> Output {
    command().args(args).output().expect("the binary runs")
}

/// Run `cyclorb ARGS --json`, returning the exit code and the single JSON object on stdout.
pub fn cyclorb_json(args: &[&str]) -> (i32, Value) {
    let mut all: Vec<&str> = args.to_vec();
    all.push("--json");
    let out = cyclorb(&all);
    let value = serde_json::from_slice(&out.stdout).unwrap_or_else(|e| {
        panic!(
            "stdout of {args:?} is not one JSON object ({e}):\n{}\nstderr:\n{}",
            String::from_utf8_lossy(&out.stdout),
            String::from_utf8_lossy(&out.stderr)
        )
    });
    (out.status.code().unwrap_or(-1), value)
}

/// A fresh path in the temporary directory, unique to this process and tag.
pub fn temp_path(tag: &str) -> PathBuf {
    std::env::temp_dir().join(format!("cyclorb-test-{}-{tag}", std::process::id()))
}

/// A path under the repository's fixtures/ folder.
pub fn fixture(rel: &str) -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
        .join("fixtures")
        .join(rel)
}
