"""The example under examples/ runs top to bottom and prints the published values."""

import runpy
from pathlib import Path

EXAMPLE = Path(__file__).resolve().parents[2] / "examples" / "genus_growth.py"


def test_genus_growth_runs(tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(tmp_path)
    try:
        runpy.run_path(str(EXAMPLE), run_name="__main__")
    except SystemExit as done:  # the branch without matplotlib ends with exit(0)
        assert done.code == 0
    out = capsys.readouterr().out
    # Castro, Gaberdiel, Hartman, Maloney, Volpato (2012) and the all-genus follow-up (2019)
    assert "genus 1: dim V_g = 3, orbit 24 lines, λ = 8" in out
    assert "genus 2: dim V_g = 10, orbit 3840 lines, λ = 384" in out
    # Lagrangian subspaces of F_2^6: (2+1)(4+1)(8+1) = 135 (Grove, Classical Groups and
    # Geometric Algebra)
    assert "dw:Z2     3       64      135" in out
