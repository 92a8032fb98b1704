//! `cyclorb orbit dw:… --method structure`: the text and JSON of the counted vacuum orbit of
//! a Dijkgraaf–Witten theory, and its `--out` certificate. The count, B over orbitals and
//! the certificate's figures are the pipeline's (`cyclorb_pipeline::dw_count`).

use std::path::Path;
use std::time::Instant;

use cyclorb_dw::{VacuumCount, VacuumOrbit};
use cyclorb_pipeline::dw_count::{self, answer, certificate, CERTIFICATE_KIND, NOT_COUNTED};
use cyclorb_pipeline::dw_space::DwSpace;
use serde_json::{json, Value};

use super::dw::generator_images;
use super::envelope::{self, Source};
use super::output::{Outcome, Report};

/// What `cyclorb orbit dw:… --method structure` reads from its command line.
pub struct CountArgs<'a> {
    /// The `dw:` spec.
    pub spec: &'a str,
    /// The genus.
    pub genus: usize,
    /// The generating set's name.
    pub set: &'a str,
    /// The cap on Ω (`--limit`).
    pub limit: Option<usize>,
    /// Where to write the certificate (`--out`).
    pub out: Option<&'a Path>,
}

/// Run the counting route; `limit` caps the listed orbits of the parts (Ω); `out` receives
/// the certificate of an exact count (kind `dw-vacuum-set-stabiliser`).
pub fn run(args: &CountArgs, as_json: bool, started: Instant) -> Outcome {
    let (spec, genus) = (args.spec, args.genus);
    let (space, result) = match dw_count::counted_orbit(spec, genus, args.set, args.limit) {
        Ok(x) => x,
        Err(e) => return Outcome::Invalid(e),
    };
    let mut text = format!(
        "theory {spec} at genus {genus}: dimension |X_g| = {} over Q, {} generators\n",
        space.dimension(),
        space.twists().len()
    );
    match &result {
        VacuumOrbit::Counted(c) => {
            if let Some(path) = args.out {
                if let Err(e) = write_certificate(&space, args, c, path) {
                    return Outcome::Invalid(e);
                }
                text.push_str(&format!(
                    "certificate written to {} (re-check: cyclorb check {})\n",
                    path.display(),
                    path.display()
                ));
            }
            text.push_str(&counted_text(c));
        }
        VacuumOrbit::Bounded(b) => text.push_str(&format!(
            "orbit not counted exactly: {}\nproved bounds: {} ≤ |orbit| ≤ {}\n  lower: {}\n  upper: {}\n",
            b.reason, b.lower, b.upper, b.lower_proof, b.upper_proof
        )),
    }
    let mut answer = answer(&space, &result, started.elapsed());
    answer.peak_memory_bytes = crate::runtime::peak_memory_bytes();
    if answer.saturated {
        text.push_str(&format!(
            "Poincaré sum: {}\n",
            answer.poincare_sum.note.as_deref().unwrap_or("")
        ));
    }
    let report = Report::new(json_of(&answer), text, as_json);
    if answer.saturated {
        Outcome::Done(report)
    } else {
        Outcome::Stopped(report)
    }
}

/// The answer's JSON with the keys this route has always printed: no `stop_reason` (a
/// stopped count says why in `details.stopped`), and only the note of a sum not computed.
fn json_of(answer: &cyclorb_pipeline::OrbitAnswer) -> Value {
    let mut value = serde_json::to_value(answer).expect("answers serialise");
    if let Value::Object(map) = &mut value {
        map.remove("stop_reason");
        if !answer.saturated {
            map.insert("poincare_sum".into(), json!({ "note": NOT_COUNTED }));
        }
    }
    value
}

/// Write the certificate of an exact count with its envelope.
fn write_certificate(
    space: &DwSpace,
    args: &CountArgs,
    c: &VacuumCount,
    path: &Path,
) -> Result<(), String> {
    let mut cert = certificate(c);
    cert["theory"] = json!(args.spec);
    cert["genus"] = json!(args.genus);
    cert["generators"] = json!(generator_images(space));
    let source = Source {
        spec: args.spec,
        genus: args.genus,
        set: args.set,
    };
    envelope::write(Some(path), CERTIFICATE_KIND, &source, &cert)
}

fn counted_text(c: &VacuumCount) -> String {
    let orbits: Vec<String> = c
        .part_orbits
        .iter()
        .map(|o| format!("{} (parts of {} states)", o.size, o.part_size))
        .collect();
    format!(
        "orbit (counted as |P| / |Stab_P(S)|): {} lines\n  S = {} states in {} parts over G^ab (order {}); orbits of the parts: {}\n  |P| = {} (Schreier–Sims on X_g ⊔ Ω, {} points)\n  |Stab_P(S)| = {} arrangements × |pointwise stabiliser of the parts| {} = {}\n  image order {}\n",
        c.orbit_size,
        c.vacuum_states,
        c.parts,
        c.abelian_order,
        orbits.join(", "),
        c.image_order,
        c.degree,
        c.arrangements,
        c.pointwise_stabiliser_order,
        c.stabiliser_order,
        c.image_order
    )
}
