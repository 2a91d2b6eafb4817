"""Helium-3: saturated vapour pressure, latent heat, and the budget of a helium-3 pot.

Pure physics: SI floats and numpy arrays in and out (kelvin, pascals, joules, moles,
watts, seconds). CoolProp carries no helium-3, so the published equations are implemented
here:

- 0.65 K to 3.2 K: the ITS-90 helium-3 vapour-pressure equation [1]_, T90 as a function of
  p, inverted numerically for p(T).
- 0.2 K to 0.65 K: the T62 helium-3 scale's full-range working equation [2]_ (valid from
  0.2 K to the critical point), ln p[mmHg] as a function of T, multiplied by the constant
  factor that makes it meet the ITS-90 equation at 0.65 K (:data:`T62_JOIN_FACTOR`, 2.7 %
  below 1: at one pressure the T62 scale reads 3 mK to 6 mK below T90 from 0.65 K to
  3.2 K, the known offset of the older helium scales, and at 0.65 K 3 mK of temperature
  are 2.7 % of pressure). This join is our choice, made so that p(T) and T(p) stay
  continuous and monotonic.
- The liquid's heat capacity from Greywall's fit [3]_ at the saturated-vapour molar
  volume.
- Latent heat from Clausius-Clapeyron with an ideal-gas vapour (below).

Arguments outside the range of the equations raise
:class:`cryoplan.physics.errors.TemperatureError`; other bad arguments
:class:`cryoplan.physics.errors.InputError`.

References
----------
.. [1] H. Preston-Thomas, "The International Temperature Scale of 1990 (ITS-90)",
   Metrologia 27, 3-10 (1990), equation (3) and table 3 (helium-3, 0.65 K to 3.2 K).
   The coefficients are from memory; they were not found in a public copy, and are
   checked in the tests against the independent T62 equation [2]_ (agreement within
   the few millikelvin between the two scales).
.. [2] R. H. Sherman, S. G. Sydoriak, T. R. Roberts, "The 1962 He3 scale of temperatures.
   II. Derivation", J. Res. Natl. Bur. Stand. 68A, 579-588 (1964): the full-range working
   equation; coefficients checked against the abstract of the public copy (p in mm Hg).
.. [3] D. S. Greywall, "Specific heat of normal liquid 3He", Phys. Rev. B 27, 2747-2766
   (1983): the fit of C_V/R against T and the molar volume V, 0.1 K to 2.5 K. The
   coefficients are as transcribed in a public low-temperature library (he3lib,
   functions/he3_normal.f), not re-read from the paper.
.. [4] F. Pobell, "Matter and Methods at Low Temperatures", 3rd ed., Springer (2007),
   chapter 6 (helium-3 cryostats) and chapter 2 (properties of liquid helium-3).
"""

from __future__ import annotations

from functools import lru_cache
from types import SimpleNamespace

import numpy as np

from .errors import InputError, TemperatureError

__all__ = [
    "ITS90_COEFFICIENTS",
    "T62_COEFFICIENTS",
    "T62_JOIN_FACTOR",
    "LIQUID_MOLAR_VOLUME",
    "T_MIN",
    "T_MAX",
    "its90_temperature",
    "t62_pressure",
    "pressure",
    "temperature_at_pressure",
    "latent_heat_molar",
    "liquid_heat_capacity",
    "evaporated_fraction",
    "pot_hold_time",
    "sorption_pump_heat",
    "recondensation_heat",
    "HELIUM_ON_CARBON_ADSORPTION_HEAT",
]

#: ITS-90 helium-3 equation, T90 = A0 + sum_i A_i [(ln(p/Pa) - B) / C]^i, 0.65 K to 3.2 K:
#: A0..A9, B, C. Preston-Thomas, Metrologia 27, 3 (1990), table 3; from memory (see the
#: module's references).
ITS90_COEFFICIENTS = {
    "A": (
        1.053447,
        0.980106,
        0.676380,
        0.372692,
        0.151656,
        -0.002263,
        0.006596,
        0.088966,
        -0.004770,
        -0.054943,
    ),
    "B": 7.3,
    "C": 4.3,
}
ITS90_RANGE = (0.65, 3.2)

