//! Groups, flat bundles, twists and relations of the Dijkgraaf–Witten crate, against
//! standard values (each source named beside it).

use cyclorb_cert::StabiliserChain;
use cyclorb_dw::{
    builtin_group, character_degrees, check_relations, conjugacy_classes, parse_group_file,
    separating_twist, subset_orbit, verlinde_dimension, word_permutation, Automorphism, DwError,
    FlatBundles, Orbitals, SizeBound, Word,
};
use cyclorb_mcg::{Curve, GeneratingSet};

const BUILTINS: &[&str] = &[
    "Z2", "Z3", "Z5", "Z2xZ2", "S3", "D4", "D5", "Q8", "A4", "S4",
];

fn space(name: &str, genus: usize) -> FlatBundles {
    FlatBundles::new(&builtin_group(name).unwrap(), genus, SizeBound::default()).unwrap()
}

#[test]
fn orders_classes_and_degrees() {
    // standard: orders, class numbers and irreducible degrees of the small groups
    // (e.g. James–Liebeck, Representations and Characters of Groups, ch. 18–19)
    let cases: &[(&str, usize, &[u64])] = &[
        ("Z5", 5, &[1, 1, 1, 1, 1]),
        ("Z2xZ2", 4, &[1, 1, 1, 1]),
        ("S3", 6, &[1, 1, 2]),
        ("D4", 8, &[1, 1, 1, 1, 2]),
        ("D5", 10, &[1, 1, 2, 2]),
        ("Q8", 8, &[1, 1, 1, 1, 2]),
        ("A4", 12, &[1, 1, 1, 3]),
        ("S4", 24, &[1, 1, 2, 3, 3]),
        ("S5", 120, &[1, 1, 4, 4, 5, 5, 6]),
    ];
    for &(name, order, degrees) in cases {
        let g = builtin_group(name).unwrap();
        assert_eq!(g.order(), order, "{name}");
        assert_eq!(conjugacy_classes(&g).len(), degrees.len(), "{name}");
        let all: Vec<u16> = g.elements().collect();
        assert_eq!(character_degrees(&g, &all).unwrap(), degrees, "{name}");
    }
    // Q8 and D4: same degrees, told apart by their involutions (standard: Q8 has one)
    let involutions = |name: &str| {
        let g = builtin_group(name).unwrap();
        g.elements().filter(|&x| g.element_order(x) == 2).count()
    };
    assert_eq!(involutions("Q8"), 1);
    assert_eq!(involutions("D4"), 5);
}

#[test]
fn flat_bundles_count_the_verlinde_dimension() {
    // standard: |Hom(π₁Σ_g, G)/G| = dim V_g of D(G) (Dijkgraaf–Witten 1990; Verlinde)
    for name in BUILTINS {
        let g = builtin_group(name).unwrap();
        for genus in 1..=3 {
            if *name == "S4" && genus == 3 {
                continue; // 711 411 states: covered by the size bound test below
            }
            let x = FlatBundles::new(&g, genus, SizeBound::default()).unwrap();
            let v = verlinde_dimension(&g, genus).unwrap();
            assert_eq!(v, x.len().into(), "{name} at genus {genus}");
        }
    }
    // D(S3): quantum dimensions 1, 1, 2, 2, 2, 2, 3, 3, D = 6, so dim V_2 = Σ (6/d)² = 116;
    // D(Q8): 8 anyons of dimension 1 and 14 of dimension 2, D = 8: 8·64 + 14·16 = 736
    // (standard; computed by hand from the anyon content)
    assert_eq!(space("S3", 2).len(), 116);
    assert_eq!(space("Q8", 2).len(), 736);
    // abelian G: X_g = G^{2g} (standard)
    assert_eq!(space("Z3", 3).len(), 729);
}

