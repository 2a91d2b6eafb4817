"""Paramagnetic salts below 1 K: the Brillouin model with an internal field, and demagnetization.

Pure physics: SI floats and numpy arrays in and out (tesla, kelvin, joules, moles, seconds),
every function vectorised with numpy broadcasting. A salt's magnetic ions are 2J+1 levels
split by the effective field

.. math:: B_\\mathrm{eff} = \\sqrt{B^2 + b^2},

where B is the applied field and b the internal (interaction) field that stands for the
ions' mutual interactions and their crystal-field splittings (the model of the textbooks:
Pobell [1]_, chapter 9; Lounasmaa [2]_, chapter 1). With the level spacing reduced by the
thermal energy,

.. math:: y = \\frac{g \\mu_B B_\\mathrm{eff}}{k_B T},

every molar quantity of the spins depends on y alone (the Brillouin argument of the
textbooks is x = J y). The formulas are written in the variable u = exp(-y) with ``expm1``
and ``log1p``, so that y from 0 to beyond 10^300 (millikelvin and teslas) gives neither
overflow nor NaN, and S and C keep full accuracy at small y through their series.

Arguments that cannot be physical (a field, spin or g-factor below zero, an amount or a
power that is not positive) raise :class:`cryoplan.physics.errors.InputError`; a
temperature below 0 K or not a number raises
:class:`cryoplan.physics.errors.TemperatureError`.

References
----------
.. [1] F. Pobell, "Matter and Methods at Low Temperatures", 3rd ed., Springer (2007),
   chapter 9 (electronic magnetic refrigeration), sections 9.1 to 9.3.
.. [2] O. V. Lounasmaa, "Experimental Principles and Methods Below 1 K", Academic Press
   (1974), chapter 1 (adiabatic demagnetization of paramagnetic salts).
.. [3] R. K. Pathria, P. D. Beale, "Statistical Mechanics", 3rd ed., Elsevier (2011),
   section 3.9 (paramagnetism; the Brillouin function).
"""

from __future__ import annotations

from functools import lru_cache
from types import SimpleNamespace

import numpy as np

from .errors import InputError, TemperatureError

__all__ = [
    "effective_field",
    "level_spacing_ratio",
    "brillouin_argument",
    "spin_entropy_limit",
    "entropy",
    "heat_capacity",
    "magnetization",
    "entropy_fraction_removed",
    "schottky_heat_capacity",
    "schottky_entropy",
    "isentropic_temperature",
    "demagnetization_temperature",
    "ideal_demagnetization_temperature",
    "isentropic_field",
    "magnetization_heat",
    "hold_time",
]

#: Below this level-spacing ratio y the series of S, C and <m> in y are used (their first
#: neglected terms are of relative order y^4 ~ 1e-12; the closed forms lose about
#: eps / y^2 there through cancellation).
_SMALL_Y = 1e-3
#: y is capped here: exp(-y) is already 0 in double precision far below it, and the cap
#: keeps y * 0 from becoming inf * 0 = NaN at T = 0.
_Y_CAP = 1e300
#: Bisection steps of the isentrope inversions: each halves a bracket in log space of
#: width below ln(1e12 * 800) ~ 34, so 90 steps reach the resolution of a double.
_BISECTION_STEPS = 90


@lru_cache(maxsize=1)
def _constants() -> SimpleNamespace:
    """CODATA constants from scipy.constants, imported on first use (keeps start-up fast)."""
    from scipy import constants as c

    return SimpleNamespace(
        k=c.k,
        R=c.R,
        N_A=c.N_A,
        mu_B=c.physical_constants["Bohr magneton"][0],
    )


# --------------------------------------------------------------------------------------
# Checks of the arguments
# --------------------------------------------------------------------------------------


def _field(name: str, value) -> np.ndarray:
    b = np.asarray(value, dtype=float)
    if np.any(np.isnan(b)) or np.any(b < 0):
        raise InputError(
            f"{name}: a magnetic field below zero or not a number",
            expected="a field of 0 T or more (its direction does not matter here)",
            found=repr(value),
        )
    return b


def _temperature(name: str, value) -> np.ndarray:
    t = np.asarray(value, dtype=float)
    if np.any(np.isnan(t)) or np.any(t < 0):
        raise TemperatureError(
            f"{name}: a temperature below 0 K or not a number ({value!r}); temperatures "
            "are in kelvin"
        )
    return t


def _spin(spin, g_factor) -> tuple[np.ndarray, np.ndarray]:
    j = np.asarray(spin, dtype=float)
    g = np.asarray(g_factor, dtype=float)
    if np.any(np.isnan(j)) or np.any(j <= 0) or np.any(np.abs(2 * j - np.round(2 * j)) > 1e-9):
        raise InputError(
            "spin: not a positive half-integer", expected="J = 1/2, 1, 3/2, ...", found=repr(spin)
        )
    if np.any(np.isnan(g)) or np.any(g <= 0):
        raise InputError("g_factor: not a positive number", expected="g > 0", found=repr(g_factor))
    return j, g


