"""Progress of long runs, in a notebook or a terminal.

``progress=True`` chooses: a line that updates in place under Jupyter (IPython's display
handles), a carriage-return line on a terminal's standard error, and nothing otherwise
(a pipe, a log file). A callable receives the engine's snapshots (a dict: ``layer``,
``lines``, ``processed``, ``layer_end``, ``lines_per_second``, ``store_bytes``,
``elapsed``) instead.
"""

from __future__ import annotations

import sys
from typing import Callable, Optional, Tuple


def _in_notebook() -> bool:
    shell = sys.modules.get("IPython")
    if shell is None:
        return False
    ip = shell.get_ipython()  # type: ignore[attr-defined]
    return ip is not None and type(ip).__name__ == "ZMQInteractiveShell"


def _line(p: dict) -> str:
    return (
        f"layer {p['layer']}: {p['lines']:,} lines, "
        f"{p['processed']:,}/{p['layer_end']:,} expanded, "
        f"{p['lines_per_second']:,.0f} lines/s, {p['store_bytes'] / 2**20:,.1f} MiB, "
        f"{p['elapsed']:.1f} s"
    )


def display(progress) -> Tuple[Optional[Callable[[dict], None]], Callable[[], None]]:
    """The callback for ``progress`` and a function that closes the display."""
    if callable(progress):
        return progress, lambda: None
    if not progress:
        return None, lambda: None
    if _in_notebook():
        from IPython.display import display as show  # type: ignore

        handle = show("orbit: starting", display_id=True)

        def update(p: dict) -> None:
            handle.update(_line(p))

        return update, lambda: None
    if sys.stderr.isatty():
        width = [0]

        def write(p: dict) -> None:
            text = _line(p)
            sys.stderr.write("\r" + text.ljust(width[0]))
            sys.stderr.flush()
            width[0] = len(text)

        def close() -> None:
            if width[0]:
                sys.stderr.write("\r" + " " * width[0] + "\r")
                sys.stderr.flush()

        return write, close
    return None, lambda: None
