//! Writing a certificate file for `--out`: the pipeline's `envelope::wrap` with the theory
//! files this process read (docs/certificates.md §1).

use std::path::Path;

use serde::Serialize;

use cyclorb_pipeline::envelope::wrap;
pub use cyclorb_pipeline::envelope::{program, Source};
use cyclorb_pipeline::proof;

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
    let wrapped = wrap(kind, source, certificate, &proof::files_read());
    let text = serde_json::to_string_pretty(&wrapped).expect("JSON values serialise");
    std::fs::write(path, text).map_err(|e| format!("{}: {e}", path.display()))
}