def _positive(name: str, value, what: str) -> np.ndarray:
    v = np.asarray(value, dtype=float)
    if np.any(np.isnan(v)) or np.any(v <= 0):
        raise InputError(
            f"{name}: not a positive {what}", expected=f"{what} > 0", found=repr(value)
        )
    return v


def _scalar(a: np.ndarray):
    return float(a) if np.ndim(a) == 0 else a


# --------------------------------------------------------------------------------------
# The reduced variable and the closed forms in it
# --------------------------------------------------------------------------------------


def effective_field(field, internal_field):
    """Effective field of the Brillouin model with an internal field, sqrt(B^2 + b^2).

    .. math:: B_\\mathrm{eff} = \\sqrt{B^2 + b^2}

    Parameters
    ----------
    field : float or ndarray
        Applied field B, [T].
    internal_field : float or ndarray
        Internal (interaction) field b, [T].

    Returns
    -------
    float or ndarray
        B_eff, [T].

    References
    ----------
    .. [1] Pobell (2007), section 9.2, eq. for the entropy with an internal field.

    Examples
    --------
    >>> effective_field(0.3, 0.4)
    0.5
    """
    b = _field("field", field)
    bi = _field("internal_field", internal_field)
    return _scalar(np.hypot(b, bi))


def level_spacing_ratio(field, temperature, g_factor, internal_field=0.0):
    """Level spacing over the thermal energy, y = g muB B_eff / (k T), of a Brillouin spin.

    .. math:: y = \\frac{g \\mu_B \\sqrt{B^2 + b^2}}{k_B T}

    Parameters
    ----------
    field : float or ndarray
        Applied field B, [T].
    temperature : float or ndarray
        Temperature, [K]; 0 K gives a very large y (the cap of the module).
    g_factor : float
        Landé g-factor of the ion, [-].
    internal_field : float, optional
        Internal field b, [T].

    Returns
    -------
    float or ndarray
        y, [-], capped at 1e300.

    Notes
    -----
    Where B_eff and T are both zero the ratio is taken as 0 (the free-spin limit).

    References
    ----------
    .. [1] Pathria and Beale (2011), section 3.9.

    Examples
    --------
    >>> round(level_spacing_ratio(1.0, 1.0, 2.0), 4)   # 2 muB (1 T) / k (1 K)
    1.3434
    """
    c = _constants()
    b = _field("field", field)
    bi = _field("internal_field", internal_field)
    t = _temperature("temperature", temperature)
    g = np.asarray(g_factor, dtype=float)
    return _scalar(_y(b, t, g, bi, c))


def _y(b, t, g, bi, c) -> np.ndarray:
    energy = g * c.mu_B * np.hypot(b, bi)  # level spacing, [J]
    thermal = c.k * t
    with np.errstate(divide="ignore", invalid="ignore"):
        y = np.where(thermal > 0, energy / np.where(thermal > 0, thermal, 1.0), np.inf)
    y = np.where((thermal == 0) & (energy == 0), 0.0, y)
    return np.minimum(y, _Y_CAP)


def _log1mexp(y: np.ndarray) -> np.ndarray:
    """ln(1 - e^-y) for y > 0 to full relative accuracy (expm1 below ln 2, log1p above)."""
    near = y < np.log(2.0)
    return np.where(
        near,
        np.log(-np.expm1(-np.where(near, y, 1.0))),
        np.log1p(-np.exp(-np.where(near, 1.0, y))),
    )


def _entropy_over_r(y: np.ndarray, j: np.ndarray) -> np.ndarray:
    """S/R of 2J+1 equally spaced levels at spacing ratio y (exact, overflow-safe)."""
    n = 2 * j + 1
    small = y < _SMALL_Y
    ys = np.where(small, 1.0, y)  # the closed forms away from y = 0
    y = np.where(small, y, 0.0)  # the series only where it is used
    u = np.exp(-ys)
    # ln Z' = ln[(1 - u^n) / (1 - u)], Z' = Z exp(-J y) the sum over k = J - m of u^k
    ln_z = _log1mexp(n * ys) - _log1mexp(ys)
    # <k> = u / (1 - u) - n u^n / (1 - u^n)
    mean_k = u / -np.expm1(-ys) - n * np.exp(-n * ys) / -np.expm1(-n * ys)
    closed = ln_z + np.where(mean_k > 0, ys * mean_k, 0.0)
    a = j * (j + 1) / 6.0
    b4 = j * (j + 1) * (2 * j * j + 2 * j + 1) / 360.0
    series = np.log(n) - a * y**2 + 3 * b4 * y**4
    return np.clip(np.where(small, series, closed), 0.0, np.log(n))


