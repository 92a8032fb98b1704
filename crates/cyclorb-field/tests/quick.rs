use cyclorb_field::*;
use num_bigint::BigInt;

#[test]
fn smoke() {
    for n in [1u32, 2, 3, 5, 8, 12, 16, 20, 48, 60, 105] {
        let f = CyclotomicField::new(n).unwrap();
        let z = f.zeta_pow(1);
        assert_eq!(f.pow(&z, n as i64).unwrap(), f.one(), "n={n}");
        let a = f.parse("(3 + 2*z - z^2)/7").unwrap();
        if a.is_zero() {
            continue;
        }
        let b = f.inv(&a).unwrap();
        assert_eq!(f.mul(&a, &b).unwrap(), f.one(), "n={n} a={a}");
        assert_eq!(f.parse(&a.to_string()).unwrap(), a);
        let c = f.conj(&a);
        assert_eq!(f.conj(&c), a);
    }
    let f = CyclotomicField::new(60).unwrap();
    for r in [2i64, 3, 5, -1, -3, 15, -15, 6, 10, 30, -2] {
        let s = f.sqrt_rational(&BigInt::from(r), &BigInt::from(1)).unwrap();
        if let Some(s) = s {
            assert_eq!(f.mul(&s, &s).unwrap(), f.int(r), "r={r}");
            let (re, im) = s.to_complex();
            if r > 0 {
                assert!(re > 0.0 && im.abs() < 1e-9, "r={r} {re} {im}");
            } else {
                assert!(im > 0.0 && re.abs() < 1e-9, "r={r}");
            }
        } else {
            println!("no sqrt {r} in Q(z60)");
        }
    }
}
