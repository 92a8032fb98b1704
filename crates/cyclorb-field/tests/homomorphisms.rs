//! The Galois group, complex conjugation and the embeddings Q(ζ_m) → Q(ζ_n) are ring
//! homomorphisms with the expected composition laws, stamped over every conductor and
//! representation like the field axioms.
//!
//! Sources: Gal(Q(ζ_n)/Q) ≅ (Z/n)^× with σ_k: ζ ↦ ζ^k, so σ_a∘σ_b = σ_{ab}, and complex
//! conjugation is σ_{−1} (Washington, Introduction to Cyclotomic Fields, ch. 2; Lang, Algebra,
//! ch. VI §3). The norm is multiplicative and the trace additive and Q-linear (any algebraic
//! number theory text; common practice).

mod random_and_reference;

use random_and_reference::{iters, Repr, CONDUCTORS};

mod laws {
    use cyclorb_field::{common_conductor, Cyc, CyclotomicField, FieldError};
    use num_bigint::BigInt;

    use crate::random_and_reference::{assert_canonical, element, nonzero, Repr, Rng};

    fn setup(n: u32, repr: Repr, law: &str) -> (CyclotomicField, Rng) {
        let field = CyclotomicField::new(n).expect("supported conductor");
        (field, Rng::new(&format!("{law}/{n}/{repr:?}")))
    }

    /// A random k with gcd(k, n) = 1, possibly negative or larger than n.
    fn unit(rng: &mut Rng, n: u32) -> i64 {
        loop {
            let k = rng.range(-3 * n as i64, 3 * n as i64);
            if num_integer::Integer::gcd(&k, &(n as i64)) == 1 {
                return k;
            }
        }
    }

    /// σ_k(a+b) = σ_k(a)+σ_k(b), σ_k(ab) = σ_k(a)σ_k(b), σ_k(1) = 1, σ_k(ζ) = ζ^k,
    /// σ_a∘σ_b = σ_{ab}, σ_{k+n} = σ_k; σ_k with gcd(k, n) ≠ 1 is an error.
    pub fn galois(n: u32, repr: Repr, rounds: usize) {
        let (f, mut rng) = setup(n, repr, "galois");
        for _ in 0..rounds {
            let (a, b) = (element(&f, &mut rng, repr), element(&f, &mut rng, repr));
            let (j, k) = (unit(&mut rng, n), unit(&mut rng, n));
            let s = |x: &Cyc| f.galois(x, k).unwrap();
            assert_eq!(s(&f.add(&a, &b).unwrap()), f.add(&s(&a), &s(&b)).unwrap());
            let image = s(&f.mul(&a, &b).unwrap());
            assert_eq!(
                image,
                f.mul(&s(&a), &s(&b)).unwrap(),
                "σ_{k} on a={a} b={b}"
            );
            assert_canonical(&image);
            assert!(s(&f.one()).is_one());
            assert_eq!(s(&f.zeta_pow(1)), f.zeta_pow(k));
            let composed = f.galois(&f.galois(&a, j).unwrap(), k).unwrap();
            assert_eq!(composed, f.galois(&a, j * k).unwrap(), "σ_{k}∘σ_{j}");
            assert_eq!(f.galois(&a, k + n as i64).unwrap(), s(&a));
        }
        if n > 2 {
            let a = element(&f, &mut rng, repr);
            let bad = [0, n as i64, if n % 2 == 0 { 2 } else { n as i64 * 2 }];
            for k in bad {
                assert_eq!(
                    f.galois(&a, k),
                    Err(FieldError::NotAnAutomorphism { k, n }),
                    "σ_{k} on Q(ζ_{n})"
                );
            }
        }
    }

