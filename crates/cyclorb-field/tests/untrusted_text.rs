//! Untrusted text: depth and power limits refuse quickly with a reason; square roots of
//! rationals of any size are found exactly.

use cyclorb_field::{CyclotomicField, MAX_PARSE_DEPTH};
use num_bigint::BigInt;

fn field(n: u32) -> CyclotomicField {
    CyclotomicField::new(n).unwrap()
}

#[test]
fn deep_nesting_is_refused_not_overflowed() {
    let f = field(8);
    let deep = format!("{}1{}", "(".repeat(5200), ")".repeat(5200));
    let err = f.parse(&deep).unwrap_err().to_string();
    assert!(err.contains("nesting deeper than"), "{err}");
    let deep_sqrt = format!("{}4{}", "sqrt(".repeat(5200), ")".repeat(5200));
    assert!(f.parse(&deep_sqrt).is_err());
    let ok = format!(
        "{}1{}",
        "(".repeat(MAX_PARSE_DEPTH),
        ")".repeat(MAX_PARSE_DEPTH)
    );
    assert!(f.parse(&ok).unwrap().is_one());
}

#[test]
fn huge_powers_are_refused_before_they_are_computed() {
    let f = field(8);
    for text in [
        "2^1099511627776",
        "(1+z)^99999999999",
        "2^100000000",
        "(1+z)^-99999999",
    ] {
        let err = f.parse(text).unwrap_err().to_string();
        assert!(err.contains("power too large"), "{text}: {err}");
    }
    let err = f.parse("2^99999999999999999999").unwrap_err().to_string();
    assert!(err.contains("does not fit in 64 bits"), "{err}");
    // within the limit: exact
    let big = f.parse("2^100000").unwrap();
    assert_eq!(big.as_rational().unwrap().0, BigInt::from(2).pow(100_000));
}

#[test]
fn powers_of_roots_of_unity_reduce_their_exponent() {
    let f = field(8);
    assert_eq!(f.parse("z^1099511627776").unwrap(), f.one());
    assert_eq!(f.parse("z^1099511627777").unwrap(), f.zeta_pow(1));
    assert_eq!(
        f.parse("(-z)^-9223372036854775807").unwrap(),
        f.parse("(-z)^1").unwrap()
    );
}

#[test]
fn square_roots_of_big_rationals() {
    let f = field(8);
    // sqrt(2^64) = 2^32
    let r = f.parse("sqrt(2^64)").unwrap();
    assert_eq!(r.as_rational().unwrap().0, BigInt::from(1u64 << 32));
    // sqrt(2^65) = 2^32·√2, and its square is 2^65
    let r = f.parse("sqrt(2^65)").unwrap();
    assert_eq!(f.mul(&r, &r).unwrap(), f.parse("2^65").unwrap());
    // sqrt of a big odd square over a big square denominator
    let r = f.parse("sqrt(3^80/7^60)").unwrap();
    assert_eq!(r, f.parse("3^40/7^30").unwrap());
    // a big non-square prime to the first power is not in Q(ζ_8)
    let err = f
        .parse("sqrt(18446744073709551557)")
        .unwrap_err()
        .to_string();
    assert!(err.contains("is not in Q(ζ_8)"), "{err}");
    // sqrt(-2·5^50) in Q(ζ_8): i·√2·5^25
    let r = f.parse("sqrt(-2*5^50)").unwrap();
    assert_eq!(f.mul(&r, &r).unwrap(), f.parse("-2*5^50").unwrap());
    let f5 = field(20);
    let r = f5.parse("sqrt(5*11^40)").unwrap();
    assert_eq!(f5.mul(&r, &r).unwrap(), f5.parse("5*11^40").unwrap());
}
