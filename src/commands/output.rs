//! Outcomes, exit codes and the two output modes (text for people, one JSON object for programs).

use std::io::{IsTerminal, Write};
use std::process::ExitCode;

use serde_json::Value;

use cyclorb_pipeline::proof;

/// The result of a subcommand, before it is printed.
pub enum Outcome {
    /// Finished; the report is printed (exit 0).
    Done(Report),
    /// A check failed; the report is printed (exit 1).
    CheckFailed(Report),
    /// Stopped by a limit or an interrupt with a partial result (exit 3).
    Stopped(Report),
    /// The input was invalid: message on stderr (exit 1).
    Invalid(String),
    /// Another process reports (a rank other than 0 of a distributed run): print nothing,
    /// exit with this code.
    Quiet(u8),
}

/// What a subcommand prints: a JSON object and its human-readable text.
pub struct Report {
    /// The machine-readable form (printed alone with `--json`).
    pub json: Value,
    /// The text form.
    pub text: String,
    /// Whether to print JSON.
    pub as_json: bool,
}

impl Report {
    /// A report printed as JSON when `as_json`, else as text.
    pub fn new(json: Value, text: String, as_json: bool) -> Report {
        Report {
            json,
            text,
            as_json,
        }
    }

    /// Print, with the proof status of the data used (`verified`; see `proof`) when the
    /// command used theory or generator data. A closed stdout (`| head`) is not an error
    /// of the computation: the rest of the output is dropped quietly.
    fn print(&self) {
        let verified = proof::answers_verified();
        let mut out = String::new();
        if self.as_json {
            let mut json = self.json.clone();
            add_approximations(&mut json);
            if let (Some(v), Value::Object(obj)) = (verified, &mut json) {
                obj.insert("verified".into(), Value::Bool(v));
            }
            out.push_str(&serde_json::to_string_pretty(&json).expect("JSON values serialise"));
            out.push('\n');
        } else {
            out.push_str(&self.text);
            if !self.text.ends_with('\n') {
                out.push('\n');
            }
            if verified == Some(false) {
                out.push_str(
                    "verified: false (data used without proof under --unverified; this answer \
                     is not established)\n",
                );
            }
        }
        let mut stdout = std::io::stdout().lock();
        let _closed_stdout_is_not_an_error = stdout
            .write_all(out.as_bytes())
            .and_then(|()| stdout.flush());
    }
}

impl Outcome {
    /// Print now and keep only the exit code: a distributed run prints before MPI ends,
    /// since the launcher may end a rank once another has exited.
    #[cfg(feature = "mpi")]
    pub fn printed(self) -> Outcome {
        let code = match &self {
            Outcome::Done(_) => 0,
            Outcome::CheckFailed(_) | Outcome::Invalid(_) => 1,
            Outcome::Stopped(_) => 3,
            Outcome::Quiet(code) => *code,
        };
        let _printed = self.finish();
        Outcome::Quiet(code)
    }

    /// Print and map to the exit code of the contract.
    pub fn finish(self) -> ExitCode {
        match self {
            Outcome::Done(r) => {
                r.print();
                ExitCode::SUCCESS
            }
            Outcome::CheckFailed(r) => {
                r.print();
                ExitCode::from(1)
            }
            Outcome::Stopped(r) => {
                r.print();
                ExitCode::from(3)
            }
            Outcome::Invalid(msg) => {
                eprintln!("cyclorb: {msg}");
                ExitCode::from(1)
            }
            Outcome::Quiet(code) => ExitCode::from(code),
        }
    }
}

/// Whether progress displays may be drawn: a terminal on stderr and not JSON mode.
pub fn progress_allowed(json: bool) -> bool {
    !json && std::io::stderr().is_terminal()
}

/// A word as the shell needs it typed: unchanged when it is plain, else in single quotes.
pub fn shell_word(text: &str) -> String {
    let plain = !text.is_empty()
        && text
            .chars()
            .all(|c| c.is_ascii_alphanumeric() || "-_./:=@+,".contains(c));
    if plain {
        text.to_string()
    } else {
        format!("'{}'", text.replace('\'', "'\\''"))
    }
}

/// Keys whose exact value (an integer or a rational, as a string because it may exceed any
/// machine word) gets a floating-point companion `KEY_approx` for plotting.
const EXACT_NUMBER_KEYS: &[&str] = &[
    "prefactor",
    "order",
    "image_order",
    "orbit_size",
    "coefficient",
];

/// A decimal integer or rational `p/q` as the nearest f64 (display only; `None` for other
/// text, such as a cyclotomic number).
fn approximate(text: &str) -> Option<f64> {
    let number = |t: &str| -> Option<f64> {
        let t = t.trim();
        let digits = t.strip_prefix('-').unwrap_or(t);
        (!digits.is_empty() && digits.chars().all(|c| c.is_ascii_digit()))
            .then(|| t.parse::<f64>().ok())
            .flatten()
    };
    match text.split_once('/') {
        Some((p, q)) => Some(number(p)? / number(q).filter(|&q| q != 0.0)?),
        None => number(text),
    }
}

/// Beside every exact number of [`EXACT_NUMBER_KEYS`] given as a string, anywhere in the
/// object, its approximation `KEY_approx` (the exact string stays the answer).
pub fn add_approximations(value: &mut Value) {
    match value {
        Value::Object(obj) => {
            let extra: Vec<(String, f64)> = EXACT_NUMBER_KEYS
                .iter()
                .filter_map(|key| {
                    let x = approximate(obj.get(*key)?.as_str()?)?;
                    Some((format!("{key}_approx"), x))
                })
                .collect();
            for v in obj.values_mut() {
                add_approximations(v);
            }
            for (key, x) in extra {
                obj.entry(key).or_insert(Value::from(x));
            }
        }
        Value::Array(items) => items.iter_mut().for_each(add_approximations),
        _ => {}
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn exact_numbers_get_an_approximation_beside_them() {
        let mut v = serde_json::json!({
            "order": "3019898880",
            "poincare_sum": {"prefactor": "3/2", "invariants": [{"coefficient": "-4"}]},
            "orbit_size": 24,
            "theory": "ising",
            "prefactor_note": "x",
        });
        add_approximations(&mut v);
        assert_eq!(v["order_approx"], 3019898880.0);
        assert_eq!(v["poincare_sum"]["prefactor_approx"], 1.5);
        assert_eq!(
            v["poincare_sum"]["invariants"][0]["coefficient_approx"],
            -4.0
        );
        // numbers already numeric and other text are left alone
        assert!(v.get("orbit_size_approx").is_none());
        assert_eq!(approximate("1 + z^2"), None);
        assert_eq!(approximate("3/0"), None);
    }
}
