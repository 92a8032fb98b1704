"""A sweep: a plan of theories × genera run through the same pipeline as ``cyclorb sweep``."""

from __future__ import annotations

import os
from fractions import Fraction
from typing import Callable, List, Optional, Union

from . import _native
from .numbers import Cyclotomic, exact


class SweepRun:
    """One finished run of a sweep, exact where the program's ``result.json`` is.

    ``id``, ``theory``, ``genus``, ``dimension``, ``conductor``; ``size`` (int, None when
    no orbit was asked for), ``saturated``, ``stop_reason``, ``layer_sizes``; ``prefactor``
    λ (int, Fraction or Cyclotomic; None unless B = λ·G⁻¹); ``image_order`` (int, None
    unless proved finite), ``image_finite``, ``image_route``; ``commutant_dimension``;
    ``witness`` (the word of infinite order, or None); ``errors``; the whole result in
    :attr:`raw`.
    """

    def __init__(self, raw: dict):
        self.raw = raw
        self.id: str = raw["id"]
        self.theory: str = raw["theory"]
        self.label: str = raw["label"]
        self.genus: int = raw["genus"]
        self.dimension: int = raw["dimension"]
        self.conductor: int = raw["conductor"]
        self.answers: List[str] = raw["answers"]
        self.size: Optional[int] = raw["orbit_size"]
        self.saturated: Optional[bool] = raw["saturated"]
        self.stop_reason: Optional[str] = raw["stop_reason"]
        self.layer_sizes: Optional[List[int]] = raw["layer_sizes"]
        sum_ = raw.get("poincare_sum") or {}
        text = sum_.get("prefactor")
        self.prefactor: Union[int, Fraction, Cyclotomic, None] = (
            None if text is None else exact(text, self.conductor)
        )
        image = raw.get("image") or {}
        order = image.get("order")
        self.image_order: Optional[int] = None if order is None else int(order)
        self.image_finite: Optional[bool] = image.get("finite")
        self.image_route: Optional[str] = image.get("route")
        commutant = raw.get("commutant") or {}
        self.commutant_dimension: Optional[int] = commutant.get("commutant_dimension")
        witness = raw.get("witness") or {}
        self.witness: Optional[List[str]] = witness.get("word") if witness.get("found") else None
        self.errors: List[str] = raw["errors"]
        self.elapsed: float = raw["total_seconds"]

    def __repr__(self) -> str:
        size = "no orbit" if self.size is None else f"{self.size} lines"
        lam = "" if self.prefactor is None else f", λ = {self.prefactor}"
        return f"<SweepRun {self.id}: {size}{lam}>"


class SweepResult:
    """The answer of :func:`sweep`: :attr:`runs` (:class:`SweepRun`, in plan order),
    ``plan_hash``, ``notes`` (checkpoints that could not be used, …) and ``interrupted``."""

    def __init__(self, raw: dict):
        self.raw = raw
        self.name: str = raw["name"]
        self.plan_hash: str = raw["plan_hash"]
        self.interrupted: bool = raw["interrupted"]
        self.notes: List[str] = raw["notes"]
        self.runs: List[SweepRun] = [SweepRun(r) for r in raw["runs"]]

    def run(self, theory: str, genus: int) -> SweepRun:
        """The run of ``theory`` (as the plan names it, or its label) at ``genus``."""
        for r in self.runs:
            if r.genus == genus and theory in (r.theory, r.label):
                return r
        raise KeyError(f"no finished run of {theory} at genus {genus}")

    def __repr__(self) -> str:
        state = ", interrupted" if self.interrupted else ""
        return f"<SweepResult {self.name}: {len(self.runs)} runs{state}>"


class SweepInterrupted(KeyboardInterrupt):
    """Ctrl-C during :func:`sweep`: it stopped cleanly between chunks; :attr:`result` holds
    the runs finished so far. With ``out=DIR`` the same call continues from the stopped
    run's checkpoint."""

    def __init__(self, result: SweepResult):
        super().__init__(f"sweep interrupted after {len(result.runs)} runs")
        self.result = result


def sweep(
    plan: Union[str, os.PathLike],
    *,
    lines: Optional[int] = None,
    memory_mib: Optional[int] = None,
    seconds: Optional[int] = None,
    threads: Optional[int] = None,
    out: Union[str, os.PathLike, None] = None,
    progress: Optional[Callable[[dict], object]] = None,
) -> SweepResult:
    """Run a sweep plan (the TOML of ``cyclorb sweep``): a path to the plan file, or the
    plan's text itself (any string holding a newline; its ``file`` entries are then read
    relative to the current folder). The plan is checked before anything runs (errors name
    the line and the reason) and the runs go smallest first, as in the program.

    Caps given here replace the plan's in every entry: ``lines`` (orbit lines),
    ``memory_mib`` (orbit store), ``seconds`` (enumeration time). ``threads`` overrides the
    plan's. ``out``: a folder keeping each run's checkpoint (``runs/<id>/checkpoint.bin``)
    so that an interrupted sweep continues; by default a temporary folder, removed.
    ``progress``: a callable receiving dicts with ``run`` and ``stage`` (and, while an
    orbit is listed, ``layer``, ``lines``, ``lines_per_second``, ``elapsed``). Ctrl-C
    raises :class:`SweepInterrupted` with the finished runs.
    """
    if progress is not None and not callable(progress):
        raise TypeError("progress must be None or a callable receiving dicts")
    path, text = (None, plan) if isinstance(plan, str) and "\n" in plan else (os.fspath(plan), None)
    raw, error = _native.sweep(
        path,
        text,
        lines=lines,
        memory_mib=memory_mib,
        seconds=seconds,
        threads=threads,
        out=None if out is None else os.fspath(out),
        progress=progress,
    )
    result = SweepResult(raw)
    if isinstance(error, KeyboardInterrupt):
        raise SweepInterrupted(result) from error
    if error is not None:
        raise error
    return result
