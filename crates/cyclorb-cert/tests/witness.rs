//! Witnesses of infinite image, and their absence for a finite image.

mod sample_sets;

use cyclorb_cert::{
    find_witness, polynomial_text, CertError, CyclotomicFactor, ProvedGenerators,
    WitnessCertificate, WitnessOptions, WitnessOutcome,
};
use cyclorb_field::CyclotomicField;
use cyclorb_matrix::{Matrix, Operator};
use sample_sets::*;

fn found(outcome: WitnessOutcome) -> WitnessCertificate {
    match outcome {
        WitnessOutcome::Found(cert) => cert,
        WitnessOutcome::NotFound(report) => panic!("no witness: {report:?}"),
    }
}

/// [[1,2],[0,1]] and [[1,0],[2,1]] over Q: a free group (Sanov's theorem; common practice).
fn sanov_pair() -> ProvedGenerators {
    let f = CyclotomicField::new(1).unwrap();
    let a = Matrix::from_rows(vec![vec![f.one(), f.int(2)], vec![f.zero(), f.one()]]).unwrap();
    let b = Matrix::from_rows(vec![vec![f.one(), f.zero()], vec![f.int(2), f.one()]]).unwrap();
    ProvedGenerators::new(
        f,
        vec![
            ("a".into(), Operator::Dense(a)),
            ("b".into(), Operator::Dense(b)),
        ],
        None,
    )
    .unwrap()
}

#[test]
fn the_free_pair_has_a_witness_ab() {
    let gens = sanov_pair();
    let cert = found(find_witness(&gens, &WitnessOptions::default()).unwrap());
    // a and b are unipotent (eigenvalue ratio 1): the first witness is ab = [[5,2],[2,1]],
    // trace 6, det 1, eigenvalues 3 ± 2√2, ratio (3 + 2√2)² = 17 + 12√2, a root of
    // x² − 34x + 1 (hand computation)
    assert_eq!(cert.word, vec!["a".to_string(), "b".to_string()]);
    assert_eq!(cert.charpoly, vec!["1", "-6", "1"]);
    assert_eq!(cert.remaining_factor_text(), "x^2 - 34*x + 1");
    assert!(cert.cyclotomic_factors.is_empty());
    cert.recheck(&gens).unwrap();
    let text = serde_json::to_string(&cert).unwrap();
    let back: WitnessCertificate = serde_json::from_str(&text).unwrap();
    back.recheck(&gens).unwrap();
    let outcome = serde_json::to_value(WitnessOutcome::Found(cert)).unwrap();
    assert_eq!(outcome["result"], "found");
    assert_eq!(
        outcome["remaining_factor"],
        serde_json::json!(["1", "-34", "1"])
    );
}

#[test]
fn the_norm_is_taken_over_the_galois_conjugates() {
    // diag(1, 1, 2 + i) over Q(i): the ratios are 1 (five times), 2 + i and 1/(2 + i) (twice
    // each). Dividing out (x − 1)³ leaves (x − 1)²(x − 2 − i)²(x − 1/(2 + i))², whose
    // conjugate under i ↦ −i differs; the norm is
    // (x − 1)⁴ (x² − 4x + 5)² (5x² − 4x + 1)² (hand computation: |2 + i|² = 5).
    let f = CyclotomicField::new(4).unwrap();
    let u = f.add(&f.int(2), &f.zeta_pow(1)).unwrap();
    let gens = ProvedGenerators::new(
        f.clone(),
        vec![("d".into(), Operator::Diagonal(vec![f.one(), f.one(), u]))],
        None,
    )
    .unwrap();
    let cert = found(find_witness(&gens, &WitnessOptions::default()).unwrap());
    assert_eq!(cert.word, vec!["d".to_string()]);
    assert_eq!(cert.block, vec![0, 1, 2]);
    assert_eq!(cert.conjugates, 2);
    assert_eq!(
        cert.cyclotomic_factors,
        vec![CyclotomicFactor {
            order: 1,
            multiplicity: 4
        }]
    );
    // (x² − 4x + 5)(5x² − 4x + 1) = 5x⁴ − 24x³ + 42x² − 24x + 5, and the rest is its square
    let once = [5i64, -24, 42, -24, 5];
    let mut square = [0i64; 9];
    for (i, x) in once.iter().enumerate() {
        for (j, y) in once.iter().enumerate() {
            square[i + j] += x * y;
        }
    }
    let expected: Vec<String> = square.iter().map(ToString::to_string).collect();
    assert_eq!(cert.remaining_factor, expected);
    assert_eq!(
        polynomial_text(&once.map(|c| c.to_string())),
        "5*x^4 - 24*x^3 + 42*x^2 - 24*x + 5"
    );
    cert.recheck(&gens).unwrap();
}

#[test]
fn a_non_integral_unit_circle_ratio_is_found() {
    // (3 + 4i)/5 has modulus 1 but is not a root of unity (not an algebraic integer;
    // common practice): diag(1, (3 + 4i)/5) has infinite projective order, and the ratio
    // polynomial is 5x² − 6x + 5 (hand computation)
    let f = CyclotomicField::new(4).unwrap();
    let u = f.parse("(3 + 4*i)/5").unwrap();
    let gens = ProvedGenerators::new(
        f.clone(),
        vec![("d".into(), Operator::Diagonal(vec![f.one(), u]))],
        Some(vec![f.one(), f.one()]),
    )
    .unwrap();
    let cert = found(find_witness(&gens, &WitnessOptions::default()).unwrap());
    assert_eq!(cert.remaining_factor_text(), "5*x^2 - 6*x + 5");
    cert.recheck(&gens).unwrap();
}

#[test]
fn finite_images_give_no_witness() {
    // Ising and Fibonacci at genus 1 have finite images (orders 384 and 60, see the image
    // tests; Ng–Schauenburg 2010 for the congruence property)
    let options = WitnessOptions {
        depth: 5,
        tries: 30,
        ..WitnessOptions::default()
    };
    for data in [ising(), fibonacci()] {
        let gens = data.generators();
        match find_witness(&gens, &options).unwrap() {
            WitnessOutcome::Found(cert) => panic!("a witness in a finite group: {cert:?}"),
            WitnessOutcome::NotFound(report) => {
                // Lyndon words over 2 letters of length ≤ 5: 2 + 1 + 2 + 3 + 6 = 14
                // (Witt's necklace formula; common practice), then the random ones
                assert_eq!(report.words_tried, 14 + 30);
                assert_eq!(report.blocks_over_degree, 0);
            }
        }
    }
}

#[test]
fn tampered_witnesses_are_rejected() {
    let gens = sanov_pair();
    let cert = found(find_witness(&gens, &WitnessOptions::default()).unwrap());
    let mut other_word = cert.clone();
    other_word.word = vec!["a".into()];
    assert!(matches!(
        other_word.recheck(&gens),
        Err(CertError::Rejected(_))
    ));
    let mut cyclotomic_rest = cert.clone();
    // pretend the factor were x² − x + 1 = Φ_6
    cyclotomic_rest.remaining_factor = ["1", "-1", "1"].map(String::from).to_vec();
    assert!(matches!(
        cyclotomic_rest.recheck(&gens),
        Err(CertError::Rejected(_))
    ));
    let mut unknown = cert;
    unknown.word = vec!["c".into()];
    assert!(matches!(unknown.recheck(&gens), Err(CertError::Input(_))));
}
