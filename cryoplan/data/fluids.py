"""Cryogen properties from CoolProp, cached so that a run does not pay CoolProp's import.

The six cryogens a low-temperature lab uses (helium, hydrogen, neon, nitrogen, argon,
oxygen) are taken from CoolProp's reference equations of state [1]_. CoolProp's import
alone takes seconds, so the properties cryoplan needs are computed once per cryogen,
pressure and CoolProp version, and written as small JSON tables to the user cache
directory (``platformdirs.user_cache_dir("cryoplan")``, or ``$CRYOPLAN_CACHE_DIR``):

* the saturation scalars at the pressure (boiling point, latent heat, densities, the
  liquid and vapour enthalpy and entropy), the triple and critical points and the
  reference of the equation of state;
* a table of the gas enthalpy, entropy and density against temperature at that pressure,
  from the boiling point to :data:`T_MAX`, with their temperature derivatives, on a grid
  refined until cubic Hermite interpolation in :math:`\\ln T` is within
  :data:`INTERPOLATION_TOLERANCE` of CoolProp at every interval midpoint.

Once a table exists, :func:`cryogen` reads it with :mod:`json` and :mod:`numpy` only; it
never imports CoolProp. A corrupt or foreign table is rebuilt silently; a cache directory
that cannot be written leaves the tables in memory for the run.

Hydrogen is para-hydrogen (CoolProp ``"ParaHydrogen"``): liquid hydrogen that is stored is
converted to (near) para-hydrogen in the liquefier, and its boil-off stays para while it
warms in a cryostat without a catalyst.

References
----------
.. [1] I. H. Bell, J. Wronski, S. Quoilin and V. Lemort, "Pure and pseudo-pure fluid
   thermophysical property evaluation and the open-source thermophysical property library
   CoolProp", Ind. Eng. Chem. Res. 53 (2014) 2498-2508.
"""

from __future__ import annotations

import json
import math
import os
import re
import shutil
import tempfile
from collections.abc import Iterable
from pathlib import Path

import numpy as np

from ..errors import CryoplanError, InputError, TemperatureError, UnknownNameError

#: Standard atmosphere [Pa] (a defined value).
ATMOSPHERE = 101325.0

#: Upper end of the cached gas tables [K]: room temperature with a margin.
T_MAX = 350.0

#: Largest relative error of the interpolated gas tables against CoolProp, checked at the
#: midpoint of every interval when a table is built (the tables promise 1e-4; this is 50
#: times tighter, because a cubic's error between midpoint checks can be somewhat larger).
INTERPOLATION_TOLERANCE = 2e-6

#: Version of the layout of the cache files; a file of another version is rebuilt.
CACHE_FORMAT = 1

#: The cryogens, in order of boiling point, and the CoolProp fluid behind each.
_COOLPROP_NAMES: dict[str, str] = {
    "helium": "Helium",
    "hydrogen": "ParaHydrogen",
    "neon": "Neon",
    "nitrogen": "Nitrogen",
    "argon": "Argon",
    "oxygen": "Oxygen",
}

#: Other spellings users write (compared in lower case).
_ALIASES: dict[str, str] = {
    "he": "helium",
    "he4": "helium",
    "he-4": "helium",
    "4he": "helium",
    "helium-4": "helium",
    "lhe": "helium",
    "h2": "hydrogen",
    "lh2": "hydrogen",
    "parahydrogen": "hydrogen",
    "para-hydrogen": "hydrogen",
    "p-h2": "hydrogen",
    "ne": "neon",
    "lne": "neon",
    "n2": "nitrogen",
    "ln2": "nitrogen",
    "ar": "argon",
    "lar": "argon",
    "o2": "oxygen",
    "lox": "oxygen",
    "lo2": "oxygen",
}

#: Cryogen objects already loaded in this process, by (cache dir, version, name, pressure).
_MEMO: dict[tuple[str, str, str, float], Cryogen] = {}
_VERSION: list[str] = []


def cryogen_names() -> list[str]:
    """The cryogens cryoplan knows, in order of normal boiling point.

    Examples
    --------
    >>> cryogen_names()
    ['helium', 'hydrogen', 'neon', 'nitrogen', 'argon', 'oxygen']
    """
    return list(_COOLPROP_NAMES)


