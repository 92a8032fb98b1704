//! The comb basis of the genus-g block space (docs/genus-g.md §1).
//!
//! Σ_g is a sphere with punctures p₀ … p_{2g−1}, p_{2h} glued to p_{2h+1} (handle h). A basis
//! vector is a splitting tree with leaves (a₀, a₀*, a₁, a₁*, …) and total charge 0, of comb
//! shape: the stick H_h = (a_h a_h*) carries b_h, C₁ = H₀ (x₁ = b₀), C_m = (C_{m−1}, H_{m−1})
//! carries x_m (m = 2..g) and x_g = 0. The vacuum is the tree with every label 0.

use hashbrown::HashMap;

use cyclorb_theory::Theory;

use crate::error::McgError;

/// One labelled comb tree: loops a_h, sticks b_h and backbone x_m.
#[derive(Clone, Debug, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub struct CombState {
    /// a_h, the label running around handle h (h = 0..g).
    pub loops: Vec<usize>,
    /// b_h ∈ a_h ⊗ a_h*, the stick of handle h.
    pub sticks: Vec<usize>,
    /// x_m for m = 1..=g stored at index m − 1: x₁ = b₀ and x_g = 0.
    pub backbone: Vec<usize>,
}

impl CombState {
    /// x_m (1-based as in the text).
    pub fn x(&self, m: usize) -> usize {
        self.backbone[m - 1]
    }

    /// The vertices (a, b → c) of the tree: the sticks (a_h, a_h* → b_h) and the backbone
    /// (x_{m−1}, b_{m−1} → x_m), m = 2..g.
    pub fn vertices(&self, theory: &Theory) -> Vec<(usize, usize, usize)> {
        let g = self.loops.len();
        let mut v: Vec<_> = (0..g)
            .map(|h| (self.loops[h], theory.dual(self.loops[h]), self.sticks[h]))
            .collect();
        for m in 2..=g {
            v.push((self.x(m - 1), self.sticks[m - 1], self.x(m)));
        }
        v
    }

    /// The labels as text: `a=(…) b=(…) x=(…)` with the theory's label names; x lists only
    /// the free backbone labels x₂ … x_{g−1}.
    pub fn describe(&self, theory: &Theory) -> String {
        let names = |v: &[usize]| {
            v.iter()
                .map(|&l| theory.label(l))
                .collect::<Vec<_>>()
                .join(",")
        };
        let g = self.loops.len();
        let free = if g > 2 {
            &self.backbone[1..g - 1]
        } else {
            &[][..]
        };
        format!(
            "a=({}) b=({}) x=({})",
            names(&self.loops),
            names(&self.sticks),
            names(free)
        )
    }
}

/// The ordered comb basis of the genus-g block space, with its index.
#[derive(Clone, Debug)]
pub struct CombBasis {
    genus: usize,
    states: Vec<CombState>,
    index: HashMap<CombState, usize>,
}

impl CombBasis {
    /// Every labelled comb tree of genus g ≥ 1, in lexicographic order of (loops, sticks, backbone);
    /// the vacuum comes first.
    pub fn new(theory: &Theory, genus: usize) -> Result<CombBasis, McgError> {
        if genus == 0 {
            return Err(McgError::Genus(genus));
        }
        let r = theory.rank();
        // choices per handle: (a, b) with b ∈ a ⊗ a*
        let handles: Vec<(usize, usize)> = (0..r)
            .flat_map(|a| {
                theory
                    .fusion_outcomes(a, theory.dual(a))
                    .iter()
                    .map(move |&b| (a, b))
            })
            .collect();
        let mut states = Vec::new();
        let mut partial: Vec<(Vec<(usize, usize)>, usize)> = vec![(Vec::new(), 0)];
        // build handle by handle, tracking the backbone charge x_m
        for h in 0..genus {
            let mut next = Vec::new();
            for (chosen, charge) in &partial {
                for &(a, b) in &handles {
                    let charges: Vec<usize> = if h == 0 {
                        vec![b]
                    } else {
                        theory.fusion_outcomes(*charge, b).to_vec()
                    };
                    for x in charges {
                        let mut c = chosen.clone();
                        c.push((a, b));
                        c.push((x, usize::MAX));
                        next.push((c, x));
                    }
                }
            }
            partial = next;
        }
        for (chosen, charge) in partial {
            if charge != 0 {
                continue;
            }
            let mut loops = Vec::with_capacity(genus);
            let mut sticks = Vec::with_capacity(genus);
            let mut backbone = Vec::with_capacity(genus);
            for pair in chosen.chunks(2) {
                loops.push(pair[0].0);
                sticks.push(pair[0].1);
                backbone.push(pair[1].0);
            }
            states.push(CombState {
                loops,
                sticks,
                backbone,
            });
        }
        states.sort();
        states.dedup();
        let index = states
            .iter()
            .cloned()
            .enumerate()
            .map(|(i, s)| (s, i))
            .collect();
        Ok(CombBasis {
            genus,
            states,
            index,
        })
    }

    /// The genus g.
    pub fn genus(&self) -> usize {
        self.genus
    }

    /// dim V_g.
    pub fn dimension(&self) -> usize {
        self.states.len()
    }

    /// The basis vectors in order.
    pub fn states(&self) -> &[CombState] {
        &self.states
    }

    /// The position of a state, if it is a valid comb tree.
    pub fn position(&self, s: &CombState) -> Option<usize> {
        self.index.get(s).copied()
    }

    /// Index of the vacuum (all labels 0).
    pub fn vacuum(&self) -> usize {
        let g = self.genus;
        self.position(&CombState {
            loops: vec![0; g],
            sticks: vec![0; g],
            backbone: vec![0; g],
        })
        .expect("the vacuum tree is always a basis vector")
    }
}
