#!/usr/bin/env python3
"""Write the differential reference fixtures read by cyclorb's Rust tests.

  fixtures/reference/field.json   products, inverses, Galois images, norms and traces in Q(zeta_n)
  fixtures/reference/matrix.json  determinants, ranks and characteristic polynomials over Q(zeta_n)

Reference libraries (general purpose, not cyclorb): python-flint for field arithmetic
(fmpq_poly modulo the cyclotomic polynomial fmpz_poly.cyclotomic(n): products, inverses by the
extended gcd, norms as resultants Res(Phi_n, a), traces as the trace of the multiplication
map) and sympy for linear algebra (DomainMatrix over the algebraic field QQ<exp(2*pi*I/n)>:
det, rank, charpoly). Where both can compute a value the script checks that they agree.

Elements are written in cyclorb's text syntax: a polynomial in z = zeta_n = exp(2*pi*i/n) in
the power basis modulo Phi_n, integer coefficients over one positive common denominator, e.g.
"(3 + 2*z - z^5)/7" (the canonical printed form of cyclorb, which the tests also check).
Rationals (norm, trace) are "p/q" or "p". Characteristic polynomials are lists of coefficients,
constant term first.

Deterministic: a fixed seed, so re-running reproduces the committed files byte for byte.

Usage (CI does not run this; the fixtures are committed):
  python3 -m venv /tmp/ref-venv && /tmp/ref-venv/bin/pip install python-flint sympy
  /tmp/ref-venv/bin/python scripts/make_reference.py
"""

import json
import random
import sys
from fractions import Fraction
from math import gcd, lcm
from pathlib import Path

import flint
import sympy
from sympy import I, QQ, exp, pi
from sympy.polys.matrices import DomainMatrix

SEED = 20261202
ROOT = Path(__file__).resolve().parent.parent
OUT = ROOT / "fixtures" / "reference"

FIELD_CONDUCTORS = [1, 2, 3, 4, 5, 7, 8, 9, 12, 15, 16, 20, 21, 24, 28, 30, 36, 48, 60, 84,
                    105, 120, 240]
MATRIX_CONDUCTORS = [1, 3, 4, 5, 8, 12, 16, 20, 60]


# ---------------------------------------------------------------- text syntax