#[test]
fn enumeration_agrees_with_burnside_by_brute_force() {
    // an independent count: Burnside's lemma over all of G^{2g}, |X_g| = (1/|G|) Σ_x |Fix(x)|
    for (name, genus) in [("S3", 2), ("Q8", 1), ("A4", 1), ("D4", 2)] {
        let g = builtin_group(name).unwrap();
        let n = g.order();
        let mut fixed = 0usize;
        let mut tuple = vec![0u16; 2 * genus];
        for code in 0..n.pow(2 * genus as u32) {
            let mut c = code;
            for slot in tuple.iter_mut() {
                *slot = (c % n) as u16;
                c /= n;
            }
            let relation = tuple
                .chunks(2)
                .fold(0u16, |acc, p| g.mul(acc, g.commutator(p[0], p[1])));
            if relation == 0 {
                fixed += g
                    .elements()
                    .filter(|&h| tuple.iter().all(|&t| g.conjugate(h, t) == t))
                    .count();
            }
        }
        assert_eq!(fixed % n, 0);
        assert_eq!(
            space(name, genus).len(),
            fixed / n,
            "{name} at genus {genus}"
        );
    }
}

#[test]
fn canonical_representatives_are_least_conjugates() {
    let x = space("S3", 2);
    let g = x.group().clone();
    for i in 0..x.len() {
        let t = x.state(i);
        for h in g.elements() {
            let c: Vec<u16> = t.iter().map(|&e| g.conjugate(h, e)).collect();
            assert!(c.as_slice() >= t);
            assert_eq!(x.canonical(&c), t);
        }
    }
    // the trivial bundle comes first and lies in the vacuum subset
    assert!(x.state(0).iter().all(|&e| e == 0));
    assert_eq!(x.vacuum()[0], 0);
}

#[test]
fn relations_hold_on_every_builtin() {
    for name in BUILTINS {
        for genus in 1..=2 {
            let x = space(name, genus);
            let checks = check_relations(&x).unwrap();
            let failed: Vec<&str> = checks
                .iter()
                .filter(|c| !c.ok)
                .map(|c| c.name.as_str())
                .collect();
            assert!(failed.is_empty(), "{name} genus {genus}: {failed:?}");
            assert!(checks.iter().any(|c| c.name.starts_with("braid")));
        }
    }
    // genus 3: γ₀ and γ₁ commute, the 4-chain is a non-trivial separating twist
    for name in ["Z2", "S3", "Q8"] {
        let checks = check_relations(&space(name, 3)).unwrap();
        assert!(checks.iter().all(|c| c.ok), "{name}");
        assert!(checks.iter().any(|c| c.name == "commute gamma0 gamma1"));
    }
}

#[test]
fn relations_catch_a_twist_of_the_wrong_handedness() {
    // the inverse twist about β₀ (a₀ ↦ a₀ b₀) breaks the braid relation with α₀ on X_1(Z3)
    let x = space("Z3", 1);
    let wrong = Automorphism::identity(1).with_image(1, Word::new(&[1, 2]));
    let pa = x
        .permutation(&cyclorb_dw::twist(Curve::Alpha(0), 1).unwrap())
        .unwrap();
    let pb = x.permutation(&wrong).unwrap();
    let d = x.len();
    assert_ne!(
        word_permutation(&[&pa, &pb, &pa], d),
        word_permutation(&[&pb, &pa, &pb], d)
    );
    // and the separating twist with the other side of conjugation is not (α₁β₁)⁶ on X_2(S3)
    let x = space("S3", 2);
    let gens = x.generators(GeneratingSet::Lickorish).unwrap();
    let p = |c: Curve| gens.iter().find(|(k, _)| *k == c).unwrap().1.clone();
    let (a1, b1) = (p(Curve::Alpha(1)), p(Curve::Beta(1)));
    let chain: Vec<&[u32]> = std::iter::repeat([a1.as_slice(), b1.as_slice()])
        .take(6)
        .flatten()
        .collect();
    let right = x.permutation(&separating_twist(2, 1..2)).unwrap();
    let boundary = Word::commutators(1..2);
    let other_side = Automorphism::conjugating(2, &[2, 3], &boundary);
    let wrong = x.permutation(&other_side).unwrap();
    assert_eq!(word_permutation(&chain, x.len()), right);
    assert_ne!(word_permutation(&chain, x.len()), wrong);
}

