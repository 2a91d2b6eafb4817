"""Where the files shipped with cryoplan live: the bundled materials and example plans.

In an installed wheel they sit inside the package (``cryoplan/materials``,
``cryoplan/examples``); in a source checkout beside it (``materials/``, ``examples/``).
"""

from __future__ import annotations

from pathlib import Path

PACKAGE = Path(__file__).resolve().parent


def bundled(name: str) -> Path | None:
    """The shipped folder ``name`` ("materials" or "examples"), or None when it is missing.

    >>> bundled("materials").name
    'materials'
    """
    for candidate in (PACKAGE / name, PACKAGE.parent / name):
        if candidate.is_dir():
            return candidate
    return None
