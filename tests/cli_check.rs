//! `cyclorb check FILE`: every kind of certificate written by `--out` re-checks (exit 0), and
//! one changed digit in any of them is caught by the claim it touches (exit 1, the claim
//! named). Each tampering below was chosen so that the file still parses and the claim named
//! is the one that must catch it: the test asserts that claim's name, so a check that let the
//! change through would fail the test.

mod run_cli;

use std::path::{Path, PathBuf};

use run_cli::{cyclorb, cyclorb_json, temp_path};
use serde_json::Value;

/// Run a producing command with `--out`, expect exit 0, and return the file and its JSON.
fn produce(tag: &str, args: &[&str]) -> (PathBuf, Value) {
    let path = temp_path(&format!("{tag}.json"));
    let mut all: Vec<&str> = args.to_vec();
    let out = path.to_str().unwrap().to_string();
    all.extend(["--out", &out]);
    let run = cyclorb(&all);
    assert_eq!(
        run.status.code(),
        Some(0),
        "{args:?}: {}",
        String::from_utf8_lossy(&run.stderr)
    );
    let value = serde_json::from_str(&std::fs::read_to_string(&path).unwrap()).unwrap();
    (path, value)
}

/// `cyclorb check FILE --json`: exit code and report.
fn check(path: &Path) -> (i32, Value) {
    cyclorb_json(&["check", path.to_str().unwrap()])
}

/// The certificate holds: exit 0, `ok`, every claim ok, the kind as written.
fn holds(path: &Path, kind: &str) -> Value {
    let (code, report) = check(path);
    assert_eq!(code, 0, "{report:#}");
    assert_eq!(report["ok"], true);
    assert_eq!(report["kind"], kind);
    let claims = report["claims"].as_array().unwrap();
    assert!(claims.iter().all(|c| c["ok"] == true), "{report:#}");
    report
}

/// Every (pointer, new value, claim) of `tamperings` is caught by that claim.
fn all_caught<const N: usize>(original: &Value, tag: &str, tamperings: [(&str, Value, &str); N]) {
    for (k, (pointer, value, claim)) in tamperings.into_iter().enumerate() {
        caught(original, &format!("{tag}-{k}"), pointer, value, claim);
    }
}

/// Replace the value at `pointer` and expect `claim` to fail (exit 1, named in JSON and text).
fn caught(original: &Value, tag: &str, pointer: &str, new: Value, claim: &str) {
    let mut changed = original.clone();
    let slot = changed
        .pointer_mut(pointer)
        .unwrap_or_else(|| panic!("{tag}: no {pointer}"));
    assert_ne!(*slot, new, "{tag}: {pointer} must change");
    *slot = new;
    let path = temp_path(&format!("{tag}-tampered.json"));
    std::fs::write(&path, serde_json::to_string_pretty(&changed).unwrap()).unwrap();
    let (code, report) = check(&path);
    assert_eq!(code, 1, "{tag} {pointer}: {report:#}");
    assert_eq!(report["ok"], false);
    assert_eq!(report["failed"], claim, "{tag} {pointer}: {report:#}");
    let text = cyclorb(&["check", path.to_str().unwrap()]);
    assert_eq!(text.status.code(), Some(1));
    let stdout = String::from_utf8_lossy(&text.stdout);
    assert!(stdout.contains(&format!("claim {claim} FAILS")), "{stdout}");
    let stderr = String::from_utf8_lossy(&text.stderr);
    assert!(
        stderr.contains(path.to_str().unwrap()) && stderr.contains(&format!("claim {claim} fails")),
        "{stderr}"
    );
}

