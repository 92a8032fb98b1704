//! Bounded, seeded mutation test of every input parser (issue 15): thousands of mutants of a
//! theory file, a spec, field expressions, a generator file, a seed file and a checkpoint go
//! through the library readers (and, when they are read, through verification, invertibility
//! proofs and a short orbit); a few hundred plans and theory files go through the binary.
//! Expected: no panic, no abort, every mutant answered quickly, and the binary's exit codes
//! within the contract (0, 1, 2, 3).
//!
//! Stable toolchain, no fuzzing framework: a xorshift generator with a fixed seed drives
//! byte-level and token-level mutations, so a failure reproduces exactly.
//! `CYCLORB_MUTATION_SCALE` (default 1) multiplies every mutant count.

mod run_cli;

use std::panic::{catch_unwind, AssertUnwindSafe};
use std::path::Path;
use std::time::{Duration, Instant};

use cyclorb_field::{set_memory_budget, CyclotomicField};
use cyclorb_orbit::{GeneratorSet, OrbitOptions, OrbitProblem, Progress, Seed};
use cyclorb_theory::{parse_spec, parse_spec_traced, theory_to_json, verify};

use run_cli::{cyclorb, fixture, temp_path};

/// Longest time one library mutant may take: a bound that catches runaway work (a hang, an
/// exponential blow-up), not a speed figure. Some mutants are valid specs that build a
/// product theory (about 1 s alone in release), and CI machines are shared, hence the margin.
const MUTANT_TIME: Duration = Duration::from_secs(20);

struct XorShift(u64);

impl XorShift {
    fn next(&mut self) -> u64 {
        let mut x = self.0;
        x ^= x << 13;
        x ^= x >> 7;
        x ^= x << 17;
        self.0 = x;
        x
    }

    fn below(&mut self, n: usize) -> usize {
        (self.next() % n.max(1) as u64) as usize
    }
}

const TOKENS: &[&str] = &[
    "(",
    ")",
    "[",
    "]",
    "{",
    "}",
    ",",
    ":",
    "\"",
    "-",
    "-1",
    "0",
    "1",
    "2",
    "null",
    "true",
    "\"\"",
    "[]",
    "{}",
    "99999999999999999999",
    "4294967296",
    "18446744073709551616",
    "1e308",
    "z^99999999999",
    "2^100000000",
    "sqrt(",
    "zeta(",
    "((((((((((((((((",
    "\"conductor\": 7, ",
    "\"dimension\": 4000000000, ",
    "\u{0}",
    "é",
    "\\u0000",
    "z",
    "i",
    "/0",
    "*",
    "^-1",
];

fn scale() -> usize {
    std::env::var("CYCLORB_MUTATION_SCALE")
        .ok()
        .and_then(|s| s.parse().ok())
        .unwrap_or(1)
}

/// One to three random edits: byte changes, deletions, duplications, token insertions,
/// digit-run replacements, truncation; never the base itself.
fn mutate(base: &[u8], rng: &mut XorShift) -> Vec<u8> {
    loop {
        let v = edit(base, rng);
        if v != base {
            return v;
        }
    }
}

fn edit(base: &[u8], rng: &mut XorShift) -> Vec<u8> {
    let mut v = base.to_vec();
    for _ in 0..1 + rng.below(3) {
        let len = v.len().max(1);
        let at = rng.below(len);
        match rng.below(6) {
            0 if !v.is_empty() => v[at] = b' ' + rng.below(95) as u8,
            1 if !v.is_empty() => {
                let end = (at + 1 + rng.below(16)).min(v.len());
                v.drain(at..end);
            }
            2 if !v.is_empty() => {
                let end = (at + 1 + rng.below(32)).min(v.len());
                let copy = v[at..end].to_vec();
                v.splice(at..at, copy);
            }
            3 => {
                let token = TOKENS[rng.below(TOKENS.len())].as_bytes();
                let at = at.min(v.len());
                v.splice(at..at, token.iter().copied());
            }
            4 => {
                if let Some(start) = (at..v.len()).find(|&i| v[i].is_ascii_digit()) {
                    let end = (start..v.len())
                        .find(|&i| !v[i].is_ascii_digit())
                        .unwrap_or(v.len());
                    let number = match rng.below(4) {
                        0 => "0".to_string(),
                        1 => (rng.next() % 20).to_string(),
                        2 => rng.next().to_string(),
                        _ => "340282366920938463463374607431768211457".to_string(),
                    };
                    v.splice(start..end, number.bytes());
                }
            }
            _ => v.truncate(at),
        }
    }
    v
}

