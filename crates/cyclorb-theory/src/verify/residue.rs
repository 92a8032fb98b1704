//! Polynomial identities among a theory's numbers, proved on word-sized residues.
//!
//! **The argument** (docs/conventions.md §5, "Identities on residues"). The numbers that enter
//! an identity come in groups g (the entries of S, the twists, one scalar, integers, …). For
//! each group let D_g be the lcm of its entries' denominators (an entry u = A/d in the power
//! basis, A ∈ Z[ζ_n]) and L_g ≥ 1 at least every ⌈‖A‖₁/d⌉, so |σ(u)| ≤ L_g under every
//! complex embedding σ because |σ(ζ^j)| = 1. Suppose the identity says y = lhs − rhs = 0,
//! where the two sides together are a sum of at most T monomials with coefficients ±1, each
//! a product of at most k_g entries of group g. Then
//!
//! - M·y ∈ Z[ζ_n] for M = Π_g D_g^{k_g}: a monomial with j_g ≤ k_g factors from group g
//!   times Π D_g^{j_g} is a product of the integral D_g·u, and Π D_g^{k_g − j_g} is an
//!   integer;
//! - |σ(M·y)| ≤ B = T·Π_g (D_g·L_g)^{k_g} for every σ;
//! - y lies in the fixed field K of the Galois automorphisms fixing every entry of every
//!   group ([`CyclotomicField::fixing_group`]; the intersection of the groups' fixing
//!   groups).
//!
//! Matrices are reduced once ([`ResidueMatrix`]: one dense matrix of residues per ideal), and
//! products of reduced matrices are products over each F_p, so (ST)³, S², S·S† and the
//! Verlinde sums cost r³ or r⁴ word products per ideal instead of as many field products.

use cyclorb_field::{Cyc, CyclotomicField, ResidueMap};
use cyclorb_matrix::Matrix;
use hashbrown::HashSet;
use num_bigint::{BigInt, BigUint};
use num_integer::Integer;
use num_traits::One;

/// D, L and the fixing group of a set of entries (see the module documentation).
pub(crate) struct EntryBounds {
    /// D: the lcm of the entries' denominators.
    pub lcm: BigUint,
    /// L: the largest ⌈‖A‖₁/d⌉ (at least 1).
    pub largest: BigUint,
    /// The Galois automorphisms (exponents) fixing every entry.
    pub fixing: Vec<i64>,
}

impl EntryBounds {
    /// The bounds of the distinct entries among `entries`, all of `field`.
    pub fn of<'a>(field: &CyclotomicField, entries: impl IntoIterator<Item = &'a Cyc>) -> Self {
        let distinct: HashSet<&Cyc> = entries.into_iter().collect();
        let distinct: Vec<Cyc> = distinct.into_iter().cloned().collect();
        let mut lcm = BigUint::one();
        let mut largest = BigUint::one();
        for x in &distinct {
            let (ceil, den) = x.embedding_bound_ceil();
            lcm = lcm.lcm(&den);
            largest = largest.max(ceil);
        }
        let fixing = field
            .fixing_group(&distinct)
            .expect("entries lie in the theory's field");
        EntryBounds {
            lcm,
            largest,
            fixing,
        }
    }

    /// The bounds of the integers of absolute value at most `largest`: D = 1, L = largest,
    /// fixed by every automorphism.
    pub fn integers(field: &CyclotomicField, largest: u64) -> Self {
        EntryBounds {
            lcm: BigUint::one(),
            largest: BigUint::from(largest.max(1)),
            fixing: field.galois_group(),
        }
    }
}

/// The residue map that proves zero every y = lhs − rhs of at most `terms` monomials with
/// at most k_g factors from group g, for `groups` = [(group, k_g)]: the bound
/// B = T·Π (D_g·L_g)^{k_g} of the module documentation, ideals avoiding every D_g, one per
/// coset of the groups' common fixing group.
pub(crate) fn identity_residues(
    field: &CyclotomicField,
    groups: &[(&EntryBounds, u32)],
    terms: u128,
) -> ResidueMap {
    let mut bound = BigUint::from(terms.max(1));
    let mut avoid = BigUint::one();
    let mut fixing = field.galois_group();
    for (group, k) in groups {
        bound *= (&group.lcm * &group.largest).pow(*k);
        avoid = avoid.lcm(&group.lcm);
        fixing.retain(|h| group.fixing.contains(h));
    }
    field.residue_map(&bound, &BigInt::from(avoid), &fixing)
}

