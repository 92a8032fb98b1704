"""Exact matrices: rows of exact numbers (int, Fraction or Cyclotomic)."""

from __future__ import annotations

from typing import Iterable, List, Sequence, Tuple


class Matrix:
    """A matrix of exact numbers, acting on columns (entry [new, old]).

    ``m[i, j]`` is an entry, ``m.tolist()`` the nested lists, ``m.to_numpy()`` a complex
    array (needs numpy; floats for display and plotting only).
    """

    __slots__ = ("_rows",)

    def __init__(self, rows: Iterable[Sequence]):
        self._rows: List[list] = [list(r) for r in rows]
        widths = {len(r) for r in self._rows}
        if len(widths) > 1:
            raise ValueError("rows of different lengths")

    @classmethod
    def from_entries(cls, size: int, entries: Iterable[Tuple[int, int, object]]) -> "Matrix":
        """A size × size matrix with the given non-zero entries (row, column, value)."""
        rows = [[0] * size for _ in range(size)]
        for i, j, x in entries:
            rows[i][j] = x
        return cls(rows)

    @property
    def shape(self) -> Tuple[int, int]:
        return (len(self._rows), len(self._rows[0]) if self._rows else 0)

    def __getitem__(self, index):
        i, j = index
        return self._rows[i][j]

    def tolist(self) -> List[list]:
        """The rows as nested lists of exact numbers."""
        return [list(r) for r in self._rows]

    def to_numpy(self):
        """A complex numpy array (needs numpy)."""
        import numpy

        return numpy.array([[complex(x) for x in r] for r in self._rows], dtype=complex)

    def __eq__(self, other) -> bool:
        if not isinstance(other, Matrix):
            return NotImplemented
        return self._rows == other._rows

    __hash__ = None  # type: ignore[assignment]

    def __repr__(self) -> str:
        body = ",\n ".join("[" + ", ".join(str(x) for x in r) + "]" for r in self._rows)
        return f"Matrix([{body}])"

