//! The permutations the generators induce on a saturated set of lines, found through keys
//! of the lines modulo a prime, so that millions of lines cost a few bytes each.
//!
//! **Keys.** Fix a prime p ≡ 1 (mod n) and the reduction Q(ζ_n) → F_p, ζ_n ↦ r (a ring
//! homomorphism on the local ring at the prime 𝔭 it defines). A representative v of a line
//! whose coordinates reduce, not all to 0, has a reduction v̄ ≠ 0; the key of the line is a
//! 64-bit hash of v̄ scaled to have first non-zero entry 1 (a point of P^{d−1}(F_p)). It
//! does not depend on the representative: if w = c·v and both reduce to non-zero vectors,
//! c is a 𝔭-unit and w̄ = c̄·v̄.
//!
//! **Why the permutations are exact.** Suppose the lines are closed under every generator
//! A (the orbit engine proves this exactly) and their keys are pairwise distinct (checked
//! here). For a line ⟨v_i⟩, A·v_i = c·v_j for the line ⟨v_j⟩ of the set that A maps it to.
//! If Ā·v̄_i ≠ 0 (checked), then A·v_i is not in 𝔭, so c is a 𝔭-unit and the key of Ā·v̄_i
//! is the key of ⟨v_j⟩, which no other line has: the look-up returns j. A prime that fails
//! a check (a denominator divisible by p, a representative or an image reducing to 0, two
//! lines with one key) is replaced by the next one. An image whose key is not among the
//! lines proves the set is not closed.

use cyclorb_field::numtheory::pow_mod;
use cyclorb_field::{Cyc, FieldError, PrimeReduction};
use hashbrown::HashMap;

use crate::error::CertError;
use crate::line_set::LineSet;
use crate::parallel::map_ranges;
use crate::projective::normalise;
use cyclorb_matrix::ProvedGenerators;

/// Primes tried before giving up.
const KEY_PRIMES: usize = 4;

/// A generator reduced modulo p, as its non-zero entries row by row.
type SparseRows = Vec<Vec<(usize, u64)>>;

/// The reduction modulo one prime: the generators, the lines and the index of their keys.
struct Keys {
    reduction: PrimeReduction,
    generators: Vec<SparseRows>,
    dim: usize,
    /// Per line, its key (two 32-bit halves) and its d residues (each below p < 2^31):
    /// kept so that no line is read twice.
    records: Vec<u32>,
    index: HashMap<u64, u32>,
}

fn unusable(p: u64, reason: &str) -> CertError {
    CertError::Field(FieldError::BadPrime {
        p,
        reason: reason.into(),
    })
}

/// The 64-bit hash of a vector of residues (multiply–xorshift; collisions are detected).
fn hash(v: &[u64]) -> u64 {
    let mut h = 0x9e37_79b9_7f4a_7c15u64 ^ v.len() as u64;
    for &x in v {
        h = (h ^ x).wrapping_mul(0xff51_afd7_ed55_8ccd);
        h ^= h >> 29;
    }
    h
}

impl Keys {
    fn reduce_vector(&self, v: &[Cyc]) -> Result<Vec<u64>, CertError> {
        v.iter().map(|x| Ok(self.reduction.reduce(x)?)).collect()
    }

    /// The key of the projective point of v̄; an unusable-prime error for v̄ = 0.
    fn key(&self, v: &[u64]) -> Result<u64, CertError> {
        let p = self.reduction.prime();
        let Some(&lead) = v.iter().find(|&&x| x != 0) else {
            return Err(unusable(p, "a line reduces to the zero vector"));
        };
        let scale = pow_mod(lead, p - 2, p);
        let scaled: Vec<u64> = v.iter().map(|&x| x * scale % p).collect();
        Ok(hash(&scaled))
    }

    /// Ā·v̄ for generator `a`.
    fn apply(&self, a: usize, v: &[u64]) -> Vec<u64> {
        let p = self.reduction.prime();
        self.generators[a]
            .iter()
            .map(|row| row.iter().fold(0, |acc, &(j, m)| (acc + m * v[j]) % p))
            .collect()
    }

    /// The reduced generators and the key index of the lines, with the `attempt`-th prime.
    fn build<L: LineSet + ?Sized>(
        gens: &ProvedGenerators,
        lines: &L,
        attempt: usize,
        threads: usize,
    ) -> Result<Keys, CertError> {
        let field = gens.field();
        let reduction = PrimeReduction::nth(field, attempt)?;
        let mut generators = Vec::with_capacity(gens.len());
        for a in 0..gens.len() {
            let m = gens.dense(a);
            let mut rows = Vec::with_capacity(m.rows());
            for i in 0..m.rows() {
                let mut row = Vec::new();
                for (j, x) in m.row(i).iter().enumerate() {
                    let r = reduction.reduce(x)?;
                    if r != 0 {
                        row.push((j, r));
                    }
                }
                rows.push(row);
            }
            generators.push(rows);
        }
        let dim = gens.dimension();
        let mut keys = Keys {
            reduction,
            generators,
            dim,
            records: Vec::new(),
            index: HashMap::with_capacity(lines.len()),
        };
        let stride = dim + 2;
        keys.records = map_ranges(lines.len(), threads, |range| {
            let mut out = Vec::with_capacity(range.len() * stride);
            for k in range {
                let v = lines.line(k)?;
                if v.len() != dim {
                    return Err(CertError::Input(format!(
                        "line {k} has {} coordinates, the generators act on {dim}",
                        v.len()
                    )));
                }
                let r = keys.reduce_vector(&v)?;
                let key = keys.key(&r)?;
                out.extend([key as u32, (key >> 32) as u32]);
                out.extend(r.into_iter().map(|x| x as u32));
            }
            Ok(out)
        })?;
        let line_keys: Vec<u64> = keys
            .records
            .chunks_exact(stride)
            .map(|r| u64::from(r[0]) | (u64::from(r[1]) << 32))
            .collect();
        for (k, key) in line_keys.into_iter().enumerate() {
            if let Some(earlier) = keys.index.insert(key, k as u32) {
                let earlier = earlier as usize;
                if normalise(field, &lines.line(earlier)?)? == normalise(field, &lines.line(k)?)? {
                    return Err(CertError::Input(format!("line {k} repeats line {earlier}")));
                }
                return Err(unusable(keys.reduction.prime(), "two lines share a key"));
            }
        }
        Ok(keys)
    }

