//! Checks against outside sources; each source is named beside its test.

use std::cmp::Ordering;

use cyclorb_field::{real_sign, root_of_unity};
use cyclorb_field::{Cyc, CyclotomicField, Rational};
use cyclorb_theory::{parse_spec, Theory};
use num_bigint::BigInt;

fn load(spec: &str) -> Theory {
    parse_spec(spec).unwrap_or_else(|e| panic!("{spec}: {e}"))
}

fn rational(p: i64, q: i64) -> Rational {
    Rational::new(BigInt::from(p), BigInt::from(q)).unwrap()
}

/// sin(π m / n) in `field` (4 | conductor and 2n | conductor).
fn sine(field: &CyclotomicField, m: i64, n: i64) -> Cyc {
    let e = |t: i64| root_of_unity(field, t, 2 * n).unwrap();
    let two_i = field.mul_int(&root_of_unity(field, 1, 4).unwrap(), 2);
    field
        .div(&field.sub(&e(m), &e(-m)).unwrap(), &two_i)
        .unwrap()
}

/// exp(2πi h) in `field`.
fn exp_2pi_i(field: &CyclotomicField, h: &Rational) -> Cyc {
    let num: i64 = h.numer().try_into().unwrap();
    let den: i64 = h.denom().try_into().unwrap();
    root_of_unity(field, num, den).unwrap()
}

fn sqrt(field: &CyclotomicField, p: i64, q: i64) -> Cyc {
    field
        .sqrt_rational(&BigInt::from(p), &BigInt::from(q))
        .unwrap()
        .unwrap()
}

#[test]
fn su2_modular_data_against_di_francesco_mathieu_senechal() {
    // Di Francesco–Mathieu–Sénéchal, Conformal Field Theory, ch. 14 and 17:
    // S_ab = √(2/(k+2)) sin(π(a+1)(b+1)/(k+2)), h_j = j(j+1)/(k+2), c = 3k/(k+2).
    for k in 1..=20i64 {
        let t = load(&format!("su2:{k}"));
        let f = t.field();
        let s = t.s_matrix().unwrap();
        let norm = sqrt(f, 2, k + 2);
        for a in 0..=k {
            for b in 0..=k {
                let expected = f.mul(&norm, &sine(f, (a + 1) * (b + 1), k + 2)).unwrap();
                assert_eq!(
                    s.get(a as usize, b as usize),
                    &expected,
                    "su2:{k} S[{a}][{b}]"
                );
            }
            // label a = 2j: h_j = j(j+1)/(k+2) = a(a+2)/(4(k+2))
            let theta = root_of_unity(f, a * (a + 2), 4 * (k + 2)).unwrap();
            assert_eq!(t.twist(a as usize), &theta, "su2:{k} θ for 2j = {a}");
        }
        assert_eq!(
            t.central_charge_mod_8(),
            rational(3 * k, k + 2).rem_euclid(8),
            "su2:{k} c"
        );
    }
}

#[test]
fn tricritical_ising_matches_the_minimal_model_m54() {
    // Di Francesco–Mathieu–Sénéchal ch. 7 and 10: M(5,4) has c = 7/10 and weights
    // 0, 1/10, 3/5, 3/2, 7/16, 3/80; its S-matrix from the Kac-table formula must equal the
    // S of (Fibonacci conjugate) ⊠ Ising-type(7) after matching labels by their twists.
    let weights = [
        rational(0, 1),
        rational(1, 10),
        rational(3, 5),
        rational(3, 2),
        rational(7, 16),
        rational(3, 80),
    ];
    let m54 = load("minimal:5:4");
    let tci = load("tricritical-ising");
    assert_eq!(m54.central_charge_mod_8(), rational(7, 10));
    assert_eq!(tci.central_charge_mod_8(), rational(7, 10));
    let n = 80;
    let field = CyclotomicField::new(n).unwrap();
    let up = |x: &Cyc| field.embed(x).unwrap();
    for theory in [&m54, &tci] {
        let mut found: Vec<Cyc> = (0..theory.rank()).map(|a| up(theory.twist(a))).collect();
        let mut expected: Vec<Cyc> = weights.iter().map(|h| exp_2pi_i(&field, h)).collect();
        found.sort_by_key(|x| x.to_string());
        expected.sort_by_key(|x| x.to_string());
        assert_eq!(found, expected, "{}: the six weights", theory.name());
    }
    // match labels by twist (all six differ) and compare S entrywise
    let matching: Vec<usize> = (0..tci.rank())
        .map(|a| {
            (0..m54.rank())
                .find(|&b| up(m54.twist(b)) == up(tci.twist(a)))
                .unwrap()
        })
        .collect();
    let (s1, s2) = (tci.s_matrix().unwrap(), m54.s_matrix().unwrap());
    for a in 0..6 {
        for b in 0..6 {
            assert_eq!(
                up(s1.get(a, b)),
                up(s2.get(matching[a], matching[b])),
                "S[{}][{}]",
                tci.label(a),
                tci.label(b)
            );
        }
    }
    // the labels of tricritical-ising are named by their weights
    for (a, name) in tci.labels().iter().enumerate() {
        let h: Rational = name.parse().unwrap();
        assert_eq!(up(tci.twist(a)), exp_2pi_i(&field, &h), "label {name}");
    }
}

