//! Roots of unity exp(2πi·p/q) inside a field Q(ζ_n), and conductor bookkeeping; the
//! whole group of roots of unity of the field as exponents ([`RootsOfUnity`]).
//!
//! Every root of unity of Q(ζ_n) is ±ζ_n^k, so they form the cyclic group μ_m, m = n for
//! even n and m = 2n for odd n (ζ_{2n} = −ζ_n^{(n+1)/2}).

use std::collections::HashMap;

use crate::{Cyc, CyclotomicField, FieldError, Rational};
use num_integer::Integer;
use num_traits::ToPrimitive;

/// exp(2πi·num/den) as an element of `field`, when it lies there.
///
/// With num/den in lowest terms, the root lies in Q(ζ_n) when den | n, or when n is odd and
/// den | 2n (then ζ_{2n}^t = −ζ_n^{(t+n)/2} for odd t).
pub fn root_of_unity(field: &CyclotomicField, num: i64, den: i64) -> Option<Cyc> {
    if den == 0 {
        return None;
    }
    let g = num.gcd(&den);
    let (mut p, mut q) = (num / g, den / g);
    if q < 0 {
        p = -p;
        q = -q;
    }
    let n = field.conductor() as i64;
    if n % q == 0 {
        return Some(field.zeta_pow(p.rem_euclid(q) * (n / q)));
    }
    if n % 2 == 1 && (2 * n) % q == 0 {
        let t = p.rem_euclid(q) * (2 * n / q);
        return Some(if t % 2 == 0 {
            field.zeta_pow(t / 2)
        } else {
            field.neg(&field.zeta_pow((t + n) / 2))
        });
    }
    None
}

/// exp(2πi·r) for a rational r, when it lies in `field`.
pub fn root_of_unity_at(field: &CyclotomicField, r: &Rational) -> Option<Cyc> {
    let den = r.denom().to_i64()?;
    let num = (r.numer() % r.denom()).to_i64()?;
    root_of_unity(field, num, den)
}

/// The conventional conductor of a field: Q(ζ_n) = Q(ζ_{2n}) for odd n, so n ≡ 2 (mod 4)
/// is replaced by n/2 (and 2 by 1).
pub fn canonical_conductor(n: u64) -> u64 {
    if n % 4 == 2 {
        n / 2
    } else {
        n
    }
}

/// The smallest canonical conductor of a field holding exp(2πi·p/q) (p/q in lowest terms).
pub fn conductor_of_root(num: i64, den: i64) -> u64 {
    let g = num.gcd(&den).max(1);
    canonical_conductor((den / g).unsigned_abs())
}

/// The table e ↦ ζ_m^e and its inverse.
#[derive(Debug, Clone)]
pub struct RootsOfUnity {
    modulus: u32,
    powers: Vec<Cyc>,
    index: HashMap<Cyc, u32>,
}

impl RootsOfUnity {
    /// μ_m inside `field` (m = lcm(2, n)).
    pub fn new(field: &CyclotomicField) -> Result<RootsOfUnity, FieldError> {
        let n = field.conductor();
        let (modulus, generator) = if n % 2 == 0 {
            (n, field.zeta_pow(1))
        } else {
            (2 * n, field.neg(&field.zeta_pow(i64::from(n.div_ceil(2)))))
        };
        let mut powers = Vec::with_capacity(modulus as usize);
        let mut current = field.one();
        for _ in 0..modulus {
            let next = field.mul(&current, &generator)?;
            powers.push(current);
            current = next;
        }
        let index = powers
            .iter()
            .enumerate()
            .map(|(e, x)| (x.clone(), e as u32))
            .collect();
        Ok(RootsOfUnity {
            modulus,
            powers,
            index,
        })
    }

    /// m: the order of the group of roots of unity of the field.
    pub fn modulus(&self) -> u32 {
        self.modulus
    }

    /// ζ_m^e (e taken modulo m).
    pub fn power(&self, e: u32) -> &Cyc {
        &self.powers[(e % self.modulus) as usize]
    }

    /// The exponent e with c = ζ_m^e, when c is a root of unity.
    pub fn exponent(&self, c: &Cyc) -> Option<u32> {
        self.index.get(c).copied()
    }

    /// The multiplicative order of ζ_m^e.
    pub fn order(&self, e: u32) -> u32 {
        let m = self.modulus;
        m / num_integer::gcd(e % m, m)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_roots_of_unity_of_q_zeta_n_form_mu_lcm_2_n() {
        // Q(ζ_n) holds exactly the roots of unity ±ζ_n^k, a cyclic group of order lcm(2, n)
        // (common practice)
        for (n, m) in [(1u32, 2u32), (3, 6), (5, 10), (8, 8), (12, 12), (15, 30)] {
            let f = CyclotomicField::new(n).unwrap();
            let roots = RootsOfUnity::new(&f).unwrap();
            assert_eq!(roots.modulus(), m, "n = {n}");
            for e in 0..m {
                let x = roots.power(e);
                assert_eq!(roots.exponent(x), Some(e));
                // ζ_m^e has order m / gcd(e, m): its order-th power is 1 and no smaller one is
                let order = roots.order(e);
                assert_eq!(f.pow(x, i64::from(order)).unwrap(), f.one());
                assert!((1..order).all(|k| f.pow(x, i64::from(k)).unwrap() != f.one()));
            }
            // −1 is the root of exponent m/2, and 2 is not a root of unity
            assert_eq!(roots.exponent(&f.int(-1)), Some(m / 2));
            assert_eq!(roots.exponent(&f.int(2)), None);
        }
    }
}
