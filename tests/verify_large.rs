//! Full exact verification (pentagon included) of the larger built-ins that the theory
//! crate's own suite leaves to the command line: su2:K for 9 ≤ K ≤ 20 and so3:K for odd
//! 11 ≤ K ≤ 19. With the residue form of the pentagon, su2:20 (324 million pentagon
//! instances) takes about a minute on two cores.

mod run_cli;

use run_cli::cyclorb_json;

fn verifies_fully(spec: &str) {
    let (code, v) = cyclorb_json(&["verify", spec]);
    assert_eq!(code, 0, "{spec}: {v}");
    assert_eq!(v["ok"], true, "{spec}");
    let checks = v["checks"].as_array().unwrap();
    for name in [
        "pentagon",
        "hexagon",
        "hexagon-inverse",
        "modular-relation",
        "verlinde",
    ] {
        let check = checks.iter().find(|c| c["name"] == name);
        assert_eq!(
            check.map(|c| &c["ok"]),
            Some(&serde_json::json!(true)),
            "{spec}: {name}"
        );
    }
}

#[test]
fn su2_levels_nine_to_fourteen() {
    for k in 9..=14 {
        verifies_fully(&format!("su2:{k}"));
    }
}

#[test]
fn su2_levels_fifteen_to_twenty() {
    for k in 15..=20 {
        verifies_fully(&format!("su2:{k}"));
    }
}

#[test]
fn so3_odd_levels_eleven_to_nineteen() {
    for k in [11, 13, 15, 17, 19] {
        verifies_fully(&format!("so3:{k}"));
    }
}
