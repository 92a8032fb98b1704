"""How fast does the vacuum orbit grow with the genus?

A walk through the Python module, top to bottom:

1. build a theory and look at its data (labels, twists, central charge, verification);
2. the vacuum orbit of the mapping class group at genus 1 and 2, with its Poincaré sum B;
3. B over the labels of the basis;
4. a small sweep over theories and genera, and a plot of orbit size against genus
   (matplotlib when it is installed, else the table is printed).

Run it after installing the module from the repository's root:

    pip install ./python
    python examples/genus_growth.py            # writes genus_growth.png with matplotlib

Every number printed is exact (int, fractions.Fraction or cyclorb.Cyclotomic).
"""

from __future__ import annotations

import math
import sys

import cyclorb

# 1. A theory: the Ising anyons.
ising = cyclorb.Theory("ising")
print(ising)
for label, twist, dim in zip(ising.labels, ising.twists, ising.quantum_dimensions):
    print(f"  label {label:>5}: twist θ = {twist}, quantum dimension d = {dim}")
print("  verified:", bool(ising.verify()))

# 2. The vacuum orbit at genus 1 and 2: its size and B = λ·G⁻¹.
for genus in (1, 2):
    r = cyclorb.orbit("ising", genus=genus, progress=False)
    print(f"genus {genus}: dim V_g = {r.dimension}, orbit {r.size} lines, λ = {r.prefactor}")

# 3. B over the labels. At genus 1 the basis is labelled by the anyon a running around
# the cycle; at genus 2 by the labels of the comb (B is diagonal there, B = λ·G⁻¹).
g1 = cyclorb.orbit("ising", genus=1, progress=False)
print("genus 1, B over the labels:")
invariant = g1.raw["poincare_sum"]["modular_invariant"]
for label, row in zip(invariant["labels"], invariant["matrix"]):
    print(f"  {label:>5}: {' '.join(f'{x:>3}' for x in row)}")
g2 = cyclorb.orbit("ising", genus=2, progress=False)
print("genus 2, the diagonal of B by comb label (first five):")
for i, label in enumerate(g2.basis[:5]):
    print(f"  {label}: {g2.B[i, i]}")

# A theory whose B is not a multiple of the identity: the three-state Potts model
# M(6,5) at genus 1, where B is a sum of modular invariants with exact coefficients.
potts = cyclorb.orbit("kac:6:5", genus=1, progress=False)
print(f"M(6,5) at genus 1: {potts.size} lines, {len(potts.invariants)} invariants, coefficients",
      [term.coefficient for term in potts.invariants])

# 4. Orbit size against genus: a sweep (the plan of `cyclorb sweep`, given as text). The
# Dijkgraaf–Witten theory of Z2 is counted rather than listed (method "structure").
plan = """
answers = ["orbit"]
[[theory]]
spec = "zn:2:1"
label = "semion"
genera = [1, 2]
[[theory]]
spec = "ising"
genera = [1, 2]
[[theory]]
spec = "dw:Z2"
genera = [1, 2, 3]
method = "structure"
"""
result = cyclorb.sweep(plan)
series: dict[str, list[tuple[int, int]]] = {}
print(f"{'theory':<8} {'g':>2} {'dim V_g':>8} {'orbit':>8} {'λ':>6}")
for run in result.runs:
    print(f"{run.label:<8} {run.genus:>2} {run.dimension:>8} {run.size:>8} "
          f"{str(run.prefactor) if run.prefactor is not None else '—':>6}")
    series.setdefault(run.label, []).append((run.genus, run.size))

try:
    import matplotlib

    matplotlib.use("Agg")
    import matplotlib.pyplot as plt
except ImportError:
    print("matplotlib is not installed: the table above is the plot's data "
          "(pip install matplotlib for genus_growth.png)")
    sys.exit(0)

fig, ax = plt.subplots(figsize=(5, 3.5))
for theory, points in series.items():
    genera = [g for g, _ in points]
    ax.plot(genera, [math.log10(n) for _, n in points], marker="o", label=theory)
ax.set_xlabel("genus g")
ax.set_ylabel("log10 (vacuum orbit size)")
ax.set_xticks(sorted({g for points in series.values() for g, _ in points}))
ax.legend()
fig.tight_layout()
fig.savefig("genus_growth.png", dpi=120)
print("written: genus_growth.png")
