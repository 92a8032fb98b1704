//! The envelope of every certificate file written by `--out`: what a re-check needs to rebuild
//! the input from nothing else (docs/certificates.md §1).
//!
//! The certificate's own keys are kept; the envelope adds `kind` (which claims the file
//! makes), `program` (the version that wrote it), `spec` (the theory as typed), `genus`,
//! `generating_set`, and `theory_files`: every theory file the spec read, with the SHA-256
//! hash of its data (`cyclorb verify` prints the same hash), so that `cyclorb check` reads the
//! same data or says that it did not.

use std::path::Path;

use serde::Serialize;
use serde_json::{json, Map, Value};

use cyclorb_pipeline::proof;

/// The input of a certificate: a theory spec, a genus and a generating set.
pub struct Source<'a> {
    /// The theory spec as typed.
    pub spec: &'a str,
    /// The genus.
    pub genus: usize,
    /// The generating set's name.
    pub set: &'a str,
}

/// The program that writes (and re-checks) certificates.
pub fn program() -> String {
    format!("cyclorb {}", env!("CARGO_PKG_VERSION"))
}

/// The theory files read by this process as the `theory_files` value.
pub fn theory_files() -> Value {
    Value::Array(
        proof::files_read()
            .into_iter()
            .map(|(path, hash)| json!({"path": path, "data_hash": hash}))
            .collect(),
    )
}

/// `certificate` (a JSON object once serialised) with the envelope keys added.
pub fn wrap<T: Serialize>(kind: &str, source: &Source, certificate: &T) -> Value {
    let mut body = match serde_json::to_value(certificate).expect("certificates serialise") {
        Value::Object(map) => map,
        other => {
            let mut map = Map::new();
            map.insert("certificate".into(), other);
            map
        }
    };
    body.insert("kind".into(), json!(kind));
    body.insert("program".into(), json!(program()));
    body.insert("spec".into(), json!(source.spec));
    body.insert("genus".into(), json!(source.genus));
    body.insert("generating_set".into(), json!(source.set));
    body.insert("theory_files".into(), theory_files());
    Value::Object(body)
}

/// Write the wrapped certificate to `path` (nothing when `None`); the error names the file.
pub fn write<T: Serialize>(
    path: Option<&Path>,
    kind: &str,
    source: &Source,
    certificate: &T,
) -> Result<(), String> {
    let Some(path) = path else {
        return Ok(());
    };
    let text = serde_json::to_string_pretty(&wrap(kind, source, certificate))
        .expect("JSON values serialise");
    std::fs::write(path, text).map_err(|e| format!("{}: {e}", path.display()))
}