def canonical_name(name: str) -> str:
    """The cryogen's name as :func:`cryogen_names` spells it, from a name or an alias.

    Raises
    ------
    UnknownNameError
        Neither a name nor an alias; the message suggests the closest names.

    Examples
    --------
    >>> canonical_name("LN2"), canonical_name("He")
    ('nitrogen', 'helium')
    """
    expected = "one of " + ", ".join(cryogen_names())
    if not isinstance(name, str):
        raise UnknownNameError(
            "cryogen", repr(name), cryogen_names(), expected=expected, found=repr(name)
        )
    key = name.strip().lower().replace("_", "-").replace(" ", "-")
    if key in _COOLPROP_NAMES:
        return key
    if key in _ALIASES:
        return _ALIASES[key]
    raise UnknownNameError("cryogen", name, cryogen_names(), expected=expected, found=repr(name))


def coolprop_version() -> str:
    """CoolProp's installed version, read from the package metadata without importing it.

    Raises
    ------
    CryoplanError
        CoolProp is not installed.

    Examples
    --------
    >>> coolprop_version() >= "6"
    True
    """
    if not _VERSION:
        from importlib.metadata import PackageNotFoundError, version

        try:
            _VERSION.append(version("CoolProp"))
        except PackageNotFoundError:
            raise CryoplanError(
                "cryoplan needs CoolProp for fluid properties; install it with "
                "'pip install CoolProp'"
            ) from None
    return _VERSION[0]


def cache_dir() -> Path:
    """The directory of the fluid tables for the installed CoolProp version.

    ``$CRYOPLAN_CACHE_DIR/fluids/coolprop-VERSION`` when that variable is set, otherwise
    under ``platformdirs.user_cache_dir("cryoplan")``.

    Examples
    --------
    >>> cache_dir().name == "coolprop-" + coolprop_version()
    True
    """
    root = os.environ.get("CRYOPLAN_CACHE_DIR")
    if not root:
        import platformdirs

        root = platformdirs.user_cache_dir("cryoplan")
    return Path(root) / "fluids" / f"coolprop-{coolprop_version()}"


def _normal_pressure(pressure) -> float:
    """The pressure as a float rounded to 6 significant figures (the cache key)."""
    if isinstance(pressure, bool) or not isinstance(
        pressure, (int, float, np.integer, np.floating)
    ):
        raise InputError(
            "a pressure must be a number in pascals",
            expected="a pressure in Pa, such as 101325.0",
            found=repr(pressure),
        )
    p = float(pressure)
    if not (math.isfinite(p) and p > 0.0):
        raise InputError(
            "a pressure must be finite and above zero",
            expected="a pressure in Pa, such as 101325.0",
            found=repr(pressure),
        )
    return float(f"{p:.6g}")


def _kpa(p: float) -> str:
    return f"{p / 1000.0:.6g} kPa"


