//! The modular data of D(G) from the centralisers' characters against the permutation
//! action of the Dehn twists on X_1 = {commuting pairs}/G.
//!
//! Sources: the character tables (Dixon's method) against the degrees counted by
//! Frobenius's formula (Frobenius 1896, as in `degrees`); S and T of D(G) from
//! Coste–Gannon–Ruelle, Phys. Lett. B 477 (2000) (formulas from memory); S² = C,
//! (ST)³ = S² for c = 0 (standard, modular data); V_1 = C[X_1] carries the same SL(2, Z)
//! representation as the modular data (Dijkgraaf–Witten 1990; Bakalov–Kirillov §3.2), so the
//! traces of T_α, ABA, ABA·A, (ABA)⁻¹ and (ABA)⁻¹·A agree exactly with tr T, tr S⁻¹,
//! tr S⁻¹T, tr S and tr ST (S = ABA ↦ S⁻¹ as in cyclorb-mcg's genus-1 convention; no scalar
//! enters: the permutation matrices and the normalised S, T with c = 0 are the same
//! representation of SL(2, Z), not only projectively). The vacuum line has orbits of the same size under both
//! (the orbit of the vacuum subset of X_1 under the permutations; the orbit of the vacuum
//! anyon's line under S and T of the modular data, listed by the orbit engine).

use cyclorb_dw::{
    builtin_group, character_degrees, character_table, conjugacy_classes, modular_data,
    subset_orbit, word_permutation, FlatBundles, SizeBound,
};
use cyclorb_field::{Cyc, CyclotomicField};
use cyclorb_mcg::{Curve, GeneratingSet};

const GROUPS: &[&str] = &[
    "Z2", "Z3", "Z5", "Z2xZ2", "S3", "D4", "D5", "Q8", "A4", "S4",
];

fn fixed_points(p: &[u32]) -> i64 {
    p.iter()
        .enumerate()
        .filter(|&(i, &x)| i == x as usize)
        .count() as i64
}

fn mat_mul(f: &CyclotomicField, a: &[Vec<Cyc>], b: &[Vec<Cyc>]) -> Vec<Vec<Cyc>> {
    let k = a.len();
    (0..k)
        .map(|i| {
            (0..k)
                .map(|j| {
                    let mut acc = f.zero();
                    for (l, bl) in b.iter().enumerate() {
                        acc = f.add(&acc, &f.mul(&a[i][l], &bl[j]).unwrap()).unwrap();
                    }
                    acc
                })
                .collect()
        })
        .collect()
}

#[test]
fn character_degrees_agree_with_frobenius_counts() {
    // two independent routes to the degrees of every centraliser (Frobenius 1896; Dixon 1967)
    for name in GROUPS.iter().chain(&["S5"]) {
        let g = builtin_group(name).unwrap();
        for class in conjugacy_classes(&g) {
            let table = character_table(&g, &class.centraliser).unwrap();
            let mut degrees: Vec<u64> = (0..table.values.len())
                .map(|c| u64::from(table.degree(c)))
                .collect();
            degrees.sort_unstable();
            assert_eq!(
                degrees,
                character_degrees(&g, &class.centraliser).unwrap(),
                "{name}"
            );
        }
    }
}

#[test]
fn modular_relations_hold() {
    // S² = C (a permutation matrix), (ST)³ = S² (c = 0): standard for modular data
    for name in GROUPS {
        let md = modular_data(&builtin_group(name).unwrap()).unwrap();
        let f = &md.field;
        let k = md.anyons.len();
        let s2 = mat_mul(f, &md.s, &md.s);
        for row in &s2 {
            assert_eq!(row.iter().filter(|x| x.is_one()).count(), 1, "{name}");
            assert_eq!(row.iter().filter(|x| x.is_zero()).count(), k - 1, "{name}");
        }
        let st: Vec<Vec<Cyc>> =
            md.s.iter()
                .map(|row| {
                    row.iter()
                        .zip(&md.t)
                        .map(|(x, t)| f.mul(x, t).unwrap())
                        .collect()
                })
                .collect();
        let st3 = mat_mul(f, &mat_mul(f, &st, &st), &st);
        assert_eq!(st3, s2, "{name}: (ST)^3 = S^2");
    }
}

