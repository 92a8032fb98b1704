//! `cyclorb describe dw:ZN:P`: the modular data of the twisted theory D^{ω_p}(Z_N)
//! (cyclorb-dw's `twisted_modular_data`; docs/dijkgraaf-witten.md, "The anyons as a metric
//! group"): labels (flux, charge), dimensions, twists, duals, S, T, c mod 8 (proved 0 by the
//! Gauss sum), dim V_g and the cocycle ω_p.

use cyclorb_dw::{fuse, twisted_modular_data, CyclicCocycle, FiniteGroup};
use serde_json::json;

use super::dw::s_text;
use super::output::{Outcome, Report};

/// Largest N whose table of ω_p(a, b, c) is printed in the text (N³ values).
const COCYCLE_PRINT_LIMIT: u32 = 3;
/// Largest number of labels whose S is printed in the text.
const S_PRINT_LIMIT: usize = 16;

/// The exponent of ζ_{N²} of ω_p(a, b, c) = exp(2πi p a (b + c − [b + c]_N) / N²).
fn cocycle_exponent(n: u32, p: u32, a: u32, b: u32, c: u32) -> u32 {
    let carry = (b + c) - (b + c) % n;
    (p * a * carry) % (n * n)
}

/// Describe `spec` = `dw:ZN:P` with its group Z_N and cocycle ω_p.
pub fn describe_twisted(
    spec: &str,
    group: &FiniteGroup,
    cocycle: &CyclicCocycle,
    as_json: bool,
) -> Outcome {
    let md = match twisted_modular_data(cocycle) {
        Ok(md) => md,
        Err(e) => return Outcome::Invalid(format!("{spec}: {e}")),
    };
    let (n, p) = (cocycle.order(), cocycle.level());
    let m = n * n;
    let label = |(a, c): (u32, u32)| format!("({a},{c})");
    let labels: Vec<String> = md.labels.iter().map(|&x| label(x)).collect();
    let dual = |x: (u32, u32)| {
        md.labels
            .iter()
            .copied()
            .find(|&y| fuse(cocycle, x, y) == (0, 0))
            .expect("A is a group")
    };
    let duals: serde_json::Map<String, serde_json::Value> = md
        .labels
        .iter()
        .map(|&x| (label(x), json!(label(dual(x)))))
        .collect();
    let twists: serde_json::Map<String, serde_json::Value> = md
        .labels
        .iter()
        .zip(&md.t)
        .map(|(&x, t)| (label(x), json!(t.to_string())))
        .collect();
    let s_rows: Vec<Vec<String>> =
        md.s.iter()
            .map(|row| row.iter().map(|x| x.to_string()).collect())
            .collect();
    let t_diag: Vec<String> = md.t.iter().map(|x| x.to_string()).collect();
    let verlinde: Vec<String> = (1..=3u32)
        .map(|g| (u64::from(m) * u64::from(n).pow(2 * g - 2)).to_string())
        .collect();
    let omega: Vec<Vec<Vec<u32>>> = (0..n)
        .map(|a| {
            (0..n)
                .map(|b| (0..n).map(|c| cocycle_exponent(n, p, a, b, c)).collect())
                .collect()
        })
        .collect();
    let mut text = format!(
        "theory {spec}: the twisted quantum double D^ω(G) of {} (order {n}) with the 3-cocycle ω_{p}\n\
         cocycle: ω_{p}(a, b, c) = exp(2πi·{p}·a·(b + c − [b + c]_{n})/{m}) for a, b, c in 0…{} (de Wild Propitius 1995)\n",
        group.name(),
        n - 1
    );
    if n <= COCYCLE_PRINT_LIMIT {
        text.push_str(&format!(
            "  exponents of ζ_{m} of ω(a, b, c), by a, then b (rows), then c: {omega:?}\n"
        ));
    }
    text.push_str(&format!(
        "simple objects (flux a, charge n), a pointed theory: {} of them, every quantum dimension 1; total dimension D = {n}\n\
         fusion: (a, n) + (a′, n′) = (a + a′, n + n′) if a + a′ < {n}, else (a + a′ − {n}, n + n′ + {}) (charges mod {n})\n\
         central charge 0 (mod 8): the Gauss sum Σθ equals D = {n} exactly\n\
         dim V_g = {m}·{n}^(2g−2) for g = 1, 2, 3: {}\n\
         modular data in Q(ζ_{m}): T = diag({})\n",
        labels.len(),
        2 * p,
        verlinde.join(", "),
        t_diag.join(", ")
    ));
    text.push_str(&format!(
        "duals: {}\n",
        labels
            .iter()
            .zip(&md.labels)
            .map(|(l, &x)| format!("{l}* = {}", label(dual(x))))
            .collect::<Vec<_>>()
            .join(", ")
    ));
    text.push_str(&s_text(&s_rows, S_PRINT_LIMIT));
    let value = json!({
        "theory": spec,
        "group": group.name(),
        "group_order": n,
        "labels": labels,
        "quantum_dimensions": vec![1; md.labels.len()],
        "conductor": m,
        "central_charge_mod_8": md.central_charge_mod_8.to_string(),
        "modular_data_only": false,
        "dimensions_by_genus": verlinde,
        "modular_data_conductor": md.field.conductor(),
        "twists": twists,
        "duals": duals,
        "S": s_rows,
        "T": t_diag,
        "cocycle": {
            "order": n,
            "level": p,
            "formula": format!("omega(a,b,c) = exp(2 pi i {p} a (b + c - [b + c]_{n}) / {m})"),
            "exponents": omega,
        },
    });
    Outcome::Done(Report::new(value, text, as_json))
}