class Cryogen:
    """Saturation and gas properties of one cryogen at one pressure, from cached tables.

    Made by :func:`cryogen`; do not build one directly. Scalars are attributes, in SI units:

    name : str
        One of :func:`cryogen_names`.
    pressure : float
        Pressure of the bath [Pa], rounded to 6 significant figures.
    boiling_point : float
        Saturation temperature at ``pressure`` [K].
    latent_heat : float
        Enthalpy of vaporisation at ``pressure``, :math:`h_v - h_l` [J/kg].
    liquid_density, vapor_density : float
        Densities of the saturated liquid and vapour [kg/m^3].
    volumetric_latent_heat : float
        Latent heat per volume of liquid, :math:`L \\rho_l` [J/m^3]; a heat load Q [W]
        boils Q / this [m^3/s] of liquid.
    triple_point, triple_pressure : float
        Lower end of the equation's two-phase range [K], [Pa] (for helium-4, the lambda
        point, where the equation of state ends).
    critical_temperature, critical_pressure : float
        Critical point [K], [Pa].
    molar_mass : float
        [kg/mol].
    coolprop_fluid : str
        The CoolProp fluid behind the data.
    source : str
        CoolProp's version and the equation of state the data come from.
    """

    def __init__(self, name: str, data: dict) -> None:
        self.name = name
        self.coolprop_fluid = data["coolprop_fluid"]
        self.coolprop_version = data["coolprop"]
        self.pressure = float(data["pressure"])
        self.boiling_point = float(data["boiling_point"])
        self.liquid_enthalpy = float(data["liquid_enthalpy"])
        self.saturated_vapor_enthalpy = float(data["vapor_enthalpy"])
        self.liquid_entropy = float(data["liquid_entropy"])
        self.saturated_vapor_entropy = float(data["vapor_entropy"])
        self.latent_heat = self.saturated_vapor_enthalpy - self.liquid_enthalpy
        self.liquid_density = float(data["liquid_density"])
        self.vapor_density = float(data["vapor_density"])
        self.volumetric_latent_heat = self.latent_heat * self.liquid_density
        self.triple_point = float(data["triple_point"])
        self.triple_pressure = float(data["triple_pressure"])
        self.critical_temperature = float(data["critical_temperature"])
        self.critical_pressure = float(data["critical_pressure"])
        self.molar_mass = float(data["molar_mass"])
        self.source = (
            f"CoolProp {self.coolprop_version} (Bell et al., Ind. Eng. Chem. Res. 53 (2014) "
            f"2498-2508); equation of state: {data['eos_reference']}"
        )
        table = data["table"]
        self._T = np.asarray(table["T"], dtype=float)
        self._x = np.log(self._T)
        self._h = np.asarray(table["h"], dtype=float)
        self._dh = np.asarray(table["dh_dlnT"], dtype=float)
        self._s = np.asarray(table["s"], dtype=float)
        self._ds = np.asarray(table["ds_dlnT"], dtype=float)
        self._lnrho = np.asarray(table["lnrho"], dtype=float)
        self._dlnrho = np.asarray(table["dlnrho_dlnT"], dtype=float)
        self.table_temperature_max = float(self._T[-1])

    def __repr__(self) -> str:
        return (
            f"<Cryogen {self.name} at {_kpa(self.pressure)}: boils at "
            f"{self.boiling_point:.4g} K, L = {self.latent_heat:.5g} J/kg>"
        )

    # ------------------------------------------------------------------ gas tables
    def _gas_x(self, temperature, what: str):
        """ln T of gas temperatures, checked against the table's range."""
        T = np.asarray(temperature, dtype=float)
        low, high = self.boiling_point, self.table_temperature_max
        bad = ~((T >= low * (1.0 - 1e-12)) & (T <= high * (1.0 + 1e-12)))
        if np.any(bad):
            found = T[bad].flat[0] if T.ndim else float(T)
            if math.isnan(found):
                reason = "not a number"
            elif found < low:
                reason = "below the boiling point: there is no gas there at this pressure"
            else:
                reason = "above the cached tables"
            raise TemperatureError(
                f"{what} of {self.name} at {_kpa(self.pressure)}: {found:g} K is {reason}; "
                f"the tables cover {low:.6g} K (boiling point) to {high:g} K"
            )
        return np.clip(np.log(T), self._x[0], self._x[-1])

    def _interpolate(self, x, y, dy):
        return _hermite(x, self._x, y, dy)

    def gas_enthalpy(self, temperature):
        """Absolute specific enthalpy of the gas at ``temperature`` and the bath pressure.

        On CoolProp's reference state for the fluid; only differences mean anything.

        Parameters
        ----------
        temperature : float or ndarray
            Gas temperature, [K], from the boiling point to :data:`T_MAX`.

        Returns
        -------
        float or ndarray
            Specific enthalpy, [J/kg].

        Examples
        --------
        >>> c = cryogen("argon")
        >>> c.gas_enthalpy(300.0) - c.gas_enthalpy(c.boiling_point) == c.vapor_enthalpy(300.0)
        True
        """
        return _same_shape(
            temperature,
            self._interpolate(self._gas_x(temperature, "gas enthalpy"), self._h, self._dh),
        )

    def gas_entropy(self, temperature):
        """Absolute specific entropy of the gas at ``temperature`` and the bath pressure.

        On CoolProp's reference state for the fluid; only differences mean anything.

        Parameters
        ----------
        temperature : float or ndarray
            Gas temperature, [K], from the boiling point to :data:`T_MAX`.

        Returns
        -------
        float or ndarray
            Specific entropy, [J/(kg K)].

        Examples
        --------
        >>> c = cryogen("argon")
        >>> c.gas_entropy(c.boiling_point) == c.saturated_vapor_entropy
        True
        """
        return _same_shape(
            temperature,
            self._interpolate(self._gas_x(temperature, "gas entropy"), self._s, self._ds),
        )

    def boiloff_gas_enthalpy(self, temperature):
        """:meth:`vapor_enthalpy` of gas leaving at ``temperature``, read as the boiling point
        where it lies below it (the gas cannot leave colder than it boiled), [J/kg].

        >>> round(float(cryogen("helium").boiloff_gas_enthalpy(1.0)), 6)
        0.0
        """
        return self.vapor_enthalpy(np.maximum(temperature, self.boiling_point))

    def vapor_enthalpy(self, temperature):
        """Enthalpy of the boil-off gas warmed at constant pressure, from the real-fluid EOS.

        .. math:: \\Delta h_v(T) = h(T, p) - h(T_b(p), p, \\text{saturated vapour})
                  = \\int_{T_b}^{T} c_p(T', p)\\, dT'

        Parameters
        ----------
        temperature : float or ndarray
            Gas temperature, [K], from the boiling point to :data:`T_MAX`.

        Returns
        -------
        float or ndarray
            Enthalpy above the saturated vapour, [J/kg]; zero at the boiling point.
            Same shape as ``temperature``.

        Raises
        ------
        TemperatureError
            A temperature below the boiling point (no gas there), above :data:`T_MAX`, or NaN.

        Notes
        -----
        Cubic Hermite interpolation in :math:`\\ln T` of a table computed with CoolProp [1]_,
        with the exact slopes :math:`T c_p`; within 1e-4 relative of CoolProp from the
        boiling point to :data:`T_MAX` (checked by the test suite).

        References
        ----------
        .. [1] I. H. Bell et al., Ind. Eng. Chem. Res. 53 (2014) 2498-2508.

        Examples
        --------
        >>> c = cryogen("nitrogen")
        >>> round(c.vapor_enthalpy(300.0) / 1000)   # kJ/kg, 77.4 K -> 300 K at 1 atm
        234
        >>> c.vapor_enthalpy(c.boiling_point)
        0.0
        """
        h = self._interpolate(self._gas_x(temperature, "vapour enthalpy"), self._h, self._dh)
        return _same_shape(temperature, h - self.saturated_vapor_enthalpy)

    def vapor_entropy(self, temperature):
        """Entropy of the boil-off gas warmed at constant pressure, above the saturated vapour.

        .. math:: \\Delta s_v(T) = s(T, p) - s_v(T_b) = \\int_{T_b}^{T} \\frac{c_p}{T'}\\, dT'

        Parameters
        ----------
        temperature : float or ndarray
            Gas temperature, [K], from the boiling point to :data:`T_MAX`.

        Returns
        -------
        float or ndarray
            [J/(kg K)]; zero at the boiling point.

        Notes
        -----
        Interpolated as :meth:`vapor_enthalpy` is, with slopes :math:`c_p`.

        Examples
        --------
        >>> round(cryogen("helium").vapor_entropy(300.0))   # J/(kg K), 4.2 K -> 300 K
        23111
        """
        s = self._interpolate(self._gas_x(temperature, "vapour entropy"), self._s, self._ds)
        return _same_shape(temperature, s - self.saturated_vapor_entropy)

    def vapor_density_at(self, temperature):
        """Density of the gas at ``temperature`` and the bath pressure, from the real-fluid EOS.

        .. math:: \\rho(T, p), \\quad \\rho \\to \\frac{p M}{R T} \\text{ as the gas warms}

        Parameters
        ----------
        temperature : float or ndarray
            Gas temperature, [K], from the boiling point to :data:`T_MAX`.

        Returns
        -------
        float or ndarray
            Gas density, [kg/m^3].

        Notes
        -----
        Cubic Hermite interpolation of :math:`\\ln\\rho` against :math:`\\ln T`, with the
        exact slopes; within 1e-4 relative of CoolProp.

        Examples
        --------
        >>> round(cryogen("helium").vapor_density_at(293.15), 4)   # kg/m^3 at 1 atm
        0.1663
        """
        lnrho = self._interpolate(
            self._gas_x(temperature, "gas density"), self._lnrho, self._dlnrho
        )
        return _same_shape(temperature, np.exp(lnrho))

    # ------------------------------------------------------------------ derived figures
    def _at_one_atmosphere(self) -> Cryogen:
        if self.pressure == ATMOSPHERE:
            return self
        return cryogen(self.name, ATMOSPHERE)

    def expansion_ratio(self, T_room=293.15):
        """Volume of gas at room temperature and 1 atm per volume of liquid in the bath.

        .. math:: r = \\frac{\\rho_l(p)}{\\rho(T_{room}, 101325\\ \\mathrm{Pa})}

        Parameters
        ----------
        T_room : float or ndarray
            Temperature of the gas, [K], from the normal boiling point to :data:`T_MAX`.

        Returns
        -------
        float or ndarray
            Volume ratio, [-].

        Notes
        -----
        The figure behind oxygen-deficiency and pressure build-up estimates. A litre of
        liquid becomes hundreds of litres of gas: in a closed volume it builds pressure, in
        a room it displaces the air. Local codes, the site's safety office and licensed
        practice decide on ventilation, relief and oxygen monitoring.

        Examples
        --------
        >>> round(cryogen("nitrogen").expansion_ratio(293.15))
        692
        """
        rho_gas = self._at_one_atmosphere().vapor_density_at(T_room)
        return _same_shape(T_room, self.liquid_density / np.asarray(rho_gas))

    def ideal_liquefaction_work(self, T_ambient=300.0):
        """Minimum (reversible) work to liquefy gas from the ambient, by the exergy balance.

        .. math:: W = T_0 [s(T_0, p_0) - s_l(p)] - [h(T_0, p_0) - h_l(p)],
                  \\quad p_0 = 101325\\ \\mathrm{Pa}

        Parameters
        ----------
        T_ambient : float or ndarray
            Temperature of the gas fed in and of the heat sink, [K].

        Returns
        -------
        float or ndarray
            Work per mass of saturated liquid at the bath pressure, [J/kg].

        Notes
        -----
        The ideal (Carnot) liquefier of the cryogenic-systems textbooks [1]_, with the
        gas fed at 1 atm and ``T_ambient`` and all heat rejected at ``T_ambient``; real
        liquefiers need several to tens of times more. Hydrogen is para-hydrogen on both
        ends: the work of the ortho-para conversion of room-temperature normal hydrogen is
        not included.

        References
        ----------
        .. [1] R. F. Barron, Cryogenic Systems, 2nd ed., Oxford University Press (1985),
           ch. 3.

        Examples
        --------
        >>> round(cryogen("nitrogen").ideal_liquefaction_work(300.0) / 1000)   # kJ/kg
        769
        """
        gas = self._at_one_atmosphere()
        T0 = np.asarray(T_ambient, dtype=float)
        s_gas = gas.gas_entropy(T0)
        h_gas = gas.gas_enthalpy(T0)
        work = T0 * (s_gas - self.liquid_entropy) - (h_gas - self.liquid_enthalpy)
        return _same_shape(T_ambient, work)


