//! Shared helpers of the field tests: a seeded generator, random elements in three
//! representations, the iteration scale, and a slow reference implementation of Q(ζ_n) on
//! `BigInt` that shares no code with the crate (its own Φ_n, its own reduction).

#![allow(dead_code)] // each test binary uses a different part of this module

use cyclorb_field::{Cyc, CyclotomicField};
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{One, Signed, Zero};

/// Conductors every property is stamped over (the list).
pub const CONDUCTORS: [u32; 9] = [1, 2, 5, 16, 20, 48, 60, 105, 240];

/// xorshift64*: tiny, deterministic, good enough to draw test inputs.
pub struct Rng(u64);

impl Rng {
    /// A generator for one test; the label keeps streams of different tests apart.
    pub fn new(label: &str) -> Rng {
        let mut h = 0xCBF2_9CE4_8422_2325u64; // FNV-1a offset basis (common practice)
        for b in label.bytes() {
            h = (h ^ b as u64).wrapping_mul(0x0100_0000_01B3);
        }
        Rng(h | 1)
    }

    /// The next 64 random bits.
    pub fn next_u64(&mut self) -> u64 {
        self.0 ^= self.0 >> 12;
        self.0 ^= self.0 << 25;
        self.0 ^= self.0 >> 27;
        self.0.wrapping_mul(0x2545_F491_4F6C_DD1D)
    }

    /// Uniform-ish in 0..m (m > 0).
    pub fn below(&mut self, m: u64) -> u64 {
        self.next_u64() % m
    }

    /// Uniform-ish in lo..=hi.
    pub fn range(&mut self, lo: i64, hi: i64) -> i64 {
        lo + self.below((hi - lo + 1) as u64) as i64
    }

    /// True with probability 1/m.
    pub fn one_in(&mut self, m: u64) -> bool {
        self.below(m) == 0
    }

    /// A random signed big integer of at most `bits` bits.
    pub fn big(&mut self, bits: u32) -> BigInt {
        let mut x = BigInt::zero();
        let words = bits.div_ceil(64);
        for _ in 0..words {
            x = (x << 64) + BigInt::from(self.next_u64());
        }
        x >>= (words * 64 - bits) as usize;
        if self.one_in(2) {
            -x
        } else {
            x
        }
    }
}

/// Iterations for a property: `base` times the integer in `CYCLORB_TEST_ITERS` (default 1).
pub fn iters(base: usize) -> usize {
    let scale = std::env::var("CYCLORB_TEST_ITERS")
        .ok()
        .and_then(|s| s.parse::<usize>().ok())
        .unwrap_or(1);
    base * scale.max(1)
}

/// How the coefficients of a random element are drawn.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Repr {
    /// n/2^k, |n| ≤ 8, 0 ≤ k ≤ 4: the machine-word path, no overflow.
    Small,
    /// Numerators and denominators near the i64 limits: stored in machine words, but products
    /// overflow i128 and must fall back to big integers.
    Edge,
    /// Numerators of 65 to 140 bits: stored as big integers from the start.
    Big,
}

/// A random element of `field` in the given representation (sometimes sparse or rational).
pub fn element(field: &CyclotomicField, rng: &mut Rng, repr: Repr) -> Cyc {
    let phi = field.degree();
    let shape = rng.below(8);
    let (mut num, den): (Vec<BigInt>, BigInt) = match repr {
        Repr::Small => {
            let num = (0..phi)
                .map(|_| {
                    let n = rng.range(-8, 8);
                    let k = rng.range(0, 4);
                    BigInt::from(n << (4 - k))
                })
                .collect();
            (num, BigInt::from(16))
        }
        Repr::Edge => {
            let near = |rng: &mut Rng| {
                let m = i64::MAX - rng.range(0, 1 << 20);
                BigInt::from(if rng.one_in(2) { -m } else { m })
            };
            let num = (0..phi).map(|_| near(rng)).collect();
            let den = if rng.one_in(2) {
                BigInt::from(1)
            } else {
                BigInt::from(i64::MAX - rng.range(0, 1 << 20))
            };
            (num, den)
        }
        Repr::Big => {
            let num = (0..phi)
                .map(|_| {
                    let bits = rng.range(65, 140) as u32;
                    rng.big(bits)
                })
                .collect();
            let den_bits = rng.range(1, 80) as u32;
            let den = rng.big(den_bits).abs() + BigInt::one();
            (num, den)
        }
    };
    match shape {
        // a monomial c·ζ^j
        0 => {
            let keep = rng.below(phi as u64) as usize;
            for (j, c) in num.iter_mut().enumerate() {
                if j != keep {
                    *c = BigInt::zero();
                }
            }
        }
        // a rational
        1 => {
            for c in num.iter_mut().skip(1) {
                *c = BigInt::zero();
            }
        }
        // sparse
        2 => {
            for c in num.iter_mut() {
                if rng.one_in(2) {
                    *c = BigInt::zero();
                }
            }
        }
        _ => {}
    }
    field.from_parts(&num, &den).expect("valid parts")
}

/// A random non-zero element.
pub fn nonzero(field: &CyclotomicField, rng: &mut Rng, repr: Repr) -> Cyc {
    loop {
        let x = element(field, rng, repr);
        if !x.is_zero() {
            return x;
        }
    }
}

