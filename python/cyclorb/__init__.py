"""cyclorb: exact mapping class group orbits of conformal blocks over cyclotomic fields.

The same library as the ``cyclorb`` program, as Python objects::

    import cyclorb
    r = cyclorb.orbit("ising", genus=2)
    r.size, r.prefactor          # 3840, 384
    cyclorb.Theory("fibonacci").S
    cyclorb.orbit("dw:S3", genus=2, method="structure").size   # 38400, counted
    cyclorb.sweep("plan.toml").runs                              # a sweep plan's results

Every decision is exact; numbers come back exactly (int, ``fractions.Fraction``,
:class:`Cyclotomic`). Errors raise :class:`CyclorbError` with the program's messages.
"""

from ._native import CyclorbError, __version__
from .certificates import (
    CheckResult,
    Claim,
    CommutantResult,
    ImageResult,
    WitnessResult,
    check,
    commutant,
    image,
    witness,
)
from .matrix import Matrix
from .numbers import Cyclotomic
from .orbit import Invariant, OrbitInterrupted, OrbitResult, orbit
from .sweep import SweepInterrupted, SweepResult, SweepRun, sweep
from .theory import BlockSpace, Theory, Verification

__all__ = [
    "BlockSpace",
    "CheckResult",
    "Claim",
    "CommutantResult",
    "Cyclotomic",
    "CyclorbError",
    "ImageResult",
    "Invariant",
    "Matrix",
    "OrbitInterrupted",
    "OrbitResult",
    "SweepInterrupted",
    "SweepResult",
    "SweepRun",
    "Theory",
    "Verification",
    "WitnessResult",
    "__version__",
    "check",
    "commutant",
    "image",
    "orbit",
    "sweep",
    "witness",
]
