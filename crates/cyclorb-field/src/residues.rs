//! Residues at many prime ideals of degree one: a way to prove identities in Q(ζ_n) with
//! word-sized arithmetic.
//!
//! For a prime p ≡ 1 (mod n) and a root r of Φ_n modulo p, 𝔭 = (p, ζ − r) is a prime ideal
//! of Z[ζ_n] of norm p, and ζ ↦ r is the ring homomorphism onto Z[ζ_n]/𝔭 = F_p (extended to
//! elements whose denominator is prime to p). Different roots of one prime, and different
//! primes, give different ideals.
//!
//! **Zero test.** Let y ∈ Q(ζ_n) with D·y ∈ Z[ζ_n] for an integer D and |σ(y)| ≤ B for every
//! complex embedding σ. If y ≡ 0 modulo distinct ideals 𝔭_1, …, 𝔭_E none of which divides D,
//! and Π N(𝔭_i) > (D·B)^φ(n), then y = 0: otherwise 𝔭_1⋯𝔭_E divides the non-zero ideal
//! (D·y), so Π N(𝔭_i) divides the integer N(D·y) = Π_σ σ(D·y), whose absolute value is at
//! most (D·B)^φ(n). When y lies in a subfield K, the same holds with N_K and [K:Q] in place
//! of φ(n), for ideals whose restrictions to K are distinct.
//! [`CyclotomicField::residue_map`] chooses enough ideals for a given bound.
//! A bound that holds for every embedding at once is ‖A‖₁/d for a = A/d in the power basis
//! (|σ(ζ^j)| = 1), see [`Cyc::embedding_bound`].
//!
//! Residues are kept in Montgomery form; all arithmetic is on slices with one residue per
//! ideal, so a sum of products costs E word products per term.

use num_bigint::{BigInt, BigUint};
use num_integer::Integer;
use num_traits::Zero;

use crate::context::CyclotomicField;
use crate::element::{Cyc, Data};
use crate::error::FieldError;
use crate::modular::{Montgomery, PRIME_BITS};

/// One prime ideal 𝔭 = (p, ζ − r): arithmetic modulo p and the powers r^j, j < φ(n)
/// (Montgomery form).
#[derive(Debug, Clone)]
struct Ideal {
    mont: Montgomery,
    powers: Vec<u64>,
}

/// The residue maps a ↦ a mod 𝔭_i at E distinct prime ideals of degree one, with slice
/// arithmetic (one Montgomery residue per ideal). See the module documentation for the zero
/// test it serves.
#[derive(Debug, Clone)]
pub struct ResidueMap {
    conductor: u32,
    ideals: Vec<Ideal>,
}

impl CyclotomicField {
    /// Enough prime ideals of degree one, none dividing `avoid`, to prove zero the elements
    /// y of the fixed field K of `fixing` (a subgroup H of Gal(Q(ζ_n)/Q) as exponents, see
    /// [`CyclotomicField::fixing_group`]; `[1]` for K = Q(ζ_n)) for which some integer M,
    /// built from the primes of `avoid` (so that y's residues are defined), has M·y
    /// integral and M·|σ(y)| ≤ `bound` for every embedding σ.
    ///
    /// The ideals 𝔭_k = (p, ζ − r^k) are taken with k in distinct cosets kH, so that their
    /// restrictions 𝔭_k ∩ K are distinct primes of K of norm p (the primes of Q(ζ_n) above
    /// one prime of K form one H-orbit). Zero residues at E of them put the product of those
    /// E primes into the ideal (M·y) of K, so p_1⋯p_E divides N_K(M·y), whose absolute
    /// value is at most `bound`^\[K:Q\]; with every p > 2^61,
    /// E = ⌊\[K:Q\]·bits(bound)/61⌋ + 1 ideals force y = 0.
    pub fn residue_map(&self, bound: &BigUint, avoid: &BigInt, fixing: &[i64]) -> ResidueMap {
        let n = self.conductor() as i64;
        let degree = self.degree() / fixing.len().max(1);
        let count = (degree as u64 * bound.bits() / PRIME_BITS) as usize + 1;
        // one exponent per coset kH, ascending
        let mut representatives: Vec<usize> = Vec::with_capacity(degree);
        let mut covered: Vec<i64> = Vec::new();
        for (index, k) in self.galois_group().into_iter().enumerate() {
            if !covered.contains(&k) {
                representatives.push(index);
                covered.extend(fixing.iter().map(|&h| k * h % n));
            }
        }
        let mut ideals = Vec::with_capacity(count);
        let mut primes_taken = 0;
        while ideals.len() < count {
            primes_taken += 1;
            let prime = self
                .primes(primes_taken)
                .pop()
                .expect("the cache returns the requested primes");
            let mont = prime.mont;
            if !avoid.is_zero() && (avoid % BigInt::from(mont.p)).is_zero() {
                continue;
            }
            for &index in representatives.iter().take(count - ideals.len()) {
                let root = prime.roots[index];
                let mut powers = Vec::with_capacity(self.degree());
                let mut x = mont.of_u64(1);
                for _ in 0..self.degree() {
                    powers.push(x);
                    x = mont.mul(x, root);
                }
                ideals.push(Ideal { mont, powers });
            }
        }
        ResidueMap {
            conductor: self.conductor(),
            ideals,
        }
    }
}

