//! `cyclorb check FILE`: the re-check of a certificate is the pipeline's `check`; this module
//! renders its report (text, or the JSON object) and maps it to the exit codes (a failed claim
//! exits 1 with the file, the claim and the reason on stderr).

use cyclorb_pipeline::check::{check, Certificate, CheckReport};

use super::envelope;
use super::output::{Outcome, Report};
use crate::cli::CheckArgs;

/// One line per claim, then the verdict.
fn text(report: &CheckReport) -> String {
    let mut text = format!(
        "certificate {}: kind {}, written by {} (re-checked by {})\n",
        report.file,
        report.kind,
        report.program,
        envelope::program()
    );
    for c in &report.claims {
        let mark = if c.ok { "ok" } else { "FAILED" };
        text.push_str(&format!("  [{mark}] {}: {}\n", c.name, c.detail));
    }
    match &report.failed {
        None => text.push_str(&format!("all {} claims hold\n", report.claims.len())),
        Some(name) => text.push_str(&format!(
            "claim {name} FAILS: the certificate does not hold\n"
        )),
    }
    text
}

/// Run `cyclorb check FILE`.
pub fn run(args: &CheckArgs, as_json: bool) -> Outcome {
    let report = match Certificate::read(&args.file).and_then(|c| check(&c)) {
        Ok(report) => report,
        Err(e) => return Outcome::Invalid(e),
    };
    let value = serde_json::to_value(&report).expect("a check report serialises");
    let rendered = Report::new(value, text(&report), as_json);
    match report.failed_claim() {
        None => Outcome::Done(rendered),
        Some(claim) => {
            // the report goes to stdout; stderr names the file, the claim and the reason
            eprintln!(
                "cyclorb: {}: claim {} fails: {}",
                report.file, claim.name, claim.detail
            );
            Outcome::CheckFailed(rendered)
        }
    }
}
