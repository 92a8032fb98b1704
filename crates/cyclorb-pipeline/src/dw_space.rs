//! Dijkgraaf–Witten theories `dw:GROUP`: the space C[X_g] of functions on flat G-bundles
//! and the Dehn twists as permutation matrices over Q (monomial over Q(ζ_{N²}) for the
//! twisted `dw:ZN:P`). The generators and the seed (the indicator of the vacuum subset) go
//! to the same orbit engine as every other theory; the image order is Schreier–Sims on the
//! permutations of X_g, and the Poincaré sum is written over the orbitals of that
//! permutation group.

use std::path::Path;

use cyclorb_cert::{CommutantOptions, StabiliserChain};
use cyclorb_dw::{
    builtin_group, check_relations, check_twisted_relations, subset_orbit, CyclicCocycle, DwError,
    FiniteGroup, FlatBundles, Orbitals, RelationCheck, SizeBound, TwistedBundles,
};
use cyclorb_field::CyclotomicField;
use cyclorb_matrix::Operator;
use cyclorb_mcg::{Curve, GeneratingSet};
use cyclorb_orbit::{
    GeneratorSet, InvariantReport, LabelledEntry, OrbitProblem, PoincareReport, Seed,
};
use cyclorb_structure::{Monomial, MonomialChain};
use num_bigint::BigUint;

use crate::image::ImageRoute;
use crate::proof;
use crate::space::parse_set;

/// The spec prefix of Dijkgraaf–Witten theories.
const PREFIX: &str = "dw:";

/// Largest dimension whose invariant matrices (and B) are printed entry by entry.
pub const MATRIX_PRINT_LIMIT: usize = 128;

/// Whether a spec names a Dijkgraaf–Witten theory.
pub fn is_dw(spec: &str) -> bool {
    spec.starts_with(PREFIX)
}

/// The group and, for `dw:ZN:P`, the cocycle ω_p of the twisted theory D^{ω_p}(Z_N).
pub fn theory_of(spec: &str) -> Result<(FiniteGroup, Option<CyclicCocycle>), String> {
    let rest = spec.strip_prefix(PREFIX).unwrap_or(spec);
    if rest.ends_with(".json") || rest.contains('/') {
        let group = cyclorb_dw::read_group_file(Path::new(rest)).map_err(|e| e.to_string())?;
        return Ok((group, None));
    }
    let Some((name, level)) = rest.split_once(':') else {
        return Ok((
            builtin_group(rest).map_err(|e| format!("{spec}: {e}"))?,
            None,
        ));
    };
    let twisted_form =
        || format!("{spec}: a twisted theory is dw:ZN:P, Z_N cyclic and 0 ≤ P < N (e.g. dw:Z2:1)");
    let n: u32 = name
        .strip_prefix('Z')
        .and_then(|n| n.parse().ok())
        .ok_or_else(twisted_form)?;
    let p: u32 = level.parse().map_err(|_| twisted_form())?;
    let cocycle = CyclicCocycle::new(n, p).map_err(|e| format!("{spec}: {e}"))?;
    let group = builtin_group(name).map_err(|e| format!("{spec}: {e}"))?;
    Ok((group, Some(cocycle)))
}

/// The rows `cyclorb theories` lists for Dijkgraaf–Witten theories.
pub fn catalogue() -> Vec<(String, String)> {
    vec![
        (
            "dw:GROUP".into(),
            format!(
                "Dijkgraaf–Witten theory D(G) as a permutation model on flat G-bundles (orbit, image, commutant, witness, twists); GROUP = ZN, DN (order 2N), SN (N ≤ 6), AN (3 ≤ N ≤ 6), Q8 or a product AxB, e.g. {}",
                cyclorb_dw::EXAMPLES.join(", ")
            ),
        ),
        (
            "dw:ZN:P".into(),
            "twisted Dijkgraaf–Witten theory D^{ω_p}(Z_N) (0 ≤ P < N ≤ 32): the permutations of dw:ZN with phases in Q(ζ_N²), e.g. dw:Z2:1 (double semion)".into(),
        ),
        (
            "dw:FILE.json".into(),
            format!(
                "Dijkgraaf–Witten theory of a group file: {}",
                cyclorb_dw::GROUP_FILE_FORMAT
            ),
        ),
    ]
}