#: T62 full-range working equation, ln(p/mmHg) = a_-1/T + a0 + a1 T + a2 T^2 + a3 T^3
#: + a4 T^4 + b ln T, 0.2 K to 3.324 K. Sherman, Sydoriak and Roberts, J. Res. NBS 68A,
#: 579 (1964), checked against the public abstract.
T62_COEFFICIENTS = {
    "a_-1": -2.49174,
    "a": (4.80386, -0.286001, 0.198608, -0.0502237, 0.00505486),
    "b": 2.24846,
}
T62_RANGE = (0.2, 3.324)
#: 1 mm Hg (conventional, 13.5951 g/cm^3 mercury under standard gravity), [Pa]: 101325/760.
MMHG = 101325.0 / 760.0

#: Lowest and highest temperatures of :func:`pressure` [K].
T_MIN, T_MAX = 0.2, 3.2

#: Molar volume of liquid helium-3 at zero pressure, [m^3/mol]: 36.837 cm^3/mol (the
#: zero-pressure term of Greywall's 1986 molar-volume fit, after Wheatley, Rev. Mod. Phys.
#: 47, 415 (1975), as transcribed in the he3lib library's he3_vm); the saturated-vapour
#: pressure is below 1 bar, where the volume changes by under 4 %.
LIQUID_MOLAR_VOLUME = 36.837e-6

# Greywall (1983), C_V/R for 0.1 K <= T < 2.5 K:
#   sum_{i=0..3} sum_{j=0..2} b_ij V^j T^-i + exp(-sum_j d_j V^j / T) sum_{i=1..3} sum_j c_ij V^j T^-i
# with V in cm^3/mol and T in K; transcribed from he3lib (see the module's references).
_GREYWALL_B = np.array(
    [
        [-6.5521193e-2, 1.3502371e-2, 0.0],
        [4.1359033e-2, 3.8233755e-4, -5.3468396e-5],
        [5.7976786e-3, -6.5611532e-4, 1.2689707e-5],
        [-3.8374623e-4, 3.2072581e-5, -5.3038906e-7],
    ]
)
_GREYWALL_C = np.array(
    [
        [-2.5482958e1, 1.6416936e0, -1.5110378e-2],
        [3.7882751e1, -2.8769188e0, 3.5751181e-2],
        [2.4412956e1, -2.4244083e0, 6.7775905e-2],
    ]
)
_GREYWALL_D = np.array([-7.1613436e0, 6.0525139e-1, -7.1295855e-3])
GREYWALL_RANGE = (0.1, 2.5)

#: Heat of adsorption of helium on activated charcoal, [J/mol]: of the order of 1 kJ/mol.
#: From memory: the binding energy of a helium atom on graphite is about 12 meV (about
#: 140 K, W. E. Carlos and M. W. Cole, Surf. Sci. 91, 339 (1980)), i.e. 1.2 kJ/mol;
#: charcoal's micropores bind more strongly, so treat it as an order of magnitude.
HELIUM_ON_CARBON_ADSORPTION_HEAT = 1.2e3


@lru_cache(maxsize=1)
def _constants() -> SimpleNamespace:
    from scipy import constants as c

    return SimpleNamespace(R=c.R)


def _t62_ln_p(t: np.ndarray) -> np.ndarray:
    a = T62_COEFFICIENTS["a"]
    poly = a[0] + t * (a[1] + t * (a[2] + t * (a[3] + t * a[4])))
    return T62_COEFFICIENTS["a_-1"] / t + poly + T62_COEFFICIENTS["b"] * np.log(t)


def _t62_dln_p_dt(t: np.ndarray) -> np.ndarray:
    a = T62_COEFFICIENTS["a"]
    poly = a[1] + t * (2 * a[2] + t * (3 * a[3] + t * 4 * a[4]))
    return -T62_COEFFICIENTS["a_-1"] / t**2 + poly + T62_COEFFICIENTS["b"] / t


def _its90_t(x: np.ndarray) -> np.ndarray:
    a = ITS90_COEFFICIENTS["A"]
    return sum(ai * x**i for i, ai in enumerate(a))


def _its90_dt_dx(x: np.ndarray) -> np.ndarray:
    a = ITS90_COEFFICIENTS["A"]
    return sum(i * ai * x ** (i - 1) for i, ai in enumerate(a) if i > 0)


def _its90_ln_p(t: np.ndarray) -> np.ndarray:
    """ln(p/Pa) of the ITS-90 equation at T90 = t, by bisection in x (T rises with x)."""
    b, c = ITS90_COEFFICIENTS["B"], ITS90_COEFFICIENTS["C"]
    low = np.full_like(t, (np.log(20.0) - b) / c)  # 20 Pa: below 0.65 K
    high = np.full_like(t, (np.log(2.0e5) - b) / c)  # 200 kPa: above 3.2 K
    for _ in range(60):
        mid = 0.5 * (low + high)
        below = _its90_t(mid) < t
        low = np.where(below, mid, low)
        high = np.where(below, high, mid)
    return b + c * 0.5 * (low + high)


