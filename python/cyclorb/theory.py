"""Theories (modular tensor categories) and their genus-g block spaces."""

from __future__ import annotations

import os
from fractions import Fraction
from typing import Dict, List, Optional, Union

from . import _native
from .matrix import Matrix
from .numbers import from_triple


class Verification:
    """The outcome of every check of ``cyclorb verify`` (pentagon, hexagons, ribbon,
    modularity, …): :attr:`ok` and the :attr:`checks` as dicts (``name``, ``equation``,
    ``ok``, ``instances``, ``failure``)."""

    def __init__(self, data: dict):
        self.theory: str = data["theory"]
        self.ok: bool = data["ok"]
        self.checks: List[dict] = data["checks"]

    def __bool__(self) -> bool:
        return self.ok

    def __repr__(self) -> str:
        failed = [c["name"] for c in self.checks if not c["ok"]]
        state = "ok" if self.ok else "FAILS " + ", ".join(failed)
        return f"<Verification of {self.theory}: {state}>"


class Theory:
    """A theory from a built-in spec (``"ising"``, ``"su2:4"``, ``"fibonacci*fibonacci"``,
    …; ``cyclorb theories`` lists them) or a theory file. A file is proved (every check of
    :meth:`verify`) before it is used, as by every command of the program."""

    def __init__(self, spec: Union[str, os.PathLike]):
        spec = os.fspath(spec)
        data = _native.theory(spec)
        self.spec: str = spec
        self.name: str = data["name"]
        self.labels: List[str] = data["labels"]
        self.duals: List[int] = data["duals"]
        self.conductor: int = data["conductor"]
        self.quantum_dimensions = [from_triple(t) for t in data["quantum_dimensions"]]
        self.twists = [from_triple(t) for t in data["twists"]]
        self.S: Optional[Matrix] = (
            None if data["S"] is None else Matrix([[from_triple(t) for t in r] for r in data["S"]])
        )
        num, den = data["central_charge_mod_8"]
        self.central_charge_mod_8 = Fraction(num, den)
        self.modular_data_only: bool = data["modular_data_only"]
        self.data_hash: str = data["data_hash"]

    @property
    def rank(self) -> int:
        return len(self.labels)

    @property
    def T(self) -> Matrix:
        """diag(θ_a), the twists."""
        n = self.rank
        return Matrix.from_entries(n, ((a, a, t) for a, t in enumerate(self.twists)))

    def verify(self) -> Verification:
        """Run every check on the data (the structural route for products and conjugates)."""
        return Verification(_native.verify(self.spec))

    def save(self, path: Union[str, os.PathLike]) -> None:
        """Write the theory as a theory file (reading it back gives the same data hash)."""
        with open(path, "w", encoding="utf-8") as f:
            f.write(_native.theory_file(self.spec))

    def block_space(self, genus: int, set: str = "humphries") -> "BlockSpace":
        """The genus-g block space with the Dehn twists of a generating set."""
        return BlockSpace(self.spec, genus, set)

    def __repr__(self) -> str:
        return f"<Theory {self.name}: labels {self.labels}, c = {self.central_charge_mod_8} mod 8>"


class BlockSpace:
    """The space of genus-g conformal blocks in the comb basis: its :attr:`basis` labels,
    the index of the :attr:`vacuum`, the diagonal invariant :attr:`form` G, and the
    :attr:`generators` (Dehn twists by curve name, exact matrices acting on columns)."""

    def __init__(self, spec: str, genus: int, set: str = "humphries"):
        data = _native.block_space(spec, genus, set)
        self.theory: str = data["theory"]
        self.genus: int = data["genus"]
        self.dimension: int = data["dimension"]
        self.conductor: int = data["conductor"]
        self.basis: List[str] = data["basis"]
        self.vacuum: int = data["vacuum"]
        self.form = [from_triple(t) for t in data["form"]]
        self.generators: Dict[str, Matrix] = {
            name: Matrix.from_entries(
                self.dimension, ((i, j, from_triple(t)) for i, j, t in entries)
            )
            for name, entries in data["generators"]
        }

    def __repr__(self) -> str:
        return (
            f"<BlockSpace of {self.theory} at genus {self.genus}: dimension {self.dimension}, "
            f"generators {list(self.generators)}>"
        )