def text(coeffs):
    """cyclorb's canonical text for sum_j coeffs[j] z^j (coeffs: Fractions, low degree first)."""
    den = 1
    for c in coeffs:
        den = lcm(den, c.denominator)
    terms = []
    for j, c in enumerate(coeffs):
        num = c.numerator * (den // c.denominator)
        if num == 0:
            continue
        mag = abs(num)
        if j == 0:
            body = str(mag)
        elif j == 1:
            body = "z" if mag == 1 else f"{mag}*z"
        else:
            body = f"z^{j}" if mag == 1 else f"{mag}*z^{j}"
        terms.append((num < 0, body))
    if not terms:
        return "0"
    poly = ""
    for i, (neg, body) in enumerate(terms):
        if i == 0:
            poly += "-" if neg else ""
        else:
            poly += " - " if neg else " + "
        poly += body
    if den == 1:
        return poly
    if len(terms) == 1:
        return f"{poly}/{den}"
    return f"({poly})/{den}"


def rational_text(q):
    q = Fraction(q)
    return str(q.numerator) if q.denominator == 1 else f"{q.numerator}/{q.denominator}"


# ---------------------------------------------------------------- python-flint side

class FlintField:
    """Q(zeta_n) as fmpq_poly modulo Phi_n (python-flint)."""

    def __init__(self, n):
        self.n = n
        self.phi = flint.fmpq_poly(flint.fmpz_poly.cyclotomic(n).coeffs())
        self.degree = self.phi.degree()

    def element(self, coeffs):
        return flint.fmpq_poly([flint.fmpq(c.numerator, c.denominator) for c in coeffs])

    def coeffs(self, x):
        x = x % self.phi
        out = [Fraction(int(c.p), int(c.q)) for c in x.coeffs()]
        return out + [Fraction(0)] * (self.degree - len(out))

    def mul(self, a, b):
        return (a * b) % self.phi

    def inv(self, a):
        g, s, _ = a.xgcd(self.phi)
        assert g == 1
        return s % self.phi

    def galois(self, a, k):
        x = flint.fmpq_poly([0] * (k % self.n) + [1])
        return a(x) % self.phi

    def norm(self, a):
        # Res(Phi_n, a) = prod over the roots r of Phi_n of a(r) = N(a), Phi_n monic
        r = self.phi.resultant(a)
        return Fraction(int(r.p), int(r.q))

    def trace(self, a):
        # the trace of x -> a*x in the power basis
        total = Fraction(0)
        for i in range(self.degree):
            c = self.coeffs(a * flint.fmpq_poly([0] * i + [1]))
            total += c[i]
        return total


# ---------------------------------------------------------------- sympy side

class SympyField:
    """Q(zeta_n) as sympy's algebraic field QQ<exp(2*pi*I/n)> (generator zeta_n)."""

    def __init__(self, n):
        self.n = n
        self.K = QQ if n <= 2 else QQ.algebraic_field(exp(2 * pi * I / n))

    def element(self, coeffs):
        if self.K == QQ:
            return QQ(coeffs[0].numerator, coeffs[0].denominator)
        return self.K.new([QQ(c.numerator, c.denominator) for c in reversed(coeffs)])

    def coeffs(self, x, degree):
        if self.K == QQ:
            return [Fraction(int(x.numerator), int(x.denominator))]
        out = [Fraction(int(c.numerator), int(c.denominator)) for c in reversed(x.to_list())]
        return out + [Fraction(0)] * (degree - len(out))


# ---------------------------------------------------------------- random inputs

def small_coeff(rng):
    return Fraction(rng.randint(-8, 8), 2 ** rng.randint(0, 4))


def large_coeff(rng):
    num = rng.getrandbits(rng.randint(20, 90)) * rng.choice([-1, 1])
    return Fraction(num, rng.randint(1, 10 ** rng.randint(1, 12)))


def random_coeffs(rng, degree, large=False):
    """Coefficients n/2^k (|n| <= 8, 0 <= k <= 4), sometimes sparse, sometimes larger."""
    draw = large_coeff if large else small_coeff
    shape = rng.randrange(6)
    coeffs = [draw(rng) for _ in range(degree)]
    if shape == 0:
        coeffs = [c if rng.random() < 0.3 else Fraction(0) for c in coeffs]
    if all(c == 0 for c in coeffs):
        coeffs[0] = Fraction(1)
    return coeffs


# ---------------------------------------------------------------- field cases

def field_cases(rng):
    cases = []
    for n in FIELD_CONDUCTORS:
        F = FlintField(n)
        S = SympyField(n)
        d = F.degree
        units = [k for k in range(1, max(n, 2)) if gcd(k, n) == 1]
        # (mul, inv, galois, norm, trace) counts, fewer inversions and norms in big fields
        counts = (8, 4, 4, 3, 3) if d <= 16 else (5, 2, 3, 2, 2) if d <= 48 else (4, 0, 3, 1, 2)
        for i in range(counts[0]):
            large = i >= counts[0] - 2
            ca, cb = random_coeffs(rng, d, large), random_coeffs(rng, d, large and i % 2 == 0)
            r = F.coeffs(F.mul(F.element(ca), F.element(cb)))
            # sympy must agree
            rs = S.coeffs(S.element(ca) * S.element(cb), d)
            assert r == rs, (n, "mul")
            cases.append({"conductor": n, "op": "mul", "a": text(ca), "b": text(cb),
                          "result": text(r)})
        for i in range(counts[1]):
            ca = random_coeffs(rng, d, large=(i == counts[1] - 1 and d <= 16))
            r = F.coeffs(F.inv(F.element(ca)))
            if d <= 16:
                rs = S.coeffs(S.K.one / S.element(ca), d)
                assert r == rs, (n, "inv")
            cases.append({"conductor": n, "op": "inv", "a": text(ca), "result": text(r)})
        for i in range(counts[2]):
            ca = random_coeffs(rng, d, large=(i == 0))
            k = rng.choice(units)
            if rng.random() < 0.3:
                k -= n  # negative exponents too
            r = F.coeffs(F.galois(F.element(ca), k))
            cases.append({"conductor": n, "op": "galois", "a": text(ca), "k": k,
                          "result": text(r)})
        for i in range(counts[3]):
            ca = random_coeffs(rng, d, large=(i == 0 and d <= 16))
            r = F.norm(F.element(ca))
            cases.append({"conductor": n, "op": "norm", "a": text(ca),
                          "result": rational_text(r)})
        for i in range(counts[4]):
            ca = random_coeffs(rng, d, large=(i == 0))
            r = F.trace(F.element(ca))
            cases.append({"conductor": n, "op": "trace", "a": text(ca),
                          "result": rational_text(r)})
    return cases


# ---------------------------------------------------------------- matrix cases

def matrix_cases(rng):
    cases = []
    for n in MATRIX_CONDUCTORS:
        S = SympyField(n)
        F = FlintField(n)
        d = F.degree
        for size in range(1, 7):
            for singular in (False, True):
                if singular and size == 1:
                    continue
                if singular:
                    # a product B*C with B: size x r and C: r x size has rank <= r < size
                    r = rng.randint(0, size - 1)
                    B = [[random_coeffs(rng, d) for _ in range(r)] for _ in range(size)]
                    C = [[random_coeffs(rng, d) for _ in range(size)] for _ in range(r)]
                    Bm = DomainMatrix([[S.element(x) for x in row] for row in B],
                                      (size, r), S.K)
                    Cm = DomainMatrix([[S.element(x) for x in row] for row in C],
                                      (r, size), S.K)
                    M = Bm * Cm if r > 0 else DomainMatrix.zeros((size, size), S.K)
                    entries = [[S.coeffs(x, d) for x in row] for row in M.to_list()]
                else:
                    entries = [[random_coeffs(rng, d) for _ in range(size)]
                               for _ in range(size)]
                    M = DomainMatrix([[S.element(x) for x in row] for row in entries],
                                     (size, size), S.K)
                rows = [[text(x) for x in row] for row in entries]
                det = S.coeffs(M.det(), d)
                rank = M.rank()
                charpoly = [S.coeffs(c, d) for c in reversed(M.charpoly())]
                # internal consistency: det = (-1)^size * chi(0), rank < size iff det = 0
                sign = -1 if size % 2 else 1
                assert det == [sign * c for c in charpoly[0]]
                assert (rank < size) == all(c == 0 for c in det)
                if singular:
                    assert rank < size
                cases.append({"conductor": n, "op": "det", "matrix": rows, "result": text(det)})
                cases.append({"conductor": n, "op": "rank", "matrix": rows, "result": rank})
                if size <= 5:
                    cases.append({"conductor": n, "op": "charpoly", "matrix": rows,
                                  "result": [text(c) for c in charpoly]})
    return cases


def write(name, description, cases):
    document = {
        "description": description,
        "generator": "scripts/make_reference.py",
        "reference": {"python-flint": flint.__version__, "sympy": sympy.__version__,
                      "python": sys.version.split()[0]},
        "seed": SEED,
        "syntax": "elements: polynomials in z = exp(2*pi*i/n) modulo Phi_n, e.g. "
                  "\"(3 + 2*z - z^5)/7\"; rationals \"p/q\"; charpoly constant term first",
        "cases": cases,
    }
    OUT.mkdir(parents=True, exist_ok=True)
    path = OUT / name
    path.write_text(json.dumps(document, indent=1) + "\n")
    print(f"{path.relative_to(ROOT)}: {len(cases)} cases")


def main():
    rng = random.Random(SEED)
    write("field.json",
          "Q(zeta_n) arithmetic computed by python-flint (fmpq_poly mod Phi_n), products and "
          "inverses cross-checked with sympy",
          field_cases(rng))
    write("matrix.json",
          "det, rank and characteristic polynomial over Q(zeta_n) computed by sympy "
          "(DomainMatrix over QQ<exp(2*pi*I/n)>)",
          matrix_cases(rng))


if __name__ == "__main__":
    main()