def _join_factor() -> float:
    t = np.array(ITS90_RANGE[0])
    return float(np.exp(_its90_ln_p(t) - _t62_ln_p(t) - np.log(MMHG)))


#: Factor on the T62 pressure below 0.65 K that makes it meet the ITS-90 equation there.
T62_JOIN_FACTOR = _join_factor()


def _temperature(value, low: float, high: float, what: str) -> np.ndarray:
    t = np.asarray(value, dtype=float)
    if np.any(np.isnan(t)) or np.any(t < low * (1 - 1e-12)) or np.any(t > high * (1 + 1e-12)):
        raise TemperatureError(
            f"{what}: {value!r} K is outside {low:g} K to {high:g} K, the range of the "
            "published helium-3 equations used here"
        )
    return np.clip(t, low, high)


def _scalar(a: np.ndarray):
    return float(a) if np.ndim(a) == 0 else a


def its90_temperature(pressure_pa):
    """T90 of saturated helium-3 from its vapour pressure, the ITS-90 equation.

    .. math:: T_{90} = A_0 + \\sum_{i=1}^{9} A_i \\left[\\frac{\\ln(p/\\mathrm{Pa}) - B}{C}\\right]^i

    Parameters
    ----------
    pressure_pa : float or ndarray
        Vapour pressure, [Pa]; the equation holds where T90 is 0.65 K to 3.2 K.

    Returns
    -------
    float or ndarray
        T90, [K].

    References
    ----------
    .. [1] Preston-Thomas (1990), equation (3), table 3 (coefficients from memory).

    Examples
    --------
    >>> round(its90_temperature(101325.0), 3)   # normal boiling point of helium-3
    3.197
    """
    p = np.asarray(pressure_pa, dtype=float)
    if np.any(np.isnan(p)) or np.any(p <= 0):
        raise InputError("pressure: not above zero", expected="p > 0 Pa", found=repr(pressure_pa))
    x = (np.log(p) - ITS90_COEFFICIENTS["B"]) / ITS90_COEFFICIENTS["C"]
    return _scalar(_its90_t(x))


def t62_pressure(temperature):
    """Vapour pressure of helium-3 on the T62 scale, the full-range working equation.

    .. math::

        \\ln\\frac{p}{\\mathrm{mmHg}} = \\frac{a_{-1}}{T} + \\sum_{i=0}^{4} a_i T^i + b \\ln T

    Parameters
    ----------
    temperature : float or ndarray
        T62, [K], 0.2 K to 3.324 K.

    Returns
    -------
    float or ndarray
        p, [Pa] (1 mmHg = 101325/760 Pa).

    References
    ----------
    .. [1] Sherman, Sydoriak and Roberts (1964).

    Examples
    --------
    >>> round(t62_pressure(3.324) / 133.322, 0)   # the critical point, 873 mmHg
    872.0
    """
    t = _temperature(temperature, *T62_RANGE, "temperature")
    return _scalar(np.exp(_t62_ln_p(t)) * MMHG)


def pressure(temperature):
    """Saturated vapour pressure of helium-3: ITS-90 from 0.65 K, the joined T62 equation below.

    .. math::

        p(T) = \\begin{cases} p_{90}(T) & 0.65\\,\\mathrm{K} \\le T \\le 3.2\\,\\mathrm{K} \\\\
                f\\,p_{62}(T) & 0.2\\,\\mathrm{K} \\le T < 0.65\\,\\mathrm{K} \\end{cases}

    Parameters
    ----------
    temperature : float or ndarray
        T, [K], 0.2 K to 3.2 K.

    Returns
    -------
    float or ndarray
        p, [Pa].

    Notes
    -----
    f is :data:`T62_JOIN_FACTOR`. Near 0.3 K the T62 equation is itself derived from the
    liquid's thermodynamic data (its "experimental thermodynamic equation" scale, 0.2 K to
    2 K [1]_); expect a few per cent.

    References
    ----------
    .. [1] Sherman, Sydoriak and Roberts (1964).
    .. [2] Preston-Thomas (1990).

    Examples
    --------
    >>> round(pressure(0.3), 3)   # Pa
    0.244
    >>> round(pressure(1.0) / 1e3, 3)   # kPa
    1.16
    """
    t = _temperature(temperature, T_MIN, T_MAX, "temperature")
    high = t >= ITS90_RANGE[0]
    ln_p = np.where(
        high,
        _its90_ln_p(np.where(high, t, ITS90_RANGE[0])),
        _t62_ln_p(t) + np.log(MMHG * T62_JOIN_FACTOR),
    )
    return _scalar(np.exp(ln_p))


