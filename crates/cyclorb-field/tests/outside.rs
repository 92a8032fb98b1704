//! Checks against values from outside this project, the source named beside each.

mod random_and_reference;

use cyclorb_field::int_poly::cyclotomic;
use cyclorb_field::{Cyc, CyclotomicField};
use num_bigint::BigInt;

fn field(n: u32) -> CyclotomicField {
    CyclotomicField::new(n).expect("supported conductor")
}

/// Prime factors of m by trial division (independent of the crate's `numtheory`).
fn prime_factors(mut m: u64) -> Vec<(u64, u32)> {
    let mut out = Vec::new();
    let mut p = 2;
    while p * p <= m {
        let mut e = 0;
        while m % p == 0 {
            m /= p;
            e += 1;
        }
        if e > 0 {
            out.push((p, e));
        }
        p += 1;
    }
    if m > 1 {
        out.push((m, 1));
    }
    out
}

fn phi(m: u64) -> i64 {
    prime_factors(m)
        .iter()
        .map(|&(p, e)| ((p - 1) * p.pow(e - 1)) as i64)
        .product()
}

fn mu(m: u64) -> i64 {
    let f = prime_factors(m);
    if f.iter().any(|&(_, e)| e > 1) {
        0
    } else if f.len() % 2 == 0 {
        1
    } else {
        -1
    }
}

fn gcd(a: u64, b: u64) -> u64 {
    if b == 0 {
        a
    } else {
        gcd(b, a % b)
    }
}

fn is_prime(p: u64) -> bool {
    p >= 2 && prime_factors(p) == vec![(p, 1)]
}

fn height(poly: &[BigInt]) -> u64 {
    poly.iter()
        .map(|c| c.magnitude().to_u64_digits().first().copied().unwrap_or(0))
        .max()
        .unwrap_or(0)
}

/// Φ_105 has −2 at x^7 (and, being palindromic, at x^41); 105 is the smallest n whose Φ_n
/// has a coefficient outside {−1, 0, 1}, 385 the smallest with one of absolute value 3 and
/// 1365 with 4. Source: OEIS A013594 (a(2) = 105, a(3) = 385, a(4) = 1365; from memory,
/// confirmed with python-flint 0.9 fmpz_poly.cyclotomic).
#[test]
fn cyclotomic_polynomial_heights() {
    let phi105 = cyclotomic(105);
    assert_eq!(phi105.len(), 49);
    assert_eq!(phi105[7], BigInt::from(-2));
    assert_eq!(phi105[41], BigInt::from(-2));
    let context: Vec<BigInt> = field(105)
        .cyclotomic_polynomial()
        .iter()
        .map(|&c| BigInt::from(c))
        .collect();
    assert_eq!(context, phi105);
    let mut first = [0u64; 5];
    for n in 1..=1365u64 {
        let h = height(&cyclotomic(n)) as usize;
        for slot in first.iter_mut().take(h.min(4) + 1).skip(2) {
            if *slot == 0 {
                *slot = n;
            }
        }
    }
    assert_eq!(first[2..], [105, 385, 1365]);
}

/// The crate's Φ_n (Möbius product) equals the textbook recursion x^n − 1 = Π_{d|n} Φ_d
/// computed independently on big integers in the test helpers (Lang, Algebra, ch. VI §3;
/// common practice), for every n ≤ 150.
#[test]
fn cyclotomic_polynomials_agree_with_the_recursion() {
    for n in 1..=150u32 {
        let expected: Vec<BigInt> = random_and_reference::reference_cyclotomic(n);
        let got: Vec<BigInt> = cyclotomic(n as u64);
        assert_eq!(got, expected, "Φ_{n}");
    }
}

/// The quadratic Gauss sum g = Σ_{k=0}^{p−1} ζ_p^{k²} satisfies g² = (−1)^{(p−1)/2}·p for every
/// odd prime p (Gauss; Ireland & Rosen, A Classical Introduction to Modern Number Theory,
/// ch. 6), checked for all odd primes p < 100.
#[test]
fn quadratic_gauss_sums() {
    let primes: Vec<u64> = (3..100).filter(|&p| is_prime(p)).collect();
    assert_eq!(primes.len(), 24);
    for p in primes {
        let f = field(p as u32);
        let g = f
            .sum(
                &(0..p)
                    .map(|k| f.zeta_pow((k * k) as i64))
                    .collect::<Vec<_>>(),
            )
            .unwrap();
        let sign = if p % 4 == 1 { 1 } else { -1 };
        assert_eq!(f.mul(&g, &g).unwrap(), f.int(sign * p as i64), "p = {p}");
    }
}