/// The projective image order of a `dw:` theory and the chain that proves it.
pub struct DwImage {
    /// The order.
    pub order: BigUint,
    /// `permutation-schreier-sims` or `monomial-schreier-sims`.
    pub route: ImageRoute,
    /// The base of the chain.
    pub base: Vec<u32>,
    /// Its basic orbit lengths.
    pub basic_orbit_lengths: Vec<usize>,
    /// The number of strong generators.
    pub strong_generators: usize,
}

/// X_g of a `dw:` spec with the twists of a generating set: permutations, and for the
/// twisted `dw:ZN:P` their phases.
pub struct DwSpace {
    spec: String,
    bundles: FlatBundles,
    twists: Vec<(Curve, Vec<u32>)>,
    twisting: Option<Twisting>,
}

/// The phases of a twisted theory: the cocycle and, per generator (in the order of
/// `twists`), the exponent of ζ_{N²} of each row.
struct Twisting {
    cocycle: CyclicCocycle,
    phases: Vec<Vec<u32>>,
}

impl DwSpace {
    /// Build X_g (refused beyond the default size bound, with the exact size) and the twists
    /// of the named set.
    pub fn new(spec: &str, genus: usize, set: &str) -> Result<DwSpace, String> {
        DwSpace::with_set(spec, genus, parse_set(set)?)
    }

    /// The same with the generating set given. The relations of `twists --check` are
    /// proved on the generators before they are used (an error names a failing one); the
    /// answers then carry `verified: true`.
    pub fn with_set(spec: &str, genus: usize, set: GeneratingSet) -> Result<DwSpace, String> {
        let (group, cocycle) = theory_of(spec)?;
        let bundles =
            FlatBundles::new(&group, genus, SizeBound::default()).map_err(|e| match e {
                DwError::SpaceTooLarge { .. } => format!("{spec} at genus {genus}: {e}"),
                other => other.to_string(),
            })?;
        let twists = bundles.generators(set).map_err(|e| e.to_string())?;
        let twisting = match cocycle {
            None => None,
            Some(cocycle) => {
                let phases = TwistedBundles::new(&bundles, &cocycle)
                    .and_then(|t| t.generators(set))
                    .map_err(|e| e.to_string())?
                    .into_iter()
                    .map(|(_, m)| m.phases)
                    .collect();
                Some(Twisting { cocycle, phases })
            }
        };
        let space = DwSpace {
            spec: spec.to_string(),
            bundles,
            twists,
            twisting,
        };
        let checks = space.relations().map_err(|e| format!("{spec}: {e}"))?;
        if let Some(failed) = checks.iter().find(|c| !c.ok) {
            return Err(format!(
                "{spec} at genus {genus}: internal check failed: the relation {} does not hold on the generators",
                failed.name
            ));
        }
        proof::record_proved();
        Ok(space)
    }

    /// Every relation of `twists --check` (docs/dijkgraaf-witten.md): on the free group,
    /// and on X_g as permutations, or up to scalars as monomial matrices when twisted.
    pub fn relations(&self) -> Result<Vec<RelationCheck>, DwError> {
        match &self.twisting {
            None => check_relations(&self.bundles),
            Some(t) => check_twisted_relations(&self.bundles, &t.cocycle),
        }
    }

    /// Whether this is a twisted theory `dw:ZN:P`.
    pub fn is_twisted(&self) -> bool {
        self.twisting.is_some()
    }

    /// The conductor of the field of the entries: 1 (permutations), or N² when twisted.
    pub fn conductor(&self) -> u32 {
        self.twisting.as_ref().map_or(1, |t| t.cocycle.modulus())
    }

    /// The group's multiplication table as text lines (name, order, the cocycle of a twisted
    /// theory, then one row per element), for hashing what a result depends on.
    pub fn group_data(&self) -> Vec<String> {
        let g = self.bundles.group();
        let mut lines = vec![format!("group {} order {}", g.name(), g.order())];
        if let Some(t) = &self.twisting {
            lines.push(format!(
                "3-cocycle omega_{} of Z_{}",
                t.cocycle.level(),
                t.cocycle.order()
            ));
        }
        for a in g.elements() {
            let row: Vec<String> = g.elements().map(|b| g.mul(a, b).to_string()).collect();
            lines.push(row.join(" "));
        }
        lines
    }