#[test]
fn ising_data_against_kitaev() {
    // Kitaev, Anyons in an exactly solved model (2006), Table 1 / appendix:
    // d_σ = √2, θ_σ = exp(2πi/16), θ_ψ = −1; S = ½[[1, √2, 1], [√2, 0, −√2], [1, −√2, 1]].
    let t = load("ising");
    let f = t.field();
    let sqrt2 = sqrt(f, 2, 1);
    let (sigma, psi) = (
        t.label_index("sigma").unwrap(),
        t.label_index("psi").unwrap(),
    );
    assert_eq!(t.quantum_dim(sigma), &sqrt2);
    assert_eq!(t.quantum_dim(psi), &f.one());
    assert_eq!(t.twist(sigma), &root_of_unity(f, 1, 16).unwrap());
    assert_eq!(t.twist(psi), &f.int(-1));
    let half = f.rational(1, 2).unwrap();
    let h = |x: Cyc| f.mul(&x, &half).unwrap();
    let rows = [
        [f.one(), sqrt2.clone(), f.one()],
        [sqrt2.clone(), f.zero(), f.neg(&sqrt2)],
        [f.one(), f.neg(&sqrt2), f.one()],
    ];
    let s = t.s_matrix().unwrap();
    for (a, row) in rows.iter().enumerate() {
        for (b, x) in row.iter().enumerate() {
            assert_eq!(s.get(a, b), &h(x.clone()), "S[{a}][{b}]");
        }
    }
    assert_eq!(t.central_charge_mod_8(), rational(1, 2));
}

#[test]
fn fibonacci_data() {
    // Fibonacci anyons (e.g. Kitaev 2006; Rowell–Stong–Wang 2009): d_τ = (1+√5)/2,
    // θ_τ = exp(4πi/5), c = 14/5; the conjugate has c = −14/5.
    let t = load("fibonacci");
    let f = t.field();
    let phi = f
        .mul(
            &f.add(&f.one(), &sqrt(f, 5, 1)).unwrap(),
            &f.rational(1, 2).unwrap(),
        )
        .unwrap();
    assert_eq!(t.quantum_dim(1), &phi);
    assert_eq!(t.twist(1), &root_of_unity(f, 2, 5).unwrap());
    assert_eq!(t.central_charge_mod_8(), rational(14, 5));
    assert_eq!(
        load("conj(fibonacci)").central_charge_mod_8(),
        rational(-14, 5).rem_euclid(8)
    );
}

/// Σ_a S_0a^{2−2g}, which must be an integer.
fn verlinde_dimension(t: &Theory, genus: i64) -> BigInt {
    let f = t.field();
    let s = t.s_matrix().unwrap();
    let mut total = f.zero();
    for a in 0..t.rank() {
        total = f
            .add(&total, &f.pow(s.get(0, a), 2 - 2 * genus).unwrap())
            .unwrap();
    }
    let (p, q) = total.as_rational().expect("rational");
    assert_eq!(q, BigInt::from(1), "{}: not an integer", t.name());
    p
}

#[test]
fn verlinde_dimensions() {
    // Verlinde (1988): dim V_g = Σ_a S_0a^{2−2g}. Values: Ising 3, 10, 36, 136 and Fibonacci
    // 2, 5, 15 (from memory); SU(2)_3 4, 20, 120; SU(2)_4 5, 35, 329; tricritical Ising
    // 6, 50, 540 (docs/check-values.md table, recomputed here from the formula).
    let cases: [(&str, &[i64]); 5] = [
        ("ising", &[3, 10, 36, 136]),
        ("fibonacci", &[2, 5, 15]),
        ("su2:3", &[4, 20, 120]),
        ("su2:4", &[5, 35, 329]),
        ("tricritical-ising", &[6, 50, 540]),
    ];
    for (spec, dims) in cases {
        let t = load(spec);
        for (i, &d) in dims.iter().enumerate() {
            let g = i as i64 + 1;
            assert_eq!(
                verlinde_dimension(&t, g),
                BigInt::from(d),
                "{spec} genus {g}"
            );
        }
    }
}

