//! The built-in groups and their names.
//!
//! | name | group | as permutations of |
//! | --- | --- | --- |
//! | `ZN` (N ≥ 1) | cyclic of order N | N points: the N-cycle (0 1 … N−1) |
//! | `DN` (N ≥ 3) | dihedral of order 2N (symmetries of the N-gon) | N points: rotation i ↦ i+1, reflection i ↦ −i |
//! | `SN` (1 ≤ N ≤ 6) | symmetric | N points: (0 1) and (0 1 … N−1) |
//! | `AN` (3 ≤ N ≤ 6) | alternating | N points: the 3-cycles (0 1 k) |
//! | `Q8` | quaternion group {±1, ±i, ±j, ±k} | 8 points: left multiplication by i and j |
//! | `AxB` | direct product of any of these | — |
//!
//! So `dw:D4` is the gauge group of order 8 and `Z2xZ2` the Klein four-group.

use crate::error::DwError;
use crate::group::FiniteGroup;

/// The group of a name in the table above, e.g. `S3`, `D4`, `Q8`, `Z2xZ2`.
pub fn builtin_group(name: &str) -> Result<FiniteGroup, DwError> {
    let factors: Vec<&str> = name.split('x').collect();
    let mut group = simple_group(factors[0])?;
    for f in &factors[1..] {
        group = group.direct_product(&simple_group(f)?)?;
    }
    Ok(group)
}

/// The names `cyclorb theories` lists as examples.
pub const EXAMPLES: &[&str] = &["Z2", "Z3", "Z2xZ2", "S3", "D4", "Q8", "A4", "S4"];

fn parameter(name: &str, prefix: char) -> Option<Result<usize, DwError>> {
    let rest = name.strip_prefix(prefix)?;
    Some(
        rest.parse::<usize>()
            .map_err(|_| DwError::UnknownGroup(format!("{name} ({rest:?} is not a number)"))),
    )
}

fn simple_group(name: &str) -> Result<FiniteGroup, DwError> {
    let out_of_range = |what: &str| Err(DwError::UnknownGroup(format!("{name} ({what})")));
    if name == "Q8" {
        return quaternion();
    }
    if let Some(n) = parameter(name, 'Z') {
        let n = n?;
        if n == 0 || n > crate::group::MAX_ORDER {
            return out_of_range("need 1 ≤ N ≤ 1024");
        }
        let cycle: Vec<usize> = (0..n).map(|i| (i + 1) % n).collect();
        return FiniteGroup::from_permutations(name, n, &[cycle]);
    }
    if let Some(n) = parameter(name, 'D') {
        let n = n?;
        if !(3..=512).contains(&n) {
            return out_of_range("the dihedral group DN needs 3 ≤ N ≤ 512");
        }
        let rotation: Vec<usize> = (0..n).map(|i| (i + 1) % n).collect();
        let reflection: Vec<usize> = (0..n).map(|i| (n - i) % n).collect();
        return FiniteGroup::from_permutations(name, n, &[rotation, reflection]);
    }
    if let Some(n) = parameter(name, 'S') {
        let n = n?;
        if !(1..=6).contains(&n) {
            return out_of_range("the symmetric group SN needs 1 ≤ N ≤ 6");
        }
        let mut gens = vec![(0..n).map(|i| (i + 1) % n).collect::<Vec<usize>>()];
        if n >= 2 {
            let mut swap: Vec<usize> = (0..n).collect();
            swap.swap(0, 1);
            gens.push(swap);
        }
        return FiniteGroup::from_permutations(name, n, &gens);
    }
    if let Some(n) = parameter(name, 'A') {
        let n = n?;
        if !(3..=6).contains(&n) {
            return out_of_range("the alternating group AN needs 3 ≤ N ≤ 6");
        }
        let gens: Vec<Vec<usize>> = (2..n)
            .map(|k| {
                let mut p: Vec<usize> = (0..n).collect();
                p[0] = 1;
                p[1] = k;
                p[k] = 0;
                p
            })
            .collect();
        return FiniteGroup::from_permutations(name, n, &gens);
    }
    Err(DwError::UnknownGroup(format!(
        "{name:?} (built-ins: ZN, DN, SN, AN, Q8 and products AxB such as Z2xZ2)"
    )))
}

/// Product of quaternion units, each ±1, ±i, ±j, ±k coded as 4·sign + unit (unit 0 = 1,
/// 1 = i, 2 = j, 3 = k; sign 1 = minus).
fn quaternion_product(x: usize, y: usize) -> usize {
    // unit table: (sign, unit) of u·v for units u, v (i² = j² = k² = ijk = −1)
    const UNIT: [[(usize, usize); 4]; 4] = [
        [(0, 0), (0, 1), (0, 2), (0, 3)],
        [(0, 1), (1, 0), (0, 3), (1, 2)],
        [(0, 2), (1, 3), (1, 0), (0, 1)],
        [(0, 3), (0, 2), (1, 1), (1, 0)],
    ];
    let (s, u) = UNIT[x % 4][y % 4];
    4 * ((s + x / 4 + y / 4) % 2) + u
}

/// Q8 as the permutations of its eight elements by left multiplication with i and j.
fn quaternion() -> Result<FiniteGroup, DwError> {
    let left = |a: usize| {
        (0..8)
            .map(|x| quaternion_product(a, x))
            .collect::<Vec<usize>>()
    };
    FiniteGroup::from_permutations("Q8", 8, &[left(1), left(2)])
}