/// Run `f` on `count` mutants of `base`; return (accepted, refused). Panics and slow
/// mutants are collected in `failures` with the mutant's text.
fn campaign(
    name: &str,
    base: &[u8],
    count: usize,
    seed: u64,
    failures: &mut Vec<String>,
    mut f: impl FnMut(&[u8]) -> bool,
) -> (usize, usize) {
    let mut rng = XorShift(seed);
    let (mut accepted, mut refused) = (0, 0);
    for k in 0..count {
        let mutant = mutate(base, &mut rng);
        let started = Instant::now();
        match catch_unwind(AssertUnwindSafe(|| f(&mutant))) {
            Ok(true) => accepted += 1,
            Ok(false) => refused += 1,
            Err(_) => failures.push(format!(
                "{name} mutant {k} panicked: {}",
                String::from_utf8_lossy(&mutant)
            )),
        }
        if started.elapsed() > MUTANT_TIME {
            failures.push(format!(
                "{name} mutant {k} took {:?}: {}",
                started.elapsed(),
                String::from_utf8_lossy(&mutant)
            ));
        }
    }
    (accepted, refused)
}

fn no_progress(_: &Progress) {}

/// A short orbit of a problem (at most 50 lines).
fn short_orbit(problem: &OrbitProblem) -> bool {
    let options = OrbitOptions {
        limit: Some(50),
        threads: 1,
        ..OrbitOptions::default()
    };
    problem.enumerate(&options, &mut no_progress).is_ok()
}

