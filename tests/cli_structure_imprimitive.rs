//! The structural route through an imprimitive structure (SU(2)_4): `orbit --method
//! structure`, `image` and `check` agree with the enumerating route and re-derive their
//! certificates; a changed certificate is refused by the claim it breaks.

mod run_cli;

use std::path::PathBuf;

use run_cli::{cyclorb, cyclorb_json, temp_path};
use serde_json::Value;

/// B's entries in the vacuum's column, by row label, from an `orbit --json` report of
/// either route (the enumerating route lists all of B).
fn vacuum_column(report: &Value, vacuum: &str) -> Vec<(String, String)> {
    let entries = report["poincare_sum"]
        .get("vacuum_column")
        .or_else(|| report["poincare_sum"].get("entries"))
        .and_then(Value::as_array)
        .unwrap();
    let mut column: Vec<(String, String)> = entries
        .iter()
        .filter(|e| e["column"] == vacuum)
        .map(|e| {
            (
                e["row"].as_str().unwrap().to_string(),
                e["value"].as_str().unwrap().to_string(),
            )
        })
        .collect();
    column.sort();
    column
}

#[test]
fn su2_level_four_genus_two_agrees_with_enumeration() {
    // the enumerating route lists the 1 228 800 lines and sums B exactly; the structural
    // route counts them through the 16 sectors. B = 38 400·I₁ + 7 680·I₂ (README): its
    // vacuum column is 38 400 at the vacuum and 7 680 at the labels (0,2), (2,0), (2,2).
    let (c1, counted) = cyclorb_json(&["orbit", "su2:4", "--genus", "2", "--method", "structure"]);
    let (c2, listed) = cyclorb_json(&["orbit", "su2:4", "--genus", "2"]);
    assert_eq!((c1, c2), (0, 0), "{counted}");
    assert_eq!(counted["orbit_size"], 1228800);
    assert_eq!(counted["orbit_size"], listed["orbit_size"]);
    assert_eq!(counted["structure"], "imprimitive");
    assert_eq!(counted["poincare_sum"]["commutant_dimension"], 2);
    assert_eq!(listed["poincare_sum"]["commutant_dimension"], 2);
    let vacuum = "a=(0,0) b=(0,0) x=()";
    let column = vacuum_column(&counted, vacuum);
    assert_eq!(column, vacuum_column(&listed, vacuum));
    let values: Vec<&str> = column.iter().map(|(_, v)| v.as_str()).collect();
    assert_eq!(values, ["38400", "7680", "7680", "7680"]);
    // 15 × 40 × 4³ × 32: the Lagrangians of F_2^4 (Grove, Classical Groups and Geometric
    // Algebra), component lines, relative phases
    let d = &counted["decomposition"];
    assert_eq!(d["sector_supports"], 15);
    assert_eq!(d["line_tuples_per_sector_support"], 2560);
    assert_eq!(d["patterns_per_support"], 32);
}

#[test]
fn su2_level_four_image_order_by_the_imprimitive_structure() {
    // 2^59·3^15·5^2, the order found by Schreier–Sims on the 1 228 800 lines of the
    // enumerating route (README, "Certificates"); Sp(4, F_2) ≅ S_6 of order 720 (ATLAS of
    // Finite Groups) permutes the sectors
    let (code, v) = cyclorb_json(&["image", "su2:4", "--genus", "2"]);
    assert_eq!(code, 0, "{v}");
    assert_eq!(v["route"], "structure");
    assert_eq!(v["order"], "206789543098796485273190400");
    assert_eq!(v["block_permutation_order"], "720");
    assert_eq!(v["sectors"], 16);
}

/// Produce a certificate with `--out`, expect exit 0, return the file and its JSON.
fn produce(tag: &str, args: &[&str]) -> (PathBuf, Value) {
    let path = temp_path(&format!("{tag}.json"));
    let out = path.to_str().unwrap().to_string();
    let mut all = args.to_vec();
    all.extend(["--out", &out]);
    let run = cyclorb(&all);
    assert_eq!(
        run.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&run.stderr)
    );
    let value = serde_json::from_str(&std::fs::read_to_string(&path).unwrap()).unwrap();
    (path, value)
}

#[test]
fn imprimitive_certificates_recheck_and_changes_are_caught() {
    // SU(2)_4 at genus 1: 48 lines (`cyclorb orbit su2:4 --genus 1`, the enumerating route)
    let (path, cert) = produce(
        "imprimitive",
        &["orbit", "su2:4", "--genus", "1", "--method", "structure"],
    );
    let (code, report) = cyclorb_json(&["check", path.to_str().unwrap()]);
    assert_eq!(code, 0, "{report:#}");
    assert_eq!(report["kind"], "structure-imprimitive");
    assert!(report["claims"]
        .as_array()
        .unwrap()
        .iter()
        .all(|c| c["ok"] == true));
    assert_eq!(cert["orbit_size"], "48");
    let phase = cert["monomials"][0]["phases"][0].as_u64().unwrap();
    let tamperings = [
        (
            "/monomials/0/phases/0",
            Value::from((phase + 1) % 24),
            "line-monomials",
        ),
        ("/components/0/0/1", Value::from("7"), "vacuum-components"),
        ("/sector_of_line/0", Value::from(3), "sectors"),
        (
            "/basic_orbit_lengths/0",
            Value::from(1000),
            "line-permutation-order",
        ),
        ("/orbit_size", Value::from("49"), "orbit-arithmetic"),
        ("/support_permutations", Value::from(5), "derived-data"),
        ("/genus", Value::from(2), "identity"),
    ];
    for (k, (pointer, value, claim)) in tamperings.into_iter().enumerate() {
        let mut changed = cert.clone();
        *changed.pointer_mut(pointer).unwrap() = value;
        let file = temp_path(&format!("imprimitive-{k}.json"));
        std::fs::write(&file, serde_json::to_string(&changed).unwrap()).unwrap();
        let (code, report) = cyclorb_json(&["check", file.to_str().unwrap()]);
        assert_eq!(code, 1, "{pointer}: {report:#}");
        assert_eq!(report["failed"], claim, "{pointer}: {report:#}");
    }
}