#[test]
fn witness_certificate_rechecks_and_each_change_is_caught() {
    // Fibonacci at genus ≥ 2 has an infinite image (Freedman–Larsen–Wang 2002), so a witness
    // exists; the default search finds one.
    let (path, w) = produce("witness-fib2", &["witness", "fibonacci", "--genus", "2"]);
    let report = holds(&path, "witness");
    let names: Vec<&str> = report["claims"]
        .as_array()
        .unwrap()
        .iter()
        .map(|c| c["name"].as_str().unwrap())
        .collect();
    assert!(names.contains(&"no-cyclotomic-factor"), "{names:?}");
    assert_eq!(w["spec"], "fibonacci");
    assert_eq!(w["genus"], 2);
    assert_eq!(w["generating_set"], "humphries");
    assert!(w["program"].as_str().unwrap().starts_with("cyclorb "));
    let chi = w["charpoly"][0].as_str().unwrap();
    let n1: i64 = w["ratio_norm"][1].as_str().unwrap().parse().unwrap();
    let r1: i64 = w["remaining_factor"][1].as_str().unwrap().parse().unwrap();
    let conjugates = w["conjugates"].as_u64().unwrap();
    // a coefficient of χ, of the norm, of the remaining factor; the number of conjugates; a
    // letter of the word (a name the set does not have); the genus (at genus 1 the Humphries
    // set has no gamma0); the spec (Ising's field is Q(ζ_16), not the word's Q(ζ_20))
    let tamperings = [
        ("/charpoly/0", Value::from(format!("{chi} + 1")), "charpoly"),
        (
            "/ratio_norm/1",
            Value::from((n1 + 1).to_string()),
            "ratio-norm",
        ),
        (
            "/remaining_factor/1",
            Value::from((r1 + 1).to_string()),
            "cyclotomic-factors",
        ),
        ("/conjugates", Value::from(conjugates + 1), "ratio-norm"),
        ("/word/0", Value::from("alpha9"), "word"),
        ("/genus", Value::from(1), "word"),
        ("/spec", Value::from("ising"), "word"),
    ];
    all_caught(&w, "witness", tamperings);
}

#[test]
fn lifted_witness_certificate_rechecks_on_its_factor() {
    // Fibonacci ⊠ Ising at genus 2: the Fibonacci factor's image is infinite
    // (Freedman–Larsen–Wang 2002), and the witness is certified there.
    let (path, w) = produce(
        "witness-lifted",
        &["witness", "fibonacci*ising", "--genus", "2"],
    );
    holds(&path, "witness-lifted");
    assert_eq!(w["lifted_from_factor"]["theory"], "fibonacci");
    let hash = w["lifted_from_factor"]["data_hash"].as_str().unwrap();
    let other = format!(
        "{}{}",
        if hash.starts_with('0') { "1" } else { "0" },
        &hash[1..]
    );
    all_caught(
        &w,
        "witness-lifted",
        [
            (
                "/lifted_from_factor/data_hash",
                Value::from(other),
                "factor",
            ),
            ("/lifted_from_factor/factor", Value::from("right"), "factor"),
            ("/certificate/word/0", Value::from("alpha9"), "word"),
            ("/certificate/charpoly/0", Value::from("0"), "charpoly"),
        ],
    );
}

#[test]
fn commutant_certificates_recheck_and_each_change_is_caught() {
    // Ising at genus 2 is irreducible: B = 384·G⁻¹ is scalar over the orbit (Castro,
    // Gaberdiel, Hartman, Maloney, Volpato 2012 and the 2019 follow-up).
    let (path, c) = produce("comm-ising2", &["commutant", "ising", "--genus", "2"]);
    holds(&path, "commutant");
    assert_eq!(c["dimension"], 1);
    // the identity with one diagonal entry doubled commutes with nothing irreducible; the
    // dimension; the nullity modulo the stated prime
    let tamperings = [
        ("/basis/0/rows/0/0", Value::from("2"), "basis-commutes"),
        ("/dimension", Value::from(2), "lower-bound"),
        ("/bounds/0/nullity", Value::from(2), "bounds"),
    ];
    all_caught(&c, "commutant-ising", tamperings);
    // Z_3 at genus 1: charge conjugation a ↦ −a commutes with S and T (S² = C, common
    // practice), so the commutant is 2-dimensional and found exactly.
    let (path, z) = produce("comm-z3", &["commutant", "zn:3:2", "--genus", "1"]);
    holds(&path, "commutant");
    assert_eq!(z["dimension"], 2);
    assert_eq!(z["route"], "exact");
    let tamperings = [
        ("/basis/0/rows/0/1", Value::from("1"), "basis-commutes"),
        (
            "/hermitian_basis/0/rows/1/2",
            Value::from("3"),
            "self-adjoint-basis",
        ),
        ("/dimension", Value::from(1), "lower-bound"),
    ];
    all_caught(&z, "commutant-z3", tamperings);
}

