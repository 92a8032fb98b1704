//! Only proved data are used: every theory read from a file is verified (all checks of
//! `cyclorb verify`) before any command builds on it, and refused with the failing check and
//! equation when a check fails. Built-in theories, and everything derived from them by
//! products, conjugates, Galois conjugates and gauge changes, are proved by the test suite and
//! are not re-verified here. A file proved once is remembered in a sealed cache entry (see
//! `proof_cache`). Raw generator sets are proved invertible.
//!
//! `--unverified` skips these proofs; the process then records that data were used without
//! proof, and every report says `verified: false` (the `verified` key in JSON, a line of
//! text). The record is process-wide because one command may read several theories (a sweep,
//! the factors of a product).

use std::sync::atomic::{AtomicBool, AtomicU8, Ordering};
use std::sync::Mutex;

use cyclorb_orbit::GeneratorSet;
use cyclorb_theory::{parse_spec_traced, verify, FileTheory, Theory};

use crate::proof_cache;

static SKIP_PROOFS: AtomicBool = AtomicBool::new(false);

/// What the answers of this process rest on: 0 no theory or generator data used yet,
/// 1 only proved data, 2 some data used without proof.
static LEDGER: AtomicU8 = AtomicU8::new(0);

/// Every theory file this process read, as (path as written, SHA-256 data hash), in
/// reading order: certificates record them so that a re-check reads the same data.
static FILES_READ: Mutex<Vec<(String, String)>> = Mutex::new(Vec::new());

/// Set once from the command line: whether `--unverified` was given.
pub fn set_unverified(skip: bool) {
    SKIP_PROOFS.store(skip, Ordering::SeqCst);
}

fn record(proved: bool) {
    let state = if proved { 1 } else { 2 };
    LEDGER.fetch_max(state, Ordering::SeqCst);
}

/// `None` when this process used no theory or generator data (nothing to say), else whether
/// every datum it used was proved.
pub fn answers_verified() -> Option<bool> {
    match LEDGER.load(Ordering::SeqCst) {
        0 => None,
        1 => Some(true),
        _ => Some(false),
    }
}

/// Read a spec and prove every theory file it reads (cached by data hash), unless
/// `--unverified` was given. Errors name the file, the failing check and its equation.
pub fn theory(spec: &str) -> Result<Theory, String> {
    theory_traced(spec).map(|(theory, _)| theory)
}

/// [`theory`], with the theory files this spec reads (path as written, SHA-256 data hash),
/// each once, in reading order: what a certificate of this spec records, whatever else the
/// process has read before.
pub fn theory_traced(spec: &str) -> Result<(Theory, Vec<(String, String)>), String> {
    let traced = parse_spec_traced(spec).map_err(|e| e.to_string())?;
    let mut files = Vec::new();
    for file in &traced.files {
        prove_file(file)?;
        let entry = (file.path.display().to_string(), file.theory.data_hash());
        if !files.contains(&entry) {
            files.push(entry.clone());
        }
        let mut read = FILES_READ.lock().unwrap_or_else(|e| e.into_inner());
        if !read.contains(&entry) {
            read.push(entry);
        }
    }
    if traced.files.is_empty() {
        record(true);
    }
    Ok((traced.theory, files))
}

/// Remember a theory whose data hash has just passed every check of `verify` (a file read
/// later with the same data is not verified again; see the sealed cache).
pub fn remember_proved(data_hash: &str) {
    proof_cache::remember(data_hash);
}

/// The theory files read so far (path, data hash), each once, in reading order.
pub fn files_read() -> Vec<(String, String)> {
    FILES_READ.lock().unwrap_or_else(|e| e.into_inner()).clone()
}

fn prove_file(file: &FileTheory) -> Result<(), String> {
    if SKIP_PROOFS.load(Ordering::SeqCst) {
        record(false);
        return Ok(());
    }
    let hash = file.theory.data_hash();
    if proof_cache::is_proved(&hash) {
        record(true);
        return Ok(());
    }
    let verification = verify(&file.theory);
    match verification.first_failure() {
        None => {
            proof_cache::remember(&hash);
            record(true);
            Ok(())
        }
        Some(check) => Err(format!(
            "theory file {} fails verification, check {}: {} fails {}; \
             `cyclorb verify {}` lists every check, --unverified uses the data anyway",
            file.path.display(),
            check.name,
            check.equation,
            check.failure.as_deref().unwrap_or("(no instance recorded)"),
            file.path.display()
        )),
    }
}

/// Prove every generator of a raw generator set invertible (exactly), unless `--unverified`
/// was given. A singular generator is refused by name.
pub fn generators(set: &GeneratorSet, file: &str) -> Result<(), String> {
    if SKIP_PROOFS.load(Ordering::SeqCst) {
        record(false);
        return Ok(());
    }
    set.prove_invertible()
        .map_err(|e| format!("generator file {file}: {e}"))?;
    record(true);
    Ok(())
}

/// Record that generators built by the program itself were proved before use: a `dw:`
/// theory's twists satisfy every relation of `twists --check` (checked exactly when the
/// space is built, see `dw::DwSpace::with_set`). `--unverified` does not skip this proof,
/// so the record is always "proved".
pub fn record_proved() {
    record(true);
}
