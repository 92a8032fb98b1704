//! Fingerprints of lines modulo a prime: they pick hash buckets, never decide equality.
//!
//! Let p ≡ 1 (mod n) be a prime below 2^31, r a primitive n-th root of unity mod p, and 𝔭 the
//! prime of Z[ζ_n] above p with ζ ≡ r (mod 𝔭); red: Z[ζ_n]_𝔭 → F_p is reduction mod 𝔭. For a
//! line with key w (w_k = 1, see [`crate::key`]) the fingerprint is
//!
//!   F = Σ_i h_i red(w_i)  when every w_i is 𝔭-integral,  and the sentinel p otherwise,
//!
//! with fixed pseudo-random weights h_i. This is a function of the line alone, computed in
//! one of two ways that agree:
//! - from any integer representative U = c·w of the line whose first non-zero coordinate
//!   has red(U_k) ≠ 0: then w_i = U_i/U_k is 𝔭-integral and F = Σ_{i,t} h_i r^t U_{i,t} / red(U_k)
//!   (no field inversion: this is the hot path);
//! - from the key S = D·w: if p ∤ D, F = Σ h_i r^t S_{i,t} / D; if p | D (rare: p is large and
//!   denominators are products of small primes), w_i is 𝔭-integral exactly when
//!   S_i(ζ̂) ≡ 0 (mod p^e), e = v_p(D), where ζ̂ ∈ Z_p is the p-adic n-th root of unity
//!   lifting r (Hensel); then red(w_i) = (S_i(ζ̂)/p^e)·(D/p^e)⁻¹ mod p.
//!
//! A second value F′ = Σ_i g_i red(w_i) with independent weights g_i shares the one
//! inversion of red(U_k) (or of D); the pair (F, F′), 62 bits, is the wide fingerprint the
//! compact store keeps. Two lines whose reductions mod 𝔭 differ share it with probability
//! about p⁻² over the weights; a shared value costs a recomputation of the stored line, never
//! a wrong answer: equality is still decided exactly.

use cyclorb_field::{CyclotomicField, PrimeReduction};
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{One, Signed, ToPrimitive, Zero};

use crate::key::KeyNumbers;
use crate::sparse_numerators::SparseNumerators;

/// Fingerprints of lines of Q(ζ_n)^d.
#[derive(Debug, Clone)]
pub(crate) struct Fingerprinter {
    phi: usize,
    n: u64,
    p: u64,
    root: u64,
    /// (h_i r^t, g_i r^t) mod p for all d·φ numerators.
    weights: Vec<[u64; 2]>,
    /// (h_i, g_i) mod p.
    block_weights: Vec<[u64; 2]>,
    /// r^t mod p for t < φ.
    powers: Vec<u64>,
}

fn splitmix(state: &mut u64) -> u64 {
    *state = state.wrapping_add(0x9E37_79B9_7F4A_7C15);
    let mut z = *state;
    z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
    z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
    z ^ (z >> 31)
}

/// a⁻¹ mod p for 0 < a < p < 2^31 (extended Euclid).
fn inverse_mod(a: u64, p: u64) -> u64 {
    let (mut r0, mut r1) = (p as i64, a as i64);
    let (mut s0, mut s1) = (0i64, 1i64);
    while r1 != 0 {
        let q = r0 / r1;
        (r0, r1) = (r1, r0 - q * r1);
        (s0, s1) = (s1, s0 - q * s1);
    }
    s0.rem_euclid(p as i64) as u64
}

impl Fingerprinter {
    /// Tables for Q(ζ_n)^dim with the first prime p ≡ 1 (mod n) above 2^30.
    pub(crate) fn new(field: &CyclotomicField, dim: usize) -> Result<Fingerprinter, String> {
        let reduction = PrimeReduction::nth(field, 0).map_err(|e| e.to_string())?;
        let (p, root) = (reduction.prime(), reduction.root());
        let phi = field.degree();
        let mut powers = Vec::with_capacity(phi);
        let mut x = 1u64;
        for _ in 0..phi {
            powers.push(x);
            x = x * root % p;
        }
        let mut state = 0x6379_636C_6F72_6221u64;
        let mut draw = |_| splitmix(&mut state) % p;
        let first: Vec<u64> = (0..dim).map(&mut draw).collect();
        let second: Vec<u64> = (0..dim).map(&mut draw).collect();
        // both forms' weights of numerator (i, t), side by side
        let weights = first
            .iter()
            .zip(&second)
            .flat_map(|(&h, &g)| powers.iter().map(move |&r| [h * r % p, g * r % p]))
            .collect();
        Ok(Fingerprinter {
            phi,
            n: field.conductor() as u64,
            p,
            root,
            weights,
            block_weights: first.into_iter().zip(second).map(|(h, g)| [h, g]).collect(),
            powers,
        })
    }