def _heat_capacity_over_r(y: np.ndarray, j: np.ndarray) -> np.ndarray:
    """C/R of 2J+1 equally spaced levels: y^2 Var(m) (exact, overflow-safe)."""
    n = 2 * j + 1
    small = y < _SMALL_Y
    ys = np.where(small, 1.0, y)  # the closed forms away from y = 0
    y = np.where(small, y, 0.0)  # the series only where it is used

    def a_over_sinh(a):  # a / sinh(a) = 2 a e^-a / (1 - e^-2a), safe for large a
        return 2 * a * np.exp(-a) / -np.expm1(-2 * a)

    closed = a_over_sinh(ys / 2) ** 2 - a_over_sinh(n * ys / 2) ** 2
    series = j * (j + 1) / 3.0 * y**2 - j * (j + 1) * (2 * j * j + 2 * j + 1) / 30.0 * y**4
    return np.maximum(np.where(small, series, closed), 0.0)


def _mean_m(y: np.ndarray, j: np.ndarray) -> np.ndarray:
    """<m> along B_eff, from J (saturation) down to 0 (no field), overflow-safe."""
    n = 2 * j + 1
    small = y < _SMALL_Y
    ys = np.where(small, 1.0, y)  # the closed forms away from y = 0
    y = np.where(small, y, 0.0)  # the series only where it is used
    mean_k = np.exp(-ys) / -np.expm1(-ys) - n * np.exp(-n * ys) / -np.expm1(-n * ys)
    closed = j - mean_k
    series = j * (j + 1) / 3.0 * y - j * (j + 1) * (2 * j * j + 2 * j + 1) / 90.0 * y**3
    return np.clip(np.where(small, series, closed), 0.0, j)


# --------------------------------------------------------------------------------------
# Public state functions
# --------------------------------------------------------------------------------------


def brillouin_argument(field, temperature, spin, g_factor, internal_field=0.0):
    """The argument x = g J muB B_eff / (k T) of the Brillouin function.

    .. math:: x = \\frac{g J \\mu_B \\sqrt{B^2 + b^2}}{k_B T}

    Parameters
    ----------
    field : float or ndarray
        Applied field B, [T].
    temperature : float or ndarray
        Temperature, [K].
    spin : float
        Spin J of the ion (half-integer), [-].
    g_factor : float
        g-factor, [-].
    internal_field : float, optional
        Internal field b, [T].

    Returns
    -------
    float or ndarray
        x, [-]. Below about 1 a field removes only a small share of the spin entropy.

    References
    ----------
    .. [1] Pathria and Beale (2011), section 3.9.

    Examples
    --------
    >>> round(brillouin_argument(1.0, 1.0, 2.5, 2.0), 3)
    3.359
    """
    j, _ = _spin(spin, g_factor)
    return _scalar(
        j * np.asarray(level_spacing_ratio(field, temperature, g_factor, internal_field))
    )


def spin_entropy_limit(spin):
    """Molar spin entropy of free spins, R ln(2J+1) [J/(K mol)].

    .. math:: S_\\infty = R \\ln(2J + 1)

    Parameters
    ----------
    spin : float or ndarray
        Spin J, [-].

    Returns
    -------
    float or ndarray
        [J/(K mol of magnetic ions)].

    References
    ----------
    .. [1] Pobell (2007), section 9.1.

    Examples
    --------
    >>> round(spin_entropy_limit(0.5) / 8.314462618, 6)   # ln 2
    0.693147
    """
    j, _ = _spin(spin, 2.0)
    return _scalar(_constants().R * np.log(2 * j + 1))


