//! Re-checking a certificate written by `--out` (what `cyclorb check FILE` runs): every claim
//! is re-derived from the theory, genus and generating set its envelope names, each by a
//! computation other than the producer's where one exists (docs/certificates.md). The theory
//! is read through the verified-theory path ([`crate::proof`]), so an unproved theory file is
//! refused unless proofs are switched off (`proof::set_unverified`), and the process's ledger
//! then says so.
//!
//! Claims are checked in order and the first that fails ends the check; every claim says in
//! its detail how it was re-derived, and names the producer's own derivation where nothing
//! simpler re-derives it. [`check`] is the one entry: a [`Certificate`] (read from a file,
//! parsed from text or given as a JSON value) in, a serde [`CheckReport`] out; a file that is
//! not a certificate of a known kind, or whose input cannot be rebuilt, is an `Err` naming the
//! file, the place and the reason.
//!
//! ```
//! use cyclorb_pipeline::check::{check, Certificate};
//! use serde_json::json;
//!
//! // an envelope naming an unknown kind is refused with the file and the key
//! let body = json!({"kind": "nothing", "program": "p", "spec": "ising", "genus": 1,
//!                   "generating_set": "humphries", "theory_files": []});
//! let certificate = Certificate::from_value("c.json", body).unwrap();
//! let error = check(&certificate).unwrap_err();
//! assert!(error.starts_with("c.json: key `kind`: unknown kind"));
//! ```

use std::path::Path;

use cyclorb_field::UniqueKeys;
use cyclorb_mcg::BlockSpace;
use serde::de::DeserializeOwned;
use serde::{Deserialize, Serialize};
use serde_json::Value;

use crate::space::{build_space_traced, cert_generators, parse_set};
use cyclorb_cert::ProvedGenerators;

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

pub use claims::Claim;
use claims::{Claims, Stop};

/// Theory, genus and generating set, as the producing command read them.
pub(crate) struct Source {
    /// The theory spec.
    pub spec: String,
    /// The genus.
    pub genus: usize,
    /// The generating set's name.
    pub set: String,
}

/// The envelope of a certificate file: kind, program, theory spec, genus, generating set.
pub(crate) struct Envelope {
    /// Which claims the file makes.
    pub kind: String,
    /// The program that wrote it.
    pub program: String,
    /// Theory, genus and generating set, as the producing command read them.
    pub space: Source,
    /// The theory files' (path, data hash), as recorded.
    pub theory_files: Vec<(String, String)>,
}

/// A certificate to re-check: its JSON object and the name its messages give it (the file's
/// path, or a name the caller chooses for text or a value it holds).
#[derive(Clone, Debug)]
pub struct Certificate {
    name: String,
    body: Value,
}

impl Certificate {
    /// Read a certificate file (a repeated key is refused); errors name the file.
    pub fn read(path: &Path) -> Result<Certificate, String> {
        let name = path.display().to_string();
        let text = std::fs::read_to_string(path).map_err(|e| format!("{name}: {e}"))?;
        Certificate::parse(&name, &text)
    }

    /// Parse a certificate from JSON text (a repeated key is refused); `name` is what the
    /// messages call it.
    pub fn parse(name: &str, text: &str) -> Result<Certificate, String> {
        serde_json::from_str::<UniqueKeys>(text).map_err(|e| format!("{name}: not JSON: {e}"))?;
        let body: Value =
            serde_json::from_str(text).map_err(|e| format!("{name}: not JSON: {e}"))?;
        Certificate::from_value(name, body)
    }

    /// A certificate already parsed; it must be a JSON object.
    pub fn from_value(name: &str, body: Value) -> Result<Certificate, String> {
        if !body.is_object() {
            return Err(format!("{name}: expected a JSON object (a certificate)"));
        }
        Ok(Certificate {
            name: name.to_string(),
            body,
        })
    }

    /// The name the messages give the certificate.
    pub fn name(&self) -> &str {
        &self.name
    }
}

/// The outcome of a re-check: the envelope as recorded and every claim checked, in order, up
/// to the first that failed. Its JSON form is the `cyclorb check --json` object (less the
/// `verified` key the program adds).
#[derive(Clone, Debug, Serialize, Deserialize, PartialEq, Eq)]
pub struct CheckReport {
    /// The certificate's name (its file).
    pub file: String,
    /// The certificate's kind.
    pub kind: String,
    /// The program that wrote it.
    pub program: String,
    /// The theory spec it names.
    pub spec: String,
    /// Its genus.
    pub genus: usize,
    /// Its generating set.
    pub generating_set: String,
    /// Whether every claim held.
    pub ok: bool,
    /// The claim that failed, if one did (the last of `claims`).
    pub failed: Option<String>,
    /// The claims checked, in order.
    pub claims: Vec<Claim>,
}

impl CheckReport {
    /// The claim that failed, if any.
    pub fn failed_claim(&self) -> Option<&Claim> {
        self.claims.iter().find(|c| !c.ok)
    }
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
        space: Source {
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

/// The theory files the spec reads now (`proof::theory_traced`) against those the
/// certificate records.
pub(crate) fn check_theory_files(
    envelope: &Envelope,
    now: &[(String, String)],
    claims: &mut Claims,
) -> Result<(), Stop> {
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

/// The block space, its generators as a certificate input, and the theory files the spec
/// read.
type Input = (BlockSpace, ProvedGenerators, Vec<(String, String)>);

/// Rebuild the block space and its generators from the envelope.
fn load(source: &Source) -> Result<Input, String> {
    let set = parse_set(&source.set)?;
    let (space, files) = build_space_traced(&source.spec, source.genus)?;
    let gens = cert_generators(&space, set)?;
    Ok((space, gens, files))
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
    let (space, gens, files) = load(&envelope.space)
        .map_err(|e| Stop::Invalid(format!("{file}: rebuilding the input: {e}")))?;
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
    check_theory_files(envelope, &files, claims)?;
    match kind {
        "witness" => witness::check(&gens, &body_as(body, file, kind)?, claims),
        "commutant" => commutant::check(&gens, &body_as(body, file, kind)?, claims),
        "image-enumeration" => image::enumeration(&gens, &body_as(body, file, kind)?, claims),
        "image-orbit" => image::orbit(&space, envelope, &gens, body, file, claims),
        "structure-imprimitive" => imprimitive::check(&space, &body_as(body, file, kind)?, claims),
        _ => structure::check(&space, &gens, &body_as(body, file, kind)?, claims),
    }
}

/// Re-check a certificate: `Ok` with every claim checked (a failed claim is a report with
/// `ok: false`, not an error), `Err` when the certificate is not one of a known kind or its
/// input cannot be rebuilt (the message names the certificate, the place and the reason).
pub fn check(certificate: &Certificate) -> Result<CheckReport, String> {
    let file = certificate.name.as_str();
    let envelope = envelope_of(&certificate.body, file)?;
    let mut claims = Claims::default();
    if let Err(Stop::Invalid(message)) = check_kind(&envelope, &certificate.body, file, &mut claims)
    {
        return Err(message);
    }
    let claims = claims.into_list();
    let failed = claims.iter().find(|c| !c.ok).map(|c| c.name.clone());
    Ok(CheckReport {
        file: file.to_string(),
        kind: envelope.kind,
        program: envelope.program,
        spec: envelope.space.spec,
        genus: envelope.space.genus,
        generating_set: envelope.space.set,
        ok: failed.is_none(),
        failed,
        claims,
    })
}