impl ResidueMap {
    /// The number E of ideals (the length of every residue slice).
    pub fn len(&self) -> usize {
        self.ideals.len()
    }

    /// Whether there are no ideals (never, for a map made by the field).
    pub fn is_empty(&self) -> bool {
        self.ideals.is_empty()
    }

    /// The residues of `a` at every ideal, written to `out` (length E); an error when `a`
    /// is from another field or an ideal's prime divides its denominator.
    pub fn reduce_into(&self, a: &Cyc, out: &mut [u64]) -> Result<(), FieldError> {
        if a.n != self.conductor {
            return Err(FieldError::FieldMismatch {
                left: self.conductor,
                right: a.n,
            });
        }
        for (ideal, slot) in self.ideals.iter().zip(out.iter_mut()) {
            let m = &ideal.mont;
            let (value, den) = match &a.data {
                Data::Small { num, den } => {
                    let v = num
                        .iter()
                        .zip(&ideal.powers)
                        .filter(|(&c, _)| c != 0)
                        .fold(0, |acc, (&c, &w)| m.add(acc, m.mul(m.of_i64(c), w)));
                    (v, m.of_i64(*den))
                }
                Data::Big { num, den } => {
                    let v = num
                        .iter()
                        .zip(&ideal.powers)
                        .fold(0, |acc, (c, &w)| m.add(acc, m.mul(m.of_big(c), w)));
                    (v, m.of_big(den))
                }
            };
            if den == 0 {
                return Err(FieldError::DivisionByZero);
            }
            *slot = m.mul(value, m.inv(den));
        }
        Ok(())
    }

    /// The residues of `a` as a new vector.
    pub fn reduce(&self, a: &Cyc) -> Result<Vec<u64>, FieldError> {
        let mut out = vec![0; self.len()];
        self.reduce_into(a, &mut out)?;
        Ok(out)
    }

    /// x·y modulo the i-th ideal (Montgomery residues).
    #[inline]
    pub fn mul_at(&self, i: usize, x: u64, y: u64) -> u64 {
        self.ideals[i].mont.mul(x, y)
    }

    /// Σ_j x_j·y_j modulo the i-th ideal, for residues x_j, y_j at that ideal. Products are
    /// added four at a time before one Montgomery reduction: 4p² < p·2^64 because p < 2^62.
    #[inline]
    pub fn dot_at(&self, i: usize, x: &[u64], y: &[u64]) -> u64 {
        let m = &self.ideals[i].mont;
        let mut acc = 0;
        let mut xs = x.chunks_exact(4);
        let mut ys = y.chunks_exact(4);
        for (a, b) in (&mut xs).zip(&mut ys) {
            let t = a[0] as u128 * b[0] as u128
                + a[1] as u128 * b[1] as u128
                + a[2] as u128 * b[2] as u128
                + a[3] as u128 * b[3] as u128;
            acc = m.add(acc, m.redc(t));
        }
        for (&a, &b) in xs.remainder().iter().zip(ys.remainder()) {
            acc = m.add(acc, m.mul(a, b));
        }
        acc
    }