#[test]
fn image_certificates_recheck_and_each_change_is_caught() {
    // Schreier–Sims on the vacuum orbit of Ising at genus 1: 24 lines (Castro et al. 2012).
    let (path, o) = produce(
        "image-orbit",
        &["image", "ising", "--genus", "1", "--route", "orbit"],
    );
    holds(&path, "image-orbit");
    assert_eq!(o["lines"], 24);
    let order: u64 = o["group"]["order"].as_str().unwrap().parse().unwrap();
    let first = o["group"]["basic_orbit_lengths"][1].as_u64().unwrap();
    let digest = o["permutation_digests"][0].as_str().unwrap();
    let flipped = format!(
        "{}{}",
        &digest[..15],
        if digest.ends_with('0') { "1" } else { "0" }
    );
    let strong = o["group"]["strong_generators"].as_u64().unwrap();
    let tamperings = [
        (
            "/group/order",
            Value::from((order + 1).to_string()),
            "chain-arithmetic",
        ),
        (
            "/group/basic_orbit_lengths/1",
            Value::from(first + 1),
            "chain-arithmetic",
        ),
        ("/lines", Value::from(25), "lines"),
        (
            "/permutation_digests/0",
            Value::from(flipped),
            "permutations",
        ),
        (
            "/group/strong_generators",
            Value::from(strong + 1),
            "faithfulness-and-chain",
        ),
    ];
    all_caught(&o, "image-orbit", tamperings);
    // enumeration modulo scalars (Z_3 at genus 1)
    let (path, e) = produce(
        "image-enum",
        &["image", "zn:3:2", "--genus", "1", "--route", "enumeration"],
    );
    holds(&path, "image-enumeration");
    let order = e["order"].as_u64().unwrap();
    let tamperings = [
        ("/order", Value::from(order + 1), "order"),
        ("/order", Value::from(order - 1), "order"),
    ];
    all_caught(&e, "enumeration", tamperings);
}

#[test]
fn structure_certificates_recheck_and_each_change_is_caught() {
    // Ising at genus 2: 3840 lines (the all-genus follow-up of Castro et al., 2019).
    let (path, s) = produce(
        "structure",
        &["orbit", "ising", "--genus", "2", "--method", "structure"],
    );
    holds(&path, "structure");
    assert_eq!(s["orbit_size"], "3840");
    // `cyclorb image` writes the same kind when it takes the monomial route
    let (path2, _) = produce("structure-image", &["image", "ising", "--genus", "2"]);
    holds(&path2, "structure");
    let phase = s["monomials"][0]["phases"][0].as_u64().unwrap();
    let row = s["kernel"]["generators"][0][0].as_u64().unwrap();
    let tamperings = [
        (
            "/monomials/0/phases/0",
            Value::from((phase + 1) % 16),
            "monomial-form",
        ),
        ("/basis/0/0/1", Value::from("2"), "monomial-form"),
        ("/power", Value::from(3), "power"),
        ("/vacuum/0/1", Value::from("7"), "vacuum-expansion"),
        (
            "/permutation_group/order",
            Value::from("721"),
            "permutation-order",
        ),
        ("/kernel/order", Value::from("16777217"), "image-order"),
        ("/image_order", Value::from("3019898881"), "image-order"),
        ("/supports", Value::from("16"), "orbit-size"),
        ("/orbit_size", Value::from("3841"), "orbit-size"),
        (
            "/kernel/generators/0/0",
            Value::from(row + 1),
            "derived-data",
        ),
        ("/genus", Value::from(1), "identity"),
        ("/spec", Value::from("su2:2"), "identity"),
    ];
    all_caught(&s, "structure", tamperings);
}

