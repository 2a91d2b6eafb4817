"""The one unit registry of the application, and parsing of quantities written by users.

Strings such as ``"12 kg"``, ``"4.2 K"``, ``"20 degC"``, ``"3 /h"`` or ``"18 USD/L"`` are
parsed here, once, at the boundary; their dimension is checked and they are converted to
SI floats. The physics core never sees a pint Quantity.
"""

from __future__ import annotations

import re
from functools import lru_cache

from .errors import InputError

_NUMBER = re.compile(r"^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*(.*?)\s*$")
_PRICE = re.compile(
    r"^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*([A-Za-z]{3})\s*/\s*(.+?)\s*$"
)

#: Dimensions by the name used in messages, with the SI unit values are converted to.
DIMENSIONS: dict[str, tuple[str, str]] = {
    "mass": ("[mass]", "kg"),
    "temperature": ("[temperature]", "K"),
    "length": ("[length]", "m"),
    "area": ("[length] ** 2", "m**2"),
    "volume": ("[length] ** 3", "m**3"),
    "power": ("[power]", "W"),
    "energy": ("[energy]", "J"),
    "pressure": ("[pressure]", "Pa"),
    "time": ("[time]", "s"),
    "rate": ("1 / [time]", "1/s"),
    "flow": ("[length] ** 3 / [time]", "m**3/s"),
    "current": ("[current]", "A"),
    "per length": ("1 / [length]", "1/m"),
    "density": ("[mass] / [length] ** 3", "kg/m**3"),
    "specific heat": ("[energy] / [mass] / [temperature]", "J/(kg*K)"),
    "thermal conductance": ("[power] / [temperature]", "W/K"),
    "thermal conductivity": ("[power] / [length] / [temperature]", "W/(m*K)"),
    "specific energy": ("[energy] / [mass]", "J/kg"),
    "energy per volume": ("[energy] / [length] ** 3", "J/m**3"),
}

#: Exact SI factors of the spellings plan files use most, by dimension, so that a plan that
#: sticks to them is read without building pint's registry (a fifth of a second). Every
#: entry is checked against pint in tests/test_units.py; anything else goes to pint.
FAST_UNITS: dict[str, dict[str, float]] = {
    "mass": {"kg": 1.0, "g": 1e-3, "t": 1e3, "lb": 0.45359237},
    "temperature": {"K": 1.0, "mK": 1e-3},
    "length": {"m": 1.0, "cm": 1e-2, "mm": 1e-3, "um": 1e-6, "in": 0.0254},
    "area": {"m^2": 1.0, "cm^2": 1e-4, "mm^2": 1e-6, "m**2": 1.0, "mm**2": 1e-6},
    "volume": {"L": 1e-3, "l": 1e-3, "mL": 1e-6, "m^3": 1.0, "m**3": 1.0, "cm^3": 1e-6},
    "power": {"W": 1.0, "mW": 1e-3, "kW": 1e3, "uW": 1e-6},
    "energy": {"J": 1.0, "kJ": 1e3, "MJ": 1e6, "kWh": 3.6e6, "Wh": 3600.0},
    "pressure": {"Pa": 1.0, "kPa": 1e3, "MPa": 1e6, "bar": 1e5, "mbar": 100.0, "atm": 101325.0},
    "time": {"s": 1.0, "min": 60.0, "h": 3600.0, "d": 86400.0, "day": 86400.0, "days": 86400.0},
    "rate": {"/h": 1 / 3600.0, "1/h": 1 / 3600.0, "/s": 1.0, "1/s": 1.0},
    "flow": {
        "m^3/h": 1 / 3600.0,
        "m^3/s": 1.0,
        "L/h": 1e-3 / 3600.0,
        "L/min": 1e-3 / 60.0,
        "L/s": 1e-3,
        "L/d": 1e-3 / 86400.0,
        "L/day": 1e-3 / 86400.0,
    },
    "current": {"A": 1.0, "kA": 1e3, "mA": 1e-3},
    "per length": {"/cm": 100.0, "1/cm": 100.0, "/m": 1.0, "1/m": 1.0, "/mm": 1e3},
    "thermal conductance": {"W/K": 1.0, "mW/K": 1e-3},
    "energy per volume": {"kWh/L": 3.6e9, "J/L": 1e3, "MJ/L": 1e9, "kWh/m^3": 3.6e6},
}

_TEMPERATURE_EXAMPLES = "a temperature such as '4.2 K' or '20 degC'"


@lru_cache(maxsize=1)
def registry():
    """The application's pint UnitRegistry, built once (pint's own cache makes it fast)."""
    import pint

    try:
        ureg = pint.UnitRegistry(cache_folder=":auto:")
    except Exception:  # a read-only cache location: build without the cache
        ureg = pint.UnitRegistry()
    ureg.define("percent_unit = 0.01 = pct")
    return ureg


def _example(dimension: str) -> str:
    return {
        "mass": "a mass such as '22 kg' or '500 g'",
        "temperature": _TEMPERATURE_EXAMPLES,
        "length": "a length such as '250 mm'",
        "area": "an area such as '20 mm^2'",
        "volume": "a volume such as '100 L'",
        "power": "a power such as '0.25 W'",
        "pressure": "a pressure such as '1 atm' or '120 kPa'",
        "time": "a time such as '3 h'",
        "rate": "a rate such as '2 /h'",
        "flow": "a flow such as '300 m^3/h'",
        "current": "a current such as '100 A'",
    }.get(dimension, f"a {dimension} with units")