/// The canonical-form invariant stated in the crate docs: positive denominator, numerators
/// and denominator coprime, zero stored as 0/1, machine words exactly when everything fits
/// in an i64 other than i64::MIN.
pub fn assert_canonical(x: &Cyc) {
    let (num, den) = x.to_big_parts();
    assert!(den.is_positive(), "denominator not positive: {x}");
    let g = num.iter().fold(den.clone(), |g, c| g.gcd(c));
    assert!(g.is_one(), "not in lowest terms: {x}");
    if num.iter().all(Zero::is_zero) {
        assert!(den.is_one(), "zero with denominator {den}");
    }
    let fits = |v: &BigInt| *v > BigInt::from(i64::MIN) && *v <= BigInt::from(i64::MAX);
    let all_fit = fits(&den) && num.iter().all(fits);
    assert_eq!(
        x.small_parts().is_some(),
        all_fit,
        "wrong storage tier for {x}"
    );
}

/// Φ_n by exact division of x^n − 1 by Φ_d for every proper divisor d, on BigInt
/// (the textbook recursion x^n − 1 = Π_{d | n} Φ_d; independent of the crate's Möbius product).
pub fn reference_cyclotomic(n: u32) -> Vec<BigInt> {
    let mut poly = vec![BigInt::zero(); n as usize + 1];
    poly[0] = BigInt::from(-1);
    poly[n as usize] = BigInt::one();
    for d in 1..n {
        if n % d == 0 {
            poly = exact_div_monic(&poly, &reference_cyclotomic(d));
        }
    }
    poly
}

fn exact_div_monic(num: &[BigInt], den: &[BigInt]) -> Vec<BigInt> {
    let mut rem = num.to_vec();
    let dl = den.len();
    let ql = num.len() - dl + 1;
    let mut quot = vec![BigInt::zero(); ql];
    for i in (0..ql).rev() {
        let c = rem[i + dl - 1].clone();
        for (j, d) in den.iter().enumerate() {
            rem[i + j] -= &c * d;
        }
        quot[i] = c;
    }
    assert!(rem.iter().all(Zero::is_zero), "division not exact");
    quot
}

/// A slow, obviously correct model of Q(ζ_n): polynomials over BigInt with one denominator,
/// reduced by long division by Φ_n. Values need not be canonical; compare with [`Slow::same`].
pub struct Slow {
    n: u32,
    phi_poly: Vec<BigInt>,
}

/// A value of the slow model: numerators (length φ) over a non-zero denominator.
#[derive(Clone, Debug)]
pub struct SlowValue {
    pub num: Vec<BigInt>,
    pub den: BigInt,
}

impl Slow {
    /// The model of Q(ζ_n).
    pub fn new(n: u32) -> Slow {
        Slow {
            n,
            phi_poly: reference_cyclotomic(n),
        }
    }

    fn degree(&self) -> usize {
        self.phi_poly.len() - 1
    }

    /// Remainder of a polynomial of any length modulo Φ_n.
    pub fn reduce(&self, mut p: Vec<BigInt>) -> Vec<BigInt> {
        let phi = self.degree();
        for top in (phi..p.len()).rev() {
            let c = std::mem::take(&mut p[top]);
            for (j, d) in self.phi_poly.iter().enumerate().take(phi) {
                p[top - phi + j] -= &c * d;
            }
        }
        p.resize(phi, BigInt::zero());
        p
    }

    /// The value of a crate element.
    pub fn value_of(&self, x: &Cyc) -> SlowValue {
        let (num, den) = x.to_big_parts();
        SlowValue { num, den }
    }

    /// Whether a crate element equals a model value (cross-multiplied, so the model value need
    /// not be in lowest terms).
    pub fn same(&self, x: &Cyc, v: &SlowValue) -> bool {
        let (num, den) = x.to_big_parts();
        num.len() == v.num.len() && num.iter().zip(&v.num).all(|(a, b)| a * &v.den == b * &den)
    }

    /// Sum.
    pub fn add(&self, a: &SlowValue, b: &SlowValue) -> SlowValue {
        SlowValue {
            num: a
                .num
                .iter()
                .zip(&b.num)
                .map(|(x, y)| x * &b.den + y * &a.den)
                .collect(),
            den: &a.den * &b.den,
        }
    }

    /// Product: schoolbook convolution, then long division.
    pub fn mul(&self, a: &SlowValue, b: &SlowValue) -> SlowValue {
        let mut wide = vec![BigInt::zero(); a.num.len() + b.num.len() - 1];
        for (i, x) in a.num.iter().enumerate() {
            for (j, y) in b.num.iter().enumerate() {
                wide[i + j] += x * y;
            }
        }
        SlowValue {
            num: self.reduce(wide),
            den: &a.den * &b.den,
        }
    }

    /// σ_k: x^j ↦ x^{jk mod n}, then reduction.
    pub fn galois(&self, a: &SlowValue, k: i64) -> SlowValue {
        let n = self.n as i64;
        let mut wide = vec![BigInt::zero(); self.n as usize];
        for (j, c) in a.num.iter().enumerate() {
            wide[(j as i64 * k).rem_euclid(n) as usize] += c;
        }
        SlowValue {
            num: self.reduce(wide),
            den: a.den.clone(),
        }
    }
}