def entropy(field, temperature, spin, g_factor, internal_field=0.0, lattice=0.0):
    """Molar entropy of a paramagnet, 2J+1 levels in B_eff = sqrt(B^2 + b^2), plus a T^3 lattice.

    .. math::

        \\frac{S}{R} = \\ln\\frac{\\sinh[(2J+1)y/2]}{\\sinh(y/2)}
                       - y\\,\\langle m \\rangle + \\frac{a T^3}{3R},
        \\qquad y = \\frac{g\\mu_B B_\\mathrm{eff}}{k_B T}

    written as S/R = ln[(1 - u^{2J+1})/(1 - u)] + y <k> with u = e^{-y} and <k> = J - <m>.

    Parameters
    ----------
    field : float or ndarray
        Applied field B, [T]; broadcasts against ``temperature``.
    temperature : float or ndarray
        Temperature T, [K].
    spin : float
        Spin J of the magnetic ion, [-].
    g_factor : float
        g-factor, [-].
    internal_field : float, optional
        Internal field b, [T].
    lattice : float, optional
        Lattice coefficient a of C_lattice = a T^3, [J/(K^4 mol of magnetic ions)].

    Returns
    -------
    float or ndarray
        S(B, T), [J/(K mol of magnetic ions)]: from 0 at T = 0 (third law) to R ln(2J+1)
        at zero field and high temperature (plus the lattice's a T^3 / 3).

    Notes
    -----
    The model holds above the salt's ordering temperature, where the interactions act as
    the single field b; near and below it the real entropy falls off differently (Pobell
    [1]_, section 9.3).

    References
    ----------
    .. [1] Pobell (2007), sections 9.1 and 9.2.
    .. [2] Pathria and Beale (2011), section 3.9.

    Examples
    --------
    >>> round(entropy(0.0, 10.0, 2.5, 2.0) / 8.314462618, 4)   # ln 6 = 1.7918
    1.7918
    >>> float(entropy(5.0, 0.001, 2.5, 2.0, 0.05))
    0.0
    """
    c = _constants()
    b = _field("field", field)
    t = _temperature("temperature", temperature)
    j, g = _spin(spin, g_factor)
    bi = _field("internal_field", internal_field)
    s = c.R * _entropy_over_r(_y(b, t, g, bi, c), j)
    if np.any(np.asarray(lattice) != 0):
        s = s + np.asarray(lattice, dtype=float) * t**3 / 3.0
    return _scalar(s)


def heat_capacity(field, temperature, spin, g_factor, internal_field=0.0, lattice=0.0):
    """Molar heat capacity at constant field of a Brillouin paramagnet, plus a T^3 lattice.

    .. math::

        \\frac{C_B}{R} = y^2 \\mathrm{Var}(m)
          = \\left[\\frac{y/2}{\\sinh(y/2)}\\right]^2
          - \\left[\\frac{(2J+1)y/2}{\\sinh((2J+1)y/2)}\\right]^2 + \\frac{a T^3}{R}

    Parameters
    ----------
    field : float or ndarray
        Applied field B, [T].
    temperature : float or ndarray
        Temperature, [K].
    spin : float
        Spin J, [-].
    g_factor : float
        g-factor, [-].
    internal_field : float, optional
        Internal field b, [T].
    lattice : float, optional
        Lattice coefficient a, [J/(K^4 mol)].

    Returns
    -------
    float or ndarray
        C_B, [J/(K mol of magnetic ions)], never negative.

    Notes
    -----
    At high temperature C_B T^2 / R tends to J(J+1) g^2 muB^2 B_eff^2 / (3 k^2): the
    "specific-heat tail" from which b is measured (Pobell [1]_, eq. 9.14). For J = 1/2 the
    formula is the two-level Schottky anomaly.

    References
    ----------
    .. [1] Pobell (2007), section 9.2.

    Examples
    --------
    >>> c = heat_capacity(0.0, 0.4168 * 2 * 9.2740100783e-24 * 1.0 / 1.380649e-23, 0.5, 2.0, 1.0)
    >>> round(c / 8.314462618, 4)   # the two-level peak, 0.4392 R
    0.4392
    """
    c = _constants()
    b = _field("field", field)
    t = _temperature("temperature", temperature)
    j, g = _spin(spin, g_factor)
    bi = _field("internal_field", internal_field)
    heat = c.R * _heat_capacity_over_r(_y(b, t, g, bi, c), j)
    if np.any(np.asarray(lattice) != 0):
        heat = heat + np.asarray(lattice, dtype=float) * t**3
    return _scalar(heat)


def magnetization(field, temperature, spin, g_factor, internal_field=0.0):
    """Molar magnetic moment along the applied field of a Brillouin paramagnet.

    .. math::

        M = N_A g \\mu_B \\langle m \\rangle \\frac{B}{B_\\mathrm{eff}},
        \\qquad \\langle m \\rangle = J\\,B_J(J y)

    Parameters
    ----------
    field : float or ndarray
        Applied field B, [T].
    temperature : float or ndarray
        Temperature, [K].
    spin : float
        Spin J, [-].
    g_factor : float
        g-factor, [-].
    internal_field : float, optional
        Internal field b, [T].

    Returns
    -------
    float or ndarray
        M, [A m^2 per mol of magnetic ions] (= J/(T mol)); saturates at N_A g J muB.

    Notes
    -----
    The projection B / B_eff is what makes the model thermodynamically consistent: with it
    (dS/dB)_T = (dM/dT)_B holds (a Maxwell relation, checked in the tests).

    References
    ----------
    .. [1] Pathria and Beale (2011), section 3.9.
    .. [2] Pobell (2007), section 9.2.

    Examples
    --------
    >>> sat = 6.02214076e23 * 2.0 * 2.5 * 9.2740100783e-24
    >>> round(magnetization(10.0, 0.01, 2.5, 2.0, 0.0) / sat, 6)
    1.0
    """
    c = _constants()
    b = _field("field", field)
    t = _temperature("temperature", temperature)
    j, g = _spin(spin, g_factor)
    bi = _field("internal_field", internal_field)
    beff = np.hypot(b, bi)
    with np.errstate(divide="ignore", invalid="ignore"):
        share = np.where(beff > 0, b / np.where(beff > 0, beff, 1.0), 0.0)
    return _scalar(c.N_A * g * c.mu_B * _mean_m(_y(b, t, g, bi, c), j) * share)


