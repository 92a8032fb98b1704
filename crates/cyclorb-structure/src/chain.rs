//! Schreier–Sims on the permutation parts of monomial matrices, carrying the monomial
//! lifts, with the diagonal kernel as a lattice.
//!
//! M = ⟨A_1, …, A_r⟩ is a finite group of monomial matrices (π, φ); P is its image in
//! Sym(d), K = ker(M → P) its diagonal part, a subgroup of (Z/m)^d. Levels k have base
//! points b_k, generator lists S_k ⊂ M, basic orbits Δ_k = b_k^{⟨π(S_k)⟩} and transversals
//! T_k (monomial lifts: b_k^{π(T_k[β])} = β). Sifting g from level k replaces it by
//! g·T_k[b_k^g]⁻¹; an element that passes every level keeps a diagonal residue.
//!
//! The construction is the deterministic one of cyclorb-cert (every pair (β ∈ Δ_k,
//! s ∈ S_k) tested once; Schreier generators sifted from level k + 1; a residue with a
//! non-trivial permutation becomes a strong generator, with a new base point if needed),
//! with one addition: every residue that is a non-trivial *diagonal* matrix (including
//! those of input generators already in the group) is inserted into a lattice K'. At the
//! end K'' is the closure of K' under the permutations of the input generators (the
//! normal closure in M: conjugating diag(x) by (π, φ) gives diag(y), y_{π(i)} = x_i).
//!
//! Why |P| = Π|Δ_k| and K = K'': Sims' criterion as in cyclorb-cert for the permutation
//! parts. For the lifts, with U_k = T_{L−1}⋯T_k (products in that order), induction from
//! the last level shows ⟨S_k⟩ ⊆ K''·U_k: for x = d·v·T_k[β] (d ∈ K'', v ∈ U_{k+1}) and
//! s ∈ S_k, T_k[β]·s = h·T_k[β^s] with h a Schreier generator, and h = r·w with
//! w ∈ U_{k+1} and r either a strong generator of level k + 1 or a diagonal residue in
//! K'; as K'' is normal, x·s ∈ K''·U_{k+1}·T_k. So every element of M is d·u with
//! d ∈ K'' and u a product of transversal elements; a diagonal one has u = 1, hence
//! K ⊆ K''; and K'' ⊆ K as K is normal. So |M| = |P|·|K|.

use num_bigint::BigUint;

use crate::error::StructureError;
use crate::lattice::ModLattice;
use crate::monomial::Monomial;

struct Level {
    base_point: u32,
    generators: Vec<Monomial>,
    transversal: Vec<Option<Monomial>>,
    /// The inverses of the transversal elements (sifting multiplies by them).
    inverses: Vec<Option<Monomial>>,
    orbit: Vec<u32>,
}

impl Level {
    fn new(base_point: u32, degree: usize) -> Level {
        let mut transversal = vec![None; degree];
        transversal[base_point as usize] = Some(Monomial::identity(degree));
        let inverses = transversal.clone();
        Level {
            base_point,
            generators: Vec::new(),
            transversal,
            inverses,
            orbit: vec![base_point],
        }
    }
}

/// The permutation a permutation of points induces on classes of points (`class_of[i] <
/// classes`), when it maps every class onto a class.
pub(crate) fn induced_permutation(
    perm: &[u32],
    class_of: &[u32],
    classes: usize,
) -> Option<Vec<u32>> {
    let mut induced = vec![u32::MAX; classes];
    for (i, &p) in perm.iter().enumerate() {
        let (from, to) = (class_of[i] as usize, class_of[p as usize]);
        if induced[from] != u32::MAX && induced[from] != to {
            return None;
        }
        induced[from] = to;
    }
    let mut seen = vec![false; classes];
    for &p in &induced {
        if p == u32::MAX || std::mem::replace(&mut seen[p as usize], true) {
            return None;
        }
    }
    Some(induced)
}

struct Test {
    level: usize,
    point: u32,
    generator: usize,
}