def _same_shape(template, values):
    """A float for a scalar input, otherwise an array of the input's shape."""
    values = np.asarray(values, dtype=float)
    if np.ndim(template) == 0:
        return float(values)
    return values.reshape(np.shape(template))


def _hermite(x, xs, ys, dys):
    """Cubic Hermite interpolation of ``ys`` (slopes ``dys``) on the increasing nodes ``xs``."""
    x = np.asarray(x, dtype=float)
    i = np.clip(np.searchsorted(xs, x, side="right") - 1, 0, len(xs) - 2)
    x0, x1 = xs[i], xs[i + 1]
    dx = x1 - x0
    t = (x - x0) / dx
    t2, t3 = t * t, t * t * t
    h00 = 2 * t3 - 3 * t2 + 1
    h10 = t3 - 2 * t2 + t
    h01 = -2 * t3 + 3 * t2
    h11 = t3 - t2
    return h00 * ys[i] + h10 * dx * dys[i] + h01 * ys[i + 1] + h11 * dx * dys[i + 1]


# ---------------------------------------------------------------------- the cache
def _cache_file(name: str, pressure: float) -> Path:
    return cache_dir() / f"{name}-{pressure:.6g}Pa.json"


def _valid(data, name: str, pressure: float, version: str) -> bool:
    """Whether a loaded cache file is a complete table of this cryogen, pressure and version."""
    try:
        if (
            data["format"] != CACHE_FORMAT
            or data["coolprop"] != version
            or data["fluid"] != name
            or data["coolprop_fluid"] != _COOLPROP_NAMES[name]
            or float(data["pressure"]) != pressure
        ):
            return False
        table = data["table"]
        columns = [np.asarray(table[k], dtype=float) for k in _TABLE_COLUMNS]
        n = len(columns[0])
        if n < 2 or any(c.shape != (n,) or not np.all(np.isfinite(c)) for c in columns):
            return False
        if not np.all(np.diff(columns[0]) > 0):
            return False
        scalars = [float(data[k]) for k in _SCALARS]
        if not all(math.isfinite(v) for v in scalars):
            return False
        return isinstance(data["eos_reference"], str)
    except (KeyError, TypeError, ValueError, AttributeError):
        return False