def entropy_fraction_removed(field, temperature, spin, g_factor, internal_field=0.0):
    """Share of the zero-field spin entropy that a field removes at a temperature.

    .. math:: f = \\frac{S(0, T) - S(B, T)}{S(0, T)}

    Parameters
    ----------
    field : float or ndarray
        Applied field B, [T].
    temperature : float or ndarray
        Temperature, [K].
    spin, g_factor, internal_field
        As in :func:`entropy`.

    Returns
    -------
    float or ndarray
        f in [0, 1], [-] (0 where S(0, T) is itself 0).

    References
    ----------
    .. [1] Pobell (2007), section 9.2.

    Examples
    --------
    >>> round(entropy_fraction_removed(1.0, 1.0, 2.5, 2.0, 0.05), 2)
    0.57
    """
    s0 = np.asarray(entropy(0.0, temperature, spin, g_factor, internal_field))
    sb = np.asarray(entropy(field, temperature, spin, g_factor, internal_field))
    with np.errstate(divide="ignore", invalid="ignore"):
        f = np.where(s0 > 0, (s0 - sb) / np.where(s0 > 0, s0, 1.0), 0.0)
    return _scalar(np.clip(f, 0.0, 1.0))


# --------------------------------------------------------------------------------------
# The two-level (Schottky) system, the check of the Brillouin forms at J = 1/2
# --------------------------------------------------------------------------------------


def schottky_heat_capacity(gap, temperature):
    """Molar heat capacity of a two-level system with equal degeneracies (Schottky anomaly).

    .. math::

        \\frac{C}{R} = \\left(\\frac{\\Delta}{k_B T}\\right)^2
          \\frac{e^{\\Delta/k_B T}}{(1 + e^{\\Delta/k_B T})^2}
          = \\left[\\frac{\\Delta/2k_BT}{\\cosh(\\Delta/2k_BT)}\\right]^2

    Parameters
    ----------
    gap : float or ndarray
        Level splitting Delta, [J].
    temperature : float or ndarray
        Temperature, [K].

    Returns
    -------
    float or ndarray
        C, [J/(K mol)]; its maximum is 0.4392 R at k T / Delta = 0.4168.

    References
    ----------
    .. [1] C. Kittel, H. Kroemer, "Thermal Physics", 2nd ed., Freeman (1980), chapter 3,
       problem 3.3 (the two-state system); the peak values are those of the exact
       maximum of x^2 e^x / (1 + e^x)^2.

    Examples
    --------
    >>> round(schottky_heat_capacity(1.380649e-23, 0.4168) / 8.314462618, 4)
    0.4392
    """
    c = _constants()
    d = np.asarray(gap, dtype=float)
    t = _temperature("temperature", temperature)
    with np.errstate(divide="ignore", invalid="ignore"):
        x = np.where(t > 0, d / (2 * c.k * np.where(t > 0, t, 1.0)), np.inf)
    x = np.minimum(np.abs(x), _Y_CAP)
    # x / cosh(x) = 2 x e^-x / (1 + e^-2x)
    return _scalar(c.R * (2 * x * np.exp(-x) / (1 + np.exp(-2 * x))) ** 2)


def schottky_entropy(gap, temperature):
    """Molar entropy of a two-level system with equal degeneracies.

    .. math:: \\frac{S}{R} = \\ln(1 + e^{-x}) + \\frac{x}{1 + e^{x}}, \\qquad x = \\Delta / k_B T

    Parameters
    ----------
    gap : float or ndarray
        Level splitting Delta, [J].
    temperature : float or ndarray
        Temperature, [K].

    Returns
    -------
    float or ndarray
        S, [J/(K mol)], from 0 to R ln 2.

    References
    ----------
    .. [1] Kittel and Kroemer (1980), chapter 3.

    Examples
    --------
    >>> round(schottky_entropy(0.0, 1.0) / 8.314462618, 6)
    0.693147
    """
    c = _constants()
    d = np.asarray(gap, dtype=float)
    t = _temperature("temperature", temperature)
    with np.errstate(divide="ignore", invalid="ignore"):
        x = np.where(t > 0, d / (c.k * np.where(t > 0, t, 1.0)), np.inf)
    x = np.minimum(np.abs(x), _Y_CAP)
    e = np.exp(-x)
    return _scalar(c.R * (np.log1p(e) + x * e / (1 + e)))


