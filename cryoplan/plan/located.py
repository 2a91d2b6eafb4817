"""The collector of a plan's mistakes: each recorded with the file, the line and the key,
what was expected and what was found, so that the reader can report them all at once.

:class:`_Reader` holds the checks every section reader uses (a table, a list, a name, a
flag, a quantity with units, a fraction, a bounded count, a temperature or a stage's name,
a material or a cryogen the data layer knows); each records its problem and returns a
default, so that reading goes on.
"""

from __future__ import annotations

import datetime as _dt
import math
import reprlib
from typing import Any

from .. import units
from ..errors import CryoplanError, InputError, UnknownNameError, closest
from .positions import LineFinder
from .schema import MAX_COUNT

_SHORT = reprlib.Repr()
_SHORT.maxlevel = 3
_SHORT.maxstring = 60
_SHORT.maxother = 60
_SHORT.maxlist = _SHORT.maxtuple = _SHORT.maxdict = 6


def shown(value: Any) -> str:
    """``repr`` of a value found in a plan, cut short when long or deeply nested.

    >>> shown("4 K"), shown([[[[[1]]]]] * 50)[:12]
    ("'4 K'", '[[[[...]]], ')
    """
    if isinstance(value, (_dt.date, _dt.time)):
        return value.isoformat()  # as the plan writes it, not datetime.date(...)
    try:
        text = repr(value)
    except RecursionError:
        text = None
    if text is not None and len(text) <= 200:
        return text
    return _SHORT.repr(value)


def is_number(value: Any) -> bool:
    """True for a finite TOML number (not a boolean).

    >>> is_number(4.2), is_number(True), is_number(float("inf")), is_number("4")
    (True, False, False, False)
    """
    return isinstance(value, (int, float)) and not isinstance(value, bool) and math.isfinite(value)


