#!/usr/bin/env python3
"""Time the work of `benches/arith.rs` through python-flint, for a side-by-side comparison.

python-flint (0.9) has no number-field type of its own, so an element of Q(zeta_n) is what a
researcher would write with it: an `fmpq_poly` (rational polynomial, FLINT's canonical
numerator-over-denominator form) reduced modulo the cyclotomic polynomial Phi_n.
  multiply:  (a * b) % Phi_n
  inverse:   s from the extended gcd  s*a + t*Phi_n = 1
  mat-vec:   each output entry is (sum_j a_ij * v_j) % Phi_n, one reduction per entry.
Inputs: fixed seed, coefficients n/2^k with |n| <= 8, 0 <= k <= 4 (as in benches/arith.rs).

Usage: bench_flint.py [--only WORKLOAD] [SECONDS]
  (time per workload: SECONDS, else env CYCLORB_BENCH_SECONDS, else 1)
Output: one line per workload, `name<TAB>ops_per_second` (per second of thread CPU time).
"""

import os
import random
import sys
import time

import flint

POOL = 256
DIM = 36


def cyclotomic(n):
    return flint.fmpq_poly(flint.fmpz_poly.cyclotomic(n).coeffs())


def random_element(rng, degree):
    while True:
        coeffs = [flint.fmpq(rng.randint(-8, 8), 2 ** rng.randint(0, 4)) for _ in range(degree)]
        x = flint.fmpq_poly(coeffs)
        if not x.is_zero():
            return x


def rate(budget, ops_per_step, step):
    """Operations per second of this thread's CPU time, over about `budget` seconds of wall
    time (as in benches/arith.rs, so other load on the machine does not count)."""
    for i in range(4):
        step(i)
    start = time.perf_counter()
    cpu_start = time.thread_time()
    steps = 0
    while time.perf_counter() - start < budget:
        for _ in range(16):
            step(steps)
            steps += 1
    return steps * ops_per_step / (time.thread_time() - cpu_start)


def bench_mul(n, rng, budget):
    phi = cyclotomic(n)
    xs = [random_element(rng, phi.degree()) for _ in range(POOL)]

    def step(_):
        for i in range(POOL):
            (xs[i] * xs[(i + 1) % POOL]) % phi

    return rate(budget, POOL, step)


def bench_inv(n, rng, budget):
    phi = cyclotomic(n)
    xs = [random_element(rng, phi.degree()) for _ in range(POOL)]
    # correctness of the method, checked once
    g, s, _ = xs[0].xgcd(phi)
    assert g == 1 and (s * xs[0]) % phi == 1

    def step(i):
        xs[i % POOL].xgcd(phi)

    return rate(budget, 1, step)


def bench_mat_vec(n, rng, budget):
    phi = cyclotomic(n)
    d = phi.degree()
    matrix = [[random_element(rng, d) for _ in range(DIM)] for _ in range(DIM)]
    vectors = [[random_element(rng, d) for _ in range(DIM)] for _ in range(8)]
    zero = flint.fmpq_poly(0)

    def step(s):
        v = vectors[s % len(vectors)]
        out = []
        for row in matrix:
            acc = zero
            for a, b in zip(row, v):
                acc = acc + a * b
            out.append(acc % phi)
        return out

    return rate(budget, 1, step)


def main():
    args = sys.argv[1:]
    only = None
    if args[:1] == ["--only"]:
        only, args = args[1], args[2:]
    budget = float(args[0]) if args else float(os.environ.get("CYCLORB_BENCH_SECONDS", "1"))
    workloads = [
        ("mul_q16", lambda r: bench_mul(16, r, budget)),
        ("mul_q60", lambda r: bench_mul(60, r, budget)),
        ("inv_q16", lambda r: bench_inv(16, r, budget)),
        ("inv_q60", lambda r: bench_inv(60, r, budget)),
        ("matvec36_q16", lambda r: bench_mat_vec(16, r, budget)),
    ]
    print(f"# python-flint {flint.__version__}; rates per second of thread CPU time", flush=True)
    for name, run in workloads:
        if only is not None and name != only:
            continue
        rng = random.Random(0x9E3779B97F4A7C15)
        print(f"{name}\t{run(rng):.0f}", flush=True)


if __name__ == "__main__":
    main()