# --------------------------------------------------------------------------------------
# Isentropes and the demagnetization cycle
# --------------------------------------------------------------------------------------


def isentropic_temperature(entropy_target, field, spin, g_factor, internal_field=0.0, lattice=0.0):
    """Temperature at which a paramagnet has a given molar entropy in a given field.

    Solves S(B, T) = S_target for T by bisection in ln T, vectorised over broadcast inputs.

    .. math:: S(B, T_f) = S_\\mathrm{target}

    Parameters
    ----------
    entropy_target : float or ndarray
        Molar entropy, [J/(K mol of magnetic ions)].
    field : float or ndarray
        Applied field B, [T].
    spin, g_factor, internal_field, lattice
        As in :func:`entropy`.

    Returns
    -------
    float or ndarray
        T, [K]; 0 where the target is 0 or where B_eff = 0 (a free spin at zero field
        keeps R ln(2J+1) at any temperature, so its isentrope ends at 0 K).

    Raises
    ------
    InputError
        A target below zero, or without a lattice term at or above R ln(2J+1) (no
        temperature reaches it).

    Notes
    -----
    Without a lattice term S depends on B_eff / T alone, and the result is the closed
    form of :func:`ideal_demagnetization_temperature` (to the resolution of a double).

    References
    ----------
    .. [1] Pobell (2007), section 9.2.

    Examples
    --------
    >>> s = entropy(1.0, 1.0, 2.5, 2.0, 0.05)
    >>> round(isentropic_temperature(s, 0.0, 2.5, 2.0, 0.05) * 1e3, 3)   # mK
    49.938
    """
    c = _constants()
    s_t = np.asarray(entropy_target, dtype=float)
    b = _field("field", field)
    j, g = _spin(spin, g_factor)
    bi = _field("internal_field", internal_field)
    a = np.asarray(lattice, dtype=float)
    limit = c.R * np.log(2 * j + 1)
    if np.any(np.isnan(s_t)) or np.any(s_t < 0):
        raise InputError(
            "entropy: below zero or not a number", expected="S >= 0", found=repr(entropy_target)
        )
    if np.all(a == 0) and np.any(s_t >= limit):
        raise InputError(
            "entropy: at or above the free-spin limit R ln(2J+1), which no temperature reaches",
            expected=f"S < {np.max(limit):.6g} J/(K mol)",
            found=repr(entropy_target),
        )
    s_t, b, j, g, bi, a = np.broadcast_arrays(s_t, b, j, g, bi, a)
    spacing = g * c.mu_B * np.hypot(b, bi) / c.k  # [K]: y = spacing / T
    # bracket: at T = spacing / 800 the spin entropy is below 1e-300 J/(K mol); above
    # 1e9 spacing it is within 1e-17 of R ln(2J+1); the lattice alone reaches the target
    # at (3 S / a)^(1/3).
    with np.errstate(divide="ignore", invalid="ignore"):
        t_lattice = np.where(a > 0, np.cbrt(3 * s_t / np.where(a > 0, a, 1.0)), 0.0)
    low = np.log(np.maximum(spacing / 800.0, 1e-300))
    high = np.log(np.maximum(spacing * 1e9 + t_lattice, 1e-290))
    for _ in range(_BISECTION_STEPS):
        mid = 0.5 * (low + high)
        t = np.exp(mid)
        s = c.R * _entropy_over_r(_y(b, t, g, bi, c), j) + a * t**3 / 3.0
        below = s < s_t
        low = np.where(below, mid, low)
        high = np.where(below, high, mid)
    t_f = np.exp(0.5 * (low + high))
    t_f = np.where((s_t <= 0) | ((spacing == 0) & (s_t < limit)), 0.0, t_f)
    return _scalar(t_f)


def demagnetization_temperature(
    initial_temperature,
    initial_field,
    final_field,
    spin,
    g_factor,
    internal_field=0.0,
    lattice=0.0,
):
    """Final temperature of an isentropic demagnetization from (B_i, T_i) to B_f.

    .. math:: S(B_f, T_f) = S(B_i, T_i)

    Parameters
    ----------
    initial_temperature : float or ndarray
        T_i, the temperature at which the salt was magnetized, [K].
    initial_field : float or ndarray
        B_i, the full field, [T].
    final_field : float or ndarray
        B_f, [T]; 0 for the lowest temperature of the stage.
    spin, g_factor, internal_field, lattice
        As in :func:`entropy`.

    Returns
    -------
    float or ndarray
        T_f, [K].

    Notes
    -----
    Without a lattice term this is T_i sqrt(B_f^2 + b^2) / sqrt(B_i^2 + b^2); a lattice
    term makes T_f higher, as the lattice's entropy at T_i is handed to the spins.

    References
    ----------
    .. [1] Pobell (2007), section 9.2, eq. 9.12.

    Examples
    --------
    >>> round(demagnetization_temperature(1.0, 1.0, 0.0, 2.5, 2.0, 0.05) * 1e3, 3)
    49.938
    """
    s_i = entropy(initial_field, initial_temperature, spin, g_factor, internal_field, lattice)
    return isentropic_temperature(s_i, final_field, spin, g_factor, internal_field, lattice)


