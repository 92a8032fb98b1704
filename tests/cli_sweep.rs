//! `cyclorb sweep`: results against published values, kill-and-resume, plan refusals.

use std::path::{Path, PathBuf};
use std::process::{Child, Command, Output, Stdio};
use std::time::{Duration, Instant};

use serde_json::Value;

const BIN: &str = env!("CARGO_BIN_EXE_cyclorb");

fn fixture(name: &str) -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("fixtures/sweeps")
        .join(name)
}

/// A fresh folder under the system temp dir, removed when dropped.
struct Scratch(PathBuf);

impl Scratch {
    fn new(name: &str) -> Scratch {
        let dir = std::env::temp_dir().join(format!("cyclorb-sweep-{name}-{}", std::process::id()));
        let _ = std::fs::remove_dir_all(&dir);
        std::fs::create_dir_all(&dir).unwrap();
        Scratch(dir)
    }

    fn path(&self, name: &str) -> PathBuf {
        self.0.join(name)
    }
}

impl Drop for Scratch {
    fn drop(&mut self) {
        let _ = std::fs::remove_dir_all(&self.0);
    }
}

/// The cache folder of this test process (remembered proofs stay out of the user's cache).
fn test_cache() -> std::path::PathBuf {
    std::env::temp_dir().join(format!("cyclorb-test-{}-cache", std::process::id()))
}

fn sweep(plan: &Path, out: &Path) -> Output {
    Command::new(BIN)
        .env("XDG_CACHE_HOME", test_cache())
        .args(["--json", "sweep"])
        .arg(plan)
        .arg("--out")
        .arg(out)
        .output()
        .unwrap()
}

fn spawn_sweep(plan: &Path, out: &Path) -> Child {
    Command::new(BIN)
        .env("XDG_CACHE_HOME", test_cache())
        .args(["--json", "sweep"])
        .arg(plan)
        .arg("--out")
        .arg(out)
        .stdout(Stdio::null())
        .stderr(Stdio::null())
        .spawn()
        .unwrap()
}

fn json_of(output: &Output) -> Value {
    serde_json::from_slice(&output.stdout).unwrap_or_else(|e| {
        panic!(
            "stdout is not one JSON object ({e}); stderr: {}",
            String::from_utf8_lossy(&output.stderr)
        )
    })
}

fn run_of<'a>(report: &'a Value, id: &str) -> &'a Value {
    report["runs"]
        .as_array()
        .unwrap()
        .iter()
        .find(|r| r["id"] == id)
        .unwrap_or_else(|| panic!("no run {id} in {report}"))
}

fn wait_for(path: &Path) {
    let start = Instant::now();
    while !path.exists() {
        assert!(
            start.elapsed() < Duration::from_secs(120),
            "{} never appeared",
            path.display()
        );
        std::thread::sleep(Duration::from_millis(5));
    }
}

/// The CSV summary without the columns that measure cost (time, memory).
fn summary_without_costs(out: &Path) -> Vec<Vec<String>> {
    let text = std::fs::read_to_string(out.join("summary.csv")).unwrap();
    let mut lines = text
        .lines()
        .map(|l| l.split(',').map(str::to_string).collect::<Vec<String>>());
    let header = lines.next().unwrap();
    let keep: Vec<usize> = (0..header.len())
        .filter(|&i| header[i] != "seconds" && header[i] != "peak_memory_mib")
        .collect();
    std::iter::once(header)
        .chain(lines)
        .map(|row| keep.iter().map(|&i| row[i].clone()).collect())
        .collect()
}

