"""One cryogen at one pressure: the :class:`Cryogen` read from its tables, and the names of
the cryogens with the one resolver of their spellings (:func:`resolve_cryogen_name`).

Nothing here imports CoolProp or reads a file: the tables come from
:mod:`cryoplan.data.fluid_cache` or :mod:`cryoplan.data.fluid_build`, and
:func:`cryoplan.data.fluids.cryogen` puts them together.
"""

from __future__ import annotations

import math

import numpy as np

from ..errors import InputError, TemperatureError, UnknownNameError

#: Standard atmosphere [Pa] (a defined value).
ATMOSPHERE = 101325.0

#: Upper end of the cached gas tables [K]: room temperature with a margin.
T_MAX = 350.0


#: The cryogens, in order of boiling point, and the CoolProp fluid behind each.
COOLPROP_NAMES: dict[str, str] = {
    "helium": "Helium",
    "hydrogen": "ParaHydrogen",
    "neon": "Neon",
    "nitrogen": "Nitrogen",
    "argon": "Argon",
    "oxygen": "Oxygen",
}

#: Other spellings users write (compared in lower case).
CRYOGEN_ALIASES: dict[str, str] = {
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


TABLE_COLUMNS = ("T", "h", "dh_dlnT", "s", "ds_dlnT", "lnrho", "dlnrho_dlnT")
SCALARS = (
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


def cryogen_names() -> list[str]:
    """The cryogens cryoplan knows, in order of normal boiling point.

    Examples
    --------

    >>> cryogen_names()
    ['helium', 'hydrogen', 'neon', 'nitrogen', 'argon', 'oxygen']
    """
    return list(COOLPROP_NAMES)


def resolve_cryogen_name(name, **where) -> str:
    """The cryogen's canonical id, as :func:`cryogen_names` spells it, from a name or alias.

    The one resolver of cryogen names: the fluid layer, the plan reader and the commands
    all ask it, so that every spelling :func:`cryoplan.cryogen` accepts is accepted
    everywhere. Names are compared in lower case, with ``_`` and spaces read as ``-``.

    Parameters
    ----------
    name : str
        A name of :func:`cryogen_names` or an alias of :data:`CRYOGEN_ALIASES`, such as
        ``"LN2"``, ``"He"`` or ``"para-hydrogen"`` (any case).
    **where
        ``file``, ``line`` and ``key`` for the error message.

    Returns
    -------
    str
        One of :func:`cryogen_names`.

    Raises
    ------
    UnknownNameError
        Neither a name nor an alias (or not text); the message suggests the closest names.

    Examples
    --------

    >>> resolve_cryogen_name("LN2"), resolve_cryogen_name("He")
    ('nitrogen', 'helium')
    >>> try:
    ...     resolve_cryogen_name("helum", key="bath[0].cryogen")
    ... except UnknownNameError as exc:
    ...     print(exc.suggestions)
    ['helium']
    """
    names = cryogen_names()
    expected = "one of " + ", ".join(names)
    if not isinstance(name, str):
        raise UnknownNameError(
            "cryogen", repr(name), names, expected=expected, found=repr(name), **where
        )
    key = name.strip().lower().replace("_", "-").replace(" ", "-")
    if key in COOLPROP_NAMES:
        return key
    if key in CRYOGEN_ALIASES:
        return CRYOGEN_ALIASES[key]
    raise UnknownNameError("cryogen", name, names, expected=expected, found=repr(name), **where)


def normal_pressure(pressure) -> float:
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


def kpa(p: float) -> str:
    return f"{p / 1000.0:.6g} kPa"


def check_pressure(name: str, p: float, p_low: float, p_high: float) -> None:
    if not (p_low * (1.0 - 1e-5) <= p < p_high):  # 1e-5: the key rounds to 6 figures
        low_note = (
            " (the lambda point: superfluid helium is not covered)" if name == "helium" else ""
        )
        raise InputError(
            f"{name} has no boiling liquid at {kpa(p)}",
            key="pressure",
            expected=f"a pressure from {kpa(p_low)}{low_note} up to the critical "
            f"pressure {kpa(p_high)}",
            found=kpa(p),
        )


class Cryogen:
    """Saturation and gas properties of one cryogen at one pressure, from cached tables.

    Made by :func:`cryoplan.data.fluids.cryogen`; do not build one directly. Scalars are attributes, in SI units:

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

    def __init__(self, name: str, data: dict, atmosphere: Cryogen | None = None) -> None:
        self.name = name
        #: The same cryogen at 1 atm (None: this one), for the ratios to room conditions.
        self._atmosphere = atmosphere
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
            f"<Cryogen {self.name} at {kpa(self.pressure)}: boils at "
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
                f"{what} of {self.name} at {kpa(self.pressure)}: {found:g} K is {reason}; "
                f"the tables cover {low:.6g} K (boiling point) to {high:g} K"
            )
        return np.clip(np.log(T), self._x[0], self._x[-1])

    def _interpolate(self, x, y, dy):
        return hermite(x, self._x, y, dy)

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

        >>> from cryoplan.data.fluids import cryogen
        >>> c = cryogen("argon")
        >>> c.gas_enthalpy(300.0) - c.gas_enthalpy(c.boiling_point) == c.vapor_enthalpy(300.0)
        True
        """
        return same_shape(
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

        >>> from cryoplan.data.fluids import cryogen
        >>> c = cryogen("argon")
        >>> c.gas_entropy(c.boiling_point) == c.saturated_vapor_entropy
        True
        """
        return same_shape(
            temperature,
            self._interpolate(self._gas_x(temperature, "gas entropy"), self._s, self._ds),
        )

    def boiloff_gas_enthalpy(self, temperature):
        """:meth:`vapor_enthalpy` of gas leaving at ``temperature``, read as the boiling point
        where it lies below it (the gas cannot leave colder than it boiled), [J/kg].

        >>> from cryoplan.data.fluids import cryogen
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

        >>> from cryoplan.data.fluids import cryogen
        >>> c = cryogen("nitrogen")
        >>> round(c.vapor_enthalpy(300.0) / 1000)   # kJ/kg, 77.4 K -> 300 K at 1 atm
        234
        >>> c.vapor_enthalpy(c.boiling_point)
        0.0
        """
        h = self._interpolate(self._gas_x(temperature, "vapour enthalpy"), self._h, self._dh)
        return same_shape(temperature, h - self.saturated_vapor_enthalpy)

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

        >>> from cryoplan.data.fluids import cryogen
        >>> round(cryogen("helium").vapor_entropy(300.0))   # J/(kg K), 4.2 K -> 300 K
        23111
        """
        s = self._interpolate(self._gas_x(temperature, "vapour entropy"), self._s, self._ds)
        return same_shape(temperature, s - self.saturated_vapor_entropy)

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

        >>> from cryoplan.data.fluids import cryogen
        >>> round(cryogen("helium").vapor_density_at(293.15), 4)   # kg/m^3 at 1 atm
        0.1663
        """
        lnrho = self._interpolate(
            self._gas_x(temperature, "gas density"), self._lnrho, self._dlnrho
        )
        return same_shape(temperature, np.exp(lnrho))

    # ------------------------------------------------------------------ derived figures
    def _at_one_atmosphere(self) -> Cryogen:
        return self if self._atmosphere is None else self._atmosphere

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

        >>> from cryoplan.data.fluids import cryogen
        >>> round(cryogen("nitrogen").expansion_ratio(293.15))
        692
        """
        rho_gas = self._at_one_atmosphere().vapor_density_at(T_room)
        return same_shape(T_room, self.liquid_density / np.asarray(rho_gas))

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

        >>> from cryoplan.data.fluids import cryogen
        >>> round(cryogen("nitrogen").ideal_liquefaction_work(300.0) / 1000)   # kJ/kg
        769
        """
        gas = self._at_one_atmosphere()
        T0 = np.asarray(T_ambient, dtype=float)
        s_gas = gas.gas_entropy(T0)
        h_gas = gas.gas_enthalpy(T0)
        work = T0 * (s_gas - self.liquid_entropy) - (h_gas - self.liquid_enthalpy)
        return same_shape(T_ambient, work)


def same_shape(template, values):
    """A float for a scalar input, otherwise an array of the input's shape."""
    values = np.asarray(values, dtype=float)
    if np.ndim(template) == 0:
        return float(values)
    return values.reshape(np.shape(template))


def hermite(x, xs, ys, dys):
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
