"""The exceptions of the whole application, defined in the lowest layer.

They live here, in the physics package, so that the pure functions can raise them while
importing nothing but the standard library; :mod:`cryoplan.errors` re-exports them for the
readers and shells, which add the file, line and key. The command line turns any
:class:`CryoplanError` into its message on standard error and exit code 2.
"""

from __future__ import annotations

import difflib
from collections.abc import Iterable


class CryoplanError(Exception):
    """Base of every error whose message is meant for the user."""


class InputError(CryoplanError, ValueError):
    """One mistake in an input: a plan file, a material file, an argument.

    Parameters
    ----------
    message : str
        What is wrong, in plain words.
    file : str, optional
        The file the mistake is in.
    line : int, optional
        The line in that file, where it is known.
    key : str, optional
        The dotted key, for example ``stage[1].parts[0].mass``.
    expected : str, optional
        What was expected there.
    found : str, optional
        What was found there.
    """

    def __init__(
        self,
        message: str,
        *,
        file: str | None = None,
        line: int | None = None,
        key: str | None = None,
        expected: str | None = None,
        found: str | None = None,
    ) -> None:
        self.message = message
        self.file = file
        self.line = line
        self.key = key
        self.expected = expected
        self.found = found
        super().__init__(str(self))

    def where(self) -> str:
        parts = []
        if self.file:
            parts.append(str(self.file) + (f":{self.line}" if self.line else ""))
        if self.key:
            parts.append(f"key '{self.key}'")
        return ", ".join(parts)

    def __str__(self) -> str:
        text = self.message
        extra = []
        if self.expected is not None:
            extra.append(f"expected {self.expected}")
        if self.found is not None:
            extra.append(f"found {self.found}")
        if extra:
            text += " (" + "; ".join(extra) + ")"
        where = self.where()
        return f"{where}: {text}" if where else text


class UnknownNameError(InputError, KeyError):
    """A name (material, cryogen, stage, key) that is not known; suggests the closest ones."""

    def __init__(self, kind: str, name: str, known: Iterable[str], **where) -> None:
        known = list(known)
        close = closest(name, known)
        hint = f"; did you mean {', '.join(repr(c) for c in close)}?" if close else ""
        self.suggestions = close
        where.setdefault("found", repr(name))
        if "expected" not in where:
            shown = ", ".join(known[:8]) + (", ..." if len(known) > 8 else "")
            where["expected"] = f"a known {kind} ({shown})" if known else f"a known {kind}"
        super().__init__(f"unknown {kind} {name!r}{hint}", **where)

    __str__ = InputError.__str__


def closest(name: str, known: Iterable[str], n: int = 3) -> list[str]:
    """The known names closest to ``name`` (difflib ratio), best first.

    >>> closest("coper", ["copper", "silver", "stainless-304"])
    ['copper']
    """
    known = list(known)
    lowered = {k.lower(): k for k in known}
    hits = difflib.get_close_matches(name.lower(), list(lowered), n=n, cutoff=0.5)
    hits += [k for k in lowered if name.lower() in k and k not in hits][: max(0, n - len(hits))]
    return [lowered[h] for h in hits]


class TemperatureError(CryoplanError, ValueError):
    """A temperature outside what the physics or the data allow (below 0 K, NaN, above data)."""
