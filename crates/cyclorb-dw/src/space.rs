//! X_g = Hom(π₁Σ_g, G)/G by canonical representatives, and the twists as permutations.
//!
//! A point of Hom(π₁Σ_g, G) is a tuple t = (A₀, B₀, …, A_{g−1}, B_{g−1}) ∈ G^{2g} with
//! Π_h [A_h, B_h] = 1 (A_h = φ(a_h), B_h = φ(b_h)); G acts by simultaneous conjugation. The
//! representative of an orbit is its lexicographically least tuple (elements compared by
//! their index in the table). It is found coordinate by coordinate: the first entry is the
//! least element of its conjugacy class, and each further entry is the least element of its
//! orbit under the centraliser of the entries before it. Enumerating these choices in
//! increasing order lists X_g in lexicographic order, with one entry per orbit, so states
//! are looked up by binary search. The number of states is the Verlinde dimension of D(G),
//! known before anything is built ([`crate::verlinde_dimension`]); [`FlatBundles::new`]
//! refuses spaces beyond a [`SizeBound`] and checks the count it enumerates against it.

use cyclorb_mcg::{Curve, GeneratingSet};
use num_traits::ToPrimitive;

use crate::degrees::verlinde_dimension;
use crate::error::DwError;
use crate::group::{Element, FiniteGroup};
use crate::twists::twist;
use crate::words::{Automorphism, Word};

/// Limits checked before X_g is built.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct SizeBound {
    /// Most states |X_g| (each costs 4g bytes, and 4 bytes per generator permutation).
    pub max_states: u64,
    /// Most search steps, measured as |G|^{2g−1} (the number of tuples the enumeration may
    /// visit, up to a small factor).
    pub max_work: u64,
}

impl Default for SizeBound {
    fn default() -> Self {
        SizeBound {
            max_states: 2_000_000,
            max_work: 1 << 32,
        }
    }
}

/// Largest genus handled.
pub const MAX_GENUS: usize = 8;

/// The set X_g with its states in lexicographic order.
#[derive(Clone, Debug)]
pub struct FlatBundles {
    group: FiniteGroup,
    genus: usize,
    width: usize,
    /// The states, `width` entries each.
    states: Vec<Element>,
    /// conj[g·|G| + x] = g x g⁻¹.
    conj: Vec<Element>,
}

/// Work space of one canonicalisation.
struct Scratch {
    candidates: Vec<Element>,
    next: Vec<Element>,
    tuple: Vec<Element>,
    canonical: Vec<Element>,
}

impl FlatBundles {
    /// Enumerate X_g (genus 1 to 8), refusing, before building, spaces beyond `bound`.
    pub fn new(
        group: &FiniteGroup,
        genus: usize,
        bound: SizeBound,
    ) -> Result<FlatBundles, DwError> {
        if genus == 0 || genus > MAX_GENUS {
            return Err(DwError::Genus(genus));
        }
        let expected = FlatBundles::predicted_size(group, genus)?;
        if expected > bound.max_states.into() {
            return Err(DwError::SpaceTooLarge {
                states: expected.to_string(),
                bound: bound.max_states as usize,
            });
        }
        let work = num_bigint::BigUint::from(group.order()).pow(2 * genus as u32 - 1);
        if work > bound.max_work.into() {
            return Err(DwError::TooLarge(format!(
                "enumerating X_{genus} of {} takes about |G|^{} = {work} steps (bound {})",
                group.name(),
                2 * genus - 1,
                bound.max_work
            )));
        }
        let n = group.order();
        let mut conj = vec![0; n * n];
        for g in group.elements() {
            for x in group.elements() {
                conj[g as usize * n + x as usize] = group.conjugate(g, x);
            }
        }
        let mut space = FlatBundles {
            group: group.clone(),
            genus,
            width: 2 * genus,
            states: Vec::new(),
            conj,
        };
        let all: Vec<Element> = group.elements().collect();
        let mut prefix = Vec::with_capacity(2 * genus);
        let mut states = Vec::new();
        space.search(&mut prefix, &all, 0, &mut states);
        space.states = states;
        let expected = expected.to_usize().unwrap_or(usize::MAX);
        if space.len() != expected {
            return Err(DwError::Inconsistent(format!(
                "enumerated {} states of X_{genus} for {}, the Verlinde formula says {expected}",
                space.len(),
                group.name()
            )));
        }
        Ok(space)
    }

    /// |X_g| by the Verlinde formula of D(G), without building anything.
    pub fn predicted_size(
        group: &FiniteGroup,
        genus: usize,
    ) -> Result<num_bigint::BigUint, DwError> {
        verlinde_dimension(group, genus)
    }

    fn conj(&self, g: Element, x: Element) -> Element {
        self.conj[g as usize * self.group.order() + x as usize]
    }

    /// Depth-first search over canonical prefixes; `stabiliser` = the centraliser of the
    /// prefix, `partial` = the product of the commutators of its complete pairs.
    fn search(
        &self,
        prefix: &mut Vec<Element>,
        stabiliser: &[Element],
        partial: Element,
        out: &mut Vec<Element>,
    ) {
        let g = &self.group;
        let pos = prefix.len();
        let is_rep =
            |x: Element| stabiliser.len() == 1 || stabiliser.iter().all(|&h| self.conj(h, x) >= x);
        if pos + 1 == self.width {
            // the last entry B: [A, B] must be partial⁻¹
            let a = prefix[pos - 1];
            let target = g.inv(partial);
            for x in g.elements() {
                if g.commutator(a, x) == target && is_rep(x) {
                    out.extend_from_slice(prefix);
                    out.push(x);
                }
            }
            return;
        }
        for x in g.elements() {
            if !is_rep(x) {
                continue;
            }
            let next: Vec<Element> = stabiliser
                .iter()
                .copied()
                .filter(|&h| self.conj(h, x) == x)
                .collect();
            let partial = if pos % 2 == 1 {
                g.mul(partial, g.commutator(prefix[pos - 1], x))
            } else {
                partial
            };
            prefix.push(x);
            self.search(prefix, &next, partial, out);
            prefix.pop();
        }
    }