_TABLE_COLUMNS = ("T", "h", "dh_dlnT", "s", "ds_dlnT", "lnrho", "dlnrho_dlnT")
_SCALARS = (
    "boiling_point",
    "liquid_enthalpy",
    "vapor_enthalpy",
    "liquid_entropy",
    "vapor_entropy",
    "liquid_density",
    "vapor_density",
    "triple_point",
    "triple_pressure",
    "critical_temperature",
    "critical_pressure",
    "molar_mass",
)


def _read(path: Path, name: str, pressure: float, version: str) -> dict | None:
    try:
        with open(path, encoding="utf-8") as fh:
            data = json.load(fh)
    except (OSError, ValueError, UnicodeDecodeError):
        return None
    return data if _valid(data, name, pressure, version) else None


def _write(path: Path, data: dict) -> bool:
    """Write atomically (a temporary file, then a rename); False if the cache is unwritable."""
    tmp = None
    try:
        path.parent.mkdir(parents=True, exist_ok=True)
        fd, tmp = tempfile.mkstemp(prefix=path.name + ".", suffix=".tmp", dir=path.parent)
        with os.fdopen(fd, "w", encoding="utf-8") as fh:
            json.dump(data, fh, separators=(",", ":"))
        os.chmod(tmp, 0o644)
        os.replace(tmp, path)
        return True
    except OSError:
        if tmp is not None:
            try:
                os.unlink(tmp)
            except OSError:
                pass
        return False