#[test]
fn small_sweep_matches_published_values() {
    let scratch = Scratch::new("small");
    let out = scratch.path("out");
    let output = sweep(&fixture("small.toml"), &out);
    assert_eq!(output.status.code(), Some(0), "{:?}", output);
    let report = json_of(&output);
    // Castro, Gaberdiel, Hartman, Maloney, Volpato, Phys. Rev. D 85, 024032 (2012):
    // Ising at genus 1, 24 lines with B = 8·I.
    let ising1 = run_of(&report, "ising-g1");
    assert_eq!(ising1["orbit_size"], 24);
    assert_eq!(ising1["saturated"], true);
    assert_eq!(ising1["poincare_sum"]["prefactor"], "8");
    // The all-genus follow-up (2019): Ising at genus 2, 3840 lines with B = 384·I.
    let ising2 = run_of(&report, "ising-g2");
    assert_eq!(ising2["dimension"], 10); // Verlinde 1988: dim V_2 = 10 for Ising
    assert_eq!(ising2["orbit_size"], 3840);
    assert_eq!(ising2["poincare_sum"]["prefactor"], "384");
    assert_eq!(ising2["image"]["finite"], true);
    // Same 2012 paper: tricritical Ising at genus 1, B = 48·I.
    let tri1 = run_of(&report, "tricritical-ising-g1");
    assert_eq!(tri1["poincare_sum"]["prefactor"], "48");
    // Fibonacci at genus 1: the projective image of SL(2, Z) is A_5, order 60 (level-5
    // congruence representation; from memory).
    let fib1 = run_of(&report, "fibonacci-g1");
    assert_eq!(fib1["image"]["order"], "60");
    // Larsen–Wang 2005 (density of the SO(3) quantum representations): the Fibonacci image
    // at genus 2 is infinite, so the orbit does not close and a witness exists.
    let fib2 = run_of(&report, "fibonacci-g2");
    assert_eq!(fib2["saturated"], false);
    assert_eq!(fib2["stop_reason"], "limit");
    assert_eq!(fib2["orbit_size"], 3000);
    assert_eq!(fib2["poincare_sum"]["prefactor"], Value::Null);
    assert_eq!(fib2["witness"]["found"], true);
    assert_eq!(fib2["image"]["finite"], false);
    // A theory file named relative to the plan: it holds the data of the built-in zn:3:2
    // (θ_q = ζ_3), so both give the same orbit.
    let file = run_of(&report, "z3-quarks-g1");
    let builtin = run_of(&report, "zn-3-2-g1");
    assert_eq!(file["saturated"], true);
    assert_eq!(file["orbit_size"], builtin["orbit_size"]);
    assert_eq!(file["layer_sizes"], builtin["layer_sizes"]);
    // citation data and files
    for r in report["runs"].as_array().unwrap() {
        assert_eq!(
            r["citation"]["theory_data_hash"].as_str().unwrap().len(),
            64
        );
        assert_eq!(r["citation"]["program_version"], env!("CARGO_PKG_VERSION"));
        assert!(r["citation"]["command"].as_str().unwrap().contains("sweep"));
        let stored = out
            .join("runs")
            .join(r["id"].as_str().unwrap())
            .join("result.json");
        let stored: Value =
            serde_json::from_str(&std::fs::read_to_string(stored).unwrap()).unwrap();
        assert_eq!(&stored, r);
    }
    let files: Vec<&str> = report["report_files"]
        .as_array()
        .unwrap()
        .iter()
        .map(|f| f.as_str().unwrap())
        .collect();
    assert_eq!(files.len(), 3);
    let md = std::fs::read_to_string(out.join("summary.md")).unwrap();
    assert!(md.contains("| ising | 2 | 10 | 3840 | 384 |"), "{md}");
    assert!(md.contains("not closed after 3000 (limit)"), "{md}");
    // the command as a user types it, not the path of the test binary
    assert!(md.contains("Command: `cyclorb --json sweep "), "{md}");
    assert!(!md.contains(BIN), "{md}");
    let csv = summary_without_costs(&out);
    assert_eq!(csv.len(), 1 + 7);
    let svg = std::fs::read_to_string(out.join("growth.svg")).unwrap();
    assert!(svg.starts_with("<svg") && svg.trim_end().ends_with("</svg>"));
    for label in ["ising", "tricritical-ising", "fibonacci"] {
        assert!(
            svg.contains(&format!(">{label}</text>")),
            "legend lacks {label}"
        );
    }
}

