"""Theories and block spaces, against textbook modular data."""

from fractions import Fraction
from pathlib import Path

import pytest

import cyclorb
from cyclorb import Cyclotomic, CyclorbError, Theory

FIXTURES = Path(__file__).resolve().parents[2] / "fixtures"


def test_ising_modular_data():
    # Ising: twists 1, e^{2πi/16}, −1; S = ½[[1, √2, 1], [√2, 0, −√2], [1, −√2, 1]];
    # c = 1/2 (textbook, e.g. Kitaev 2006, Table 1)
    t = Theory("ising")
    assert t.labels == ["1", "sigma", "psi"]
    assert t.twists == [1, Cyclotomic("z", 16), -1]
    r2 = Cyclotomic("sqrt(2)", 16)
    half = Fraction(1, 2)
    assert t.S.tolist() == [
        [half, r2 / 2, half],
        [r2 / 2, 0, -r2 / 2],
        [half, -r2 / 2, half],
    ]
    assert t.central_charge_mod_8 == Fraction(1, 2)
    assert t.verify().ok


def test_a_theory_file_round_trips(tmp_path):
    path = tmp_path / "fib.json"
    Theory("fibonacci").save(path)
    again = Theory(path)
    assert again.data_hash == Theory("fibonacci").data_hash
    assert again.twists == Theory("fibonacci").twists


def test_a_broken_theory_file_is_refused_with_the_failing_check():
    broken = FIXTURES / "theories" / "broken" / "fib-with-d0.json"
    with pytest.raises(CyclorbError, match="fails verification"):
        Theory(broken)


def test_block_space_dimensions_follow_the_verlinde_formula():
    # Ising genus-g dimensions 3, 10, 36 (Verlinde formula; common practice); Humphries'
    # generators: 2 curves at genus 1, 2g + 1 from genus 2 on (common practice)
    for genus, dim, curves in [(1, 3, 2), (2, 10, 5), (3, 36, 7)]:
        space = Theory("ising").block_space(genus)
        assert space.dimension == dim
        assert len(space.generators) == curves
    s = cyclorb.BlockSpace("ising", 1)
    assert s.basis[s.vacuum].startswith("a=(1)")


def test_matrices_convert_to_numpy():
    numpy = pytest.importorskip("numpy")
    s = Theory("fibonacci").S.to_numpy()
    # S is unitary and symmetric (textbook modular data)
    assert numpy.allclose(s @ s.conj().T, numpy.eye(2))
    assert numpy.allclose(s, s.T)