    /// conj is σ_{−1}, an involutive ring homomorphism; a·ā is real (fixed by conj).
    pub fn conjugation(n: u32, repr: Repr, rounds: usize) {
        let (f, mut rng) = setup(n, repr, "conj");
        for _ in 0..rounds {
            let (a, b) = (element(&f, &mut rng, repr), element(&f, &mut rng, repr));
            let c = |x: &Cyc| f.conj(x);
            assert_eq!(c(&c(&a)), a);
            assert_eq!(c(&a), f.galois(&a, -1).unwrap());
            assert_eq!(c(&f.add(&a, &b).unwrap()), f.add(&c(&a), &c(&b)).unwrap());
            assert_eq!(c(&f.mul(&a, &b).unwrap()), f.mul(&c(&a), &c(&b)).unwrap());
            let square = f.mul(&a, &c(&a)).unwrap();
            assert_eq!(c(&square), square);
        }
    }

    /// N(ab) = N(a)N(b), Tr(a + b) = Tr(a) + Tr(b), Tr(q·a) = q·Tr(a) for rational q, and
    /// N, Tr are the product and sum of the conjugates σ_k(a) (the definition).
    pub fn norm_and_trace(n: u32, repr: Repr, rounds: usize) {
        let (f, mut rng) = setup(n, repr, "norm");
        let rational = |pair: (BigInt, BigInt)| f.big_rational(&pair.0, &pair.1).unwrap();
        for _ in 0..rounds {
            let (a, b) = (element(&f, &mut rng, repr), element(&f, &mut rng, repr));
            let ab = f.mul(&a, &b).unwrap();
            let (na, nb) = (rational(f.norm(&a).unwrap()), rational(f.norm(&b).unwrap()));
            assert_eq!(rational(f.norm(&ab).unwrap()), f.mul(&na, &nb).unwrap());
            let (ta, tb) = (
                rational(f.trace(&a).unwrap()),
                rational(f.trace(&b).unwrap()),
            );
            let sum = f.add(&a, &b).unwrap();
            assert_eq!(rational(f.trace(&sum).unwrap()), f.add(&ta, &tb).unwrap());
            let q = f.rational(rng.range(-9, 9), rng.range(1, 9)).unwrap();
            let qa = f.mul(&q, &a).unwrap();
            assert_eq!(rational(f.trace(&qa).unwrap()), f.mul(&q, &ta).unwrap());
            let conjugates: Vec<_> = f
                .galois_group()
                .into_iter()
                .map(|k| f.galois(&a, k).unwrap())
                .collect();
            assert_eq!(f.sum(&conjugates).unwrap(), ta);
            if repr == Repr::Small || f.degree() <= 16 {
                // the definition, slow for big coefficients in large fields
                let product = conjugates
                    .iter()
                    .fold(f.one(), |acc, x| f.mul(&acc, x).unwrap());
                assert_eq!(product, na);
            }
        }
    }

    /// Embedding Q(ζ_m) → Q(ζ_n), m | n: a homomorphism sending ζ_m to ζ_n^{n/m}, commuting
    /// with σ_k for gcd(k, n) = 1 and with conjugation; the identity when m = n. A conductor
    /// that does not divide n is an error.
    pub fn embeddings(n: u32, repr: Repr, rounds: usize) {
        let (big, mut rng) = setup(n, repr, "embed");
        let divisors: Vec<u32> = (1..=n).filter(|m| n % m == 0).collect();
        for _ in 0..rounds {
            let m = divisors[rng.below(divisors.len() as u64) as usize];
            let small = CyclotomicField::new(m).unwrap();
            let (a, b) = (
                element(&small, &mut rng, repr),
                element(&small, &mut rng, repr),
            );
            let e = |x: &Cyc| big.embed(x).unwrap();
            assert_eq!(
                e(&small.add(&a, &b).unwrap()),
                big.add(&e(&a), &e(&b)).unwrap()
            );
            let image = e(&small.mul(&a, &b).unwrap());
            assert_eq!(
                image,
                big.mul(&e(&a), &e(&b)).unwrap(),
                "Q(ζ_{m}) → Q(ζ_{n})"
            );
            assert_canonical(&image);
            assert_eq!(e(&small.zeta_pow(1)), big.zeta_pow((n / m) as i64));
            let k = unit(&mut rng, n);
            assert_eq!(
                e(&small.galois(&a, k).unwrap()),
                big.galois(&e(&a), k).unwrap()
            );
            assert_eq!(e(&small.conj(&a)), big.conj(&e(&a)));
            assert_eq!(common_conductor(m, n), n);
            if repr == Repr::Small {
                // the same text means the same number in both fields (z = ζ_m or ζ_n^{n/m})
                let text = format!("{a}").replace('z', &format!("zeta({m})"));
                assert_eq!(big.parse(&text).unwrap(), e(&a), "text {text}");
            }
        }
        let a = nonzero(&big, &mut rng, repr);
        assert_eq!(big.embed(&a).unwrap(), a, "Q(ζ_{n}) → itself");
        let other = CyclotomicField::new(n * 7).unwrap();
        assert_eq!(
            big.embed(&other.zeta_pow(1)),
            Err(FieldError::NotASubfield { from: n * 7, to: n })
        );
    }
}

