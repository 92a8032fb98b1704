//! Small integer number theory used to build field contexts: gcd, Euler φ,
//! Möbius μ, factorisation by trial division, cyclotomic polynomials.

/// Greatest common divisor of two non-negative 128-bit integers.
pub fn gcd_u128(mut a: u128, mut b: u128) -> u128 {
    while b != 0 {
        let t = a % b;
        a = b;
        b = t;
    }
    a
}

/// Greatest common divisor of two signed integers, always non-negative.
pub fn gcd_i64(a: i64, b: i64) -> i64 {
    gcd_u128(a.unsigned_abs() as u128, b.unsigned_abs() as u128) as i64
}

/// Prime factorisation by trial division: (prime, exponent) pairs in increasing order.
pub fn factorize(mut m: u64) -> Vec<(u64, u32)> {
    let mut out = Vec::new();
    let mut p = 2u64;
    while p * p <= m {
        if m % p == 0 {
            let mut e = 0;
            while m % p == 0 {
                m /= p;
                e += 1;
            }
            out.push((p, e));
        }
        p += if p == 2 { 1 } else { 2 };
    }
    if m > 1 {
        out.push((m, 1));
    }
    out
}

/// Euler's totient φ(m).
pub fn euler_phi(m: u64) -> u64 {
    factorize(m)
        .iter()
        .fold(m, |acc, &(p, _)| acc / p * (p - 1))
}

/// Möbius function μ(m).
pub fn moebius(m: u64) -> i64 {
    let f = factorize(m);
    if f.iter().any(|&(_, e)| e > 1) {
        0
    } else if f.len() % 2 == 0 {
        1
    } else {
        -1
    }
}

/// Modular exponentiation b^e mod p for p < 2^63.
pub fn pow_mod(b: u64, mut e: u64, p: u64) -> u64 {
    let mut r = 1u128;
    let m = p as u128;
    let mut x = (b % p) as u128;
    while e > 0 {
        if e & 1 == 1 {
            r = r * x % m;
        }
        x = x * x % m;
        e >>= 1;
    }
    r as u64
}

/// Deterministic primality test for 64-bit integers (Miller–Rabin with the first 12 primes as bases).
pub fn is_prime(p: u64) -> bool {
    if p < 2 {
        return false;
    }
    for q in [2u64, 3, 5, 7, 11, 13, 17, 19, 23, 29, 31, 37] {
        if p % q == 0 {
            return p == q;
        }
    }
    let mut d = p - 1;
    let mut s = 0;
    while d % 2 == 0 {
        d /= 2;
        s += 1;
    }
    'outer: for a in [2u64, 3, 5, 7, 11, 13, 17, 19, 23, 29, 31, 37] {
        let mut x = pow_mod(a, d, p);
        if x == 1 || x == p - 1 {
            continue;
        }
        for _ in 1..s {
            x = ((x as u128 * x as u128) % p as u128) as u64;
            if x == p - 1 {
                continue 'outer;
            }
        }
        return false;
    }
    true
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn phi_and_mu() {
        assert_eq!(euler_phi(60), 16);
        assert_eq!(euler_phi(105), 48);
        assert_eq!(moebius(30), -1);
        assert_eq!(moebius(12), 0);
        assert!(is_prime(1_000_000_007));
        assert!(!is_prime(1_000_000_007 * 3));
    }
}
