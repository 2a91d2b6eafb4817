"""The terminal dashboard (Textual): see and change a whole plan live.

Importing this package is cheap; Textual and the plan machinery load only in :func:`run`.
"""

from __future__ import annotations


def run(path: str, *, plain: bool = False, bundled: bool = False) -> int:
    """Open the dashboard on a plan file and return the exit code when it closes.

    Parameters
    ----------
    path : str
        The plan file (TOML).
    plain : bool
        Plain characters only (no braille or box drawing), for limited terminal fonts.
    bundled : bool
        The plan is the bundled demo; saving then asks for a file of the user's own.
    """
    from .app import CryoplanApp

    app = CryoplanApp(path, plain=plain, bundled=bundled)
    result = app.run()
    return int(result or 0)