#[test]
fn dijkgraaf_witten_certificates_recheck_and_each_change_is_caught() {
    // D(S_3) at genus 1: X_1 = commuting pairs up to conjugation, 8 of them, one per simple
    // object of D(S_3) (Dijkgraaf–Pasquier–Roche 1990).
    let (path, i) = produce("dw-image", &["image", "dw:S3", "--genus", "1"]);
    holds(&path, "dw-permutation-image");
    assert_eq!(i["degree"], 8);
    let order: u64 = i["order"].as_str().unwrap().parse().unwrap();
    let images = i["generators"][0]["images"].clone();
    let mut swapped: Vec<u64> = serde_json::from_value(images).unwrap();
    let moved = (0..swapped.len())
        .find(|&k| swapped[k] != k as u64)
        .unwrap();
    let target = swapped[moved] as usize;
    swapped.swap(moved, target);
    let lengths: Vec<u64> = serde_json::from_value(i["basic_orbit_lengths"].clone()).unwrap();
    let mut base: Vec<u64> = serde_json::from_value(i["base"].clone()).unwrap();
    base.pop();
    assert!(lengths.last().unwrap() > &1);
    let tamperings = [
        (
            "/order",
            Value::from((order + 1).to_string()),
            "chain-arithmetic",
        ),
        ("/generators/0/images", Value::from(swapped), "generators"),
        ("/base", Value::from(base), "order"),
    ];
    all_caught(&i, "dw-image", tamperings);
    let (path, o) = produce("dw-orbitals", &["commutant", "dw:S3", "--genus", "1"]);
    holds(&path, "dw-orbitals");
    let n = o["commutant_dimension"].as_u64().unwrap();
    let tamperings = [(
        "/commutant_dimension",
        Value::from(n + 1),
        "commutant-dimension",
    )];
    all_caught(&o, "dw-orbitals", tamperings);
}

#[test]
fn twisted_dijkgraaf_witten_certificates_recheck_and_each_change_is_caught() {
    // the double semion D^{ω_1}(Z_2) at genus 1: four anyons of dimension 1, so
    // |X_1| = N^{2g} = 4 (Verlinde formula; standard)
    let (path, i) = produce("dwt-image", &["image", "dw:Z2:1", "--genus", "1"]);
    holds(&path, "dw-monomial-image");
    assert_eq!(i["degree"], 4);
    let order: u64 = i["order"].as_str().unwrap().parse().unwrap();
    let phase = i["generators"][0]["phases"][1].as_u64().unwrap();
    let tamperings = [
        ("/order", Value::from((2 * order).to_string()), "order"),
        (
            "/generators/0/phases/1",
            Value::from((phase + 1) % 4),
            "generators",
        ),
    ];
    all_caught(&i, "dwt-image", tamperings);
    let (path, o) = produce("dwt-commutant", &["commutant", "dw:Z2:1", "--genus", "1"]);
    holds(&path, "dw-monomial-commutant");
    let n = o["commutant_dimension"].as_u64().unwrap();
    let tamperings = [(
        "/commutant_dimension",
        Value::from(n + 1),
        "commutant-dimension",
    )];
    all_caught(&o, "dwt-commutant", tamperings);
}

/// `value` with `key` (a big decimal string) multiplied by `factor` / `divisor`.
fn scaled(value: &mut Value, key: &str, factor: u64, divisor: u64) {
    let n: num_bigint::BigUint = value[key].as_str().unwrap().parse().unwrap();
    value[key] = Value::from((n * factor / divisor).to_string());
}

#[test]
fn counted_dijkgraaf_witten_orbits_recheck_and_each_change_is_caught() {
    // D(S_3) at genus 2: |X_2| = Σ_{([x], ρ)} (|C(x)| / dim ρ)² = (36 + 36 + 9) + 2·4 + 3·9
    // = 116 (Verlinde dimension of the quantum double; standard)
    let (path, c) = produce(
        "dw-count",
        &["orbit", "dw:S3", "--genus", "2", "--method", "structure"],
    );
    let report = holds(&path, "dw-vacuum-set-stabiliser");
    assert_eq!(report["claims"].as_array().unwrap().len(), 7, "{report:#}");
    assert_eq!(c["degree"].as_u64().unwrap() - 100, 116);
    let arrangements = c["arrangements"].as_u64().unwrap();
    let parts = c["parts"].as_u64().unwrap();
    let first = c["part_orbits"][0]["orbit_size"].as_u64().unwrap();
    let length = c["basic_orbit_lengths"][0].as_u64().unwrap();
    let mut swapped: Vec<u64> =
        serde_json::from_value(c["generators"][0]["images"].clone()).unwrap();
    let moved = (0..swapped.len())
        .find(|&k| swapped[k] != k as u64)
        .unwrap();
    let target = swapped[moved] as usize;
    swapped.swap(moved, target);
    let tamperings = [
        ("/generators/0/images", Value::from(swapped), "generators"),
        ("/parts", Value::from(parts + 1), "parts"),
        (
            "/part_orbits/0/orbit_size",
            Value::from(first + 1),
            "part-orbits",
        ),
        (
            "/basic_orbit_lengths/0",
            Value::from(length + 1),
            "chain-arithmetic",
        ),
        (
            "/arrangements",
            Value::from(arrangements + 1),
            "chain-arithmetic",
        ),
    ];
    all_caught(&c, "dw-count", tamperings);
    // consistent arithmetic, a false |P|: the first basic orbit, |P| and the orbit doubled
    let mut larger = c.clone();
    larger["basic_orbit_lengths"][0] = Value::from(2 * length);
    scaled(&mut larger, "image_order", 2, 1);
    caught(
        &larger,
        "dw-count-p",
        "/orbit_size",
        Value::from("76800"),
        "image-order",
    );
    // consistent arithmetic, a false stabiliser: c and |Stab| doubled, the orbit halved
    let mut doubled = c.clone();
    doubled["arrangements"] = Value::from(2 * arrangements);
    scaled(&mut doubled, "stabiliser_order", 2, 1);
    caught(
        &doubled,
        "dw-count-c",
        "/orbit_size",
        Value::from("19200"),
        "stabiliser-order",
    );
}