    /// out ← x·y, ideal by ideal.
    #[inline]
    pub fn mul_into(&self, out: &mut [u64], x: &[u64], y: &[u64]) {
        for (((o, &a), &b), ideal) in out.iter_mut().zip(x).zip(y).zip(&self.ideals) {
            *o = ideal.mont.mul(a, b);
        }
    }

    /// acc ← acc + x·y, ideal by ideal.
    #[inline]
    pub fn add_product(&self, acc: &mut [u64], x: &[u64], y: &[u64]) {
        for (((o, &a), &b), ideal) in acc.iter_mut().zip(x).zip(y).zip(&self.ideals) {
            let m = &ideal.mont;
            *o = m.add(*o, m.mul(a, b));
        }
    }
}

impl Cyc {
    /// A bound for |σ(a)| under every complex embedding σ, as (‖A‖₁, d) for a = A/d in the
    /// power basis: |σ(a)| ≤ ‖A‖₁/d because every |σ(ζ^j)| = 1. Also d·a ∈ Z\[ζ_n\].
    pub fn embedding_bound(&self) -> (BigUint, BigUint) {
        match &self.data {
            Data::Small { num, den } => {
                let sum: u128 = num.iter().map(|c| c.unsigned_abs() as u128).sum();
                (BigUint::from(sum), BigUint::from(den.unsigned_abs()))
            }
            Data::Big { num, den } => {
                let sum = num
                    .iter()
                    .fold(BigUint::zero(), |acc, c| acc + c.magnitude());
                (sum, den.magnitude().clone())
            }
        }
    }