    /// The spec the space was built from (`dw:S3`, `dw:Z2:1`, …).
    pub fn spec(&self) -> &str {
        &self.spec
    }

    /// The 3-cocycle ω_p of a twisted theory `dw:ZN:P`.
    pub fn cocycle(&self) -> Option<&CyclicCocycle> {
        self.twisting.as_ref().map(|t| &t.cocycle)
    }

    /// The phases of a twisted theory: per generator (in the order of `twists`), the
    /// exponent of ζ_{N²} in each row; `None` when untwisted.
    pub fn phases(&self) -> Option<&[Vec<u32>]> {
        self.twisting.as_ref().map(|t| t.phases.as_slice())
    }

    /// X_g.
    pub fn bundles(&self) -> &FlatBundles {
        &self.bundles
    }

    /// The twists as named permutations of X_g.
    pub fn twists(&self) -> &[(Curve, Vec<u32>)] {
        &self.twists
    }

    /// |X_g|.
    pub fn dimension(&self) -> usize {
        self.bundles.len()
    }

    /// Q(ζ_n), n = [`DwSpace::conductor`]: Q for permutation matrices.
    fn field(&self) -> CyclotomicField {
        CyclotomicField::new(self.conductor()).expect("Q(ζ_n) for n ≤ 1024 is a field")
    }

    /// The twists as monomial matrices: row x holds ζ_{N²}^{phase} (1 when untwisted) at
    /// column p(x) ((M f)(x) = f(p(x)) up to the phase, the crate's convention), unit
    /// invariant form.
    pub fn generator_set(&self) -> Result<GeneratorSet, String> {
        let field = self.field();
        let d = self.dimension();
        let entry = |k: usize, x: usize| match &self.twisting {
            None => field.one(),
            Some(t) => field.zeta_pow(i64::from(t.phases[k][x])),
        };
        let named = self
            .twists
            .iter()
            .enumerate()
            .map(|(k, (c, p))| {
                let rows = p
                    .iter()
                    .enumerate()
                    .map(|(x, &j)| vec![(j as usize, entry(k, x))])
                    .collect();
                (c.to_string(), Operator::SparseRows { dim: d, rows })
            })
            .collect();
        let labels = (0..d).map(|i| self.bundles.describe(i)).collect();
        let set = GeneratorSet::new(field.clone(), named)
            .and_then(|set| set.with_basis_labels(labels))
            .map_err(|e| e.to_string())?;
        Ok(set.with_origin(Some(self.spec.clone()), Some(self.bundles.genus() as u32)))
    }

    /// The orbit problem of the vacuum: the indicator of {[φ] : φ(a_h) = 1 for all h}.
    pub fn problem(&self) -> Result<OrbitProblem, String> {
        let field = self.field();
        let mut vector = vec![field.zero(); self.dimension()];
        for i in self.bundles.vacuum() {
            vector[i as usize] = field.one();
        }
        let seed = Seed {
            conductor: self.conductor(),
            vector,
        };
        OrbitProblem::new(self.generator_set()?, &seed).map_err(|e| e.to_string())
    }

    fn permutations(&self) -> Vec<&[u32]> {
        self.twists.iter().map(|(_, p)| p.as_slice()).collect()
    }

    /// The order of the projective image. Untwisted: the permutation group the twists
    /// generate on X_g, by Schreier–Sims (a permutation matrix is a scalar only when it is
    /// the identity). Twisted: the monomial group, by Schreier–Sims on the permutation parts
    /// carrying the phases (cyclorb-structure's `MonomialChain`), |P|·|K| / |K ∩ scalars|.
    pub fn image(&self) -> Result<DwImage, String> {
        let d = self.dimension();
        let Some(t) = &self.twisting else {
            let perms: Vec<Vec<u32>> = self.twists.iter().map(|(_, p)| p.clone()).collect();
            let chain = StabiliserChain::new(d, &perms).map_err(|e| e.to_string())?;
            return Ok(DwImage {
                order: chain.order(),
                route: ImageRoute::PermutationSchreierSims,
                base: chain.base(),
                basic_orbit_lengths: chain.basic_orbit_lengths(),
                strong_generators: chain.strong_generator_count(),
            });
        };
        let chain = MonomialChain::new(d, self.monomial_modulus(), &self.monomials(t));
        Ok(DwImage {
            order: chain.projective_order(),
            route: ImageRoute::MonomialSchreierSims,
            base: chain.base(),
            basic_orbit_lengths: chain.basic_orbit_lengths(),
            strong_generators: chain.strong_generators().len(),
        })
    }

