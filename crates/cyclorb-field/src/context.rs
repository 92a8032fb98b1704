//! The field context: everything about Q(ζ_n) that does not depend on an element.

use std::sync::Arc;

use crate::error::FieldError;
use crate::modular::{ModPrime, PrimeCache};
use num_traits::ToPrimitive;

use crate::int_poly;
use crate::numtheory::euler_phi;

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
    /// Sparse residues of x^e for φ ≤ e ≤ 2φ − 2 (the exponents of a product).
    fold_table: FoldTable,
    reduction: Reduction,
    primes: PrimeCache,
}

impl CyclotomicField {
    /// The context for Q(ζ_n). Conductor 1 (and 2) give Q.
    pub fn new(n: u32) -> Result<Self, FieldError> {
        if n == 0 || n > MAX_CONDUCTOR {
            return Err(FieldError::BadConductor(n));
        }
        crate::budget::check_budget(
            || format!("the field Q(ζ_{n})"),
            CyclotomicField::table_bytes(n),
        )?;
        let phi = euler_phi(n as u64) as usize;
        // the coefficients of Φ_n for n ≤ MAX_CONDUCTOR are small (far inside i64)
        let cyclotomic = int_poly::cyclotomic(n as u64)
            .iter()
            .map(|c| c.to_i64().ok_or(FieldError::BadConductor(n)))
            .collect::<Result<Vec<i64>, FieldError>>()?;
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
        let fold_table = FoldTable::new(&residues, phi);
        Ok(CyclotomicField {
            n,
            phi,
            cyclotomic,
            residues,
            lower_terms,
            fold_table,
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

    /// The sparse residues of the exponents of a product (see [`FoldTable`]).
    pub(crate) fn fold_table(&self) -> &FoldTable {
        &self.fold_table
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

/// The residues x^e mod Φ_n for φ ≤ e ≤ 2φ − 2, stored sparsely: folding an unreduced product
/// w (length ≤ 2φ − 1) is w_j += Σ_e w_e·[x^j](x^e mod Φ_n), one flat pass with no chain of
/// dependent steps. `gain` bounds the growth: |folded_j| ≤ gain·max_e |w_e|.
#[derive(Debug, Clone)]
pub(crate) struct FoldTable {
    /// (e − φ, target exponent j < φ, coefficient), sorted by e.
    entries: Vec<(u32, u32, i64)>,
    /// `ends[m]` = number of entries with e − φ < m.
    ends: Vec<usize>,
    gain: u64,
}

impl FoldTable {
    fn new(residues: &[Vec<i64>], phi: usize) -> FoldTable {
        let mut entries = Vec::new();
        let mut ends = vec![0];
        let mut column_sums = vec![1u64; phi];
        for e in phi..2 * phi - 1 {
            // ζ^n = 1, so x^e and x^{e mod n} have the same residue
            let row = &residues[e % residues.len()];
            for (j, &c) in row.iter().enumerate() {
                if c != 0 {
                    entries.push(((e - phi) as u32, j as u32, c));
                    column_sums[j] = column_sums[j].saturating_add(c.unsigned_abs());
                }
            }
            ends.push(entries.len());
        }
        let gain = column_sums.into_iter().max().unwrap_or(1);
        FoldTable {
            entries,
            ends,
            gain,
        }
    }

    /// Upper bound on |folded coefficient| / max |unreduced coefficient|.
    pub(crate) fn gain(&self) -> u64 {
        self.gain
    }

    /// The entries (e − φ, j, [x^j](x^e mod Φ_n)) with e − φ < `high`.
    #[inline]
    pub(crate) fn entries(&self, high: usize) -> &[(u32, u32, i64)] {
        &self.entries[..self.ends[high]]
    }
}