/// The central charge of each built-in from formulas outside this crate.
fn expected_central_charges() -> Vec<(String, Rational)> {
    let mut out = Vec::new();
    // Ising-type ν: c = ν/2 (Kitaev 2006, sixteenfold way).
    for nu in (1..16).step_by(2) {
        out.push((format!("ising:{nu}"), rational(nu, 2)));
    }
    out.push(("fibonacci".into(), rational(14, 5)));
    out.push(("conj(fibonacci)".into(), rational(-14, 5)));
    // SU(2)_k: c = 3k/(k+2) (Di Francesco–Mathieu–Sénéchal ch. 15).
    for k in 1..=20 {
        out.push((format!("su2:{k}"), rational(3 * k, k + 2)));
    }
    // SO(3)_k, k odd: SU(2)_k = SO(3)_k ⊠ {0, k/2}, the second factor a semion (c = 1) when
    // k ≡ 1 mod 4 and its conjugate (c = −1) when k ≡ 3 mod 4 (from memory).
    for k in (1..20).step_by(2) {
        let semion = if k % 4 == 1 { 1 } else { -1 };
        out.push((
            format!("so3:{k}"),
            rational(3 * k, k + 2).sub(&rational(semion, 1)),
        ));
    }
    // Pointed Z_N: Gauss sums (Ireland–Rosen, ch. 6): Σ_{a mod N} exp(2πi a²/N) is √N for
    // N ≡ 1 and i√N for N ≡ 3 mod 4, so zn:N:2 has c = 0 or 2; for even N,
    // Σ_a exp(πi a²/N) = exp(iπ/4)√N, so zn:N:1 has c = 1 and zn:N:−1 has c = −1.
    for n in [3, 5, 7, 11, 13] {
        out.push((
            format!("zn:{n}:2"),
            rational(if n % 4 == 1 { 0 } else { 2 }, 1),
        ));
    }
    for n in [2, 4, 6, 8, 10] {
        out.push((format!("zn:{n}:1"), rational(1, 1)));
        out.push((format!("zn:{n}:-1"), rational(-1, 1)));
    }
    // Minimal models: c = 1 − 6(p−p′)²/(pp′) (Di Francesco–Mathieu–Sénéchal ch. 7).
    for (p, q) in [
        (4, 3),
        (5, 4),
        (6, 5),
        (7, 6),
        (5, 2),
        (5, 3),
        (7, 2),
        (7, 4),
    ] {
        out.push((
            format!("minimal:{p}:{q}"),
            rational(1, 1).sub(&rational(6 * (p - q) * (p - q), p * q)),
        ));
    }
    out.push(("tricritical-ising".into(), rational(7, 10)));
    out
}

#[test]
fn gauss_milgram_for_every_builtin() {
    // Gauss–Milgram (Fröhlich–Kerler; Bakalov–Kirillov ch. 3): Σ_a d_a² θ_a = D·exp(2πi c/8)
    // with D² = Σ_a d_a², c from the formulas above; D > 0 (for modular data D = 1/S_00).
    for (spec, c) in expected_central_charges() {
        let t = load(&spec);
        let f = t.field();
        assert_eq!(t.central_charge_mod_8(), c.rem_euclid(8), "{spec}: c mod 8");
        let d = t.total_dim().unwrap();
        let squares: Vec<Cyc> = t
            .quantum_dims()
            .iter()
            .map(|x| f.mul(x, x).unwrap())
            .collect();
        assert_eq!(
            &f.mul(d, d).unwrap(),
            &f.sum(&squares).unwrap(),
            "{spec}: D²"
        );
        let plus = f.dot(squares.iter().zip(t.twists())).unwrap();
        let num: i64 = c.numer().try_into().unwrap();
        let den: i64 = c.denom().try_into().unwrap();
        let phase = root_of_unity(f, num, 8 * den).expect("exp(2πi c/8) lies in the field");
        assert_eq!(plus, f.mul(d, &phase).unwrap(), "{spec}: Gauss sum");
        // D > 0 for theories with F and R, except the minimal models, which take D = 1/S_00
        // of Kac's formula (negative for some non-unitary ones, e.g. M(5,2)).
        if t.has_fr() && !spec.starts_with("minimal:") {
            assert_eq!(real_sign(f, d), Some(Ordering::Greater), "{spec}: D > 0");
        }
    }
}

#[test]
fn exact_sign_of_real_numbers() {
    // √2 − 1.41421356 > 0 > √2 − 1.41421357 (√2 = 1.41421356237…, common practice), and
    // 2cos(2π/7) − 1.2469796 > 0 (2cos(2π/7) = 1.24697960…, from memory).
    let f = CyclotomicField::new(56).unwrap();
    let s2 = sqrt(&f, 2, 1);
    let below = f
        .sub(&s2, &f.rational(141421356, 100000000).unwrap())
        .unwrap();
    let above = f
        .sub(&s2, &f.rational(141421357, 100000000).unwrap())
        .unwrap();
    assert_eq!(real_sign(&f, &below), Some(Ordering::Greater));
    assert_eq!(real_sign(&f, &above), Some(Ordering::Less));
    let c7 = f.add(&f.zeta_pow(8), &f.zeta_pow(-8)).unwrap();
    let x = f
        .sub(&c7, &f.rational(12469796, 10000000).unwrap())
        .unwrap();
    assert_eq!(real_sign(&f, &x), Some(Ordering::Greater));
    let y = f
        .sub(&c7, &f.rational(12469797, 10000000).unwrap())
        .unwrap();
    assert_eq!(real_sign(&f, &y), Some(Ordering::Less));
    assert_eq!(real_sign(&f, &f.zeta_pow(1)), None, "ζ is not real");
    assert_eq!(real_sign(&f, &f.zero()), Some(Ordering::Equal));
}
