//! The README's examples, run as written.
//!
//! - A fenced block whose lines start with `$ cyclorb …` is an example with its output: the
//!   command is run (stdout and stderr together) and its output must equal the lines that
//!   follow, line by line, where `…` in the README stands for any text (times, memory, paths).
//! - In the other fenced blocks every line `cyclorb …  # comment` is run in README order
//!   (files written by one are read by the next) and must succeed, and every number of at
//!   least two digits in its comment (digit groups may be separated by spaces) must appear in
//!   its output, except durations (`~70 s`). The few slow examples are listed in [`SLOW`];
//!   lines that install into the user's home (`~/…`) are not run.
//!
//! Everything runs in a scratch folder that sees the repository's `fixtures/`.

mod run_cli;

use std::path::{Path, PathBuf};
use std::process::Command;

/// Examples that take more than a few seconds; run by hand or by the sweeps.
const SLOW: &[&str] = &["cyclorb verify su2:20", "cyclorb image su2:4 --genus 2"];

/// One example: a command and what the README says about its output.
enum Example {
    /// `$ command` followed by its output.
    Output {
        command: String,
        expected: Vec<String>,
    },
    /// A command line with its comment (possibly empty).
    Claim { command: String, comment: String },
}

/// The examples of a Markdown text, in order.
fn examples(readme: &str) -> Vec<Example> {
    let mut out = Vec::new();
    let mut block: Option<Vec<&str>> = None;
    for line in readme.lines() {
        if line.trim_start().starts_with("```") {
            match block.take() {
                Some(lines) => out.extend(block_examples(&lines)),
                None => block = Some(Vec::new()),
            }
        } else if let Some(lines) = block.as_mut() {
            lines.push(line);
        }
    }
    out
}

fn block_examples(lines: &[&str]) -> Vec<Example> {
    let mut out = Vec::new();
    if lines.first().is_some_and(|l| l.starts_with("$ cyclorb ")) {
        for line in lines {
            if let Some(command) = line.strip_prefix("$ ") {
                out.push(Example::Output {
                    command: command.to_string(),
                    expected: Vec::new(),
                });
            } else if let Some(Example::Output { expected, .. }) = out.last_mut() {
                expected.push(line.to_string());
            }
        }
        return out;
    }
    for line in lines {
        if line.starts_with("cyclorb ") {
            let (command, comment) = line.split_once(" # ").unwrap_or((line, ""));
            out.push(Example::Claim {
                command: command.trim().to_string(),
                comment: comment.trim().to_string(),
            });
        }
    }
    out
}

/// Whether `line` matches `pattern`, where each `…` stands for any text.
fn matches(pattern: &str, line: &str) -> bool {
    let pieces: Vec<&str> = pattern.split('…').collect();
    if pieces.len() == 1 {
        return pattern == line;
    }
    let (first, last) = (pieces[0], pieces[pieces.len() - 1]);
    if !line.starts_with(first) || !line.ends_with(last) || line.len() < first.len() + last.len() {
        return false;
    }
    let mut rest = &line[first.len()..line.len() - last.len()];
    for piece in &pieces[1..pieces.len() - 1] {
        match rest.find(piece) {
            Some(i) => rest = &rest[i + piece.len()..],
            None => return false,
        }
    }
    true
}

/// The integers of at least two digits in a comment, digit groups joined, durations left
/// out.
fn claimed_numbers(comment: &str) -> Vec<String> {
    let chars: Vec<char> = comment.chars().collect();
    let mut numbers = Vec::new();
    let mut i = 0;
    while i < chars.len() {
        if !chars[i].is_ascii_digit() || (i > 0 && (chars[i - 1] == '~' || chars[i - 1] == '_')) {
            i += 1;
            continue;
        }
        let mut digits = String::new();
        while i < chars.len() {
            if chars[i].is_ascii_digit() {
                digits.push(chars[i]);
                i += 1;
            } else if chars[i] == ' '
                && chars.get(i + 1).is_some_and(char::is_ascii_digit)
                && !chars.get(i + 4).is_some_and(char::is_ascii_digit)
                && (i + 1..i + 4).all(|k| chars.get(k).is_some_and(char::is_ascii_digit))
            {
                i += 1; // a thin group separator: "1 228 800"
            } else {
                break;
            }
        }
        let duration = comment[comment
            .char_indices()
            .nth(i)
            .map_or(comment.len(), |(b, _)| b)..]
            .trim_start()
            .starts_with("s ")
            || comment.ends_with(&format!("{digits} s"));
        if digits.len() >= 2 && !duration {
            numbers.push(digits);
        }
    }
    numbers
}

