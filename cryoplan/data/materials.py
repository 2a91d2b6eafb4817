"""The material library: loads and validates materials/*.toml, finds a material by id.

Material files live in three kinds of folder, searched in this order (a later folder
overrides an earlier one, material by material):

1. the bundled folder: ``cryoplan/materials`` in an installed package, or ``materials/``
   beside the package in a source checkout;
2. the user's folder: ``<platformdirs user data dir>/cryoplan/materials``;
3. each folder named in the environment variable ``CRYOPLAN_MATERIALS`` (several are
   separated by ``os.pathsep``).

Loading is lazy and cheap: the files are read with tomllib on first use and checked
(a bad file becomes an :class:`~cryoplan.errors.InputError` in :func:`library_problems`,
and the other materials still load); the tables behind enthalpy, entropy and the
conductivity integral are built on first use per material. The file format is described
in DEVELOPERS.md ("Material files").
"""

from __future__ import annotations

import math
import os
import re
import sys
from collections.abc import Callable
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from ..errors import CryoplanError, InputError, TemperatureError, UnknownNameError
from ..physics import solids
from ..resources import bundled as _bundled_folder

if sys.version_info >= (3, 11):
    import tomllib
else:  # pragma: no cover
    import tomli as tomllib

#: The environment variable naming extra material folders.
ENV_VAR = "CRYOPLAN_MATERIALS"

#: Material classes a file may declare.
CLASSES = (
    "metal",
    "alloy",
    "polymer",
    "composite",
    "ceramic",
    "crystal",
    "glass",
    "superconductor composite",
)

#: Standard temperatures of the material table [K].
STANDARD_TEMPERATURES = (4.2, 10.0, 20.0, 40.0, 77.0, 150.0, 300.0)

#: Relative slack above a material's highest data temperature (0.5 %).
RANGE_TOLERANCE = 0.005

# --------------------------------------------------------------------------------------
# Units in material files: a fast table for the usual spellings, pint for the rest
# --------------------------------------------------------------------------------------

_NUMBER = re.compile(r"^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*(.*?)\s*$")

#: kind -> {normalised unit: (factor to SI, per mole?)}
_FAST_UNITS: dict[str, dict[str, tuple[float, bool]]] = {
    "temperature": {"K": (1.0, False), "mK": (1e-3, False)},
    "density": {
        "kg/m^3": (1.0, False),
        "kg/m3": (1.0, False),
        "g/cm^3": (1000.0, False),
        "g/cm3": (1000.0, False),
        "g/cc": (1000.0, False),
    },
    "molar mass": {"g/mol": (1e-3, False), "kg/mol": (1.0, False)},
    "specific heat": {
        "J/(kg*K)": (1.0, False),
        "J/kg/K": (1.0, False),
        "J/(g*K)": (1000.0, False),
        "mJ/(g*K)": (1.0, False),
        "J/(mol*K)": (1.0, True),
        "mJ/(mol*K)": (1e-3, True),
    },
    "electronic coefficient": {
        "J/(mol*K^2)": (1.0, True),
        "mJ/(mol*K^2)": (1e-3, True),
        "J/(kg*K^2)": (1.0, False),
        "mJ/(kg*K^2)": (1e-3, False),
        "mJ/(g*K^2)": (1.0, False),
    },
    "thermal conductivity": {"W/(m*K)": (1.0, False), "W/m/K": (1.0, False)},
    "resistivity": {
        "ohm*m": (1.0, False),
        "nohm*m": (1e-9, False),
        "uohm*cm": (1e-8, False),
        "ohm*cm": (1e-2, False),
    },
}

_PINT_DIMENSIONS = {
    "temperature": ["[temperature]"],
    "density": ["[mass] / [length] ** 3"],
    "molar mass": ["[mass] / [substance]"],
    "specific heat": [
        "[energy] / [mass] / [temperature]",
        "[energy] / [substance] / [temperature]",
    ],
    "electronic coefficient": [
        "[energy] / [mass] / [temperature] ** 2",
        "[energy] / [substance] / [temperature] ** 2",
    ],
    "thermal conductivity": ["[power] / [length] / [temperature]"],
    "resistivity": ["[resistance] * [length]"],
}

_SI_UNIT = {
    "temperature": ("K", "K"),
    "density": ("kg/m**3", None),
    "molar mass": ("kg/mol", None),
    "specific heat": ("J/(kg*K)", "J/(mol*K)"),
    "electronic coefficient": ("J/(kg*K**2)", "J/(mol*K**2)"),
    "thermal conductivity": ("W/(m*K)", None),
    "resistivity": ("ohm*m", None),
}

