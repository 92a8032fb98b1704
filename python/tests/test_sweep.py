"""Sweeps from Python: the plan of `cyclorb sweep`, run through the pipeline."""

import pytest

import cyclorb

PLAN = """
answers = ["orbit", "image"]
[[theory]]
spec = "ising"
genera = [1, 2]
[[theory]]
spec = "fibonacci"
genera = [1]
"""


def test_a_plan_text_gives_the_published_values():
    result = cyclorb.sweep(PLAN, threads=1)
    assert [r.id for r in result.runs] == ["ising-g1", "ising-g2", "fibonacci-g1"]
    # Castro, Gaberdiel, Hartman, Maloney, Volpato (2012) and the all-genus follow-up
    # (2019): Ising 24 lines with λ = 8 at genus 1, 3840 lines with λ = 384 at genus 2
    g1, g2 = result.run("ising", 1), result.run("ising", 2)
    assert (g1.size, g1.prefactor, g1.saturated) == (24, 8, True)
    assert (g2.size, g2.prefactor, g2.saturated) == (3840, 384, True)
    assert isinstance(g2.prefactor, int)
    # from memory: Fibonacci at genus 1 has the image SL(2, 5)/±1 ≅ A₅, of order 60
    fib = result.run("fibonacci", 1)
    assert (fib.image_order, fib.image_finite) == (60, True)
    assert not result.interrupted and all(not r.errors for r in result.runs)


def test_a_plan_file_with_counted_dw_runs(tmp_path):
    plan = tmp_path / "dw.toml"
    plan.write_text('[[theory]]\nspec = "dw:Z2"\ngenera = [1, 2, 3]\nmethod = "structure"\n')
    result = cyclorb.sweep(plan, threads=1)
    # Lagrangian subspaces of F_2^{2g}: Π_{k=1}^{g} (2^k + 1) (Grove, Classical Groups and
    # Geometric Algebra)
    assert [r.size for r in result.runs] == [3, 15, 135]
    assert all(r.raw["counted"]["kind"] == "dw-vacuum-set-stabiliser" for r in result.runs)
    assert result.name == "dw"


def test_limits_as_keywords_replace_the_plans():
    result = cyclorb.sweep('[[theory]]\nspec = "ising"\ngenera = [2]\nanswers = ["orbit"]\n', lines=100)
    r = result.runs[0]
    assert (r.size, r.saturated, r.stop_reason, r.prefactor) == (100, False, "limit", None)
    with pytest.raises(cyclorb.CyclorbError, match="lines must be at least 1"):
        cyclorb.sweep(PLAN, lines=0)


def test_a_bad_plan_names_the_line():
    with pytest.raises(cyclorb.CyclorbError, match=r"<plan>:3:.*genus must be at least 1"):
        cyclorb.sweep('[[theory]]\nspec = "ising"\ngenera = [0]\n')
    with pytest.raises(cyclorb.CyclorbError, match="not a sweep route"):
        cyclorb.sweep('[[theory]]\nspec = "ising"\ngenera = [1]\nmethod = "product"\n')


def test_interrupted_and_continued(tmp_path):
    def interrupt(snapshot):
        if snapshot["run"] == "ising-g2" and snapshot["stage"] == "start":
            raise KeyboardInterrupt

    plan = '[[theory]]\nspec = "ising"\ngenera = [1, 2]\nanswers = ["orbit"]\n'
    with pytest.raises(cyclorb.SweepInterrupted) as stopped:
        cyclorb.sweep(plan, out=tmp_path, threads=1, progress=interrupt)
    partial = stopped.value.result
    assert partial.interrupted and [r.id for r in partial.runs] == ["ising-g1"]
    stages = []
    done = cyclorb.sweep(plan, out=tmp_path, threads=1, progress=stages.append)
    assert [r.size for r in done.runs] == [24, 3840]
    assert {"orbit", "Poincaré sum"} <= {s["stage"] for s in stages}