/// Base, strong generators, basic orbits and diagonal kernel of a monomial group.
pub struct MonomialChain {
    degree: usize,
    modulus: u32,
    levels: Vec<Level>,
    strong: Vec<Monomial>,
    kernel: ModLattice,
    /// The class of every point (the identity for a plain monomial group).
    class_of: Vec<u32>,
    /// A diagonal residue that was not constant on a class (its point).
    inconsistent: Option<u32>,
}

impl MonomialChain {
    /// The chain of ⟨generators⟩ (checked monomials of one degree, phases modulo m).
    pub fn new(degree: usize, modulus: u32, generators: &[Monomial]) -> MonomialChain {
        let identity = (0..degree as u32).collect();
        let chain = MonomialChain::build(degree, modulus, generators, &[0], identity, degree);
        debug_assert!(
            chain.inconsistent.is_none(),
            "singleton classes are always consistent"
        );
        chain
    }

    /// The chain with the base starting at `base` (distinct points) and the kernel held on
    /// classes (`class_of[i] < classes`, permuted by every generator); an error when a
    /// diagonal element of the group is not constant on some class, or the classes are not
    /// permuted by the generators.
    pub(crate) fn with_classes(
        degree: usize,
        modulus: u32,
        generators: &[Monomial],
        base: &[u32],
        class_of: Vec<u32>,
        classes: usize,
    ) -> Result<MonomialChain, StructureError> {
        let chain = MonomialChain::build(degree, modulus, generators, base, class_of, classes);
        match chain.inconsistent {
            Some(point) => Err(StructureError::Absent(format!(
                "a diagonal element of the group is not constant on the class of point {point}"
            ))),
            None => Ok(chain),
        }
    }

    fn build(
        degree: usize,
        modulus: u32,
        generators: &[Monomial],
        base: &[u32],
        class_of: Vec<u32>,
        classes: usize,
    ) -> MonomialChain {
        let mut chain = MonomialChain {
            degree,
            modulus,
            levels: Vec::new(),
            strong: Vec::new(),
            kernel: ModLattice::new(classes, modulus),
            class_of,
            inconsistent: None,
        };
        if degree == 0 {
            return chain;
        }
        chain.levels = base.iter().map(|&b| Level::new(b, degree)).collect();
        let mut queue = Vec::new();
        for g in generators {
            let (level, residue) = chain.sift(0, g.clone());
            if level == chain.levels.len() && residue.is_diagonal() {
                chain.insert_diagonal(&residue.phases);
            } else {
                chain.strong.push(g.clone());
                chain.push_generator(0, g.clone(), &mut queue);
                chain.run(&mut queue);
            }
        }
        let on_classes: Vec<Monomial> = generators
            .iter()
            .filter_map(|g| induced_permutation(&g.perm, &chain.class_of, classes))
            .map(|perm| Monomial {
                phases: vec![0; perm.len()],
                perm,
            })
            .collect();
        if on_classes.len() < generators.len() {
            chain.inconsistent.get_or_insert(0);
        }
        chain.kernel.close_under(&on_classes);
        chain
    }

    /// Insert a diagonal residue into K, on classes.
    fn insert_diagonal(&mut self, phases: &[u32]) {
        let mut on_classes = vec![u32::MAX; self.kernel.dim()];
        for (i, &x) in phases.iter().enumerate() {
            let slot = &mut on_classes[self.class_of[i] as usize];
            if *slot == u32::MAX {
                *slot = x;
            } else if *slot != x {
                self.inconsistent.get_or_insert(i as u32);
                return;
            }
        }
        self.kernel.insert(&on_classes);
    }

    fn push_generator(&mut self, level: usize, g: Monomial, queue: &mut Vec<Test>) {
        let l = &mut self.levels[level];
        l.generators.push(g);
        let generator = l.generators.len() - 1;
        queue.extend(l.orbit.iter().map(|&point| Test {
            level,
            point,
            generator,
        }));
    }

