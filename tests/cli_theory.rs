//! `cyclorb theories`, `cyclorb describe` and `cyclorb verify` through the binary: the JSON
//! keys of the contract, exit codes, round trips of describe output, refusals.

use std::path::{Path, PathBuf};
use std::process::{Command, Output};

use serde_json::Value;

fn cyclorb(args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_cyclorb"))
        .env(
            "XDG_CACHE_HOME",
            std::env::temp_dir().join(format!("cyclorb-test-{}-cache", std::process::id())),
        )
        .args(args)
        .output()
        .expect("the binary runs")
}

fn json_of(out: &Output) -> Value {
    serde_json::from_slice(&out.stdout).unwrap_or_else(|e| {
        panic!(
            "stdout is one JSON object ({e}): {}",
            String::from_utf8_lossy(&out.stdout)
        )
    })
}

fn temp_file(tag: &str) -> PathBuf {
    std::env::temp_dir().join(format!(
        "cyclorb-cli-theory-{}-{tag}.json",
        std::process::id()
    ))
}

fn fixture(name: &str) -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("fixtures/theories")
        .join(name)
}

#[test]
fn theories_lists_the_contract_names() {
    let out = cyclorb(&["theories"]);
    assert!(out.status.success());
    let text = String::from_utf8_lossy(&out.stdout);
    for name in [
        "ising",
        "fibonacci",
        "tricritical-ising",
        "su2:K",
        "so3:K",
        "zn:N:P",
        "minimal:P:Q",
        "kac:P:Q",
        "conj(A)",
        "A*B",
    ] {
        assert!(text.contains(name), "{name} missing from:\n{text}");
    }
    let json = json_of(&cyclorb(&["theories", "--json"]));
    assert!(json["theories"].as_array().unwrap().len() >= 8);
}

#[test]
fn describe_json_has_the_contract_keys() {
    // Ising: labels 1, σ, ψ; Q(ζ₁₆); c = 1/2 (Kitaev 2006)
    let out = cyclorb(&["describe", "ising", "--json"]);
    assert!(out.status.success());
    let json = json_of(&out);
    assert_eq!(json["labels"], serde_json::json!(["1", "sigma", "psi"]));
    assert_eq!(json["conductor"], 16);
    assert_eq!(json["central_charge_mod_8"], "1/2");
    // M(5,4): c = 7/10 (Di Francesco–Mathieu–Sénéchal ch. 7): with F and R as `minimal`,
    // modular data only as `kac`.
    for (spec, data_only) in [("minimal:5:4", false), ("kac:5:4", true)] {
        let json = json_of(&cyclorb(&["describe", spec, "--json"]));
        assert_eq!(json["central_charge_mod_8"], "7/10", "{spec}");
        assert_eq!(json["modular_data_only"], data_only, "{spec}");
        assert_eq!(json["labels"].as_array().unwrap().len(), 6, "{spec}");
    }
    // the text form names the pieces
    let text = String::from_utf8_lossy(&cyclorb(&["describe", "fibonacci"]).stdout).to_string();
    for piece in [
        "conductor 20",
        "c ≡ 14/5",
        "fusion rules",
        "tau × tau = 1 + tau",
        "S (normalised",
        "T = diag",
    ] {
        assert!(text.contains(piece), "{piece} missing from:\n{text}");
    }
    // F and R of M(6,5) (issue 13's "done when"): 175 R-symbols, one per fusion triple of
    // (so3:3 ⊠ su2:4: 5 · 35; common practice, the SU(2)_k truncated Clebsch–Gordan rule).
    let text = String::from_utf8_lossy(&cyclorb(&["describe", "minimal:6:5"]).stdout).to_string();
    assert!(
        text.contains("F- and R-symbols present:") && text.contains("175 R-symbols"),
        "{text}"
    );
    let text = String::from_utf8_lossy(&cyclorb(&["describe", "kac:6:5"]).stdout).to_string();
    assert!(!text.contains("F- and R-symbols present"), "{text}");
}

#[test]
fn describe_output_reads_back_as_a_theory_file() {
    for spec in ["su2:3", "tricritical-ising", "minimal:5:2"] {
        let out = cyclorb(&["describe", spec, "--json"]);
        let original = json_of(&out);
        let path = temp_file(&spec.replace(':', "-"));
        std::fs::write(&path, &out.stdout).unwrap();
        let file = path.to_str().unwrap();
        let again = json_of(&cyclorb(&["describe", file, "--json"]));
        assert_eq!(again["data_hash"], original["data_hash"], "{spec}");
        let verified = cyclorb(&["verify", file, "--json"]);
        assert!(verified.status.success(), "{spec}");
        assert_eq!(json_of(&verified)["ok"], true);
        std::fs::remove_file(&path).ok();
    }
}

