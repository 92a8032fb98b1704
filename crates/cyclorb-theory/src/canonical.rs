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
        for (a, b, c, _) in t.fusion().triples() {
            h.line(&format!("R {a} {b} {c} {}", number(&t.r_symbol(a, b, c))));
            let w = t.vertex_weight(a, b, c);
            if !w.is_one() {
                h.line(&format!("weight {a} {b} {c} {}", number(&w)));
            }
        }
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
