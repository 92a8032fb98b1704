//! The comb basis has the dimension the Verlinde formula predicts:
//! dim V_g = Σ_a S_0a^{2−2g} = Σ_a (D²/d_a²)^{g−1} (Verlinde 1988; Moore–Seiberg 1989),
//! computed exactly in the theory's field.

#[path = "../../../tests/outside/mod.rs"]
mod outside;

use cyclorb_mcg::BlockSpace;
use cyclorb_theory::parse_spec;

/// Σ_a (D²/d_a²)^{g−1} as an integer.
fn verlinde(spec: &str, genus: usize) -> i64 {
    let t = parse_spec(spec).unwrap();
    let f = t.field();
    let dims: Vec<_> = (0..t.rank()).map(|a| t.quantum_dim(a).clone()).collect();
    let d2 = f.dot(dims.iter().zip(&dims)).unwrap();
    let mut total = f.zero();
    for d in &dims {
        let ratio = f.div(&d2, &f.mul(d, d).unwrap()).unwrap();
        total = f
            .add(&total, &f.pow(&ratio, genus as i64 - 1).unwrap())
            .unwrap();
    }
    let (p, q) = total.as_rational().expect("the Verlinde sum is rational");
    assert_eq!(
        q,
        1.into(),
        "{spec} genus {genus}: Verlinde sum {total} is not an integer"
    );
    p.try_into().unwrap()
}

fn comb_dimension(spec: &str, genus: usize) -> i64 {
    BlockSpace::new(parse_spec(spec).unwrap(), genus)
        .unwrap()
        .dimension() as i64
}

#[test]
fn published_dimensions() {
    // every published dimension of fixtures/outside.toml (Verlinde 1988; the sources are in
    // the table)
    let theories = outside::verlinde_theories();
    assert!(theories.len() >= 4);
    for spec in theories {
        for (g, &d) in outside::verlinde(&spec).iter().enumerate() {
            assert_eq!(
                comb_dimension(&spec, g + 1),
                d as i64,
                "{spec} genus {}",
                g + 1
            );
        }
    }
}

#[test]
fn every_small_builtin_matches_verlinde() {
    // up to genus 4 for at most 6 labels, genus 3 above that
    let specs = [
        "ising",
        "ising:3",
        "ising:5",
        "ising:7",
        "fibonacci",
        "conj(fibonacci)",
        "su2:1",
        "su2:2",
        "su2:3",
        "su2:4",
        "su2:5",
        "su2:6",
        "so3:3",
        "so3:5",
        "so3:7",
        "zn:2:1",
        "zn:3:2",
        "zn:4:1",
        "zn:5:2",
        "tricritical-ising",
        "ising*fibonacci",
        "galois:3(su2:3)",
    ];
    for spec in specs {
        let rank = parse_spec(spec).unwrap().rank();
        let top = if rank <= 6 { 4 } else { 3 };
        for g in 1..=top {
            assert_eq!(
                comb_dimension(spec, g),
                verlinde(spec, g),
                "{spec} genus {g}"
            );
        }
    }
}

#[test]
fn larger_levels_at_genus_two() {
    for k in [7, 8, 10, 12] {
        let spec = format!("su2:{k}");
        assert_eq!(comb_dimension(&spec, 2), verlinde(&spec, 2), "{spec}");
    }
}
