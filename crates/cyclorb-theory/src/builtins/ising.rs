//! The eight Ising-type theories (docs/conventions.md §2–3), ν odd, c = ν/2, labels 1, σ, ψ:
//! κ = (−1)^{(ν²−1)/8}; F^{σσσ}_σ = (κ/√2)[[1,1],[1,−1]] (rows and columns 1, ψ),
//! F^{ψσψ}_σ = F^{σψσ}_ψ = −1, every other admissible F-symbol 1;
//! R^{σσ}_1 = κ e^{−iπν/8}, R^{σσ}_ψ = κ e^{3iπν/8}, R^{σψ}_σ = R^{ψσ}_σ = (−i)^ν,
//! R^{ψψ}_1 = −1; θ = (1, e^{iπν/8}, −1), d = (1, √2, 1). A unitary gauge, in Q(ζ₁₆).

use cyclorb_field::CyclotomicField;
use hashbrown::HashMap;

use crate::arith::SameField;
use crate::assemble::{assemble, blocks_from_entries, RawF, RawStructure, RawTheory};
use crate::error::TheoryError;
use crate::fusion::FusionRules;
use crate::structure::key3;
use crate::theory::Theory;
use cyclorb_field::root_of_unity;

const ONE: usize = 0;
const SIGMA: usize = 1;
const PSI: usize = 2;

/// The Ising-type theory with odd ν (taken mod 16); ν = 1 is Ising.
pub fn ising_type(nu: i64) -> Result<Theory, TheoryError> {
    let name = if nu == 1 {
        "ising".to_string()
    } else {
        format!("ising:{nu}")
    };
    if nu % 2 == 0 || !(1..16).contains(&nu) {
        return Err(TheoryError::Spec {
            spec: name,
            reason: "ν must be odd, 1 ≤ ν ≤ 15".into(),
        });
    }
    let field = CyclotomicField::new(16)?;
    let z = |num: i64, den: i64| root_of_unity(&field, num, den).expect("16th roots");
    let kappa: i64 = if ((nu * nu - 1) / 8) % 2 == 0 { 1 } else { -1 };
    let sqrt2 = field.plus(&z(1, 8), &z(-1, 8));
    let inv_sqrt2 = field.inverse(&sqrt2).expect("√2 ≠ 0");
    let k_over_sqrt2 = field.mul_int(&inv_sqrt2, kappa);
    let fusion = FusionRules::from_triples(
        3,
        [
            (SIGMA, SIGMA, ONE, 1),
            (SIGMA, SIGMA, PSI, 1),
            (SIGMA, PSI, SIGMA, 1),
            (PSI, SIGMA, SIGMA, 1),
            (PSI, PSI, ONE, 1),
        ],
    )
    .map_err(|e| TheoryError::Internal(format!("Ising fusion: {e:?}")))?;
    let blocks = blocks_from_entries(&field, &fusion, |a, b, c, d, e, f| match (a, b, c, d) {
        (SIGMA, SIGMA, SIGMA, SIGMA) => {
            if e == PSI && f == PSI {
                field.neg(&k_over_sqrt2)
            } else {
                k_over_sqrt2.clone()
            }
        }
        (PSI, SIGMA, PSI, SIGMA) | (SIGMA, PSI, SIGMA, PSI) => field.int(-1),
        _ => field.one(),
    });
    let mut r = HashMap::new();
    let kappa_times = |x| field.mul_int(&x, kappa);
    r.insert(key3(3, SIGMA, SIGMA, ONE), kappa_times(z(-nu, 16)));
    r.insert(key3(3, SIGMA, SIGMA, PSI), kappa_times(z(3 * nu, 16)));
    r.insert(key3(3, SIGMA, PSI, SIGMA), z(-nu, 4));
    r.insert(key3(3, PSI, SIGMA, SIGMA), z(-nu, 4));
    r.insert(key3(3, PSI, PSI, ONE), field.int(-1));
    for a in 0..3 {
        r.insert(key3(3, ONE, a, a), field.one());
        r.insert(key3(3, a, ONE, a), field.one());
    }
    assemble(RawTheory {
        name,
        labels: vec!["1".into(), "sigma".into(), "psi".into()],
        fusion,
        dims: vec![field.one(), sqrt2, field.one()],
        twists: vec![field.one(), z(nu, 16), field.int(-1)],
        structure: RawStructure::Braided {
            f: RawF::Stored(blocks),
            r,
            weights: HashMap::new(),
        },
        field,
    })
}
