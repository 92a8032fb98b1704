//! `cyclorb orbit dw:… --method structure`: the vacuum orbit of D(G) counted as
//! |P| / |Stab_P(S)| against the listed orbit and against standard counts.

mod run_cli;

use run_cli::cyclorb_json;
use serde_json::Value;

fn run(spec: &str, genus: usize, extra: &[&str]) -> (i32, Value) {
    let g = genus.to_string();
    let mut args = vec!["orbit", spec, "--genus", &g, "--method", "structure"];
    args.extend_from_slice(extra);
    cyclorb_json(&args)
}

#[test]
fn counted_orbits_equal_listed_ones() {
    // the listing (the default route) is the independent check; S3 and Q8 at genus 2 have
    // 38 400 and 120 lines, D(Z2) and D(Z3) count Lagrangian subspaces of F_p^{2g},
    // Π (p^k + 1) (standard)
    for (spec, genus) in [
        ("dw:S3", 1),
        ("dw:S3", 2),
        ("dw:Q8", 2),
        ("dw:D4", 2),
        ("dw:Z2", 3),
        ("dw:Z3", 2),
    ] {
        let (code, counted) = run(spec, genus, &[]);
        assert_eq!(code, 0, "{spec} genus {genus}: {counted}");
        let (code, listed) = cyclorb_json(&["orbit", spec, "--genus", &genus.to_string()]);
        assert_eq!(code, 0, "{spec} genus {genus}: {listed}");
        assert_eq!(
            counted["orbit_size"], listed["orbit_size"],
            "{spec} {genus}"
        );
        assert_eq!(counted["method"], "structure");
        assert_eq!(counted["saturated"], true);
        // B on the orbitals: the same values as the listing's B
        let values = |v: &Value| -> Vec<String> {
            v["poincare_sum"]["invariants"]
                .as_array()
                .unwrap()
                .iter()
                .map(|t| t["coefficient"].as_str().unwrap().to_string())
                .collect()
        };
        assert_eq!(values(&counted), values(&listed), "{spec} {genus}");
        assert_eq!(counted["poincare_sum"]["trace_check"], true);
        assert_eq!(
            counted["poincare_sum"]["commutant_dimension"],
            listed["poincare_sum"]["commutant_dimension"]
        );
        // |P| as `cyclorb image` finds it (Schreier–Sims on X_g alone)
        let (_, image) = cyclorb_json(&["image", spec, "--genus", &genus.to_string()]);
        assert_eq!(counted["image_order"], image["order"], "{spec} {genus}");
    }
    let sizes = [
        ("dw:Z2", 1, 3),
        ("dw:Z3", 1, 4),
        ("dw:Z3", 2, 40),
        ("dw:S3", 2, 38400),
    ];
    for (spec, genus, size) in sizes {
        assert_eq!(
            run(spec, genus, &[]).1["orbit_size"],
            size,
            "{spec} {genus}"
        );
    }
}

#[test]
fn the_certificate_multiplies_out() {
    // |Stab| = arrangements × pointwise stabiliser and |P| = |orbit| × |Stab|, exactly
    let (_, v) = run("dw:Q8", 2, &[]);
    let c = &v["details"]["certificate"];
    let big = |k: &str| -> num_bigint::BigUint { c[k].as_str().unwrap().parse().unwrap() };
    let arrangements = num_bigint::BigUint::from(c["arrangements"].as_u64().unwrap());
    assert_eq!(
        big("stabiliser_order"),
        arrangements * big("pointwise_stabiliser_order")
    );
    assert_eq!(
        big("image_order"),
        big("stabiliser_order") * big("orbit_size")
    );
    let lengths: num_bigint::BigUint = c["basic_orbit_lengths"]
        .as_array()
        .unwrap()
        .iter()
        .map(|l| num_bigint::BigUint::from(l.as_u64().unwrap()))
        .product();
    assert_eq!(lengths, big("image_order"));
}

#[test]
fn a_cap_gives_proved_bounds_not_a_count() {
    // Ω capped at 20 subsets: exit 3 (stopped), no orbit size, bounds around 38 400
    let (code, v) = run("dw:S3", 2, &["--limit", "20"]);
    assert_eq!(code, 3, "{v}");
    assert_eq!(v["orbit_size"], Value::Null);
    assert_eq!(v["saturated"], false);
    let lower = v["details"]["orbit_lower_bound"].as_u64().unwrap();
    let upper = v["details"]["orbit_upper_bound"].as_u64().unwrap();
    assert!(lower > 1 && lower <= 38400 && 38400 <= upper, "{v}");
}
