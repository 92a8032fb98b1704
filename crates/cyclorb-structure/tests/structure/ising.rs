//! Ising (and the Ising-type SU(2)_2) against published values, an independent brute-force
//! orbit, cyclorb-cert's image routes, and the symplectic counts the structure predicts.

use cyclorb_cert::{enumerate_projective_image, image_from_orbit, ImageEnumeration};
use cyclorb_mcg::GeneratingSet;
use cyclorb_structure::{analyse, StructureOptions};

use crate::reference_orbits::{
    brute_orbit, brute_prefactor, generator_set, lagrangians, report, space, symplectic_order,
};

#[test]
fn genus_one_matches_the_published_orbit_and_both_image_routes() {
    let space = space("ising", 1);
    let r = report(&space);
    // Castro, Gaberdiel, Hartman, Maloney, Volpato, Phys. Rev. D 85, 024032 (2012):
    // 24 lines, B = 8·I
    assert_eq!(r.orbit_size, "24");
    assert_eq!(r.prefactor.as_deref(), Some("8"));
    assert_eq!(r.commutant_dimension, 1);
    let lines = brute_orbit(&space);
    assert_eq!(lines.len(), 24);
    let field = space.theory().field();
    assert_eq!(brute_prefactor(&space, &lines), Some(field.int(8)));
    // the three even spin structures of the torus are permuted by SL(2, F₂) ≅ S₃
    assert_eq!(r.supports, lagrangians(1).to_string());
    assert_eq!(r.image.permutation_order, symplectic_order(1).to_string());
    // the projective image, by cyclorb-cert's two routes
    let gens = generator_set(&space);
    let ImageEnumeration::Finite(enumerated) = enumerate_projective_image(&gens, 10_000).unwrap()
    else {
        panic!("the genus-1 Ising image is finite");
    };
    assert_eq!(r.image_order, enumerated.order.to_string());
    let by_orbit = image_from_orbit(&gens, &lines).unwrap();
    assert_eq!(r.image_order, by_orbit.group.order);
}

#[test]
fn genus_two_matches_the_published_orbit_and_the_orbit_image_route() {
    let space = space("ising", 2);
    let r = report(&space);
    // the all-genus follow-up (2019) of Castro et al.: 3840 lines, B = 384·I
    assert_eq!(r.orbit_size, "3840");
    assert_eq!(r.prefactor.as_deref(), Some("384"));
    let lines = brute_orbit(&space);
    assert_eq!(lines.len(), 3840);
    let field = space.theory().field();
    assert_eq!(brute_prefactor(&space, &lines), Some(field.int(384)));
    // Lagrangians of F₂⁴ and |Sp(4, F₂)| = 720 (Grove)
    assert_eq!(r.supports, lagrangians(2).to_string());
    assert_eq!(r.orbit.support_size, 4);
    assert_eq!(r.image.permutation_order, symplectic_order(2).to_string());
    // cyclorb-cert: Schreier–Sims on the 3840 lines, after its faithfulness lemma
    let by_orbit = image_from_orbit(&generator_set(&space), &lines).unwrap();
    assert_eq!(r.image_order, by_orbit.group.order);
}

#[test]
fn genus_three_has_the_symplectic_counts() {
    let space = space("ising", 3);
    // Verlinde: dim V_3 = 36 for Ising (docs/genus-g.md §1)
    assert_eq!(space.dimension(), 36);
    let r = report(&space);
    assert_eq!(r.supports, lagrangians(3).to_string());
    assert_eq!(r.orbit.support_size, 8);
    assert_eq!(r.image.permutation_order, symplectic_order(3).to_string());
    let supports: u128 = r.supports.parse().unwrap();
    let patterns: u128 = r.patterns_per_support.parse().unwrap();
    let orbit: u128 = r.orbit_size.parse().unwrap();
    assert_eq!(orbit, supports * patterns);
    // λ = |orbit|·⟨v₀, v₀⟩/dim with ⟨v₀, v₀⟩ = 1 (unitary gauge)
    assert_eq!(r.prefactor, Some((orbit / 36).to_string()));
    assert_eq!(orbit % 36, 0);
}

#[test]
fn both_generating_sets_give_the_same_counts() {
    let space = space("ising", 3);
    let humphries = report(&space);
    let lickorish = analyse(
        &space,
        &StructureOptions {
            generating_set: GeneratingSet::Lickorish,
            ..StructureOptions::default()
        },
    )
    .unwrap();
    assert_eq!(humphries.generators.len(), 7);
    assert_eq!(lickorish.generators.len(), 8);
    assert_eq!(humphries.image_order, lickorish.image_order);
    assert_eq!(humphries.image, lickorish.image);
    assert_eq!(humphries.orbit_size, lickorish.orbit_size);
    assert_eq!(humphries.prefactor, lickorish.prefactor);
    assert_eq!(humphries.orbit, lickorish.orbit);
}

#[test]
fn ising_type_su2_level_two_agrees_with_brute_force() {
    // SU(2)_2 is the Ising-type theory ν = 3 up to gauge (docs/conventions.md §2–3)
    for genus in [1, 2] {
        let space = space("su2:2", genus);
        let r = report(&space);
        let lines = brute_orbit(&space);
        assert_eq!(r.orbit_size, lines.len().to_string());
        let lambda = brute_prefactor(&space, &lines).unwrap();
        let (p, q) = lambda.as_rational().unwrap();
        assert_eq!(r.prefactor, Some(format!("{}", p / q)));
    }
}

#[test]
fn a_pointed_theory_with_the_structure_agrees_with_brute_force() {
    // Z_4 with θ_a = exp(πi a²/4): its genus-1 representation is monomial but reducible,
    // so the orbit is counted and no prefactor is claimed; brute force finds B·G not scalar
    let space = space("zn:4:1", 1);
    let r = report(&space);
    let lines = brute_orbit(&space);
    assert_eq!(r.orbit_size, lines.len().to_string());
    assert!(r.commutant_dimension > 1);
    assert_eq!(r.prefactor, None);
    assert_eq!(brute_prefactor(&space, &lines), None);
}

#[test]
fn genus_four_has_the_symplectic_counts_and_rechecks() {
    let space = space("ising", 4);
    // Verlinde: dim V_4 = 136 for Ising (docs/genus-g.md §1)
    assert_eq!(space.dimension(), 136);
    let r = report(&space);
    assert_eq!(r.supports, lagrangians(4).to_string());
    assert_eq!(r.orbit.support_size, 16);
    assert_eq!(r.image.permutation_order, symplectic_order(4).to_string());
    let supports: u128 = r.supports.parse().unwrap();
    let patterns: u128 = r.patterns_per_support.parse().unwrap();
    let orbit: u128 = r.orbit_size.parse().unwrap();
    assert_eq!(orbit, supports * patterns);
    assert_eq!(orbit % 136, 0);
    assert_eq!(r.prefactor, Some((orbit / 136).to_string()));
    cyclorb_structure::recheck(&space, &r.certificate).unwrap();
}
