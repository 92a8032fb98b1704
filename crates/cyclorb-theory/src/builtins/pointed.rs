//! Pointed theories zn:N:P on Z_N with θ_a = exp(πi·P·a²/N) (P·N even, gcd(P, N) = 1).
//!
//! Labels 0..N−1, a ⊗ b = [a+b] (mod N), d = 1. With representatives 0 ≤ a < N:
//! F^{abc} = exp(πi·P·a·(b + c − [b+c])/N) = (−1)^{P·a·[b+c ≥ N]} (trivial when N is odd,
//! since P is then even; the order-2 3-cocycle when N is even), R^{ab} = exp(πi·P·a·b/N).
//! The pair (F, R) is an abelian 3-cocycle whose quadratic form is θ, so pentagon and
//! hexagons hold. A unitary gauge; N = 2, P = 1 is the semion.

use cyclorb_field::CyclotomicField;
use hashbrown::HashMap;
use num_integer::Integer;

use crate::assemble::{assemble, blocks_from_entries, RawF, RawStructure, RawTheory};
use crate::error::TheoryError;
use crate::fusion::FusionRules;
use crate::structure::key3;
use crate::theory::Theory;
use cyclorb_field::{canonical_conductor, root_of_unity};

/// Largest N accepted by `zn:N:P`.
pub const MAX_ORDER: i64 = 64;

/// The pointed theory zn:N:P.
pub fn zn(n: i64, p: i64) -> Result<Theory, TheoryError> {
    let name = format!("zn:{n}:{p}");
    let bad = |reason: String| TheoryError::Spec {
        spec: name.clone(),
        reason,
    };
    if !(1..=MAX_ORDER).contains(&n) {
        return Err(bad(format!("N must be between 1 and {MAX_ORDER}")));
    }
    if (p * n) % 2 != 0 {
        return Err(bad("P·N must be even".into()));
    }
    if p.gcd(&n) != 1 {
        return Err(bad("gcd(P, N) must be 1 (otherwise θ is degenerate)".into()));
    }
    let nu = n as usize;
    let field = CyclotomicField::new(canonical_conductor(2 * n as u64) as u32)?;
    let z = |num: i64| root_of_unity(&field, num, 2 * n).expect("2N-th roots");
    let triples = (0..nu).flat_map(|a| (0..nu).map(move |b| (a, b, (a + b) % nu, 1)));
    let fusion = FusionRules::from_triples(nu, triples)
        .map_err(|e| TheoryError::Internal(format!("Z_N fusion: {e:?}")))?;
    let blocks = blocks_from_entries(&field, &fusion, |a, b, c, _, _, _| {
        let wraps = b + c >= nu;
        if wraps && (p * a as i64) % 2 != 0 {
            field.int(-1)
        } else {
            field.one()
        }
    });
    let mut r = HashMap::new();
    for a in 0..nu {
        for b in 0..nu {
            r.insert(key3(nu, a, b, (a + b) % nu), z(p * (a * b) as i64));
        }
    }
    let twists = (0..nu).map(|a| z(p * (a * a) as i64)).collect();
    assemble(RawTheory {
        name,
        labels: (0..nu).map(|a| a.to_string()).collect(),
        fusion,
        dims: vec![field.one(); nu],
        twists,
        structure: RawStructure::Braided {
            f: RawF::Stored(blocks),
            r,
            weights: HashMap::new(),
        },
        field,
    })
}
