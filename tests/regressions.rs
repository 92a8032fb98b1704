//! One test per reported failure of issue 15 ("answers that can be trusted"), each with the
//! clean outcome now expected: exit 1 with a named reason, exit 2 for a usage error, or exit
//! 3 with a partial result. Every test bounds its own time by the size of what it runs.

mod run_cli;

use std::io::Read;
use std::path::{Path, PathBuf};
use std::process::{Output, Stdio};
use std::time::{Duration, Instant};

use run_cli::{command, cyclorb, cyclorb_json, temp_path, test_cache};
use serde_json::Value;

fn text(bytes: &[u8]) -> String {
    String::from_utf8_lossy(bytes).into_owned()
}

/// The outcome must be exit 1 with every `needle` in stderr, no panic, within `seconds`.
fn refused(args: &[&str], needles: &[&str], seconds: u64) -> String {
    let started = Instant::now();
    let out = cyclorb(args);
    let err = text(&out.stderr);
    assert_eq!(
        out.status.code(),
        Some(1),
        "{args:?}: {err}\n{}",
        text(&out.stdout)
    );
    assert!(!err.contains("panicked"), "{args:?}: {err}");
    for needle in needles {
        assert!(err.contains(needle), "{args:?}: {needle:?} not in {err}");
    }
    assert!(
        started.elapsed() < Duration::from_secs(seconds),
        "{args:?} took {:?}",
        started.elapsed()
    );
    err
}

fn folder(tag: &str) -> PathBuf {
    let dir = temp_path(tag);
    std::fs::create_dir_all(&dir).unwrap();
    dir
}

/// `cyclorb describe SPEC --json`, written to `dir/name` (a valid theory file).
fn theory_file(spec: &str, dir: &Path, name: &str) -> (PathBuf, Value) {
    let (code, value) = cyclorb_json(&["describe", spec]);
    assert_eq!(code, 0);
    let path = dir.join(name);
    std::fs::write(&path, value.to_string()).unwrap();
    (path, value)
}

fn write_json(path: &Path, value: &Value) -> String {
    std::fs::write(path, value.to_string()).unwrap();
    path.display().to_string()
}

// ---- only proved data are used ----------------------------------------------------------