#[test]
fn vacuum_is_fixed_by_meridian_twists() {
    let x = space("S3", 2);
    let mut vacuum = x.vacuum();
    vacuum.sort_unstable();
    // pairs (B₀, B₁) up to conjugation: (1/6) Σ_g |C(g)|² = (36 + 3·4 + 2·9)/6 = 11
    assert_eq!(vacuum.len(), 11);
    for (curve, p) in x.generators(GeneratingSet::Lickorish).unwrap() {
        let mut image: Vec<u32> = vacuum.iter().map(|&i| p[i as usize]).collect();
        image.sort_unstable();
        assert_eq!(image == vacuum, !matches!(curve, Curve::Beta(_)), "{curve}");
    }
}

/// |orbit of the vacuum subset| and |permutation group| on X_g.
fn orbit_and_image(name: &str, genus: usize) -> (usize, String) {
    let x = space(name, genus);
    let gens = x.generators(GeneratingSet::Humphries).unwrap();
    let orbit = subset_orbit(&x.vacuum(), &gens, 1 << 20).unwrap();
    let perms: Vec<Vec<u32>> = gens.into_iter().map(|(_, p)| p).collect();
    let chain = StabiliserChain::new(x.len(), &perms).unwrap();
    (orbit.len(), chain.order().to_string())
}

#[test]
fn toric_code_and_z3_orbits_and_images() {
    // orbits: the Lagrangian subspaces of F_p^{2g}, Π_{k=1}^{g} (p^k + 1) (standard);
    // images: Sp(2g, F_p) acting on F_p^{2g}, |Sp(2,2)| = 6, |Sp(4,2)| = 720,
    // |Sp(6,2)| = 1 451 520, |Sp(2,3)| = 24, |Sp(4,3)| = 51 840 (ATLAS of Finite Groups)
    assert_eq!(orbit_and_image("Z2", 1), (3, "6".into()));
    assert_eq!(orbit_and_image("Z2", 2), (15, "720".into()));
    assert_eq!(orbit_and_image("Z2", 3), (135, "1451520".into()));
    assert_eq!(orbit_and_image("Z3", 1), (4, "24".into()));
    assert_eq!(orbit_and_image("Z3", 2), (40, "51840".into()));
    // |Sp(6, F₃)| = 9 170 703 360 (ATLAS: twice |PSp₆(3)| = 4 585 351 680)
    assert_eq!(orbit_and_image("Z3", 3), (1120, "9170703360".into()));
}

#[test]
fn humphries_and_lickorish_sets_give_the_same_orbit() {
    let x = space("Q8", 2);
    let h = x.generators(GeneratingSet::Humphries).unwrap();
    let l = x.generators(GeneratingSet::Lickorish).unwrap();
    assert_eq!(h.len(), 5);
    assert_eq!(l.len(), 5);
    let x = space("Z2xZ2", 3);
    let h = x.generators(GeneratingSet::Humphries).unwrap();
    let l = x.generators(GeneratingSet::Lickorish).unwrap();
    assert_eq!((h.len(), l.len()), (7, 8));
    let a = subset_orbit(&x.vacuum(), &h, 1 << 20).unwrap().len();
    let b = subset_orbit(&x.vacuum(), &l, 1 << 20).unwrap().len();
    assert_eq!((a, b), (135, 135));
}

