//! Fingerprints of lines modulo two primes: they pick hash buckets, never decide equality.
//!
//! For a prime p ≡ 1 (mod n) let r be the chosen primitive n-th root of unity mod p and
//! red: Z[ζ_n] → F_p the ring map ζ ↦ r. For a line with key S = D·w (see [`crate::key`]),
//! its fingerprint modulo p is
//!
//!   F_p = Σ_{i,t} h_{i,t} S_{i,t} / D  (mod p),  h_{i,t} = h_i r^t,
//!
//! i.e. Σ_i h_i red(w_i), when p ∤ D; when p | D it is the sentinel value p. This is a function
//! of the line alone. It can be computed from any integer representative U = c·S of the line
//! without the field inversion that normalising U costs: if p ∤ N(U_k) (the norm of the first
//! non-zero coordinate), then U_k is a unit at every prime above p, so p ∤ D and
//! red(S_i)·red(U_k) = D·red(U_i) gives F_p = Σ h_{i,t} U_{i,t} / red(U_k). The norm test is
//! exact: p | N(U_k) exactly when U_k(r^j) ≡ 0 for some unit j mod n, because p splits
//! completely in Q(ζ_n). When it fails, the caller normalises U and uses the key.
//!
//! Two primes give a 62-bit fingerprint; the weights h_i come from a fixed-seed generator, so
//! fingerprints are reproducible.

use cyclorb_field::numtheory::pow_mod;
use cyclorb_field::{CyclotomicField, PrimeReduction};
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::ToPrimitive;

use crate::key::KeyNumbers;

/// One prime's tables.
#[derive(Debug, Clone)]
struct PrimeTables {
    p: u64,
    /// h_{i,t} for all d·φ numerators.
    weights: Vec<u64>,
    /// r^{j·t mod n} for every unit j mod n (rows) and t < φ (columns); row 0 is j = 1.
    evaluations: Vec<u64>,
}

/// Fingerprints of lines of Q(ζ_n)^d.
#[derive(Debug, Clone)]
pub(crate) struct Fingerprinter {
    phi: usize,
    primes: [PrimeTables; 2],
}

fn splitmix(state: &mut u64) -> u64 {
    *state = state.wrapping_add(0x9E37_79B9_7F4A_7C15);
    let mut z = *state;
    z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
    z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
    z ^ (z >> 31)
}

impl PrimeTables {
    fn new(field: &CyclotomicField, dim: usize, index: usize) -> Result<PrimeTables, String> {
        let reduction = PrimeReduction::nth(field, index).map_err(|e| e.to_string())?;
        let (p, r) = (reduction.prime(), reduction.root());
        let n = field.conductor() as u64;
        let phi = field.degree();
        let powers: Vec<u64> = (0..phi as u64).map(|t| pow_mod(r, t, p)).collect();
        let mut state = 0x6379_636C_6F72_6221 ^ (index as u64).wrapping_mul(0x1234_5678_9ABC);
        let mut weights = Vec::with_capacity(dim * phi);
        for _ in 0..dim {
            let h = splitmix(&mut state) % p;
            weights.extend(
                powers
                    .iter()
                    .map(|&x| (h as u128 * x as u128 % p as u128) as u64),
            );
        }
        let units = (1..n.max(2)).filter(|j| j.gcd(&n) == 1);
        let mut evaluations = Vec::new();
        for j in units {
            let rj = pow_mod(r, j, p);
            evaluations.extend((0..phi as u64).map(|t| pow_mod(rj, t, p)));
        }
        Ok(PrimeTables {
            p,
            weights,
            evaluations,
        })
    }

    /// Σ weights·u mod p, for machine-word numerators.
    fn weighted_sum(&self, u: &[i64]) -> u64 {
        let mut acc = 0i128;
        for (&w, &x) in self.weights.iter().zip(u) {
            acc += w as i128 * x as i128;
        }
        acc.rem_euclid(self.p as i128) as u64
    }

    /// red(a) at every prime above p; `None` when one of them is 0 (p | N(a)), else red(a)
    /// at the chosen prime (j = 1).
    fn unit_reduction(&self, a: &[i64], phi: usize) -> Option<u64> {
        let mut first = None;
        for row in self.evaluations.chunks(phi) {
            let mut acc = 0i128;
            for (&e, &x) in row.iter().zip(a) {
                acc += e as i128 * x as i128;
            }
            let v = acc.rem_euclid(self.p as i128) as u64;
            if v == 0 {
                return None;
            }
            first.get_or_insert(v);
        }
        first
    }