def parse_quantity(text, dimension: str, **where) -> float:
    """Parse ``text`` (a string with units) into an SI float of the named dimension.

    Parameters
    ----------
    text : str
        For example ``"22 kg"``, ``"4.2 K"``, ``"20 degC"``, ``"300 g"``.
    dimension : str
        A key of :data:`DIMENSIONS`, for example ``"mass"``.
    **where
        ``file``, ``line`` and ``key`` for the error message.

    Returns
    -------
    float
        The value in the SI unit of :data:`DIMENSIONS` (K for temperatures).

    Raises
    ------
    InputError
        Not a string with a number and a unit, a unit pint does not know, or the wrong
        dimension; the message names what was expected and what was found.

    Examples
    --------
    >>> parse_quantity("500 g", "mass")
    0.5
    >>> round(parse_quantity("20 degC", "temperature"), 2)
    293.15
    >>> parse_quantity("2 /h", "rate") * 3600
    2.0
    """
    expected = _example(dimension)
    if isinstance(text, bool) or not isinstance(text, (str, int, float)):
        raise InputError("not a quantity", expected=expected, found=repr(text), **where)
    if isinstance(text, (int, float)):
        raise InputError("a number without units", expected=expected, found=repr(text), **where)
    match = _NUMBER.match(text)
    if not match:
        raise InputError("not a number with units", expected=expected, found=repr(text), **where)
    number, unit = float(match.group(1)), match.group(2)
    if not unit:
        raise InputError("the units are missing", expected=expected, found=repr(text), **where)
    factor = FAST_UNITS.get(dimension, {}).get(unit)
    if factor is not None:
        return number * factor
    import pint

    ureg = registry()
    dim, si = DIMENSIONS[dimension]
    unit = unit.replace("^", "**")
    if unit.startswith("/"):
        unit = "1 " + unit
    try:
        quantity = ureg.Quantity(number, unit)
    except (
        pint.errors.UndefinedUnitError,
        pint.errors.DefinitionSyntaxError,
        AttributeError,
        TypeError,
        ValueError,
        SyntaxError,
    ) as exc:
        bad = getattr(exc, "unit_names", None) or unit
        if isinstance(bad, (tuple, list)):
            bad = ", ".join(bad)
        raise InputError(
            f"unknown unit {bad!r}", expected=expected, found=repr(text), **where
        ) from None
    if not quantity.check(dim):
        raise InputError(
            f"wrong kind of quantity ({quantity.dimensionality})",
            expected=expected,
            found=repr(text),
            **where,
        )
    try:
        return float(quantity.m_as(si))
    except pint.errors.OffsetUnitCalculusError:  # pragma: no cover - kelvin-like units only
        raise InputError("cannot convert", expected=expected, found=repr(text), **where) from None


def parse_temperature(text, **where) -> float:
    """Parse a temperature; refuse values below absolute zero.

    >>> parse_temperature("77 K")
    77.0
    """
    value = parse_quantity(text, "temperature", **where)
    if not value >= 0.0:
        raise InputError(
            "a temperature below absolute zero",
            expected="a temperature of 0 K or more",
            found=repr(text),
            **where,
        )
    return value


def parse_price(text, **where) -> tuple[float, str, str]:
    """Parse a price per volume such as ``"18 USD/L"``.

    Returns
    -------
    (float, str, str)
        Price per cubic metre [currency/m^3], the three-letter currency code, and the
        volume unit as written.

    >>> p, cur, unit = parse_price("18 USD/L")
    >>> round(p), cur
    (18000, 'USD')
    """
    expected = "a price per volume such as '18 USD/L'"
    if not isinstance(text, str):
        raise InputError("not a price", expected=expected, found=repr(text), **where)
    match = _PRICE.match(text)
    if not match:
        raise InputError("not a price per volume", expected=expected, found=repr(text), **where)
    number, currency, unit = float(match.group(1)), match.group(2).upper(), match.group(3)
    if number < 0:
        raise InputError("a negative price", expected=expected, found=repr(text), **where)
    per = parse_quantity(f"1 {unit}", "volume", **where)
    return number / per, currency, unit


def parse_fraction(value, low: float = 0.0, high: float = 1.0, **where) -> float:
    """A plain number in [low, high]; ``"5 %"`` is accepted and means 0.05.

    >>> parse_fraction("5 %")
    0.05
    """
    expected = f"a number from {low:g} to {high:g}"
    if isinstance(value, str) and value.strip().endswith("%"):
        try:
            value = float(value.strip()[:-1]) / 100.0
        except ValueError:
            raise InputError(
                "not a fraction", expected=expected, found=repr(value), **where
            ) from None
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        raise InputError("not a number", expected=expected, found=repr(value), **where)
    value = float(value)
    if not (low <= value <= high):
        raise InputError("out of range", expected=expected, found=repr(value), **where)
    return value
