//! The Verlinde formula N_ab^c = Σ_x S_ax S_bx conj(S_cx) / S_0x.

use cyclorb_field::{Cyc, CyclotomicField};
use cyclorb_matrix::Matrix;
use num_traits::{Signed, ToPrimitive};

use crate::arith::SameField;

/// Precomputed S_ax/S_0x and conj(S_cx), so each coefficient is one dot product.
pub(crate) struct Verlinde<'a> {
    field: &'a CyclotomicField,
    scaled: Vec<Vec<Cyc>>,
    plain: Vec<Vec<Cyc>>,
    conj: Vec<Vec<Cyc>>,
}

impl<'a> Verlinde<'a> {
    /// `None` when some S_0x vanishes.
    pub fn new(field: &'a CyclotomicField, s: &Matrix) -> Option<Verlinde<'a>> {
        let r = s.rows();
        let inv0: Vec<Cyc> = (0..r)
            .map(|x| field.inverse(s.get(0, x)))
            .collect::<Option<_>>()?;
        let scaled = (0..r)
            .map(|a| (0..r).map(|x| field.times(s.get(a, x), &inv0[x])).collect())
            .collect();
        let plain = (0..r).map(|a| s.row(a).to_vec()).collect();
        let conj = (0..r)
            .map(|c| (0..r).map(|x| field.conj(s.get(c, x))).collect())
            .collect();
        Some(Verlinde {
            field,
            scaled,
            plain,
            conj,
        })
    }

    /// S_ax/S_0x.
    pub fn scaled(&self, a: usize, x: usize) -> &Cyc {
        &self.scaled[a][x]
    }

    /// conj(S_cx).
    pub fn conj(&self, c: usize, x: usize) -> &Cyc {
        &self.conj[c][x]
    }

    /// Every S_ax/S_0x.
    pub fn scaled_entries(&self) -> impl Iterator<Item = &Cyc> {
        self.scaled.iter().flatten()
    }

    /// Every S_bx and conj(S_cx).
    pub fn s_entries(&self) -> impl Iterator<Item = &Cyc> {
        self.plain.iter().chain(&self.conj).flatten()
    }

    /// The products S_ax S_bx / S_0x over x, shared by every c of one pair (a, b).
    pub fn pair(&self, a: usize, b: usize) -> Vec<Cyc> {
        let f = self.field;
        (0..self.plain.len())
            .map(|x| f.times(&self.scaled[a][x], &self.plain[b][x]))
            .collect()
    }

    /// Σ_x S_ax S_bx conj(S_cx)/S_0x as Σ_x pair_x conj(S_cx), `pair` from [`Verlinde::pair`].
    pub fn coefficient_with(&self, pair: &[Cyc], c: usize) -> Cyc {
        self.field.dot_same(pair.iter().zip(&self.conj[c]))
    }
}

/// Fusion triples (a, b, c, N_ab^c) with N ≠ 0 from S, or the first (a, b, c) where the
/// formula does not give a non-negative integer.
pub(crate) fn fusion_from_s(
    field: &CyclotomicField,
    s: &Matrix,
) -> Result<Vec<(usize, usize, usize, u32)>, String> {
    let v = Verlinde::new(field, s).ok_or("an entry S_0x vanishes")?;
    let r = s.rows();
    let mut out = Vec::new();
    for a in 0..r {
        for b in 0..r {
            let pair = v.pair(a, b);
            for c in 0..r {
                let n = v.coefficient_with(&pair, c);
                let value = n
                    .as_rational()
                    .filter(|(p, q)| q == &1.into() && !p.is_negative())
                    .and_then(|(p, _)| p.to_u32());
                match value {
                    Some(0) => {}
                    Some(m) => out.push((a, b, c, m)),
                    None => {
                        return Err(format!(
                            "the Verlinde formula gives N_{{{a},{b}}}^{{{c}}} = {n}, not a non-negative integer"
                        ))
                    }
                }
            }
        }
    }
    Ok(out)
}
