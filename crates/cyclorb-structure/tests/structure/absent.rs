//! Theories without the structure are reported as such, not forced.

use cyclorb_structure::{analyse, StructureError, StructureOptions};

use crate::reference_orbits::space;

fn absent(spec: &str, genus: usize) -> String {
    match analyse(&space(spec, genus), &StructureOptions::default()) {
        Err(e @ StructureError::Absent(_)) => {
            assert!(e.is_absent());
            e.to_string()
        }
        Err(e) => panic!("{spec} at genus {genus}: unexpected error {e}"),
        Ok(r) => panic!(
            "{spec} at genus {genus}: a structure was claimed (orbit {})",
            r.orbit_size
        ),
    }
}

#[test]
fn fibonacci_lacks_the_structure() {
    // at genus 1 the projective image is A₅ (from memory; docs/check-values.md), which has no
    // subgroup of index 2, so its 2-dimensional representation is not monomial; for g ≥ 2
    // the image is infinite (Larsen–Wang 2005). The twists have prime order 5, so the
    // route has no proper power to start from
    for genus in [1, 2] {
        let message = absent("fibonacci", genus);
        assert!(message.contains("order 5"), "{message}");
    }
}

#[test]
fn su2_level_three_lacks_the_structure() {
    // SU(2)_3: infinite image at g ≥ 2 (Larsen–Wang 2005), so not finite monomial; at
    // genus 1 too every proper power of the twists fails to commute exactly
    for genus in [1, 2] {
        let message = absent("su2:3", genus);
        assert!(message.contains("do not commute"), "{message}");
    }
}

#[test]
fn tricritical_ising_and_su2_level_four_lack_the_structure() {
    // tricritical Ising contains Fibonacci; SU(2)_4 has a finite image (from memory:
    // Freedman–Larsen–Wang 2002 and later work) but powers of its twists leave
    // eigenspaces of dimension 2 at genus 1
    let message = absent("tricritical-ising", 1);
    assert!(message.contains("largest of dimension 2"), "{message}");
    let message = absent("su2:4", 1);
    assert!(message.contains("largest of dimension 2"), "{message}");
}