/// A matrix reduced modulo every ideal of a [`ResidueMap`]: entry (i, j) at ideal e is
/// `data[(e·rows + i)·cols + j]`.
pub(crate) struct ResidueMatrix {
    rows: usize,
    cols: usize,
    data: Vec<u64>,
}

impl ResidueMatrix {
    /// The residues of `m` (entries of the map's field).
    pub fn of(map: &ResidueMap, m: &Matrix) -> ResidueMatrix {
        Self::from_fn(map, m.rows(), m.cols(), |i, j| m.get(i, j))
    }

    /// The residues of the matrix whose entry (i, j) is `entry(i, j)`.
    pub fn from_fn<'a>(
        map: &ResidueMap,
        rows: usize,
        cols: usize,
        entry: impl Fn(usize, usize) -> &'a Cyc,
    ) -> ResidueMatrix {
        let e = map.len();
        let mut data = vec![0; e * rows * cols];
        let mut slot = vec![0; e];
        for i in 0..rows {
            for j in 0..cols {
                map.reduce_into(entry(i, j), &mut slot)
                    .expect("the ideals avoid every denominator of the entries");
                for (ideal, &v) in slot.iter().enumerate() {
                    data[(ideal * rows + i) * cols + j] = v;
                }
            }
        }
        ResidueMatrix { rows, cols, data }
    }

    /// The residues of the integer matrix whose entry (i, j) is `entry(i, j)`.
    pub fn integers(
        map: &ResidueMap,
        field: &CyclotomicField,
        rows: usize,
        cols: usize,
        entry: impl Fn(usize, usize) -> i64,
    ) -> ResidueMatrix {
        let values: Vec<Cyc> = (0..rows * cols)
            .map(|k| field.int(entry(k / cols, k % cols)))
            .collect();
        Self::from_fn(map, rows, cols, |i, j| &values[i * cols + j])
    }

    /// Row i at ideal e.
    pub fn row(&self, e: usize, i: usize) -> &[u64] {
        &self.data[(e * self.rows + i) * self.cols..][..self.cols]
    }

    fn row_mut(&mut self, e: usize, i: usize) -> &mut [u64] {
        &mut self.data[(e * self.rows + i) * self.cols..][..self.cols]
    }

    /// The transpose.
    pub fn transpose(&self, map: &ResidueMap) -> ResidueMatrix {
        let mut out = ResidueMatrix {
            rows: self.cols,
            cols: self.rows,
            data: vec![0; self.data.len()],
        };
        for e in 0..map.len() {
            for i in 0..self.rows {
                for (j, &v) in self.row(e, i).iter().enumerate() {
                    out.row_mut(e, j)[i] = v;
                }
            }
        }
        out
    }

    /// self · other, ideal by ideal.
    pub fn mul(&self, map: &ResidueMap, other: &ResidueMatrix) -> ResidueMatrix {
        let other_t = other.transpose(map);
        let mut out = ResidueMatrix {
            rows: self.rows,
            cols: other.cols,
            data: vec![0; map.len() * self.rows * other.cols],
        };
        for e in 0..map.len() {
            for i in 0..self.rows {
                for j in 0..other.cols {
                    out.row_mut(e, i)[j] = map.dot_at(e, self.row(e, i), other_t.row(e, j));
                }
            }
        }
        out
    }

    /// self · diag(d): column j multiplied by d_j (`d[e][j]` the residue at ideal e).
    pub fn scale_columns(&self, map: &ResidueMap, d: &ResidueMatrix) -> ResidueMatrix {
        let mut out = ResidueMatrix {
            rows: self.rows,
            cols: self.cols,
            data: self.data.clone(),
        };
        for e in 0..map.len() {
            for i in 0..self.rows {
                for (x, &s) in out.row_mut(e, i).iter_mut().zip(d.row(e, 0)) {
                    *x = map.mul_at(e, *x, s);
                }
            }
        }
        out
    }

    /// Every entry multiplied by the scalar whose residues are `s` (one per ideal).
    pub fn scale(&self, map: &ResidueMap, s: &[u64]) -> ResidueMatrix {
        let mut out = ResidueMatrix {
            rows: self.rows,
            cols: self.cols,
            data: self.data.clone(),
        };
        for (e, &c) in s.iter().enumerate() {
            for i in 0..self.rows {
                for x in out.row_mut(e, i) {
                    *x = map.mul_at(e, *x, c);
                }
            }
        }
        out
    }

    /// Whether the two matrices agree at every ideal (then, under the bound the map was
    /// made for, they are equal; otherwise they differ).
    pub fn equals(&self, other: &ResidueMatrix) -> bool {
        self.rows == other.rows && self.cols == other.cols && self.data == other.data
    }
}
