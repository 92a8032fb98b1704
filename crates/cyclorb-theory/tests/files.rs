//! Theory files: the fixture, round trips, corrupted data caught by `verify`, malformed files
//! refused with file, place and reason.

use std::path::{Path, PathBuf};

use cyclorb_field::Rational;
use cyclorb_theory::{
    parse_spec, read_theory_file, theory_from_json, theory_to_json, verify, Theory, TheoryError,
};
use serde_json::{json, Value};

fn fixture(name: &str) -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("../../fixtures/theories")
        .join(name)
}

fn load(spec: &str) -> Theory {
    parse_spec(spec).unwrap_or_else(|e| panic!("{spec}: {e}"))
}

fn reread(value: &Value) -> Result<Theory, TheoryError> {
    theory_from_json(value, "test.json", "test")
}

#[test]
fn the_z3_fixture_reads_and_verifies() {
    let path = fixture("z3-quarks.json");
    let t = read_theory_file(&path).unwrap();
    assert_eq!(t.name(), "z3-quarks");
    assert_eq!(t.labels(), ["1", "q", "qbar"]);
    assert_eq!(t.dual(1), 2);
    // declared in Q(ζ₃); D = √3 and exp(2πi c/8) = i need Q(ζ₁₂)
    assert_eq!(t.conductor(), 12);
    // Z_3 with θ = exp(2πi a²/3): the quadratic Gauss sum is i√3 (Ireland–Rosen ch. 6), c = 2
    assert_eq!(t.central_charge_mod_8(), "2".parse::<Rational>().unwrap());
    assert!(verify(&t).ok());
    // the spec parser takes the path too
    let same = parse_spec(path.to_str().unwrap()).unwrap();
    assert_eq!(same.data_hash(), t.data_hash());
    // and it is the built-in zn:3:2 with other label names
    let zn = load("zn:3:2");
    assert_eq!(zn.s_matrix(), t.s_matrix());
}

#[test]
fn describe_json_reads_back_with_the_same_data() {
    for spec in [
        "ising",
        "fibonacci",
        "conj(fibonacci)",
        "su2:3",
        "su2:4",
        "so3:5",
        "zn:4:1",
        "tricritical-ising",
        "minimal:5:4",
        "minimal:5:2",
        "gauge:4(su2:2)",
    ] {
        let t = load(spec);
        let json = theory_to_json(&t);
        for key in ["labels", "conductor", "central_charge_mod_8"] {
            assert!(json.get(key).is_some(), "{spec}: key {key}");
        }
        let back = reread(&json).unwrap_or_else(|e| panic!("{spec}: {e}"));
        assert_eq!(back.data_hash(), t.data_hash(), "{spec}");
        assert_eq!(back.name(), t.name());
        assert_eq!(back.central_charge_mod_8(), t.central_charge_mod_8());
        assert_eq!(back.s_matrix(), t.s_matrix(), "{spec}");
        assert!(verify(&back).ok(), "{spec}");
    }
}

/// Replace the value of the F entry with these six labels.
fn set_f(json: &mut Value, labels: [&str; 6], value: &str) {
    let entries = json["F"].as_array_mut().unwrap();
    let entry = entries
        .iter_mut()
        .find(|e| (0..6).all(|i| e[i] == labels[i]))
        .expect("the entry exists");
    entry[6] = json!(value);
}

#[test]
fn a_corrupted_f_symbol_fails_the_pentagon() {
    // Fibonacci: [F^{τττ}_τ]_{ττ} = −φ⁻¹ changed to +φ⁻¹ (the matrix stays invertible)
    let mut json = theory_to_json(&load("fibonacci"));
    let original = json["F"]
        .as_array()
        .unwrap()
        .iter()
        .find(|e| (0..6).all(|i| e[i] == "tau"))
        .unwrap()[6]
        .as_str()
        .unwrap()
        .to_string();
    set_f(&mut json, ["tau"; 6], &format!("-({original})"));
    let t = reread(&json).unwrap();
    let v = verify(&t);
    let first = v.first_failure().expect("corruption is caught");
    assert_eq!(first.name, "pentagon");
    let failure = first.failure.as_deref().unwrap();
    assert!(failure.contains("a=tau"), "{failure}");

    // SU(2)_3: one entry of F^{½ ½ ½}_{½} doubled
    let mut json = theory_to_json(&load("su2:3"));
    let entry = json["F"]
        .as_array()
        .unwrap()
        .iter()
        .find(|e| (0..4).all(|i| e[i] == "1/2") && e[4] == "1" && e[5] == "1")
        .unwrap()
        .clone();
    let doubled = format!("2*({})", entry[6].as_str().unwrap());
    set_f(&mut json, ["1/2", "1/2", "1/2", "1/2", "1", "1"], &doubled);
    let v = verify(&reread(&json).unwrap());
    assert_eq!(v.first_failure().unwrap().name, "pentagon");
}

#[test]
fn missing_vertex_weights_break_the_invariant_form_only() {
    let mut json = theory_to_json(&load("su2:3"));
    json.as_object_mut().unwrap().remove("vertex_weights");
    let v = verify(&reread(&json).unwrap());
    let failing: Vec<&str> = v
        .checks
        .iter()
        .filter(|c| !c.ok)
        .map(|c| c.name.as_str())
        .collect();
    assert_eq!(failing, ["invariant-form"]);
}

