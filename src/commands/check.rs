//! `cyclorb check FILE`: re-derive every claim of a certificate written by `--out` from the
//! theory, genus and generating set its envelope names (`envelope`), each by a computation
//! other than the producer's where one exists (docs/certificates.md). The theory is read
//! through the verified-theory path (`proof`), so an unproved theory file is refused unless
//! `--unverified` is given, and the answer then says `verified: false`.
//!
//! Claims are checked in order and the first that fails ends the check (exit 1); every claim
//! says in its detail how it was re-derived, and names the producer's own derivation where
//! nothing simpler re-derives it.

use std::path::Path;

use cyclorb_field::UniqueKeys;
use serde::de::DeserializeOwned;
use serde_json::{json, Value};

use super::certify::load;
use super::envelope;
use super::output::{Outcome, Report};
use crate::cli::{CertArgs, CheckArgs, SpaceArgs};

mod claims;
mod commutant;
mod dw;
mod dw_count;
mod dw_monomial;
mod dw_pairs;
mod image;
mod imprimitive;
mod linear;
mod poly;
mod structure;
mod witness;

pub(crate) use claims::{Claims, Stop};

/// The envelope of a certificate file: kind, program, theory spec, genus, generating set.
pub(crate) struct Envelope {
    /// Which claims the file makes.
    pub kind: String,
    /// The program that wrote it.
    pub program: String,
    /// Theory, genus and generating set, as the producing command read them.
    pub space: SpaceArgs,
    /// The theory files' (path, data hash), as recorded.
    pub theory_files: Vec<(String, String)>,
}

/// The kinds `cyclorb check` reads.
const KINDS: &str =
    "commutant, image-enumeration, image-orbit, structure, structure-imprimitive, witness, witness-lifted, \
                     dw-permutation-image, dw-orbitals, dw-monomial-image, dw-monomial-commutant, \
                     dw-vacuum-set-stabiliser";

fn key<'a>(body: &'a Value, name: &str, file: &str) -> Result<&'a Value, String> {
    body.get(name).ok_or_else(|| {
        format!(
            "{file}: key `{name}`: missing (a certificate written by `--out` of this version \
             carries it; an older file must be written again)"
        )
    })
}

fn text_key(body: &Value, name: &str, file: &str) -> Result<String, String> {
    key(body, name, file)?
        .as_str()
        .map(str::to_string)
        .ok_or_else(|| format!("{file}: key `{name}`: expected a string"))
}

/// Read the envelope keys.
fn envelope_of(body: &Value, file: &str) -> Result<Envelope, String> {
    let genus = key(body, "genus", file)?
        .as_u64()
        .and_then(|g| usize::try_from(g).ok())
        .ok_or_else(|| format!("{file}: key `genus`: expected a non-negative integer"))?;
    let files = key(body, "theory_files", file)?
        .as_array()
        .ok_or_else(|| format!("{file}: key `theory_files`: expected a list"))?;
    let mut theory_files = Vec::with_capacity(files.len());
    for (k, entry) in files.iter().enumerate() {
        let place = format!("{file}: key `theory_files`, entry {k}");
        let path = entry["path"].as_str();
        let hash = entry["data_hash"].as_str();
        match (path, hash) {
            (Some(p), Some(h)) => theory_files.push((p.to_string(), h.to_string())),
            _ => return Err(format!("{place}: expected `path` and `data_hash` strings")),
        }
    }
    Ok(Envelope {
        kind: text_key(body, "kind", file)?,
        program: text_key(body, "program", file)?,
        space: SpaceArgs {
            spec: text_key(body, "spec", file)?,
            genus,
            set: text_key(body, "generating_set", file)?,
        },
        theory_files,
    })
}

/// The certificate body as the producer's type; the error names the file and serde's place.
pub(crate) fn body_as<T: DeserializeOwned>(
    body: &Value,
    file: &str,
    kind: &str,
) -> Result<T, Stop> {
    serde_json::from_value(body.clone())
        .map_err(|e| Stop::Invalid(format!("{file}: not a valid {kind} certificate: {e}")))
}

/// The theory files read now against those the certificate records.
pub(crate) fn check_theory_files(envelope: &Envelope, claims: &mut Claims) -> Result<(), Stop> {
    let now = cyclorb_pipeline::proof::files_read();
    claims.claim("theory-files", || {
        if now == envelope.theory_files {
            Ok(if now.is_empty() {
                "no theory file: the spec names built-in theories only".into()
            } else {
                format!(
                    "{} file(s) read again with the recorded SHA-256 data hashes",
                    now.len()
                )
            })
        } else {
            Err(format!(
                "the spec now reads {:?}, the certificate records {:?}",
                now, envelope.theory_files
            ))
        }
    })
}

