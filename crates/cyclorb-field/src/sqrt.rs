//! Exact square roots of rationals inside Q(ζ_n).
//!
//! For a squarefree integer m, Q(√m) ⊂ Q(ζ_n) exactly when its conductor |disc Q(√m)|
//! (|m| if m ≡ 1 mod 4, else 4|m|) divides n. The roots are built from
//! √−1 = ζ_4, √2 = ζ_8 + ζ_8⁻¹ and, for an odd prime p, the quadratic Gauss sum
//! g_p = Σ_k (k/p) ζ_p^k with g_p² = (−1)^{(p−1)/2} p. The root returned is the one with
//! positive real part (or positive imaginary part for negative rationals) under the
//! standard embedding.

use num_bigint::BigInt;
use num_traits::Signed;

use crate::context::CyclotomicField;
use crate::element::Cyc;
use crate::error::FieldError;
use crate::numtheory::{factorize, pow_mod};

impl CyclotomicField {
    /// Legendre symbol (k/p) for an odd prime p, by Euler's criterion.
    fn legendre(k: u64, p: u64) -> i64 {
        let r = pow_mod(k % p, (p - 1) / 2, p);
        if r == 0 {
            0
        } else if r == 1 {
            1
        } else {
            -1
        }
    }

    /// The quadratic Gauss sum g_p = Σ_{k=1}^{p−1} (k/p) ζ_p^k for an odd prime p | n;
    /// g_p² = p* = (−1)^{(p−1)/2} p, and g_p = √p or i√p (Gauss's sign theorem).
    fn gauss_sum(&self, p: u64) -> Result<Cyc, FieldError> {
        let step = self.conductor() as i64 / p as i64;
        let mut g = self.zero();
        for k in 1..p {
            let term = self.zeta_pow(step * k as i64);
            g = if Self::legendre(k, p) == 1 {
                self.add(&g, &term)?
            } else {
                self.sub(&g, &term)?
            };
        }
        Ok(g)
    }

    /// √r for r ∈ {1, −1, 2, −2}, principal branch: 1, ζ_4, ζ_8 + ζ_8⁻¹, ζ_8 + ζ_8³.
    fn sqrt_unit_or_two(&self, r: i64) -> Result<Cyc, FieldError> {
        let n = self.conductor() as i64;
        match r {
            1 => Ok(self.one()),
            -1 => Ok(self.zeta_pow(n / 4)),
            2 => self.add(&self.zeta_pow(n / 8), &self.zeta_pow(-n / 8)),
            _ => self.add(&self.zeta_pow(n / 8), &self.zeta_pow(3 * n / 8)),
        }
    }

    /// Whether √m (m a non-zero squarefree integer) lies in this field.
    fn contains_sqrt_squarefree(&self, m: i64) -> bool {
        let disc = if m.rem_euclid(4) == 1 {
            m.abs()
        } else {
            4 * m.abs()
        };
        let disc = if m == 1 { 1 } else { disc };
        self.conductor() as i64 % disc == 0
    }

    /// √(p/q) for a rational p/q when it lies in Q(ζ_n): the root with non-negative real
    /// part, and positive imaginary part when p/q < 0. `None` when it is not in the field.
    pub fn sqrt_rational(&self, p: &BigInt, q: &BigInt) -> Result<Option<Cyc>, FieldError> {
        if q.is_zero_big() {
            return Err(FieldError::DivisionByZero);
        }
        if p.is_zero_big() {
            return Ok(Some(self.zero()));
        }
        // √(p/q) = √(p·q) / |q|. Only primes dividing n can stay under the root
        // (Q(√m) ⊂ Q(ζ_n) needs every prime of m to divide n), so those are divided out
        // with their multiplicities and what is left must be a perfect square: no
        // factorisation of the (arbitrarily large) integer is needed.
        let prod = p * q;
        let negative = prod.is_negative();
        let mut rest = prod.abs();
        let mut square_part = BigInt::from(1);
        let mut free: Vec<u64> = Vec::new();
        for (prime, _) in factorize(u64::from(self.conductor())) {
            let big_prime = BigInt::from(prime);
            let mut exponent = 0u32;
            while (&rest % &big_prime).is_zero_big() {
                rest /= &big_prime;
                exponent += 1;
            }
            square_part *= big_prime.pow(exponent / 2);
            if exponent % 2 == 1 {
                free.push(prime);
            }
        }
        let root_of_rest = rest.sqrt();
        if &root_of_rest * &root_of_rest != rest {
            return Ok(None);
        }
        square_part *= root_of_rest;
        let free_product: i64 = free.iter().product::<u64>() as i64;
        let m = if negative {
            -free_product
        } else {
            free_product
        };
        if !self.contains_sqrt_squarefree(m) {
            return Ok(None);
        }
        // m = r · Π_{p odd} p*, r ∈ {±1, ±2}; each Gauss sum is √p or i√p, and √r is
        // 1, i, √2 or i√2. Count the factors of i (t) to land on the principal branch:
        // t ≡ [m < 0] (mod 2), so i^{[m<0] − t} = ±1 fixes the sign exactly.
        let mut root = self.big_rational(&square_part, &q.abs())?;
        let mut residual = m;
        let mut i_count = 0i64;
        for &prime in free.iter().filter(|&&p| p != 2) {
            root = self.mul(&root, &self.gauss_sum(prime)?)?;
            let p_star = if prime % 4 == 1 {
                prime as i64
            } else {
                -(prime as i64)
            };
            residual /= p_star;
            if prime % 4 == 3 {
                i_count += 1;
            }
        }
        if residual < 0 {
            i_count += 1;
        }
        root = self.mul(&root, &self.sqrt_unit_or_two(residual)?)?;
        let correction = i64::from(negative) - i_count;
        if correction.rem_euclid(4) == 2 {
            root = self.neg(&root);
        }
        Ok(Some(root))
    }
}

trait ZeroTest {
    fn is_zero_big(&self) -> bool;
}

impl ZeroTest for BigInt {
    fn is_zero_big(&self) -> bool {
        num_traits::Zero::is_zero(self)
    }
}