#[test]
fn a_wrong_twist_is_not_modular() {
    let mut json = theory_to_json(&load("fibonacci"));
    json["twists"]["tau"] = json!("zeta(5)");
    match reread(&json) {
        Err(TheoryError::File { place, reason, .. }) => {
            assert_eq!(place, "dimensions and twists");
            assert!(reason.contains("Gauss"), "{reason}")
        }
        other => panic!("expected a refusal, got {other:?}"),
    }
}

#[test]
fn modular_data_files_derive_fusion_by_verlinde() {
    let t = load("kac:5:4");
    let mut json = theory_to_json(&t);
    json.as_object_mut().unwrap().remove("fusion");
    let back = reread(&json).unwrap();
    assert_eq!(back.fusion(), t.fusion());
    assert!(!back.has_fr());
    assert!(verify(&back).ok());
}

/// Write `value` to a temporary file and read it, expecting a refusal.
fn refusal(tag: &str, text: &str) -> (String, String, String) {
    let path =
        std::env::temp_dir().join(format!("cyclorb-theory-{}-{tag}.json", std::process::id()));
    std::fs::write(&path, text).unwrap();
    let result = read_theory_file(&path);
    std::fs::remove_file(&path).ok();
    match result {
        Err(TheoryError::File {
            file,
            place,
            reason,
        }) => {
            assert!(file.ends_with(&format!("{tag}.json")), "{file}");
            (file, place, reason)
        }
        other => panic!("{tag}: expected a refusal, got {other:?}"),
    }
}

fn fixture_json() -> Value {
    serde_json::from_str(&std::fs::read_to_string(fixture("z3-quarks.json")).unwrap()).unwrap()
}

#[test]
fn malformed_files_are_refused_with_place_and_reason() {
    // unknown label
    let mut j = fixture_json();
    j["R"][0][1] = json!("quark");
    let (_, place, reason) = refusal("unknown-label", &j.to_string());
    assert_eq!(place, "R[0][1]");
    assert!(reason.contains("unknown label \"quark\""), "{reason}");

    // missing symbol
    let mut j = fixture_json();
    j["F"].as_array_mut().unwrap().remove(3);
    let (_, place, reason) = refusal("missing-symbol", &j.to_string());
    assert_eq!(place, "F");
    assert!(
        reason.contains("missing symbol [F^{q qbar qbar}_{qbar}]_{1 q}"),
        "{reason}"
    );

    // bad number
    let mut j = fixture_json();
    j["twists"]["q"] = json!("zeta(3) +* 1");
    let (_, place, reason) = refusal("bad-number", &j.to_string());
    assert_eq!(place, "twists[\"q\"]");
    assert!(reason.contains("bad number"), "{reason}");

    // a value outside the declared field: √2 is not in Q(ζ₃)
    let mut j = fixture_json();
    j["R"][1][3] = json!("sqrt(2)");
    let (_, place, reason) = refusal("outside-field", &j.to_string());
    assert_eq!(place, "R[1][3]");
    assert!(reason.contains("not in Q(ζ_3)"), "{reason}");

    // an inadmissible symbol
    let mut j = fixture_json();
    j["R"][0][2] = json!("q");
    let (_, place, reason) = refusal("inadmissible", &j.to_string());
    assert_eq!(place, "R[0]");
    assert!(reason.contains("not admissible"), "{reason}");

    // a symbol given twice
    let mut j = fixture_json();
    let first = j["F"][0].clone();
    j["F"].as_array_mut().unwrap().push(first);
    let (_, place, reason) = refusal("twice", &j.to_string());
    assert_eq!(place, "F[8]");
    assert!(reason.contains("twice"), "{reason}");

    // a vacuum-leg symbol that is not 1
    let mut j = fixture_json();
    j["R"]
        .as_array_mut()
        .unwrap()
        .push(json!(["1", "q", "q", "-1"]));
    let (_, place, reason) = refusal("vacuum-leg", &j.to_string());
    assert_eq!(place, "R[4]");
    assert!(reason.contains("vacuum leg"), "{reason}");

    // an unknown key, a missing key, a missing twist, a label without a dual
    let mut j = fixture_json();
    j["twist"] = json!({});
    let (_, place, reason) = refusal("unknown-key", &j.to_string());
    assert_eq!(
        (place.as_str(), reason.as_str()),
        ("twist", "unknown key \"twist\"")
    );
    let mut j = fixture_json();
    j.as_object_mut().unwrap().remove("R");
    let (_, place, _) = refusal("missing-key", &j.to_string());
    assert_eq!(place, "R");
    let mut j = fixture_json();
    j["twists"].as_object_mut().unwrap().remove("qbar");
    let (_, place, reason) = refusal("missing-twist", &j.to_string());
    assert_eq!(place, "twists");
    assert!(reason.contains("\"qbar\""), "{reason}");
    let mut j = fixture_json();
    j["fusion"].as_array_mut().unwrap().remove(1);
    let (_, place, reason) = refusal("no-dual", &j.to_string());
    assert_eq!(place, "fusion");
    assert!(reason.contains("no dual"), "{reason}");

    // not JSON at all: line and column
    let (_, place, reason) = refusal("not-json", "{\n  \"conductor\": 3,\n  oops\n}");
    assert!(place.starts_with("line 3"), "{place}");
    assert!(reason.contains("not valid JSON"), "{reason}");
}
