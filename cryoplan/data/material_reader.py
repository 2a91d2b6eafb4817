"""Reading the values of a material file: quantities through :mod:`cryoplan.units`, and
every problem located by file, key and line.

The kinds of quantity a material file holds map onto the dimensions of
:data:`cryoplan.units.DIMENSIONS`. Three have no dimension there: a molar heat capacity
[J/(mol K)] and the electronic coefficient gamma per kilogram [J/(kg K^2)] and per mole
[J/(mol K^2)]. Each is read by :func:`cryoplan.units.parse_quantity` as a specific heat
after multiplying the text by an exact unit (``mol/kg``, ``K``, ``mol*K/kg``), so that one
parser reads every quantity of the application.
"""

from __future__ import annotations

import re
from pathlib import Path

import numpy as np

from ..errors import InputError
from ..units import DIMENSIONS, parse_quantity

#: For each kind of value in a material file, the ways it may be written, in the order
#: tried: (dimension, per mole?). A dimension that :data:`cryoplan.units.DIMENSIONS` lacks
#: is read through :data:`NEIGHBOURS`.
KINDS: dict[str, tuple[tuple[str, bool], ...]] = {
    "temperature": (("temperature", False),),
    "density": (("density", False),),
    "molar mass": (("molar mass", False),),
    "specific heat": (("specific heat", False), ("molar heat capacity", True)),
    "electronic coefficient": (
        ("electronic coefficient", False),
        ("molar electronic coefficient", True),
    ),
    "thermal conductivity": (("thermal conductivity", False),),
    "resistivity": (("resistivity", False),),
}

#: Dimensions missing from :data:`cryoplan.units.DIMENSIONS`: (exact units multiplied in,
#: the dimension of the product). 1 J/(mol K) x 1 mol/kg = 1 J/(kg K), and so on.
NEIGHBOURS: dict[str, tuple[str, str]] = {
    "molar heat capacity": ("mol/kg", "specific heat"),
    "electronic coefficient": ("K", "specific heat"),
    "molar electronic coefficient": ("mol*K/kg", "specific heat"),
}

EXAMPLES = {
    "temperature": "a temperature in kelvin such as '300 K'",
    "density": "a density such as '8960 kg/m^3'",
    "molar mass": "a molar mass such as '63.546 g/mol'",
    "specific heat": "a heat capacity unit such as 'J/(kg K)' or 'J/(mol K)'",
    "electronic coefficient": "a unit such as 'mJ/(mol K^2)'",
    "thermal conductivity": "a conductivity unit such as 'W/(m K)'",
    "resistivity": "a resistivity such as '1.55e-8 ohm m'",
}

_KIND_WORDS = {
    "specific heat": "a heat capacity",
    "thermal conductivity": "a thermal conductivity",
    "density": "a density",
    "molar mass": "a molar mass",
    "temperature": "a temperature",
    "electronic coefficient": "an electronic (gamma) coefficient",
    "resistivity": "a resistivity",
}

_WRONG_KIND = "wrong kind of quantity"


def _as(text: str, dimension: str, where: dict) -> float:
    """``text`` in the SI unit of ``dimension``, by :func:`cryoplan.units.parse_quantity`."""
    if dimension in DIMENSIONS:
        return parse_quantity(text, dimension, **where)
    times, neighbour = NEIGHBOURS[dimension]
    try:  # the text as written first, so that its own mistakes are named as written
        parse_quantity(text, neighbour, **where)
    except InputError as exc:
        if not exc.message.startswith(_WRONG_KIND):
            raise
    else:  # the neighbour itself is not this dimension
        raise InputError(_WRONG_KIND, **where)
    product = f"{text} * {times}"
    try:
        return parse_quantity(product, neighbour, **where)
    except InputError as exc:
        message = exc.message if not exc.message.startswith(_WRONG_KIND) else _WRONG_KIND
        raise InputError(message.replace(product, text), **where) from None


