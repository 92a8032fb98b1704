//! `cyclorb theories`, `cyclorb describe` and `cyclorb verify`: the theory catalogue, the
//! exact data of one theory, and its check-by-check verification.

use std::time::Instant;

use cyclorb_field::{Cyc, CyclotomicField};
use cyclorb_theory::{
    builtin_catalogue, check_verification_storage, parse_spec, parse_spec_traced, theory_to_json,
    verify_by, CheckId, Route, Theory, TracedSpec,
};
use serde_json::{json, Value};

use super::output::{Outcome, Report};
use super::progress::spinner;
use crate::cli::{DescribeArgs, VerifyArgs};
use cyclorb_pipeline::proof;

const GRAMMAR: &str = "spec := factor ('*' factor)* ; factor := conj(spec) | galois:K(spec) | gauge:SEED(spec) | (spec) | NAME | PATH.json";

/// Run `cyclorb theories`.
pub fn run_theories(as_json: bool) -> Outcome {
    let mut rows = builtin_catalogue();
    rows.extend(cyclorb_pipeline::dw_space::catalogue());
    let width = rows.iter().map(|(s, _)| s.len()).max().unwrap_or(0);
    let mut text = String::from("Theory specs (usable wherever SPEC is asked):\n");
    for (spec, description) in &rows {
        text.push_str(&format!("  {spec:width$}  {description}\n"));
    }
    text.push_str(&format!(
        "\nGrammar: {GRAMMAR}\nExamples: ising*fibonacci, conj(su2:3), galois:3(fibonacci), su2:2*zn:3:2\n"
    ));
    let json = json!({
        "theories": rows
            .iter()
            .map(|(s, d)| json!({ "spec": s, "description": d }))
            .collect::<Vec<_>>(),
        "grammar": GRAMMAR,
    });
    Outcome::Done(Report::new(json, text, as_json))
}

/// exp(2πi h) written as h = e/N when θ is a root of unity.
fn weight_of(field: &CyclotomicField, theta: &Cyc) -> String {
    match field.root_of_unity_exponent(theta) {
        Ok(Some((n, e))) => {
            let g = gcd(e, n);
            if e == 0 {
                "0".to_string()
            } else if n / g == 1 {
                format!("{}", e / g)
            } else {
                format!("{}/{}", e / g, n / g)
            }
        }
        _ => "?".to_string(),
    }
}

fn gcd(a: u64, b: u64) -> u64 {
    if b == 0 {
        a.max(1)
    } else {
        gcd(b, a % b)
    }
}

fn approx(x: &Cyc) -> String {
    let (re, im) = x.to_complex();
    if im.abs() < 1e-12 {
        format!("{re:.6}")
    } else {
        format!("{re:.6}{im:+.6}i")
    }
}

