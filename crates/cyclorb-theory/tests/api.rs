//! The accessors the generators use, the spec grammar, and the operations on theories.

use cyclorb_field::{Cyc, Rational};
use cyclorb_theory::{builtin_catalogue, parse_spec, Theory, TheoryError};

fn load(spec: &str) -> Theory {
    parse_spec(spec).unwrap_or_else(|e| panic!("{spec}: {e}"))
}

#[test]
fn f_and_r_accessors_follow_the_admissibility_rules() {
    let t = load("ising");
    let (one, sigma, psi) = (0, 1, 2);
    let f = t.f_matrix(sigma, sigma, sigma, sigma);
    assert_eq!(f.rows, vec![one, psi]);
    assert_eq!(f.cols, vec![one, psi]);
    // docs/conventions.md §2–3: F^{σσσ}_σ = (1/√2)[[1, 1], [1, −1]] for ν = 1
    let field = t.field();
    let inv_sqrt2 = field.inv(t.quantum_dim(sigma)).unwrap();
    assert_eq!(f.entry(psi, psi), field.neg(&inv_sqrt2));
    assert_eq!(t.f_symbol(sigma, sigma, sigma, sigma, one, psi), inv_sqrt2);
    // entries and blocks outside the fusion rules are zero / empty
    assert!(t.f_symbol(sigma, sigma, sigma, sigma, sigma, psi).is_zero());
    assert!(f.entry(sigma, one).is_zero());
    assert!(t.f_matrix(sigma, sigma, sigma, one).rows.is_empty());
    assert!(t.f_matrix(sigma, sigma, psi, sigma).rows.is_empty());
    // the inverse has rows f and columns e and multiplies to 1
    let inv = t.f_inverse(sigma, sigma, sigma, sigma);
    assert_eq!(inv.rows, f.cols);
    let product = f.matrix.mul(field, &inv.matrix).unwrap();
    assert_eq!(product, cyclorb_matrix::Matrix::identity(field, 2));
    assert!(t.r_symbol(sigma, psi, psi).is_zero());
    assert_eq!(t.r_symbol(psi, psi, one), field.int(-1));
    assert_eq!(t.fusion_outcomes(sigma, sigma), &[one, psi]);
    assert!(t.fuses(sigma, psi, sigma) && !t.fuses(sigma, psi, psi));
    assert_eq!(t.dual(sigma), sigma);
    assert!(t.is_unitary_gauge());
    // out-of-range labels never panic
    assert!(t.f_matrix(9, 0, 0, 0).rows.is_empty());
    assert!(t.r_symbol(9, 9, 9).is_zero());
    assert_eq!(t.label(9), "");
}

/// G_tree of the genus-2 comb (a0, a1, b): vertices (a0,a0*→b), (a1,a1*→b), (b,b→0);
/// handles a0, a1 (docs/conventions.md §4).
fn genus2_form(t: &Theory, a0: usize, a1: usize, b: usize) -> Cyc {
    let f = t.field();
    let vertices = [
        t.vertex_weight(a0, t.dual(a0), b),
        t.vertex_weight(a1, t.dual(a1), t.dual(b)),
        t.vertex_weight(b, t.dual(b), 0),
    ];
    let handles = f.mul(&t.handle_weight(a0), &t.handle_weight(a1)).unwrap();
    f.div(&f.product_of(&vertices), &handles).unwrap()
}

trait ProductOf {
    fn product_of(&self, xs: &[Cyc]) -> Cyc;
}

impl ProductOf for cyclorb_field::CyclotomicField {
    fn product_of(&self, xs: &[Cyc]) -> Cyc {
        xs.iter()
            .fold(self.one(), |acc, x| self.mul(&acc, x).unwrap())
    }
}

#[test]
fn fibonacci_weights_give_the_genus_two_form_of_the_conventions() {
    // docs/conventions.md §4: at genus 2, G = diag(1, 1, 1, 1, φ⁻¹), φ⁻¹ on a0 = a1 = b0 = b1 = τ.
    let t = load("fibonacci");
    let f = t.field();
    let phi = t.quantum_dim(1).clone();
    let inv_phi = f.inv(&phi).unwrap();
    assert_eq!(genus2_form(&t, 1, 1, 1), inv_phi);
    for (a0, a1) in [(0, 0), (0, 1), (1, 0), (1, 1)] {
        assert_eq!(genus2_form(&t, a0, a1, 0), f.one(), "a0={a0} a1={a1}");
    }
    assert!(!t.is_unitary_gauge());
}