#[test]
fn fibonacci_with_zero_dimension_is_refused_naming_the_check() {
    let dir = folder("fib-d0");
    let (_, mut fib) = theory_file("fibonacci", &dir, "fib.json");
    fib["dimensions"]["tau"] = Value::from("0");
    // without the informational D, which would no longer match Σ d² and be refused on reading
    fib.as_object_mut().unwrap().remove("total_dimension");
    let bad = write_json(&dir.join("fib-d0.json"), &fib);
    // was: "1 lines, saturated", exit 0
    refused(
        &["orbit", &bad, "--genus", "2"],
        &[
            "fib-d0.json",
            "check dimensions",
            "d_a d_b = Σ_c N_ab^c d_c",
        ],
        20,
    );
    // was: "finite, order 125", exit 0
    refused(&["image", &bad, "--genus", "2"], &["check dimensions"], 20);
    for cmd in ["commutant", "witness", "twists"] {
        refused(&[cmd, &bad, "--genus", "2"], &["check dimensions"], 20);
    }
    refused(
        &["orbit", &bad, "--genus", "2", "--method", "structure"],
        &["check dimensions"],
        20,
    );
    // a product with a built-in still proves the file factor
    let product = format!("ising*{bad}");
    refused(
        &["orbit", &product, "--genus", "1", "--method", "product"],
        &["check dimensions"],
        20,
    );
    // the expert's opt-out answers, and says the answer is not established
    let (code, v) = cyclorb_json(&["orbit", &bad, "--genus", "2", "--unverified"]);
    assert_eq!(code, 0, "{v}");
    assert_eq!(v["verified"], false);
    let out = cyclorb(&["orbit", &bad, "--genus", "2", "--unverified"]);
    assert!(text(&out.stdout).contains("verified: false"));
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn an_ising_mutant_failing_verify_is_refused() {
    let dir = folder("ising-mutant");
    let (_, mut ising) = theory_file("ising", &dir, "ising.json");
    // R^{σσ}_1 multiplied by −1: the hexagons and the twist fail
    let r = ising["R"].as_array_mut().unwrap();
    let entry = r
        .iter_mut()
        .find(|e| e[0] == "sigma" && e[1] == "sigma" && e[2] == "1")
        .expect("R^{σσ}_1 is listed");
    let value = entry[3].as_str().unwrap().to_string();
    entry[3] = Value::from(format!("-({value})"));
    let bad = write_json(&dir.join("ising-mutant.json"), &ising);
    let err = refused(
        &["orbit", &bad, "--genus", "2"],
        &["fails verification"],
        20,
    );
    assert!(err.contains("hexagon") || err.contains("twist"), "{err}");
    refused(
        &["image", &bad, "--genus", "2"],
        &["fails verification"],
        20,
    );
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn a_valid_file_is_proved_once_and_answers_say_verified() {
    let dir = folder("valid-file");
    let (path, value) = theory_file("ising", &dir, "ising.json");
    let p = path.display().to_string();
    let (code, v) = cyclorb_json(&["orbit", &p, "--genus", "2"]);
    assert_eq!(code, 0, "{v}");
    assert_eq!(v["verified"], true);
    assert_eq!(v["orbit_size"], 3840);
    let hash = value["data_hash"].as_str().unwrap();
    let entry = test_cache()
        .join("cyclorb")
        .join("verified")
        .join(format!("{hash}.json"));
    assert!(entry.is_file(), "no cache entry at {}", entry.display());
    // built-ins carry the test suite's proof
    let (_, v) = cyclorb_json(&["orbit", "ising", "--genus", "1"]);
    assert_eq!(v["verified"], true);
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn a_forged_cache_entry_does_not_prove_a_failing_file() {
    let dir = folder("forged-cache");
    let (_, mut fib) = theory_file("fibonacci", &dir, "fib.json");
    fib["dimensions"]["tau"] = Value::from("0");
    // without the informational D, which would no longer match Σ d² and be refused on reading
    fib.as_object_mut().unwrap().remove("total_dimension");
    let bad = write_json(&dir.join("fib-d0.json"), &fib);
    // the failing file's own data hash, as `describe` computes it
    let (_, described) = cyclorb_json(&["describe", "--unverified", &bad]);
    let hash = described["data_hash"].as_str().unwrap().to_string();
    // a valid file creates the key and one genuine entry to copy
    let (good, good_value) = theory_file("ising", &dir, "ising.json");
    let (code, _) = cyclorb_json(&["orbit", good.to_str().unwrap(), "--genus", "1"]);
    assert_eq!(code, 0);
    let verified = test_cache().join("cyclorb").join("verified");
    let genuine = std::fs::read_to_string(verified.join(format!(
        "{}.json",
        good_value["data_hash"].as_str().unwrap()
    )))
    .unwrap();
    let mut forged: Value = serde_json::from_str(&genuine).unwrap();
    forged["data_hash"] = Value::from(hash.clone());
    std::fs::write(verified.join(format!("{hash}.json")), forged.to_string()).unwrap();
    refused(&["orbit", &bad, "--genus", "2"], &["check dimensions"], 20);
    std::fs::remove_dir_all(&dir).ok();
}

/// The ising genus-1 generator file of the fixtures with S replaced by `rows`.
fn raw_generators(dir: &Path, rows: Value) -> String {
    let text = std::fs::read_to_string(run_cli::fixture("orbit/ising-genus1.json")).unwrap();
    let mut gens: Value = serde_json::from_str(&text).unwrap();
    gens["generators"][1]["rows"] = rows;
    write_json(&dir.join("gens.json"), &gens)
}

#[test]
fn a_singular_raw_generator_is_refused() {
    let dir = folder("singular");
    let gens = raw_generators(
        &dir,
        serde_json::json!([["1", "1", "0"], ["1", "1", "0"], ["0", "0", "1"]]),
    );
    let seed = run_cli::fixture("orbit/vacuum-seed-ising.json");
    // was: "17 lines, saturated", exit 0
    refused(
        &[
            "orbit",
            "--matrices",
            &gens,
            "--seed",
            seed.to_str().unwrap(),
        ],
        &["generator S is singular", "rank 2 of 3"],
        20,
    );
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn an_infinite_order_raw_generator_honours_the_limit() {
    let dir = folder("infinite-order");
    let gens = raw_generators(
        &dir,
        serde_json::json!([["1", "0", "0"], ["0", "2", "0"], ["0", "0", "-1"]]),
    );
    let seed = dir.join("seed.json");
    std::fs::write(
        &seed,
        r#"{"format": "cyclorb-seed", "version": 1, "conductor": 16, "vector": ["1", "1", "1"]}"#,
    )
    .unwrap();
    let started = Instant::now();
    let (code, v) = cyclorb_json(&[
        "orbit",
        "--matrices",
        &gens,
        "--seed",
        seed.to_str().unwrap(),
        "--limit",
        "100000",
    ]);
    assert_eq!(code, 3, "{v}");
    assert_eq!(v["saturated"], false);
    assert_eq!(v["orbit_size"], 100_000);
    // was: minutes (the size of the store's big keys was summed after every chunk); now
    // about 6 s on two shared cores
    assert!(
        started.elapsed() < Duration::from_secs(60),
        "{:?}",
        started.elapsed()
    );
    std::fs::remove_dir_all(&dir).ok();
}

// ---- no panic, no hang on bad input -----------------------------------------------------

#[test]
fn a_closed_stdout_ends_quietly() {
    let mut child = command()
        .args(["orbit", "ising", "--genus", "2", "--json"])
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    drop(child.stdout.take()); // the reader went away before anything was written
    let mut err = String::new();
    child
        .stderr
        .take()
        .unwrap()
        .read_to_string(&mut err)
        .unwrap();
    let status = child.wait().unwrap();
    assert_ne!(status.code(), Some(101), "{err}");
    assert!(!err.contains("panicked"), "{err}");
}

#[test]
fn deep_nesting_is_refused_everywhere() {
    let parens = format!("{}1{}", "(".repeat(5200), ")".repeat(5200));
    refused(&["field", "-n", "8", &parens], &["nesting deeper than"], 10);
    let conj = format!("{}ising{}", "conj(".repeat(1400), ")".repeat(1400));
    refused(&["describe", &conj], &["nesting deeper than"], 10);
    let dir = folder("deep-value");
    let (_, mut ising) = theory_file("ising", &dir, "ising.json");
    ising["twists"]["psi"] = Value::from(format!("{}-1{}", "(".repeat(5200), ")".repeat(5200)));
    let bad = write_json(&dir.join("deep.json"), &ising);
    refused(
        &["describe", &bad],
        &["deep.json", "twists", "nesting deeper than"],
        10,
    );
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn huge_exponents_are_refused_quickly() {
    for e in ["2^1099511627776", "(1+z)^99999999999", "2^100000000"] {
        refused(&["field", "-n", "8", e], &["power too large"], 5);
    }
}

#[test]
fn square_roots_of_big_rationals_are_found() {
    let (code, v) = cyclorb_json(&["field", "-n", "8", "sqrt(2^64)", "sqrt(2^65/3^40)"]);
    assert_eq!(code, 0, "{v}");
    assert_eq!(v["values"][0]["value"], "4294967296");
    assert_eq!(
        v["values"][1]["value"],
        "(4294967296*z - 4294967296*z^3)/3486784401"
    );
}

#[test]
fn negative_parameters_are_refused_as_written() {
    // was: silently gauge:1
    refused(
        &["describe", "gauge:-1(ising)"],
        &["gauge seed -1 must be non-negative"],
        5,
    );
    // was: quoted as "su2:0"
    refused(&["describe", "su2:-1"], &["\"su2:-1\""], 5);
}

#[test]
fn a_repeated_json_key_is_refused() {
    let dir = folder("repeated-key");
    let (path, _) = theory_file("ising", &dir, "ising.json");
    let doubled = std::fs::read_to_string(&path)
        .unwrap()
        .replacen('{', "{\"conductor\": 7, ", 1);
    std::fs::write(&path, doubled).unwrap();
    refused(
        &["describe", path.to_str().unwrap()],
        &["ising.json", "repeated key \"conductor\""],
        5,
    );
    let gens = std::fs::read_to_string(run_cli::fixture("orbit/ising-genus1.json"))
        .unwrap()
        .replacen('{', "{\"dimension\": 4, ", 1);
    let gens_path = dir.join("gens.json");
    std::fs::write(&gens_path, gens).unwrap();
    let seed = run_cli::fixture("orbit/vacuum-seed-ising.json");
    refused(
        &[
            "orbit",
            "--matrices",
            gens_path.to_str().unwrap(),
            "--seed",
            seed.to_str().unwrap(),
        ],
        &["gens.json", "repeated key \"dimension\""],
        5,
    );
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn resume_with_the_structure_method_is_refused() {
    refused(
        &[
            "orbit",
            "ising",
            "--genus",
            "2",
            "--method",
            "structure",
            "--resume",
            "x.ckpt",
        ],
        &["--method structure keeps no checkpoints"],
        5,
    );
}

#[test]
fn too_many_threads_is_a_usage_error() {
    let out: Output = cyclorb(&["orbit", "ising", "--genus", "2", "--threads", "3000"]);
    assert_eq!(out.status.code(), Some(2));
    assert!(text(&out.stderr).contains("from 1 to 256"));
}

// ---- every size known before it is spent ------------------------------------------------
// The budget is given explicitly (4 GiB) so that the outcome does not depend on the machine.

#[test]
fn oversized_block_spaces_are_refused_at_once() {
    refused(
        &["twists", "ising", "--genus", "11", "--memory-limit", "4096"],
        &[
            "genus-11 block space of ising (dimension 2098176)",
            "--memory-limit",
        ],
        5,
    );
    // --limit cannot help: the space was built before the first line
    refused(
        &[
            "orbit",
            "su2:4",
            "--genus",
            "6",
            "--limit",
            "10",
            "--memory-limit",
            "4096",
        ],
        &[
            "genus-6 block space of su2:4 (dimension 499955)",
            "by estimate",
        ],
        5,
    );
    let dir = folder("plan-g12");
    let plan = dir.join("g12.toml");
    std::fs::write(&plan, "[[theory]]\nspec = \"ising\"\ngenera = [12]\n").unwrap();
    let out = dir.join("out");
    refused(
        &[
            "sweep",
            plan.to_str().unwrap(),
            "--dry-run",
            "--out",
            out.to_str().unwrap(),
            "--memory-limit",
            "4096",
        ],
        &[
            "g12.toml:2",
            "genus-12 block space of ising",
            "--memory-limit",
        ],
        5,
    );
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn oversized_theories_and_fields_are_refused_at_once() {
    refused(
        &["describe", "su2:30", "--memory-limit", "4096"],
        &["every F-symbol of su2:30", "by estimate"],
        10,
    );
    refused(
        &[
            "describe",
            "ising*ising*ising*ising*ising",
            "--memory-limit",
            "512",
        ],
        &["the product", "by estimate"],
        10,
    );
    refused(
        &["field", "-n", "19997", "1", "--memory-limit", "1024"],
        &["the field Q(ζ_19997)", "--memory-limit"],
        5,
    );
    // the flag lifts the budget: a small theory under a small budget still works
    let (code, _) = cyclorb_json(&["describe", "su2:3", "--memory-limit", "64"]);
    assert_eq!(code, 0);
}

// ---- nothing lost, nothing forged -------------------------------------------------------

#[test]
fn an_unwritable_checkpoint_path_is_refused_before_work() {
    let missing = temp_path("no-such-folder").join("orbit.ckpt");
    refused(
        &[
            "orbit",
            "ising",
            "--genus",
            "2",
            "--checkpoint",
            missing.to_str().unwrap(),
        ],
        &["orbit.ckpt cannot be written"],
        5,
    );
}

fn small_sweep(dir: &Path) -> (i32, Value) {
    let plan = dir.join("one.toml");
    std::fs::write(
        &plan,
        "answers = [\"orbit\"]\n[[theory]]\nspec = \"ising\"\ngenera = [1]\n",
    )
    .unwrap();
    let out = dir.join("out");
    cyclorb_json(&[
        "sweep",
        plan.to_str().unwrap(),
        "--out",
        out.to_str().unwrap(),
    ])
}

#[test]
fn an_edited_stored_result_is_detected_and_recomputed() {
    let dir = folder("sweep-edited");
    let (code, first) = small_sweep(&dir);
    assert_eq!(code, 0, "{first}");
    let size = first["runs"][0]["orbit_size"].clone();
    let result = dir.join("out/runs/ising-g1/result.json");
    assert!(dir.join("out/runs/ising-g1/result.json.sha256").is_file());
    // an unchanged result is reused without comment
    let (_, again) = small_sweep(&dir);
    assert_eq!(again["notes"], serde_json::json!([]));
    // a hand edit (orbit_size 25) is detected
    let mut edited: Value =
        serde_json::from_str(&std::fs::read_to_string(&result).unwrap()).unwrap();
    edited["orbit_size"] = Value::from(25);
    std::fs::write(&result, serde_json::to_string_pretty(&edited).unwrap()).unwrap();
    let (code, v) = small_sweep(&dir);
    assert_eq!(code, 0, "{v}");
    assert_eq!(v["runs"][0]["orbit_size"], size);
    let notes = v["notes"].to_string();
    assert!(notes.contains("does not match its digest"), "{notes}");
    assert!(notes.contains("recomputing"), "{notes}");
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn a_corrupt_run_checkpoint_is_reported() {
    let dir = folder("sweep-corrupt-checkpoint");
    let run = dir.join("out/runs/ising-g1");
    std::fs::create_dir_all(&run).unwrap();
    std::fs::write(run.join("checkpoint.bin"), b"not a checkpoint at all").unwrap();
    let (code, v) = small_sweep(&dir);
    assert_eq!(code, 0, "{v}");
    let notes = v["notes"].to_string();
    assert!(notes.contains("checkpoint.bin is unusable"), "{notes}");
    assert_eq!(v["runs"][0]["resumed"], false);
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn a_file_too_large_for_the_budget_is_refused_before_reading() {
    let dir = folder("big-file");
    let (path, value) = theory_file("ising", &dir, "ising.json");
    // the same data after four million spaces
    let padded = format!("{}{}", " ".repeat(4_000_000), value);
    std::fs::write(&path, padded).unwrap();
    refused(
        &[
            "orbit",
            path.to_str().unwrap(),
            "--genus",
            "1",
            "--memory-limit",
            "64",
        ],
        &["reading", "ising.json", "--memory-limit"],
        5,
    );
    let (code, v) = cyclorb_json(&["orbit", path.to_str().unwrap(), "--genus", "1"]);
    assert_eq!(code, 0, "{v}");
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn dense_generators_past_the_budget_are_refused_before_they_are_built() {
    // Ising at genus 7 (dim 8256, Verlinde: 2^6·(2^7 + 1)) as 15 dense matrices is tens of
    // GiB; the certificate commands (and `cyclorb check` on a certificate whose genus was
    // changed to 7) used to start building them.
    refused(
        &[
            "commutant",
            "ising",
            "--genus",
            "7",
            "--memory-limit",
            "512",
        ],
        &["dense generator matrices", "--memory-limit"],
        30,
    );
}

#[test]
fn a_huge_genus_is_refused_at_once() {
    // the size estimate iterated once per handle: genus 3·10¹⁸ (a mutated certificate) hung
    refused(
        &[
            "commutant",
            "ising",
            "--genus",
            "3009911920519387700",
            "--memory-limit",
            "512",
        ],
        &["genus-3009911920519387700", "--memory-limit"],
        30,
    );
}

#[test]
fn structural_verify_counts_only_the_building_blocks_f_symbols() {
    // The structural route proves the F/R equations of a Deligne product on its factors, so
    // only the factors' F-symbols are computed in full: a product whose own F-symbols would
    // pass the budget (about 100 MiB for so3:5*so3:7) still verifies under 40 MiB, while the
    // direct route is refused before computing them. (Both factors are modular: SO(3)_k for
    // odd k, common practice.)
    let (code, v) = cyclorb_json(&["--memory-limit", "40", "verify", "so3:5*so3:7"]);
    assert_eq!(code, 0, "{v}");
    assert_eq!(v["ok"], true);
    let pentagon = v["checks"]
        .as_array()
        .unwrap()
        .iter()
        .find(|c| c["name"] == "pentagon")
        .unwrap();
    assert_eq!(pentagon["proved_on"], serde_json::json!(["so3:5", "so3:7"]));
    refused(
        &["--memory-limit", "40", "verify", "so3:5*so3:7", "--direct"],
        &["every F-symbol of so3:5*so3:7", "--memory-limit"],
        60,
    );
}
