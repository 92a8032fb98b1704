//! The roots of unity of Q(ζ_n) as exponents: μ_m = ⟨ζ_m⟩ with m = lcm(2, n).
//!
//! Every root of unity of Q(ζ_n) is ±ζ_n^k, so they form the cyclic group μ_m, m = n for
//! even n and m = 2n for odd n (ζ_{2n} = −ζ_n^{(n+1)/2}). Phases of monomial matrices are
//! stored as exponents e ∈ Z/m of ζ_m.

use cyclorb_field::{Cyc, CyclotomicField, FieldError};
use hashbrown::HashMap;

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
