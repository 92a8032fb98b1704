//! Conjugacy classes and centralisers.
//!
//! The class of x is {g x g⁻¹ : g ∈ G}; its representative here is its least element (in
//! the numbering of the table), and classes are listed by their representatives in
//! increasing order, so the class of the identity comes first. The centraliser
//! C(x) = {g : g x = x g} is a subgroup, listed as its elements in increasing order;
//! |[x]| · |C(x)| = |G|.

use crate::group::{Element, FiniteGroup};

/// One conjugacy class with the centraliser of its representative.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct ConjugacyClass {
    /// The least element of the class.
    pub representative: Element,
    /// Every element of the class, increasing.
    pub elements: Vec<Element>,
    /// C(representative), increasing.
    pub centraliser: Vec<Element>,
}

/// The elements of `within` that commute with x (a subgroup when `within` is one).
pub fn centraliser_in(group: &FiniteGroup, within: &[Element], x: Element) -> Vec<Element> {
    within
        .iter()
        .copied()
        .filter(|&g| group.mul(g, x) == group.mul(x, g))
        .collect()
}

/// The conjugacy classes of G, by increasing representative.
pub fn conjugacy_classes(group: &FiniteGroup) -> Vec<ConjugacyClass> {
    let all: Vec<Element> = group.elements().collect();
    let mut done = vec![false; group.order()];
    let mut classes = Vec::new();
    for x in group.elements() {
        if done[x as usize] {
            continue;
        }
        let mut elements: Vec<Element> = all.iter().map(|&g| group.conjugate(g, x)).collect();
        elements.sort_unstable();
        elements.dedup();
        for &y in &elements {
            done[y as usize] = true;
        }
        classes.push(ConjugacyClass {
            representative: x,
            elements,
            centraliser: centraliser_in(group, &all, x),
        });
    }
    classes
}