def temperature_at_pressure(pressure_pa):
    """Temperature of saturated helium-3 at a vapour pressure (inverse of :func:`pressure`).

    .. math:: p(T) = p_\\mathrm{given}

    Parameters
    ----------
    pressure_pa : float or ndarray
        p, [Pa], between p(0.2 K) and p(3.2 K).

    Returns
    -------
    float or ndarray
        T, [K].

    References
    ----------
    .. [1] Preston-Thomas (1990); Sherman, Sydoriak and Roberts (1964).

    Examples
    --------
    >>> round(temperature_at_pressure(pressure(0.3)), 6)
    0.3
    """
    p = np.asarray(pressure_pa, dtype=float)
    p_low, p_high = pressure(T_MIN), pressure(T_MAX)
    if np.any(np.isnan(p)) or np.any(p < p_low * (1 - 1e-9)) or np.any(p > p_high * (1 + 1e-9)):
        raise TemperatureError(
            f"pressure: {pressure_pa!r} Pa is outside {p_low:.3g} Pa to {p_high:.4g} Pa, the "
            "vapour pressures of helium-3 from 0.2 K to 3.2 K"
        )
    ln_p = np.log(np.clip(p, p_low, p_high))
    low = np.full_like(ln_p, np.log(T_MIN))
    high = np.full_like(ln_p, np.log(T_MAX))
    for _ in range(60):
        mid = 0.5 * (low + high)
        below = np.log(pressure(np.exp(mid))) < ln_p
        low = np.where(below, mid, low)
        high = np.where(below, high, mid)
    return _scalar(np.exp(0.5 * (low + high)))


def latent_heat_molar(temperature):
    """Molar latent heat of evaporation of helium-3, Clausius-Clapeyron with an ideal-gas vapour.

    .. math:: L = R T^2 \\frac{d \\ln p}{d T}

    (the exact Clapeyron equation L = T (v_g - v_l) dp/dT with v_g = RT/p and v_l = 0).

    Parameters
    ----------
    temperature : float or ndarray
        T, [K], 0.2 K to 3.2 K.

    Returns
    -------
    float or ndarray
        L, [J/mol].

    Notes
    -----
    The derivative is analytic on either equation (dT90/dx of the ITS-90 polynomial; the
    T62 expression below 0.65 K); where they meet, at 0.65 K, L steps by 0.6 %. The approximation's error grows with the pressure:
    at 0.3 K (p ~ 0.25 Pa) the vapour's molar volume is ~10^4 m^3 and both the liquid
    volume (v_l / v_g ~ 4e-9) and the second virial coefficient (B p / RT ~ 1e-5 for
    |B| ~ 100 cm^3/mol, from memory) are negligible; at 3 K (p ~ 80 kPa) v_l / v_g is
    already 0.12 and B p / RT about -0.3, so the ideal form overstates L by roughly a
    third there. Use it below about 1.5 K (v_l / v_g < 0.3 %) for budgets.

    References
    ----------
    .. [1] Pobell (2007), section 6.1 (Clausius-Clapeyron for the helium baths).

    Examples
    --------
    >>> round(latent_heat_molar(0.3), 1)   # J/mol
    26.2
    """
    c = _constants()
    t = _temperature(temperature, T_MIN, T_MAX, "temperature")
    high = t >= ITS90_RANGE[0]
    th = np.where(high, t, ITS90_RANGE[0])
    x = (_its90_ln_p(th) - ITS90_COEFFICIENTS["B"]) / ITS90_COEFFICIENTS["C"]
    dlnp_its = ITS90_COEFFICIENTS["C"] / _its90_dt_dx(x)
    dlnp = np.where(high, dlnp_its, _t62_dln_p_dt(t))
    return _scalar(c.R * t**2 * dlnp)