def ideal_demagnetization_temperature(
    initial_temperature, initial_field, final_field, internal_field=0.0
):
    """Closed-form isentrope of an ideal paramagnet with an internal field.

    .. math:: T_f = T_i \\frac{\\sqrt{B_f^2 + b^2}}{\\sqrt{B_i^2 + b^2}}

    Parameters
    ----------
    initial_temperature : float or ndarray
        T_i, [K].
    initial_field : float or ndarray
        B_i, [T].
    final_field : float or ndarray
        B_f, [T].
    internal_field : float, optional
        b, [T].

    Returns
    -------
    float or ndarray
        T_f, [K].

    References
    ----------
    .. [1] Pobell (2007), section 9.2, eq. 9.12.

    Examples
    --------
    >>> round(ideal_demagnetization_temperature(1.0, 1.0, 0.0, 0.05) * 1e3, 3)
    49.938
    """
    t = _temperature("initial_temperature", initial_temperature)
    bi = _field("initial_field", initial_field)
    bf = _field("final_field", final_field)
    b = _field("internal_field", internal_field)
    with np.errstate(divide="ignore", invalid="ignore"):
        ratio = np.hypot(bf, b) / np.hypot(bi, b)
    return _scalar(t * ratio)


def isentropic_field(entropy_target, temperature, spin, g_factor, internal_field=0.0, lattice=0.0):
    """Applied field at which a paramagnet has a given molar entropy at a given temperature.

    Solves S(B, T) = S_target for B >= 0 by bisection in ln B_eff, vectorised; the field
    at which a demagnetization reaches the regulation temperature.

    .. math:: S(B, T) = S_\\mathrm{target}, \\qquad B = \\sqrt{B_\\mathrm{eff}^2 - b^2}

    Parameters
    ----------
    entropy_target : float or ndarray
        Molar entropy, [J/(K mol of magnetic ions)].
    temperature : float or ndarray
        Temperature, [K], above 0.
    spin, g_factor, internal_field, lattice
        As in :func:`entropy`.

    Returns
    -------
    float or ndarray
        B, [T].

    Raises
    ------
    InputError
        Where the entropy at zero field is already below the target (the salt is colder
        than its isentrope can reach at this temperature), or the target is not above 0.

    References
    ----------
    .. [1] Pobell (2007), section 9.2.

    Examples
    --------
    >>> s = entropy(1.0, 1.0, 2.5, 2.0, 0.05)
    >>> round(isentropic_field(s, 0.1, 2.5, 2.0, 0.05), 4)   # sqrt(0.100125^2 - 0.05^2)
    0.0867
    """
    c = _constants()
    s_t = np.asarray(entropy_target, dtype=float)
    t = _temperature("temperature", temperature)
    j, g = _spin(spin, g_factor)
    bi = _field("internal_field", internal_field)
    a = np.asarray(lattice, dtype=float)
    if np.any(t <= 0):
        raise TemperatureError("temperature: the isentrope's field needs a temperature above 0 K")
    if np.any(np.isnan(s_t)) or np.any(s_t <= 0):
        raise InputError("entropy: not above zero", expected="S > 0", found=repr(entropy_target))
    s_t, t, j, g, bi, a = np.broadcast_arrays(s_t, t, j, g, bi, a)
    s_zero = c.R * _entropy_over_r(_y(np.zeros_like(t), t, g, bi, c), j) + a * t**3 / 3.0
    if np.any(s_zero < s_t * (1 - 1e-12)):
        raise InputError(
            "temperature: below what the salt reaches on this isentrope even at zero field",
            expected="a temperature at or above the end of the demagnetization",
            found=repr(temperature),
        )
    s_spin = s_t - a * t**3 / 3.0
    # B_eff between b (zero applied field) and the field where y = 800 (S ~ 0)
    per_tesla = g * c.mu_B / (c.k * t)  # y per tesla of B_eff
    low = np.log(np.maximum(bi, 1e-300))
    high = np.log(np.maximum(800.0 / per_tesla, bi * 2 + 1e-300))
    for _ in range(_BISECTION_STEPS):
        mid = 0.5 * (low + high)
        s = c.R * _entropy_over_r(np.minimum(np.exp(mid) * per_tesla, _Y_CAP), j)
        above = s > s_spin
        low = np.where(above, mid, low)
        high = np.where(above, high, mid)
    beff = np.exp(0.5 * (low + high))
    return _scalar(np.sqrt(np.maximum(beff**2 - bi**2, 0.0)))