fn describe_text(t: &Theory) -> String {
    let field = t.field();
    let mut out = String::new();
    out.push_str(&format!("theory {}\n", t.name()));
    out.push_str(&format!(
        "field Q(ζ_{n}) (conductor {n}; z = ζ_{n} = exp(2πi/{n}) below)\n",
        n = t.conductor()
    ));
    let d = t.total_dim().expect("D is always computed");
    out.push_str(&format!(
        "rank {}, central charge c ≡ {} (mod 8), total dimension D = {d} ≈ {}\n",
        t.rank(),
        t.central_charge_mod_8(),
        approx(d)
    ));
    if t.has_fr() {
        out.push_str(&format!(
            "F- and R-symbols present: {} F-blocks, {} R-symbols (every genus)\n",
            t.f_block_labels().len(),
            t.fusion().triples().count()
        ));
    }
    if !t.has_fr() {
        out.push_str("modular data only (S and T; no F or R): usable at genus 1\n");
    } else if t.is_unitary_gauge() {
        out.push_str("gauge: unitary (every vertex weight is 1, invariant form G = 1)\n");
    } else {
        out.push_str(
            "gauge: not unitary; vertex weights w(a,b,c) ≠ 1 give the invariant form (describe --json lists them)\n",
        );
    }
    out.push_str("\nlabels:\n");
    let width = t.labels().iter().map(String::len).max().unwrap_or(1).max(5);
    out.push_str(&format!(
        "  {:>3}  {:width$}  {:width$}  {:>10}  {:>8}  d (exact)  |  θ (exact)\n",
        "#", "label", "dual", "d ≈", "h"
    ));
    for a in 0..t.rank() {
        out.push_str(&format!(
            "  {:>3}  {:width$}  {:width$}  {:>10}  {:>8}  {}  |  {}\n",
            a,
            t.label(a),
            t.label(t.dual(a)),
            approx(t.quantum_dim(a)),
            weight_of(field, t.twist(a)),
            t.quantum_dim(a),
            t.twist(a)
        ));
    }
    out.push_str("\nfusion rules (a × b for a ≤ b):\n");
    for a in 0..t.rank() {
        for b in a..t.rank() {
            let terms: Vec<String> = t
                .fusion_outcomes(a, b)
                .iter()
                .map(|&c| match t.fusion_coefficient(a, b, c) {
                    1 => t.label(c).to_string(),
                    m => format!("{m}·{}", t.label(c)),
                })
                .collect();
            out.push_str(&format!(
                "  {} × {} = {}\n",
                t.label(a),
                t.label(b),
                terms.join(" + ")
            ));
        }
    }
    let s = t.s_matrix().expect("S is always computed");
    out.push_str("\nS (normalised, rows and columns in label order):\n");
    for a in 0..t.rank() {
        let row: Vec<String> = s.row(a).iter().map(|x| x.to_string()).collect();
        out.push_str(&format!("  [{}]\n", row.join(", ")));
    }
    let twists: Vec<String> = t.twists().iter().map(|x| x.to_string()).collect();
    out.push_str(&format!("\nT = diag({})\n", twists.join(", ")));
    out.push_str(&format!("\ndata hash (SHA-256): {}\n", t.data_hash()));
    out
}

/// Run `cyclorb describe SPEC`.
pub fn run_describe(args: &DescribeArgs, as_json: bool) -> Outcome {
    if cyclorb_pipeline::dw_space::is_dw(&args.spec) {
        return super::dw::describe(&args.spec, as_json);
    }
    let theory = match parse_spec(&args.spec) {
        Ok(t) => t,
        Err(e) => return Outcome::Invalid(e.to_string()),
    };
    if let Err(e) = theory.check_f_storage() {
        return Outcome::Invalid(e.to_string());
    }
    let mut json = theory_to_json(&theory);
    if let Value::Object(obj) = &mut json {
        obj.insert("spec".into(), json!(args.spec));
    }
    let text = if as_json {
        String::new()
    } else {
        describe_text(&theory)
    };
    Outcome::Done(Report::new(json, text, as_json))
}

fn check_names() -> String {
    CheckId::ALL
        .iter()
        .map(|c| c.name())
        .collect::<Vec<_>>()
        .join(", ")
}

/// A file whose theory has just passed every check is remembered as proved, so that later
/// commands reading it do not verify it again. A spec that reads no file (a built-in, or
/// products and conjugates of built-ins) has nothing to remember, and its data hash, which
/// fills every F-block, is not computed.
fn remember_proved_files(traced: &TracedSpec) {
    if traced.files.is_empty() {
        return;
    }
    let hash = traced.theory.data_hash();
    for file in &traced.files {
        if file.theory.data_hash() == hash {
            proof::remember_proved(&hash);
        }
    }
}