#[test]
fn genus_one_traces_match_the_permutation_action() {
    for name in GROUPS {
        let g = builtin_group(name).unwrap();
        let md = modular_data(&g).unwrap();
        let f = &md.field;
        let x = FlatBundles::new(&g, 1, SizeBound::default()).unwrap();
        // |X_1| = number of simple objects (standard)
        assert_eq!(x.len(), md.anyons.len(), "{name}");
        let perms = x.generators(GeneratingSet::Humphries).unwrap();
        let p = |c: Curve| perms.iter().find(|(k, _)| *k == c).unwrap().1.as_slice();
        let (a, b) = (p(Curve::Alpha(0)), p(Curve::Beta(0)));
        let dim = x.len();
        let tr_a = fixed_points(&word_permutation(&[a], dim));
        let tr_s = fixed_points(&word_permutation(&[a, b, a], dim));
        let tr_sa = fixed_points(&word_permutation(&[a, b, a, a], dim));
        // S = (ABA)⁻¹ and ST = (ABA)⁻¹A: the inverse permutation of ABA
        let aba = word_permutation(&[a, b, a], dim);
        let mut s_perm = vec![0u32; dim];
        for (i, &j) in aba.iter().enumerate() {
            s_perm[j as usize] = i as u32;
        }
        let tr_s_direct = fixed_points(&s_perm);
        let tr_st = fixed_points(&word_permutation(&[&s_perm, a], dim));
        let tr_t = f.sum(md.t.iter()).unwrap();
        // S⁻¹ = S† (S unitary): tr S⁻¹ = Σ conj S_ii, tr S⁻¹T = Σ conj S_ii T_i
        let diag: Vec<Cyc> = (0..dim).map(|i| f.conj(&md.s[i][i])).collect();
        let tr_sinv = f.sum(diag.iter()).unwrap();
        let terms: Vec<Cyc> = diag
            .iter()
            .zip(&md.t)
            .map(|(s, t)| f.mul(s, t).unwrap())
            .collect();
        let tr_sinv_t = f.sum(terms.iter()).unwrap();
        let tr_s_md = f.sum((0..dim).map(|i| &md.s[i][i])).unwrap();
        let st_terms: Vec<Cyc> = (0..dim)
            .map(|i| f.mul(&md.s[i][i], &md.t[i]).unwrap())
            .collect();
        let tr_st_md = f.sum(st_terms.iter()).unwrap();
        assert_eq!(tr_s_md, f.int(tr_s_direct), "{name}: tr S");
        assert_eq!(tr_st_md, f.int(tr_st), "{name}: tr ST");
        assert_eq!(tr_t, f.int(tr_a), "{name}: tr T");
        assert_eq!(tr_sinv, f.int(tr_s), "{name}: tr S^-1");
        assert_eq!(tr_sinv_t, f.int(tr_sa), "{name}: tr S^-1 T");
    }
}

#[test]
fn genus_one_vacuum_orbits_match_the_modular_data() {
    use cyclorb_matrix::{Matrix, Operator};
    use cyclorb_orbit::{GeneratorSet, OrbitOptions, OrbitProblem, Seed, Silent};
    for name in GROUPS {
        let g = builtin_group(name).unwrap();
        let md = modular_data(&g).unwrap();
        let k = md.anyons.len();
        // the vacuum anyon: its row of S is d_b / |G| > 0 for every b (standard)
        let positive = |x: &Cyc| x.as_rational().is_some_and(|(p, _)| p > 0.into());
        let vacuum = (0..k)
            .find(|&a| md.s[a].iter().all(positive))
            .expect("a vacuum row");
        let generators = GeneratorSet::new(
            md.field.clone(),
            vec![
                (
                    "S".into(),
                    Operator::Dense(Matrix::from_rows(md.s.clone()).unwrap()),
                ),
                ("T".into(), Operator::Diagonal(md.t.clone())),
            ],
        )
        .and_then(|set| set.with_basis_labels((0..k).map(|a| a.to_string()).collect()))
        .unwrap();
        let seed = Seed::basis_vector(&md.field, k, vacuum);
        let problem = OrbitProblem::new(generators, &seed).unwrap();
        let lines = problem
            .enumerate(&OrbitOptions::default(), &mut Silent)
            .unwrap();
        assert!(lines.is_saturated());
        let x = FlatBundles::new(&g, 1, SizeBound::default()).unwrap();
        let perms = x.generators(GeneratingSet::Humphries).unwrap();
        let subsets = subset_orbit(&x.vacuum(), &perms, usize::MAX).unwrap();
        assert_eq!(lines.len(), subsets.len(), "{name}");
    }
}

#[test]
fn large_tables_are_refused_before_anything_is_built() {
    // Z_64 has 64 classes, beyond MAX_CLASSES (a bound of this crate, no outside value)
    let g = builtin_group("Z64").unwrap();
    let all: Vec<u16> = g.elements().collect();
    assert!(matches!(
        character_table(&g, &all),
        Err(cyclorb_dw::DwError::TooLarge(_))
    ));
    assert!(matches!(
        modular_data(&g),
        Err(cyclorb_dw::DwError::TooLarge(_))
    ));
}
