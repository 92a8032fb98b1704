"""Dijkgraaf–Witten theories counted from Python (the pipeline's dw counting route)."""

import pytest

import cyclorb


def lagrangians(p: int, g: int) -> int:
    # Lagrangian subspaces of a 2g-dimensional symplectic space over F_p: Π_{k=1}^{g} (p^k + 1)
    # (Grove, Classical Groups and Geometric Algebra)
    n = 1
    for k in range(1, g + 1):
        n *= p**k + 1
    return n


@pytest.mark.parametrize("p, genus", [(2, 1), (2, 2), (2, 3), (3, 1), (3, 2)])
def test_abelian_counts_are_lagrangian_subspaces(p, genus):
    # For D(Z_p) the vacuum orbit consists of the Lagrangian subspaces of
    # H_1(Σ_g, F_p) (docs/dijkgraaf-witten.md)
    r = cyclorb.orbit(f"dw:Z{p}", genus=genus, method="structure", progress=False)
    assert (r.size, r.saturated, r.method) == (lagrangians(p, genus), True, "structure")
    assert r.raw["details"]["route"] == "dw-set-stabiliser"


def test_s3_counted_equals_listed():
    # two independent routes: |P| / |Stab_P(S)| and the breadth-first listing; B over the
    # orbitals must agree term by term, and tr B = |orbit|·|S|
    counted = cyclorb.orbit("dw:S3", genus=2, method="structure", progress=False)
    listed = cyclorb.orbit("dw:S3", genus=2, progress=False)
    assert counted.size == listed.size == 38400
    assert counted.raw["poincare_sum"]["trace_check"] is True
    coefficients = lambda r: [t["coefficient"] for t in r.raw["poincare_sum"]["invariants"]]
    assert coefficients(counted) == coefficients(listed)
    assert int(counted.raw["image_order"]) % 38400 == 0


def test_a_capped_count_gives_proved_bounds():
    r = cyclorb.orbit("dw:S3", genus=2, method="structure", limit=1, progress=False)
    assert (r.size, r.saturated, r.stop_reason) == (None, False, "limit")
    details = r.raw["details"]
    assert 1 <= int(details["orbit_lower_bound"]) <= 38400 <= int(details["orbit_upper_bound"])


def test_a_twisted_theory_is_refused_by_the_count():
    with pytest.raises(cyclorb.CyclorbError, match="untwisted"):
        cyclorb.orbit("dw:Z2:1", genus=1, method="structure", progress=False)