    /// The two values (F, F') as one number: F in the low 32 bits, F' above it when `wide`.
    fn join(&self, s: [u64; 2], inverse: u64, wide: bool) -> u64 {
        let p = self.p;
        let low = s[0] * inverse % p;
        if wide {
            low | (s[1] * inverse % p) << 32
        } else {
            low
        }
    }

    /// The fingerprint of the line through `u` (first non-zero block k), or `None` when
    /// red(u_k) = 0 (then use [`Self::of_key`]); the second form only when `wide`.
    pub(crate) fn of_representative(
        &self,
        u: &SparseNumerators,
        k: usize,
        wide: bool,
    ) -> Option<u64> {
        let p = self.p as i128;
        let lead = &u.dense[k * self.phi..(k + 1) * self.phi];
        let mut a = 0i128;
        for (&r, &x) in self.powers.iter().zip(lead) {
            a += r as i128 * x as i128;
        }
        let a = a.rem_euclid(p) as u64;
        if a == 0 {
            return None;
        }
        let (mut s, mut t) = (0i128, 0i128);
        if wide {
            for &i in &u.nonzero {
                let [h, g] = self.weights[i as usize];
                let x = u.dense[i as usize] as i128;
                s += h as i128 * x;
                t += g as i128 * x;
            }
        } else {
            for &i in &u.nonzero {
                s += self.weights[i as usize][0] as i128 * u.dense[i as usize] as i128;
            }
        }
        let sums = [s.rem_euclid(p) as u64, t.rem_euclid(p) as u64];
        Some(self.join(sums, inverse_mod(a, self.p), wide))
    }

    /// The fingerprint of a line from its key (first non-zero block k).
    pub(crate) fn of_key(&self, key: &KeyNumbers, k: usize, wide: bool) -> u64 {
        let p = self.p;
        match key {
            KeyNumbers::Small(v) if v[k * self.phi] % p as i64 != 0 => {
                let (mut s, mut t) = (0i128, 0i128);
                for (&[h, g], &x) in self.weights.iter().zip(v) {
                    s += h as i128 * x as i128;
                    t += g as i128 * x as i128;
                }
                let sums = [
                    s.rem_euclid(p as i128) as u64,
                    t.rem_euclid(p as i128) as u64,
                ];
                let d = v[k * self.phi].rem_euclid(p as i64) as u64;
                self.join(sums, inverse_mod(d, p), wide)
            }
            _ => {
                // already normalised; the sentinel p (not 𝔭-integral) is kept as it is
                let [f, g] = self.of_big_key(&key.to_big(), k);
                if wide {
                    f | g << 32
                } else {
                    f
                }
            }
        }
    }

    /// The general formula, with the p-adic route when p divides the denominator: both
    /// forms, already normalised.
    fn of_big_key(&self, v: &[BigInt], k: usize) -> [u64; 2] {
        let p = BigInt::from(self.p);
        let mut rest = v[k * self.phi].clone();
        let mut e = 0u32;
        while (&rest % &p).is_zero() {
            rest /= &p;
            e += 1;
        }
        let modulus = p.pow(e + 1);
        let lift = self.teichmuller_lift(&modulus);
        let scale = p.pow(e);
        let rest_inverse = inverse_mod(rest.mod_floor(&p).to_u64().unwrap_or(0), self.p);
        let mut f = [0u128; 2];
        for (block, weights) in v.chunks(self.phi).zip(&self.block_weights) {
            // S_i(ζ̂) mod p^{e+1}
            let mut value = BigInt::zero();
            let mut power = BigInt::one();
            for c in block {
                value = (value + c * &power).mod_floor(&modulus);
                power = (power * &lift).mod_floor(&modulus);
            }
            if !(&value % &scale).is_zero() {
                return [self.p; 2];
            }
            let reduced = (value / &scale).mod_floor(&p).to_u64().unwrap_or(0);
            let wi = reduced as u128 * rest_inverse as u128 % self.p as u128;
            for (acc, &h) in f.iter_mut().zip(weights) {
                *acc = (*acc + h as u128 * wi) % self.p as u128;
            }
        }
        f.map(|x| x as u64)
    }

    /// The n-th root of unity of Z_p congruent to r, modulo `modulus` (a power of p), by
    /// Newton's iteration on x^n − 1 (a simple root mod p, as p ∤ n).
    fn teichmuller_lift(&self, modulus: &BigInt) -> BigInt {
        let n = BigInt::from(self.n);
        let mut x = BigInt::from(self.root);
        let mut precision = 1u32;
        let mut power = BigInt::from(self.p);
        while &power < modulus {
            let f: BigInt = x.modpow(&n, modulus) - 1;
            let df: BigInt = (&n * x.modpow(&(&n - 1), modulus)).mod_floor(modulus);
            let inv: BigInt = df.extended_gcd(modulus).x.mod_floor(modulus);
            let step: BigInt = f * inv;
            x = (&x - step).mod_floor(modulus);
            precision *= 2;
            power = BigInt::from(self.p).pow(precision);
        }
        if x.is_negative() {
            x += modulus;
        }
        x
    }
}