    /// Sift from level `from`: the level where it failed (the number of levels when it
    /// passed all) and the residue.
    fn sift(&self, from: usize, mut g: Monomial) -> (usize, Monomial) {
        for (k, level) in self.levels.iter().enumerate().skip(from) {
            let beta = g.perm[level.base_point as usize];
            if beta == level.base_point {
                continue;
            }
            match &level.inverses[beta as usize] {
                Some(inverse) => g.then_in_place(inverse, self.modulus),
                None => return (k, g),
            }
        }
        (self.levels.len(), g)
    }

    fn run(&mut self, queue: &mut Vec<Test>) {
        while let Some(Test {
            level,
            point,
            generator,
        }) = queue.pop()
        {
            let l = &self.levels[level];
            let rep = l.transversal[point as usize]
                .as_ref()
                .expect("queued points lie in the basic orbit");
            let tau = rep.then(&l.generators[generator], self.modulus);
            let gamma = tau.perm[l.base_point as usize];
            match &l.inverses[gamma as usize] {
                Some(existing) => {
                    let schreier = tau.then(existing, self.modulus);
                    self.add_schreier_generator(level, schreier, queue);
                }
                None => {
                    let l = &mut self.levels[level];
                    l.inverses[gamma as usize] = Some(tau.inverse(self.modulus));
                    l.transversal[gamma as usize] = Some(tau);
                    l.orbit.push(gamma);
                    queue.extend((0..l.generators.len()).map(|generator| Test {
                        level,
                        point: gamma,
                        generator,
                    }));
                }
            }
        }
    }

    fn add_schreier_generator(&mut self, level: usize, h: Monomial, queue: &mut Vec<Test>) {
        let (j, residue) = self.sift(level + 1, h);
        if j == self.levels.len() {
            let Some(moved) = residue
                .perm
                .iter()
                .enumerate()
                .position(|(x, &y)| x as u32 != y)
            else {
                self.insert_diagonal(&residue.phases);
                return;
            };
            self.levels.push(Level::new(moved as u32, self.degree));
        }
        self.strong.push(residue.clone());
        for k in level + 1..=j {
            self.push_generator(k, residue.clone(), queue);
        }
    }

    /// |P| = Π_k |Δ_k|.
    pub fn permutation_order(&self) -> BigUint {
        self.levels
            .iter()
            .map(|l| BigUint::from(l.orbit.len()))
            .product()
    }

    /// The base b_0 = 0, b_1, ….
    pub fn base(&self) -> Vec<u32> {
        self.levels.iter().map(|l| l.base_point).collect()
    }

    /// |Δ_0|, |Δ_1|, ….
    pub fn basic_orbit_lengths(&self) -> Vec<usize> {
        self.levels.iter().map(|l| l.orbit.len()).collect()
    }

    /// The strong generators (kept input generators and residues), as monomial lifts.
    pub fn strong_generators(&self) -> &[Monomial] {
        &self.strong
    }

    /// K, the diagonal part of the group, as a subgroup of (Z/m)^d (of (Z/m)^{classes}
    /// for a chain built with classes).
    pub fn kernel(&self) -> &ModLattice {
        &self.kernel
    }

    /// The class of every point.
    pub(crate) fn classes(&self) -> &[u32] {
        &self.class_of
    }

    /// The basic orbit of level k.
    pub(crate) fn basic_orbit(&self, k: usize) -> &[u32] {
        &self.levels[k].orbit
    }

    /// The transversal element of level k for a point of its basic orbit.
    pub(crate) fn transversal(&self, k: usize, point: u32) -> Option<&Monomial> {
        self.levels[k].transversal[point as usize].as_ref()
    }

    /// |M| = |P|·|K|.
    pub fn group_order(&self) -> BigUint {
        self.permutation_order() * self.kernel.order()
    }

    /// The order of M modulo scalars: |P|·|K| / |K ∩ scalars|.
    pub fn projective_order(&self) -> BigUint {
        self.group_order() / BigUint::from(self.kernel.scalar_order())
    }
}
