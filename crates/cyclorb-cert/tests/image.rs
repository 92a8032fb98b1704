//! Image orders by the two routes, on the genus-1 Ising and Fibonacci representations and
//! on Clifford groups.

#[path = "../../../tests/outside/mod.rs"]
mod outside;
mod sample_sets;

use cyclorb_cert::{
    enumerate_projective_image, image_from_lines, image_from_orbit, induced_permutations,
    CertError, ImageEnumeration, ImageOptions, PermutationImageCertificate, ProvedGenerators,
};
use cyclorb_field::CyclotomicField;
use cyclorb_matrix::{Matrix, Operator};
use sample_sets::*;

fn enumerated_order(gens: &ProvedGenerators, cap: usize) -> u64 {
    match enumerate_projective_image(gens, cap).unwrap() {
        ImageEnumeration::Finite(cert) => {
            cert.verify(gens).unwrap();
            cert.order
        }
        ImageEnumeration::Exceeds { cap } => panic!("more than {cap} elements"),
    }
}

fn orbit_certificate(
    gens: &ProvedGenerators,
    cap: usize,
) -> (Vec<Vec<cyclorb_field::Cyc>>, PermutationImageCertificate) {
    let lines = line_orbit(gens, vacuum(gens.field(), gens.dimension()), cap);
    let cert = image_from_orbit(gens, &lines).unwrap();
    cert.verify(gens, &lines, &ImageOptions::default()).unwrap();
    (lines, cert)
}

#[test]
fn fibonacci_genus_one_image_is_a5_by_both_routes() {
    // The projective image of SL(2, Z) in the Fibonacci representation is A₅, order 60
    // (fixtures/outside.toml: level-5 congruence representation, SL(2, 5)/±1 ≅ A₅).
    let gens = fibonacci().generators();
    let order = outside::image_order("fibonacci", 1);
    assert_eq!(enumerated_order(&gens, 1000), order);
    let (lines, cert) = orbit_certificate(&gens, 1000);
    // the vacuum line's orbit: the 12 vertices of the icosahedron on CP¹, stabiliser C₅
    // (rotation group of the icosahedron; from memory)
    assert_eq!(lines.len(), 12);
    assert_eq!(cert.group.order, order.to_string());
    assert_eq!(cert.group.orbit_of_first_point, 12);
    assert_eq!(cert.group.stabiliser_order, "5");
}

#[test]
fn ising_genus_one_image_orders_agree() {
    let gens = ising().generators();
    let enumerated = enumerated_order(&gens, 100_000);
    let (lines, cert) = orbit_certificate(&gens, 10_000);
    // orbit of the vacuum line: 24 lines (fixtures/outside.toml: Castro, Gaberdiel,
    // Hartman, Maloney, Volpato, Phys. Rev. D 85, 024032 (2012))
    assert_eq!(lines.len() as u64, outside::orbit("ising", 1).lines);
    assert_eq!(cert.group.order, enumerated.to_string());
    // 384 (both routes agree; value recomputed, not from a source)
    assert_eq!(enumerated, 384);
    // the stabiliser of the vacuum line contains ⟨T⟩, T of projective order 16
    // (θ_σ = ζ16; Di Francesco–Mathieu–Sénéchal, ch. 12)
    let stabiliser: u64 = cert.group.stabiliser_order.parse().unwrap();
    assert_eq!(stabiliser % 16, 0);
    assert_eq!(24 * stabiliser, enumerated);
    let text = serde_json::to_string(&cert).unwrap();
    let back: PermutationImageCertificate = serde_json::from_str(&text).unwrap();
    back.verify(&gens, &lines, &ImageOptions { threads: 2 })
        .unwrap();
}

#[test]
fn tampered_image_certificates_are_rejected() {
    let gens = fibonacci().generators();
    let (lines, cert) = orbit_certificate(&gens, 1000);
    let options = ImageOptions::default();
    let mut wrong_order = cert.clone();
    wrong_order.group.order = "120".into();
    assert!(matches!(
        wrong_order.verify(&gens, &lines, &options),
        Err(CertError::Rejected(_))
    ));
    let mut wrong_perm = cert.clone();
    wrong_perm.permutation_digests.swap(0, 1);
    assert!(matches!(
        wrong_perm.verify(&gens, &lines, &options),
        Err(CertError::Rejected(_))
    ));
    let mut wrong_links = cert.clone();
    wrong_links.faithfulness.links.clear();
    assert!(matches!(
        wrong_links.verify(&gens, &lines, &options),
        Err(CertError::Rejected(_))
    ));
    let mut fewer_lines = cert;
    fewer_lines.lines -= 1;
    assert!(matches!(
        fewer_lines.verify(&gens, &lines, &options),
        Err(CertError::Rejected(_))
    ));
}

