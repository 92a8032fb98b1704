"""The orbit of the vacuum line under the mapping class group, and its Poincaré sum."""

from __future__ import annotations

import os
from fractions import Fraction
from typing import List, Optional, Union

from . import _native
from .matrix import Matrix
from .numbers import exact
from .progress import display


class Invariant:
    """One term of B over the invariant matrices: ``coefficient`` · ``matrix``."""

    def __init__(self, coefficient, matrix: Matrix):
        self.coefficient = coefficient
        self.matrix = matrix

    def __repr__(self) -> str:
        return f"<Invariant {self.coefficient} · {self.matrix.shape[0]}×{self.matrix.shape[1]}>"


class OrbitResult:
    """The answer of :func:`orbit`, exact where the program's is.

    ``size`` (int), ``saturated`` (proved closed), ``prefactor`` λ (int or Fraction, None
    unless B = λ·G⁻¹), ``B`` (the Poincaré sum Σ v v† as a Matrix over the basis, when
    listed), ``invariants`` (B over the invariant matrices, when B is not scalar),
    ``layer_sizes``, ``words`` and the rest of ``cyclorb orbit --json`` in :attr:`raw`.
    """

    def __init__(self, raw: dict, stopped_by: Optional[str] = None):
        self.raw = raw
        self.stopped_by = stopped_by
        size = raw["orbit_size"]
        self.size: Optional[int] = None if size is None else int(size)
        self.saturated: bool = raw["saturated"]
        self.stop_reason: Optional[str] = "time" if stopped_by == "time" else raw.get("stop_reason")
        self.method: str = raw["method"]
        self.theory: Optional[str] = raw.get("theory")
        self.genus: Optional[int] = raw.get("genus")
        self.dimension: int = raw["dimension"]
        self.conductor: int = raw["conductor"]
        self.generators: List[str] = raw["generator_names"]
        self.layer_sizes: Optional[List[int]] = raw.get("layer_sizes")
        self.basis: Optional[List[str]] = raw.get("basis")
        self.checkpoint: Optional[str] = raw.get("checkpoint")
        self.words = [(w["line"], w["word"]) for w in raw.get("words") or []]
        self.elapsed: float = raw["elapsed_seconds"]
        sum_ = raw["poincare_sum"]
        self.is_scalar: Optional[bool] = sum_.get("is_scalar")
        self.commutant_dimension: Optional[int] = sum_.get("commutant_dimension")
        text = sum_.get("prefactor")
        self.prefactor: Union[int, Fraction, None] = (
            None if text is None else exact(text, self.conductor)
        )
        self.B: Optional[Matrix] = self._matrix_of(sum_.get("entries"))
        self.invariants: List[Invariant] = [
            Invariant(
                exact(term["coefficient"], self.conductor),
                Matrix([[exact(x, self.conductor) for x in row] for row in term["matrix"]]),
            )
            for term in sum_.get("invariants") or []
        ]

    def _matrix_of(self, entries) -> Optional[Matrix]:
        if entries is None or self.basis is None:
            return None
        index = {label: i for i, label in enumerate(self.basis)}
        return Matrix.from_entries(
            len(self.basis),
            ((index[e["row"]], index[e["column"]], exact(e["value"], self.conductor)) for e in entries),
        )

    def __repr__(self) -> str:
        state = "saturated" if self.saturated else f"not saturated ({self.stop_reason})"
        lam = "" if self.prefactor is None else f", λ = {self.prefactor}"
        return f"<OrbitResult {self.theory} genus {self.genus}: {self.size} lines, {state}{lam}>"


class OrbitInterrupted(KeyboardInterrupt):
    """Ctrl-C during :func:`orbit`: the run stopped cleanly; :attr:`result` is the partial
    answer and its ``checkpoint`` continues it (``orbit(resume=result.checkpoint)``)."""

    def __init__(self, result: OrbitResult):
        super().__init__(f"orbit interrupted after {result.size} lines")
        self.result = result


def orbit(
    spec: Optional[str] = None,
    genus: Optional[int] = None,
    *,
    set: str = "humphries",
    method: str = "enumerate",
    limit: Optional[int] = None,
    memory_limit: Optional[int] = None,
    time_limit: Optional[float] = None,
    threads: Optional[int] = None,
    checkpoint: Union[str, os.PathLike, None] = None,
    resume: Union[str, os.PathLike, None] = None,
    words: int = 0,
    progress=True,
) -> OrbitResult:
    """The orbit of the vacuum line of ``spec`` at ``genus`` and its Poincaré sum.

    ``method``: ``"enumerate"`` (list every line), ``"structure"`` (count the lines through
    the monomial structure, with a re-checked certificate, Ising at any genus; for an
    untwisted ``dw:GROUP`` as |P| / |Stab_P(S)|, with ``limit`` capping the listed orbits
    of the parts, a stopped count giving ``saturated=False`` and its proved bounds in
    ``raw["details"]``) or ``"product"`` (a Deligne product A*B from its factors). Limits: ``limit`` lines, ``memory_limit`` MiB (the budget of every
    allocation; default a quarter of the machine), ``time_limit`` seconds; a stopped run
    returns ``saturated=False`` with its ``checkpoint``, which ``resume=`` continues to the
    identical answer (``orbit(resume=path)`` alone is enough). Ctrl-C raises
    :class:`OrbitInterrupted` carrying the partial result. ``progress``: True (a display in
    a notebook or terminal), False, or a callable receiving snapshots.
    """
    callback, close = display(progress)
    try:
        raw, stopped_by, error = _native.orbit(
            spec,
            genus,
            set=set,
            method=method,
            limit=limit,
            memory_limit=memory_limit,
            time_limit=time_limit,
            threads=threads,
            checkpoint=None if checkpoint is None else os.fspath(checkpoint),
            resume=None if resume is None else os.fspath(resume),
            words=words,
            progress=callback,
        )
    finally:
        close()
    result = OrbitResult(raw, stopped_by)
    if isinstance(error, KeyboardInterrupt):
        raise OrbitInterrupted(result) from error
    if error is not None:
        raise error
    return result