class _Reader:
    """Collects every problem of one plan file, each with its line."""

    def __init__(self, path: str, text: str) -> None:
        self.path = path
        self.lines = LineFinder(text)
        self.errors: list[InputError] = []

    # --- recording ----------------------------------------------------------------------

    def where(self, key: str, at: str | None = None) -> dict:
        """File, line and key of ``key``; the line is that of ``at`` when given (an item of
        a list of plain values has no line of its own: its list's line)."""
        return {"file": self.path, "line": self.lines.line_of(at or key), "key": key}

    def error(self, message: str, key: str, expected=None, found=None, at=None) -> None:
        self.errors.append(
            InputError(message, expected=expected, found=found, **self.where(key, at))
        )

    def unknown(self, kind: str, name, known, key: str, at: str | None = None) -> None:
        """An unknown name, with the closest known ones suggested."""
        self.errors.append(UnknownNameError(kind, str(name), list(known), **self.where(key, at)))

    def sorted_errors(self) -> list[InputError]:
        """The problems in the order of the file's lines (those without a line last)."""
        return sorted(self.errors, key=lambda e: (e.line is None, e.line or 0))

    # --- shapes of values ---------------------------------------------------------------

    def keys(self, table: Any, allowed: set[str], key: str) -> None:
        if not isinstance(table, dict):
            return
        for name in table:
            if name not in allowed:
                close = closest(name, sorted(allowed), n=1)
                hint = f"; did you mean '{close[0]}'?" if close else ""
                path = f"{key}.{name}" if key else name
                self.errors.append(
                    InputError(
                        f"unknown key '{name}'{hint}",
                        expected="one of " + ", ".join(sorted(allowed)),
                        found=repr(name),
                        **self.where(path),
                    )
                )

    def table(self, value, key: str) -> dict:
        if isinstance(value, dict):
            return value
        self.error("not a table", key, expected="a table of keys", found=shown(value))
        return {}

    def array(self, value, key: str) -> list:
        if value is None:
            return []
        if isinstance(value, list):
            return value
        self.error("not a list", key, expected="a list", found=shown(value))
        return []

    def required(self, table: dict, name: str, key: str):
        if name not in table:
            self.error(
                f"the key '{name}' is missing",
                f"{key}.{name}" if key else name,
                expected=f"a value for '{name}'",
                found="nothing",
            )
            return None
        return table[name]

    def text(self, table: dict, name: str, key: str, default=None, required=False) -> str | None:
        if name not in table:
            if required:
                self.required(table, name, key)
            return default
        value = table[name]
        if not isinstance(value, str) or not value.strip():
            self.error(
                "not a name", f"{key}.{name}", expected="a non-empty string", found=shown(value)
            )
            return default
        return value.strip()

    def choice(self, table: dict, name: str, key: str, choices, default, kind: str):
        """One of ``choices`` (a name), or ``default`` with the problem recorded."""
        if name not in table:
            return default
        value = table[name]
        path = f"{key}.{name}"
        if not isinstance(value, str):
            self.error(
                f"not a {kind}",
                path,
                expected="one of " + ", ".join(repr(c) for c in choices),
                found=shown(value),
            )
            return default
        if value not in choices:
            self.unknown(kind, value, choices, path)
            return default
        return value

    def flag(self, table: dict, name: str, key: str, default: bool) -> bool:
        """``true`` or ``false``; a string such as ``"false"`` is refused, not read as true."""
        if name not in table:
            return default
        value = table[name]
        if not isinstance(value, bool):
            self.error(
                "not true or false",
                f"{key}.{name}",
                expected="true or false (without quotes)",
                found=shown(value),
            )
            return default
        return value

    def quantity(
        self,
        table,
        name,
        key,
        dimension,
        default=None,
        required=False,
        positive=False,
        nonnegative=False,
        at=None,
    ):
        path = f"{key}.{name}" if key else name
        if name not in table:
            if required:
                self.required(table, name, key)
            return default
        try:
            if dimension == "temperature":
                value = units.parse_temperature(table[name], **self.where(path, at))
            else:
                value = units.parse_quantity(table[name], dimension, **self.where(path, at))
        except InputError as exc:
            self.errors.append(exc)
            return default
        if not math.isfinite(value):
            self.error(
                f"a {dimension} that is not finite",
                path,
                expected=f"a finite {dimension}",
                found=shown(table[name]),
                at=at,
            )
            return default
        if positive and not value > 0:
            self.error(
                f"a {dimension} that is not positive",
                path,
                expected=f"a {dimension} greater than zero",
                found=shown(table[name]),
                at=at,
            )
            return default
        if nonnegative and value < 0:
            self.error(
                f"a negative {dimension}",
                path,
                expected=f"a {dimension} of zero or more",
                found=shown(table[name]),
                at=at,
            )
            return default
        return value

    def fraction(self, table, name, key, default, low=0.0, high=1.0, at=None):
        if name not in table:
            return default
        try:
            return units.parse_fraction(table[name], low, high, **self.where(f"{key}.{name}", at))
        except InputError as exc:
            self.errors.append(exc)
            return default

    def count(self, table, name, key, default=1, high=MAX_COUNT, what="items"):
        """A whole number from 1 to ``high``."""
        if name not in table:
            return default
        value = table[name]
        if isinstance(value, bool) or not isinstance(value, int) or value < 1:
            self.error(
                "not a whole number of 1 or more",
                f"{key}.{name}",
                expected="a whole number such as 3",
                found=shown(value),
            )
            return default
        if value > high:
            self.error(
                f"more {what} than a plan can mean",
                f"{key}.{name}",
                expected=f"a whole number from 1 to {high:,}",
                found=shown(value),
            )
            return default
        return value

    def temperature_or_stage(self, table, name, key, stage_temps, required=True):
        """A temperature ('77 K') or the name of a stage; returns (K, stage name or None)."""
        path = f"{key}.{name}"
        if name not in table:
            if required:
                self.required(table, name, key)
            return None, None
        value = table[name]
        if isinstance(value, str) and value.strip() in stage_temps:
            return stage_temps[value.strip()], value.strip()
        try:
            found = units.parse_temperature(value, **self.where(path))
        except InputError as exc:
            if isinstance(value, str) and not any(ch.isdigit() for ch in value):
                self.unknown("stage", value, list(stage_temps), path)
            else:
                self.errors.append(exc)
            return None, None
        if not math.isfinite(found):
            self.error(
                "a temperature that is not finite",
                path,
                expected="a finite temperature or a stage's name",
                found=shown(value),
            )
            return None, None
        return found, None

    # --- names the data layer knows -----------------------------------------------------

    def material(self, name, key: str, conductivity: bool = False) -> str | None:
        """The id of a known material (with thermal-conductivity data if asked), or None."""
        from ..data.materials import material, material_ids

        if not isinstance(name, str):
            self.error(
                "not a material id",
                key,
                expected="a material id such as 'copper'",
                found=shown(name),
            )
            return None
        try:
            found = material(name)
        except UnknownNameError:
            self.unknown("material", name, material_ids(), key)
            return None
        if conductivity and not found.has_conductivity:
            self.error(
                f"'{found.id}' has no thermal-conductivity data",
                key,
                expected="a material with conductivity data",
                found=repr(name),
            )
            return None
        return found.id

    def cryogen(self, name, key: str) -> str | None:
        """The cryogen's name as the fluid layer spells it, from any name or alias that
        :func:`cryoplan.cryogen` accepts; None with the problem recorded."""
        from ..data.fluids import canonical_name, cryogen_names

        if not isinstance(name, str):
            self.error(
                "not a cryogen's name",
                key,
                expected="a name such as 'helium' or 'LN2'",
                found=shown(name),
            )
            return None
        try:
            return canonical_name(name)
        except UnknownNameError:
            self.unknown("cryogen", name, cryogen_names(), key)
            return None

    def boiling_point(self, cryogen: str, pressure: float, key: str) -> float | None:
        """The boiling point at the pressure, or None with the problem recorded at ``key``."""
        from ..data.fluids import cryogen as _cryogen

        try:
            return _cryogen(cryogen, pressure=pressure).boiling_point
        except CryoplanError as exc:
            self.errors.append(
                InputError(
                    getattr(exc, "message", str(exc)),
                    expected=getattr(exc, "expected", None),
                    found=getattr(exc, "found", None),
                    **self.where(key),
                )
            )
            return None