/// N(1 − ζ_n) = p when n = p^k is a prime power and 1 when n has two distinct prime factors
/// (Washington, Introduction to Cyclotomic Fields, ch. 2: Φ_n(1)), and the norm of a rational
/// r is r^φ(n).
#[test]
fn norms_of_one_minus_zeta() {
    let prime_powers = [
        2u32, 3, 4, 5, 7, 8, 9, 11, 13, 16, 17, 19, 23, 25, 27, 29, 31, 32, 37, 49, 64, 81,
    ];
    let composite = [6u32, 10, 12, 14, 15, 20, 21, 30, 36, 60, 105];
    for n in prime_powers.into_iter().chain(composite) {
        let f = field(n);
        let x = f.sub(&f.one(), &f.zeta_pow(1)).unwrap();
        let factors = prime_factors(n as u64);
        let expected = if factors.len() == 1 {
            factors[0].0 as i64
        } else {
            1
        };
        let (num, den) = f.norm(&x).unwrap();
        assert_eq!(
            (num, den),
            (BigInt::from(expected), BigInt::from(1)),
            "n = {n}"
        );
        let (num, den) = f.norm(&f.rational(-2, 3).unwrap()).unwrap();
        let e = phi(n as u64) as u32;
        assert_eq!(num, BigInt::from(-2).pow(e), "n = {n}");
        assert_eq!(den, BigInt::from(3).pow(e), "n = {n}");
    }
}

/// Ramanujan sums c_n(j) = Σ_{gcd(k,n)=1} ζ_n^{kj} = μ(n/d)·φ(n)/φ(n/d), d = gcd(n, j)
/// (Ramanujan 1918; Hardy & Wright, An Introduction to the Theory of Numbers, Thm 272, from
/// memory). Checked as the sum itself and as the trace of ζ_n^j down to Q.
#[test]
fn ramanujan_sums() {
    for n in [1u32, 2, 5, 8, 12, 16, 20, 30, 36, 48, 60, 105] {
        let f = field(n);
        let units: Vec<i64> = (1..=n as i64)
            .filter(|&k| gcd(k as u64, n as u64) == 1)
            .collect();
        for j in 0..2 * n as i64 {
            let d = gcd(n as u64, j as u64);
            let expected = mu(n as u64 / d) * phi(n as u64) / phi(n as u64 / d);
            let terms: Vec<Cyc> = units.iter().map(|&k| f.zeta_pow(k * j)).collect();
            assert_eq!(f.sum(&terms).unwrap(), f.int(expected), "n = {n}, j = {j}");
            let (num, den) = f.trace(&f.zeta_pow(j)).unwrap();
            assert_eq!((num, den), (BigInt::from(expected), BigInt::from(1)));
        }
    }
}

/// The conductor of Q(√m) for squarefree m: |m| if m ≡ 1 (mod 4), else 4|m| (the absolute
/// discriminant; Washington, ch. 2, from memory). Q(√m) ⊂ Q(ζ_n) exactly when it divides n.
fn quadratic_conductor(m: i64) -> u64 {
    if m == 1 {
        1
    } else if m.rem_euclid(4) == 1 {
        m.unsigned_abs()
    } else {
        4 * m.unsigned_abs()
    }
}

/// The principal square root of a squarefree m built independently: √2 = ζ_8 + ζ_8⁻¹
/// (= 2 cos π/4), i = ζ_4, and for an odd prime p the Gauss sum g_p = Σ_k ζ_p^{k²}, which is
/// the principal √p* (p* = (−1)^{(p−1)/2}·p): +√p for p ≡ 1 (mod 4) and +i√p for p ≡ 3
/// (mod 4) (Gauss's sign theorem; Ireland & Rosen, ch. 6). With t primes p ≡ 3 (mod 4) in m
/// and u = m/Π p* ∈ {±1, ±2}: √m = i^{[m<0] − t}·√|u|·Π √p and i^{−t}·Π √p·i^t = Π g_p, so
/// √m = (−1)^{([m<0] − t − [u<0])/2}·√u·Π g_p, using i only when u < 0.
fn principal_root(f: &CyclotomicField, m: i64) -> Cyc {
    let n = f.conductor() as i64;
    let mut root = f.one();
    let mut p_star_product = 1i64;
    let mut t = 0i64;
    for (p, _) in prime_factors(m.unsigned_abs()) {
        if p == 2 {
            continue;
        }
        let step = n / p as i64;
        let terms: Vec<Cyc> = (0..p as i64).map(|k| f.zeta_pow(step * k * k)).collect();
        root = f.mul(&root, &f.sum(&terms).unwrap()).unwrap();
        if p % 4 == 3 {
            t += 1;
            p_star_product *= -(p as i64);
        } else {
            p_star_product *= p as i64;
        }
    }
    let u = m / p_star_product;
    let sqrt2 = || f.add(&f.zeta_pow(n / 8), &f.zeta_pow(-n / 8)).unwrap();
    let sqrt_u = match u {
        1 => f.one(),
        2 => sqrt2(),
        -1 => f.zeta_pow(n / 4),
        -2 => f.mul(&f.zeta_pow(n / 4), &sqrt2()).unwrap(),
        _ => unreachable!("u = m / Π p* is ±1 or ±2 for squarefree m"),
    };
    let exponent = i64::from(m < 0) - t - i64::from(u < 0);
    assert_eq!(exponent % 2, 0);
    root = f.mul(&root, &sqrt_u).unwrap();
    if exponent.rem_euclid(4) == 2 {
        f.neg(&root)
    } else {
        root
    }
}

