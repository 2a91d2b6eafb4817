"""The tables behind :mod:`cryoplan.units`: dimensions, exact SI factors of unit names, SI
prefixes, offset temperatures, the plain names of dimensions, and the parser's limits.

Every factor is exact by definition of the unit (SI brochure, 9th ed., BIPM 2019; NIST SP
811, 2008 edition) and is checked against pint in tests/test_units.py.
"""

from __future__ import annotations

import re
from fractions import Fraction

#: The longest quantity string read [characters].
MAX_LENGTH = 200
#: The deepest nesting of brackets in a unit expression.
MAX_DEPTH = 8
#: The largest power of one unit name in an expression (after brackets are multiplied out).
MAX_POWER = 12
#: The largest denominator of a fractional power (``m^(1/2)``).
MAX_DENOMINATOR = 12

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
    "molar mass": ("[mass] / [substance]", "kg/mol"),
    "magnetic field": ("[mass] / [current] / [time] ** 2", "T"),
    "resistivity": ("[mass] * [length] ** 3 / [current] ** 2 / [time] ** 3", "ohm*m"),
}

#: Exact SI factors of the whole unit strings plan files use most, by dimension. A unit
#: written exactly so is converted by this table (the figures stay those of earlier
#: versions to the last bit); every entry is checked against pint in tests/test_units.py.
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

# The SI base dimensions, in pint's spelling, with their SI base symbols.
_BASE = {
    "[mass]": "kg",
    "[length]": "m",
    "[time]": "s",
    "[temperature]": "K",
    "[current]": "A",
    "[substance]": "mol",
    "[luminosity]": "cd",
}
_POWERS = ("mass", "length", "time", "temperature", "current", "substance")


def _dim(**powers: int) -> tuple[tuple[str, Fraction], ...]:
    return tuple(sorted((f"[{k}]", Fraction(v)) for k, v in powers.items() if v))


_LENGTH = _dim(length=1)
_VOLUME = _dim(length=3)
_TIME = _dim(time=1)
_ENERGY = _dim(mass=1, length=2, time=-2)
_PRESSURE = _dim(mass=1, length=-1, time=-2)
_TEMPERATURE = _dim(temperature=1)

#: Names read without pint: name -> (exact SI factor, dimension). Sources: the SI Brochure,
#: 9th edition (2019) for the SI units and the litre (1964 CGPM), the minute, hour and day;
#: the international yard and pound agreement (1959) for the inch, foot and pound
#: (0.0254 m, 0.3048 m, 0.45359237 kg); the standard atmosphere 101325 Pa (10th CGPM,
#: 1954), the torr as 1/760 of it, the bar 1e5 Pa; the pound-force 0.45359237 kg times the
#: standard gravity 9.80665 m/s^2 (3rd CGPM, 1901). Each is checked against pint in
#: tests/test_units.py.
BASE_UNITS: dict[str, tuple[float, tuple[tuple[str, Fraction], ...]]] = {
    "g": (1e-3, _dim(mass=1)),
    "gram": (1e-3, _dim(mass=1)),
    "kilogram": (1.0, _dim(mass=1)),
    "t": (1e3, _dim(mass=1)),
    "tonne": (1e3, _dim(mass=1)),
    "lb": (0.45359237, _dim(mass=1)),
    "m": (1.0, _LENGTH),
    "meter": (1.0, _LENGTH),
    "metre": (1.0, _LENGTH),
    "in": (0.0254, _LENGTH),
    "inch": (0.0254, _LENGTH),
    "ft": (0.3048, _LENGTH),
    "foot": (0.3048, _LENGTH),
    "L": (1e-3, _VOLUME),
    "l": (1e-3, _VOLUME),
    "liter": (1e-3, _VOLUME),
    "litre": (1e-3, _VOLUME),
    "s": (1.0, _TIME),
    "second": (1.0, _TIME),
    "seconds": (1.0, _TIME),
    "min": (60.0, _TIME),
    "minute": (60.0, _TIME),
    "minutes": (60.0, _TIME),
    "h": (3600.0, _TIME),
    "hour": (3600.0, _TIME),
    "hours": (3600.0, _TIME),
    "d": (86400.0, _TIME),
    "day": (86400.0, _TIME),
    "days": (86400.0, _TIME),
    "week": (604800.0, _TIME),
    "weeks": (604800.0, _TIME),
    "K": (1.0, _TEMPERATURE),
    "kelvin": (1.0, _TEMPERATURE),
    "A": (1.0, _dim(current=1)),
    "ampere": (1.0, _dim(current=1)),
    "mol": (1.0, _dim(substance=1)),
    "C": (1.0, _dim(current=1, time=1)),
    "coulomb": (1.0, _dim(current=1, time=1)),
    "N": (1.0, _dim(mass=1, length=1, time=-2)),
    "J": (1.0, _ENERGY),
    "joule": (1.0, _ENERGY),
    "Wh": (3600.0, _ENERGY),
    "W": (1.0, _dim(mass=1, length=2, time=-3)),
    "watt": (1.0, _dim(mass=1, length=2, time=-3)),
    "Pa": (1.0, _PRESSURE),
    "pascal": (1.0, _PRESSURE),
    "bar": (1e5, _PRESSURE),
    "atm": (101325.0, _PRESSURE),
    "torr": (101325.0 / 760.0, _PRESSURE),
    "psi": (0.45359237 * 9.80665 / 0.0254**2, _PRESSURE),
    "Hz": (1.0, _dim(time=-1)),
    "V": (1.0, _dim(mass=1, length=2, time=-3, current=-1)),
    "ohm": (1.0, _dim(mass=1, length=2, time=-3, current=-2)),
    "Ω": (1.0, _dim(mass=1, length=2, time=-3, current=-2)),
    "T": (1.0, _dim(mass=1, time=-2, current=-1)),
}