#[test]
fn orbitals_count_the_commutant() {
    // Sp(2, F₂) ≅ S₃ on F₂²: orbitals {(0,0)}, {(0,v)}, {(v,0)}, {(v,v)}, {(v,w): v ≠ w ≠ 0}
    // (standard)
    let x = space("Z2", 1);
    let gens = x.generators(GeneratingSet::Humphries).unwrap();
    let perms: Vec<&[u32]> = gens.iter().map(|(_, p)| p.as_slice()).collect();
    let o = Orbitals::new(x.len(), &perms).unwrap();
    assert_eq!(o.count(), 5);
    // B = Σ 1_S 1_Sᵀ over the orbit is constant on orbitals; the identity matrix is not
    let orbit = subset_orbit(&x.vacuum(), &gens, 100).unwrap();
    let b = |i: usize, j: usize| {
        orbit
            .iter()
            .filter(|s| s.contains(&(i as u32)) && s.contains(&(j as u32)))
            .count()
    };
    let c = o.coefficients(b).unwrap();
    assert_eq!(c[o.of(0, 0)], 3); // the trivial bundle lies in every Lagrangian
    assert_eq!(c[o.of(1, 1)], 1);
    assert!(o.coefficients(|i, j| usize::from(i == j && i < 2)).is_err());
}

#[test]
fn size_bound_refuses_before_building() {
    let s4 = builtin_group("S4").unwrap();
    let bound = SizeBound {
        max_states: 100_000,
        ..SizeBound::default()
    };
    // D(S4) at genus 3: Σ (|C(x)|/d)^4 = 692480 + 1024 + 16640 + 243 + 1024 = 711411
    // (computed by hand from the centraliser degrees; standard character tables)
    match FlatBundles::new(&s4, 3, bound) {
        Err(DwError::SpaceTooLarge { states, bound }) => {
            assert_eq!(states, "711411");
            assert_eq!(bound, 100_000);
        }
        other => panic!("expected a refusal, got {other:?}"),
    }
    assert!(matches!(
        FlatBundles::new(&s4, 0, SizeBound::default()),
        Err(DwError::Genus(0))
    ));
}

#[test]
fn group_files_and_refusals() {
    let s3 = parse_group_file(
        "s3.json",
        r#"{"name": "S3", "generators": [[1, 2, 0], [1, 0, 2]]}"#,
    )
    .unwrap();
    assert_eq!(s3.order(), 6);
    let z3 = parse_group_file(
        "z3.json",
        r#"{"name": "Z3", "table": [[1, 2, 0], [2, 0, 1], [0, 1, 2]], "labels": ["r", "rr", "e"]}"#,
    )
    .unwrap();
    assert_eq!(z3.order(), 3);
    assert_eq!(z3.label(0), "e"); // the identity is renumbered first
    assert_eq!(
        space("Z3", 2).len(),
        FlatBundles::new(&z3, 2, SizeBound::default())
            .unwrap()
            .len()
    );
    let refuse = |text: &str, expected: &str| {
        let e = parse_group_file("bad.json", text).unwrap_err().to_string();
        assert!(e.starts_with("bad.json: "), "{e}");
        assert!(e.contains(expected), "{e} should mention {expected}");
    };
    refuse(
        r#"{"name": "x", "generators": [[0, 0, 1]]}"#,
        "generator 0 is not a bijection",
    );
    refuse(
        r#"{"name": "x", "generators": [[0, 3, 1]]}"#,
        "sends point 1 to 3",
    );
    refuse(
        r#"{"name": "x", "table": [[0, 1], [1, 1]]}"#,
        "row 1 contains element 1 twice",
    );
    refuse(
        r#"{"name": "x", "table": [[0, 0], [1, 1]]}"#,
        "no element is a two-sided identity",
    );
    // a Latin square with identity that is not associative (a loop of order 5)
    refuse(
        r#"{"name": "x", "table": [[0,1,2,3,4],[1,0,3,4,2],[2,4,0,1,3],[3,2,4,0,1],[4,3,1,2,0]]}"#,
        "not associative",
    );
    refuse(
        r#"{"name": "x", "table": [[0, 1], [1]]}"#,
        "row 1 has 1 entries",
    );
    refuse(r#"{"name": "x"}"#, "neither generators nor table");
    refuse(
        r#"{"name": "x", "table": [[0]], "generators": [[0]]}"#,
        "not both",
    );
    refuse(r#"{"name": "x", "tables": []}"#, "unknown key");
    refuse("[1, 2]", "not a JSON object");
    assert!(builtin_group("S7").is_err());
    assert!(builtin_group("D2").is_err());
    assert!(builtin_group("G5").is_err());
}
