//! `cyclorb twists --check`: the Dehn twists satisfy the mapping class group relations
//! exactly (Humphries 1979; Wajnryb 1983; Birman–Hilden; Farb–Margalit, A Primer on Mapping
//! Class Groups, ch. 3–5), and block-space dimensions match the Verlinde formula.

mod run_cli;

use run_cli::{cyclorb_json, fixture};

fn check(spec: &str, genus: usize) -> serde_json::Value {
    let g = genus.to_string();
    let (code, v) = cyclorb_json(&[
        "twists",
        spec,
        "--genus",
        &g,
        "--check",
        "--set",
        "lickorish",
    ]);
    assert_eq!(code, 0, "{spec} genus {genus}: {v}");
    assert_eq!(v["relations_ok"], true, "{spec} genus {genus}");
    let failed: Vec<_> = v["relations"]
        .as_array()
        .unwrap()
        .iter()
        .filter(|c| c["ok"] != true)
        .collect();
    assert!(failed.is_empty(), "{failed:?}");
    v
}

#[test]
fn ising_relations_up_to_genus_three() {
    // dimensions from the Verlinde formula Σ_a S_0a^{2−2g}: 3, 10, 36 (Verlinde 1988)
    for (g, dim) in [(1, 3), (2, 10), (3, 36)] {
        assert_eq!(check("ising", g)["dimension"], dim);
    }
}

#[test]
fn fibonacci_relations_up_to_genus_three() {
    // Verlinde dimensions 2, 5, 15 (from memory; Σ_a S_0a^{2−2g} with d_τ = φ)
    for (g, dim) in [(1, 2), (2, 5), (3, 15)] {
        assert_eq!(check("fibonacci", g)["dimension"], dim);
    }
}

#[test]
fn su2_level_four_genus_two() {
    // SU(2)_4 has b ≠ 0 blocks larger than 1×1, the case where slips in μ or in F vs F⁻¹ show.
    // Verlinde dimension 35 at genus 2 (Verlinde 1988).
    assert_eq!(check("su2:4", 2)["dimension"], 35);
}

#[test]
fn tricritical_ising_relations() {
    for (g, dim) in [(1, 6), (2, 50)] {
        assert_eq!(check("tricritical-ising", g)["dimension"], dim);
    }
}

#[test]
fn non_unitary_gauge_keeps_every_relation() {
    // A product theory in a random non-unitary gauge: the invariant form G is not the identity
    // and every twist must still satisfy X† G X = G.
    check("gauge:7(su2:2*fibonacci)", 2);
}

#[test]
fn a_user_theory_file() {
    let file = fixture("theories/z3-quarks.json");
    let v = check(file.to_str().unwrap(), 2);
    // a pointed Z_3 theory: every S_0a = 1/√3, so dim V_2 = 3·3 = 9
    assert_eq!(v["dimension"], 9);
}

#[test]
fn generator_counts_of_the_two_sets() {
    for g in [1usize, 2, 3] {
        let gs = g.to_string();
        let (_, h) = cyclorb_json(&["twists", "ising", "--genus", &gs, "--set", "humphries"]);
        let (_, l) = cyclorb_json(&["twists", "ising", "--genus", &gs, "--set", "lickorish"]);
        let humphries = if g == 1 { 2 } else { 2 * g + 1 };
        assert_eq!(h["generators"].as_array().unwrap().len(), humphries);
        assert_eq!(l["generators"].as_array().unwrap().len(), 3 * g - 1);
    }
}

#[test]
fn non_self_dual_labels_at_genus_one() {
    // Regression: S² = (AB)³ = −I acts as charge conjugation, not a scalar, when a label is not
    // self-dual; the checks are (SA)³ ∝ 1 and S² ∝ (AB)³ (standard SL(2, Z) relations for
    // positive twists; Farb–Margalit, A Primer on Mapping Class Groups, §2.2). Dimensions: the
    // rank, 3 and 5 (standard).
    for (spec, dim) in [("zn:3:2", 3), ("zn:5:2", 5)] {
        let v = check(spec, 1);
        assert_eq!(v["dimension"], dim);
        let names: Vec<&str> = v["relations"]
            .as_array()
            .unwrap()
            .iter()
            .filter_map(|c| c["name"].as_str())
            .collect();
        assert!(names.contains(&"genus 1: (SA)^3 ∝ 1"), "{names:?}");
        assert!(names.contains(&"genus 1: S^2 ∝ (AB)^3"), "{names:?}");
    }
}
