//! The enumerating route (`--method enumerate`): where the problem comes from, where its
//! checkpoint lives, the run itself (fresh or resumed) and its answer with the Poincaré sum.
//!
//! A run records its [`Origin`] in every checkpoint, so that a checkpoint alone is enough
//! to continue: the origin rebuilds the identical problem (the checkpoint's own hash of
//! the generators and seed then refuses anything else).

use std::path::{Path, PathBuf};
use std::time::Duration;

use cyclorb_orbit::{
    checkpoint_origin, gather_numbers, Collective, DistributedOrbit, GeneratorSet, Orbit,
    OrbitOptions, OrbitProblem, ProgressObserver, Seed,
};
use serde_json::json;

use crate::answer::{LineWord, OrbitAnswer, StoreFigures};
use crate::dw_space::{is_dw, DwSpace};
use crate::{proof, runtime, space};

/// How an orbit problem is built: a theory's vacuum at a genus under a generating set, or
/// raw generator and seed files.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum Origin {
    /// The vacuum line of a theory (built-in spec or theory file).
    Theory {
        /// The spec.
        spec: String,
        /// The genus.
        genus: usize,
        /// The generating set's name (`humphries`, `lickorish`).
        set: String,
    },
    /// A generator-set file and a seed file (as `cyclorb twists --out` writes them).
    Files {
        /// The generator-set file.
        matrices: PathBuf,
        /// The seed file.
        seed: PathBuf,
    },
}

impl Origin {
    /// The origin as the JSON text recorded in checkpoints (files by absolute path, so that
    /// a run continued from another folder finds them).
    pub fn to_json(&self) -> String {
        let absolute = |p: &Path| {
            std::path::absolute(p)
                .unwrap_or_else(|_| p.to_path_buf())
                .display()
                .to_string()
        };
        match self {
            Origin::Files { matrices, seed } => {
                json!({"matrices": absolute(matrices), "seed": absolute(seed)})
            }
            Origin::Theory { spec, genus, set } => {
                json!({"theory": spec, "genus": genus, "set": set})
            }
        }
        .to_string()
    }

    /// The origin recorded in the checkpoint at `path`; the error names the file and says
    /// what is missing.
    pub fn recorded(path: &Path) -> Result<Origin, String> {
        let place = path.display();
        let origin = checkpoint_origin(path)
            .map_err(|e| e.to_string())?
            .ok_or_else(|| {
                format!(
                    "{place}: this checkpoint records no theory (an older format); give SPEC \
                     --genus G (and --set) as when it was written"
                )
            })?;
        Origin::from_recorded(&place.to_string(), &origin)
    }

    /// The origin from the text a checkpoint recorded ([`Origin::to_json`]); `place` names
    /// the checkpoint in errors.
    pub fn from_recorded(place: &str, origin: &str) -> Result<Origin, String> {
        let v: serde_json::Value = serde_json::from_str(origin)
            .map_err(|e| format!("{place}: the recorded origin is not JSON: {e}"))?;
        match (
            v["matrices"].as_str(),
            v["seed"].as_str(),
            v["theory"].as_str(),
            v["genus"].as_u64(),
            v["set"].as_str(),
        ) {
            (Some(m), Some(s), ..) => Ok(Origin::Files {
                matrices: m.into(),
                seed: s.into(),
            }),
            (_, _, Some(spec), Some(genus), Some(set)) => Ok(Origin::Theory {
                spec: spec.to_string(),
                genus: genus as usize,
                set: set.to_string(),
            }),
            _ => Err(format!(
                "{place}: the recorded origin {origin} names no problem"
            )),
        }
    }
}

/// An orbit problem ready to list, with what its answer needs: a `dw:` theory keeps its
/// space, whose Poincaré sum is read over the orbitals of its permutation group.
pub struct Listing {
    problem: OrbitProblem,
    dw: Option<DwSpace>,
}

