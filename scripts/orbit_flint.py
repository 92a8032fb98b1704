#!/usr/bin/env python3
"""The same orbit computation as `cyclorb orbit --matrices FILE --seed FILE`, written with
python-flint, for a speed comparison (it is not part of the test suite).

Elements of Q(zeta_n) are `fmpq_poly` values reduced modulo Phi_n (python-flint has no
number-field type); a line is keyed by dividing by its first non-zero coordinate (inverse by
the extended gcd with Phi_n) and hashing the tuple of coefficient strings. Breadth-first
saturation under the generators, then B = sum over the orbit of (N/<w,w>_G) w w^dagger, as in
cyclorb (docs/orbits.md). Prints the orbit size, the trace of B*G and the seconds taken.

Usage: orbit_flint.py GENERATORS.json SEED.json
  (GENERATORS.json as written by `cyclorb twists SPEC --genus G --out FILE`)
"""

import json
import re
import sys
import time

import flint


def field(n):
    phi = flint.fmpq_poly(flint.fmpz_poly.cyclotomic(n).coeffs())
    z = flint.fmpq_poly([0, 1])
    return phi, z


def parse(text, phi, z, n):
    """Evaluate cyclorb's element syntax (integers, z, i, sqrt(r), + - * / ^) in Q(zeta_n)."""
    expr = text.replace("^", "**")
    if "sqrt" in expr or re.search(r"\bi\b", expr):
        raise SystemExit(f"this script reads the printed form only (polynomials in z): {text!r}")
    value = eval(expr, {"__builtins__": {}}, {"z": z})  # printed form: integers, z, + - * / **
    if not isinstance(value, flint.fmpq_poly):
        value = flint.fmpq_poly([value])
    return value % phi


def inverse(a, phi):
    g, s, _ = a.xgcd(phi)
    return s / g


def main():
    gens_file, seed_file = sys.argv[1], sys.argv[2]
    gens = json.load(open(gens_file))
    seed = json.load(open(seed_file))
    n, dim = gens["conductor"], gens["dimension"]
    phi, z = field(n)
    el = lambda t: parse(t, phi, z, n)
    zero = flint.fmpq_poly([])

    def conj(a):
        # zeta -> zeta^-1 = zeta^(n-1)
        out = zero
        for k, c in enumerate(a.coeffs()):
            out += c * z ** ((n - k) % n)
        return out % phi

    operators = []
    for g in gens["generators"]:
        rows = [dict() for _ in range(dim)]
        if g["kind"] == "diagonal":
            for i, v in enumerate(g["diagonal"]):
                rows[i][i] = el(v)
        elif g["kind"] == "block-diagonal":
            covered = set()
            for b in g["blocks"]:
                idx = b["indices"]
                for r, i in enumerate(idx):
                    covered.add(i)
                    for c, j in enumerate(idx):
                        v = el(b["matrix"][r][c])
                        if not v.is_zero():
                            rows[i][j] = v
            for i in range(dim):
                if i not in covered:
                    rows[i][i] = flint.fmpq_poly([1])
        elif g["kind"] == "sparse-rows":
            for i, row in enumerate(g["rows"]):
                for j, v in row:
                    rows[i][j] = el(v)
        else:
            for i, row in enumerate(g["rows"]):
                for j, v in enumerate(row):
                    if el(v) != zero:
                        rows[i][j] = el(v)
        operators.append(rows)
    form = [el(x) for x in gens["form"]] if gens.get("form") else [flint.fmpq_poly([1])] * dim
    v0 = [el(x) for x in seed["vector"]]

    def key(v):
        k = next(i for i, x in enumerate(v) if not x.is_zero())
        inv = inverse(v[k], phi)
        w = [(x * inv) % phi for x in v]
        return tuple(str(x) for x in w), w

    def norm(w):
        total = zero
        for x, g in zip(w, form):
            total += conj(x) * g * x
        return total % phi

    start = time.perf_counter()
    k0, w0 = key(v0)
    seen = {k0: w0}
    frontier = [w0]
    while frontier:
        nxt = []
        for w in frontier:
            for rows in operators:
                image = [sum((c * w[j] for j, c in r.items()), zero) % phi for r in rows]
                k, u = key(image)
                if k not in seen:
                    seen[k] = u
                    nxt.append(u)
        frontier = nxt
    n0 = norm(v0)
    trace = zero
    for w in seen.values():
        # tr(B G) contribution of one line: N/<w,w> * <w,w> = N
        q = norm(w)
        trace += (n0 * inverse(q, phi) % phi) * q
    trace %= phi
    elapsed = time.perf_counter() - start
    print(f"orbit {len(seen)} lines, tr(B G) = {trace}, {elapsed:.2f} s")


if __name__ == "__main__":
    main()