    fn of_representative(&self, u: &[i64], k: usize, phi: usize) -> Option<u64> {
        let a = self.unit_reduction(&u[k * phi..(k + 1) * phi], phi)?;
        let s = self.weighted_sum(u);
        Some((s as u128 * pow_mod(a, self.p - 2, self.p) as u128 % self.p as u128) as u64)
    }

    fn of_key(&self, key: &KeyNumbers, k: usize, phi: usize) -> u64 {
        let p = self.p;
        let (s, d) = match key {
            KeyNumbers::Small(v) => (self.weighted_sum(v), v[k * phi].rem_euclid(p as i64) as u64),
            KeyNumbers::Big(v) => {
                let m = BigInt::from(p);
                let red = |x: &BigInt| x.mod_floor(&m).to_u64().expect("reduced below p");
                let mut s = 0u128;
                for (&w, x) in self.weights.iter().zip(v) {
                    s = (s + w as u128 * red(x) as u128) % p as u128;
                }
                (s as u64, red(&v[k * phi]))
            }
        };
        if d == 0 {
            return p;
        }
        (s as u128 * pow_mod(d, p - 2, p) as u128 % p as u128) as u64
    }
}

impl Fingerprinter {
    /// Tables for Q(ζ_n)^dim, with the first two primes p ≡ 1 (mod n) above 2^30.
    pub(crate) fn new(field: &CyclotomicField, dim: usize) -> Result<Fingerprinter, String> {
        Ok(Fingerprinter {
            phi: field.degree(),
            primes: [
                PrimeTables::new(field, dim, 0)?,
                PrimeTables::new(field, dim, 1)?,
            ],
        })
    }

    /// The fingerprint of the line through the integer vector u (first non-zero block k),
    /// or `None` when the norm test fails at one of the primes (then use [`Self::of_key`]).
    pub(crate) fn of_representative(&self, u: &[i64], k: usize) -> Option<u64> {
        let a = self.primes[0].of_representative(u, k, self.phi)?;
        let b = self.primes[1].of_representative(u, k, self.phi)?;
        Some(a | (b << 32))
    }

    /// The fingerprint of a line from its key (first non-zero block k).
    pub(crate) fn of_key(&self, key: &KeyNumbers, k: usize) -> u64 {
        let a = self.primes[0].of_key(key, k, self.phi);
        let b = self.primes[1].of_key(key, k, self.phi);
        a | (b << 32)
    }
}

/// The hash-table hash of a fingerprint (spreads the bits hashbrown reads).
pub(crate) fn bucket_hash(fingerprint: u64) -> u64 {
    let x = fingerprint.wrapping_mul(0x9E37_79B9_7F4A_7C15);
    x ^ (x >> 29)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::key::{key_of_integer_vector, KeyNumbers};
    use crate::poly::PolyKernel;
    use cyclorb_field::Cyc;

    #[test]
    fn representative_and_key_agree() {
        for n in [8u32, 12, 16] {
            let f = CyclotomicField::new(n).unwrap();
            let kernel = PolyKernel::new(&f);
            let fp = Fingerprinter::new(&f, 3).unwrap();
            let v: Vec<Cyc> = ["0", "3 + z", "1 - 2*z^2"]
                .iter()
                .map(|t| f.parse(t).unwrap())
                .collect();
            let u: Vec<i64> = v
                .iter()
                .flat_map(|x| x.small_parts().unwrap().0.to_vec())
                .collect();
            let key = key_of_integer_vector(&f, &kernel, &u, 1).unwrap();
            assert_eq!(key, KeyNumbers::of_line(&f, &v).unwrap().unwrap());
            let from_rep = fp.of_representative(&u, 1).unwrap();
            assert_eq!(from_rep, fp.of_key(&key, 1), "n={n}");
            let other: Vec<i64> = ["0", "3 + z", "1 + 2*z^2"]
                .iter()
                .flat_map(|t| f.parse(t).unwrap().small_parts().unwrap().0.to_vec())
                .collect();
            assert_ne!(fp.of_representative(&other, 1).unwrap(), from_rep);
        }
    }
}