def cryogen(name: str, pressure: float = ATMOSPHERE) -> Cryogen:
    """Properties of a cryogen boiling at ``pressure``, from CoolProp via the cache.

    .. math:: T_b = T_{sat}(p), \\quad L = h_v(p) - h_l(p)

    Parameters
    ----------
    name : str
        One of :func:`cryogen_names`, or an alias such as ``"LHe"``, ``"LN2"``, ``"N2"``,
        ``"para-hydrogen"`` (any case).
    pressure : float
        Pressure over the bath, [Pa]: 101325 for a bath open to the atmosphere, lower for
        a pumped bath, higher for a pressurised one.

    Returns
    -------
    Cryogen

    Raises
    ------
    UnknownNameError
        An unknown cryogen; the message suggests the closest names.
    InputError
        A pressure that is not a positive number, or outside the liquid-vapour range of
        the cryogen (from the triple point to the critical point).

    Notes
    -----
    The first call for a cryogen and pressure computes its tables with CoolProp [1]_ and
    writes them to :func:`cache_dir`; later calls, in any process, only read them.
    Hydrogen is para-hydrogen. Helium-4 is covered down to its lambda point (2.177 K,
    5.04 kPa), where CoolProp's equation of state ends: superfluid baths are refused.

    References
    ----------
    .. [1] I. H. Bell et al., Ind. Eng. Chem. Res. 53 (2014) 2498-2508.

    Examples
    --------
    >>> c = cryogen("LHe")
    >>> c.name, round(c.boiling_point, 3), round(c.latent_heat)
    ('helium', 4.224, 20564)
    >>> round(cryogen("nitrogen", pressure=360.4e3).boiling_point, 1)   # pressurised
    90.0
    """
    key_name = canonical_name(name)
    p = _normal_pressure(pressure)
    version = coolprop_version()
    directory = cache_dir()
    memo_key = (str(directory), version, key_name, p)
    found = _MEMO.get(memo_key)
    if found is not None:
        return found
    if p != ATMOSPHERE:
        # The 1-atm table carries the fluid's range and serves the ratios to room conditions.
        ref = cryogen(key_name, ATMOSPHERE)
        _check_pressure(key_name, p, ref.triple_pressure, ref.critical_pressure)
    path = _cache_file(key_name, p)
    data = _read(path, key_name, p, version)
    if data is None:
        data = _build(key_name, p, version)
        _write(path, data)
    made = Cryogen(key_name, data)
    _MEMO[memo_key] = made
    return made


def _check_pressure(name: str, p: float, p_low: float, p_high: float) -> None:
    if not (p_low * (1.0 - 1e-5) <= p < p_high):  # 1e-5: the key rounds to 6 figures
        low_note = (
            " (the lambda point: superfluid helium is not covered)" if name == "helium" else ""
        )
        raise InputError(
            f"{name} has no boiling liquid at {_kpa(p)}",
            key="pressure",
            expected=f"a pressure from {_kpa(p_low)}{low_note} up to the critical "
            f"pressure {_kpa(p_high)}",
            found=_kpa(p),
        )


