//! The orbit of a subset of X_g under permutations, breadth first.
//!
//! The vacuum vector of C[X_g] is the indicator of a subset, and a permutation matrix maps
//! indicators to indicators, so the orbit of the vacuum line is an orbit of subsets: no
//! field arithmetic. A finite set closed under each generator is closed under its inverse
//! too, so forward images saturate the orbit.

use hashbrown::HashSet;

use crate::error::DwError;

/// Every image of `seed` (a set of points, any order) under the group the permutations
/// generate, in breadth-first order, each as a sorted list; the seed first. An error when
/// the orbit has more than `limit` subsets (nothing is returned then).
pub fn subset_orbit(
    seed: &[u32],
    generators: &[(impl Sized, Vec<u32>)],
    limit: usize,
) -> Result<Vec<Vec<u32>>, DwError> {
    let mut first = seed.to_vec();
    first.sort_unstable();
    let mut seen: HashSet<Vec<u32>> = HashSet::new();
    seen.insert(first.clone());
    let mut orbit = vec![first];
    let mut next = 0;
    while next < orbit.len() {
        for (_, p) in generators {
            let mut image: Vec<u32> = orbit[next].iter().map(|&x| p[x as usize]).collect();
            image.sort_unstable();
            if !seen.contains(&image) {
                if orbit.len() == limit {
                    return Err(DwError::TooLarge(format!(
                        "the orbit has more than {limit} subsets"
                    )));
                }
                seen.insert(image.clone());
                orbit.push(image);
            }
        }
        next += 1;
    }
    Ok(orbit)
}
