//! The stable data hash: SHA-256 of a canonical text streamed line by line,
//! ```text
//! cyclorb-theory-data/1
//! conductor n
//! label NAME                      one per label, in order
//! fusion a b c N                  every N_ab^c ≠ 0 (label indices)
//! dimension a X | twist a X
//! F a b c d e f X                 every entry of every block, blocks in index order
//! R a b c X | weight a b c X      (weights ≠ 1 only) | S a b X (modular data only)
//! ```
//! where a number X ∈ Q(ζ_n) is written `den;c_0,…,c_{φ(n)−1}`, its canonical power-basis
//! form (so equal numbers give equal text). The name is not part of it.

use cyclorb_field::Cyc;

use crate::digest::Sha256;
use crate::theory::Theory;

fn number(x: &Cyc) -> String {
    match x.small_parts() {
        Some((num, den)) => {
            let parts: Vec<String> = num.iter().map(i64::to_string).collect();
            format!("{den};{}", parts.join(","))
        }
        None => {
            let (num, den) = x.to_big_parts();
            let parts: Vec<String> = num.iter().map(|c| c.to_string()).collect();
            format!("{den};{}", parts.join(","))
        }
    }
}

struct Lines(Sha256);

impl Lines {
    fn line(&mut self, text: &str) {
        self.0.update(text.as_bytes());
        self.0.update(b"\n");
    }
}

/// SHA-256 (hex) of the theory's canonical data text.
pub(crate) fn data_hash(t: &Theory) -> String {
    t.compute_all_f();
    let mut h = Lines(Sha256::new());
    h.line("cyclorb-theory-data/1");
    labels_fusion_dimensions(&mut h, t);
    if t.has_fr() {
        for (a, b, c, d) in t.f_block_labels() {
            let Some(blk) = t.f_block(a, b, c, d) else {
                continue;
            };
            for (i, e) in blk.rows.iter().enumerate() {
                for (j, f) in blk.cols.iter().enumerate() {
                    let x = number(blk.matrix.get(i, j));
                    h.line(&format!("F {a} {b} {c} {d} {e} {f} {x}"));
                }
            }
        }
        r_and_weights(&mut h, t);
    } else {
        let s = t.s_matrix().expect("S is always present");
        for a in 0..t.rank() {
            for b in 0..t.rank() {
                h.line(&format!("S {a} {b} {}", number(s.get(a, b))));
            }
        }
    }
    h.0.finish_hex()
}

/// The lines shared by both hashes: conductor, labels, fusion, dimensions, twists.
fn labels_fusion_dimensions(h: &mut Lines, t: &Theory) {
    h.line(&format!("conductor {}", t.conductor()));
    for name in t.labels() {
        h.line(&format!("label {name}"));
    }
    for (a, b, c, m) in t.fusion().triples() {
        h.line(&format!("fusion {a} {b} {c} {m}"));
    }
    for a in 0..t.rank() {
        h.line(&format!("dimension {a} {}", number(t.quantum_dim(a))));
        h.line(&format!("twist {a} {}", number(t.twist(a))));
    }
}

fn r_and_weights(h: &mut Lines, t: &Theory) {
    for (a, b, c, _) in t.fusion().triples() {
        h.line(&format!("R {a} {b} {c} {}", number(&t.r_symbol(a, b, c))));
        let w = t.vertex_weight(a, b, c);
        if !w.is_one() {
            h.line(&format!("weight {a} {b} {c} {}", number(&w)));
        }
    }
}

/// SHA-256 (hex) of the theory's construction: the data hash when its F-symbols are its own
/// (stored, or SU(2)'s q-Racah formula); for a Deligne product or a Galois conjugate (a
/// change of spherical structure is one with k = 1) the text
/// ```text
/// cyclorb-theory-construction/1
/// conductor, label, fusion, dimension, twist, R, weight lines as in the data hash
/// total-dimension X
/// F product LEFT RIGHT | F galois k BASE      (construction hashes of the building blocks)
/// ```
/// Sound as an identity of data: the F-blocks of a product are the Kronecker products of
/// its factors' blocks in the product's field (label (a, b) at a·rank(B) + b) and those of
/// a conjugate are σ_k of its base's, so equal construction hashes mean equal F-symbols, and
/// every other number is hashed directly. Two constructions of the same data may hash
/// differently, which only costs a recomputation where the hash is a cache key (the sweep).
/// It never fills the product's own F-blocks.
pub(crate) fn construction_hash(t: &Theory) -> String {
    let Some(source) = t
        .braiding
        .as_ref()
        .and_then(|b| b.source.construction_line())
    else {
        return t.data_hash();
    };
    let mut h = Lines(Sha256::new());
    h.line("cyclorb-theory-construction/1");
    labels_fusion_dimensions(&mut h, t);
    r_and_weights(&mut h, t);
    h.line(&format!("total-dimension {}", number(&t.total_dim)));
    h.line(&source);
    h.0.finish_hex()
}