/// Dispatch on the kind; claims are recorded in `claims`.
fn check_kind(
    envelope: &Envelope,
    body: &Value,
    file: &str,
    claims: &mut Claims,
) -> Result<(), Stop> {
    let kind = envelope.kind.as_str();
    if kind.starts_with("dw-") {
        return dw::check(envelope, body, file, claims);
    }
    if kind == "witness-lifted" {
        return witness::lifted(envelope, &body_as(body, file, kind)?, file, claims);
    }
    if !matches!(
        kind,
        "commutant"
            | "image-enumeration"
            | "image-orbit"
            | "structure"
            | "structure-imprimitive"
            | "witness"
    ) {
        return Err(Stop::Invalid(format!(
            "{file}: key `kind`: unknown kind {kind:?} (known: {KINDS})"
        )));
    }
    let args = CertArgs {
        space: SpaceArgs {
            spec: envelope.space.spec.clone(),
            genus: envelope.space.genus,
            set: envelope.space.set.clone(),
        },
        out: None,
    };
    let (space, gens) =
        load(&args).map_err(|e| Stop::Invalid(format!("{file}: rebuilding the input: {e}")))?;
    claims.claim("input", || {
        Ok(format!(
            "{} at genus {} ({} set): dimension {}, {} generators over Q(ζ_{}), rebuilt from the spec",
            space.theory().name(),
            space.genus(),
            envelope.space.set,
            space.dimension(),
            gens.len(),
            gens.field().conductor()
        ))
    })?;
    check_theory_files(envelope, claims)?;
    match kind {
        "witness" => witness::check(&gens, &body_as(body, file, kind)?, claims),
        "commutant" => commutant::check(&gens, &body_as(body, file, kind)?, claims),
        "image-enumeration" => image::enumeration(&gens, &body_as(body, file, kind)?, claims),
        "image-orbit" => image::orbit(&space, envelope, &gens, body, file, claims),
        "structure-imprimitive" => imprimitive::check(&space, &body_as(body, file, kind)?, claims),
        _ => structure::check(&space, &gens, &body_as(body, file, kind)?, claims),
    }
}

/// Read a certificate file as JSON (a repeated key is refused).
fn read(path: &Path) -> Result<Value, String> {
    let file = path.display();
    let text = std::fs::read_to_string(path).map_err(|e| format!("{file}: {e}"))?;
    serde_json::from_str::<UniqueKeys>(&text).map_err(|e| format!("{file}: not JSON: {e}"))?;
    let body: Value = serde_json::from_str(&text).map_err(|e| format!("{file}: not JSON: {e}"))?;
    if !body.is_object() {
        return Err(format!("{file}: expected a JSON object (a certificate)"));
    }
    Ok(body)
}

/// Run `cyclorb check FILE`.
pub fn run(args: &CheckArgs, as_json: bool) -> Outcome {
    let file = args.file.display().to_string();
    let (body, envelope) = match read(&args.file).and_then(|b| {
        let e = envelope_of(&b, &file)?;
        Ok((b, e))
    }) {
        Ok(x) => x,
        Err(e) => return Outcome::Invalid(e),
    };
    let mut claims = Claims::default();
    let result = check_kind(&envelope, &body, &file, &mut claims);
    if let Err(Stop::Invalid(message)) = result {
        return Outcome::Invalid(message);
    }
    let failed = claims.failed().map(|c| c.name.clone());
    let mut text = format!(
        "certificate {file}: kind {}, written by {} (re-checked by {})\n",
        envelope.kind,
        envelope.program,
        envelope::program()
    );
    text.push_str(&claims.text());
    match &failed {
        None => text.push_str(&format!("all {} claims hold\n", claims.count())),
        Some(name) => text.push_str(&format!(
            "claim {name} FAILS: the certificate does not hold\n"
        )),
    }
    let value = json!({
        "file": file,
        "kind": envelope.kind,
        "program": envelope.program,
        "spec": envelope.space.spec,
        "genus": envelope.space.genus,
        "generating_set": envelope.space.set,
        "ok": failed.is_none(),
        "failed": failed,
        "claims": claims.json(),
    });
    let report = Report::new(value, text, as_json);
    match claims.failed() {
        None => Outcome::Done(report),
        Some(claim) => {
            // the report goes to stdout; stderr names the file, the claim and the reason
            eprintln!(
                "cyclorb: {file}: claim {} fails: {}",
                claim.name, claim.detail
            );
            Outcome::CheckFailed(report)
        }
    }
}