fn library_mutants(failures: &mut Vec<String>) -> Vec<(String, usize, usize)> {
    let n = scale();
    let dir = temp_path("mutation");
    std::fs::create_dir_all(&dir).unwrap();
    let mut figures = Vec::new();

    // theory files (read, then verified; a verified mutant builds its genus-2 twists)
    let ising = theory_to_json(&parse_spec("ising").unwrap()).to_string();
    let theory_path = dir.join("theory.json");
    let (a, r) = campaign(
        "theory file",
        ising.as_bytes(),
        1500 * n,
        11,
        failures,
        |m| {
            std::fs::write(&theory_path, m).unwrap();
            match parse_spec_traced(&theory_path.display().to_string()) {
                Ok(traced) => {
                    if verify(&traced.theory).ok() {
                        if let Ok(space) = cyclorb_mcg::BlockSpace::new(traced.theory, 2) {
                            let _ = space.generators(cyclorb_mcg::GeneratingSet::Humphries);
                        }
                    }
                    true
                }
                Err(_) => false,
            }
        },
    );
    figures.push(("theory file".to_string(), a, r));

    // specs (structural edits and numbers)
    let spec = "ising*conj(fibonacci)*gauge:3(galois:3(zn:3:2))";
    let (a, r) = campaign("spec", spec.as_bytes(), 1000 * n, 12, failures, |m| {
        parse_spec(&String::from_utf8_lossy(m)).is_ok()
    });
    figures.push(("spec".to_string(), a, r));

    // field expressions
    let field = CyclotomicField::new(24).unwrap();
    let expr = "((1 + z)^3/2 - sqrt(2)*zeta(8) + i*sqrt(-3/4))^-2 * (z^5 - 7)/(3 - z)";
    let (a, r) = campaign(
        "field expression",
        expr.as_bytes(),
        2000 * n,
        13,
        failures,
        |m| field.parse(&String::from_utf8_lossy(m)).is_ok(),
    );
    figures.push(("field expression".to_string(), a, r));

    // generator files (read, validated, proved invertible, a short orbit)
    let gens_text = std::fs::read(fixture("orbit/ising-genus1.json")).unwrap();
    let seed_text = std::fs::read(fixture("orbit/vacuum-seed-ising.json")).unwrap();
    let base_seed = Seed::from_json(&String::from_utf8_lossy(&seed_text), "seed").unwrap();
    let base_gens = GeneratorSet::from_json(&String::from_utf8_lossy(&gens_text), "g").unwrap();
    let (a, r) = campaign("generator file", &gens_text, 1500 * n, 14, failures, |m| {
        let Ok(gens) = GeneratorSet::from_json(&String::from_utf8_lossy(m), "mutant") else {
            return false;
        };
        if gens.prove_invertible().is_err() {
            return false;
        }
        match OrbitProblem::new(gens, &base_seed) {
            Ok(problem) => short_orbit(&problem),
            Err(_) => false,
        }
    });
    figures.push(("generator file".to_string(), a, r));

    // seed files
    let (a, r) = campaign("seed file", &seed_text, 1000 * n, 15, failures, |m| {
        let Ok(seed) = Seed::from_json(&String::from_utf8_lossy(m), "mutant") else {
            return false;
        };
        match OrbitProblem::new(base_gens.clone(), &seed) {
            Ok(problem) => short_orbit(&problem),
            Err(_) => false,
        }
    });
    figures.push(("seed file".to_string(), a, r));

    // checkpoints (binary; every byte position is fair game)
    let problem = OrbitProblem::new(base_gens.clone(), &base_seed).unwrap();
    let partial = problem
        .enumerate(
            &OrbitOptions {
                limit: Some(12),
                threads: 1,
                ..OrbitOptions::default()
            },
            &mut no_progress,
        )
        .unwrap();
    let checkpoint = dir.join("orbit.ckpt");
    problem.write_checkpoint(&partial, &checkpoint).unwrap();
    let ckpt_bytes = std::fs::read(&checkpoint).unwrap();
    let mutant_path = dir.join("mutant.ckpt");
    let (a, r) = campaign("checkpoint", &ckpt_bytes, 2000 * n, 16, failures, |m| {
        std::fs::write(&mutant_path, m).unwrap();
        match problem.read_checkpoint(&mutant_path) {
            Ok(orbit) => problem
                .extend(orbit, &OrbitOptions::default(), &mut no_progress)
                .is_ok(),
            Err(_) => false,
        }
    });
    assert_eq!(a, 0, "a changed checkpoint was accepted");
    figures.push(("checkpoint".to_string(), a, r));
    std::fs::remove_dir_all(&dir).ok();
    figures
}

/// Run the binary on a mutant written to `path`; the exit code must be in the contract and
/// stderr free of panics.
fn binary_mutant(path: &Path, args: &[&str], failures: &mut Vec<String>, what: &str) -> bool {
    let started = Instant::now();
    let out = cyclorb(args);
    let code = out.status.code();
    let err = String::from_utf8_lossy(&out.stderr);
    if !matches!(code, Some(0..=3)) || err.contains("panicked") {
        failures.push(format!(
            "{what}: exit {code:?}, stderr {err}, input {}",
            String::from_utf8_lossy(&std::fs::read(path).unwrap_or_default())
        ));
    }
    if started.elapsed() > Duration::from_secs(10) {
        failures.push(format!("{what}: took {:?}", started.elapsed()));
    }
    code == Some(0)
}

