//! `cyclorb twists SPEC --genus G`: the comb basis and the Dehn-twist generators, exactly;
//! `--check` proves the mapping class group relations, `--out` writes the generator set.

use cyclorb_matrix::{LinearMap, Operator};
use cyclorb_mcg::{check_relations, BlockSpace};
use serde_json::json;

use super::output::{Outcome, Report};
use crate::cli::TwistsArgs;
use cyclorb_pipeline::space::{build_space, parse_set};

fn kind(op: &Operator) -> String {
    match op {
        Operator::Dense(_) => "dense".into(),
        Operator::Diagonal(_) => "diagonal".into(),
        Operator::BlockDiagonal { blocks, .. } => {
            let largest = blocks.iter().map(|b| b.indices.len()).max().unwrap_or(0);
            format!(
                "block-diagonal ({} blocks, largest {largest})",
                blocks.len()
            )
        }
        Operator::SparseRows { .. } => "sparse rows".into(),
    }
}

/// Run `cyclorb twists`.
pub fn run(args: &TwistsArgs, as_json: bool) -> Outcome {
    if cyclorb_pipeline::dw_space::is_dw(&args.space.spec) {
        return super::dw::twists(args, as_json);
    }
    let set = match parse_set(&args.space.set) {
        Ok(s) => s,
        Err(e) => return Outcome::Invalid(e),
    };
    let space: BlockSpace = match build_space(&args.space.spec, args.space.genus) {
        Ok(s) => s,
        Err(e) => return Outcome::Invalid(e),
    };
    let theory = space.theory();
    let field = theory.field();
    let gens = match space.generators(set) {
        Ok(g) => g,
        Err(e) => return Outcome::Invalid(e.to_string()),
    };
    let mut text = format!(
        "theory {} at genus {}: dim V_g = {} over Q(ζ_{})\n",
        theory.name(),
        args.space.genus,
        space.dimension(),
        field.conductor()
    );
    text.push_str("basis (comb trees):\n");
    for (i, s) in space.states().iter().enumerate() {
        text.push_str(&format!("  {i:>5}  {}\n", s.describe(theory)));
    }
    text.push_str(&format!("generators ({} set):\n", set.name()));
    let mut gen_json = Vec::new();
    for (curve, op) in &gens {
        text.push_str(&format!(
            "  {curve:<8} {}, {} non-zeros\n",
            kind(op),
            op.nonzeros()
        ));
        gen_json
            .push(json!({"name": curve.to_string(), "kind": kind(op), "nonzeros": op.nonzeros()}));
    }
    let mut json = json!({
        "theory": theory.name(),
        "genus": args.space.genus,
        "dimension": space.dimension(),
        "conductor": field.conductor(),
        "set": set.name(),
        "generators": gens.iter().map(|(c, _)| c.to_string()).collect::<Vec<_>>(),
        "generator_details": gen_json,
        "basis": space.states().iter().map(|s| s.describe(theory)).collect::<Vec<_>>(),
    });
    let mut all_ok = true;
    if args.check {
        let checks = match check_relations(&space) {
            Ok(c) => c,
            Err(e) => return Outcome::Invalid(e.to_string()),
        };
        all_ok = checks.iter().all(|c| c.ok);
        text.push_str("relations:\n");
        for c in &checks {
            text.push_str(&format!(
                "  [{}] {}\n",
                if c.ok { "ok" } else { "FAILED" },
                c.name
            ));
        }
        json["relations_ok"] = json!(all_ok);
        json["relations"] = json!(checks);
    }
    if let Some(path) = &args.out {
        let file = match space.generator_set(&gens) {
            Ok(file) => file,
            Err(e) => return Outcome::Invalid(e.to_string()),
        };
        if let Err(e) = file.write(path) {
            return Outcome::Invalid(e.to_string());
        }
        text.push_str(&format!("generators written to {}\n", path.display()));
        json["out"] = json!(path.display().to_string());
    }
    let report = Report::new(json, text, as_json);
    if all_ok {
        Outcome::Done(report)
    } else {
        Outcome::CheckFailed(report)
    }
}