    /// m = lcm(2, N²), the phase modulus of cyclorb-structure's monomials.
    fn monomial_modulus(&self) -> u32 {
        let n2 = self.conductor();
        if n2 % 2 == 0 {
            n2
        } else {
            2 * n2
        }
    }

    /// The generators as cyclorb-structure monomials e_i ↦ ζ_m^{φ_i} e_{π(i)}: row x of a
    /// twist holds ζ_{N²}^{phase} at column p(x), so π(p(x)) = x and φ_{p(x)} is that
    /// phase in units of ζ_m.
    fn monomials(&self, t: &Twisting) -> Vec<Monomial> {
        let scale = self.monomial_modulus() / self.conductor();
        self.twists
            .iter()
            .zip(&t.phases)
            .map(|((_, p), phases)| {
                let mut perm = vec![0; p.len()];
                let mut out = vec![0; p.len()];
                for (x, (&j, &phase)) in p.iter().zip(phases).enumerate() {
                    perm[j as usize] = x as u32;
                    out[j as usize] = phase * scale;
                }
                Monomial { perm, phases: out }
            })
            .collect()
    }

    /// The orbitals of the permutation group; their number is the commutant dimension of
    /// an untwisted theory.
    pub fn orbitals(&self) -> Result<Orbitals, String> {
        Orbitals::new(self.dimension(), &self.permutations()).map_err(|e| e.to_string())
    }

    /// The entries (i, j) where `value` is non-zero and not `None`, keyed by the states'
    /// descriptions.
    fn labelled_entries(&self, value: impl Fn(usize, usize) -> Option<u64>) -> Vec<LabelledEntry> {
        let d = self.dimension();
        let mut out = Vec::new();
        for i in 0..d {
            for j in 0..d {
                if let Some(v) = value(i, j).filter(|&v| v != 0) {
                    out.push(LabelledEntry {
                        row: self.bundles.describe(i),
                        column: self.bundles.describe(j),
                        value: v.to_string(),
                        approx: [v as f64, 0.0],
                    });
                }
            }
        }
        out
    }

    /// The commutant dimension and its route: the number of orbitals (untwisted), or
    /// cyclorb-cert's commutant certificate on the monomial generators (twisted), re-checked.
    pub fn commutant_dimension(&self) -> Result<(usize, &'static str, Vec<u64>), String> {
        if self.twisting.is_none() {
            return Ok((self.orbitals()?.count(), "orbitals", Vec::new()));
        }
        let set = self.generator_set()?.prove().map_err(|e| e.to_string())?;
        let cert = cyclorb_cert::commutant(&set, CommutantOptions::default())
            .map_err(|e| e.to_string())?;
        cert.verify(&set).map_err(|e| e.to_string())?;
        let primes = cert.bounds.iter().map(|b| b.prime).collect();
        Ok((cert.dimension, "commutant-certificate", primes))
    }