def warm_cache(
    pressures: Iterable[float] = (ATMOSPHERE,), names: Iterable[str] | None = None
) -> list[Cryogen]:
    """Build (or load) the tables of the cryogens at the given pressures.

    Parameters
    ----------
    pressures : iterable of float
        Bath pressures, [Pa]. The 1-atm tables are always built.
    names : iterable of str, optional
        Cryogens to build; all of :func:`cryogen_names` when omitted. With names omitted,
        a pressure outside a cryogen's liquid-vapour range is skipped for that cryogen;
        with names given, it raises :class:`~cryoplan.errors.InputError`.

    Returns
    -------
    list of Cryogen
        The cryogens built or loaded, in order.

    Examples
    --------
    >>> [(c.name, c.pressure) for c in warm_cache([200e3], names=["nitrogen"])]
    [('nitrogen', 101325.0), ('nitrogen', 200000.0)]
    """
    strict = names is not None
    chosen = [canonical_name(n) for n in names] if strict else cryogen_names()
    wanted = [ATMOSPHERE] + [_normal_pressure(p) for p in pressures]
    made: list[Cryogen] = []
    for name in chosen:
        for p in dict.fromkeys(wanted):
            try:
                c = cryogen(name, p)
            except InputError:
                if strict:
                    raise
                continue
            if c not in made:
                made.append(c)
    return made


def clear_cache(files: bool = True) -> None:
    """Forget the tables loaded in this process and, with ``files``, delete the cache files.

    Only the ``fluids`` directory of the cache is removed (all CoolProp versions).

    Examples
    --------
    >>> clear_cache(files=False)   # the next cryogen() reads the files again
    """
    _MEMO.clear()
    if files:
        shutil.rmtree(cache_dir().parent, ignore_errors=True)


# ---------------------------------------------------------------------- building with CoolProp
def _coolprop():
    try:
        import CoolProp.CoolProp as CP
    except ImportError as exc:  # pragma: no cover - CoolProp is a dependency
        raise CryoplanError(
            f"cryoplan needs CoolProp to build its fluid tables ({exc}); "
            "install it with 'pip install CoolProp'"
        ) from None
    return CP


def _build(name: str, p: float, version: str) -> dict:
    """Compute the saturation scalars and the gas table of ``name`` at ``p`` with CoolProp."""
    CP = _coolprop()
    fluid = _COOLPROP_NAMES[name]
    state = CP.AbstractState("HEOS", fluid)
    p_triple = state.trivial_keyed_output(CP.iP_triple)
    p_crit = state.p_critical()
    _check_pressure(name, p, p_triple, p_crit)
    try:
        state.update(CP.PQ_INPUTS, p, 0.0)
        T_b = state.T()
        liquid = (state.hmass(), state.smass(), state.rhomass())
        state.update(CP.PQ_INPUTS, p, 1.0)
        vapour = (state.hmass(), state.smass(), state.rhomass())
        T_nodes, columns = _gas_table(CP, fluid, p, T_b, vapour)
    except ValueError as exc:  # CoolProp's solvers fail very close to the critical point
        raise InputError(
            f"CoolProp cannot compute {name} at {_kpa(p)} ({exc})",
            key="pressure",
            expected=f"a pressure further below the critical pressure {_kpa(p_crit)}",
            found=_kpa(p),
        ) from None
    table = {"T": T_nodes}
    table.update(columns)
    return {
        "format": CACHE_FORMAT,
        "coolprop": version,
        "fluid": name,
        "coolprop_fluid": fluid,
        "pressure": p,
        "boiling_point": T_b,
        "liquid_enthalpy": liquid[0],
        "liquid_entropy": liquid[1],
        "liquid_density": liquid[2],
        "vapor_enthalpy": vapour[0],
        "vapor_entropy": vapour[1],
        "vapor_density": vapour[2],
        "triple_point": state.Ttriple(),
        "triple_pressure": p_triple,
        "critical_temperature": state.T_critical(),
        "critical_pressure": p_crit,
        "molar_mass": state.molar_mass(),
        "eos_reference": _eos_reference(CP, fluid),
        "table": {k: [float(v) for v in table[k]] for k in _TABLE_COLUMNS},
    }


