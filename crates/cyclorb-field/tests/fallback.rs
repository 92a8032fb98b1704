//! The machine-word fast paths against a slow big-integer model written in the test helpers
//! (`random_and_reference::Slow`: schoolbook products and long division by Φ_n on `BigInt`, sharing no code
//! with the crate), with inputs chosen to overflow every tier: coefficients and denominators
//! near the i64 limits, products that overflow i128, sums that land exactly on i64::MIN.
//! Source of truth: the definition of arithmetic in Z[x]/(Φ_n) (common practice).

mod random_and_reference;

use cyclorb_field::{Cyc, CyclotomicField};
use num_bigint::BigInt;
use random_and_reference::{assert_canonical, element, iters, nonzero, Repr, Rng, Slow};

/// A representation for one operand: the given one or, half of the time, another, so that
/// mixed small/edge/big operations are covered.
fn pick(rng: &mut Rng, repr: Repr) -> Repr {
    match rng.below(4) {
        0 => Repr::Small,
        1 => Repr::Edge,
        2 => Repr::Big,
        _ => repr,
    }
}

fn check_against_model(n: u32, repr: Repr, rounds: usize) {
    let f = CyclotomicField::new(n).unwrap();
    let slow = Slow::new(n);
    let mut rng = Rng::new(&format!("fallback/{n}/{repr:?}"));
    for _ in 0..rounds {
        let (ra, rb) = (pick(&mut rng, repr), pick(&mut rng, repr));
        let a = element(&f, &mut rng, ra);
        let b = nonzero(&f, &mut rng, rb);
        let (sa, sb) = (slow.value_of(&a), slow.value_of(&b));
        let sum = f.add(&a, &b).unwrap();
        assert!(slow.same(&sum, &slow.add(&sa, &sb)), "a+b: a={a} b={b}");
        let product = f.mul(&a, &b).unwrap();
        assert!(slow.same(&product, &slow.mul(&sa, &sb)), "a·b: a={a} b={b}");
        let square = f.pow(&b, 2).unwrap();
        assert!(slow.same(&square, &slow.mul(&sb, &sb)), "b²: b={b}");
        let k = [1i64, -1, 3, 7, 11][rng.below(5) as usize];
        if num_integer::Integer::gcd(&k, &(n as i64)) == 1 {
            let image = f.galois(&a, k).unwrap();
            assert!(slow.same(&image, &slow.galois(&sa, k)), "σ_{k}: a={a}");
        }
        // the inverse: b·b⁻¹ = 1 in the model
        let inverse = f.inv(&b).unwrap();
        let one = slow.mul(&sb, &slow.value_of(&inverse));
        assert!(slow.same(&f.one(), &one), "b·b⁻¹ ≠ 1 in the model: b={b}");
        // a dot product mixing representations
        let (rc, rd) = (pick(&mut rng, repr), pick(&mut rng, repr));
        let c = element(&f, &mut rng, rc);
        let d = element(&f, &mut rng, rd);
        let dot = f.dot([(&a, &b), (&c, &d)]).unwrap();
        let expected = slow.add(
            &slow.mul(&sa, &sb),
            &slow.mul(&slow.value_of(&c), &slow.value_of(&d)),
        );
        assert!(slow.same(&dot, &expected), "dot: a={a} b={b} c={c} d={d}");
        for x in [&sum, &product, &square, &inverse, &dot] {
            assert_canonical(x);
        }
    }
}

/// Stamps the model comparison over one (conductor, representation, base iteration count).
macro_rules! stamp {
    ($($name:ident: $n:expr, $repr:expr, $base:expr;)*) => {$(
        #[test]
        fn $name() { check_against_model($n, $repr, iters($base)) }
    )*};
}

stamp! {
    edge_1: 1, Repr::Edge, 40;
    edge_2: 2, Repr::Edge, 40;
    edge_5: 5, Repr::Edge, 30;
    edge_16: 16, Repr::Edge, 20;
    edge_20: 20, Repr::Edge, 20;
    edge_48: 48, Repr::Edge, 6;
    edge_60: 60, Repr::Edge, 6;
    edge_105: 105, Repr::Edge, 2;
    edge_240: 240, Repr::Edge, 2;
    big_1: 1, Repr::Big, 40;
    big_5: 5, Repr::Big, 30;
    big_16: 16, Repr::Big, 20;
    big_60: 60, Repr::Big, 6;
    big_240: 240, Repr::Big, 2;
}

fn parts(f: &CyclotomicField, num: &[i128], den: i128) -> Cyc {
    let num: Vec<BigInt> = num.iter().map(|&c| BigInt::from(c)).collect();
    f.from_parts(&num, &BigInt::from(den)).unwrap()
}

/// Hand-picked boundary cases: results exactly at ±(2^63 − 1) stay in words, −2^63 and
/// 2^63 move to big integers, and big intermediate values that cancel come back to words.
#[test]
fn storage_tier_boundaries() {
    let f = CyclotomicField::new(16).unwrap();
    let max = i64::MAX as i128;
    let phi = f.degree();
    let unit = |c: i128| {
        let mut v = vec![0i128; phi];
        v[0] = c;
        v
    };
    // (2^63 − 1) + 1 = 2^63 does not fit; (−2^63 + 1) − 1 = −2^63 is excluded from words
    let top = parts(&f, &unit(max), 1);
    let up = f.add(&top, &f.one()).unwrap();
    assert!(up.small_parts().is_none());
    assert_eq!(up.to_big_parts().0[0], BigInt::from(max + 1));
    let bottom = parts(&f, &unit(-max), 1);
    let down = f.sub(&bottom, &f.one()).unwrap();
    assert!(down.small_parts().is_none());
    assert_eq!(down.to_big_parts().0[0], BigInt::from(-max - 1));
    // and back: (2^63 − 1 + 1) − 1 is in words again
    let back = f.sub(&up, &f.one()).unwrap();
    assert_eq!(back, top);
    assert!(back.small_parts().is_some());
    // (2^63 − 1)·(1 + ζ + … + ζ^7) squared overflows i128; against the model
    let wide = parts(&f, &vec![max; phi], 1);
    let slow = Slow::new(16);
    let square = f.mul(&wide, &wide).unwrap();
    let sw = slow.value_of(&wide);
    assert!(slow.same(&square, &slow.mul(&sw, &sw)));
    // denominators near 2^63: their product overflows i64 and i128 squares overflow
    let d = parts(&f, &vec![3; phi], max);
    let dd = f.mul(&d, &d).unwrap();
    let sd = slow.value_of(&d);
    assert!(slow.same(&dd, &slow.mul(&sd, &sd)));
    assert_eq!(f.div(&dd, &d).unwrap(), d);
    // big numbers that cancel: (x + 2^100) − 2^100 = x, back in words
    let huge = f
        .big_rational(&(BigInt::from(1) << 100), &BigInt::from(1))
        .unwrap();
    let x = f.parse("(3 - z^5)/7").unwrap();
    let y = f.sub(&f.add(&x, &huge).unwrap(), &huge).unwrap();
    assert_eq!(y, x);
    assert!(y.small_parts().is_some());
    for c in [&up, &down, &square, &dd, &y] {
        assert_canonical(c);
    }
}
