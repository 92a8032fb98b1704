//! The outside check values of `fixtures/outside.toml`, for the tests of every crate (a
//! crate's test includes this file with `#[path = …] mod outside;`). Each value carries its
//! source in the table; a test names the value it reads, and a missing value fails the test.

#![allow(dead_code)] // each test crate reads only the kinds of value it checks

use serde::Deserialize;

const TABLE: &str = include_str!("../../fixtures/outside.toml");

/// A vacuum orbit: its number of lines and the prefactor λ of B = λ·G⁻¹ (exact text).
#[derive(Debug, Deserialize)]
pub struct Orbit {
    pub theory: String,
    pub genus: u32,
    pub lines: u64,
    pub prefactor: String,
    pub source: String,
}

/// The order of a projective image.
#[derive(Debug, Deserialize)]
pub struct Image {
    pub theory: String,
    pub genus: u32,
    pub order: u64,
    pub source: String,
}

/// dim V_g for g = 1, 2, ….
#[derive(Debug, Deserialize)]
pub struct Verlinde {
    pub theory: String,
    pub dimensions: Vec<u64>,
    pub source: String,
}

#[derive(Debug, Deserialize)]
struct Table {
    orbit: Vec<Orbit>,
    image: Vec<Image>,
    verlinde: Vec<Verlinde>,
}

fn table() -> Table {
    let t: Table = toml::from_str(TABLE).expect("fixtures/outside.toml parses");
    let sources = t.orbit.iter().map(|o| &o.source);
    let sources = sources
        .chain(t.image.iter().map(|i| &i.source))
        .chain(t.verlinde.iter().map(|v| &v.source));
    for s in sources {
        assert!(!s.trim().is_empty(), "every outside value names its source");
    }
    t
}

/// The published vacuum orbit of `theory` at `genus`.
pub fn orbit(theory: &str, genus: u32) -> Orbit {
    table()
        .orbit
        .into_iter()
        .find(|o| o.theory == theory && o.genus == genus)
        .unwrap_or_else(|| panic!("no outside orbit value for {theory} at genus {genus}"))
}

/// The published order of the projective image of `theory` at `genus`.
pub fn image_order(theory: &str, genus: u32) -> u64 {
    table()
        .image
        .into_iter()
        .find(|i| i.theory == theory && i.genus == genus)
        .map(|i| i.order)
        .unwrap_or_else(|| panic!("no outside image order for {theory} at genus {genus}"))
}

/// The published dimensions dim V_1, dim V_2, … of `theory`.
pub fn verlinde(theory: &str) -> Vec<u64> {
    table()
        .verlinde
        .into_iter()
        .find(|v| v.theory == theory)
        .map(|v| v.dimensions)
        .unwrap_or_else(|| panic!("no outside Verlinde dimensions for {theory}"))
}

/// Every theory with published Verlinde dimensions.
pub fn verlinde_theories() -> Vec<String> {
    table().verlinde.into_iter().map(|v| v.theory).collect()
}