def parse_value(text, kind: str, where: dict) -> tuple[float, bool]:
    """Parse a value of a material file, ``"8960 kg/m^3"``, into (SI value, per mole?).

    Parameters
    ----------
    text : str
        A number and its units.
    kind : str
        A key of :data:`KINDS`, for example ``"density"`` or ``"specific heat"``.
    where : dict
        ``file`` and ``key`` for the message.

    Returns
    -------
    (float, bool)
        The value in SI units (per kilogram, or per mole where the second item is true).

    Raises
    ------
    InputError
        Not a number with units of that kind; the message names the key and what was found.

    Examples
    --------
    >>> parse_value("8.96 g/cm^3", "density", {})
    (8960.0, False)
    >>> parse_value("0.695 mJ/(mol K^2)", "electronic coefficient", {})
    (0.000695, True)
    """
    expected = EXAMPLES[kind]
    if isinstance(text, bool) or not isinstance(text, str):
        raise InputError("not a quantity with units", expected=expected, found=repr(text), **where)
    first = None
    for dimension, molar in KINDS[kind]:
        try:
            return _as(text, dimension, where), molar
        except InputError as exc:
            if not exc.message.startswith(_WRONG_KIND):
                raise InputError(
                    exc.message, expected=expected, found=repr(text), **where
                ) from None
            first = first or exc
    reason = first.message[len(_WRONG_KIND) :].split(";")[0] if first else ""
    raise InputError(
        f"a unit that is not {_KIND_WORDS[kind]}{reason}",
        expected=expected,
        found=repr(text),
        **where,
    )


def unit_factor(unit, kind: str, where: dict) -> tuple[float, bool]:
    """SI factor of a unit written alone (a table's ``unit = ...``), and whether per mole.

    >>> unit_factor("J/(mol K)", "specific heat", {})
    (1.0, True)
    """
    if not isinstance(unit, str):
        raise InputError("not a unit", expected=EXAMPLES[kind], found=repr(unit), **where)
    try:
        return parse_value(f"1 {unit}", kind, where)
    except InputError as exc:
        exc.found = repr(unit)
        exc.args = (str(exc),)
        raise