impl Listing {
    /// Build the problem of `origin` (theory files proved, raw generators proved
    /// invertible; see [`proof`]) and record the origin for its checkpoints.
    pub fn new(origin: &Origin) -> Result<Listing, String> {
        let (problem, dw) = match origin {
            Origin::Files { matrices, seed } => {
                let gens = GeneratorSet::read(matrices).map_err(|e| e.to_string())?;
                let seed = Seed::read(seed).map_err(|e| e.to_string())?;
                proof::generators(&gens, &matrices.display().to_string())?;
                let problem = OrbitProblem::new(gens, &seed).map_err(|e| e.to_string())?;
                (problem, None)
            }
            Origin::Theory { spec, genus, set } if is_dw(spec) => {
                let dw = DwSpace::new(spec, *genus, set)?;
                (dw.problem()?, Some(dw))
            }
            Origin::Theory { spec, genus, set } => {
                (space::vacuum_problem(spec, *genus, set)?, None)
            }
        };
        Ok(Listing {
            problem: problem.with_origin(origin.to_json()),
            dw,
        })
    }

    /// The problem.
    pub fn problem(&self) -> &OrbitProblem {
        &self.problem
    }

    /// List the orbit: from the start, or continuing the checkpoint at `resume`. Unless the
    /// caller gives its own probe, the memory ceiling also holds the process's resident
    /// memory ([`runtime::resident_memory_bytes`]), so that what the store does not count
    /// (field tables, compiled generators, freed pages not yet returned) stops the run too.
    pub fn run(
        &self,
        options: &OrbitOptions,
        resume: Option<&Path>,
        progress: &mut dyn ProgressObserver,
    ) -> Result<Orbit, String> {
        let options = OrbitOptions {
            resident: options.resident.or(Some(runtime::resident_memory_bytes)),
            ..options.clone()
        };
        let options = &options;
        match resume {
            Some(path) => self.problem.resume(path, options, progress),
            None => self.problem.enumerate(options, progress),
        }
        .map_err(|e| e.to_string())
    }

    /// The answer of a listed orbit, with its Poincaré sum when the orbit closed: dense
    /// over the field, or for an untwisted `dw:` theory over the orbitals of its
    /// permutation group (no d × d matrix over the field). `elapsed` is the caller's wall
    /// time.
    pub fn answer(&self, orbit: &Orbit, threads: usize, elapsed: Duration) -> OrbitAnswer {
        let dense = self.dw.as_ref().map_or(true, DwSpace::is_twisted);
        let sum = (orbit.is_saturated() && dense).then(|| {
            self.problem
                .poincare_sum(orbit, threads)
                .map_err(|e| e.to_string())
        });
        let poincare = match &sum {
            Some(Ok(s)) => Ok(s),
            Some(Err(e)) => Err(e.clone()),
            None => Err("the orbit is not saturated".to_string()),
        };
        let mut answer = OrbitAnswer::enumerated(&self.problem, orbit, poincare, elapsed);
        if let (Some(space), true, false) = (&self.dw, orbit.is_saturated(), dense) {
            answer.poincare_sum = space.poincare_report(orbit.len());
        }
        answer
    }

    /// List the orbit over the ranks of `comm` (every rank calls this; docs/orbits.md §6):
    /// from the start, or continuing the rank checkpoints `resume.rankR`. As in [`Self::run`]
    /// the memory ceiling (each rank's own) also holds the rank's resident memory unless the
    /// caller gives its own probe.
    pub fn run_distributed(
        &self,
        comm: &dyn Collective,
        options: &OrbitOptions,
        resume: Option<&Path>,
        progress: &mut dyn ProgressObserver,
    ) -> Result<DistributedOrbit, String> {
        let options = OrbitOptions {
            resident: options.resident.or(Some(runtime::resident_memory_bytes)),
            ..options.clone()
        };
        let options = &options;
        match resume {
            Some(base) => self
                .problem
                .resume_distributed(base, comm, options, progress),
            None => self.problem.enumerate_distributed(comm, options, progress),
        }
        .map_err(|e| e.to_string())
    }

