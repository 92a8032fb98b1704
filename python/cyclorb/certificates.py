"""Certified answers about the group the Dehn twists generate."""

from __future__ import annotations

from typing import List, Optional

from . import _native


class CommutantResult:
    """The certified dimension of the commutant (matrices commuting with every twist):
    ``dimension``, ``irreducible``, the ``primes`` of the modular bounds, the
    ``certificate`` (re-checked before it is returned)."""

    def __init__(self, raw: dict):
        self.raw = raw
        self.dimension: int = raw["commutant_dimension"]
        self.irreducible: bool = raw["irreducible"]
        self.primes: List[int] = raw["primes"]
        self.certificate: dict = raw["certificate"]

    def __repr__(self) -> str:
        return f"<CommutantResult dimension {self.dimension}>"


class WitnessResult:
    """A word of infinite projective order (``found``, ``word``, ``certificate``), or the
    number of words tried when none was found (which proves nothing)."""

    def __init__(self, raw: dict):
        self.raw = raw
        self.found: bool = raw["found"]
        self.word: List[str] = raw["word"]
        self.certificate: Optional[dict] = raw["certificate"]
        self.lifted_from_factor: Optional[dict] = raw["lifted_from_factor"]
        self.words_tried: Optional[int] = raw["words_tried"]

    def __repr__(self) -> str:
        if self.found:
            return f"<WitnessResult: {' '.join(self.word)} has infinite projective order>"
        return f"<WitnessResult: none among {self.words_tried} words>"


def commutant(spec: str, genus: int, set: str = "humphries") -> CommutantResult:
    """The certified commutant dimension at genus g."""
    return CommutantResult(_native.commutant(spec, genus, set))


def witness(
    spec: str,
    genus: int,
    set: str = "humphries",
    depth: Optional[int] = None,
    tries: Optional[int] = None,
) -> WitnessResult:
    """Search for a certified element of infinite projective order."""
    return WitnessResult(_native.witness(spec, genus, set, depth, tries))


class ImageResult:
    """The order of the projective image: ``finite`` (None when undecided), ``order`` (an
    int when finite), the ``route`` that decided it (the program's route names), the
    ``steps`` passed over, the ``reason`` when undecided, and the re-checked
    ``certificate`` with its ``certificate_kind`` (the ``kind`` of the program's ``--out``
    file: ``structure``, ``structure-imprimitive``, ``image-orbit``, ...)."""

    def __init__(self, raw: dict):
        self.raw = raw
        self.finite: Optional[bool] = raw["finite"]
        self.order: Optional[int] = None if raw["order"] is None else int(raw["order"])
        self.route: str = raw["route"]
        self.steps: List[str] = raw["steps"]
        self.reason: Optional[str] = raw["reason"]
        self.certificate: Optional[dict] = raw["certificate"]
        self.certificate_kind: Optional[str] = raw["certificate_kind"]

    def __repr__(self) -> str:
        if self.finite:
            return f"<ImageResult: finite, order {self.order} ({self.route})>"
        if self.finite is False:
            return f"<ImageResult: infinite ({self.route})>"
        return f"<ImageResult: undecided ({self.reason})>"


def image(
    spec: str,
    genus: int,
    set: str = "humphries",
    route: str = "auto",
    orbit_limit: int = 2_000_000,
    enumeration_cap: int = 20_000,
    witness_after: int = 100_000,
    threads: Optional[int] = None,
) -> ImageResult:
    """Decide the order of the projective image of the twists (``route``: ``auto``,
    ``structure``, ``enumeration`` or ``orbit``, as ``cyclorb image --route``)."""
    return ImageResult(
        _native.image(
            spec, genus, set, route, orbit_limit, enumeration_cap, witness_after, threads
        )
    )
