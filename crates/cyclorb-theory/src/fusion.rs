//! Fusion rules N_ab^c of a rank-r theory, stored as sorted outcome lists per ordered pair.

/// The fusion rules: for each ordered pair (a, b) the sorted labels c with N_ab^c ≠ 0 and
/// their multiplicities (all 1 in a theory with F- and R-symbols).
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct FusionRules {
    rank: usize,
    outcomes: Vec<Vec<usize>>,
    multiplicities: Vec<Vec<u32>>,
    duals: Vec<usize>,
}

/// Why a set of fusion triples cannot be used.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum FusionProblem {
    /// A label index is outside 0..rank.
    LabelOutOfRange(usize),
    /// Label `a` has no b with N_ab^0 ≠ 0.
    NoDual(usize),
}

impl FusionRules {
    /// Rules from the triples (a, b, c, N_ab^c) with N ≠ 0. The vacuum rules
    /// N_0a^a = N_a0^a = 1 are added; repeated triples keep the largest multiplicity.
    pub fn from_triples(
        rank: usize,
        triples: impl IntoIterator<Item = (usize, usize, usize, u32)>,
    ) -> Result<FusionRules, FusionProblem> {
        let mut table: Vec<Vec<(usize, u32)>> = vec![Vec::new(); rank * rank];
        let mut put = |a: usize, b: usize, c: usize, m: u32| {
            let slot = &mut table[a * rank + b];
            match slot.iter_mut().find(|(x, _)| *x == c) {
                Some(entry) => entry.1 = entry.1.max(m),
                None => slot.push((c, m)),
            }
        };
        for a in 0..rank {
            put(0, a, a, 1);
            put(a, 0, a, 1);
        }
        for (a, b, c, m) in triples {
            for x in [a, b, c] {
                if x >= rank {
                    return Err(FusionProblem::LabelOutOfRange(x));
                }
            }
            if m > 0 {
                put(a, b, c, m);
            }
        }
        let mut outcomes = Vec::with_capacity(rank * rank);
        let mut multiplicities = Vec::with_capacity(rank * rank);
        for mut slot in table {
            slot.sort_unstable();
            outcomes.push(slot.iter().map(|&(c, _)| c).collect());
            multiplicities.push(slot.iter().map(|&(_, m)| m).collect());
        }
        let mut rules = FusionRules {
            rank,
            outcomes,
            multiplicities,
            duals: Vec::new(),
        };
        rules.duals = (0..rank)
            .map(|a| {
                (0..rank)
                    .find(|&b| rules.fuses(a, b, 0))
                    .ok_or(FusionProblem::NoDual(a))
            })
            .collect::<Result<_, _>>()?;
        Ok(rules)
    }

    /// Number of labels.
    pub fn rank(&self) -> usize {
        self.rank
    }

    /// Sorted labels c with N_ab^c ≠ 0.
    pub fn outcomes(&self, a: usize, b: usize) -> &[usize] {
        if a >= self.rank || b >= self.rank {
            return &[];
        }
        &self.outcomes[a * self.rank + b]
    }

    /// N_ab^c.
    pub fn coefficient(&self, a: usize, b: usize, c: usize) -> u32 {
        if a >= self.rank || b >= self.rank {
            return 0;
        }
        let slot = a * self.rank + b;
        match self.outcomes[slot].binary_search(&c) {
            Ok(i) => self.multiplicities[slot][i],
            Err(_) => 0,
        }
    }

    /// N_ab^c ≠ 0.
    pub fn fuses(&self, a: usize, b: usize, c: usize) -> bool {
        self.coefficient(a, b, c) != 0
    }

    /// The dual a*: the first b with N_ab^0 ≠ 0.
    pub fn dual(&self, a: usize) -> usize {
        self.duals[a]
    }

    /// Whether every N_ab^c is 0 or 1.
    pub fn is_multiplicity_free(&self) -> bool {
        self.multiplicities.iter().flatten().all(|&m| m == 1)
    }

    /// Every (a, b, c, N_ab^c) with N ≠ 0, in lexicographic order.
    pub fn triples(&self) -> impl Iterator<Item = (usize, usize, usize, u32)> + '_ {
        (0..self.rank * self.rank).flat_map(move |slot| {
            let (a, b) = (slot / self.rank, slot % self.rank);
            self.outcomes[slot]
                .iter()
                .zip(&self.multiplicities[slot])
                .map(move |(&c, &m)| (a, b, c, m))
        })
    }
}