/// A scratch folder with `fixtures/` pointing at the repository's.
fn scratch() -> PathBuf {
    let dir = run_cli::temp_path("readme");
    std::fs::create_dir_all(&dir).unwrap();
    let fixtures = dir.join("fixtures");
    if !fixtures.exists() {
        std::os::unix::fs::symlink(
            Path::new(env!("CARGO_MANIFEST_DIR")).join("fixtures"),
            fixtures,
        )
        .unwrap();
    }
    dir
}

/// Run a README command line through the shell, as a user would type it, with the
/// program on PATH; stdout and stderr together, and whether it succeeded.
fn run(dir: &Path, command: &str) -> (String, bool) {
    let bin = Path::new(env!("CARGO_BIN_EXE_cyclorb")).parent().unwrap();
    let path = format!(
        "{}:{}",
        bin.display(),
        std::env::var("PATH").unwrap_or_default()
    );
    let out = Command::new("sh")
        .arg("-c")
        .arg(format!("{command} 2>&1"))
        .current_dir(dir)
        .env("PATH", path)
        .env("XDG_CACHE_HOME", run_cli::test_cache())
        .output()
        .unwrap();
    (
        String::from_utf8_lossy(&out.stdout).into_owned(),
        out.status.success(),
    )
}

#[test]
fn wildcards_and_claims_are_read_as_meant() {
    assert!(matches("time … s, peak … MiB", "time 0.02 s, peak 6.9 MiB"));
    assert!(!matches(
        "time … s, peak … MiB",
        "time 0.02 s, peak 6.9 GiB"
    ));
    assert!(matches("exact", "exact"));
    assert!(!matches("exact", "exact "));
    assert_eq!(
        claimed_numbers("finite, order 206789 (1 228 800 lines), every check: ~70 s, 4 s"),
        vec!["206789", "1228800"]
    );
}

#[test]
fn every_readme_example_runs_as_written() {
    let readme =
        std::fs::read_to_string(Path::new(env!("CARGO_MANIFEST_DIR")).join("README.md")).unwrap();
    let dir = scratch();
    let mut failures = Vec::new();
    let mut ran = 0;
    for example in examples(&readme) {
        match example {
            Example::Output { command, expected } => {
                let (output, _) = run(&dir, &command);
                let got: Vec<&str> = output.lines().collect();
                let same = got.len() == expected.len()
                    && expected.iter().zip(&got).all(|(e, g)| matches(e, g));
                if !same {
                    failures.push(format!(
                        "$ {command}\nREADME:\n{}\nprogram:\n{output}",
                        expected.join("\n")
                    ));
                }
                ran += 1;
            }
            Example::Claim { command, comment } => {
                if SLOW.iter().any(|s| command.starts_with(s)) || command.contains("~/") {
                    continue;
                }
                let (output, ok) = run(&dir, &command);
                let flat: String = output.chars().filter(|c| *c != ' ').collect();
                let missing: Vec<String> = claimed_numbers(&comment)
                    .into_iter()
                    .filter(|n| !flat.contains(n.as_str()))
                    .collect();
                if !ok || !missing.is_empty() {
                    failures.push(format!(
                        "{command}  # {comment}\nsucceeded: {ok}; numbers not in the output: {missing:?}\n{}",
                        output.chars().take(2000).collect::<String>()
                    ));
                }
                ran += 1;
            }
        }
    }
    assert!(ran >= 20, "only {ran} examples found");
    assert!(failures.is_empty(), "{}", failures.join("\n\n"));
}