def _gas_table(CP, fluid: str, p: float, T_b: float, vapour) -> tuple[list, dict]:
    """Nodes in T and the gas columns, refined until Hermite midpoints match CoolProp."""
    gas = CP.AbstractState("HEOS", fluid)
    T_c = gas.T_critical()

    def point(T: float, saturated: bool = False) -> tuple:
        if T < T_c:  # below the critical temperature, say which root is wanted
            gas.specify_phase(CP.iphase_gas)
        else:
            gas.unspecify_phase()
        gas.update(CP.PT_INPUTS, p, T)
        h, s, rho = vapour if saturated else (gas.hmass(), gas.smass(), gas.rhomass())
        cp = gas.cpmass()
        drho_dT = gas.first_partial_deriv(CP.iDmass, CP.iT, CP.iP)
        return (h, T * cp, s, cp, math.log(rho), T * drho_dT / rho)

    x0, x1 = math.log(T_b), math.log(T_MAX)
    xs = list(np.linspace(x0, x1, 25))
    values = {x: point(math.exp(x), saturated=(i == 0)) for i, x in enumerate(xs)}
    h_v, s_v = vapour[0], vapour[1]
    for _ in range(30):
        xs = sorted(values)
        split = []
        for a, b in zip(xs[:-1], xs[1:], strict=True):
            m = 0.5 * (a + b)
            true = point(math.exp(m))
            va, vb = values[a], values[b]
            arr = np.array([a, b])
            h_i = _hermite(m, arr, np.array([va[0], vb[0]]), np.array([va[1], vb[1]]))
            s_i = _hermite(m, arr, np.array([va[2], vb[2]]), np.array([va[3], vb[3]]))
            r_i = _hermite(m, arr, np.array([va[4], vb[4]]), np.array([va[5], vb[5]]))
            err = max(
                abs(h_i - true[0]) / max(abs(true[0] - h_v), 1e-300),
                abs(s_i - true[2]) / max(abs(true[2] - s_v), 1e-300),
                abs(r_i - true[4]),
            )
            if err > INTERPOLATION_TOLERANCE:
                split.append((m, true))
        if not split:
            break
        values.update(split)
    xs = sorted(values)
    rows = [values[x] for x in xs]
    T_nodes = [T_b] + [math.exp(x) for x in xs[1:-1]] + [T_MAX]
    columns = {
        "h": [r[0] for r in rows],
        "dh_dlnT": [r[1] for r in rows],
        "s": [r[2] for r in rows],
        "ds_dlnT": [r[3] for r in rows],
        "lnrho": [r[4] for r in rows],
        "dlnrho_dlnT": [r[5] for r in rows],
    }
    return T_nodes, columns


def _eos_reference(CP, fluid: str) -> str:
    """A short citation of the fluid's equation of state, from CoolProp's BibTeX keys."""
    try:
        keys = CP.get_BibTeXKey(fluid, "EOS")
    except Exception:  # pragma: no cover - an older CoolProp
        return f"the CoolProp reference equation of state for {fluid}"
    entries = _bibtex_entries(CP)
    parts = []
    for key in [k.strip() for k in keys.split(",") if k.strip()]:
        fields = entries.get(key)
        parts.append(f"{_citation(fields)} [{key}]" if fields else key)
    return "; ".join(parts)


def _bibtex_entries(CP) -> dict[str, dict[str, str]]:
    """Entries of CoolProp's own BibTeX library (shipped beside its module), by key."""
    path = Path(CP.__file__).with_name("CoolPropBibTeXLibrary.bib")
    try:
        text = path.read_text(encoding="utf-8", errors="replace")
    except OSError:
        return {}
    entries: dict[str, dict[str, str]] = {}
    for match in re.finditer(r"@\w+\{([^,\s]+),(.*?)\n\}", text, flags=re.S):
        fields = {}
        for f in re.finditer(r"(\w+)\s*=\s*\{(.*?)\},?\s*$", match.group(2), flags=re.M):
            fields[f.group(1).lower()] = re.sub(r"[{}]", "", f.group(2)).strip()
        entries[match.group(1)] = fields
    return entries


def _citation(fields: dict[str, str]) -> str:
    """'Span et al., J. Phys. Chem. Ref. Data 29 (2000) 1361-1433' from BibTeX fields."""
    authors = [a.strip() for a in fields.get("author", "").split(" and ") if a.strip()]

    def surname(a: str) -> str:
        return a.split(",")[0].strip() if "," in a else a.split()[-1]

    if not authors:
        who = "anonymous"
    elif len(authors) == 1:
        who = surname(authors[0])
    elif len(authors) == 2:
        who = f"{surname(authors[0])} and {surname(authors[1])}"
    else:
        who = f"{surname(authors[0])} et al."
    year = fields.get("year", "").split(",")[0].strip()
    journal = fields.get("journal")
    if journal:
        where = journal
        if fields.get("volume"):
            where += f" {fields['volume']}"
        where += f" ({year})" if year else ""
        if fields.get("pages"):
            where += f" {fields['pages']}"
        return f"{who}, {where}"
    title = fields.get("title", "")
    return f"{who}, {title} ({fields.get('note', 'unpublished').split(' - ')[0]}, {year})"