def magnetization_heat(
    amount, field, temperature, spin, g_factor, internal_field=0.0, lattice=0.0
):
    """Heat rejected to the bath by isothermal magnetization from zero to a field.

    .. math:: Q = n T [S(0, T) - S(B, T)]

    Parameters
    ----------
    amount : float or ndarray
        n, [mol of magnetic ions].
    field : float or ndarray
        Full field B, [T].
    temperature : float or ndarray
        Bath temperature T, [K].
    spin, g_factor, internal_field, lattice
        As in :func:`entropy` (the lattice term cancels at constant T).

    Returns
    -------
    float or ndarray
        Q, [J].

    References
    ----------
    .. [1] Pobell (2007), section 9.2 (the heat of magnetization, T dS).

    Examples
    --------
    >>> round(magnetization_heat(1.0, 1.0, 1.0, 2.5, 2.0, 0.05), 2)   # J per mol of Fe
    8.42
    """
    n = _positive("amount", amount, "amount of magnetic ions")
    t = _temperature("temperature", temperature)
    s0 = np.asarray(entropy(0.0, t, spin, g_factor, internal_field))
    sb = np.asarray(entropy(field, t, spin, g_factor, internal_field))
    return _scalar(n * t * (s0 - sb))


def hold_time(
    amount,
    full_field,
    magnetization_temperature,
    regulation_temperature,
    leak,
    spin,
    g_factor,
    internal_field=0.0,
    lattice=0.0,
):
    """Time a demagnetized salt holds a regulated temperature under a heat leak.

    The field is first lowered isentropically from B_i at T_i until the salt reaches
    T_reg (at the field :func:`isentropic_field` returns), then lowered further to keep T
    at T_reg while the leak is absorbed, dS = Q dt / T_reg, until the field reaches zero:

    .. math:: t = \\frac{n T_\\mathrm{reg} [S(0, T_\\mathrm{reg}) - S(B_i, T_i)]}{\\dot Q}

    Parameters
    ----------
    amount : float or ndarray
        n, [mol of magnetic ions].
    full_field : float or ndarray
        B_i, [T].
    magnetization_temperature : float or ndarray
        T_i, the bath temperature at the end of magnetization, [K].
    regulation_temperature : float or ndarray
        T_reg, [K]; between the end of the isentrope at zero field and T_i.
    leak : float or ndarray
        Heat leak onto the salt at T_reg, [W].
    spin, g_factor, internal_field, lattice
        As in :func:`entropy`.

    Returns
    -------
    float or ndarray
        t, [s].

    Raises
    ------
    InputError
        T_reg below the lowest temperature of the isentrope (zero field), or above T_i; a
        leak that is not positive.

    Notes
    -----
    Ideal: the salt and its stage share one temperature, the field is swept reversibly,
    eddy-current and hysteresis heating are left out; the stage's own heat capacity at
    T_reg adds nothing at constant temperature.

    References
    ----------
    .. [1] Pobell (2007), section 9.2 (the heat a demagnetized salt can absorb, T dS).

    Examples
    --------
    >>> t = hold_time(1.0, 1.0, 1.0, 0.1, 1e-6, 2.5, 2.0, 0.05)
    >>> round(t / 3600, 1)   # hours
    127.7
    """
    n = _positive("amount", amount, "amount of magnetic ions")
    q = _positive("leak", leak, "power")
    t_i = _temperature("magnetization_temperature", magnetization_temperature)
    t_r = _temperature("regulation_temperature", regulation_temperature)
    if np.any(t_r > t_i):
        raise InputError(
            "regulation_temperature: above the temperature the salt is magnetized at",
            expected="T_reg <= the bath's temperature",
            found=repr(regulation_temperature),
        )
    s_i = np.asarray(entropy(full_field, t_i, spin, g_factor, internal_field, lattice))
    s_r = np.asarray(entropy(0.0, t_r, spin, g_factor, internal_field, lattice))
    if np.any(s_r < s_i * (1 - 1e-12)):
        lowest = demagnetization_temperature(
            t_i, full_field, 0.0, spin, g_factor, internal_field, lattice
        )
        raise InputError(
            "regulation_temperature: below what the salt reaches at zero field",
            expected=f"at least the lowest temperature, {np.min(lowest):.4g} K",
            found=repr(regulation_temperature),
        )
    return _scalar(n * t_r * np.maximum(s_r - s_i, 0.0) / q)