def liquid_heat_capacity(temperature, molar_volume=LIQUID_MOLAR_VOLUME):
    """Molar heat capacity of normal liquid helium-3, Greywall's fit (0.1 K to 2.5 K).

    .. math::

        \\frac{C_V}{R} = \\sum_{i=0}^{3}\\sum_{j=0}^{2} b_{ij} V^j T^{-i}
          + e^{-\\sum_j d_j V^j / T} \\sum_{i=1}^{3}\\sum_{j=0}^{2} c_{ij} V^j T^{-i}

    Parameters
    ----------
    temperature : float or ndarray
        T, [K], 0.1 K to 2.5 K.
    molar_volume : float, optional
        V, [m^3/mol]; the saturated liquid's by default.

    Returns
    -------
    float or ndarray
        C_V, [J/(K mol)]; used for the saturated liquid's heat capacity (C_sat ~ C_P ~
        C_V; the differences, of order T V alpha^2 / kappa, are not included).

    References
    ----------
    .. [1] Greywall (1983), as transcribed in he3lib (see the module's references).

    Examples
    --------
    >>> round(liquid_heat_capacity(0.5) / 8.314462618, 2)   # C/R
    0.4
    """
    c = _constants()
    t = _temperature(temperature, *GREYWALL_RANGE, "temperature")
    v = float(molar_volume) * 1e6  # cm^3/mol
    vj = np.array([1.0, v, v * v])
    b = _GREYWALL_B @ vj  # b_i, i = 0..3
    cc = _GREYWALL_C @ vj  # c_i, i = 1..3
    d = float(_GREYWALL_D @ vj)
    s1 = sum(b[i] * t ** (-i) for i in range(4))
    s2 = sum(cc[i - 1] * t ** (-i) for i in range(1, 4))
    return _scalar(c.R * (s1 + np.exp(-d / t) * s2))


def evaporated_fraction(condense_temperature, pot_temperature):
    """Share of a helium-3 charge that evaporates to cool its own liquid to the pot's temperature.

    Each evaporated dn takes L dn from the remaining liquid n, which cools by dT:

    .. math:: \\frac{dn}{n} = \\frac{C_l(T)}{L(T)}\\,dT
              \\;\\Rightarrow\\; f = 1 - \\exp\\left[-\\int_{T_\\mathrm{pot}}^{T_c}
              \\frac{C_l(T)}{L(T)}\\,dT\\right]

    Parameters
    ----------
    condense_temperature : float
        T_c, where the charge is condensed (the 1 K pot or the 4 K plate's condenser),
        [K], up to 2.5 K (the liquid heat-capacity fit's limit).
    pot_temperature : float
        T_pot, the pot's temperature under its load, [K], from 0.2 K.

    Returns
    -------
    float
        f in [0, 1), [-].

    Notes
    -----
    Integrated with Gauss-Legendre quadrature (64 nodes on each side of 0.65 K, where
    the integrand is smooth). The
    ideal-gas latent heat is used, which is what makes the result low by at most a few
    per cent for T_c up to 2 K (see :func:`latent_heat_molar`).

    References
    ----------
    .. [1] Pobell (2007), section 6.2 (the helium-3 cryostat: the share of the charge
       evaporated on cooling the liquid).

    Examples
    --------
    >>> round(evaporated_fraction(1.5, 0.3), 3)
    0.122
    """
    tc = float(
        _temperature(condense_temperature, T_MIN, GREYWALL_RANGE[1], "condense_temperature")
    )
    tp = float(_temperature(pot_temperature, T_MIN, GREYWALL_RANGE[1], "pot_temperature"))
    if tp > tc:
        raise InputError(
            "pot_temperature: above the condensation temperature",
            expected="T_pot <= T_condense",
            found=f"{tp:g} K > {tc:g} K",
        )
    if tp == tc:
        return 0.0
    nodes, weights = np.polynomial.legendre.leggauss(64)
    # split where the vapour-pressure equations meet (L steps by 0.6 % at 0.65 K)
    join = ITS90_RANGE[0]
    pieces = [(tp, join), (join, tc)] if tp < join < tc else [(tp, tc)]
    integral = 0.0
    for a, b in pieces:
        t = 0.5 * (b - a) * nodes + 0.5 * (b + a)
        integrand = np.asarray(liquid_heat_capacity(t)) / np.asarray(latent_heat_molar(t))
        integral += 0.5 * (b - a) * float(np.sum(weights * integrand))
    return float(-np.expm1(-integral))