#[test]
fn verify_reports_every_check() {
    let out = cyclorb(&["verify", "su2:4", "--json"]);
    assert!(out.status.success());
    let json = json_of(&out);
    assert_eq!(json["ok"], true);
    let names: Vec<&str> = json["checks"]
        .as_array()
        .unwrap()
        .iter()
        .map(|c| {
            assert_eq!(c["ok"], true);
            c["name"].as_str().unwrap()
        })
        .collect();
    for required in [
        "pentagon",
        "hexagon",
        "hexagon-inverse",
        "twist",
        "s-from-twists",
        "s-unitary",
        "verlinde",
        "modular-relation",
        "s-squared",
    ] {
        assert!(names.contains(&required), "{required}");
    }
    // the example file of the README
    let out = cyclorb(&["verify", fixture("z3-quarks.json").to_str().unwrap()]);
    assert!(out.status.success());
    assert!(String::from_utf8_lossy(&out.stdout).contains("all 17 checks hold"));
}

#[test]
fn a_corrupted_file_fails_naming_the_pentagon() {
    let mut json = json_of(&cyclorb(&["describe", "fibonacci", "--json"]));
    let entry = json["F"]
        .as_array_mut()
        .unwrap()
        .iter_mut()
        .find(|e| (0..6).all(|i| e[i] == "tau"))
        .unwrap();
    // [F^{τττ}_τ]_{ττ} = −φ⁻¹ becomes 2 − φ⁻¹
    entry[6] = Value::String(format!("2 + ({})", entry[6].as_str().unwrap()));
    let path = temp_file("corrupted");
    std::fs::write(&path, json.to_string()).unwrap();
    let file = path.to_str().unwrap();
    let out = cyclorb(&["verify", file, "--json"]);
    assert_eq!(out.status.code(), Some(1));
    let report = json_of(&out);
    assert_eq!(report["ok"], false);
    assert_eq!(report["first_failure"]["name"], "pentagon");
    let text_out = cyclorb(&["verify", file]);
    assert_eq!(text_out.status.code(), Some(1));
    let text = String::from_utf8_lossy(&text_out.stdout);
    assert!(text.contains("FAILED: pentagon"), "{text}");
    assert!(text.contains("a=tau"), "{text}");
    std::fs::remove_file(&path).ok();
}

/// A change of 10⁻¹² in one entry of a 3×3 F-block of SU(2)_6 breaks the pentagon (the
/// q-6j symbols satisfy it exactly: Kirillov–Reshetikhin 1989, from memory); the residue
/// form of the check must see it, and the report shows two different exact sides.
#[test]
fn a_tiny_change_in_a_large_theory_fails_the_pentagon() {
    let mut json = json_of(&cyclorb(&["describe", "su2:6", "--json"]));
    let entry = json["F"]
        .as_array_mut()
        .unwrap()
        .iter_mut()
        .find(|e| (0..4).all(|i| e[i] == "1") && e[4] == "1" && e[5] == "1")
        .unwrap();
    entry[6] = Value::String(format!(
        "1/1000000000000 + ({})",
        entry[6].as_str().unwrap()
    ));
    let path = temp_file("tiny-change");
    std::fs::write(&path, json.to_string()).unwrap();
    let out = cyclorb(&["verify", path.to_str().unwrap(), "--json"]);
    std::fs::remove_file(&path).ok();
    assert_eq!(out.status.code(), Some(1));
    let report = json_of(&out);
    assert_eq!(report["first_failure"]["name"], "pentagon");
    let failure = report["first_failure"]["failure"].as_str().unwrap();
    let (left, right) = failure
        .split_once(": left side ")
        .and_then(|(_, sides)| sides.split_once(", right side "))
        .unwrap_or_else(|| panic!("{failure}"));
    assert_ne!(left, right, "{failure}");
}

#[test]
fn malformed_input_is_refused_with_file_place_and_reason() {
    let mut json: Value =
        serde_json::from_str(&std::fs::read_to_string(fixture("z3-quarks.json")).unwrap()).unwrap();
    json["twists"]["q"] = Value::String("sqrt(5)".into());
    let path = temp_file("outside-field");
    std::fs::write(&path, json.to_string()).unwrap();
    let out = cyclorb(&["verify", path.to_str().unwrap()]);
    assert_eq!(out.status.code(), Some(1));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(err.contains(path.to_str().unwrap()), "{err}");
    assert!(err.contains("twists[\"q\"]"), "{err}");
    assert!(err.contains("not in Q(ζ_3)"), "{err}");
    std::fs::remove_file(&path).ok();

    let out = cyclorb(&["describe", "su2:0"]);
    assert_eq!(out.status.code(), Some(1));
    assert!(String::from_utf8_lossy(&out.stderr).contains("level"));
    let out = cyclorb(&["verify", "ising", "--skip", "pentagram"]);
    assert_eq!(out.status.code(), Some(1));
    assert!(String::from_utf8_lossy(&out.stderr).contains("unknown check"));
}