#[test]
fn mutants_never_panic_hang_or_abort() {
    // the library readers estimate sizes against the budget, as the program does
    set_memory_budget(512 << 20);
    let started = Instant::now();
    let mut failures = Vec::new();
    let mut figures = library_mutants(&mut failures);

    let dir = temp_path("mutation-binary");
    std::fs::create_dir_all(&dir).unwrap();
    let plan = std::fs::read(fixture("sweeps/small.toml")).unwrap();
    // the plan names ../theories/z3-quarks.json relative to itself
    std::fs::create_dir_all(dir.join("plans")).unwrap();
    std::fs::create_dir_all(dir.join("theories")).unwrap();
    std::fs::copy(
        fixture("theories/z3-quarks.json"),
        dir.join("theories/z3-quarks.json"),
    )
    .unwrap();
    let plan_path = dir.join("plans/plan.toml");
    let out = dir.join("out");
    let mut rng = XorShift(21);
    let (mut accepted, mut total) = (0, 0);
    for k in 0..150 * scale() {
        std::fs::write(&plan_path, mutate(&plan, &mut rng)).unwrap();
        let args = [
            "sweep",
            plan_path.to_str().unwrap(),
            "--dry-run",
            "--out",
            out.to_str().unwrap(),
            "--memory-limit",
            "512",
        ];
        accepted += usize::from(binary_mutant(
            &plan_path,
            &args,
            &mut failures,
            &format!("plan {k}"),
        ));
        total += 1;
    }
    figures.push((
        "plan (binary, --dry-run)".to_string(),
        accepted,
        total - accepted,
    ));

    let ising = theory_to_json(&parse_spec("ising").unwrap()).to_string();
    let theory_path = dir.join("theory.json");
    let (mut accepted, mut total) = (0, 0);
    for k in 0..60 * scale() {
        std::fs::write(&theory_path, mutate(ising.as_bytes(), &mut rng)).unwrap();
        let args = [
            "orbit",
            theory_path.to_str().unwrap(),
            "--genus",
            "1",
            "--limit",
            "200",
            "--memory-limit",
            "512",
            "--json",
        ];
        accepted += usize::from(binary_mutant(
            &theory_path,
            &args,
            &mut failures,
            &format!("theory {k}"),
        ));
        total += 1;
    }
    figures.push((
        "theory file (binary, orbit)".to_string(),
        accepted,
        total - accepted,
    ));

    // certificate files read by `cyclorb check`: the structure certificate of Ising at genus 1
    let certificate_path = dir.join("certificate.json");
    let base_path = dir.join("base-certificate.json");
    let written = cyclorb(&[
        "orbit",
        "ising",
        "--genus",
        "1",
        "--method",
        "structure",
        "--out",
        base_path.to_str().unwrap(),
    ]);
    assert_eq!(written.status.code(), Some(0));
    let certificate = std::fs::read(&base_path).unwrap();
    let (mut accepted, mut total) = (0, 0);
    for k in 0..60 * scale() {
        std::fs::write(&certificate_path, mutate(&certificate, &mut rng)).unwrap();
        let args = [
            "check",
            certificate_path.to_str().unwrap(),
            "--memory-limit",
            "512",
            "--json",
        ];
        accepted += usize::from(binary_mutant(
            &certificate_path,
            &args,
            &mut failures,
            &format!("certificate {k}"),
        ));
        total += 1;
    }
    figures.push((
        "certificate (binary, check)".to_string(),
        accepted,
        total - accepted,
    ));
    std::fs::remove_dir_all(&dir).ok();

    let mutants: usize = figures.iter().map(|(_, a, r)| a + r).sum();
    for (name, a, r) in &figures {
        eprintln!(
            "{name:>28}: {:>5} mutants, {a:>5} accepted, {r:>5} refused",
            a + r
        );
    }
    eprintln!(
        "{mutants} mutants in {:.1} s",
        started.elapsed().as_secs_f64()
    );
    assert!(
        failures.is_empty(),
        "{} failures:\n{}",
        failures.len(),
        failures.join("\n")
    );
    // the campaigns must reach past the readers' first checks: some mutants of every input
    // but the checkpoint (which refuses every change) are accepted and used
    for (name, a, r) in &figures {
        assert!(*r > 0, "{name}: no mutant was refused");
        assert!(
            *a > 0 || name == "checkpoint",
            "{name}: no mutant was accepted"
        );
    }
}
