//! `cyclorb orbit A*B --genus G --method product`: the orbit of a Deligne product's vacuum
//! line found from its factors (`cyclorb_pipeline::product`), as text or JSON.

use std::sync::atomic::AtomicBool;
use std::sync::Arc;

use cyclorb_pipeline::answer::ProductFigures;
use cyclorb_pipeline::product::product_orbit;
use cyclorb_pipeline::OrbitAnswer;

use super::orbit::options;
use super::output::{Outcome, Report};
use crate::cli::OrbitArgs;
use crate::runtime::{install_stop_handler, peak_memory_bytes};

/// The text form of the product route's answer.
fn product_text(r: &OrbitAnswer, p: &ProductFigures) -> String {
    let (a, b) = (&p.factors[0], &p.factors[1]);
    let open = |saturated: bool| if saturated { "" } else { " (not closed)" };
    let sum_line = match (r.poincare_sum.is_scalar, &r.poincare_sum.prefactor) {
        (Some(true), Some(lambda)) => {
            format!("Poincaré sum: B = {lambda} · G⁻¹ (scalar, B = B_A ⊗ B_B)")
        }
        (Some(false), _) => "Poincaré sum: B = B_A ⊗ B_B, not scalar".to_string(),
        _ => "Poincaré sum: not formed on this route".to_string(),
    };
    let size = r.size_text();
    format!(
        "theory {} at genus {}: dimension {} = {} × {}, {} generators (product route)\n\
         factor {}: {} lines{}; factor {}: {} lines{}\n\
         orbit of the vacuum line: {size} lines, {}\n\
         {sum_line}\n\
         time {:.2} s\n",
        r.theory.as_deref().unwrap_or_default(),
        r.genus.unwrap_or_default(),
        r.dimension,
        a.dimension,
        b.dimension,
        r.generators,
        a.spec,
        a.orbit_size,
        open(a.saturated),
        b.spec,
        b.orbit_size,
        open(b.saturated),
        if r.saturated {
            "saturated".to_string()
        } else {
            format!("not saturated after {size}")
        },
        r.elapsed_seconds,
    )
}

/// Run `cyclorb orbit SPEC --method product`.
pub fn run_product(args: &OrbitArgs, as_json: bool) -> Outcome {
    let Some(spec) = &args.spec else {
        return Outcome::Invalid("--method product needs a theory SPEC of the form A*B".into());
    };
    let Some(genus) = args.genus else {
        return Outcome::Invalid("--method product needs --genus".into());
    };
    if args.checkpoint.is_some() || args.resume.is_some() {
        return Outcome::Invalid(
            "--method product keeps no checkpoints (its factors are short runs); drop --checkpoint/--resume".into(),
        );
    }
    let stop = Arc::new(AtomicBool::new(false));
    if let Err(e) = install_stop_handler(&stop) {
        return Outcome::Invalid(format!("cannot install the interrupt handler: {e}"));
    }
    let mut answer = match product_orbit(spec, genus, &args.set, &options(args, stop), args.limit) {
        Ok(a) => a,
        Err(e) => return Outcome::Invalid(e),
    };
    answer.peak_memory_bytes = peak_memory_bytes();
    let text = match &answer.product {
        Some(p) => product_text(&answer, p),
        None => String::new(),
    };
    let value = serde_json::to_value(&answer).expect("answers serialise");
    let saturated = answer.saturated;
    let report = Report::new(value, text, as_json);
    if saturated {
        Outcome::Done(report)
    } else {
        Outcome::Stopped(report)
    }
}
