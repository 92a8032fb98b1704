//! The envelope of every certificate file: what a re-check ([`crate::check`]) needs to
//! rebuild the input from nothing else (docs/certificates.md §1).
//!
//! The certificate's own keys are kept; the envelope adds `kind` (which claims the file
//! makes), `program` (the version that wrote it), `spec` (the theory as typed), `genus`,
//! `generating_set`, and `theory_files`: every theory file the spec read, with the SHA-256
//! hash of its data (`cyclorb verify` prints the same hash), so that a re-check reads the
//! same data or says that it did not.

use serde::Serialize;
use serde_json::{json, Map, Value};

/// The input of a certificate: a theory spec, a genus and a generating set.
pub struct Source<'a> {
    /// The theory spec as typed.
    pub spec: &'a str,
    /// The genus.
    pub genus: usize,
    /// The generating set's name.
    pub set: &'a str,
}

/// The program that writes (and re-checks) certificates, with its version.
pub fn program() -> String {
    format!("cyclorb {}", env!("CARGO_PKG_VERSION"))
}

/// `certificate` (a JSON object once serialised) with the envelope keys added;
/// `theory_files` are the (path, data hash) pairs the spec read (`proof::theory_traced`).
pub fn wrap<T: Serialize>(
    kind: &str,
    source: &Source,
    certificate: &T,
    theory_files: &[(String, String)],
) -> Value {
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
    let files = theory_files
        .iter()
        .map(|(path, hash)| json!({"path": path, "data_hash": hash}))
        .collect();
    body.insert("theory_files".into(), Value::Array(files));
    Value::Object(body)
}
