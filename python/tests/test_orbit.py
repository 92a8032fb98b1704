"""Orbits from Python, against the published values the Rust suite checks too."""

from fractions import Fraction

import pytest

import cyclorb


def test_ising_genus_one_and_two():
    # Castro, Gaberdiel, Hartman, Maloney, Volpato, "The gravity dual of the Ising model"
    # (2012): genus 1, 24 terms, B = 8·I; the all-genus follow-up (2019): genus 2, 3840
    # terms, B = 384·G⁻¹.
    r1 = cyclorb.orbit("ising", genus=1, progress=False)
    assert (r1.size, r1.prefactor, r1.saturated) == (24, 8, True)
    assert r1.B.tolist() == [[8, 0, 0], [0, 8, 0], [0, 0, 8]]
    r2 = cyclorb.orbit("ising", genus=2, progress=False)
    assert (r2.size, r2.prefactor) == (3840, 384)
    assert isinstance(r2.prefactor, int)


def test_tricritical_ising_genus_one():
    # Castro et al. 2012: tricritical Ising (c = 7/10) at genus 1 gives B = 48·I.
    r = cyclorb.orbit("tricritical-ising", genus=1, progress=False)
    assert r.prefactor == 48 and r.saturated


def test_a_non_scalar_sum_comes_with_exact_invariants():
    # M(6,5) at genus 1: B is a combination of modular invariants with positive
    # coefficients (Castro et al. 2012, the three-state Potts model); the coefficients are
    # exact and the sum of the terms is B.
    r = cyclorb.orbit("kac:6:5", genus=1, progress=False)
    assert r.prefactor is None and r.is_scalar is False
    assert len(r.invariants) >= 2
    total = [[0] * r.dimension for _ in range(r.dimension)]
    for term in r.invariants:
        assert term.coefficient > 0
        for i in range(r.dimension):
            for j in range(r.dimension):
                total[i][j] += term.coefficient * term.matrix[i, j]
    assert total == r.B.tolist()


def test_product_route():
    # Ising ⊠ Ising: the diagonal action keeps the vacuum pair on the diagonal (derived in
    # the pipeline's product module): 24 lines at genus 1.
    r = cyclorb.orbit("ising*ising", genus=1, method="product", progress=False)
    assert r.size == 24 and r.method == "product"


def test_interrupt_and_resume(tmp_path):
    checkpoint = tmp_path / "run.ckpt"

    def interrupt(_snapshot):
        raise KeyboardInterrupt

    with pytest.raises(cyclorb.OrbitInterrupted) as stopped:
        cyclorb.orbit("ising", genus=2, checkpoint=checkpoint, threads=1, progress=interrupt)
    partial = stopped.value.result
    assert not partial.saturated and partial.size < 3840
    assert partial.checkpoint == str(checkpoint)
    done = cyclorb.orbit(resume=checkpoint, progress=False)
    assert (done.size, done.prefactor, done.saturated) == (3840, 384, True)


def test_limits_stop_with_a_partial_result():
    r = cyclorb.orbit("ising", genus=2, limit=100, progress=False)
    assert (r.size, r.saturated, r.stop_reason) == (100, False, "limit")
    assert r.prefactor is None
    t = cyclorb.orbit("ising", genus=3, time_limit=0, progress=False)
    assert not t.saturated and t.stop_reason == "time"


def test_progress_snapshots_reach_a_callback():
    seen = []
    cyclorb.orbit("ising", genus=2, threads=1, progress=seen.append)
    assert seen and seen[-1]["lines"] <= 3840
    assert {"layer", "lines", "elapsed"} <= set(seen[0])


def test_errors_carry_the_programs_message():
    with pytest.raises(cyclorb.CyclorbError, match="unknown"):
        cyclorb.orbit("no-such-theory", genus=1, progress=False)
    with pytest.raises(cyclorb.CyclorbError, match="genus"):
        cyclorb.orbit("ising", progress=False)


def test_certificates():
    assert cyclorb.commutant("ising", 2).dimension == 1
    # Fibonacci at genus 2 has an infinite image (Freedman, Larsen and Wang 2002)
    w = cyclorb.witness("fibonacci", 2)
    assert w.found and w.word


def test_counting_route_agrees_with_listing():
    # Ising at genus 2 counted through the monomial structure: the published 3840 lines and
    # λ = 384 (as above), 15 supports = (2+1)(4+1) Lagrangian subspaces of F_2^4 (Grove,
    # Classical Groups and Geometric Algebra)
    r = cyclorb.orbit("ising", genus=2, method="structure", progress=False)
    assert (r.size, r.prefactor, r.method) == (3840, 384, "structure")
    assert r.raw["supports"] == 15 and r.raw["certificate_rechecked"]


def test_image_routes_agree():
    # the structure's count and Schreier–Sims on the 3840 lines are independent routes
    by_structure = cyclorb.image("ising", 2)
    by_orbit = cyclorb.image("ising", 2, route="orbit")
    assert by_structure.route == "structure" and by_orbit.route == "orbit-schreier-sims"
    assert by_structure.order == by_orbit.order and by_structure.finite
    # 3840 lines, each stabilised by the same number of elements: the orbit divides |image|
    assert by_orbit.order % 3840 == 0
    # Fibonacci at genus 2: infinite image (Freedman, Larsen and Wang 2002)
    fib = cyclorb.image("fibonacci", 2)
    assert fib.finite is False and fib.route == "witness"


def test_imprimitive_count_agrees_with_listing():
    # SU(2)_4 has no monomial structure; powers of its twists commute and their joint
    # eigenspaces are permuted (imprimitive): the count must equal the listed orbit, and the
    # image order that of Schreier–Sims on the listed lines (two independent routes)
    counted = cyclorb.orbit("su2:4", genus=1, method="structure", progress=False)
    listed = cyclorb.orbit("su2:4", genus=1, progress=False)
    assert counted.raw["structure"] == "imprimitive"
    assert counted.size == listed.size == 48
    by_structure = cyclorb.image("su2:4", 1)
    by_orbit = cyclorb.image("su2:4", 1, route="orbit")
    assert by_structure.certificate_kind == "structure-imprimitive"
    assert by_orbit.certificate_kind == "image-orbit"
    assert by_structure.order == by_orbit.order
