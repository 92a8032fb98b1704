//! Field axioms, powers, canonical form, text and serde round trips and dot products,
//! written once as generic laws (module `laws`) and stamped by `stamp!` over every conductor of
//! the issue and every representation (small n/2^k coefficients, machine words near the i64
//! limits whose products overflow i128, and big integers).
//!
//! Source of the laws: the field axioms and the laws of integer exponents (any algebra text,
//! e.g. Lang, Algebra, ch. II and V; common practice). Every check compares two different
//! computations of one value, so a wrong kernel makes it fail.

mod random_and_reference;

use random_and_reference::{iters, Repr};

mod laws {
    use std::collections::hash_map::DefaultHasher;
    use std::hash::{Hash, Hasher};

    use cyclorb_field::{Cyc, CyclotomicField, DotAccumulator, FieldError};
    use num_bigint::BigInt;

    use crate::random_and_reference::{assert_canonical, element, nonzero, Repr, Rng};

    fn setup(n: u32, repr: Repr, law: &str) -> (CyclotomicField, Rng) {
        let field = CyclotomicField::new(n).expect("supported conductor");
        (field, Rng::new(&format!("{law}/{n}/{repr:?}")))
    }

    fn hash_of(x: &Cyc) -> u64 {
        let mut h = DefaultHasher::new();
        x.hash(&mut h);
        h.finish()
    }

    /// (a+b)+c = a+(b+c), a+b = b+a, a+0 = a, a+(−a) = 0, a−b = a+(−b).
    pub fn additive_group(n: u32, repr: Repr, rounds: usize) {
        let (f, mut rng) = setup(n, repr, "additive");
        for _ in 0..rounds {
            let [a, b, c] = [0; 3].map(|_| element(&f, &mut rng, repr));
            let ab = f.add(&a, &b).unwrap();
            let left = f.add(&ab, &c).unwrap();
            let right = f.add(&a, &f.add(&b, &c).unwrap()).unwrap();
            assert_eq!(left, right, "associativity: a={a} b={b} c={c}");
            assert_eq!(ab, f.add(&b, &a).unwrap(), "commutativity");
            assert_eq!(f.add(&a, &f.zero()).unwrap(), a, "zero");
            assert!(f.add(&a, &f.neg(&a)).unwrap().is_zero(), "negation");
            assert_eq!(f.sub(&a, &b).unwrap(), f.add(&a, &f.neg(&b)).unwrap());
            for x in [&ab, &left] {
                assert_canonical(x);
            }
        }
    }

    /// (ab)c = a(bc), ab = ba, 1·a = a, a(b+c) = ab+ac, (a+b)c = ac+bc, 0·a = 0.
    pub fn ring(n: u32, repr: Repr, rounds: usize) {
        let (f, mut rng) = setup(n, repr, "ring");
        for _ in 0..rounds {
            let [a, b, c] = [0; 3].map(|_| element(&f, &mut rng, repr));
            let ab = f.mul(&a, &b).unwrap();
            let left = f.mul(&ab, &c).unwrap();
            let right = f.mul(&a, &f.mul(&b, &c).unwrap()).unwrap();
            assert_eq!(left, right, "associativity: a={a} b={b} c={c}");
            assert_eq!(ab, f.mul(&b, &a).unwrap(), "commutativity");
            assert_eq!(f.mul(&f.one(), &a).unwrap(), a, "one");
            assert!(f.mul(&f.zero(), &a).unwrap().is_zero(), "zero");
            let bc = f.add(&b, &c).unwrap();
            let dist = f.add(&ab, &f.mul(&a, &c).unwrap()).unwrap();
            assert_eq!(f.mul(&a, &bc).unwrap(), dist, "left distributivity");
            let ac_bc = f.add(&f.mul(&a, &c).unwrap(), &f.mul(&b, &c).unwrap());
            let sum_ab = f.add(&a, &b).unwrap();
            assert_eq!(f.mul(&sum_ab, &c).unwrap(), ac_bc.unwrap(), "right");
            assert_eq!(
                f.mul_int(&a, -3),
                f.add(&f.neg(&a), &f.mul_int(&a, -2)).unwrap()
            );
            for x in [&ab, &left, &dist] {
                assert_canonical(x);
            }
        }
    }

