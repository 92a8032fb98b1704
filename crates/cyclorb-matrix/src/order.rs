//! The order of a matrix modulo scalars (its order in PGL), exactly.
//!
//! For invertible X the set {k ∈ Z : X^k is a scalar} is a subgroup dZ (if X^a = αI and
//! X^b = βI then X^{ua+vb} = α^u β^v I), and d is the projective order. Modulo a prime p
//! (see [`crate::ModpMatrix`]) with X_p invertible, the set
//! {k : X_p^k v ∈ F_p·v for the test vectors v} is again a subgroup d_p Z and contains dZ,
//! so d is a multiple of d_p. The search therefore runs cheaply mod p on two vectors
//! (O(dim²) per step) to find d_p, for two primes, and then tests only the multiples of
//! lcm(d_p, d_p') exactly. Every answer is an exact identity X^k = c·I over Q(ζ_n); the
//! primes only skip candidates that cannot work.

use cyclorb_field::{CyclotomicField, FieldError, PrimeReduction};
use num_integer::Integer;

use crate::dense::Matrix;
use crate::error::MatrixError;
use crate::modp::ModpMatrix;

/// What the computation modulo primes proved about the projective order d.
enum ModularBound {
    /// d is a multiple of this number (if d exists at all).
    MultipleOf(u64),
    /// No k ≤ max can work.
    Exceeds,
    /// No prime was usable (p divided a denominator or X_p was singular).
    Unknown,
}

/// Primes tried by the modular filter.
const FILTER_PRIMES: usize = 2;

/// Test vectors mod p with every entry in 1..p (a fixed xorshift sequence: any choice is
/// valid, random-looking ones make the filter sharp).
fn test_vectors(p: u64, dim: usize) -> [Vec<u64>; 2] {
    let mut state: u64 = 0x9e37_79b9_7f4a_7c15;
    let mut next = move || {
        state ^= state << 13;
        state ^= state >> 7;
        state ^= state << 17;
        1 + state % (p - 1)
    };
    [
        (0..dim).map(|_| next()).collect(),
        (0..dim).map(|_| next()).collect(),
    ]
}

/// w ∈ F_p·v, for v with v₀ ≠ 0: w_j·v₀ = w₀·v_j for every j.
fn proportional(w: &[u64], v: &[u64], p: u64) -> bool {
    w.iter().zip(v).all(|(a, b)| a * v[0] % p == w[0] * b % p)
}

/// The least k in 1..=max with X_p^k v ∈ F_p·v for both test vectors, if any.
fn vector_period(xp: &ModpMatrix, max: u64) -> Result<Option<u64>, MatrixError> {
    let p = xp.prime();
    let starts = test_vectors(p, xp.rows());
    let mut images = starts.clone();
    for k in 1..=max {
        for w in &mut images {
            *w = xp.mul_vec(w)?;
        }
        if images
            .iter()
            .zip(&starts)
            .all(|(w, v)| proportional(w, v, p))
        {
            return Ok(Some(k));
        }
    }
    Ok(None)
}

impl Matrix {
    /// What primes p ≡ 1 (mod n) prove about the projective order (module documentation).
    fn modular_bound(
        &self,
        field: &CyclotomicField,
        max: u64,
    ) -> Result<ModularBound, MatrixError> {
        let mut step: Option<u64> = None;
        for index in 0..FILTER_PRIMES {
            let reduction = PrimeReduction::nth(field, index)?;
            let xp = match self.reduce_mod(&reduction) {
                Ok(xp) => xp,
                Err(MatrixError::Field(FieldError::BadPrime { .. })) => continue,
                Err(e) => return Err(e),
            };
            if xp.rank() < xp.rows() {
                continue;
            }
            match vector_period(&xp, max)? {
                None => return Ok(ModularBound::Exceeds),
                Some(d) => step = Some(step.map_or(d, |s| s.lcm(&d))),
            }
        }
        Ok(match step {
            Some(s) if s > max => ModularBound::Exceeds,
            Some(s) => ModularBound::MultipleOf(s),
            None => ModularBound::Unknown,
        })
    }

    /// The projective order: the least k with 1 ≤ k ≤ `max` such that X^k = c·I for some
    /// c ≠ 0, or `None` when there is no such k (in particular when X is singular).
    /// Exact: the answer k is verified over Q(ζ_n), and `None` is proved either exactly or
    /// by the modular argument of the module documentation. Cost: O(max · dim²) operations
    /// mod p plus a few exact products.
    pub fn projective_order(
        &self,
        field: &CyclotomicField,
        max: u64,
    ) -> Result<Option<u64>, MatrixError> {
        self.require_square("a projective order")?;
        if max == 0 {
            return Ok(None);
        }
        if self.rows() == 0 {
            return Ok(Some(1));
        }
        let step = match self.modular_bound(field, max)? {
            ModularBound::MultipleOf(s) => s,
            ModularBound::Exceeds => return Ok(None),
            ModularBound::Unknown if self.rank(field)? < self.rows() => return Ok(None),
            ModularBound::Unknown => 1,
        };
        let power = self.power(field, step)?;
        let mut current = power.clone();
        let mut k = step;
        loop {
            if current.is_scalar(field).is_some_and(|c| !c.is_zero()) {
                return Ok(Some(k));
            }
            k = match k.checked_add(step) {
                Some(next) if next <= max => next,
                _ => return Ok(None),
            };
            current = current.mul(field, &power)?;
        }
    }
}