/// √m for squarefree |m| ≤ 35 and √(m·k²/l²): present exactly when the conductor of Q(√m)
/// divides n, squares back to m, and is the principal root (non-negative real part, positive
/// imaginary part for m < 0) built independently from Gauss sums.
#[test]
fn square_roots_of_rationals() {
    let squarefree: Vec<i64> = (-35i64..=35)
        .filter(|&m| m != 0 && prime_factors(m.unsigned_abs()).iter().all(|&(_, e)| e == 1))
        .collect();
    for n in [
        1u32, 3, 4, 5, 8, 12, 13, 15, 20, 21, 24, 40, 56, 60, 84, 120,
    ] {
        let f = field(n);
        for &m in &squarefree {
            let root = f.sqrt_rational(&BigInt::from(m), &BigInt::from(1)).unwrap();
            let contained = n as u64 % quadratic_conductor(m) == 0;
            assert_eq!(root.is_some(), contained, "√{m} in Q(ζ_{n})");
            let Some(root) = root else { continue };
            assert_eq!(f.mul(&root, &root).unwrap(), f.int(m), "√{m}² in Q(ζ_{n})");
            if m != 1 {
                assert_eq!(root, principal_root(&f, m), "branch of √{m} in Q(ζ_{n})");
            }
            // √(m·9/4) = (3/2)·√m
            let scaled = f.sqrt_rational(&BigInt::from(9 * m), &BigInt::from(4));
            let expected = f.mul(&f.rational(3, 2).unwrap(), &root).unwrap();
            assert_eq!(scaled.unwrap(), Some(expected));
        }
    }
}

/// The roots of unity of Q(ζ_n) are exactly ±ζ_n^k (Washington, ch. 2, from memory): ζ_n^k
/// has order n/gcd(n, k) and −ζ_n^k = exp(2πi(2k + n)/2n) has order 2n/gcd(2n, 2k + n).
/// (3 + 4i)/5 has absolute value 1 but is no root of unity (common practice), nor are 2 and
/// 1 + ζ_n for n ∉ {3, 6} (|1 + ζ_n| ≠ 1).
#[test]
fn roots_of_unity() {
    for n in [1u32, 2, 3, 5, 12, 16, 20, 48, 60, 105] {
        let f = field(n);
        let n64 = n as u64;
        for k in 0..n as i64 {
            let z = f.zeta_pow(k);
            let order = n64 / gcd(n64, k as u64);
            assert_eq!(f.root_of_unity_order(&z).unwrap(), Some(order), "ζ_{n}^{k}");
            let minus = f.neg(&z);
            let e = 2 * k as u64 + n64;
            let order = 2 * n64 / gcd(2 * n64, e);
            assert_eq!(
                f.root_of_unity_order(&minus).unwrap(),
                Some(order),
                "−ζ_{n}^{k}"
            );
            // the exponent form: a = exp(2πi·e/N), N = n or 2n; for N = 2n (n odd),
            // ζ_2n^e = ζ_n^{e/2} for even e and −ζ_n^{(e−n)/2} for odd e (ζ_2n^n = −1)
            let (big_n, e) = f.root_of_unity_exponent(&minus).unwrap().unwrap();
            let e = e as i64;
            let back = if big_n == n64 {
                f.zeta_pow(e)
            } else if e % 2 == 0 {
                f.zeta_pow(e / 2)
            } else {
                f.neg(&f.zeta_pow((e - n as i64) / 2))
            };
            assert_eq!(back, minus);
        }
        assert_eq!(f.root_of_unity_order(&f.int(2)).unwrap(), None);
        assert_eq!(f.root_of_unity_order(&f.zero()).unwrap(), None);
        if n != 3 && n != 6 && n > 2 {
            let x = f.add(&f.one(), &f.zeta_pow(1)).unwrap();
            assert_eq!(f.root_of_unity_order(&x).unwrap(), None, "1 + ζ_{n}");
        }
        if n % 4 == 0 {
            let x = f.parse("(3 + 4*i)/5").unwrap();
            assert!(f.mul(&x, &f.conj(&x)).unwrap().is_one());
            assert_eq!(f.root_of_unity_order(&x).unwrap(), None);
        }
    }
}