    /// a·a⁻¹ = 1, (a/b)·b = a, (a⁻¹)⁻¹ = a, (ab)⁻¹ = a⁻¹b⁻¹; dividing by 0 is an error.
    pub fn inverses(n: u32, repr: Repr, rounds: usize) {
        let (f, mut rng) = setup(n, repr, "inverse");
        for _ in 0..rounds {
            let a = nonzero(&f, &mut rng, repr);
            let b = nonzero(&f, &mut rng, repr);
            let ai = f.inv(&a).unwrap();
            assert_canonical(&ai);
            assert!(f.mul(&a, &ai).unwrap().is_one(), "a·a⁻¹ ≠ 1 for a={a}");
            let q = f.div(&a, &b).unwrap();
            assert_eq!(f.mul(&q, &b).unwrap(), a, "(a/b)·b ≠ a: a={a} b={b}");
            assert_eq!(f.inv(&ai).unwrap(), a, "double inverse");
            let bi = f.inv(&b).unwrap();
            let ab = f.mul(&a, &b).unwrap();
            assert_eq!(f.inv(&ab).unwrap(), f.mul(&ai, &bi).unwrap());
        }
        let a = element(&f, &mut rng, repr);
        assert_eq!(f.inv(&f.zero()), Err(FieldError::DivisionByZero));
        assert_eq!(f.div(&a, &f.zero()), Err(FieldError::DivisionByZero));
        assert_eq!(f.pow(&f.zero(), -1), Err(FieldError::DivisionByZero));
    }

    /// a^{j+k} = a^j a^k and (a^j)^k = a^{jk} for j, k ∈ [−3, 3] (or [−2, 2]); a^0 = 1; a^{−1} = a⁻¹;
    /// ζ^j ζ^k = ζ^{j+k} and ζ^n = 1.
    pub fn powers(n: u32, repr: Repr, rounds: usize) {
        let (f, mut rng) = setup(n, repr, "powers");
        for _ in 0..rounds {
            let a = nonzero(&f, &mut rng, repr);
            // big coefficients grow fast under negative powers: smaller exponents there
            let e = if repr == Repr::Small { 3 } else { 2 };
            let j = rng.range(-e, e);
            let k = rng.range(-e, e);
            let aj = f.pow(&a, j).unwrap();
            let ak = f.pow(&a, k).unwrap();
            assert_eq!(
                f.pow(&a, j + k).unwrap(),
                f.mul(&aj, &ak).unwrap(),
                "j={j} k={k}"
            );
            assert_eq!(
                f.pow(&aj, k).unwrap(),
                f.pow(&a, j * k).unwrap(),
                "j={j} k={k}"
            );
            assert!(f.pow(&a, 0).unwrap().is_one());
            assert_eq!(f.pow(&a, -1).unwrap(), f.inv(&a).unwrap());
            let (zj, zk) = (rng.range(-500, 500), rng.range(-500, 500));
            let prod = f.mul(&f.zeta_pow(zj), &f.zeta_pow(zk)).unwrap();
            assert_eq!(prod, f.zeta_pow(zj + zk), "ζ^{zj}·ζ^{zk}");
        }
        assert!(f.pow(&f.zeta_pow(1), n as i64).unwrap().is_one());
    }

    /// One value built two ways is one stored value with one hash: (a+b)−b, (a·b)/b, a
    /// rescaled numerators and denominator, and the parsed printed form.
    pub fn canonical_eq_hash(n: u32, repr: Repr, rounds: usize) {
        let (f, mut rng) = setup(n, repr, "hash");
        for _ in 0..rounds {
            let a = element(&f, &mut rng, repr);
            let b_repr = if rng.one_in(2) { repr } else { Repr::Big };
            let b = nonzero(&f, &mut rng, b_repr);
            let (num, den) = a.to_big_parts();
            let scale = BigInt::from(-(rng.range(2, 1 << 40)));
            let scaled: Vec<BigInt> = num.iter().map(|c| c * &scale).collect();
            let ways = [
                f.sub(&f.add(&a, &b).unwrap(), &b).unwrap(),
                f.div(&f.mul(&a, &b).unwrap(), &b).unwrap(),
                f.from_parts(&scaled, &(&den * &scale)).unwrap(),
                f.parse(&a.to_string()).unwrap(),
            ];
            for (i, w) in ways.iter().enumerate() {
                assert_eq!(w, &a, "way {i}: a={a} b={b}");
                assert_eq!(hash_of(w), hash_of(&a), "hash, way {i}");
                assert_canonical(w);
            }
        }
    }