def pot_hold_time(charge, load, condense_temperature, pot_temperature, usable_fraction=1.0):
    """Hold time of a single-shot helium-3 pot: the liquid left after cooling, over the load.

    .. math:: t = \\frac{n\\,\\phi\\,(1 - f)\\,L(T_\\mathrm{pot})}{\\dot Q}

    Parameters
    ----------
    charge : float
        n, helium-3 condensed, [mol].
    load : float
        Q, heat load on the pot at T_pot, [W].
    condense_temperature : float
        T_c, [K].
    pot_temperature : float
        T_pot, [K].
    usable_fraction : float, optional
        phi, the share of the charge that condenses into the pot (the rest stays in the
        pump, lines and as film), [-], default 1.

    Returns
    -------
    float
        t, [s].

    References
    ----------
    .. [1] Pobell (2007), section 6.2.

    Examples
    --------
    >>> round(pot_hold_time(0.1, 100e-6, 1.5, 0.3) / 3600, 1)   # hours
    6.4
    """
    n = float(charge)
    q = float(load)
    phi = float(usable_fraction)
    if not n > 0:
        raise InputError("charge: not above zero", expected="n > 0 mol", found=repr(charge))
    if not q > 0:
        raise InputError("load: not above zero", expected="Q > 0 W", found=repr(load))
    if not 0 < phi <= 1:
        raise InputError(
            "usable_fraction: outside (0, 1]", expected="0 < phi <= 1", found=repr(usable_fraction)
        )
    f = evaporated_fraction(condense_temperature, pot_temperature)
    return n * phi * (1 - f) * float(latent_heat_molar(pot_temperature)) / q


def sorption_pump_heat(charge, adsorption_heat=HELIUM_ON_CARBON_ADSORPTION_HEAT):
    """Heat of adsorption a charcoal pump releases as it takes up a helium-3 charge.

    .. math:: Q = n\\,q_\\mathrm{ads}

    Parameters
    ----------
    charge : float or ndarray
        n, [mol].
    adsorption_heat : float, optional
        q_ads, [J/mol]; :data:`HELIUM_ON_CARBON_ADSORPTION_HEAT` (an order of magnitude,
        from memory) by default.

    Returns
    -------
    float or ndarray
        Q, [J]: released into the stage the pump is sunk to while it pumps; the same heat
        must be supplied to desorb the charge on recycling, together with the heat to warm
        the charcoal and its can (from their own materials' enthalpy), which the stage the
        pump's heat switch closes to receives when the pump is cooled again.

    References
    ----------
    .. [1] W. E. Carlos, M. W. Cole, Surf. Sci. 91, 339 (1980) (helium on graphite), from
       memory.

    Examples
    --------
    >>> sorption_pump_heat(0.1)
    120.0
    """
    n = np.asarray(charge, dtype=float)
    if np.any(np.isnan(n)) or np.any(n < 0):
        raise InputError("charge: below zero", expected="n >= 0 mol", found=repr(charge))
    return _scalar(n * float(adsorption_heat))


def recondensation_heat(charge, gas_temperature, condense_temperature):
    """Heat the condenser receives to cool a helium-3 charge's gas and condense it.

    .. math:: Q = n \\left[\\tfrac52 R (T_\\mathrm{gas} - T_c) + L(T_c)\\right]

    Parameters
    ----------
    charge : float or ndarray
        n, [mol].
    gas_temperature : float or ndarray
        T_gas, the gas's temperature as the pump desorbs it (tens of kelvin), [K].
    condense_temperature : float
        T_c, the condenser's temperature, [K], up to 3.2 K.

    Returns
    -------
    float or ndarray
        Q, [J].

    Notes
    -----
    Ideal monatomic gas, c_p = 5R/2 (exact for an ideal monatomic gas; helium-3 below
    1 bar and above 4 K departs from it by a few per cent), and the ideal-gas latent
    heat of :func:`latent_heat_molar`.

    References
    ----------
    .. [1] Pobell (2007), section 6.2.

    Examples
    --------
    >>> round(recondensation_heat(0.1, 40.0, 1.5), 1)   # J
    85.0
    """
    c = _constants()
    n = np.asarray(charge, dtype=float)
    tg = np.asarray(gas_temperature, dtype=float)
    if np.any(tg < np.asarray(condense_temperature)):
        raise TemperatureError("gas_temperature: below the condensation temperature")
    latent = np.asarray(latent_heat_molar(condense_temperature))
    return _scalar(n * (2.5 * c.R * (tg - np.asarray(condense_temperature)) + latent))