#[test]
fn su2_weights_follow_the_square_root_free_gauge() {
    // docs/conventions.md §4: w(a,b,c) = 1/(Δ(a,b,c)²[2c+1]) and handle weight [2a+1]; for
    // (½, ½ → 1): Δ² = 1/([2][3]), so w = [2]; for (½, ½ → 0): w = [2] = handle weight of ½.
    for k in 1..=6 {
        let t = load(&format!("su2:{k}"));
        let half = t.label_index("1/2").unwrap();
        let d_half = t.quantum_dim(half).clone();
        assert_eq!(t.handle_weight(half), d_half, "su2:{k}");
        assert_eq!(t.vertex_weight(half, half, 0), d_half, "su2:{k}");
        if k >= 2 {
            let one = t.label_index("1").unwrap();
            assert_eq!(t.vertex_weight(half, half, one), d_half, "su2:{k}");
            // handle weight of spin 1 is [3] = d_1
            assert_eq!(&t.handle_weight(one), t.quantum_dim(one), "su2:{k}");
        }
        assert_eq!(t.vertex_weight(0, half, half), t.field().one());
    }
}

#[test]
fn products_conjugates_and_gauges_behave() {
    let a = load("ising");
    let b = load("fibonacci");
    let p = load("ising*fibonacci");
    assert_eq!(p.rank(), 6);
    assert_eq!(p.conductor(), 80);
    assert_eq!(p.label(3), "sigma*tau");
    assert_eq!(
        p.central_charge_mod_8(),
        a.central_charge_mod_8()
            .add(&b.central_charge_mod_8())
            .rem_euclid(8)
    );
    // F of the product is the product of F's: [F^{σ·τ σ·τ σ·τ}_{σ·τ}] is 4×4
    let st = p.label_index("sigma*tau").unwrap();
    assert_eq!(p.f_matrix(st, st, st, st).rows.len(), 4);
    // c of conj is −c; galois:3 of Fibonacci is the Yang–Lee-type theory with d_τ = −1/φ
    let yl = load("galois:3(fibonacci)");
    let f = yl.field();
    let expected = f.neg(&f.inv(&f.embed(b.quantum_dim(1)).unwrap()).unwrap());
    assert_eq!(yl.quantum_dim(1), &expected);
    assert!(!yl.is_unitary_gauge(), "σ acts on the weights");
    // a random gauge changes F and the weights, not the gauge-invariant data
    let g = load("gauge:11(su2:3)");
    let s = load("su2:3");
    assert_ne!(g.f_symbol(1, 1, 1, 1, 2, 2), s.f_symbol(1, 1, 1, 1, 2, 2));
    assert_eq!(g.s_matrix(), s.s_matrix());
    assert_eq!(g.twists(), s.twists());
    assert_ne!(g.data_hash(), s.data_hash());
    assert_eq!(
        load("gauge:11(su2:3)").data_hash(),
        g.data_hash(),
        "reproducible"
    );
}

#[test]
fn spec_errors_are_explained() {
    for (spec, needle) in [
        ("isin", "unknown theory"),
        ("su2:0", "level"),
        ("su2:x", "integer"),
        ("so3:4", "odd"),
        ("zn:4:2", "gcd"),
        ("zn:3:1", "even"),
        ("minimal:4:2", "coprime"),
        ("ising:4", "odd"),
        ("galois:2(ising)", "gcd"),
        ("conj(ising", "expected ')'"),
        ("ising*", "expected a theory name"),
        ("gauge:1(kac:5:4)", "F- and R-symbols"),
        ("no/such/file.json", "cannot read"),
    ] {
        let err = parse_spec(spec).expect_err(spec);
        let text = err.to_string();
        assert!(text.contains(needle), "{spec}: {text}");
        assert!(
            matches!(err, TheoryError::Spec { .. } | TheoryError::File { .. }),
            "{spec}"
        );
    }
}

#[test]
fn the_catalogue_lists_the_contract_names() {
    let names: Vec<String> = builtin_catalogue().into_iter().map(|(s, _)| s).collect();
    for required in [
        "ising",
        "fibonacci",
        "tricritical-ising",
        "su2:K",
        "so3:K",
        "zn:N:P",
        "minimal:P:Q",
    ] {
        assert!(names.iter().any(|n| n == required), "{required}");
    }
    assert_eq!(
        load("zn:2:1").central_charge_mod_8(),
        "1".parse::<Rational>().unwrap(),
        "the semion"
    );
}

#[test]
fn construction_hashes_identify_data_without_filling_a_product() {
    // A theory whose F-symbols are its own hashes its data.
    let su2 = load("su2:3");
    assert_eq!(su2.construction_hash(), su2.data_hash());
    // Products and conjugates hash their building blocks: stable across builds, different
    // from the data hash's text, and changed by any change of a factor, of the Galois
    // exponent or of the sign of D (M(5,2) negates it).
    let a = load("ising*fibonacci").construction_hash();
    assert_eq!(a, load("ising*fibonacci").construction_hash());
    assert_ne!(a, load("ising*fibonacci").data_hash());
    let others = [
        "ising*conj(fibonacci)",
        "ising:3*fibonacci",
        "fibonacci*ising",
        "galois:3(su2:3)",
        "galois:7(su2:3)",
        "minimal:5:2",
        "minimal:5:3",
    ];
    let mut seen = vec![a];
    for spec in others {
        let h = load(spec).construction_hash();
        assert!(!seen.contains(&h), "{spec} repeats a construction hash");
        seen.push(h);
    }
}