#: SI prefixes (SI Brochure, 9th edition, table 7) by symbol, as powers of ten.
PREFIXES: dict[str, int] = {
    "n": -9,
    "u": -6,
    "µ": -6,
    "μ": -6,
    "m": -3,
    "c": -2,
    "k": 3,
    "M": 6,
    "G": 9,
}
#: Symbols of :data:`BASE_UNITS` that take a prefix of :data:`PREFIXES` (``kPa``, ``mK``).
PREFIXABLE = frozenset("g m L l s K A mol C N J Wh W Pa bar Hz V ohm Ω T".split())
_HECTO = frozenset({"Pa"})  # hPa only: "h" alone is the hour

#: Offset temperatures: name -> (factor, offset) with T [K] = factor * (value + offset).
#: degC: T = t + 273.15 (SI Brochure, 9th edition, 2.3.1); degF: T = (t + 459.67) * 5/9
#: (the Rankine scale's zero at absolute zero, 1 degF = 5/9 K; NIST SP 811, B.8).
OFFSET_UNITS: dict[str, tuple[float, float]] = {
    "degC": (1.0, 273.15),
    "°C": (1.0, 273.15),
    "celsius": (1.0, 273.15),
    "degree_Celsius": (1.0, 273.15),
    "degF": (5.0 / 9.0, 459.67),
    "°F": (5.0 / 9.0, 459.67),
    "fahrenheit": (5.0 / 9.0, 459.67),
    "degree_Fahrenheit": (5.0 / 9.0, 459.67),
}

# Plain words for dimensions in messages, with the SI spelling the dimension is read from.
_PLAIN_NAMES = [
    ("a mass", "kg"),
    ("a length", "m"),
    ("a time", "s"),
    ("a temperature", "K"),
    ("an electric current", "A"),
    ("an amount of substance", "mol"),
    ("an electric charge", "A*s"),
    ("an area", "m^2"),
    ("a volume", "m^3"),
    ("a speed", "m/s"),
    ("an acceleration", "m/s^2"),
    ("a force", "N"),
    ("an energy", "J"),
    ("a power", "W"),
    ("a pressure", "Pa"),
    ("a rate (something per time)", "1/s"),
    ("a flow (a volume per time)", "m^3/s"),
    ("a mass flow", "kg/s"),
    ("a density", "kg/m^3"),
    ("a voltage", "V"),
    ("an electrical resistance", "ohm"),
    ("an electrical resistivity", "ohm*m"),
    ("a magnetic field", "T"),
    ("a molar mass", "kg/mol"),
    ("a heat capacity", "J/K"),
    ("a specific heat", "J/(kg*K)"),
    ("a molar heat capacity", "J/(mol*K)"),
    ("a thermal conductance", "W/K"),
    ("a thermal conductivity", "W/(m*K)"),
    ("a specific energy", "J/kg"),
    ("an energy per volume", "J/m^3"),
    ("something per length", "1/m"),
    ("a volume per length", "m^2"),
]

#: The unit used to show how to write a value of each dimension in a message.
_WRITE_AS = {
    "mass": "kg",
    "length": "mm",
    "area": "mm^2",
    "volume": "L",
    "power": "W",
    "energy": "J",
    "pressure": "kPa",
    "time": "h",
    "rate": "/h",
    "flow": "m^3/h",
    "current": "A",
    "per length": "/m",
    "density": "kg/m^3",
    "specific heat": "J/(kg K)",
    "thermal conductance": "W/K",
    "thermal conductivity": "W/(m K)",
    "specific energy": "J/kg",
    "energy per volume": "kWh/L",
    "molar mass": "g/mol",
    "magnetic field": "mT",
    "resistivity": "ohm m",
}

_TEMPERATURE_EXAMPLES = "a temperature such as '4.2 K' or '20 degC'"