#[test]
fn a_witness_alone_on_a_product_comes_from_a_factor() {
    // Tricritical Ising = conj(fibonacci) ⊠ ising:7; the Fibonacci factor has a dense
    // genus-2 image (Larsen–Wang 2005), so a run that asks for the witness alone finds it on
    // that factor without building the product's generators (docs/minimal-models.md,
    // "Witnesses lifted from a factor"); the direct route on Fibonacci itself finds one too.
    let scratch = Scratch::new("lifted");
    let plan = scratch.path("lifted.toml");
    std::fs::write(
        &plan,
        "answers = [\"witness\"]\n\n[[theory]]\nspec = \"tricritical-ising\"\ngenera = [2]\n\n\
         [[theory]]\nspec = \"fibonacci\"\ngenera = [2]\n",
    )
    .unwrap();
    let output = sweep(&plan, &scratch.path("out"));
    assert_eq!(output.status.code(), Some(0));
    let report = json_of(&output);
    let tri = run_of(&report, "tricritical-ising-g2");
    assert_eq!(tri["witness"]["found"], true, "{tri}");
    assert_eq!(
        tri["witness"]["lifted_from_factor"]["theory"],
        "conj(fibonacci)"
    );
    assert_eq!(tri["orbit_size"], Value::Null);
    assert_eq!(tri["generators"], 5);
    let fib = run_of(&report, "fibonacci-g2");
    assert_eq!(fib["witness"]["found"], true, "{fib}");
    assert_eq!(fib["witness"]["lifted_from_factor"], Value::Null);
}

#[test]
fn dry_run_lists_runs_smallest_first() {
    let output = Command::new(BIN)
        .env("XDG_CACHE_HOME", test_cache())
        .args(["--json", "sweep", "--dry-run"])
        .arg(fixture("small.toml"))
        .output()
        .unwrap();
    assert_eq!(output.status.code(), Some(0));
    let report = json_of(&output);
    let order: Vec<(&str, u64)> = report["runs"]
        .as_array()
        .unwrap()
        .iter()
        .map(|r| (r["id"].as_str().unwrap(), r["dimension"].as_u64().unwrap()))
        .collect();
    // Verlinde 1988: dim V_1 = rank (Fibonacci 2, Ising and Z_3 3, tricritical Ising 6),
    // dim V_2 = 5 for Fibonacci and 10 for Ising. Equal dimensions go by the degree of the
    // field (φ(12) = 4 before φ(16) = 8), then plan order.
    assert_eq!(
        order,
        vec![
            ("fibonacci-g1", 2),
            ("z3-quarks-g1", 3),
            ("zn-3-2-g1", 3),
            ("ising-g1", 3),
            ("fibonacci-g2", 5),
            ("tricritical-ising-g1", 6),
            ("ising-g2", 10)
        ]
    );
}

const RESUME_PLAN: &str = "threads = 1\nanswers = [\"orbit\"]\ncheckpoint_seconds = 1\n\n\
[[theory]]\nspec = \"ising\"\ngenera = [1, 2]\n\n\
[[theory]]\nspec = \"fibonacci\"\ngenera = [2]\nlimits = { lines = 150000 }\n";

