//! Speed of the exact arithmetic that every orbit computation rests on.
//!
//! Times, on fixed seeded inputs with coefficients n/2^k (|n| ≤ 8, 0 ≤ k ≤ 4):
//! multiplication and inversion in Q(ζ16) and Q(ζ60), and a 36×36 dense mat-vec in Q(ζ16).
//! `scripts/bench_flint.py` times the same work through python-flint and
//! `scripts/bench_compare.sh` runs both and prints the ratios.
//!
//! Run: `cargo bench --bench arith [WORKLOAD]` (plain harness; `CYCLORB_BENCH_SECONDS` sets
//! the wall time per workload, default 1). Output: one line per workload,
//! `name<TAB>ops_per_second`, the rate per second of this thread's CPU time (Linux; wall time
//! elsewhere), which is what python-flint's side (`time.thread_time`) measures too.

use std::hint::black_box;
use std::time::{Duration, Instant};

use cyclorb_field::{Cyc, CyclotomicField};
use cyclorb_matrix::Matrix;
use num_bigint::BigInt;

/// Number of distinct inputs cycled through by each workload.
const POOL: usize = 256;

/// xorshift64*: a tiny deterministic generator, so every run times the same inputs.
struct XorShift(u64);

impl XorShift {
    fn next(&mut self) -> u64 {
        self.0 ^= self.0 >> 12;
        self.0 ^= self.0 << 25;
        self.0 ^= self.0 >> 27;
        self.0.wrapping_mul(0x2545_F491_4F6C_DD1D)
    }

    fn below(&mut self, m: u64) -> u64 {
        self.next() % m
    }
}

/// A random element with coefficients n/2^k, |n| ≤ 8, 0 ≤ k ≤ 4, never zero.
fn random_element(field: &CyclotomicField, rng: &mut XorShift) -> Cyc {
    loop {
        let mut acc = field.zero();
        for j in 0..field.degree() {
            let n = rng.below(17) as i64 - 8;
            let k = rng.below(5) as u32;
            let coeff = field
                .big_rational(&BigInt::from(n), &BigInt::from(1i64 << k))
                .expect("non-zero denominator");
            let term = field
                .mul(&coeff, &field.zeta_pow(j as i64))
                .expect("same field");
            acc = field.add(&acc, &term).expect("same field");
        }
        if !acc.is_zero() {
            return acc;
        }
    }
}

fn pool(field: &CyclotomicField, rng: &mut XorShift, size: usize) -> Vec<Cyc> {
    (0..size).map(|_| random_element(field, rng)).collect()
}

/// CPU time consumed by this thread, from Linux's /proc/thread-self/schedstat (nanoseconds on
/// CPU); `None` elsewhere.
fn thread_cpu_time() -> Option<Duration> {
    let text = std::fs::read_to_string("/proc/thread-self/schedstat").ok()?;
    let nanos: u64 = text.split_whitespace().next()?.parse().ok()?;
    Some(Duration::from_nanos(nanos))
}

/// Runs `step` (which performs `ops_per_step` operations) for about `budget` of wall time and
/// returns operations per second of this thread's CPU time (wall time where the CPU clock is
/// unavailable), so that other load on a shared machine does not count against the rate.
fn rate(budget: Duration, ops_per_step: usize, mut step: impl FnMut(usize)) -> f64 {
    // warm-up
    for i in 0..4 {
        step(i);
    }
    let start = Instant::now();
    let cpu_start = thread_cpu_time();
    let mut steps = 0usize;
    while start.elapsed() < budget {
        for _ in 0..16 {
            step(steps);
            steps += 1;
        }
    }
    let elapsed = match (cpu_start, thread_cpu_time()) {
        (Some(a), Some(b)) if b > a => b - a,
        _ => start.elapsed(),
    };
    (steps * ops_per_step) as f64 / elapsed.as_secs_f64()
}

fn bench_mul(field: &CyclotomicField, rng: &mut XorShift, budget: Duration) -> f64 {
    let xs = pool(field, rng, POOL);
    rate(budget, POOL, |_| {
        for i in 0..POOL {
            black_box(field.mul(&xs[i], &xs[(i + 1) % POOL]).expect("same field"));
        }
    })
}

fn bench_inv(field: &CyclotomicField, rng: &mut XorShift, budget: Duration) -> f64 {
    let xs = pool(field, rng, POOL);
    rate(budget, 1, |s| {
        black_box(field.inv(&xs[s % POOL]).expect("non-zero"));
    })
}

fn bench_mat_vec(field: &CyclotomicField, rng: &mut XorShift, budget: Duration) -> f64 {
    const DIM: usize = 36;
    let rows: Vec<Vec<Cyc>> = (0..DIM).map(|_| pool(field, rng, DIM)).collect();
    let matrix = Matrix::from_rows(rows).expect("square");
    let vectors: Vec<Vec<Cyc>> = (0..8).map(|_| pool(field, rng, DIM)).collect();
    rate(budget, 1, |s| {
        black_box(
            matrix
                .mul_vec(field, &vectors[s % vectors.len()])
                .expect("shapes agree"),
        );
    })
}

fn main() {
    let seconds: f64 = std::env::var("CYCLORB_BENCH_SECONDS")
        .ok()
        .and_then(|s| s.parse().ok())
        .unwrap_or(1.0);
    let budget = Duration::from_secs_f64(seconds);
    // Only the first non-flag argument filters workloads (cargo bench passes `--bench`).
    let filter = std::env::args()
        .skip(1)
        .find(|a| !a.starts_with("--"))
        .unwrap_or_default();
    let q16 = CyclotomicField::new(16).expect("conductor 16");
    let q60 = CyclotomicField::new(60).expect("conductor 60");
    type Workload<'a> = (&'a str, Box<dyn Fn(&mut XorShift) -> f64 + 'a>);
    let workloads: Vec<Workload> = vec![
        ("mul_q16", Box::new(|r| bench_mul(&q16, r, budget))),
        ("mul_q60", Box::new(|r| bench_mul(&q60, r, budget))),
        ("inv_q16", Box::new(|r| bench_inv(&q16, r, budget))),
        ("inv_q60", Box::new(|r| bench_inv(&q60, r, budget))),
        ("matvec36_q16", Box::new(|r| bench_mat_vec(&q16, r, budget))),
    ];
    let clock = if thread_cpu_time().is_some() {
        "thread CPU time"
    } else {
        "wall time"
    };
    println!("# cyclorb; rates per second of {clock}");
    for (name, run) in &workloads {
        if !name.contains(filter.as_str()) {
            continue;
        }
        let mut rng = XorShift(0x9E37_79B9_7F4A_7C15);
        println!("{name}\t{:.0}", run(&mut rng));
    }
}
