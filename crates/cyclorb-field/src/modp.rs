//! Reduction of Q(ζ_n) modulo a prime p ≡ 1 (mod n): ζ_n ↦ r, a primitive n-th root of
//! unity in F_p. This is a ring homomorphism from the elements whose denominators are prime
//! to p onto F_p; ranks computed after it are lower bounds of exact ranks.

use num_bigint::BigInt;
use num_traits::ToPrimitive;

use crate::context::CyclotomicField;
use crate::element::{Cyc, Data};
use crate::error::FieldError;
use crate::numtheory::{factorize, is_prime, pow_mod};

/// A chosen prime p ≡ 1 (mod n), p < 2^31, with the image r of ζ_n and its powers.
#[derive(Debug, Clone)]
pub struct PrimeReduction {
    p: u64,
    n: u32,
    root: u64,
    powers: Vec<u64>,
}

impl PrimeReduction {
    /// The `index`-th prime p ≡ 1 (mod n) above 2^30 (index 0, 1, 2, … give distinct primes).
    pub fn nth(field: &CyclotomicField, index: usize) -> Result<PrimeReduction, FieldError> {
        let n = field.conductor() as u64;
        let step = n.max(2) * if n % 2 == 1 { 2 } else { 1 };
        let mut p = (1u64 << 30) / step * step + 1;
        let mut found = 0;
        loop {
            if is_prime(p) {
                if found == index {
                    return PrimeReduction::with_prime(field, p);
                }
                found += 1;
            }
            p += step;
        }
    }

    /// Use the given prime (p ≡ 1 mod n, p < 2^31).
    pub fn with_prime(field: &CyclotomicField, p: u64) -> Result<PrimeReduction, FieldError> {
        let n = field.conductor() as u64;
        if !is_prime(p) || p >= 1 << 31 || (p - 1) % n != 0 {
            return Err(FieldError::BadPrime {
                p,
                reason: format!("need a prime p < 2^31 with p ≡ 1 mod {n}"),
            });
        }
        let prime_factors: Vec<u64> = factorize(n).into_iter().map(|(q, _)| q).collect();
        let root = (2..p)
            .map(|g| pow_mod(g, (p - 1) / n, p))
            .find(|&r| prime_factors.iter().all(|&q| pow_mod(r, n / q, p) != 1))
            .expect("F_p* is cyclic of order divisible by n");
        let powers = (0..field.degree() as u64)
            .map(|j| pow_mod(root, j, p))
            .collect();
        Ok(PrimeReduction {
            p,
            n: field.conductor(),
            root,
            powers,
        })
    }

    /// The prime p.
    pub fn prime(&self) -> u64 {
        self.p
    }

    /// The image of ζ_n in F_p.
    pub fn root(&self) -> u64 {
        self.root
    }

    fn reduce_big(&self, x: &BigInt) -> u64 {
        let m = BigInt::from(self.p);
        let r = ((x % &m) + &m) % &m;
        r.to_u64().expect("reduced below p")
    }

    /// The image of a in F_p; an error when p divides its denominator.
    pub fn reduce(&self, a: &Cyc) -> Result<u64, FieldError> {
        if a.n != self.n {
            return Err(FieldError::FieldMismatch {
                left: self.n,
                right: a.n,
            });
        }
        let p = self.p;
        let (sum, den) = match &a.data {
            Data::Small { num, den } => {
                let mut s = 0u64;
                for (c, w) in num.iter().zip(&self.powers) {
                    let c = c.rem_euclid(p as i64) as u64;
                    s = (s + c * w % p) % p;
                }
                (s, den.rem_euclid(p as i64) as u64)
            }
            Data::Big { num, den } => {
                let mut s = 0u64;
                for (c, w) in num.iter().zip(&self.powers) {
                    s = (s + self.reduce_big(c) * w % p) % p;
                }
                (s, self.reduce_big(den))
            }
        };
        if den == 0 {
            return Err(FieldError::BadPrime {
                p,
                reason: "it divides a denominator".into(),
            });
        }
        Ok(sum * pow_mod(den, p - 2, p) % p)
    }
}