#[test]
fn killed_sweep_resumes_to_the_same_summary() {
    let scratch = Scratch::new("resume");
    let plan = scratch.path("resume.toml");
    std::fs::write(&plan, RESUME_PLAN).unwrap();
    let reference = scratch.path("reference");
    assert_eq!(sweep(&plan, &reference).status.code(), Some(0));
    let expected = summary_without_costs(&reference);
    assert_eq!(expected.len(), 4);

    // SIGKILL right after the first run (ising-g1) has its result: restarting skips it
    // (its file is untouched) and redoes the rest.
    let killed = scratch.path("killed");
    let mut child = spawn_sweep(&plan, &killed);
    let first = killed.join("runs/ising-g1/result.json");
    wait_for(&first);
    child.kill().unwrap();
    child.wait().unwrap();
    let before = std::fs::read(&first).unwrap();
    let again = sweep(&plan, &killed);
    assert_eq!(again.status.code(), Some(0));
    assert_eq!(
        std::fs::read(&first).unwrap(),
        before,
        "finished run was redone"
    );
    assert_eq!(summary_without_costs(&killed), expected);

    // SIGTERM during the long Fibonacci run: exit 3 with its checkpoint written; the
    // restart continues from the checkpoint to the identical orbit.
    let stopped = scratch.path("stopped");
    let child = spawn_sweep(&plan, &stopped);
    wait_for(&stopped.join("runs/ising-g1/result.json"));
    wait_for(&stopped.join("runs/fibonacci-g2"));
    std::thread::sleep(Duration::from_millis(100));
    let status = Command::new("kill")
        .args(["-TERM", &child.id().to_string()])
        .status()
        .unwrap();
    assert!(status.success());
    let output = child.wait_with_output().unwrap();
    assert_eq!(output.status.code(), Some(3));
    assert!(stopped.join("runs/fibonacci-g2/checkpoint.bin").exists());
    assert!(!stopped.join("runs/fibonacci-g2/result.json").exists());
    let resumed = sweep(&plan, &stopped);
    assert_eq!(resumed.status.code(), Some(0));
    let report = json_of(&resumed);
    let fib = run_of(&report, "fibonacci-g2");
    assert_eq!(fib["resumed"], true);
    let reference_fib: Value = serde_json::from_str(
        &std::fs::read_to_string(reference.join("runs/fibonacci-g2/result.json")).unwrap(),
    )
    .unwrap();
    assert_eq!(fib["layer_sizes"], reference_fib["layer_sizes"]);
    assert_eq!(fib["orbit_size"], 150000);
    assert_eq!(summary_without_costs(&stopped), expected);
}

fn refusal(scratch: &Scratch, name: &str, text: &str) -> String {
    let plan = scratch.path(name);
    std::fs::write(&plan, text).unwrap();
    let out = scratch.path(&format!("{name}-out"));
    let output = sweep(&plan, &out);
    assert_eq!(output.status.code(), Some(1), "{name} was accepted");
    assert!(output.stdout.is_empty());
    assert!(
        !out.exists(),
        "{name}: output folder made for a refused plan"
    );
    String::from_utf8(output.stderr).unwrap()
}

#[test]
fn malformed_plans_are_refused_with_line_and_reason() {
    let scratch = Scratch::new("refusals");
    let cases = [
        (
            "syntax.toml",
            "[[theory]]\nspec = \"ising\"\ngenera = [1, 2\n",
            "syntax.toml:3:",
            "",
        ),
        (
            "genus.toml",
            "[[theory]]\nspec = \"ising\"\ngenera = [1, 0]\n",
            "genus.toml:3:",
            "genus must be at least 1",
        ),
        (
            "answer.toml",
            "answers = [\"orbit\", \"size\"]\n[[theory]]\nspec = \"ising\"\ngenera = [1]\n",
            "answer.toml:1:",
            "unknown variant `size`",
        ),
        (
            "key.toml",
            "[[theory]]\nspec = \"ising\"\ngenera = [1]\ncolour = \"red\"\n",
            "key.toml:4:",
            "unknown field `colour`",
        ),
        (
            "type.toml",
            "[limits]\nlines = \"many\"\n[[theory]]\nspec = \"ising\"\ngenera = [1]\n",
            "type.toml:2:",
            "invalid type",
        ),
        (
            "theory.toml",
            "[[theory]]\nspec = \"ising\"\ngenera = [1]\n\n[[theory]]\nspec = \"isingg\"\ngenera = [1]\n",
            "theory.toml:6:",
            "theory entry 2 (isingg)",
        ),
        (
            "empty.toml",
            "threads = 2\n",
            "empty.toml",
            "no [[theory]] entry",
        ),
    ];
    for (name, text, place, reason) in cases {
        let stderr = refusal(&scratch, name, text);
        assert!(stderr.contains(place), "{name}: {stderr}");
        assert!(stderr.contains(reason), "{name}: {stderr}");
    }
}
