//! The stable data hash: SHA-256 of the compact JSON text of the file format's data keys
//! (object keys sorted, numbers in the canonical field syntax), without the name.

use crate::digest::Sha256;
use crate::file::data_json;
use crate::theory::Theory;

/// SHA-256 (hex) of the theory's canonical data text.
pub(crate) fn data_hash(t: &Theory) -> String {
    t.compute_all_f();
    let text = serde_json::Value::Object(data_json(t)).to_string();
    let mut h = Sha256::new();
    h.update(b"cyclorb-theory/1\n");
    h.update(text.as_bytes());
    h.finish_hex()
}
