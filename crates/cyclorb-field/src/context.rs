//! The field context: everything about Q(ζ_n) that does not depend on an element.

use std::sync::Arc;

use crate::error::FieldError;
use crate::modular::{ModPrime, PrimeCache};
use crate::numtheory::{cyclotomic_polynomial, euler_phi};

/// Largest conductor accepted (tables are n × φ(n) integers).
pub const MAX_CONDUCTOR: u32 = 20_000;

/// How products of length 2φ−1 are folded back to length φ.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Reduction {
    /// n is a power of two (n ≥ 2): Φ_n = x^φ + 1, so x^{φ+j} = −x^j (negacyclic fold).
    Negacyclic,
    /// Any other n: x^e is replaced by its precomputed residue modulo Φ_n.
    Table,
}

/// The cyclotomic field Q(ζ_n), ζ_n = exp(2πi/n), in the power basis 1, ζ, …, ζ^{φ(n)−1}.
///
/// Elements ([`crate::Cyc`]) carry only their conductor and coefficients; every operation is a
/// method of this context, which holds Φ_n, the residues of x^e modulo Φ_n for 0 ≤ e < n, the
/// fast path chosen once at construction, and the word-sized primes p ≡ 1 (mod n) found so far
/// by multi-modular algorithms (kept across calls; safe to use from several threads).
#[derive(Debug, Clone)]
pub struct CyclotomicField {
    n: u32,
    phi: usize,
    cyclotomic: Vec<i64>,
    /// `residues[e]` = x^e mod Φ_n as φ integer coefficients, for 0 ≤ e < n.
    residues: Vec<Vec<i64>>,
    /// The non-zero coefficients of Φ_n below its leading 1, as (exponent, coefficient).
    lower_terms: Vec<(usize, i64)>,
    reduction: Reduction,
    primes: PrimeCache,
}

impl CyclotomicField {
    /// The context for Q(ζ_n). Conductor 1 (and 2) give Q.
    pub fn new(n: u32) -> Result<Self, FieldError> {
        if n == 0 || n > MAX_CONDUCTOR {
            return Err(FieldError::BadConductor(n));
        }
        let phi = euler_phi(n as u64) as usize;
        let cyclotomic = cyclotomic_polynomial(n as u64);
        let reduction = if n >= 2 && n.is_power_of_two() {
            Reduction::Negacyclic
        } else {
            Reduction::Table
        };
        let mut residues = Vec::with_capacity(n as usize);
        let mut cur = vec![0i64; phi];
        cur[0] = 1;
        for _ in 0..n {
            residues.push(cur.clone());
            // multiply by x and reduce the x^φ term with Φ_n (monic)
            let top = cur[phi - 1];
            for j in (1..phi).rev() {
                cur[j] = cur[j - 1];
            }
            cur[0] = 0;
            if top != 0 {
                for j in 0..phi {
                    cur[j] -= top * cyclotomic[j];
                }
            }
        }
        let lower_terms = cyclotomic[..phi]
            .iter()
            .enumerate()
            .filter(|(_, &c)| c != 0)
            .map(|(j, &c)| (j, c))
            .collect();
        Ok(CyclotomicField {
            n,
            phi,
            cyclotomic,
            residues,
            lower_terms,
            reduction,
            primes: PrimeCache::default(),
        })
    }

    /// The conductor n.
    pub fn conductor(&self) -> u32 {
        self.n
    }

    /// The degree φ(n) of Q(ζ_n) over Q: the length of every coefficient vector.
    pub fn degree(&self) -> usize {
        self.phi
    }

    /// Coefficients of Φ_n, constant term first.
    pub fn cyclotomic_polynomial(&self) -> &[i64] {
        &self.cyclotomic
    }

    /// Which fold the multiplication uses.
    pub fn reduction(&self) -> Reduction {
        self.reduction
    }

    /// x^e mod Φ_n for any integer e (ζ_n^e in the power basis).
    pub fn residue(&self, e: i64) -> &[i64] {
        &self.residues[e.rem_euclid(self.n as i64) as usize]
    }

    /// The non-zero coefficients of Φ_n below x^φ, as (exponent, coefficient) pairs.
    pub(crate) fn lower_terms(&self) -> &[(usize, i64)] {
        &self.lower_terms
    }

    /// The first `count` primes p ≡ 1 (mod n) of this field (see [`crate::modular`]).
    pub(crate) fn primes(&self, count: usize) -> Vec<Arc<ModPrime>> {
        self.primes.first(self.n, &self.cyclotomic, count)
    }

    pub(crate) fn check(&self, n: u32) -> Result<(), FieldError> {
        if n == self.n {
            Ok(())
        } else {
            Err(FieldError::FieldMismatch {
                left: self.n,
                right: n,
            })
        }
    }
}
