//! The lines of the orbit route: the saturated orbit of the vacuum line, extended when
//! needed by the orbits of coordinate lines ⟨e_i⟩ and of the all-ones line until the
//! faithfulness lemma of `cyclorb-cert` applies.
//!
//! A union of orbits is still closed under the generators, so the projective image acts on
//! it, faithfully once it holds a basis with connected supports. The extension is needed
//! when the vacuum orbit lies in a proper invariant subspace (for a pointed theory with a
//! charge conjugation, the vacuum only sees the conjugation-even blocks). With every ⟨e_i⟩
//! and the all-ones line 𝟙 = Σ e_i in the union the lemma always applies: if the supports
//! split the basis into classes, V is the direct sum of the classes' spans and each line
//! lies in one of them; 𝟙 lies in one, say V_1, and Σ e_i = 𝟙 forces every e_i into V_1.
//! Orbits are disjoint or equal, so a seed line already in the union is skipped.

use cyclorb_cert::{faithfulness_proof, CertError, LineSet};
use cyclorb_field::Cyc;
use cyclorb_orbit::{Orbit, OrbitOptions, OrbitProblem, Seed, Silent};

/// One saturated orbit, its problem and its first index in the union.
struct Part<'a> {
    problem: Held<'a, OrbitProblem>,
    orbit: Held<'a, Orbit>,
    start: usize,
}

/// Owned or borrowed (the vacuum orbit belongs to the caller).
enum Held<'a, T> {
    Borrowed(&'a T),
    Owned(T),
}

impl<T> std::ops::Deref for Held<'_, T> {
    type Target = T;
    fn deref(&self) -> &T {
        match self {
            Held::Borrowed(t) => t,
            Held::Owned(t) => t,
        }
    }
}

/// A union of saturated orbits, the vacuum's first; line 0 is the vacuum line.
pub struct OrbitLines<'a> {
    parts: Vec<Part<'a>>,
    len: usize,
    /// The seeds of the orbits added after the vacuum's (e.g. "e_3", "all-ones").
    added: Vec<String>,
}

impl<'a> OrbitLines<'a> {
    fn new(problem: &'a OrbitProblem, vacuum: &'a Orbit) -> OrbitLines<'a> {
        OrbitLines {
            parts: vec![Part {
                problem: Held::Borrowed(problem),
                orbit: Held::Borrowed(vacuum),
                start: 0,
            }],
            len: vacuum.len(),
            added: Vec::new(),
        }
    }

    fn push(&mut self, problem: OrbitProblem, orbit: Orbit, seed: String) {
        let start = self.len;
        self.len += orbit.len();
        self.parts.push(Part {
            problem: Held::Owned(problem),
            orbit: Held::Owned(orbit),
            start,
        });
        self.added.push(seed);
    }

    /// The seeds of the orbits added to the vacuum's.
    pub fn added_seeds(&self) -> &[String] {
        &self.added
    }

    /// The number of lines in the vacuum's orbit.
    pub fn vacuum_orbit_len(&self) -> usize {
        self.parts[0].orbit.len()
    }

    /// The permutations the generators induce on the union, each orbit's found by the orbit
    /// engine's exact lookup (`OrbitProblem::induced_permutations`), not through keys of the
    /// lines modulo a prime as `cyclorb-cert` finds them; orbits are closed, so each part
    /// maps to itself.
    pub fn exact_permutations(&self, threads: usize) -> Result<Vec<Vec<u32>>, String> {
        let mut out: Vec<Vec<u32>> = Vec::new();
        for part in &self.parts {
            let local = part
                .problem
                .induced_permutations(&part.orbit, threads)
                .map_err(|e| e.to_string())?;
            out.resize(local.len(), Vec::with_capacity(self.len));
            for (all, perm) in out.iter_mut().zip(local) {
                all.extend(perm.into_iter().map(|i| i + part.start as u32));
            }
        }
        Ok(out)
    }
}

impl LineSet for OrbitLines<'_> {
    fn len(&self) -> usize {
        self.len
    }

    fn line(&self, index: usize) -> Result<Vec<Cyc>, CertError> {
        let part = self
            .parts
            .iter()
            .rev()
            .find(|p| p.start <= index)
            .filter(|_| index < self.len)
            .ok_or_else(|| CertError::Input(format!("line {index} of {}", self.len)))?;
        part.problem
            .line(&part.orbit, index - part.start)
            .map_err(|e| CertError::Input(e.to_string()))
    }
}

/// Which candidate seeds (coordinate lines e_0, …, e_{d−1}, then the all-ones line) the
/// orbit already holds; lines come normalised with first non-zero entry 1.
fn mark_seeds(problem: &OrbitProblem, orbit: &Orbit, held: &mut [bool]) -> Result<(), String> {
    let d = problem.dimension();
    for k in 0..orbit.len() {
        let v = problem.line(orbit, k).map_err(|e| e.to_string())?;
        let mut non_zero = v.iter().enumerate().filter(|(_, x)| !x.is_zero());
        if let (Some((i, _)), None) = (non_zero.next(), non_zero.next()) {
            held[i] = true;
        }
        if v.iter().all(Cyc::is_one) {
            held[d] = true;
        }
    }
    Ok(())
}

/// The vacuum orbit, extended by further saturated orbits (at most `budget` lines in all)
/// until the faithfulness lemma applies: `Ok(Ok(lines))`, or `Ok(Err(reason))` when the
/// budget or the candidate seeds run out first.
pub fn faithful_lines<'a>(
    problem: &'a OrbitProblem,
    vacuum: &'a Orbit,
    budget: usize,
    threads: usize,
) -> Result<Result<OrbitLines<'a>, String>, String> {
    let field = problem.field();
    let mut lines = OrbitLines::new(problem, vacuum);
    let proved = |lines: &OrbitLines| -> Result<bool, String> {
        Ok(faithfulness_proof(field, lines)
            .map_err(|e| e.to_string())?
            .is_some())
    };
    if proved(&lines)? {
        return Ok(Ok(lines));
    }
    let d = problem.dimension();
    let mut held = vec![false; d + 1];
    mark_seeds(problem, vacuum, &mut held)?;
    for candidate in 0..=d {
        if held[candidate] {
            continue;
        }
        let (name, seed) = if candidate < d {
            (
                format!("e_{candidate}"),
                Seed::basis_vector(field, d, candidate),
            )
        } else {
            let vector = vec![field.one(); d];
            let seed = Seed {
                conductor: field.conductor(),
                vector,
            };
            ("all-ones".to_string(), seed)
        };
        let room = budget.saturating_sub(lines.len());
        let seeded =
            OrbitProblem::new(problem.generators().clone(), &seed).map_err(|e| e.to_string())?;
        let options = OrbitOptions {
            limit: Some(room),
            threads,
            ..OrbitOptions::default()
        };
        let orbit = seeded
            .enumerate(&options, &mut Silent)
            .map_err(|e| e.to_string())?;
        if !orbit.is_saturated() {
            return Ok(Err(format!(
                "the vacuum orbit ({} lines) does not prove faithfulness, and the orbit of {name} \
                 does not close within the remaining {room} of {budget} lines",
                vacuum.len()
            )));
        }
        mark_seeds(&seeded, &orbit, &mut held)?;
        lines.push(seeded, orbit, name);
        if proved(&lines)? {
            return Ok(Ok(lines));
        }
    }
    Ok(Err(format!(
        "no union of the orbits of the vacuum, the coordinate lines and the all-ones line \
         proves faithfulness modulo the first key prime ({} lines)",
        lines.len()
    )))
}