    /// parse(print(x)) = x, and the serde (JSON) round trip.
    pub fn round_trips(n: u32, repr: Repr, rounds: usize) {
        let (f, mut rng) = setup(n, repr, "text");
        for _ in 0..rounds {
            let a = element(&f, &mut rng, repr);
            let text = a.to_string();
            assert_eq!(f.parse(&text).unwrap(), a, "text {text}");
            let json = serde_json::to_string(&a).unwrap();
            let back: Cyc = serde_json::from_str(&json).unwrap();
            assert_eq!(back, a, "json {json}");
        }
    }

    /// Σ a_k b_k with one reduction (dot, DotAccumulator) equals the sum of reduced products,
    /// including sums mixing representations.
    pub fn dot_products(n: u32, repr: Repr, rounds: usize) {
        let (f, mut rng) = setup(n, repr, "dot");
        for _ in 0..rounds {
            let len = rng.range(0, 12) as usize;
            // mixed representations, and denominators other than powers of two (so the
            // common denominator grows by odd factors while the sum is accumulated)
            let pick = |rng: &mut Rng| {
                let r = if rng.one_in(4) { Repr::Small } else { repr };
                let x = element(&f, rng, r);
                let q = [1, 3, 5, 7, 9, 12][rng.below(6) as usize];
                f.mul(&x, &f.rational(rng.range(-3, 3), q).unwrap())
                    .unwrap()
            };
            let xs: Vec<Cyc> = (0..len).map(|_| pick(&mut rng)).collect();
            let ys: Vec<Cyc> = (0..len).map(|_| pick(&mut rng)).collect();
            let mut expected = f.zero();
            let mut acc = DotAccumulator::new(&f);
            for (x, y) in xs.iter().zip(&ys) {
                expected = f.add(&expected, &f.mul(x, y).unwrap()).unwrap();
                acc.add_product(x, y).unwrap();
            }
            let dot = f.dot(xs.iter().zip(&ys)).unwrap();
            assert_eq!(dot, expected);
            assert_canonical(&dot);
            assert_eq!(acc.finish(), expected);
        }
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
            fn additive_group() { laws::additive_group(N, REPR, iters($base)) }
            #[test]
            fn ring() { laws::ring(N, REPR, iters($base)) }
            #[test]
            fn inverses() { laws::inverses(N, REPR, iters($base)) }
            #[test]
            fn powers() { laws::powers(N, REPR, iters($base)) }
            #[test]
            fn canonical_eq_hash() { laws::canonical_eq_hash(N, REPR, iters($base)) }
            #[test]
            fn round_trips() { laws::round_trips(N, REPR, iters($base)) }
            #[test]
            fn dot_products() { laws::dot_products(N, REPR, iters($base)) }
        }
    )*};
}

stamp! {
    small_1: 1, Repr::Small, 40;
    small_2: 2, Repr::Small, 40;
    small_5: 5, Repr::Small, 40;
    small_16: 16, Repr::Small, 30;
    small_20: 20, Repr::Small, 30;
    small_48: 48, Repr::Small, 15;
    small_60: 60, Repr::Small, 15;
    small_105: 105, Repr::Small, 5;
    small_240: 240, Repr::Small, 4;
    edge_1: 1, Repr::Edge, 30;
    edge_2: 2, Repr::Edge, 30;
    edge_5: 5, Repr::Edge, 20;
    edge_16: 16, Repr::Edge, 10;
    edge_20: 20, Repr::Edge, 10;
    edge_48: 48, Repr::Edge, 4;
    edge_60: 60, Repr::Edge, 4;
    edge_105: 105, Repr::Edge, 2;
    edge_240: 240, Repr::Edge, 1;
    big_1: 1, Repr::Big, 30;
    big_2: 2, Repr::Big, 30;
    big_5: 5, Repr::Big, 20;
    big_16: 16, Repr::Big, 10;
    big_20: 20, Repr::Big, 10;
    big_48: 48, Repr::Big, 4;
    big_60: 60, Repr::Big, 4;
    big_105: 105, Repr::Big, 2;
    big_240: 240, Repr::Big, 1;
}
