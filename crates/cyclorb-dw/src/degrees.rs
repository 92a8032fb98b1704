//! Irreducible character degrees of a finite group from counts of commutators, and the
//! Verlinde dimension of the quantum double D(G).
//!
//! Frobenius (1896): the number of solutions of [a₁,b₁]⋯[a_g,b_g] = 1 in H^{2g} is
//! N_g = |H|^{2g−1} Σ_ρ d_ρ^{2−2g}, the sum over the irreducible characters ρ of H. So the
//! power sums p_m = Σ_ρ (d_ρ⁻²)^m = N_{m+1} / |H|^{2m+1} are counts. N_g is the g-fold
//! convolution at 1 of c(z) = #{(a, b) ∈ H² : [a, b] = z}. Every degree divides |H| and
//! d² ≤ |H|; with the k candidate degrees d (divisors of |H| with d² ≤ |H|) and the k power
//! sums p_0, …, p_{k−1}, the multiplicities n_d solve a Vandermonde system in the distinct
//! values 1/d². It is solved exactly in integers: with L = lcm(d)², y_d = L/d² and
//! r_m = p_m L^m, n_d = Σ_m r_m [t^m] Π_{e≠d}(t − y_e) / Π_{e≠d}(y_d − y_e) (Lagrange). The
//! result is checked: every r_m and n_d an integer, n_d ≥ 0, Σ n_d d² = |H|.
//!
//! Verlinde dimension of D(G) at genus g (the simple objects of D(G) are pairs ([x], ρ),
//! ρ ∈ Irr C(x), of quantum dimension |[x]| d_ρ, and D = |G|):
//! dim V_g = Σ_{([x], ρ)} (|G| / (|[x]| d_ρ))^{2g−2} = Σ_{([x], ρ)} (|C(x)| / d_ρ)^{2g−2}.

use num_bigint::{BigInt, BigUint};
use num_integer::Integer;
use num_traits::{One, Signed, ToPrimitive, Zero};

use crate::classes::conjugacy_classes;
use crate::error::DwError;
use crate::group::{Element, FiniteGroup};

/// The degrees of the irreducible characters of the subgroup H of G (its elements, which
/// must contain the identity and be closed under products), in increasing order with
/// multiplicity.
pub fn character_degrees(group: &FiniteGroup, subgroup: &[Element]) -> Result<Vec<u64>, DwError> {
    let h = subgroup.len();
    let mut local = vec![usize::MAX; group.order()];
    for (k, &x) in subgroup.iter().enumerate() {
        local[x as usize] = k;
    }
    let identity = local[0];
    if identity == usize::MAX {
        return Err(DwError::Inconsistent(
            "a subgroup without the identity".into(),
        ));
    }
    // c(z) = #{(a, b) : [a, b] = z}
    let mut c = vec![0u64; h];
    for &a in subgroup {
        for &b in subgroup {
            let z = local[group.commutator(a, b) as usize];
            if z == usize::MAX {
                return Err(DwError::Inconsistent(
                    "a subgroup not closed under products".into(),
                ));
            }
            c[z] += 1;
        }
    }
    let candidates: Vec<u64> = (1..=h as u64)
        .filter(|d| h as u64 % d == 0 && d * d <= h as u64)
        .collect();
    let k = candidates.len();
    // N_g(z) for g = 1..k by convolution with c; keep N_g(1)
    let mut counts: Vec<BigUint> = c.iter().map(|&x| BigUint::from(x)).collect();
    let mut at_one = vec![counts[identity].clone()];
    for _ in 1..k {
        let mut next = vec![BigUint::zero(); h];
        for (yi, ny) in counts.iter().enumerate() {
            if ny.is_zero() {
                continue;
            }
            let y = subgroup[yi];
            for (wi, &cw) in c.iter().enumerate() {
                // z = y·w, so c(y⁻¹ z) = c(w)
                if cw != 0 {
                    let z = local[group.mul(y, subgroup[wi]) as usize];
                    next[z] += ny * cw;
                }
            }
        }
        counts = next;
        at_one.push(counts[identity].clone());
    }
    // integers y_d = L / d² and right-hand sides r_m = N_{m+1}(1) L^m / |H|^{2m+1}
    let l = candidates.iter().fold(1u64, |acc, &d| acc.lcm(&(d * d)));
    let ys: Vec<BigInt> = candidates
        .iter()
        .map(|&d| BigInt::from(l / (d * d)))
        .collect();
    let hb = BigInt::from(h);
    let mut rhs = Vec::with_capacity(k);
    for (m, n) in at_one.iter().enumerate() {
        let numerator = BigInt::from(n.clone()) * BigInt::from(l).pow(m as u32);
        let denominator = hb.pow(2 * m as u32 + 1);
        let (q, r) = numerator.div_rem(&denominator);
        if !r.is_zero() {
            return Err(DwError::Inconsistent(format!(
                "commutator count N_{} is not compatible with integer character degrees",
                m + 1
            )));
        }
        rhs.push(q);
    }
    let mut degrees = Vec::new();
    let mut square_sum = 0u64;
    for (d_index, &d) in candidates.iter().enumerate() {
        // Π_{e≠d} (t − y_e), coefficients from t^0 up
        let mut poly = vec![BigInt::one()];
        let mut denominator = BigInt::one();
        for (e, y) in ys.iter().enumerate() {
            if e == d_index {
                continue;
            }
            let mut next = vec![BigInt::zero(); poly.len() + 1];
            for (i, a) in poly.iter().enumerate() {
                next[i + 1] += a;
                next[i] -= a * y;
            }
            poly = next;
            denominator *= &ys[d_index] - y;
        }
        let numerator: BigInt = poly.iter().zip(&rhs).map(|(a, r)| a * r).sum();
        let (n_d, r) = numerator.div_rem(&denominator);
        if !r.is_zero() || n_d.is_negative() {
            return Err(DwError::Inconsistent(format!(
                "the multiplicity of degree {d} is not a non-negative integer"
            )));
        }
        let n_d = n_d
            .to_u64()
            .ok_or_else(|| DwError::Inconsistent("a multiplicity beyond 64 bits".into()))?;
        square_sum += n_d * d * d;
        degrees.extend(std::iter::repeat(d).take(n_d as usize));
    }
    if square_sum != h as u64 {
        return Err(DwError::Inconsistent(format!(
            "the squares of the degrees add up to {square_sum}, not |H| = {h}"
        )));
    }
    Ok(degrees)
}

/// For each conjugacy class (in the order of [`conjugacy_classes`]): |C(x)| and the
/// character degrees of C(x).
pub fn centraliser_degrees(group: &FiniteGroup) -> Result<Vec<(usize, Vec<u64>)>, DwError> {
    conjugacy_classes(group)
        .iter()
        .map(|class| {
            Ok((
                class.centraliser.len(),
                character_degrees(group, &class.centraliser)?,
            ))
        })
        .collect()
}

/// dim V_g of D(G) by the Verlinde formula: Σ_{([x], ρ)} (|C(x)| / d_ρ)^{2g−2}.
pub fn verlinde_dimension(group: &FiniteGroup, genus: usize) -> Result<BigUint, DwError> {
    if genus == 0 {
        return Err(DwError::Genus(genus));
    }
    let mut total = BigUint::zero();
    for (size, degrees) in centraliser_degrees(group)? {
        for d in degrees {
            total += BigUint::from(size as u64 / d).pow(2 * genus as u32 - 2);
        }
    }
    Ok(total)
}