    /// For each generator, the images of all lines.
    fn permutations(
        &self,
        gens: &ProvedGenerators,
        threads: usize,
    ) -> Result<Vec<Vec<u32>>, CertError> {
        let count = gens.len();
        let stride = self.dim + 2;
        let images = map_ranges(self.records.len() / stride, threads, |range| {
            let mut out = Vec::with_capacity(range.len() * count);
            for k in range {
                let v: Vec<u64> = self.records[k * stride + 2..(k + 1) * stride]
                    .iter()
                    .map(|&x| u64::from(x))
                    .collect();
                for (a, name) in gens.names().iter().enumerate() {
                    let key = self.key(&self.apply(a, &v))?;
                    let target = self.index.get(&key).ok_or_else(|| {
                        CertError::Input(format!(
                            "{name} maps line {k} outside the given lines: they are not closed"
                        ))
                    })?;
                    out.push(*target);
                }
            }
            Ok(out)
        })?;
        Ok((0..count)
            .map(|a| images.iter().skip(a).step_by(count).copied().collect())
            .collect())
    }
}

/// For each generator A, the permutation π of the lines with A·⟨v_k⟩ = ⟨v_{π(k)}⟩.
///
/// Precondition: the lines are closed under every generator (a saturated orbit, or a
/// union of them). The permutations are then exact (module documentation); an image found
/// outside the lines is an error, as are repeated lines and lines of the wrong length.
pub fn induced_permutations<L: LineSet + ?Sized>(
    gens: &ProvedGenerators,
    lines: &L,
    threads: usize,
) -> Result<Vec<Vec<u32>>, CertError> {
    let mut last = None;
    for attempt in 0..KEY_PRIMES {
        let found =
            Keys::build(gens, lines, attempt, threads).and_then(|k| k.permutations(gens, threads));
        match found {
            Err(CertError::Field(e @ FieldError::BadPrime { .. })) => last = Some(e),
            other => return other,
        }
    }
    Err(CertError::Input(format!(
        "no prime among the first {KEY_PRIMES} gives the lines distinct keys (last: {})",
        last.map_or_else(String::new, |e| e.to_string())
    )))
}

#[cfg(test)]
mod tests {
    use cyclorb_field::CyclotomicField;
    use cyclorb_matrix::{Matrix, Operator};

    use super::*;

    /// The single-qubit Clifford generators H and S = diag(1, i) over Q(ζ_8) and the six
    /// stabiliser states (common practice).
    fn clifford() -> (ProvedGenerators, Vec<Vec<Cyc>>) {
        let f = CyclotomicField::new(8).unwrap();
        let e = |t: &str| f.parse(t).unwrap();
        let h = Matrix::from_rows(vec![
            vec![e("1/sqrt(2)"), e("1/sqrt(2)")],
            vec![e("1/sqrt(2)"), e("-1/sqrt(2)")],
        ])
        .unwrap();
        let gens = ProvedGenerators::new(
            f.clone(),
            vec![
                ("H".into(), Operator::Dense(h)),
                ("S".into(), Operator::Diagonal(vec![e("1"), e("i")])),
            ],
            None,
        )
        .unwrap();
        let lines = [
            ["1", "0"],
            ["0", "1"],
            ["1", "1"],
            ["1", "-1"],
            ["1", "i"],
            ["1", "-i"],
        ]
        .iter()
        .map(|v| v.iter().map(|t| e(t)).collect())
        .collect();
        (gens, lines)
    }

    #[test]
    fn clifford_permutes_the_stabiliser_states() {
        let (gens, lines) = clifford();
        let perms = induced_permutations(&gens, &lines, 2).unwrap();
        // H swaps |0⟩ ↔ |+⟩, |1⟩ ↔ |−⟩ and |+i⟩ ↔ |−i⟩; S fixes |0⟩, |1⟩ and cycles
        // |+⟩ → |+i⟩ → |−⟩ → |−i⟩ (common practice)
        assert_eq!(perms[0], vec![2, 3, 0, 1, 5, 4]);
        assert_eq!(perms[1], vec![0, 1, 4, 5, 3, 2]);
    }

    #[test]
    fn open_or_repeated_lines_are_errors() {
        let (gens, mut lines) = clifford();
        lines.pop();
        let err = induced_permutations(&gens, &lines, 1).unwrap_err();
        assert!(err.to_string().contains("not closed"), "{err}");
        let f = gens.field().clone();
        lines.push(vec![f.int(3), f.int(3)]);
        let err = induced_permutations(&gens, &lines, 1).unwrap_err();
        assert!(err.to_string().contains("repeats line 2"), "{err}");
    }
}