class MaterialFileReader:
    """Reads the values of one parsed material file; each problem names its file and key."""

    def __init__(self, path: Path, text: str, data: dict) -> None:
        self.path = path
        self.text = text
        self.data = data
        self.sources: list[str] = []

    def where(self, key: str) -> dict:
        return {"file": str(self.path), "key": key}

    def line_of(self, key: str) -> int | None:
        """The line of a dotted key such as ``heat_capacity.reference[1].points``."""
        lines = self.text.splitlines()
        raw = key.split(".")
        parts = [re.sub(r"\[\d+\]$", "", p) for p in raw]
        indices = []
        for p in raw:
            m = re.search(r"\[(\d+)\]$", p)
            indices.append(int(m.group(1)) if m else 0)
        first_header = next(
            (i for i, line in enumerate(lines) if line.lstrip().startswith("[")), len(lines)
        )
        start, end, consumed = 0, first_header, 0
        for n in range(len(parts), 0, -1):
            header = re.escape(".".join(parts[:n]))
            pattern = re.compile(rf"^\s*\[\[?\s*{header}\s*\]\]?\s*(#.*)?$")
            hits = [i for i, line in enumerate(lines) if pattern.match(line)]
            if hits:
                start = hits[min(indices[n - 1], len(hits) - 1)] + 1
                end = next(
                    (i for i in range(start, len(lines)) if lines[i].lstrip().startswith("[")),
                    len(lines),
                )
                consumed = n
                break
        rest = parts[consumed:]
        if not rest:
            return start
        for i in range(start, end):
            if re.match(rf"^\s*{re.escape(rest[0])}\s*=", lines[i]):
                return i + 1
        return start if consumed else None

    def error(self, message: str, key: str, expected=None, found=None) -> InputError:
        return InputError(message, expected=expected, found=found, **self.where(key))

    def get(self, table: dict, key: str, full: str, required: bool = True, default=None):
        if key not in table:
            if required:
                raise self.error(
                    "a required key is missing", full, expected=f"'{key}'", found="nothing"
                )
            return default
        return table[key]

    def note_source(self, entry, key: str) -> None:
        if isinstance(entry, dict):
            source = entry.get("source")
            if not isinstance(source, str) or not source.strip():
                raise self.error(
                    "a value without its source",
                    key + ".source",
                    expected='source = "author, title, year, table"',
                    found=repr(source),
                )
            if source not in self.sources:
                self.sources.append(source)

    def quantity_with_basis(self, table: dict, key: str, full: str, kind: str):
        """(SI value, per mole?, the text, its key) of ``"value unit"`` or {value, source}."""
        entry = self.get(table, key, full)
        if isinstance(entry, dict):
            self.note_source(entry, full)
            raw = self.get(entry, "value", full + ".value")
        else:
            raw = entry
        value, molar = parse_value(raw, kind, self.where(full))
        return value, molar, raw, full

    def quantity(
        self,
        table: dict,
        key: str,
        full: str,
        kind: str,
        required=True,
        molar_mass=None,
        positive=True,
    ):
        if key not in table and not required:
            return None
        value, molar, raw, where_key = self.quantity_with_basis(table, key, full, kind)
        if molar:
            if molar_mass is None:
                raise self.error(
                    "a per-mole value needs the molar mass",
                    where_key,
                    expected="molar_mass in the file",
                    found=repr(raw),
                )
            value = value / molar_mass
        if positive and not value > 0:
            raise self.error(
                f"a {kind} that is not positive",
                where_key,
                expected=f"{EXAMPLES[kind]}, above zero",
                found=repr(raw),
            )
        return value

    def number(
        self, table: dict, key: str, full: str, required=True, low=None, high=None, default=None
    ):
        entry = self.get(table, key, full, required, default)
        if isinstance(entry, dict):
            self.note_source(entry, full)
            entry = self.get(entry, "value", full + ".value")
            full = full + ".value"
        if entry is None:
            return None
        if isinstance(entry, bool) or not isinstance(entry, (int, float)):
            raise self.error("not a number", full, expected="a number", found=repr(entry))
        value = float(entry)
        if (low is not None and value < low) or (high is not None and value > high):
            raise self.error(
                "out of range",
                full,
                expected=f"a number from {low:g} to {high:g}",
                found=repr(entry),
            )
        return value

    def pairs(
        self,
        raw,
        full: str,
        what: str,
        increasing: bool = True,
        positive: bool = True,
        minimum: int = 2,
    ) -> tuple[np.ndarray, np.ndarray]:
        if not isinstance(raw, list) or len(raw) < minimum:
            many = (
                "one [T, value] pair" if minimum == 1 else f"at least {minimum} [T, value] pairs"
            )
            raise self.error(
                f"a table of {what} pairs is needed", full, expected=many, found=repr(raw)[:60]
            )
        try:
            array = np.array(raw, dtype=float)
        except (TypeError, ValueError):
            raise self.error(
                "not a table of number pairs",
                full,
                expected="[[T, value], ...] with numbers",
                found=repr(raw)[:60],
            ) from None
        if array.ndim != 2 or array.shape[1] != 2:
            raise self.error(
                "not a table of pairs", full, expected="[[T, value], ...]", found=repr(raw)[:60]
            )
        t, y = array[:, 0], array[:, 1]
        if not np.all(np.isfinite(array)):
            raise self.error(
                "a value that is not finite", full, expected="finite numbers", found=repr(raw)[:60]
            )
        if np.any(t < 0):
            bad = float(t[t < 0][0])
            raise self.error(
                "a temperature below 0 K",
                full,
                expected="temperatures of 0 K or more",
                found=f"{bad:g} K",
            )
        if np.any(t == 0):
            raise self.error(
                "a temperature of 0 K in a table",
                full,
                expected="temperatures above 0 K",
                found="0 K",
            )
        if increasing and np.any(np.diff(t) <= 0):
            i = int(np.argmax(np.diff(t) <= 0))
            raise self.error(
                "temperatures not increasing",
                full,
                expected="strictly increasing temperatures",
                found=f"{t[i]:g} K then {t[i + 1]:g} K",
            )
        if positive and np.any(y <= 0):
            bad = float(y[y <= 0][0])
            raise self.error(
                f"a {what} that is not positive",
                full,
                expected="values above zero",
                found=f"{bad:g}",
            )
        return t, y
