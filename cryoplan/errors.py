"""Errors that reach the user: each names the file, line, key, what was expected and found.

The classes are defined in :mod:`cryoplan.physics.errors` (the lowest layer, so that the pure
functions can raise them) and re-exported here with :class:`InputErrors`, the collection a
reader raises. The command line turns any :class:`CryoplanError` into its message on standard
error and exit code 2; it never shows a traceback for them.
"""

from __future__ import annotations

from collections.abc import Iterable

from .physics.errors import (
    CryoplanError,
    InputError,
    TemperatureError,
    UnknownNameError,
    closest,
)

__all__ = [
    "CryoplanError",
    "InputError",
    "InputErrors",
    "TemperatureError",
    "UnknownNameError",
    "closest",
]


class InputErrors(CryoplanError):
    """Several mistakes found in one pass, reported together."""

    def __init__(self, errors: Iterable[InputError]) -> None:
        self.errors = list(errors)
        super().__init__(str(self))

    def __str__(self) -> str:
        n = len(self.errors)
        head = f"{n} problem{'s' if n != 1 else ''} found:"
        return "\n".join([head] + ["  " + str(e) for e in self.errors])
