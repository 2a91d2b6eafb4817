"""Heat-capacity and thermal-conductivity models of solids, and their state functions.

The physics core: SI floats and numpy arrays in and out, vectorised, no units, no files.
Each model is one plain function; :data:`HEAT_CAPACITY_MODELS` and
:data:`CONDUCTIVITY_MODELS` map the model names used in material files to them, and
:func:`select_model` picks one by name and checks the temperature against its validity.

State functions from 0 K (enthalpy H(T) - H(0), entropy S(T) with S(0) = 0, the
conductivity integral) come from :class:`CumulativeIntegral`: exact fixed-order
Gauss-Legendre quadrature between the nodes of a fine logarithmic grid, and cubic Hermite
interpolation between nodes, where the derivative is the integrand itself.

Units: temperatures [K], molar heat capacities [J/(mol K)], specific heats [J/(kg K)],
molar masses [kg/mol], conductivities [W/(m K)].
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence

import numpy as np

#: Molar gas constant [J/(mol K)]: N_A k_B, exact in the 2019 SI (CODATA 2018);
#: equal to ``scipy.constants.R`` (checked by the tests; not imported here because
#: importing scipy.constants costs a fifth of a second).
R = 8.31446261815324

#: The Debye integral from 0 to infinity of x^4 e^x / (e^x - 1)^2 dx = 4 pi^4 / 15.
_DEBYE_INTEGRAL_INF = 4.0 * math.pi**4 / 15.0

#: Gauss-Legendre nodes and weights on [0, 1], fixed order.
_GL24_X, _GL24_W = np.polynomial.legendre.leggauss(24)
_GL24_X = 0.5 * (_GL24_X + 1.0)
_GL24_W = 0.5 * _GL24_W
_GL6_X, _GL6_W = np.polynomial.legendre.leggauss(6)
_GL6_X = 0.5 * (_GL6_X + 1.0)
_GL6_W = 0.5 * _GL6_W


def _as_array(value) -> tuple[np.ndarray, bool]:
    array = np.asarray(value, dtype=float)
    return array, array.ndim == 0


def _back(array: np.ndarray, scalar: bool):
    return float(array) if scalar else array


# --------------------------------------------------------------------------------------
# Lattice, electronic, Einstein, Schottky and superconducting terms
# --------------------------------------------------------------------------------------


def _debye_integral(x: np.ndarray) -> np.ndarray:
    """Integral from 0 to x of t^4 e^t / (e^t - 1)^2 dt, vectorised, to machine precision."""
    x = np.asarray(x, dtype=float)
    out = np.empty_like(x)
    small = x <= 5.0
    if np.any(small):
        xs = x[small]
        t = xs[..., None] * _GL24_X
        with np.errstate(over="ignore", invalid="ignore"):
            em1 = np.expm1(t)
            integrand = np.where(t > 0, t**4 * (em1 + 1.0) / (em1 * em1), 0.0)
        out[small] = xs * (integrand @ _GL24_W)
    large = ~small
    if np.any(large):
        xl = x[large]
        tail = np.zeros_like(xl)
        finite = xl < 700.0
        xf = xl[finite]
        acc = np.zeros_like(xf)
        # tail from x to infinity: sum over k of e^{-kx} (x^4 + 4x^3/k + 12x^2/k^2 + 24x/k^3 + 24/k^4)
        for k in range(1, 11):
            acc += np.exp(-k * xf) * (
                xf**4 + 4 * xf**3 / k + 12 * xf**2 / k**2 + 24 * xf / k**3 + 24 / k**4
            )
        tail[finite] = acc
        out[large] = _DEBYE_INTEGRAL_INF - tail
    return out


def debye_heat_capacity(temperature, debye_temperature):
    r"""Molar heat capacity of a Debye lattice, per mole of atoms (Debye 1912).

    .. math::

        C_V = 9 R \left(\frac{T}{\theta_D}\right)^3
              \int_0^{\theta_D/T} \frac{x^4 e^x}{(e^x - 1)^2}\,dx

    Parameters
    ----------
    temperature : float or ndarray
        Temperature, [K]; 0 K gives 0.
    debye_temperature : float or ndarray
        Debye temperature theta_D, [K]; broadcast against ``temperature``.

    Returns
    -------
    float or ndarray
        Heat capacity at constant volume per mole of atoms, [J/(mol K)].

    Notes
    -----
    Limits: 3R (Dulong-Petit) for T >> theta_D; (12 pi^4 R / 5) (T/theta_D)^3 for
    T < theta_D / 50. The integral is done by 24-point Gauss-Legendre quadrature for
    theta_D/T <= 5 and by the exponentially convergent tail series otherwise, to about
    1e-14 relative.

    References
    ----------
    1. P. Debye, "Zur Theorie der spezifischen Waermen", Ann. Phys. 344 (1912) 789.
    2. E. S. R. Gopal, "Specific Heats at Low Temperatures", Plenum (1966), ch. 2 and
       the Debye-function table of appendix A.

    Examples
    --------
    >>> round(debye_heat_capacity(1e6, 300.0) / (3 * R), 6)   # Dulong-Petit
    1.0
    >>> round(debye_heat_capacity(300.0, 300.0), 2)           # theta/T = 1
    23.74
    """
    t, scalar = _as_array(temperature)
    theta = np.asarray(debye_temperature, dtype=float)
    scalar = scalar and theta.ndim == 0
    t, theta = np.broadcast_arrays(t, theta)
    with np.errstate(divide="ignore", over="ignore"):
        x = np.where(t > 0, theta / np.where(t > 0, t, 1.0), np.inf)
    out = np.zeros_like(x)
    ok = np.isfinite(x)
    xo = x[ok]
    tiny = xo < 1e-6
    val = np.empty_like(xo)
    val[tiny] = 3.0 * R * (1.0 - xo[tiny] ** 2 / 20.0)
    xn = xo[~tiny]
    with np.errstate(over="ignore"):
        val[~tiny] = 9.0 * R * _debye_integral(xn) / xn**3
    out[ok] = val
    return _back(out, scalar)


def electronic_heat_capacity(temperature, gamma):
    r"""Heat capacity of conduction electrons, Sommerfeld's linear law.

    .. math:: C_e = \gamma T

    Parameters
    ----------
    temperature : float or ndarray
        Temperature, [K].
    gamma : float
        Sommerfeld coefficient, [J/(mol K^2)] (or [J/(kg K^2)] for a specific heat).

    Returns
    -------
    float or ndarray
        Electronic heat capacity, [J/(mol K)] (or [J/(kg K)]).

    Notes
    -----
    Holds for a normal metal for T much below the Fermi temperature (all of cryogenics).

    References
    ----------
    1. C. Kittel, "Introduction to Solid State Physics", 8th ed., Wiley (2005), ch. 6.

    Examples
    --------
    >>> electronic_heat_capacity(4.0, 0.695e-3)   # copper, Kittel table 6.3
    0.00278
    """
    t, scalar = _as_array(temperature)
    return _back(gamma * t, scalar)


def einstein_heat_capacity(temperature, einstein_temperature):
    r"""Molar heat capacity of Einstein oscillators, per mole of atoms (Einstein 1907).

    .. math:: C = 3 R \frac{x^2 e^x}{(e^x - 1)^2}, \qquad x = \theta_E / T

    Parameters
    ----------
    temperature : float or ndarray
        Temperature, [K].
    einstein_temperature : float
        Einstein temperature theta_E, [K].

    Returns
    -------
    float or ndarray
        Heat capacity per mole of atoms (three oscillators per atom), [J/(mol K)].

    Notes
    -----
    Tends to 3R at high T and vanishes exponentially at low T; used for optical modes
    and for the excess (boson-peak) heat capacity of glasses and polymers.

    References
    ----------
    1. A. Einstein, "Die Plancksche Theorie der Strahlung und die Theorie der
       spezifischen Waerme", Ann. Phys. 327 (1907) 180.

    Examples
    --------
    >>> round(einstein_heat_capacity(1e5, 100.0) / (3 * R), 4)
    1.0
    """
    t, scalar = _as_array(temperature)
    with np.errstate(divide="ignore", over="ignore", invalid="ignore"):
        x = np.where(t > 0, einstein_temperature / np.where(t > 0, t, 1.0), np.inf)
        em1 = np.expm1(np.minimum(x, 700.0))
        value = np.where(x < 700.0, 3.0 * R * x * x * (em1 + 1.0) / (em1 * em1), 0.0)
    return _back(value, scalar)


def schottky_heat_capacity(temperature, gap, degeneracy_ratio=1.0):
    r"""Molar heat capacity of a two-level (Schottky) system, per mole of centres.

    .. math::

        C = R \, g \left(\frac{\Delta}{T}\right)^2
            \frac{e^{\Delta/T}}{\left(1 + g\, e^{\Delta/T}\right)^2}, \qquad g = g_0/g_1

    Parameters
    ----------
    temperature : float or ndarray
        Temperature, [K].
    gap : float
        Level splitting Delta / k_B, [K].
    degeneracy_ratio : float
        g_0 / g_1, ratio of the degeneracies of the lower and upper level, [-].

    Returns
    -------
    float or ndarray
        Heat capacity per mole of two-level centres, [J/(mol K)].

    Notes
    -----
    A peak of about 0.44 R near T = 0.42 Delta for g = 1; used for magnetic impurities
    and nuclear or crystal-field levels.

    References
    ----------
    1. E. S. R. Gopal, "Specific Heats at Low Temperatures", Plenum (1966), ch. 5.

    Examples
    --------
    >>> round(schottky_heat_capacity(0.4168, 1.0) / R, 3)   # the Schottky peak
    0.439
    """
    t, scalar = _as_array(temperature)
    with np.errstate(divide="ignore", over="ignore", invalid="ignore"):
        x = np.where(t > 0, gap / np.where(t > 0, t, 1.0), np.inf)
        # written with e^{-x} to stay finite for large x
        e = np.exp(-np.minimum(x, 700.0))
        value = np.where(
            x < 700.0, R * degeneracy_ratio * x * x * e / (e + degeneracy_ratio) ** 2, 0.0
        )
    return _back(value, scalar)


def superconducting_electronic_heat_capacity(temperature, gamma, critical_temperature, b=1.44):
    r"""Electronic heat capacity across a superconducting transition (exponential BCS law).

    .. math::

        C_{es} = a \gamma T_c \, e^{-b T_c / T} \quad (T < T_c), \qquad
        C_{en} = \gamma T \quad (T \ge T_c), \qquad a = 1 / E_1(b)

    Parameters
    ----------
    temperature : float or ndarray
        Temperature, [K].
    gamma : float
        Normal-state Sommerfeld coefficient, [J/(mol K^2)].
    critical_temperature : float
        Transition temperature T_c in zero field, [K].
    b : float
        Exponent factor, [-]; 1.44 is the BCS value (Delta(0) = 1.76 k_B T_c, fitted
        over 0.3 < T/T_c < 0.8).

    Returns
    -------
    float or ndarray
        Electronic heat capacity, [J/(mol K)].

    Notes
    -----
    The prefactor a = 1/E_1(b) makes the entropy continuous at T_c (a second-order
    transition): the integral of C_es/T from 0 to T_c equals gamma T_c. For b = 1.44,
    a = 8.8 and the jump C_es(T_c)/(gamma T_c) = 2.1 (BCS: 2.43). Zero magnetic field.

    References
    ----------
    1. W. S. Corak, B. B. Goodman, C. B. Satterthwaite, A. Wexler, "Atomic heats of
       normal and superconducting vanadium", Phys. Rev. 102 (1956) 656.
    2. J. Bardeen, L. N. Cooper, J. R. Schrieffer, Phys. Rev. 108 (1957) 1175.

    Examples
    --------
    >>> round(superconducting_electronic_heat_capacity(20.0, 7.8e-3, 9.25), 4)
    0.156
    """
    t, scalar = _as_array(temperature)
    a = _bcs_prefactor(b)
    with np.errstate(divide="ignore", over="ignore"):
        x = np.where(t > 0, critical_temperature / np.where(t > 0, t, 1.0), np.inf)
        below = a * gamma * critical_temperature * np.exp(-b * x)
    value = np.where(t < critical_temperature, below, gamma * t)
    return _back(value, scalar)


_BCS_CACHE: dict[float, float] = {}


def _exponential_integral_e1(x: float) -> float:
    """E1(x) for 0 < x <= 10 by its power series (Abramowitz & Stegun 5.1.11)."""
    total, term = 0.0, 1.0
    for k in range(1, 80):
        term *= -x / k
        total += term / k
    return -0.5772156649015329 - math.log(x) - total


def _bcs_prefactor(b: float) -> float:
    # scipy.special.exp1 would do; the series avoids importing scipy at start-up
    if b not in _BCS_CACHE:
        _BCS_CACHE[b] = 1.0 / _exponential_integral_e1(float(b))
    return _BCS_CACHE[b]


def dilation_heat_capacity(temperature, lattice_heat_capacity, coefficient):
    r"""C_P - C_V of a solid by the Nernst-Lindemann relation.

    .. math:: C_P - C_V = A\, C_V^2\, T

    Parameters
    ----------
    temperature : float or ndarray
        Temperature, [K].
    lattice_heat_capacity : float or ndarray
        C_V per mole of atoms, [J/(mol K)].
    coefficient : float
        Nernst-Lindemann coefficient A, [mol/J]; about 0.0051 / T_melt (A = 0.0214 / T_m
        with C in cal/(mol K)), or fitted.

    Returns
    -------
    float or ndarray
        C_P - C_V per mole of atoms, [J/(mol K)].

    Notes
    -----
    The dilation term lets C_P exceed the Dulong-Petit 3R near room temperature, as
    measured heat capacities of metals do (lead: 26.7 J/(mol K) at 298 K against
    3R = 24.9). It vanishes as T^7 at low temperature.

    References
    ----------
    1. W. Nernst, F. A. Lindemann, "Spezifische Waerme und Quantentheorie", Z.
       Elektrochem. 17 (1911) 817.
    2. E. S. R. Gopal, "Specific Heats at Low Temperatures", Plenum (1966), sec. 2.9.

    Examples
    --------
    >>> round(dilation_heat_capacity(298.0, 24.7, 0.0051 / 600.5), 2)   # lead
    1.54
    """
    t, scalar = _as_array(temperature)
    value = coefficient * np.asarray(lattice_heat_capacity, float) ** 2 * t
    return _back(value, scalar)


# --------------------------------------------------------------------------------------
# Interpolation helpers
# --------------------------------------------------------------------------------------


def varying_debye_temperature(temperature, knot_temperatures, knot_thetas):
    r"""A Debye temperature that varies with T: linear in ln T between knots.

    .. math::

        \theta(T) = \theta_i + (\theta_{i+1} - \theta_i)
                    \frac{\ln T - \ln T_i}{\ln T_{i+1} - \ln T_i}

    constant below the first knot and above the last.

    Parameters
    ----------
    temperature : float or ndarray
        Temperature, [K].
    knot_temperatures : sequence of float
        Knot temperatures, increasing, [K].
    knot_thetas : sequence of float
        Debye temperature at each knot, [K] (fitted to reference data).

    Returns
    -------
    float or ndarray
        theta_D(T), [K].

    Notes
    -----
    Constant below the first knot, so that the lattice term follows the T^3 law at the
    lowest temperatures (the physics, and a finite entropy integral).

    References
    ----------
    1. E. S. R. Gopal, "Specific Heats at Low Temperatures", Plenum (1966), sec. 2.5
       (the "effective" Debye temperature theta(T) as a representation of data).

    Examples
    --------
    >>> round(varying_debye_temperature(20.0, [10.0, 40.0], [300.0, 320.0]), 6)
    310.0
    """
    t, scalar = _as_array(temperature)
    lt = np.log(np.maximum(t, 1e-300))
    value = np.interp(lt, np.log(np.asarray(knot_temperatures, float)), knot_thetas)
    return _back(value, scalar)


def log_log_interpolate(temperature, table_temperatures, table_values):
    """Interpolate a positive table linearly in log T and log y; power law beyond the ends.

    Parameters
    ----------
    temperature : float or ndarray
        Temperature, [K], > 0.
    table_temperatures : sequence of float
        Increasing temperatures of the table, [K].
    table_values : sequence of float
        Positive values at those temperatures (any unit).

    Returns
    -------
    float or ndarray
        The interpolated value, in the unit of ``table_values``; beyond either end the
        power law of the end segment continues.

    Examples
    --------
    >>> round(log_log_interpolate(20.0, [10.0, 40.0], [1.0, 16.0]), 12)   # y = (T/10)^2
    4.0
    """
    t, scalar = _as_array(temperature)
    x = np.log(np.asarray(table_temperatures, float))
    y = np.log(np.asarray(table_values, float))
    with np.errstate(divide="ignore"):
        lt = np.log(t)
    value = np.interp(lt, x, y)
    lo_slope = (y[1] - y[0]) / (x[1] - x[0])
    hi_slope = (y[-1] - y[-2]) / (x[-1] - x[-2])
    value = np.where(lt < x[0], y[0] + lo_slope * (lt - x[0]), value)
    value = np.where(lt > x[-1], y[-1] + hi_slope * (lt - x[-1]), value)
    return _back(np.exp(value), scalar)


# --------------------------------------------------------------------------------------
# Specific-heat models (J/(kg K)), one function each
# --------------------------------------------------------------------------------------


def _extra_terms(t, einstein, schottky):
    total = np.zeros_like(t)
    for theta_e, atoms in einstein:
        total = total + atoms * einstein_heat_capacity(t, theta_e)
    for gap, centres, ratio in schottky:
        total = total + centres * schottky_heat_capacity(t, gap, ratio)
    return total


def _electronic(t, gamma, superconducting):
    if superconducting is None:
        return gamma * t
    tc, b = superconducting
    return superconducting_electronic_heat_capacity(t, gamma, tc, b)


def debye_specific_heat(
    temperature,
    debye_temperature: float,
    molar_mass: float,
    atoms_per_formula: float = 1.0,
    gamma: float = 0.0,
    einstein: Sequence[tuple[float, float]] = (),
    schottky: Sequence[tuple[float, float, float]] = (),
    superconducting: tuple[float, float] | None = None,
    dilation: float = 0.0,
):
    r"""Specific heat from a Debye lattice, an electronic term and optional extra terms.

    .. math::

        c = \frac{1}{M}\left[n\,C_D(T;\theta_D) + \gamma T + \sum_j n_j C_E(T;\theta_j)
            + \sum_k m_k C_S(T;\Delta_k)\right]

    Parameters
    ----------
    temperature : float or ndarray
        Temperature, [K].
    debye_temperature : float
        theta_D, [K].
    molar_mass : float
        Molar mass of the formula unit, [kg/mol].
    atoms_per_formula : float
        Atoms per formula unit n carried by the Debye term, [-].
    gamma : float
        Sommerfeld coefficient per mole of formula units, [J/(mol K^2)].
    einstein : sequence of (float, float)
        (theta_E [K], atoms per formula unit [-]) of each Einstein term.
    schottky : sequence of (float, float, float)
        (gap [K], centres per formula unit [-], g0/g1 [-]) of each Schottky term.
    superconducting : (float, float) or None
        (T_c [K], b [-]) to replace gamma T by the exponential law below T_c.
    dilation : float
        Nernst-Lindemann coefficient A [mol/J] of :func:`dilation_heat_capacity`
        (C_P - C_V per mole of atoms); 0 for C_V alone.

    Returns
    -------
    float or ndarray
        Specific heat, [J/(kg K)].

    Notes
    -----
    A single theta_D rarely holds to 5 % from 4 K to 300 K; see
    :func:`varying_debye_specific_heat`. The Debye term is C_V; the small C_P - C_V of
    solids (about 2 % at 300 K for metals) is absorbed by the fitted theta.

    References
    ----------
    1. C. Kittel, "Introduction to Solid State Physics", 8th ed., Wiley (2005), ch. 5, 6.
    2. E. S. R. Gopal, "Specific Heats at Low Temperatures", Plenum (1966).

    Examples
    --------
    >>> round(debye_specific_heat(300.0, 343.0, 0.063546, gamma=0.695e-3), 0)  # copper
    371.0
    """
    t, scalar = _as_array(temperature)
    lattice = debye_heat_capacity(t, debye_temperature)
    molar = atoms_per_formula * (lattice + dilation * lattice**2 * t)
    molar = molar + _electronic(t, gamma, superconducting) + _extra_terms(t, einstein, schottky)
    return _back(molar / molar_mass, scalar)


def varying_debye_specific_heat(
    temperature,
    knot_temperatures: Sequence[float],
    knot_thetas: Sequence[float],
    molar_mass: float,
    atoms_per_formula: float = 1.0,
    gamma: float = 0.0,
    einstein: Sequence[tuple[float, float]] = (),
    schottky: Sequence[tuple[float, float, float]] = (),
    superconducting: tuple[float, float] | None = None,
    dilation: float = 0.0,
):
    r"""Specific heat from a Debye lattice whose theta_D varies with T (knots).

    .. math::

        c = \frac{1}{M}\left[n\,C_D\big(T;\theta(T)\big) + \gamma T + \ldots\right]

    with theta(T) from :func:`varying_debye_temperature`.

    Parameters
    ----------
    temperature : float or ndarray
        Temperature, [K].
    knot_temperatures, knot_thetas : sequence of float
        Knots of theta(T), [K] and [K].
    molar_mass, atoms_per_formula, gamma, einstein, schottky, superconducting, dilation
        As in :func:`debye_specific_heat`.

    Returns
    -------
    float or ndarray
        Specific heat, [J/(kg K)].

    Notes
    -----
    Below the first knot theta is constant, so c -> gamma T + beta T^3 as T -> 0.
    Valid over the range of the reference data the knots were fitted to.

    References
    ----------
    1. E. S. R. Gopal, "Specific Heats at Low Temperatures", Plenum (1966), sec. 2.5.

    Examples
    --------
    >>> round(varying_debye_specific_heat(300.0, [10.0, 300.0], [343.0, 343.0],
    ...                                   0.063546, gamma=0.695e-3), 0)
    371.0
    """
    t, scalar = _as_array(temperature)
    theta = varying_debye_temperature(t, knot_temperatures, knot_thetas)
    lattice = debye_heat_capacity(t, theta)
    molar = atoms_per_formula * (lattice + dilation * lattice**2 * t)
    molar = molar + _electronic(t, gamma, superconducting) + _extra_terms(t, einstein, schottky)
    return _back(molar / molar_mass, scalar)


def tabulated_specific_heat(
    temperature,
    table_temperatures: Sequence[float],
    table_values: Sequence[float],
    gamma: float = 0.0,
):
    r"""Specific heat from a table, log-log interpolation; gamma T + beta T^3 below it.

    .. math::

        c(T) = \gamma T + \beta T^3, \quad \beta = (c_0 - \gamma T_0) / T_0^3
        \qquad (T < T_0)

    Parameters
    ----------
    temperature : float or ndarray
        Temperature, [K].
    table_temperatures : sequence of float
        Increasing temperatures of the table, [K].
    table_values : sequence of float
        Specific heats at those temperatures, [J/(kg K)], positive.
    gamma : float
        Linear (electronic, or glassy two-level) coefficient used below the table,
        [J/(kg K^2)]; reduced to c_0/T_0 if larger than that.

    Returns
    -------
    float or ndarray
        Specific heat, [J/(kg K)].

    Notes
    -----
    For materials where no physical model fits (polymers, composites). Above the table
    the power law of its last segment continues (use only where the caller asked to
    extrapolate).

    References
    ----------
    1. R. J. Corruccini, J. J. Gniewek, "Specific heats and enthalpies of technical
       solids at low temperatures", NBS Monograph 21 (1960) (tables of this kind).

    Examples
    --------
    >>> tabulated_specific_heat(2.0, [4.0, 10.0], [0.64, 10.0])   # 0.01 T^3
    0.08
    """
    t, scalar = _as_array(temperature)
    t0 = float(table_temperatures[0])
    c0 = float(table_values[0])
    g = min(float(gamma), c0 / t0)
    beta = (c0 - g * t0) / t0**3
    inside = log_log_interpolate(np.maximum(t, t0), table_temperatures, table_values)
    value = np.where(t < t0, g * t + beta * t**3, inside)
    return _back(value, scalar)


# --------------------------------------------------------------------------------------
# Thermal-conductivity models (W/(m K))
# --------------------------------------------------------------------------------------


def nist_log_polynomial(temperature, coefficients: Sequence[float]):
    r"""A property from the NIST cryogenic-materials fit, a polynomial in log10 T.

    .. math:: \log_{10} y = \sum_{i=0}^{8} a_i (\log_{10} T)^i

    Parameters
    ----------
    temperature : float or ndarray
        Temperature, [K], > 0.
    coefficients : sequence of float
        a, b, c, ... (a_0 first), as tabulated by NIST.

    Returns
    -------
    float or ndarray
        The property in the unit of the fit (W/(m K) for conductivity, J/(kg K) for
        specific heat).

    Notes
    -----
    Valid over the equation range NIST states for each fit (mostly 4 K to 300 K);
    diverges quickly outside it.

    References
    ----------
    1. NIST Cryogenic Technologies Group, "Material Properties" database (Boulder),
       e.g. the page "Material Properties: OFHC Copper" (rev. 2010).
    2. E. D. Marquardt, J. P. Le, R. Radebaugh, "Cryogenic material properties
       database", 11th International Cryocooler Conference (2000).

    Examples
    --------
    >>> copper_c = [-1.91844, -0.15973, 8.61013, -18.996, 21.9661, -12.7328, 3.54322,
    ...             -0.3797]                        # NIST, OFHC copper specific heat
    >>> round(nist_log_polynomial(300.0, copper_c), 0)
    389.0
    """
    t, scalar = _as_array(temperature)
    with np.errstate(divide="ignore"):
        lt = np.log10(t)
    value = np.power(10.0, np.polyval(list(coefficients)[::-1], lt))
    return _back(value, scalar)


def nist_rational_conductivity(temperature, coefficients: Sequence[float]):
    r"""Conductivity from the NIST rational fit in sqrt(T) used for OFHC copper.

    .. math::

        \log_{10} k = \frac{a + c T^{1/2} + e T + g T^{3/2} + i T^2}
                           {1 + b T^{1/2} + d T + f T^{3/2} + h T^2}

    Parameters
    ----------
    temperature : float or ndarray
        Temperature, [K].
    coefficients : sequence of float
        a, b, c, d, e, f, g, h, i, as tabulated by NIST for one RRR.

    Returns
    -------
    float or ndarray
        Thermal conductivity, [W/(m K)].

    Notes
    -----
    NIST gives it for RRR 50, 100, 150, 300 and 500 over 4 K to 300 K.

    References
    ----------
    1. NIST Cryogenic Technologies Group, "Material Properties: OFHC Copper" (2010).

    Examples
    --------
    >>> rrr100 = [2.2154, -0.47461, -0.88068, 0.13871, 0.29505, -0.02043, -0.04831,
    ...           0.001281, 0.003207]
    >>> round(nist_rational_conductivity(300.0, rrr100), -1)
    400.0
    """
    t, scalar = _as_array(temperature)
    a, b, c, d, e, f, g, h, i = coefficients
    r = np.sqrt(t)
    num = a + c * r + e * t + g * t * r + i * t * t
    den = 1.0 + b * r + d * t + f * t * r + h * t * t
    return _back(np.power(10.0, num / den), scalar)


def hust_lankford_conductivity(
    temperature,
    rrr: float,
    rho_273: float,
    p1: float,
    p2: float,
    p3: float,
    p4: float,
    p5: float,
    p6: float,
    p7: float,
    p7_exponent: float = 0.0,
):
    r"""Conductivity of a pure metal of given purity (RRR), Hust and Lankford (1984).

    .. math::

        W_0 = \frac{\beta}{T},\quad \beta = \frac{\rho_{273}}{L_0\,\mathrm{RRR}},\quad
        W_i = \frac{P_1 T^{P_2}}{1 + P_1 P_3 T^{P_2+P_4}
              \exp\left[-(P_5/T)^{P_6}\right]},

        W_{i0} = P_7' \frac{W_i W_0}{W_i + W_0},\quad
        P_7' = P_7 (\beta / 0.0003)^{-q}, \quad k = \frac{1}{W_0 + W_i + W_{i0}}

    Parameters
    ----------
    temperature : float or ndarray
        Temperature, [K].
    rrr : float
        Residual resistance ratio rho(273 K) / rho(4 K), [-].
    rho_273 : float
        Electrical resistivity at 273 K, [ohm m].
    p1, p2, p3, p4, p5, p6, p7 : float
        Hust-Lankford parameters of the metal (W in m K/W).
    p7_exponent : float
        q in the beta scaling of P7, [-].

    Returns
    -------
    float or ndarray
        Thermal conductivity, [W/(m K)].

    Notes
    -----
    W_0 is the impurity term (Wiedemann-Franz with L_0 = 2.443e-8 W ohm/K^2), W_i the
    intrinsic (phonon-scattering) term, W_i0 their deviation from Matthiessen's rule.
    Valid 1 K to 300 K (and above), RRR about 10 to 3000.

    References
    ----------
    1. J. G. Hust, A. B. Lankford, "Thermal conductivity of aluminum, copper, iron and
       tungsten for temperatures from 1 K to the melting point", NBSIR 84-3007 (1984).

    Examples
    --------
    >>> cu = dict(rho_273=1.55e-8, p1=1.754e-8, p2=2.763, p3=1102.0, p4=-0.165, p5=70.0,
    ...           p6=1.756, p7=0.838, p7_exponent=0.1661)     # copper, from memory
    >>> round(hust_lankford_conductivity(300.0, 100.0, **cu), -1)
    400.0
    """
    t, scalar = _as_array(temperature)
    lorenz = 2.443e-8
    beta = rho_273 / (lorenz * rrr)
    w0 = beta / t
    with np.errstate(over="ignore", divide="ignore"):
        wi = p1 * t**p2 / (1.0 + p1 * p3 * t ** (p2 + p4) * np.exp(-((p5 / t) ** p6)))
    p7s = p7 * (beta / 0.0003) ** (-p7_exponent)
    wi0 = p7s * wi * w0 / (wi + w0)
    return _back(1.0 / (w0 + wi + wi0), scalar)


def tabulated_conductivity(temperature, table_temperatures, table_values):
    """Conductivity from a table, log-log interpolation, power law beyond the ends.

    .. math:: \\ln k = \\ln k_i + s_i (\\ln T - \\ln T_i)

    Parameters
    ----------
    temperature : float or ndarray
        Temperature, [K].
    table_temperatures, table_values : sequence of float
        [K] and [W/(m K)].

    Returns
    -------
    float or ndarray
        Thermal conductivity, [W/(m K)].

    Notes
    -----
    Below the table the first segment's power law continues (k ~ T for alloys limited
    by impurity scattering, T^1..T^2 for glasses); keep tables spaced within a factor 2.

    References
    ----------
    1. J. W. Ekin, "Experimental Techniques for Low-Temperature Measurements", Oxford
       (2006), appendix A2.1 (tables of this kind).

    Examples
    --------
    >>> round(tabulated_conductivity(8.0, [4.0, 16.0], [1.0, 4.0]), 12)
    2.0
    """
    return log_log_interpolate(temperature, table_temperatures, table_values)


#: Heat-capacity model names used in material files -> the function that computes them.
HEAT_CAPACITY_MODELS: dict[str, Callable] = {
    "debye": debye_specific_heat,
    "debye-varying": varying_debye_specific_heat,
    "tabulated": tabulated_specific_heat,
}

#: Conductivity model names used in material files -> the function that computes them.
CONDUCTIVITY_MODELS: dict[str, Callable] = {
    "nist-log-polynomial": nist_log_polynomial,
    "nist-rational": nist_rational_conductivity,
    "hust-lankford": hust_lankford_conductivity,
    "tabulated": tabulated_conductivity,
}


def select_model(kind: str, name: str) -> Callable:
    """The model function of a kind ("heat capacity" or "conductivity") by its name.

    Parameters
    ----------
    kind : str
        ``"heat capacity"`` or ``"conductivity"``.
    name : str
        A key of :data:`HEAT_CAPACITY_MODELS` or :data:`CONDUCTIVITY_MODELS`.

    Returns
    -------
    callable
        The model function.

    Raises
    ------
    KeyError
        An unknown name (the library turns it into a message naming the file).

    Examples
    --------
    >>> select_model("heat capacity", "debye") is debye_specific_heat
    True
    """
    table = HEAT_CAPACITY_MODELS if kind == "heat capacity" else CONDUCTIVITY_MODELS
    return table[name]


def check_range(temperature, t_max: float, tolerance: float = 0.005) -> np.ndarray:
    """Boolean mask of temperatures above ``t_max`` (beyond a relative ``tolerance``).

    Parameters
    ----------
    temperature : ndarray
        Temperatures, [K].
    t_max : float
        Upper end of the validity range, [K].
    tolerance : float
        Relative slack, [-]; 0.5 % by default so that 300 K data serve 301 K.

    Returns
    -------
    ndarray of bool

    Examples
    --------
    >>> check_range(np.array([300.0, 301.0, 302.0]), 300.0).tolist()
    [False, False, True]
    """
    return np.asarray(temperature) > t_max * (1.0 + tolerance)


# --------------------------------------------------------------------------------------
# State functions: cumulative integrals from 0 K
# --------------------------------------------------------------------------------------


class CumulativeIntegral:
    r"""The integral from 0 to T of a non-negative function, tabulated once, fast to read.

    .. math:: F(T) = \int_0^T f(T')\,dT'

    The nodes are a logarithmic grid from ``t_top * 1e-5`` to ``t_top`` (``per_decade``
    nodes per decade) plus the ``breakpoints`` (kinks or jumps of f). Between nodes the
    integral is done by 6-point Gauss-Legendre quadrature (exact to rounding for
    smooth f on such short intervals); between the tabulated values F is read by cubic
    Hermite interpolation with the derivative F' = f known at both ends. Below the first
    node and above ``t_top`` the integral is done directly by 24-point quadrature.

    Parameters
    ----------
    function : callable
        f(T) for an ndarray of T, [unit of f].
    t_top : float
        Top of the table, [K].
    breakpoints : sequence of float
        Temperatures where f has a kink or a jump, [K].
    per_decade : int
        Nodes per decade of T.

    Notes
    -----
    The interpolation error is of order (h/T)^4 / 384 times the fourth logarithmic
    derivative, about 1e-9 relative at 200 nodes per decade; a test compares it with
    ``scipy.integrate.quad`` to 1e-6.

    Examples
    --------
    >>> F = CumulativeIntegral(lambda t: 3 * t**2, 10.0)
    >>> round(F(2.0), 9), round(F(20.0), 6)
    (8.0, 8000.0)
    """

    def __init__(
        self,
        function: Callable[[np.ndarray], np.ndarray],
        t_top: float,
        breakpoints: Sequence[float] = (),
        per_decade: int = 200,
    ) -> None:
        self.function = function
        self.t_top = float(t_top)
        t_low = self.t_top * 1e-5
        n = int(round(5 * per_decade)) + 1
        grid = np.geomspace(t_low, self.t_top, n)
        extra = [float(b) for b in breakpoints if t_low < b < self.t_top]
        grid = np.unique(np.concatenate([grid, extra]))
        self.grid = grid
        a, b = grid[:-1], grid[1:]
        h = b - a
        nodes = a[:, None] + h[:, None] * _GL6_X
        f_nodes = np.asarray(function(nodes.ravel()), float).reshape(nodes.shape)
        pieces = h * (f_nodes @ _GL6_W)
        start = self._direct(np.array([t_low]))[0]
        self.values = np.concatenate([[start], start + np.cumsum(pieces)])
        eps = 1e-10
        self.d_left = np.asarray(function(a * (1 + eps)), float)
        self.d_right = np.asarray(function(b * (1 - eps)), float)

    def _direct(self, t: np.ndarray, lower: float = 0.0) -> np.ndarray:
        """Integral from ``lower`` to each t by 24-point Gauss-Legendre quadrature."""
        span = t - lower
        out = np.zeros_like(span)
        ok = span > 0
        if np.any(ok):
            nodes = lower + span[ok, None] * _GL24_X
            f = np.asarray(self.function(nodes.ravel()), float).reshape(nodes.shape)
            out[ok] = span[ok] * (f @ _GL24_W)
        return out

    def __call__(self, temperature):
        t, scalar = _as_array(temperature)
        flat = t.ravel()
        out = np.empty_like(flat)
        grid = self.grid
        inside = (flat >= grid[0]) & (flat <= grid[-1])
        ti = flat[inside]
        i = np.clip(np.searchsorted(grid, ti, side="right") - 1, 0, len(grid) - 2)
        t0 = grid[i]
        h = grid[i + 1] - t0
        s = (ti - t0) / h
        s2 = s * s
        s3 = s2 * s
        out[inside] = (
            (2 * s3 - 3 * s2 + 1) * self.values[i]
            + (s3 - 2 * s2 + s) * h * self.d_left[i]
            + (-2 * s3 + 3 * s2) * self.values[i + 1]
            + (s3 - s2) * h * self.d_right[i]
        )
        below = flat < grid[0]
        if np.any(below):
            out[below] = self._direct(flat[below])
        above = flat > grid[-1]
        if np.any(above):
            out[above] = self.values[-1] + self._direct(flat[above], lower=grid[-1])
        return _back(out.reshape(t.shape), scalar)