/// Run `cyclorb verify SPEC|FILE`.
pub fn run_verify(args: &VerifyArgs, as_json: bool) -> Outcome {
    if cyclorb_pipeline::dw_space::is_dw(&args.spec) {
        return Outcome::Invalid(format!(
            "{}: a Dijkgraaf–Witten theory is built from its group (checked when read); its twists are checked by `cyclorb twists {} --genus G --check`",
            args.spec, args.spec
        ));
    }
    let mut skipped = Vec::new();
    for name in &args.skip {
        match CheckId::ALL.iter().find(|c| c.name() == name) {
            Some(&id) => skipped.push(id),
            None => {
                return Outcome::Invalid(format!(
                    "unknown check {name:?} (known: {})",
                    check_names()
                ))
            }
        }
    }
    let started = Instant::now();
    let traced = match parse_spec_traced(&args.spec) {
        Ok(t) => t,
        Err(e) => return Outcome::Invalid(e.to_string()),
    };
    let theory = &traced.theory;
    let route = if args.direct {
        Route::Direct
    } else {
        Route::Structural
    };
    if let Err(e) = check_verification_storage(theory, route) {
        return Outcome::Invalid(e.to_string());
    }
    let ids: Vec<CheckId> = CheckId::ALL
        .into_iter()
        .filter(|id| !skipped.contains(id))
        .collect();
    let bar = spinner(as_json);
    let verification = verify_by(theory, &ids, route, &mut |id| {
        if let Some(bar) = &bar {
            bar.set_message(format!("checking {id} of {}", theory.name()));
        }
    });
    if let Some(bar) = &bar {
        bar.finish_and_clear();
    }
    let elapsed = started.elapsed().as_secs_f64();
    let mut text = format!(
        "verify {} (conductor {}, rank {}{})\n",
        theory.name(),
        theory.conductor(),
        theory.rank(),
        if theory.has_fr() {
            ""
        } else {
            "; modular data only: F/R checks do not apply"
        }
    );
    for c in &verification.checks {
        text.push_str(&format!(
            "  {:4}  {:18} {:>10} instances   {}\n",
            if c.ok { "ok" } else { "FAIL" },
            c.name,
            c.instances,
            c.equation
        ));
        if let Some(on) = &c.proved_on {
            text.push_str(&format!(
                "        proved on its building blocks: {}\n",
                on.join(", ")
            ));
        }
        if let Some(f) = &c.failure {
            text.push_str(&format!("        first failure {f}\n"));
        }
    }
    if !skipped.is_empty() {
        let names: Vec<&str> = skipped.iter().map(|c| c.name()).collect();
        text.push_str(&format!("  skipped on request: {}\n", names.join(", ")));
    }
    let first = verification.first_failure();
    match first {
        None => text.push_str(&format!(
            "all {} checks hold ({elapsed:.2} s)\n",
            verification.checks.len()
        )),
        Some(c) => text.push_str(&format!(
            "FAILED: {} — {} fails {}\n",
            c.name,
            c.equation,
            c.failure.as_deref().unwrap_or("")
        )),
    }
    let json = json!({
        "theory": theory.name(),
        "spec": args.spec,
        "conductor": theory.conductor(),
        "ok": verification.ok(),
        "checks": verification.checks.iter().map(|c| json!({
            "name": c.name,
            "ok": c.ok,
            "equation": c.equation,
            "instances": c.instances,
            "failure": c.failure,
            "proved_on": c.proved_on,
        })).collect::<Vec<_>>(),
        "first_failure": first.map(|c| json!({
            "name": c.name,
            "equation": c.equation,
            "failure": c.failure,
        })),
        "skipped": skipped.iter().map(|c| c.name()).collect::<Vec<_>>(),
        "elapsed_seconds": elapsed,
    });
    let report = Report::new(json, text, as_json);
    if verification.ok() {
        if skipped.is_empty() {
            remember_proved_files(&traced);
        }
        Outcome::Done(report)
    } else {
        if as_json {
            if let Some(c) = first {
                eprintln!(
                    "cyclorb: {} fails {}",
                    c.name,
                    c.failure.as_deref().unwrap_or("")
                );
            }
        }
        Outcome::CheckFailed(report)
    }
}
