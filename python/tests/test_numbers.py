"""Exact cyclotomic arithmetic through the module, against textbook identities and sympy."""

from fractions import Fraction

import pytest

from cyclorb import Cyclotomic, CyclorbError


def test_square_root_of_two_in_q_zeta_8():
    # ζ_8 + ζ_8⁷ = 2 cos(π/4) = √2 (textbook)
    r2 = Cyclotomic("z + z^7", 8)
    assert r2 * r2 == 2
    assert Cyclotomic("sqrt(2)", 8) == r2
    assert abs(complex(r2) - 2 ** 0.5) < 1e-12


def test_equal_numbers_in_different_fields_are_equal_and_hash_alike():
    # i = ζ_4 = ζ_8² (textbook)
    a, b = Cyclotomic("i", 4), Cyclotomic("z^2", 8)
    assert a == b and hash(a) == hash(b)
    assert {a, b} == {a}
    # a rational is its Fraction, in any field
    half = Cyclotomic("1/2", 12)
    assert half == Fraction(1, 2) and hash(half) == hash(Fraction(1, 2))


def test_sum_of_the_primitive_roots_is_the_moebius_function():
    # Σ over primitive n-th roots of unity = μ(n) (Ramanujan sum c_n(1); textbook)
    for n, mu in [(5, -1), (6, 1), (8, 0), (15, 1), (12, 0), (7, -1)]:
        from math import gcd

        total = sum(
            (Cyclotomic(f"z^{k}", n) for k in range(1, n) if gcd(k, n) == 1), Cyclotomic(0)
        )
        assert total == mu, n


def test_field_operations_and_conjugation():
    z = Cyclotomic("z", 5)
    assert z * z.conjugate() == 1
    assert (z + 1) / (z + 1) == 1
    assert (z - z) == 0 and not (z - z)
    assert -z + z == 0
    assert (1 + z) * 3 == 3 + 3 * z


def test_bad_text_names_the_place():
    with pytest.raises(CyclorbError, match="at byte"):
        Cyclotomic("z + ", 8)


def test_agrees_with_sympy():
    sympy = pytest.importorskip("sympy")
    x = Cyclotomic("z + 2*z^3 - 1/3", 12)
    expr = x.to_sympy()
    assert abs(complex(sympy.N(expr)) - complex(x)) < 1e-12
