"""Certified answers about the group the Dehn twists generate."""

from __future__ import annotations

import json
import os
from typing import List, Optional, Union

from . import _native


class CommutantResult:
    """The certified dimension of the commutant (matrices commuting with every twist):
    ``dimension``, ``irreducible``, the ``primes`` of the modular bounds, the
    ``certificate`` (re-checked before it is returned) and ``certificate_file`` (the same
    in its envelope, as ``cyclorb commutant --out`` writes it; :func:`check` reads it)."""

    def __init__(self, raw: dict):
        self.raw = raw
        self.dimension: int = raw["commutant_dimension"]
        self.irreducible: bool = raw["irreducible"]
        self.primes: List[int] = raw["primes"]
        self.certificate: dict = raw["certificate"]
        self.certificate_file: dict = raw["certificate_file"]

    def __repr__(self) -> str:
        return f"<CommutantResult dimension {self.dimension}>"


class WitnessResult:
    """A word of infinite projective order (``found``, ``word``, ``certificate``, and
    ``certificate_file`` as ``cyclorb witness --out`` writes it), or the number of words
    tried when none was found (which proves nothing)."""

    def __init__(self, raw: dict):
        self.raw = raw
        self.found: bool = raw["found"]
        self.word: List[str] = raw["word"]
        self.certificate: Optional[dict] = raw["certificate"]
        self.certificate_file: Optional[dict] = raw["certificate_file"]
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
    file: ``structure``, ``structure-imprimitive``, ``image-orbit``, ...) and
    ``certificate_file``, the certificate in that file's envelope (:func:`check` reads it)."""

    def __init__(self, raw: dict):
        self.raw = raw
        self.finite: Optional[bool] = raw["finite"]
        self.order: Optional[int] = None if raw["order"] is None else int(raw["order"])
        self.route: str = raw["route"]
        self.steps: List[str] = raw["steps"]
        self.reason: Optional[str] = raw["reason"]
        self.certificate: Optional[dict] = raw["certificate"]
        self.certificate_kind: Optional[str] = raw["certificate_kind"]
        self.certificate_file: Optional[dict] = raw["certificate_file"]

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


class Claim:
    """One claim of a re-check: its ``name``, whether it held (``ok``) and ``detail``: how
    it was re-derived, or why it failed."""

    def __init__(self, raw: dict):
        self.name: str = raw["name"]
        self.ok: bool = raw["ok"]
        self.detail: str = raw["detail"]

    def __repr__(self) -> str:
        return f"<Claim {self.name}: {'ok' if self.ok else 'FAILED'}>"


class CheckResult:
    """The re-check of a certificate, as ``cyclorb check --json``: ``ok`` (every claim held),
    ``failed`` (the name of the claim that did not, or None), ``claims`` in the order they
    were checked (up to the first that failed), and the envelope as recorded: ``kind``,
    ``program``, ``spec``, ``genus``, ``generating_set``, ``file``. True in a boolean
    context exactly when ``ok``."""

    def __init__(self, raw: dict):
        self.raw = raw
        self.ok: bool = raw["ok"]
        self.failed: Optional[str] = raw["failed"]
        self.claims: List[Claim] = [Claim(c) for c in raw["claims"]]
        self.kind: str = raw["kind"]
        self.program: str = raw["program"]
        self.spec: str = raw["spec"]
        self.genus: int = raw["genus"]
        self.generating_set: str = raw["generating_set"]
        self.file: str = raw["file"]

    def __bool__(self) -> bool:
        return self.ok

    def __repr__(self) -> str:
        if self.ok:
            return f"<CheckResult {self.kind}: all {len(self.claims)} claims hold>"
        return f"<CheckResult {self.kind}: claim {self.failed} FAILS>"


def check(
    certificate: Union[str, "os.PathLike[str]", dict], name: str = "<certificate>"
) -> CheckResult:
    """Re-check a certificate, as ``cyclorb check FILE`` does: every claim is re-derived from
    the theory, genus and generating set its envelope names. ``certificate`` is a path (str
    or ``os.PathLike``), the certificate as a dict (e.g. ``cyclorb.image(...).certificate_file``)
    or its JSON text (a str starting with ``{`` or ``[``); ``name`` is what messages call a dict or a
    text. A claim that fails gives ``ok`` False; a certificate that cannot be read, is not
    one of a known kind, or whose input cannot be rebuilt raises :class:`CyclorbError` with
    the program's message (file, place, reason)."""
    if isinstance(certificate, dict):
        return CheckResult(_native.check_text(json.dumps(certificate), name))
    if isinstance(certificate, str) and certificate.lstrip().startswith(("{", "[")):
        return CheckResult(_native.check_text(certificate, name))
    if isinstance(certificate, (str, os.PathLike)):
        return CheckResult(_native.check_file(os.fspath(certificate)))
    raise TypeError(
        f"check: expected a path, a dict or JSON text, not {type(certificate).__name__}"
    )
