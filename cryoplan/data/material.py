"""The Material: a solid's heat capacity, enthalpy, entropy and conductivity against
temperature, as built from one material file by :mod:`cryoplan.data.material_file`.

The tables behind enthalpy, entropy and the conductivity integral are built on first use
per material.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass, field

import numpy as np

from ..errors import InputError, TemperatureError
from ..physics import solids

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
