# Typing stubs of the Rust extension (python/src). A number of Q(ζ_n) travels as a triple
# (n, numerators of 1, ζ_n, …, ζ_n^(φ(n)−1), denominator).
from typing import Any, Callable, List, Optional, Tuple

Triple = Tuple[int, List[int], int]

__version__: str

class CyclorbError(Exception): ...

def element(n: int, text: str) -> Triple: ...
def arithmetic(op: str, a: Triple, b: Triple) -> Triple: ...
def text(a: Triple) -> str: ...
def normalised_trace(a: Triple) -> Tuple[int, int]: ...
def theory(spec: str) -> dict: ...
def theory_file(spec: str) -> str: ...
def verify(spec: str) -> dict: ...
def block_space(spec: str, genus: int, set: str = ...) -> dict: ...
def orbit(
    spec: Optional[str] = ...,
    genus: Optional[int] = ...,
    *,
    set: str = ...,
    method: str = ...,
    limit: Optional[int] = ...,
    memory_limit: Optional[int] = ...,
    time_limit: Optional[float] = ...,
    threads: Optional[int] = ...,
    checkpoint: Optional[str] = ...,
    resume: Optional[str] = ...,
    words: int = ...,
    progress: Optional[Callable[[dict], Any]] = ...,
) -> Tuple[dict, Optional[str], Optional[BaseException]]: ...
def sweep(
    path: Optional[str] = ...,
    text: Optional[str] = ...,
    *,
    lines: Optional[int] = ...,
    memory_mib: Optional[int] = ...,
    seconds: Optional[int] = ...,
    threads: Optional[int] = ...,
    out: Optional[str] = ...,
    progress: Optional[Callable[[dict], Any]] = ...,
) -> Tuple[dict, Optional[BaseException]]: ...
def commutant(spec: str, genus: int, set: str = ...) -> dict: ...
def witness(
    spec: str, genus: int, set: str = ..., depth: Optional[int] = ..., tries: Optional[int] = ...
) -> dict: ...
def image(
    spec: str,
    genus: int,
    set: str = ...,
    route: str = ...,
    orbit_limit: int = ...,
    enumeration_cap: int = ...,
    witness_after: int = ...,
    threads: Optional[int] = ...,
) -> dict: ...
def check_file(path: str) -> dict: ...
def check_text(text: str, name: str) -> dict: ...