    /// |X_g|.
    pub fn len(&self) -> usize {
        self.states.len() / self.width
    }

    /// Whether X_g is empty (never: the trivial bundle is a state).
    pub fn is_empty(&self) -> bool {
        self.states.is_empty()
    }

    /// The genus.
    pub fn genus(&self) -> usize {
        self.genus
    }

    /// The group.
    pub fn group(&self) -> &FiniteGroup {
        &self.group
    }

    /// State i as its canonical tuple (A₀, B₀, …).
    pub fn state(&self, i: usize) -> &[Element] {
        &self.states[i * self.width..(i + 1) * self.width]
    }

    /// State i as text, e.g. `A0=(0 1) B0=() | A1=…`, elements by their labels.
    pub fn describe(&self, i: usize) -> String {
        self.state(i)
            .chunks(2)
            .enumerate()
            .map(|(h, pair)| {
                format!(
                    "A{h}={} B{h}={}",
                    self.group.label(pair[0]),
                    self.group.label(pair[1])
                )
            })
            .collect::<Vec<_>>()
            .join(" | ")
    }

    /// The index of a canonical tuple.
    pub fn index_of(&self, tuple: &[Element]) -> Option<usize> {
        let (mut lo, mut hi) = (0, self.len());
        while lo < hi {
            let mid = (lo + hi) / 2;
            match self.state(mid).cmp(tuple) {
                std::cmp::Ordering::Less => lo = mid + 1,
                std::cmp::Ordering::Greater => hi = mid,
                std::cmp::Ordering::Equal => return Some(mid),
            }
        }
        None
    }

    fn scratch(&self) -> Scratch {
        Scratch {
            candidates: Vec::with_capacity(self.group.order()),
            next: Vec::with_capacity(self.group.order()),
            tuple: vec![0; self.width],
            canonical: vec![0; self.width],
        }
    }

    /// The lexicographically least conjugate of `s.tuple`, into `s.canonical`.
    fn canonicalise(&self, s: &mut Scratch) {
        s.candidates.clear();
        s.candidates.extend(self.group.elements());
        for k in 0..self.width {
            let x = s.tuple[k];
            let least = s
                .candidates
                .iter()
                .map(|&g| self.conj(g, x))
                .min()
                .unwrap_or(x);
            s.next.clear();
            for &g in &s.candidates {
                if self.conj(g, x) == least {
                    s.next.push(g);
                }
            }
            std::mem::swap(&mut s.candidates, &mut s.next);
            s.canonical[k] = least;
        }
    }

    /// The canonical representative of any tuple of the right length.
    pub fn canonical(&self, tuple: &[Element]) -> Vec<Element> {
        let mut s = self.scratch();
        s.tuple.copy_from_slice(tuple);
        self.canonicalise(&mut s);
        s.canonical
    }

    /// The value of a word at a tuple: generator k ↦ tuple[k].
    pub fn evaluate(&self, word: &Word, tuple: &[Element]) -> Element {
        let g = &self.group;
        word.letters().iter().fold(0, |acc, &x| {
            let e = tuple[x.unsigned_abs() as usize - 1];
            g.mul(acc, if x > 0 { e } else { g.inv(e) })
        })
    }

    /// The permutation [φ] ↦ [φ ∘ τ] of X_g as an image list. An error when τ does not fix
    /// the relation (an image is not a homomorphism) or has the wrong rank.
    pub fn permutation(&self, tau: &Automorphism) -> Result<Vec<u32>, DwError> {
        if tau.images().len() != self.width {
            return Err(DwError::Inconsistent(format!(
                "an automorphism of rank {} on X_{}",
                tau.images().len(),
                self.genus
            )));
        }
        let mut s = self.scratch();
        let mut out = Vec::with_capacity(self.len());
        for i in 0..self.len() {
            let t = self.state(i);
            for (k, w) in tau.images().iter().enumerate() {
                s.tuple[k] = self.evaluate(w, t);
            }
            self.canonicalise(&mut s);
            let j = self.index_of(&s.canonical).ok_or_else(|| {
                DwError::Inconsistent(format!(
                    "the image of state {i} ({}) is not a flat bundle",
                    self.describe(i)
                ))
            })?;
            out.push(j as u32);
        }
        Ok(out)
    }

    /// The twists of a generating set as permutations, named by their curves.
    pub fn generators(&self, set: GeneratingSet) -> Result<Vec<(Curve, Vec<u32>)>, DwError> {
        set.curves(self.genus)
            .into_iter()
            .map(|c| {
                let tau = twist(c, self.genus).ok_or_else(|| {
                    DwError::Inconsistent(format!("no curve {c} at genus {}", self.genus))
                })?;
                Ok((c, self.permutation(&tau)?))
            })
            .collect()
    }

    /// The vacuum subset {[φ] : φ(a_h) = 1 for all h}, increasing (state 0, the trivial
    /// bundle, first).
    pub fn vacuum(&self) -> Vec<u32> {
        (0..self.len())
            .filter(|&i| self.state(i).iter().step_by(2).all(|&x| x == 0))
            .map(|i| i as u32)
            .collect()
    }
}
