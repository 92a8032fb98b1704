//! The curves of the Humphries and Lickorish generating sets (docs/genus-g.md §2) and how they meet.

use std::fmt;

/// A simple closed curve on Σ_g used as a Dehn-twist generator.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub enum Curve {
    /// α_h: the meridian around p_{2h}, carrying the loop label a_h.
    Alpha(usize),
    /// β_h: the longitude of handle h (through the handle, across its stick).
    Beta(usize),
    /// γ_h: around p_{2h+1} and p_{2h+2}, between handles h and h+1.
    Gamma(usize),
}

impl fmt::Display for Curve {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            Curve::Alpha(h) => write!(f, "alpha{h}"),
            Curve::Beta(h) => write!(f, "beta{h}"),
            Curve::Gamma(h) => write!(f, "gamma{h}"),
        }
    }
}

impl Curve {
    /// Geometric intersection number with another curve of the sets: 1 for α_h∩β_h,
    /// β_h∩γ_h and γ_h∩β_{h+1}; 0 otherwise (including a curve with itself).
    pub fn meets_once(self, other: Curve) -> bool {
        use Curve::*;
        let pair = |x: Curve, y: Curve| match (x, y) {
            (Alpha(h), Beta(k)) => h == k,
            (Beta(h), Gamma(k)) => h == k || h == k + 1,
            _ => false,
        };
        pair(self, other) || pair(other, self)
    }
}

/// Which generating set of Dehn twists to use.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum GeneratingSet {
    /// α₀, α₁ (g ≥ 2), every β_h, every γ_h: 2g + 1 curves (Humphries 1979).
    Humphries,
    /// Every α_h, β_h, γ_h: 3g − 1 curves (Lickorish 1964).
    Lickorish,
}

impl GeneratingSet {
    /// The curves of the set at genus g, ordered α, β, γ.
    pub fn curves(self, genus: usize) -> Vec<Curve> {
        let alphas = match self {
            GeneratingSet::Humphries => genus.min(2),
            GeneratingSet::Lickorish => genus,
        };
        let mut v: Vec<Curve> = (0..alphas).map(Curve::Alpha).collect();
        v.extend((0..genus).map(Curve::Beta));
        v.extend((0..genus.saturating_sub(1)).map(Curve::Gamma));
        v
    }

    /// Every generating set, in the order of [`GeneratingSet::NAMES`].
    pub const ALL: [GeneratingSet; 2] = [GeneratingSet::Humphries, GeneratingSet::Lickorish];

    /// The names of the sets as used on the command line and in files.
    pub const NAMES: [&'static str; 2] = ["humphries", "lickorish"];

    /// The set's name as used on the command line and in files.
    pub fn name(self) -> &'static str {
        match self {
            GeneratingSet::Humphries => Self::NAMES[0],
            GeneratingSet::Lickorish => Self::NAMES[1],
        }
    }
}

impl std::str::FromStr for GeneratingSet {
    type Err = String;

    /// The set of a name (`humphries`, `lickorish`); the error names the known ones. The one
    /// parser of generating-set names (command line, sweep plans, certificates).
    fn from_str(name: &str) -> Result<GeneratingSet, String> {
        GeneratingSet::ALL
            .into_iter()
            .find(|set| set.name() == name)
            .ok_or_else(|| {
                format!(
                    "unknown generating set {name:?} (known: {})",
                    GeneratingSet::NAMES.join(", ")
                )
            })
    }
}
