//! The imprimitive route: SU(2)_4 against brute force and the enumerating route's values,
//! the sector dimensions and block permutation groups against their formulas, and the
//! monomial theories through the generalised route.

use cyclorb_structure::{
    analyse_imprimitive, recheck_imprimitive, ImprimitiveOptions, ImprimitiveReport, StructureError,
};

use crate::reference_orbits::{brute_orbit, lagrangians, report, space, symplectic_order};

fn imprimitive(spec: &str, genus: usize) -> ImprimitiveReport {
    analyse_imprimitive(&space(spec, genus), &ImprimitiveOptions::default()).unwrap()
}

/// The sector dimensions of SU(2)_4 at genus g (docs/orbits.md §5): (3^g + 1)/2 for the
/// untwisted sector, (3^{g−1} + 1)/2 for each of the 4^g − 1 others.
fn sector_dimensions(g: u32) -> Vec<(usize, usize)> {
    // 3^g is odd: (3^g + 1)/2 = ⌈3^g / 2⌉
    let untwisted = 3usize.pow(g).div_ceil(2);
    let twisted = 3usize.pow(g - 1).div_ceil(2);
    let mut dims = vec![(untwisted, 1), (twisted, 4usize.pow(g) - 1)];
    dims.sort_unstable();
    dims
}

#[test]
fn su2_level_four_genus_one_matches_brute_force() {
    let s = space("su2:4", 1);
    let r = imprimitive("su2:4", 1);
    // the brute-force breadth-first search over exact lines (tests/structure/reference_orbits.rs)
    assert_eq!(r.orbit_size, brute_orbit(&s).len().to_string());
    assert_eq!(r.sector_dimensions, sector_dimensions(1));
    // Sp(2, F_2) = SL(2, F_2) ≅ S_3 permutes the three twisted sectors
    assert_eq!(r.block_permutation_order, symplectic_order(1).to_string());
    // B = 8·1 + 2·(the D-series invariant) at genus 1 (`cyclorb orbit su2:4 --genus 1`, the
    // enumerating route; Cappelli–Itzykson–Zuber: the D₄ invariant |χ₀+χ₄|² + 2|χ₂|²), so
    // B's vacuum column has 8 + 2 = 10 at the vacuum and 2 at the label 2
    let column: Vec<&str> = r.vacuum_column.iter().map(|(_, x)| x.as_str()).collect();
    assert_eq!(column, ["10", "2"]);
    recheck_imprimitive(&s, &r.certificate, Some(1_000_000)).unwrap();
}

#[test]
fn su2_level_four_genus_two_matches_the_enumerating_route() {
    let s = space("su2:4", 2);
    let r = imprimitive("su2:4", 2);
    // the enumerating route: 1 228 800 lines, B = 38 400·I₁ + 7 680·I₂ where I₁, I₂ are 1 at
    // the vacuum–vacuum entry and at (vacuum, a = (0, 2)) respectively, and the image order
    // 2^59·3^15·5^2 by Schreier–Sims on the orbit (README, "Certificates")
    assert_eq!(r.orbit_size, "1228800");
    let order = num_bigint::BigUint::from(2u32).pow(59)
        * num_bigint::BigUint::from(3u32).pow(15)
        * num_bigint::BigUint::from(25u32);
    assert_eq!(r.image_order, order.to_string());
    let column: Vec<&str> = r.vacuum_column.iter().map(|(_, x)| x.as_str()).collect();
    assert_eq!(column, ["38400", "7680", "7680", "7680"]);
    assert_eq!(r.commutant_dimension, 2);
    // the factorisation 15 × 40 × 4³ × 32: the supports are the Lagrangians of F_2^4
    assert_eq!(r.sector_supports, lagrangians(2).to_string());
    assert_eq!(
        r.line_tuples_per_sector_support,
        (40 * 4 * 4 * 4).to_string()
    );
    assert_eq!(r.patterns_per_support, "32");
    assert_eq!(r.sector_dimensions, sector_dimensions(2));
    // the block permutation group is Sp(4, F_2) ≅ S_6, of order 720 (ATLAS of Finite Groups)
    assert_eq!(r.block_permutation_order, symplectic_order(2).to_string());
    recheck_imprimitive(&s, &r.certificate, Some(1_000_000)).unwrap();
}

#[test]
fn monomial_theories_give_the_same_answers() {
    // blocks of size 1 are a special case: the orbit and the image order of the monomial
    // route (itself checked against brute force and published values in ising.rs)
    for (spec, genus) in [
        ("ising", 1),
        ("ising", 2),
        ("ising", 3),
        ("su2:2", 2),
        ("zn:4:1", 2),
    ] {
        let s = space(spec, genus);
        let monomial = report(&s);
        let r = imprimitive(spec, genus);
        assert_eq!(r.orbit_size, monomial.orbit_size, "{spec} at genus {genus}");
        assert_eq!(
            r.image_order, monomial.image_order,
            "{spec} at genus {genus}"
        );
        recheck_imprimitive(&s, &r.certificate, Some(1_000_000)).unwrap();
    }
}

#[test]
fn tampering_is_caught() {
    let s = space("su2:4", 1);
    let r = imprimitive("su2:4", 1);
    let mut c = r.certificate.clone();
    c.monomials[0].phases[0] = (c.monomials[0].phases[0] + 1) % c.phase_modulus;
    assert!(recheck_imprimitive(&s, &c, Some(1_000_000)).is_err());
    let mut c = r.certificate.clone();
    c.orbit_size = "49".into();
    assert!(recheck_imprimitive(&s, &c, Some(1_000_000)).is_err());
    let mut c = r.certificate;
    c.components.pop();
    assert!(recheck_imprimitive(&s, &c, Some(1_000_000)).is_err());
}

#[test]
fn fibonacci_lacks_the_imprimitive_structure() {
    // the twists of Fibonacci have prime order 5 (no proper power); its genus-2 image is
    // infinite (Larsen–Wang 2005)
    match analyse_imprimitive(&space("fibonacci", 2), &ImprimitiveOptions::default()) {
        Err(e @ StructureError::Absent(_)) => assert!(e.to_string().contains("order 5"), "{e}"),
        Err(e) => panic!("unexpected error {e}"),
        Ok(r) => panic!("a structure was claimed (orbit {})", r.orbit_size),
    }
}