#[test]
fn theory_files_are_proved_and_their_data_pinned() {
    // a theory file: Ising written out by `describe --json`
    let file = temp_path("ising-theory.json");
    let described = cyclorb(&["describe", "ising", "--json"]);
    std::fs::write(&file, &described.stdout).unwrap();
    let spec = file.to_str().unwrap();
    let (path, c) = produce("file-commutant", &["commutant", spec, "--genus", "1"]);
    let files = c["theory_files"].as_array().unwrap();
    assert_eq!(files.len(), 1);
    assert_eq!(files[0]["path"], spec);
    let report = holds(&path, "commutant");
    assert_eq!(report["verified"], true);
    let hash = files[0]["data_hash"].as_str().unwrap();
    let other = format!(
        "{}{}",
        if hash.starts_with('0') { "1" } else { "0" },
        &hash[1..]
    );
    let tamperings = [(
        "/theory_files/0/data_hash",
        Value::from(other),
        "theory-files",
    )];
    all_caught(&c, "theory-file", tamperings);
    // under --unverified the answer says it rests on unproved data
    let (code, unproved) = cyclorb_json(&["check", path.to_str().unwrap(), "--unverified"]);
    assert_eq!(code, 0);
    assert_eq!(unproved["verified"], false);
}

#[test]
fn bad_files_and_usage_are_refused_cleanly() {
    let (code, _) = {
        let out = cyclorb(&["check"]);
        (out.status.code(), ())
    };
    assert_eq!(code, Some(2));
    let missing = temp_path("no-such-certificate.json");
    let out = cyclorb(&["check", missing.to_str().unwrap()]);
    assert_eq!(out.status.code(), Some(1));
    assert!(String::from_utf8_lossy(&out.stderr).contains("no-such-certificate.json"));
    // a file without the envelope names the file and the key
    let bare = temp_path("bare-certificate.json");
    std::fs::write(
        &bare,
        r#"{"conductor": 12, "generators": ["alpha0"], "order": 2}"#,
    )
    .unwrap();
    let out = cyclorb(&["check", bare.to_str().unwrap()]);
    assert_eq!(out.status.code(), Some(1));
    let stderr = String::from_utf8_lossy(&out.stderr);
    assert!(
        stderr.contains("bare-certificate.json") && stderr.contains("`genus`"),
        "{stderr}"
    );
    // an unknown kind is named
    let (path, c) = produce(
        "kind",
        &["image", "zn:3:2", "--genus", "1", "--route", "enumeration"],
    );
    let mut changed = c.clone();
    changed["kind"] = Value::from("image-guess");
    std::fs::write(&path, changed.to_string()).unwrap();
    let out = cyclorb(&["check", path.to_str().unwrap()]);
    assert_eq!(out.status.code(), Some(1));
    assert!(String::from_utf8_lossy(&out.stderr).contains("unknown kind \"image-guess\""));
    // a repeated key is refused
    std::fs::write(&path, r#"{"kind": "witness", "kind": "commutant"}"#).unwrap();
    let out = cyclorb(&["check", path.to_str().unwrap()]);
    assert_eq!(out.status.code(), Some(1));
    assert!(String::from_utf8_lossy(&out.stderr).contains("kind"));
}
