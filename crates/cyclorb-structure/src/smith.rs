//! Invariant factors of L/mZ^d from a basis of L, by diagonalising over Z/m.
//!
//! Row and column operations (swap, add an integer multiple) are unimodular over Z, and
//! entries may be reduced modulo m because mZ^d ⊆ L: so a basis matrix B of L can be
//! brought to a diagonal diag(δ_i) with entries taken modulo m, each step Euclid's
//! (the smallest non-zero entry of the remaining block divides the others, or leaves a
//! smaller remainder). Then L = U·diag(s_i)·Z^d with s_i = gcd(δ_i, m), and
//! L/mZ^d ≅ ⊕ s_i Z/mZ ≅ ⊕ Z/(m/s_i). The cyclic orders are finally combined into
//! invariant factors (each dividing the next) through their prime-power parts.

use cyclorb_field::numtheory::factorize;

/// The invariant factors (> 1, each dividing the next) of L/mZ^d, L spanned by the rows
/// of the square matrix `b` (with mZ^d ⊆ L).
pub(crate) fn invariant_factors(mut b: Vec<Vec<i64>>, m: u64) -> Vec<u64> {
    let mi = m as i64;
    let d = b.len();
    for row in b.iter_mut() {
        for x in row.iter_mut() {
            *x = x.rem_euclid(mi);
        }
    }
    let mut cyclic = Vec::new();
    for t in 0..d {
        loop {
            // the smallest non-zero entry of the block rows, columns ≥ t
            let pivot = (t..d)
                .flat_map(|i| (t..d).map(move |j| (i, j)))
                .filter(|&(i, j)| b[i][j] != 0)
                .min_by_key(|&(i, j)| b[i][j]);
            let Some((pi, pj)) = pivot else {
                break;
            };
            b.swap(t, pi);
            for row in b.iter_mut() {
                row.swap(t, pj);
            }
            let p = b[t][t];
            let mut clean = true;
            for i in t + 1..d {
                let q = b[i][t] / p;
                if q != 0 {
                    let (top, bottom) = b.split_at_mut(i);
                    for (x, &y) in bottom[0][t..].iter_mut().zip(&top[t][t..]) {
                        *x = (*x - q * y).rem_euclid(mi);
                    }
                }
                clean &= b[i][t] == 0;
            }
            for j in t + 1..d {
                let q = b[t][j] / p;
                if q != 0 {
                    for row in b.iter_mut().skip(t) {
                        row[j] = (row[j] - q * row[t]).rem_euclid(mi);
                    }
                }
                clean &= b[t][j] == 0;
            }
            if clean {
                break;
            }
        }
        let s = num_integer::gcd(b[t][t].rem_euclid(mi) as u64, m);
        let s = if s == 0 { m } else { s };
        cyclic.push(m / s);
    }
    combine(cyclic)
}

/// Invariant factors of ⊕ Z/c_k: split every c_k into prime powers, sort each prime's
/// powers decreasingly, and multiply the i-th largest powers of all primes together.
pub(crate) fn combine(cyclic: Vec<u64>) -> Vec<u64> {
    let mut by_prime: Vec<(u64, Vec<u64>)> = Vec::new();
    for c in cyclic.into_iter().filter(|&c| c > 1) {
        for (p, e) in factorize(c) {
            let power = p.pow(e);
            match by_prime.iter_mut().find(|(q, _)| *q == p) {
                Some((_, list)) => list.push(power),
                None => by_prime.push((p, vec![power])),
            }
        }
    }
    let mut factors: Vec<u64> = Vec::new();
    for (_, mut powers) in by_prime {
        powers.sort_unstable_by(|a, b| b.cmp(a));
        for (i, q) in powers.into_iter().enumerate() {
            if factors.len() <= i {
                factors.push(1);
            }
            factors[i] *= q;
        }
    }
    factors.sort_unstable();
    factors
}