_EXAMPLES = {
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


def _normalise_unit(unit: str) -> str:
    unit = unit.strip().replace("**", "^").replace("·", "*").replace("Ω", "ohm")
    unit = re.sub(r"\s*\*\s*", "*", unit)
    unit = re.sub(r"\s*/\s*", "/", unit)
    unit = re.sub(r"\s+", "*", unit)
    return unit.replace("(", "(").replace("kelvin", "K")


def unit_factor(unit: str, kind: str, where: dict) -> tuple[float, bool]:
    """SI factor of a unit of the given kind, and whether it is per mole.

    The usual spellings are looked up in a table (fast); others go to pint.
    """
    norm = _normalise_unit(unit)
    table = _FAST_UNITS[kind]
    if norm in table:
        return table[norm]
    for other, units in _FAST_UNITS.items():
        if other != kind and norm in units:
            raise InputError(
                f"a unit that is not {_KIND_WORDS[kind]}",
                expected=_EXAMPLES[kind],
                found=repr(unit),
                **where,
            )
    from ..units import registry

    ureg = registry()
    try:
        quantity = ureg.Quantity(1.0, unit.replace("^", "**"))
    except Exception:
        raise InputError(
            f"unknown unit {unit!r}", expected=_EXAMPLES[kind], found=repr(unit), **where
        ) from None
    for i, dim in enumerate(_PINT_DIMENSIONS[kind]):
        if quantity.check(dim):
            si = _SI_UNIT[kind][i]
            return float(quantity.m_as(si)), i == 1
    raise InputError(
        f"a unit that is not {_KIND_WORDS[kind]}",
        expected=_EXAMPLES[kind],
        found=repr(unit),
        **where,
    )


def parse_value(text, kind: str, where: dict) -> tuple[float, bool]:
    """Parse ``"8960 kg/m^3"`` into (SI value, per mole?)."""
    if isinstance(text, bool) or not isinstance(text, str):
        raise InputError(
            "not a quantity with units", expected=_EXAMPLES[kind], found=repr(text), **where
        )
    match = _NUMBER.match(text)
    if not match or not match.group(2):
        raise InputError(
            "not a number with units", expected=_EXAMPLES[kind], found=repr(text), **where
        )
    factor, molar = unit_factor(match.group(2), kind, where)
    return float(match.group(1)) * factor, molar


# --------------------------------------------------------------------------------------
# The Material
# --------------------------------------------------------------------------------------


@dataclass
class ReferenceSet:
    """Reference points [K, J/(kg K)] of one source."""

    source: str
    temperatures: np.ndarray
    values: np.ndarray


def _check_temperature(
    t: np.ndarray, material: Material, t_max: float, extrapolate: bool, what: str
) -> None:
    if t.size == 0:
        return
    if np.any(np.isnan(t)):
        raise TemperatureError(f"{material.id}: a temperature that is not a number (NaN)")
    low = np.min(t)
    if low < 0:
        raise TemperatureError(
            f"{material.id}: {low:g} K is below absolute zero; temperatures are in kelvin"
        )
    if not extrapolate and np.any(solids.check_range(t, t_max, RANGE_TOLERANCE)):
        high = float(np.max(t))
        raise TemperatureError(
            f"{material.id}: {high:g} K is above the range of its {what} data "
            f"(to {t_max:g} K); pass extrapolate=True (on the command line "
            "--extrapolate) to use the model beyond its data"
        )


def _power_law_below(function: Callable, t_min: float) -> Callable:
    """k(T) as given from t_min up; below, the power law with the log slope at t_min."""
    k0 = float(function(np.array([t_min]))[0])
    k1 = float(function(np.array([t_min * 1.01]))[0])
    slope = max(math.log(k1 / k0) / math.log(1.01), 0.0)

    def k(t):
        t = np.asarray(t, dtype=float)
        low = t < t_min
        out = np.empty_like(t)
        if np.any(~low):
            out[~low] = function(t[~low])
        if np.any(low):
            out[low] = k0 * (t[low] / t_min) ** slope
        return out

    return k


@dataclass(eq=False)
class Material:
    """A solid's properties as functions of temperature; built from one material file.

    Attributes
    ----------
    id, name, klass : str
        Canonical id, display name and class (see :data:`CLASSES`).
    density : float
        [kg/m^3] at room temperature.
    molar_mass : float or None
        [kg/mol] of the formula unit, where meaningful.
    t_min, t_max : float
        [K], range of the heat-capacity reference data.
    emissivity : float or None
        Total hemispherical emissivity, typical value (see the file for the surface).
    sources : list of str
        Every published source behind the data.
    origin : str
        Path of the file the material came from.
    bundled : bool
        True for the materials shipped with cryoplan.
    """

    id: str
    name: str
    klass: str
    density: float
    molar_mass: float | None
    t_min: float
    t_max: float
    emissivity: float | None
    sources: list[str]
    origin: str
    bundled: bool
    model: str
    formula: str | None = None
    aliases: list[str] = field(default_factory=list)
    references: list[ReferenceSet] = field(default_factory=list)
    notes: str = ""
    default_rrr: float | None = None
    conductivity_model: str | None = None
    k_t_min: float | None = None
    k_t_max: float | None = None
    _c: Callable | None = None
    _breakpoints: tuple = ()
    _k_factory: Callable | None = None
    _h: solids.CumulativeIntegral | None = None
    _s: solids.CumulativeIntegral | None = None
    _k_cache: dict = field(default_factory=dict)
    _k_integral_cache: dict = field(default_factory=dict)
    _params: dict = field(default_factory=dict)

    def __repr__(self) -> str:
        return f"Material({self.id!r}, {self.name!r})"

    # heat capacity -------------------------------------------------------------------

    def _c_raw(self, t: np.ndarray) -> np.ndarray:
        return np.asarray(self._c(t), dtype=float)

    def specific_heat(self, temperature, extrapolate: bool = False):
        """Specific heat c(T) [J/(kg K)] at temperature [K]; float -> float, array -> array.

        Below ``t_min`` the model follows gamma T + beta T^3 to 0 K; above ``t_max``
        (beyond 0.5 %) it is refused unless ``extrapolate`` is true.
        """
        t, scalar = solids._as_array(temperature)
        _check_temperature(t, self, self.t_max, extrapolate, "heat capacity")
        value = self._c_raw(t)
        return float(value) if scalar else value

    def _tables(self) -> tuple[solids.CumulativeIntegral, solids.CumulativeIntegral]:
        if self._h is None:
            top = self.t_max * (1.0 + RANGE_TOLERANCE)
            self._h = solids.CumulativeIntegral(self._c_raw, top, self._breakpoints)
            self._s = solids.CumulativeIntegral(
                lambda t: self._c_raw(t) / t, top, self._breakpoints
            )
        return self._h, self._s

    def enthalpy(self, temperature, extrapolate: bool = False):
        """Enthalpy H(T) - H(0 K) [J/kg], the integral of c dT from 0 K."""
        t, scalar = solids._as_array(temperature)
        _check_temperature(t, self, self.t_max, extrapolate, "heat capacity")
        value = self._tables()[0](t)
        return float(value) if scalar else np.asarray(value)

    def entropy(self, temperature, extrapolate: bool = False):
        """Entropy S(T) - S(0 K) [J/(kg K)], the integral of c/T dT; S(0) = 0."""
        t, scalar = solids._as_array(temperature)
        _check_temperature(t, self, self.t_max, extrapolate, "heat capacity")
        value = self._tables()[1](t)
        return float(value) if scalar else np.asarray(value)

    # conductivity --------------------------------------------------------------------

    @property
    def has_conductivity(self) -> bool:
        """True where the file has thermal-conductivity data."""
        return self._k_factory is not None

    def _k_function(self, rrr) -> Callable:
        if self._k_factory is None:
            raise InputError(
                f"material {self.id!r} has no thermal-conductivity data",
                file=self.origin,
                key="conductivity",
                expected="a [conductivity] table in the material file",
                found="none",
            )
        if rrr is not None:
            if self.default_rrr is None:
                raise InputError(
                    f"material {self.id!r} takes no RRR (its conductivity does not depend "
                    "on purity in cryoplan's data)",
                    key="rrr",
                    found=repr(rrr),
                )
            if not (isinstance(rrr, (int, float)) and math.isfinite(rrr) and 1.0 < rrr <= 1e5):
                raise InputError(
                    "an RRR out of range", key="rrr", expected="a number above 1", found=repr(rrr)
                )
        key = None if rrr is None else float(rrr)
        if key not in self._k_cache:
            raw = self._k_factory(self.default_rrr if key is None else key)
            self._k_cache[key] = _power_law_below(raw, self.k_t_min)
        return self._k_cache[key]

    def conductivity(self, temperature, rrr: float | None = None, extrapolate: bool = False):
        """Thermal conductivity k(T) [W/(m K)]; ``rrr`` for copper and aluminium.

        Below the lowest conductivity datum the power law of the first segment continues;
        above the highest it is refused unless ``extrapolate`` is true.
        """
        function = self._k_function(rrr)
        t, scalar = solids._as_array(temperature)
        _check_temperature(t, self, self.k_t_max, extrapolate, "conductivity")
        with np.errstate(divide="ignore", invalid="ignore"):
            value = np.where(t > 0, function(np.where(t > 0, t, 1.0)), 0.0)
        return float(value) if scalar else value

    def conductivity_integral(
        self, t_low, t_high, rrr: float | None = None, extrapolate: bool = False
    ):
        """Conductivity integral [W/m], the integral of k dT from ``t_low`` to ``t_high``.

        Vectorised in both temperatures (broadcast); negative where t_high < t_low.
        """
        function = self._k_function(rrr)
        lo, s1 = solids._as_array(t_low)
        hi, s2 = solids._as_array(t_high)
        _check_temperature(
            np.concatenate([lo.ravel(), hi.ravel()]),
            self,
            self.k_t_max,
            extrapolate,
            "conductivity",
        )
        key = None if rrr is None else float(rrr)
        table = self._k_integral_cache.get(key)
        if table is None:
            table = solids.CumulativeIntegral(
                function, self.k_t_max * (1.0 + RANGE_TOLERANCE), per_decade=100
            )
            self._k_integral_cache[key] = table
        value = np.asarray(table(hi)) - np.asarray(table(lo))
        return float(value) if (s1 and s2) else value

    # for listings ----------------------------------------------------------------------

    def summary(self) -> dict:
        """A plain dict for JSON listings."""
        return {
            "id": self.id,
            "name": self.name,
            "class": self.klass,
            "density_kg_per_m3": self.density,
            "molar_mass_kg_per_mol": self.molar_mass,
            "t_min_K": self.t_min,
            "t_max_K": self.t_max,
            "model": self.model,
            "has_conductivity": self.has_conductivity,
            "default_rrr": self.default_rrr,
            "emissivity": self.emissivity,
            "aliases": list(self.aliases),
            "origin": "bundled" if self.bundled else self.origin,
            "sources": list(self.sources),
        }


# --------------------------------------------------------------------------------------
# Reading one file
# --------------------------------------------------------------------------------------


class _Reader:
    """Reads one parsed material file, collecting the first problem per key."""

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
                expected=f"{_EXAMPLES[kind]}, above zero",
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


def _terms(reader: _Reader, hc: dict) -> dict:
    """Einstein, Schottky and superconducting terms of a Debye-type model."""
    einstein = []
    for i, term in enumerate(hc.get("einstein", [])):
        key = f"heat_capacity.einstein[{i}]"
        theta = reader.quantity(term, "temperature", key + ".temperature", "temperature")
        atoms = reader.number(term, "atoms", key + ".atoms", low=0.0, high=1e4)
        reader.note_source(term, key)
        einstein.append((theta, atoms))
    schottky = []
    for i, term in enumerate(hc.get("schottky", [])):
        key = f"heat_capacity.schottky[{i}]"
        gap = reader.quantity(term, "gap", key + ".gap", "temperature")
        centres = reader.number(term, "centres", key + ".centres", low=0.0, high=1e4)
        ratio = reader.number(
            term,
            "degeneracy_ratio",
            key + ".degeneracy_ratio",
            required=False,
            default=1.0,
            low=1e-6,
            high=1e6,
        )
        reader.note_source(term, key)
        schottky.append((gap, centres, ratio))
    superconducting = None
    if "superconducting" in hc:
        term = hc["superconducting"]
        key = "heat_capacity.superconducting"
        if not isinstance(term, dict):
            raise reader.error(
                "not a table", key, expected="{ tc = '9.25 K', ... }", found=repr(term)
            )
        tc = reader.quantity(term, "tc", key + ".tc", "temperature")
        b = reader.number(term, "b", key + ".b", required=False, default=1.44, low=0.5, high=5.0)
        reader.note_source(term, key)
        superconducting = (tc, b)
    return {
        "einstein": tuple(einstein),
        "schottky": tuple(schottky),
        "superconducting": superconducting,
    }


def _heat_capacity(
    reader: _Reader, data: dict, molar_mass: float | None, allow_unfitted: bool = False
):
    """(model name, c(T) function, breakpoints, references, t_min, t_max)."""
    hc = reader.get(data, "heat_capacity", "heat_capacity")
    if not isinstance(hc, dict):
        raise reader.error(
            "not a table", "heat_capacity", expected="[heat_capacity]", found=repr(hc)[:40]
        )
    model = reader.get(hc, "model", "heat_capacity.model")
    known = sorted(solids.HEAT_CAPACITY_MODELS) + ["mixture"]
    if model not in known:
        raise reader.error(
            "unknown heat-capacity model",
            "heat_capacity.model",
            expected="one of " + ", ".join(repr(k) for k in known),
            found=repr(model),
        )
    if "source" in hc:
        reader.note_source(hc, "heat_capacity")

    references = []
    for i, ref in enumerate(hc.get("reference", [])):
        key = f"heat_capacity.reference[{i}]"
        if not isinstance(ref, dict):
            raise reader.error(
                "not a table", key, expected="{ source = ..., points = ... }", found=repr(ref)[:40]
            )
        reader.note_source(ref, key)
        if "source" not in ref:
            raise reader.error(
                "reference points without their source",
                key + ".source",
                expected="a source",
                found="nothing",
            )
        t, y = reader.pairs(
            reader.get(ref, "points", key + ".points"), key + ".points", "specific heat", minimum=1
        )
        unit = ref.get("unit", "J/(kg K)")
        factor, molar = unit_factor(unit, "specific heat", reader.where(key + ".unit"))
        y = y * factor
        if molar:
            if molar_mass is None:
                raise reader.error(
                    "per-mole reference points need the molar mass",
                    key + ".unit",
                    expected="molar_mass in the file",
                    found=repr(unit),
                )
            y = y / molar_mass
        references.append(ReferenceSet(ref["source"], t, y))

    gamma, gamma_per_kg = 0.0, False
    if "gamma" in hc:
        gamma, molar, raw, _ = reader.quantity_with_basis(
            hc, "gamma", "heat_capacity.gamma", "electronic coefficient"
        )
        gamma_per_kg = not molar
        if gamma < 0:
            raise reader.error(
                "a negative electronic coefficient",
                "heat_capacity.gamma",
                expected="gamma of 0 or more",
                found=repr(raw),
            )

    breakpoints: list[float] = []
    if model in ("debye", "debye-varying"):
        if molar_mass is None:
            raise reader.error(
                "a Debye model needs the molar mass",
                "molar_mass",
                expected="molar_mass = { value = '63.546 g/mol', ... }",
                found="nothing",
            )
        atoms = reader.number(
            hc,
            "atoms_per_formula",
            "heat_capacity.atoms_per_formula",
            required=False,
            default=1.0,
            low=0.01,
            high=1e4,
        )
        if gamma_per_kg:
            gamma = gamma * molar_mass
        terms = _terms(reader, hc)
        terms["dilation"] = 0.0
        if "dilation" in hc:
            terms["dilation"] = reader.number(
                hc, "dilation", "heat_capacity.dilation", low=0.0, high=1e-2
            )
        if terms["superconducting"]:
            breakpoints.append(terms["superconducting"][0])
        if model == "debye":
            theta = reader.quantity(
                hc, "debye_temperature", "heat_capacity.debye_temperature", "temperature"
            )

            def c(t, theta=theta):
                return solids.debye_specific_heat(t, theta, molar_mass, atoms, gamma, **terms)

            knot_temperatures = None
        elif "theta_knots" not in hc and allow_unfitted:
            knot_temperatures = None
            c = None
        else:
            if "theta_knots" not in hc:
                raise reader.error(
                    "the model has not been fitted yet",
                    "heat_capacity.theta_knots",
                    expected="theta_knots, written by 'cryoplan fit FILE --write'",
                    found="nothing",
                )
            knots_raw = hc["theta_knots"]
            kt, kv = reader.pairs(knots_raw, "heat_capacity.theta_knots", "Debye temperature")
            breakpoints.extend(kt.tolist())
            knot_temperatures = kt

            def c(t, kt=kt, kv=kv):
                return solids.varying_debye_specific_heat(
                    t, kt, kv, molar_mass, atoms, gamma, **terms
                )

        params = {
            "atoms": atoms,
            "gamma_molar": gamma,
            "terms": terms,
            "fit_gamma": bool(hc.get("fit_gamma", False)),
            "fit_dilation": bool(hc.get("fit_dilation", False)),
        }
        if knot_temperatures is not None:
            params["knot_temperatures"] = knot_temperatures
    elif model == "tabulated":
        table = hc.get("table")
        if table is None:
            if not references:
                raise reader.error(
                    "a tabulated model needs a table",
                    "heat_capacity.table",
                    expected="table = [[T, c], ...] or reference points",
                    found="nothing",
                )
            tt, tv = references[0].temperatures, references[0].values
        else:
            tt, tv = reader.pairs(table, "heat_capacity.table", "specific heat")
        if gamma and not gamma_per_kg and molar_mass is None:
            raise reader.error(
                "a per-mole gamma needs the molar mass",
                "heat_capacity.gamma",
                expected="molar_mass in the file, or gamma per kg",
                found=repr(hc["gamma"]),
            )
        g = gamma if gamma_per_kg else gamma / (molar_mass or 1.0)
        breakpoints.extend(tt.tolist())

        def c(t, tt=tt, tv=tv, g=g):
            return solids.tabulated_specific_heat(t, tt, tv, g)

        params = {}
    else:  # mixture: resolved against the other materials after loading
        parts = reader.get(hc, "components", "heat_capacity.components")
        if not isinstance(parts, list) or not parts:
            raise reader.error(
                "a mixture needs components",
                "heat_capacity.components",
                expected="[{ material = 'copper', mass_fraction = 0.6 }, ...]",
                found=repr(parts)[:40],
            )
        comps = []
        for i, part in enumerate(parts):
            key = f"heat_capacity.components[{i}]"
            mid = reader.get(part, "material", key + ".material")
            frac = reader.number(part, "mass_fraction", key + ".mass_fraction", low=0.0, high=1.0)
            comps.append((str(mid), frac))
        total = sum(f for _, f in comps)
        if abs(total - 1.0) > 1e-3:
            raise reader.error(
                "mass fractions do not add up to 1",
                "heat_capacity.components",
                expected="a sum of 1",
                found=f"{total:g}",
            )
        c = None
        params = {"components": comps}

    if references:
        t_all = np.concatenate([r.temperatures for r in references])
        t_min, t_max = float(t_all.min()), float(t_all.max())
    else:
        t_min = t_max = None
    rng = hc.get("range")
    if rng is not None:
        if not (isinstance(rng, list) and len(rng) == 2):
            raise reader.error(
                "not a range", "heat_capacity.range", expected="['4 K', '300 K']", found=repr(rng)
            )
        t_min = parse_value(rng[0], "temperature", reader.where("heat_capacity.range"))[0]
        t_max = parse_value(rng[1], "temperature", reader.where("heat_capacity.range"))[0]
    if t_max is None:
        raise reader.error(
            "no temperature range",
            "heat_capacity.range",
            expected="reference points or range = ['4 K', '300 K']",
            found="neither",
        )
    if not (0 <= t_min < t_max):
        raise reader.error(
            "an empty temperature range",
            "heat_capacity.range",
            expected="t_min below t_max",
            found=f"{t_min:g} K to {t_max:g} K",
        )
    return model, c, tuple(breakpoints), references, t_min, t_max, params


def _conductivity(reader: _Reader, data: dict):
    """(model, factory rrr -> k(T), default rrr, t_min, t_max) or Nones."""
    k = data.get("conductivity")
    if k is None:
        return None, None, None, None, None
    key = "conductivity"
    if not isinstance(k, dict):
        raise reader.error("not a table", key, expected="[conductivity]", found=repr(k)[:40])
    model = reader.get(k, "model", key + ".model")
    if model not in solids.CONDUCTIVITY_MODELS:
        known = ", ".join(repr(m) for m in sorted(solids.CONDUCTIVITY_MODELS))
        raise reader.error(
            "unknown conductivity model",
            key + ".model",
            expected=f"one of {known}",
            found=repr(model),
        )
    reader.note_source(k, key)
    if "source" not in k:
        raise reader.error(
            "conductivity data without a source",
            key + ".source",
            expected="a source",
            found="nothing",
        )
    default_rrr = None
    if model == "nist-log-polynomial":
        coefficients = reader.get(k, "coefficients", key + ".coefficients")
        if not (
            isinstance(coefficients, list)
            and 2 <= len(coefficients) <= 12
            and all(isinstance(x, (int, float)) for x in coefficients)
        ):
            raise reader.error(
                "not a list of coefficients",
                key + ".coefficients",
                expected="[a, b, c, ...] numbers",
                found=repr(coefficients)[:60],
            )

        def factory(rrr, coefficients=tuple(float(x) for x in coefficients)):
            return lambda t: solids.nist_log_polynomial(t, coefficients)
    elif model == "tabulated":
        tt, tv = reader.pairs(
            reader.get(k, "points", key + ".points"), key + ".points", "conductivity"
        )

        def factory(rrr, tt=tt, tv=tv):
            return lambda t: solids.tabulated_conductivity(t, tt, tv)
    elif model == "hust-lankford":
        names = ("p1", "p2", "p3", "p4", "p5", "p6", "p7")
        params = {n: reader.number(k, n, f"{key}.{n}") for n in names}
        params["p7_exponent"] = reader.number(
            k, "p7_exponent", key + ".p7_exponent", required=False, default=0.0
        )
        params["rho_273"] = reader.quantity(k, "rho_273", key + ".rho_273", "resistivity")
        default_rrr = reader.number(k, "rrr", key + ".rrr", low=1.0001, high=1e5)

        def factory(rrr, params=params):
            return lambda t: solids.hust_lankford_conductivity(t, rrr, **params)
    else:  # nist-rational
        coefficients = reader.get(k, "coefficients", key + ".coefficients")

        def factory(rrr, coefficients=tuple(float(x) for x in coefficients)):
            return lambda t: solids.nist_rational_conductivity(t, coefficients)

    rng = reader.get(k, "range", key + ".range")
    if not (isinstance(rng, list) and len(rng) == 2):
        raise reader.error(
            "not a range", key + ".range", expected="['4 K', '300 K']", found=repr(rng)
        )
    t_min = parse_value(rng[0], "temperature", reader.where(key + ".range"))[0]
    t_max = parse_value(rng[1], "temperature", reader.where(key + ".range"))[0]
    if not 0 < t_min < t_max:
        raise reader.error(
            "an empty temperature range",
            key + ".range",
            expected="0 K < t_min < t_max",
            found=repr(rng),
        )
    return model, factory, default_rrr, t_min, t_max


def read_material_file(
    path: Path, bundled: bool = False, allow_unfitted: bool = False
) -> Material:
    """Read and check one material file; raises InputError naming the file and key.

    ``allow_unfitted`` accepts a Debye-type model without its fitted parameters (for
    ``cryoplan fit``); such a material cannot compute anything until it is fitted.
    """
    path = Path(path)
    try:
        text = path.read_text(encoding="utf-8")
    except OSError as exc:
        raise InputError(f"cannot read the file ({exc.strerror})", file=str(path)) from None
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        line = None
        match = re.search(r"line (\d+)", str(exc))
        if match:
            line = int(match.group(1))
        raise InputError(f"not valid TOML: {exc}", file=str(path), line=line) from None
    reader = _Reader(path, text, data)
    try:
        return _read(reader, data, path, bundled, allow_unfitted)
    except InputError as exc:
        if exc.line is None and exc.key and exc.file == str(path):
            exc.line = reader.line_of(exc.key)
            exc.args = (str(exc),)
        raise


def _read(
    reader: _Reader, data: dict, path: Path, bundled: bool, allow_unfitted: bool
) -> Material:
    mid = reader.get(data, "id", "id")
    if not isinstance(mid, str) or not re.fullmatch(r"[a-z0-9][a-z0-9.\-]*", mid):
        raise reader.error(
            "not a valid id", "id", expected="lower-case letters, digits and '-'", found=repr(mid)
        )
    name = reader.get(data, "name", "name")
    klass = reader.get(data, "class", "class")
    if klass not in CLASSES:
        raise reader.error(
            "unknown class",
            "class",
            expected="one of " + ", ".join(repr(c) for c in CLASSES),
            found=repr(klass),
        )
    density = reader.quantity(data, "density", "density", "density", positive=False)
    if not density > 0:
        raw = data["density"]["value"] if isinstance(data["density"], dict) else data["density"]
        raise reader.error(
            "a density that is not positive",
            "density",
            expected="a density above zero such as '8960 kg/m^3'",
            found=repr(raw),
        )
    molar_mass = reader.quantity(data, "molar_mass", "molar_mass", "molar mass", required=False)
    emissivity = reader.number(data, "emissivity", "emissivity", required=False, low=0.0, high=1.0)
    aliases = data.get("aliases", [])
    if not (isinstance(aliases, list) and all(isinstance(a, str) for a in aliases)):
        raise reader.error(
            "not a list of names", "aliases", expected="['name', ...]", found=repr(aliases)
        )
    model, c, breakpoints, references, t_min, t_max, params = _heat_capacity(
        reader, data, molar_mass, allow_unfitted
    )
    k_model, k_factory, default_rrr, k_t_min, k_t_max = _conductivity(reader, data)
    for extra in data.get("sources", []):
        if isinstance(extra, str) and extra not in reader.sources:
            reader.sources.append(extra)
    material = Material(
        id=mid,
        name=str(name),
        klass=klass,
        density=density,
        molar_mass=molar_mass,
        t_min=t_min,
        t_max=t_max,
        emissivity=emissivity,
        sources=reader.sources,
        origin=str(path),
        bundled=bundled,
        model=model,
        formula=data.get("formula"),
        aliases=[a.lower() for a in aliases],
        references=references,
        notes=str(data.get("notes", "")),
        default_rrr=default_rrr,
        conductivity_model=k_model,
        k_t_min=k_t_min,
        k_t_max=k_t_max,
        _c=c,
        _breakpoints=breakpoints,
        _k_factory=k_factory,
        _params=params,
    )
    return material


# --------------------------------------------------------------------------------------
# The library: folders, overrides, problems
# --------------------------------------------------------------------------------------


def bundled_folder() -> Path | None:
    """The folder of the materials shipped with cryoplan (installed or source checkout)."""
    return _bundled_folder("materials")


def user_folder() -> Path:
    """The user's own material folder (platformdirs user data dir)."""
    import platformdirs

    return Path(platformdirs.user_data_dir("cryoplan", appauthor=False)) / "materials"


def search_folders() -> list[tuple[Path, bool, bool]]:
    """(folder, bundled?, from the environment?) in reading order; later ones override."""
    folders: list[tuple[Path, bool, bool]] = []
    bundled = bundled_folder()
    if bundled is not None:
        folders.append((bundled, True, False))
    folders.append((user_folder(), False, False))
    for part in os.environ.get(ENV_VAR, "").split(os.pathsep):
        if part.strip():
            folders.append((Path(part.strip()).expanduser(), False, True))
    return folders


_ID_LINE = re.compile(r"""^id\s*=\s*["']([^"']+)["']""", re.M)
_ALIAS_LINE = re.compile(r"""^aliases\s*=\s*\[([^\]]*)\]""", re.M)


class _Library:
    """An index of the material files (id and aliases read by a quick scan); each file
    is parsed and checked in full only when its material is asked for, or when the whole
    listing is (``material_ids``, ``library_problems``)."""

    def __init__(self) -> None:
        self.candidates: dict[str, list[tuple[Path, bool]]] = {}
        self.alias_of: dict[str, str] = {}
        self.unindexed: list[tuple[Path, bool]] = []
        self.problems: list[InputError] = []
        self.loaded: dict[str, Material | None] = {}
        self.complete = False
        for folder, bundled, from_env in search_folders():
            if not folder.is_dir():
                if from_env:
                    self.problems.append(
                        InputError(
                            f"the folder named in {ENV_VAR} does not exist", file=str(folder)
                        )
                    )
                continue
            seen: dict[str, Path] = {}
            for path in sorted(folder.glob("*.toml")):
                try:
                    text = path.read_text(encoding="utf-8")
                except OSError as exc:
                    self.problems.append(
                        InputError(f"cannot read the file ({exc.strerror})", file=str(path))
                    )
                    continue
                match = _ID_LINE.search(text)
                if not match:
                    self.unindexed.append((path, bundled))
                    continue
                mid = match.group(1).strip().lower()
                if mid in seen:
                    self.problems.append(
                        InputError(
                            f"material id {mid!r} is also defined in {seen[mid]}; this file is "
                            "ignored",
                            file=str(path),
                            key="id",
                        )
                    )
                    continue
                seen[mid] = path
                self.candidates.setdefault(mid, []).append((path, bundled))
                aliases = _ALIAS_LINE.search(text)
                if aliases:
                    for alias in re.findall(r"""["']([^"']+)["']""", aliases.group(1)):
                        self.alias_of[alias.strip().lower()] = mid
        for alias in list(self.alias_of):
            if alias in self.candidates:
                del self.alias_of[alias]

    def get(self, mid: str) -> Material | None:
        """The material of this canonical id, parsed on first use (None if it is bad)."""
        if mid in self.loaded:
            return self.loaded[mid]
        self.loaded[mid] = None  # guards against a mixture that contains itself
        found = None
        for path, bundled in reversed(self.candidates.get(mid, [])):
            try:
                material = read_material_file(path, bundled=bundled)
                if material.id != mid:
                    raise InputError(
                        "the id differs from the one first read",
                        file=str(path),
                        key="id",
                        found=repr(material.id),
                    )
                if material.model == "mixture":
                    self._resolve_mixture(material)
            except InputError as exc:
                self.problems.append(exc)
                continue  # a bad override: fall back to the file it overrides
            found = material
            break
        self.loaded[mid] = found
        return found

    def load_all(self) -> None:
        if self.complete:
            return
        for mid in list(self.candidates):
            self.get(mid)
        for path, bundled in self.unindexed:
            try:
                read_material_file(path, bundled=bundled)
            except InputError as exc:
                self.problems.append(exc)
            else:
                self.problems.append(
                    InputError(
                        "the id must be on a line of its own at the top of the file",
                        file=str(path),
                        key="id",
                        expected='id = "name"',
                        found="another layout",
                    )
                )
        self.complete = True

    @property
    def materials(self) -> dict[str, Material]:
        self.load_all()
        return {k: v for k, v in self.loaded.items() if v is not None}

    def _resolve_mixture(self, material: Material) -> None:
        comps = []
        breakpoints: list[float] = []
        for i, (mid, frac) in enumerate(material._params["components"]):
            key = mid.lower()
            part = self.get(self.alias_of.get(key, key))
            if part is None or part.model == "mixture":
                raise UnknownNameError(
                    "component material",
                    mid,
                    sorted(self.candidates),
                    file=material.origin,
                    key=f"heat_capacity.components[{i}].material",
                )
            if part.t_max < material.t_max * (1 - 1e-9):
                raise InputError(
                    f"component {mid!r} has data only to {part.t_max:g} K",
                    file=material.origin,
                    key="heat_capacity.range",
                    expected=f"a range within every component's (to {part.t_max:g} K)",
                    found=f"{material.t_max:g} K",
                )
            comps.append((part, frac))
            breakpoints.extend(part._breakpoints)
            for source in part.sources:
                if source not in material.sources:
                    material.sources.append(source)

        def c(t, comps=tuple(comps)):
            return sum(frac * part._c_raw(t) for part, frac in comps)

        material._c = c
        material._breakpoints = tuple(sorted(set(breakpoints)))
        material._params["parts"] = comps


_LIBRARY: _Library | None = None


def _library() -> _Library:
    global _LIBRARY
    if _LIBRARY is None:
        _LIBRARY = _Library()
    return _LIBRARY


def reload() -> None:
    """Forget the loaded materials; the next call reads the folders again."""
    global _LIBRARY
    _LIBRARY = None


def material_ids() -> list[str]:
    """Sorted canonical ids of every material that loaded (aliases not included).

    >>> "copper" in material_ids()
    True
    """
    return sorted(_library().materials)


def material(name: str) -> Material:
    """The material with this id or alias (case-insensitive).

    Raises
    ------
    UnknownNameError
        Naming the closest ids.

    >>> material("Aluminum-6061").id
    'aluminium-6061'
    """
    lib = _library()
    if not isinstance(name, str):
        raise InputError("a material id must be text", found=repr(name))
    key = name.strip().lower()
    key = lib.alias_of.get(key, key)
    found = lib.get(key) if key in lib.candidates else None
    if found is not None:
        return found
    if key in lib.candidates:
        bad = [str(p) for p in lib.problems if getattr(p, "file", None)]
        raise InputError(
            f"material {name!r} could not be loaded; its file has a problem",
            found="; ".join(bad[-1:]) or None,
        )
    raise UnknownNameError("material", name, sorted(lib.candidates) + sorted(lib.alias_of))


def material_origin(name: str) -> str:
    """Where a material came from: ``"bundled"`` or the path of the user's file."""
    m = material(name)
    return "bundled" if m.bundled else m.origin


def library_problems() -> list[InputError]:
    """The problems found in material files (each names file, key, expected, found)."""
    lib = _library()
    lib.load_all()
    return list(lib.problems)


def all_materials() -> list[Material]:
    """Every loaded material, sorted by id."""
    materials = _library().materials
    return [materials[k] for k in sorted(materials)]


__all__ = [
    "Material",
    "material",
    "material_ids",
    "material_origin",
    "library_problems",
    "all_materials",
    "read_material_file",
    "reload",
    "CryoplanError",
]