    /// The report of B = Σ_S 1_S 1_Sᵀ over the orbit of the vacuum subset, without a dense
    /// d×d matrix: the orbit is listed again as subsets (no field arithmetic) and must have
    /// `engine_orbit_size` elements; B is invariant, so constant on each orbital O, with value
    /// (Σ_S #{(i, j) ∈ O : i, j ∈ S}) / |O| (checked to divide). B = Σ_c c·M_c, M_c the 0/1
    /// indicator of the pairs where B = c (a sum of orbitals); the commutant dimension is the
    /// number of orbitals. tr B = |orbit|·|vacuum| is checked from the orbital values.
    pub fn poincare_report(&self, engine_orbit_size: usize) -> PoincareReport {
        let vacuum = self.bundles.vacuum();
        let norm = vacuum.len();
        let mut report = PoincareReport {
            seed_norm: Some(norm.to_string()),
            ..PoincareReport::default()
        };
        let subsets = match subset_orbit(&vacuum, &self.twists, engine_orbit_size) {
            Ok(s) if s.len() == engine_orbit_size => s,
            Ok(s) => {
                report.trace_check = Some(false);
                report.note = Some(format!(
                    "the orbit of the vacuum subset has {} subsets, the engine found {engine_orbit_size} lines",
                    s.len()
                ));
                return report;
            }
            Err(e) => {
                report.trace_check = Some(false);
                report.note = Some(format!("the orbit of the vacuum subset: {e}"));
                return report;
            }
        };
        // B is diagonal only when every subset is a single state, and then scalar when every
        // state lies in equally many subsets
        if norm == 1 {
            let mut hits = vec![0usize; self.dimension()];
            for s in &subsets {
                hits[s[0] as usize] += 1;
            }
            if hits.iter().all(|&h| h == hits[0]) {
                report.is_scalar = Some(true);
                report.prefactor = Some(hits[0].to_string());
                report.trace_check = Some(hits.iter().sum::<usize>() == subsets.len());
                report.invariants = Some(Vec::new());
                return report;
            }
        }
        report.is_scalar = Some(false);
        let orbitals = match self.orbitals() {
            Ok(o) => o,
            Err(e) => {
                report.note = Some(format!(
                    "B is not scalar; its orbitals were not computed: {e}"
                ));
                return report;
            }
        };
        let d = self.dimension();
        let mut size = vec![0u64; orbitals.count()];
        for i in 0..d {
            for j in 0..d {
                size[orbitals.of(i, j)] += 1;
            }
        }
        let mut total = vec![0u64; orbitals.count()];
        for s in &subsets {
            for &i in s {
                for &j in s {
                    total[orbitals.of(i as usize, j as usize)] += 1;
                }
            }
        }
        if let Some(o) = (0..orbitals.count()).find(|&o| total[o] % size[o] != 0) {
            report.trace_check = Some(false);
            report.note = Some(format!("B is not constant on orbital {o}: not invariant"));
            return report;
        }
        let coefficient: Vec<u64> = total.iter().zip(&size).map(|(t, n)| t / n).collect();
        let trace: u64 = (0..d).map(|i| coefficient[orbitals.of(i, i)]).sum();
        report.trace_check = Some(trace == (subsets.len() * norm) as u64);
        let mut values: Vec<u64> = coefficient.clone();
        values.sort_unstable_by(|a, b| b.cmp(a));
        values.dedup();
        let print = d <= MATRIX_PRINT_LIMIT;
        let entry = |i: usize, j: usize| coefficient[orbitals.of(i, j)];
        report.invariants = Some(
            values
                .iter()
                .filter(|&&c| c != 0)
                .map(|&c| InvariantReport {
                    coefficient: c.to_string(),
                    matrix: if print {
                        (0..d)
                            .map(|i| {
                                (0..d)
                                    .map(|j| if entry(i, j) == c { "1" } else { "0" }.to_string())
                                    .collect()
                            })
                            .collect()
                    } else {
                        Vec::new()
                    },
                    entries: if print {
                        self.labelled_entries(|i, j| (entry(i, j) == c).then_some(1))
                    } else {
                        Vec::new()
                    },
                })
                .collect(),
        );
        if print {
            report.entries = Some(self.labelled_entries(|i, j| Some(entry(i, j))));
            report.matrix = Some(
                (0..d)
                    .map(|i| (0..d).map(|j| entry(i, j).to_string()).collect())
                    .collect(),
            );
        }
        report.commutant_dimension = Some(orbitals.count());
        report.physical_basis = Some(true);
        report.note = Some(format!(
            "B = Σ coefficient × (indicator of the pairs of states where B takes that value); each is a sum of orbitals of the permutation group on X_g ({} orbitals = the commutant dimension){}",
            orbitals.count(),
            if print {
                String::new()
            } else {
                format!("; matrices omitted above dimension {MATRIX_PRINT_LIMIT}")
            }
        ));
        report
    }
}
