//! The certificate survives a JSON round trip and re-checking, and every kind of tampering
//! is caught.

use cyclorb_structure::{recheck, StructureCertificate, StructureError};

use crate::common::{report, space};

fn rejected(result: Result<(), StructureError>) -> bool {
    result.is_err()
}

#[test]
fn the_certificate_rechecks_after_a_json_round_trip() {
    let space = space("ising", 2);
    let r = report(&space);
    let text = serde_json::to_string(&r).unwrap();
    let back: cyclorb_structure::StructureReport = serde_json::from_str(&text).unwrap();
    assert_eq!(back.certificate, r.certificate);
    recheck(&space, &back.certificate).unwrap();
    // the certificate names its base and strong generators and the kernel's invariants
    let value: serde_json::Value = serde_json::from_str(&text).unwrap();
    let cert = &value["certificate"];
    assert!(cert["permutation_group"]["base"].is_array());
    assert!(cert["permutation_group"]["strong_generators"].is_array());
    assert!(cert["kernel"]["invariants"].is_array());
    assert_eq!(value["route"], "structure");
}

#[test]
fn tampering_is_caught() {
    let space = space("ising", 2);
    let good: StructureCertificate = report(&space).certificate;
    recheck(&space, &good).unwrap();

    let mut phase = good.clone();
    phase.monomials[2].phases[0] = (phase.monomials[2].phases[0] + 1) % phase.phase_modulus;
    assert!(rejected(recheck(&space, &phase)));

    let mut perm = good.clone();
    perm.monomials[0].perm.swap(0, 1);
    assert!(rejected(recheck(&space, &perm)));

    let mut vector = good.clone();
    let entry = &mut vector.basis[3][0].1;
    *entry = format!("2*({entry})");
    assert!(rejected(recheck(&space, &vector)));

    let mut orbit = good.clone();
    orbit.orbit_size = "3841".into();
    assert!(rejected(recheck(&space, &orbit)));

    let mut order = good.clone();
    order.image_order = "720".into();
    assert!(rejected(recheck(&space, &order)));

    let mut invariants = good.clone();
    invariants.kernel.invariants.pop();
    assert!(rejected(recheck(&space, &invariants)));

    let mut base = good.clone();
    base.permutation_group.base.reverse();
    assert!(rejected(recheck(&space, &base)));

    let mut vacuum = good.clone();
    vacuum.vacuum.pop();
    assert!(rejected(recheck(&space, &vacuum)));

    let mut diagonal = good.clone();
    if let Some(x) = diagonal.commutant_diagonals.first_mut() {
        x[0] = (x[0] + 1) % good.phase_modulus;
    }
    assert!(rejected(recheck(&space, &diagonal)));

    let mut garbage = good.clone();
    garbage.basis[0][0].1 = "z^(".into();
    assert!(rejected(recheck(&space, &garbage)));

    // a certificate for genus 2 does not describe genus 1
    assert!(rejected(recheck(&crate::common::space("ising", 1), &good)));
}