#[test]
fn unsaturated_lines_and_non_faithful_orbits_are_errors() {
    let gens = fibonacci().generators();
    let lines = line_orbit(&gens, vacuum(gens.field(), 2), 1000);
    assert!(matches!(
        induced_permutations(&gens, &lines[..5], 1),
        Err(CertError::Input(_))
    ));
    // a diagonal generator alone: the orbit of e_0 is one line, which spans nothing
    let f = CyclotomicField::new(4).unwrap();
    let d = ProvedGenerators::new(
        f.clone(),
        vec![("d".into(), Operator::Diagonal(vec![f.one(), f.zeta_pow(1)]))],
        None,
    )
    .unwrap();
    assert!(matches!(
        image_from_orbit(&d, &vec![vacuum(&f, 2)]),
        Err(CertError::Input(_))
    ));
}

#[test]
fn an_infinite_image_exceeds_any_cap() {
    // [[1,2],[0,1]] and [[1,0],[2,1]] generate a free group (Sanov's theorem; common practice)
    let f = CyclotomicField::new(1).unwrap();
    let a = Matrix::from_rows(vec![vec![f.one(), f.int(2)], vec![f.zero(), f.one()]]).unwrap();
    let b = Matrix::from_rows(vec![vec![f.one(), f.zero()], vec![f.int(2), f.one()]]).unwrap();
    let gens = ProvedGenerators::new(
        f,
        vec![
            ("a".into(), Operator::Dense(a)),
            ("b".into(), Operator::Dense(b)),
        ],
        None,
    )
    .unwrap();
    let outcome = enumerate_projective_image(&gens, 500).unwrap();
    assert_eq!(outcome, ImageEnumeration::Exceeds { cap: 500 });
    let json = serde_json::to_value(&outcome).unwrap();
    assert_eq!(json, serde_json::json!({"result": "exceeds", "cap": 500}));
}

/// The n-qubit Clifford generators over Q(ζ_8): H and S = diag(1, i) on each qubit and CNOT
/// from each qubit to the next, as dense 2ⁿ × 2ⁿ matrices (qubit 0 outermost).
fn clifford(n: usize) -> ProvedGenerators {
    let f = CyclotomicField::new(8).unwrap();
    let h = matrix(
        &f,
        &[&["1/sqrt(2)", "1/sqrt(2)"], &["1/sqrt(2)", "-1/sqrt(2)"]],
    );
    let s = matrix(&f, &[&["1", "0"], &["0", "i"]]);
    let one = Matrix::identity(&f, 2);
    let on_qubit = |q: usize, gate: &Matrix| {
        (0..n).fold(Matrix::identity(&f, 1), |acc, k| {
            acc.kronecker(&f, if k == q { gate } else { &one }).unwrap()
        })
    };
    let dim = 1usize << n;
    let mut gens = Vec::new();
    for q in 0..n {
        gens.push((format!("H{q}"), Operator::Dense(on_qubit(q, &h))));
        gens.push((format!("S{q}"), Operator::Dense(on_qubit(q, &s))));
    }
    for q in 0..n - 1 {
        // |x⟩ ↦ |x with bit q+1 flipped when bit q is set⟩ (bit q is 2^(n−1−q))
        let (control, target) = (1 << (n - 1 - q), 1 << (n - 2 - q));
        let mut m = Matrix::zeros(&f, dim, dim);
        for x in 0..dim {
            let y = if x & control != 0 { x ^ target } else { x };
            m.set(y, x, f.one());
        }
        gens.push((format!("CNOT{q}"), Operator::Dense(m)));
    }
    ProvedGenerators::new(f, gens, None).unwrap()
}

#[test]
fn three_qubit_clifford_group_by_base_images() {
    // The stabiliser states of 3 qubits: 2³·(2+1)(4+1)(8+1) = 1080 (Aaronson–Gottesman,
    // Phys. Rev. A 70, 052328 (2004)); the Clifford group modulo phases has order
    // 2^(n²+2n)·Π_{j≤n}(4^j − 1) = 2^15·3·15·63 = 92 897 280 (Calderbank, Rains, Shor,
    // Sloane, IEEE Trans. Inf. Theory 44 (1998)).
    let gens = clifford(3);
    let lines = line_orbit(&gens, vacuum(gens.field(), 8), 2000);
    assert_eq!(lines.len(), 1080);
    let options = ImageOptions { threads: 2 };
    let cert = image_from_lines(&gens, &lines, &options).unwrap();
    assert_eq!(cert.group.order, "92897280");
    assert_eq!(cert.group.orbit_of_first_point, 1080);
    // the base is the vacuum line with the faithfulness lines: a basis of 8 and its links
    assert!(cert.faithfulness.basis.len() == 8 && cert.group.base[0] == 0);
    cert.verify(&gens, &lines, &ImageOptions::default())
        .unwrap();
    // two qubits: 60 stabiliser states, 11 520 Cliffords modulo phases (same sources)
    let gens = clifford(2);
    let lines = line_orbit(&gens, vacuum(gens.field(), 4), 100);
    assert_eq!(lines.len(), 60);
    assert_eq!(
        image_from_orbit(&gens, &lines).unwrap().group.order,
        "11520"
    );
}