/// The hash-table hash of a fingerprint (spreads the bits hashbrown reads).
pub(crate) fn bucket_hash(fingerprint: u64) -> u64 {
    let x = (fingerprint | 1 << 40).wrapping_mul(0x9E37_79B9_7F4A_7C15);
    x ^ (x >> 29)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::key::{key_of_integer_vector, KeyNumbers, Normaliser};
    use cyclorb_field::Cyc;
    use cyclorb_field::PolyKernel;

    fn numerators(f: &CyclotomicField, texts: &[&str]) -> SparseNumerators {
        let dense: Vec<i64> = texts
            .iter()
            .flat_map(|t| f.parse(t).unwrap().small_parts().unwrap().0.to_vec())
            .collect();
        let mut u = SparseNumerators::new(dense.len());
        u.set_dense(&dense);
        u
    }

    #[test]
    fn representative_and_key_agree() {
        for n in [8u32, 12, 16] {
            let f = CyclotomicField::new(n).unwrap();
            let kernel = PolyKernel::new(&f);
            let fp = Fingerprinter::new(&f, 3).unwrap();
            let texts = ["0", "3 + z", "1 - 2*z^2"];
            let v: Vec<Cyc> = texts.iter().map(|t| f.parse(t).unwrap()).collect();
            let u = numerators(&f, &texts);
            let key =
                key_of_integer_vector(&f, &kernel, &mut Normaliser::default(), &u, 1).unwrap();
            assert_eq!(key, KeyNumbers::of_line(&f, &v).unwrap().unwrap());
            let from_rep = fp.of_representative(&u, 1, true).unwrap();
            assert_eq!(from_rep, fp.of_key(&key, 1, true), "n={n}");
            let narrow = fp.of_representative(&u, 1, false).unwrap();
            assert_eq!(narrow, from_rep & 0xFFFF_FFFF);
            assert_eq!(narrow, fp.of_key(&key, 1, false));
            // the p-adic route gives the same values as the plain one when p ∤ D
            let [a, b] = fp.of_big_key(&key.to_big(), 1);
            assert_eq!(a | b << 32, from_rep, "n={n}");
            let other = numerators(&f, &["0", "3 + z", "1 + 2*z^2"]);
            assert_ne!(fp.of_representative(&other, 1, true).unwrap(), from_rep);
        }
    }

    #[test]
    fn denominators_divisible_by_p_use_the_p_adic_route() {
        // Q(ζ_4), p ≡ 1 (mod 4), r² ≡ −1. The line w = (1, (ζ − r)/p) is integral at 𝔭 (where
        // ζ ≡ r) but not at the other prime above p, so its key S = (p, ζ − r) has D = p.
        // Another representative: U = c·w with c = ζ − r³ = ζ + r − p (a 𝔭-unit), using
        // (ζ − r)(ζ − r³) = ζ² − pζ + rp − r² = p(−ζ + r − (r² + 1)/p) since ζ² = −1. The two
        // routes must give the same fingerprint.
        let f = CyclotomicField::new(4).unwrap();
        let fp = Fingerprinter::new(&f, 2).unwrap();
        let (p, r) = (fp.p as i64, fp.root as i64);
        assert_eq!((r * r + 1) % p, 0);
        let key = KeyNumbers::Small(vec![p, 0, -r, 1]);
        let w = vec![f.one(), f.parse(&format!("(z - {r})/{p}")).unwrap()];
        assert_eq!(KeyNumbers::of_line(&f, &w).unwrap().unwrap(), key);
        let mut u = SparseNumerators::new(4);
        u.set_dense(&[r - p, 1, r - (r * r + 1) / p, -1]);
        let c = f.parse(&format!("z + {r} - {p}")).unwrap();
        let cw: Vec<Cyc> = w.iter().map(|x| f.mul(&c, x).unwrap()).collect();
        let expect: Vec<i64> = cw
            .iter()
            .flat_map(|x| x.small_parts().unwrap().0.to_vec())
            .collect();
        assert_eq!(u.dense, expect);
        let via_representative = fp.of_representative(&u, 0, true).unwrap();
        assert_eq!(fp.of_key(&key, 0, true), via_representative);
        // a key that is not 𝔭-integral gets the sentinel: w = (1, 1/p)
        let key = KeyNumbers::Small(vec![p, 0, 1, 0]);
        assert_eq!(fp.of_key(&key, 0, false), fp.p);
    }
}
