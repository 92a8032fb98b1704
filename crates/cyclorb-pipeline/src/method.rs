//! How the vacuum orbit is decided: the three routes of `cyclorb orbit --method`.

use std::fmt;
use std::str::FromStr;

use serde::{Deserialize, Serialize};

/// A route to the vacuum orbit. Every route that closes the orbit proves it closed; they
/// differ in what they need and what they cost.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Default, Serialize, Deserialize)]
#[cfg_attr(feature = "clap", derive(clap::ValueEnum))]
#[serde(rename_all = "lowercase")]
pub enum OrbitMethod {
    /// List every line of the orbit (breadth-first saturation, any theory).
    #[default]
    Enumerate,
    /// Count the lines through the structure of the representation (monomial twists, or
    /// permutations of flat bundles for `dw:` theories) without listing them.
    Structure,
    /// The orbit of a Deligne product A*B from the orbits of its two factors.
    Product,
}

impl OrbitMethod {
    /// Every method, in the order the help lists them.
    pub const ALL: [OrbitMethod; 3] = [
        OrbitMethod::Enumerate,
        OrbitMethod::Structure,
        OrbitMethod::Product,
    ];

    /// The name on the command line and in JSON (`method`).
    pub fn name(self) -> &'static str {
        match self {
            OrbitMethod::Enumerate => "enumerate",
            OrbitMethod::Structure => "structure",
            OrbitMethod::Product => "product",
        }
    }
}

impl fmt::Display for OrbitMethod {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.name())
    }
}

impl FromStr for OrbitMethod {
    type Err = String;

    fn from_str(s: &str) -> Result<Self, Self::Err> {
        OrbitMethod::ALL
            .into_iter()
            .find(|m| m.name() == s)
            .ok_or_else(|| {
                format!("unknown orbit method {s:?} (known: enumerate, structure, product)")
            })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn names_round_trip_through_text_and_json() {
        for m in OrbitMethod::ALL {
            assert_eq!(m.name().parse::<OrbitMethod>(), Ok(m));
            let json = serde_json::to_string(&m).unwrap();
            assert_eq!(json, format!("\"{}\"", m.name()));
        }
        assert!("list".parse::<OrbitMethod>().is_err());
    }
}
