"""Exact numbers: elements of cyclotomic fields Q(ζ_n) and rationals.

An element of Q(ζ_n) is kept as the Rust library keeps it: its coefficients in the power
basis 1, ζ_n, …, ζ_n^(φ(n)−1) modulo the cyclotomic polynomial Φ_n, as integer numerators
over one positive denominator in lowest terms (ζ_n = exp(2πi/n)). Arithmetic, equality and
the text form are computed by the library, exactly; floats appear only in
:meth:`Cyclotomic.to_complex`.
"""

from __future__ import annotations

import cmath
from fractions import Fraction
from typing import Tuple, Union

from . import _native

Triple = Tuple[int, Tuple[int, ...], int]
Number = Union[int, Fraction, "Cyclotomic"]


class Cyclotomic:
    """An exact element of the cyclotomic field Q(ζ_n), n = :attr:`conductor`.

    ``Cyclotomic("z + z^7", 8)`` (= √2) parses cyclorb's field syntax in Q(ζ_8): ``z`` is
    ζ_n, ``zeta(m)`` is ζ_m for m dividing n, ``i``, ``sqrt(r)``, rationals, sums,
    products and powers. ``Cyclotomic(3)`` and ``Cyclotomic(Fraction(1, 2))`` are
    rationals (conductor 1).
    """

    __slots__ = ("_conductor", "_numerators", "_denominator")

    def __init__(self, value: Union[int, Fraction, str] = 0, conductor: int = 1):
        if isinstance(value, Cyclotomic):
            triple = value._triple()
        elif isinstance(value, str):
            triple = _native.element(conductor, value)
        elif isinstance(value, (int, Fraction)):
            q = Fraction(value)
            triple = _native.element(conductor, f"{q.numerator}/{q.denominator}")
        else:
            raise TypeError(f"cannot make a cyclotomic number from {type(value).__name__}")
        self._set(triple)

    def _set(self, triple) -> None:
        n, numerators, denominator = triple
        self._conductor = int(n)
        self._numerators = tuple(int(x) for x in numerators)
        self._denominator = int(denominator)

    @classmethod
    def _from_triple(cls, triple) -> "Cyclotomic":
        x = cls.__new__(cls)
        x._set(triple)
        return x

    def _triple(self):
        return (self._conductor, list(self._numerators), self._denominator)

    @property
    def conductor(self) -> int:
        """n of the field Q(ζ_n) the number is written in."""
        return self._conductor

    @property
    def coefficients(self) -> Tuple[Fraction, ...]:
        """The coefficients of 1, ζ_n, …, ζ_n^(φ(n)−1), exactly."""
        return tuple(Fraction(a, self._denominator) for a in self._numerators)

    def is_rational(self) -> bool:
        """Whether the number is rational."""
        return all(a == 0 for a in self._numerators[1:])

    def to_fraction(self) -> Fraction:
        """The number as a Fraction; ValueError when it is not rational."""
        if not self.is_rational():
            raise ValueError(f"{self} is not rational")
        first = self._numerators[0] if self._numerators else 0
        return Fraction(first, self._denominator)

    def to_complex(self) -> complex:
        """A floating-point value under ζ_n = exp(2πi/n), for display and plotting only."""
        n = self._conductor
        return sum(
            (float(c) * cmath.exp(2j * cmath.pi * k / n) for k, c in enumerate(self.coefficients)),
            0j,
        )

    __complex__ = to_complex

    def to_sympy(self):
        """The number as a sympy expression (needs sympy): Σ c_k·exp(2πik/n)."""
        import sympy

        n = self._conductor
        return sympy.Add(
            *(
                sympy.Rational(c.numerator, c.denominator)
                * sympy.exp(2 * sympy.pi * sympy.I * k / n)
                for k, c in enumerate(self.coefficients)
                if c != 0
            )
        )

    def conjugate(self) -> "Cyclotomic":
        """The complex conjugate (the Galois automorphism ζ ↦ ζ⁻¹)."""
        return Cyclotomic._from_triple(_native.arithmetic("conj", self._triple(), self._triple()))

    def __str__(self) -> str:
        return _native.text(self._triple())

    def __repr__(self) -> str:
        return f"Cyclotomic({str(self)!r}, {self._conductor})"

    def _binary(self, op: str, other) -> "Cyclotomic":
        other = _coerce(other)
        if other is NotImplemented:
            return NotImplemented
        return Cyclotomic._from_triple(_native.arithmetic(op, self._triple(), other._triple()))

    def _reflected(self, op: str, other) -> "Cyclotomic":
        other = _coerce(other)
        if other is NotImplemented:
            return NotImplemented
        return Cyclotomic._from_triple(_native.arithmetic(op, other._triple(), self._triple()))

    def __add__(self, other):
        return self._binary("+", other)

    def __radd__(self, other):
        return self._reflected("+", other)

    def __sub__(self, other):
        return self._binary("-", other)

    def __rsub__(self, other):
        return self._reflected("-", other)

    def __mul__(self, other):
        return self._binary("*", other)

    def __rmul__(self, other):
        return self._reflected("*", other)

    def __truediv__(self, other):
        return self._binary("/", other)

    def __rtruediv__(self, other):
        return self._reflected("/", other)

    def __neg__(self) -> "Cyclotomic":
        return Cyclotomic(0) - self

    def __bool__(self) -> bool:
        return any(self._numerators)

    def __eq__(self, other) -> bool:
        other = _coerce(other)
        if other is NotImplemented:
            return NotImplemented
        if other._conductor == self._conductor:
            return self._triple() == other._triple()
        return not (self - other)

    def __hash__(self) -> int:
        # the normalised trace Tr(x)/φ(n) does not depend on the field x is written in, so
        # equal numbers hash alike (and a rational hashes as the Fraction it equals)
        num, den = _native.normalised_trace(self._triple())
        return hash(Fraction(num, den))


def _coerce(x):
    if isinstance(x, Cyclotomic):
        return x
    if isinstance(x, (int, Fraction)):
        return Cyclotomic(x)
    return NotImplemented


def exact(text: str, conductor: int) -> Union[int, Fraction, Cyclotomic]:
    """An exact value from the library's text: an int or Fraction when rational (``"384"``,
    ``"3/2"``), else a Cyclotomic in Q(ζ_conductor)."""
    try:
        q = Fraction(text)
    except ValueError:
        return Cyclotomic(text, conductor)
    return q.numerator if q.denominator == 1 else q


def from_triple(triple) -> Union[int, Fraction, Cyclotomic]:
    """An int or Fraction when the triple is rational, else a Cyclotomic."""
    x = Cyclotomic._from_triple(triple)
    if x.is_rational():
        q = x.to_fraction()
        return q.numerator if q.denominator == 1 else q
    return x