    /// The answer of an orbit listed over ranks, as [`Self::answer`] gives it for one
    /// process: every rank calls this (B and the store figures are reduced over the ranks)
    /// and rank 0 gets `Some`. Store figures are those of all ranks together.
    pub fn answer_distributed(
        &self,
        orbit: &DistributedOrbit,
        comm: &dyn Collective,
        threads: usize,
        elapsed: Duration,
    ) -> Option<OrbitAnswer> {
        let dense = self.dw.as_ref().map_or(true, DwSpace::is_twisted);
        let sum = (orbit.is_saturated() && dense).then(|| {
            self.problem
                .poincare_sum_distributed(orbit, comm, threads)
                .map_err(|e| e.to_string())
        });
        let figures = gather_numbers(
            comm,
            &[
                orbit.local_store_bytes() as u64,
                orbit.numerator_width() as u64,
                orbit.local_window_bytes() as u64,
            ],
        );
        if comm.rank() != 0 {
            return None;
        }
        let store_bytes = figures.iter().map(|f| f[0] as usize).sum::<usize>();
        let store = StoreFigures {
            compute_seconds: orbit.compute_seconds(),
            store_bytes,
            bytes_per_element: store_bytes as f64 / orbit.len().max(1) as f64,
            numerator_width: figures.iter().map(|f| f[1] as usize).max().unwrap_or(1),
            store_kind: orbit.store_kind().name().into(),
            window_bytes: figures.iter().map(|f| f[2] as usize).sum(),
        };
        let poincare = match &sum {
            Some(Ok(Some(s))) => Ok(s),
            Some(Ok(None)) => Err("the sum was reduced to another rank".to_string()),
            Some(Err(e)) => Err(e.clone()),
            None => Err("the orbit is not saturated".to_string()),
        };
        let mut answer = OrbitAnswer::distributed(&self.problem, orbit, poincare, store, elapsed);
        if let (Some(space), true, false) = (&self.dw, orbit.is_saturated(), dense) {
            answer.poincare_sum = space.poincare_report(orbit.len());
        }
        Some(answer)
    }

    /// The words of the `count` lines found last (farthest from the seed first), or `None`
    /// when none are asked for.
    pub fn farthest_words(&self, orbit: &Orbit, count: usize) -> Option<Vec<LineWord>> {
        let words: Vec<LineWord> = (0..count.min(orbit.len()))
            .map(|k| orbit.len() - 1 - k)
            .map(|line| LineWord {
                line,
                word: self.problem.word_names(orbit, line),
            })
            .collect();
        (!words.is_empty()).then_some(words)
    }
}

/// Where a run keeps its checkpoint when none is named: `cyclorb-orbit-HASH.ckpt` (HASH
/// from the generators and seed) in `$XDG_CACHE_HOME/cyclorb`, `~/.cache/cyclorb` or the
/// temporary folder, created when missing; `None` when none can be written.
pub fn default_checkpoint(problem: &OrbitProblem) -> Option<PathBuf> {
    let base = std::env::var_os("XDG_CACHE_HOME")
        .filter(|v| !v.is_empty())
        .map(PathBuf::from)
        .or_else(|| std::env::var_os("HOME").map(|h| PathBuf::from(h).join(".cache")))
        .unwrap_or_else(std::env::temp_dir)
        .join("cyclorb");
    std::fs::create_dir_all(&base).ok()?;
    let path = base.join(format!(
        "cyclorb-orbit-{:016x}.ckpt",
        problem.content_hash() as u64
    ));
    check_writable(&path).ok().map(|_| path)
}

/// Prove before any work that a checkpoint can be written at `path`: a file beside it is
/// created and removed (checkpoints are written through a temporary file and a rename, so
/// the folder must take new files). An unwritable path found only at the first periodic
/// write would lose the work done until then.
pub fn check_writable(path: &Path) -> Result<(), String> {
    let mut probe = path.as_os_str().to_owned();
    probe.push(format!(".probe{}", std::process::id()));
    let probe = PathBuf::from(probe);
    std::fs::OpenOptions::new()
        .write(true)
        .create_new(true)
        .open(&probe)
        .map_err(|e| {
            format!(
                "checkpoint {} cannot be written ({e}); choose another --checkpoint path",
                path.display()
            )
        })?;
    std::fs::remove_file(&probe).ok();
    Ok(())
}