    /// ⌈‖A‖₁/d⌉ and d of [`Cyc::embedding_bound`], the integer forms the zero test uses.
    pub fn embedding_bound_ceil(&self) -> (BigUint, BigUint) {
        let (sum, den) = self.embedding_bound();
        let (q, r) = sum.div_rem(&den);
        let ceil = if r.is_zero() { q } else { q + 1u32 };
        (ceil, den)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn field(n: u32) -> CyclotomicField {
        CyclotomicField::new(n).unwrap()
    }

    /// Reduction is a ring homomorphism (common practice: ζ ↦ r with Φ_n(r) ≡ 0 mod p).
    #[test]
    fn reduction_respects_sums_and_products() {
        let q = field(24);
        let map = q.residue_map(&BigUint::from(1u32 << 20), &BigInt::from(1), &[1]);
        let a = q.parse("(3 - 2*z + z^5)/7").unwrap();
        let b = q.parse("z^3 - 5*z^7 + 1/3").unwrap();
        let (ra, rb) = (map.reduce(&a).unwrap(), map.reduce(&b).unwrap());
        let mut product = vec![0; map.len()];
        map.mul_into(&mut product, &ra, &rb);
        assert_eq!(product, map.reduce(&q.mul(&a, &b).unwrap()).unwrap());
        let mut sum_of_products = map.reduce(&q.int(0)).unwrap();
        map.add_product(&mut sum_of_products, &ra, &rb);
        map.add_product(&mut sum_of_products, &rb, &rb);
        let exact = q
            .add(&q.mul(&a, &b).unwrap(), &q.mul(&b, &b).unwrap())
            .unwrap();
        assert_eq!(sum_of_products, map.reduce(&exact).unwrap());
        for i in 0..map.len() {
            let xs = [ra[i], rb[i], ra[i], rb[i], ra[i]];
            let ys = [rb[i], rb[i], ra[i], ra[i], rb[i]];
            let direct = xs.iter().zip(&ys).fold(0, |acc, (&x, &y)| {
                (acc + map.mul_at(i, x, y)) % map.ideals[i].mont.p
            });
            assert_eq!(map.dot_at(i, &xs, &ys), direct);
        }
    }

    /// The number of ideals follows the norm bound: y = p (a prime the map uses) vanishes at
    /// every ideal above p, and |σ(y)| = p, so the map for bound p must reach another prime.
    #[test]
    fn enough_ideals_to_separate_a_prime_from_zero() {
        let q = field(5);
        let first = q.residue_map(&BigUint::from(1u32), &BigInt::from(1), &[1]);
        let p = first.ideals[0].mont.p;
        let y = q.big_rational(&BigInt::from(p), &BigInt::from(1)).unwrap();
        let map = q.residue_map(&BigUint::from(p), &BigInt::from(1), &[1]);
        assert!(map.len() > q.degree());
        let residues = map.reduce(&y).unwrap();
        assert!(residues[..q.degree()].iter().all(|&r| r == 0));
        assert!(residues.iter().any(|&r| r != 0));
    }

    /// Primes dividing `avoid` are skipped, so denominators stay invertible.
    #[test]
    fn avoided_primes_are_not_used() {
        let q = field(5);
        let p = q
            .residue_map(&BigUint::from(1u32), &BigInt::from(1), &[1])
            .ideals[0]
            .mont
            .p;
        let map = q.residue_map(&BigUint::from(1u32), &BigInt::from(p), &[1]);
        assert!(map.ideals.iter().all(|ideal| ideal.mont.p != p));
        let x = q.big_rational(&BigInt::from(1), &BigInt::from(p)).unwrap();
        assert!(map.reduce(&x).is_ok());
    }

    /// Ideals are taken one per coset of the fixing group: in Q(ζ_8), √2 = ζ + ζ⁷ lies in the
    /// fixed field of {1, 7}, and the chosen roots r^k must give distinct values of √2.
    #[test]
    fn one_ideal_per_coset_of_the_fixing_group() {
        let q = field(8);
        let sqrt2 = q.parse("z + z^7").unwrap();
        assert_eq!(
            q.fixing_group(std::slice::from_ref(&sqrt2)).unwrap(),
            vec![1, 7]
        );
        let map = q.residue_map(&BigUint::from(u64::MAX), &BigInt::from(1), &[1, 7]);
        let residues = map.reduce(&sqrt2).unwrap();
        // consecutive ideals of one prime come from different cosets: √2 ↦ ±(its square root)
        assert_ne!(residues[0], residues[1]);
        assert_eq!(map.ideals[0].mont.p, map.ideals[1].mont.p);
    }

    /// Galois groups by hand (common practice): σ_k(ζ_12^3) = ζ_12^{3k}, so i = ζ_12^3 is fixed
    /// exactly by k ∈ {1, 5}; a rational is fixed by all of (Z/12)*.
    #[test]
    fn fixing_groups_of_small_elements() {
        let q = field(12);
        let i = q.zeta_pow(3);
        assert_eq!(
            q.fixing_group(std::slice::from_ref(&i)).unwrap(),
            vec![1, 5]
        );
        assert_eq!(q.fixing_group(&[q.int(7)]).unwrap(), vec![1, 5, 7, 11]);
        assert_eq!(q.fixing_group(&[i, q.zeta_pow(1)]).unwrap(), vec![1]);
    }

    /// ‖A‖₁/d bounds every embedding: for (1 + 2ζ − ζ⁵)/2 the bound is 4/2, ceiling 2.
    #[test]
    fn embedding_bound_is_the_scaled_l1_norm() {
        let q = field(16);
        let a = q.parse("(1 + 2*z - z^5)/2").unwrap();
        assert_eq!(
            a.embedding_bound(),
            (BigUint::from(4u32), BigUint::from(2u32))
        );
        let b = q.parse("(1 + 2*z)/3").unwrap();
        assert_eq!(
            b.embedding_bound_ceil(),
            (BigUint::from(1u32), BigUint::from(3u32))
        );
    }
}