/// Stamps every law of `laws` over one (conductor, representation, base iteration count).
macro_rules! stamp {
    ($($name:ident: $n:expr, $repr:expr, $base:expr;)*) => {$(
        mod $name {
            use super::*;
            const N: u32 = $n;
            const REPR: Repr = $repr;
            #[test]
            fn galois() { laws::galois(N, REPR, iters($base)) }
            #[test]
            fn conjugation() { laws::conjugation(N, REPR, iters($base)) }
            #[test]
            fn norm_and_trace() { laws::norm_and_trace(N, REPR, iters($base.min(6))) }
            #[test]
            fn embeddings() { laws::embeddings(N, REPR, iters($base)) }
        }
    )*};
}

stamp! {
    small_1: 1, Repr::Small, 20;
    small_2: 2, Repr::Small, 20;
    small_5: 5, Repr::Small, 20;
    small_16: 16, Repr::Small, 15;
    small_20: 20, Repr::Small, 15;
    small_48: 48, Repr::Small, 8;
    small_60: 60, Repr::Small, 8;
    small_105: 105, Repr::Small, 3;
    small_240: 240, Repr::Small, 2;
    edge_1: 1, Repr::Edge, 10;
    edge_2: 2, Repr::Edge, 10;
    edge_5: 5, Repr::Edge, 10;
    edge_16: 16, Repr::Edge, 5;
    edge_20: 20, Repr::Edge, 5;
    edge_48: 48, Repr::Edge, 2;
    edge_60: 60, Repr::Edge, 2;
    edge_105: 105, Repr::Edge, 1;
    edge_240: 240, Repr::Edge, 1;
    big_1: 1, Repr::Big, 10;
    big_2: 2, Repr::Big, 10;
    big_5: 5, Repr::Big, 10;
    big_16: 16, Repr::Big, 5;
    big_20: 20, Repr::Big, 5;
    big_48: 48, Repr::Big, 2;
    big_60: 60, Repr::Big, 2;
    big_105: 105, Repr::Big, 1;
    big_240: 240, Repr::Big, 1;
}

/// σ_a∘σ_b = σ_{ab} over the whole Galois group of small fields, on a basis (every ζ^j):
/// the exhaustive version of the random law above.
#[test]
fn galois_group_law_on_a_basis() {
    for &n in CONDUCTORS.iter().filter(|&&n| n <= 20) {
        let f = cyclorb_field::CyclotomicField::new(n).unwrap();
        let group = f.galois_group();
        for &a in &group {
            for &b in &group {
                for j in 0..n as i64 {
                    let z = f.zeta_pow(j);
                    let composed = f.galois(&f.galois(&z, b).unwrap(), a).unwrap();
                    assert_eq!(composed, f.zeta_pow(j * a * b), "σ_{a}∘σ_{b}(ζ^{j})");
                }
            }
        }
    }
}
