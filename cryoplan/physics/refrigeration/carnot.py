"""Ideal and real work of a refrigerator: the Carnot limit, the fraction of it reached, and
the trend of Strobridge's 1974 survey of real refrigerators.
"""

from __future__ import annotations

import math

import numpy as np

from .. import checks
from ..errors import InputError

# --------------------------------------------------------------------------------------
# ideal and real work


def carnot_specific_power(T_cold, T_ambient):
    """Carnot (reversible) input power per watt lifted, from the second law.

    .. math::

        \\frac{W}{Q} = \\frac{T_0}{T_c} - 1 \\quad (T_c < T_0), \\qquad 0 \\quad (T_c \\ge T_0)

    Parameters
    ----------
    T_cold : float or ndarray
        Temperature at which the heat is lifted, [K]; above 0 K.
    T_ambient : float or ndarray
        Temperature at which the heat is rejected, [K]; above 0 K.

    Returns
    -------
    float or ndarray
        Input power per unit of heat lifted, [W/W]; broadcast shape of the inputs.

    Raises
    ------
    cryoplan.errors.TemperatureError
        A temperature at or below 0 K, or not finite.

    Notes
    -----
    Exact for a reversible refrigerator between two reservoirs. Where ``T_cold`` is at or
    above ``T_ambient`` the heat flows to ambient by itself and no work is needed: the
    result is 0 (a heat engine could even yield work there, which a refrigerator plan does
    not count). Real refrigerators need several to a hundred times more; see
    :func:`survey_percent_carnot`.

    References
    ----------
    1. Barron, R. F., *Cryogenic Systems*, 2nd ed., Oxford University Press, 1985,
       chapter 5 (the ideal refrigerator).

    Examples
    --------
    >>> round(carnot_specific_power(4.2, 300.0), 2)
    70.43
    >>> carnot_specific_power([77.0, 300.0], 300.0).round(3)
    array([2.896, 0.   ])
    """
    Tc = checks.temperature(T_cold, "T_cold")
    T0 = checks.temperature(T_ambient, "T_ambient")
    return checks.scalar(np.where(Tc < T0, T0 / Tc - 1.0, 0.0))


def carnot_power(load, T_cold, T_ambient):
    """Carnot (reversible) input power to lift a heat load, from the second law.

    .. math::

        W = Q \\left( \\frac{T_0}{T_c} - 1 \\right)

    Parameters
    ----------
    load : float or ndarray
        Heat lifted at ``T_cold``, [W]; 0 or more.
    T_cold : float or ndarray
        Temperature of the load, [K].
    T_ambient : float or ndarray
        Heat-rejection temperature, [K].

    Returns
    -------
    float or ndarray
        Reversible input power, [W].

    Notes
    -----
    See :func:`carnot_specific_power` (0 where ``T_cold >= T_ambient``).

    References
    ----------
    1. Barron, R. F., *Cryogenic Systems*, 2nd ed., Oxford University Press, 1985.

    Examples
    --------
    >>> round(carnot_power(1.5, 4.2, 300.0), 1)
    105.6
    """
    Q = checks.nonnegative(load, "a heat load", "W")
    return checks.scalar(Q * np.asarray(carnot_specific_power(T_cold, T_ambient)))


def fraction_of_carnot(load, T_cold, T_ambient, input_power):
    """Fraction of Carnot (second-law efficiency) of a refrigerator: ideal over real input.

    .. math::

        \\eta = \\frac{Q (T_0 / T_c - 1)}{P}

    Parameters
    ----------
    load : float or ndarray
        Heat lifted, [W].
    T_cold : float or ndarray
        Temperature of the load, [K].
    T_ambient : float or ndarray
        Heat-rejection temperature, [K].
    input_power : float or ndarray
        Real (electrical) input power, [W]; above 0.

    Returns
    -------
    float or ndarray
        Fraction of Carnot, [-] (0.01 is 1 % of Carnot). Element by element: for a cooler
        with several stages pass the stages as arrays with the cooler's one input power and
        sum the result (each element is that stage's share).

    Raises
    ------
    cryoplan.errors.InputError
        An input power of 0 or less.

    Notes
    -----
    A result above 1 means the figures are inconsistent (no refrigerator beats Carnot).

    References
    ----------
    1. Strobridge, T. R., "Cryogenic refrigerators — an updated survey", NBS Technical
       Note 655, 1974 (efficiency as percent of Carnot).

    Examples
    --------
    A two-stage cooler lifting 40 W at 45 K and 1.5 W at 4.2 K on 7 kW:

    >>> shares = fraction_of_carnot([40.0, 1.5], [45.0, 4.2], 300.0, 7000.0)
    >>> round(float(shares.sum()), 4)
    0.0475
    """
    P = np.asarray(input_power, dtype=float)
    if not np.all(np.isfinite(P)) or np.any(P <= 0.0):
        raise InputError(
            "the input power of a refrigerator must be above 0",
            expected="an electrical input power above 0 W",
            found=f"{input_power!r}",
        )
    return checks.scalar(np.asarray(carnot_power(load, T_cold, T_ambient)) / P)


def input_power_at_fraction(load, T_cold, T_ambient, fraction):
    """Real input power of a refrigerator working at a given fraction of Carnot.

    .. math::

        P = \\frac{Q (T_0 / T_c - 1)}{\\eta}

    Parameters
    ----------
    load : float or ndarray
        Heat lifted, [W].
    T_cold : float or ndarray
        Temperature of the load, [K].
    T_ambient : float or ndarray
        Heat-rejection temperature, [K].
    fraction : float or ndarray
        Fraction of Carnot, [-], in (0, 1].

    Returns
    -------
    float or ndarray
        Input power, [W].

    Raises
    ------
    cryoplan.errors.InputError
        A fraction outside (0, 1].

    References
    ----------
    1. Barron, R. F., *Cryogenic Systems*, 2nd ed., Oxford University Press, 1985.

    Examples
    --------
    >>> round(input_power_at_fraction(1.5, 4.2, 300.0, 0.015))
    7043
    """
    eta = np.asarray(fraction, dtype=float)
    if not np.all(np.isfinite(eta)) or np.any(eta <= 0.0) or np.any(eta > 1.0):
        raise InputError(
            "a fraction of Carnot must lie above 0 and at most 1",
            expected="a fraction in (0, 1], e.g. 0.02 for 2 % of Carnot",
            found=f"{fraction!r}",
        )
    return checks.scalar(np.asarray(carnot_power(load, T_cold, T_ambient)) / eta)


# --------------------------------------------------------------------------------------
# survey trend of real refrigerators

#: Points on the trend line of Strobridge's survey of real refrigerators, as
#: (refrigeration capacity [W], percent of Carnot). From memory: Strobridge, T. R.,
#: "Cryogenic refrigerators — an updated survey", NBS Technical Note 655 (1974), the figure
#: of efficiency against capacity. The trend depends on capacity far more than on
#: temperature (the survey covers liquid-helium to liquid-nitrogen temperatures).
STROBRIDGE_TREND_POINTS: tuple[tuple[float, float], ...] = (
    (1.0, 1.0),  # from memory
    (10.0, 4.0),  # from memory
    (100.0, 10.0),  # from memory
    (1.0e3, 20.0),  # from memory
    (1.0e4, 30.0),  # from memory
)

#: Scatter of the survey's machines about the trend: most lie within this factor either
#: side (from memory, Strobridge 1974).
SURVEY_SCATTER_FACTOR = 2.0

# The trend as a parabola in log-log coordinates, log10(%) = a x + b x^2 with
# x = log10(Q / 1 W), through the recalled points at 1 W, 100 W and 10 kW; the points at
# 10 W and 1 kW are left to check the shape (tests/test_refrigeration.py).
_TREND_B = (math.log10(30.0) - 2.0 * math.log10(10.0)) / 8.0
_TREND_A = 0.5 * math.log10(10.0) - 2.0 * _TREND_B
_TREND_X_PEAK = -_TREND_A / (2.0 * _TREND_B)  # about 67 kW: the trend is held flat beyond
_SURVEY_RANGE = (0.1, 1.0e5)  # W


def survey_percent_carnot(capacity):
    """Percent of Carnot of real refrigerators against capacity: Strobridge's survey trend.

    .. math::

        \\log_{10} \\eta_\\% = a x + b x^2, \\qquad x = \\log_{10}(Q / 1\\,\\mathrm{W})

    with :math:`a` and :math:`b` set by the trend's points at 1 W (1 %), 100 W (10 %) and
    10 kW (30 %) (:data:`STROBRIDGE_TREND_POINTS`, from memory); held at its peak (about
    33 % near 67 kW) above that.

    Parameters
    ----------
    capacity : float or ndarray
        Refrigeration capacity of the machine, [W]; 0.1 W to 100 kW.

    Returns
    -------
    float or ndarray
        Typical efficiency, [percent of Carnot].

    Raises
    ------
    cryoplan.errors.InputError
        A capacity outside 0.1 W to 100 kW.

    Notes
    -----
    Guidance only. The trend is recalled from the survey's figure, not read from its table
    (from memory); machines scatter about a factor of :data:`SURVEY_SCATTER_FACTOR` either
    side (:func:`survey_percent_carnot_band`). The survey found efficiency depends on
    capacity much more than on temperature, from liquid-helium to liquid-nitrogen
    temperatures. Best between 1 W and 10 kW; 0.1 W to 1 W is an extrapolation. Small
    coolers of the decades after the survey do better, above all near 80 K: ter Brake and
    Wiegerinck [2] found 80 K coolers had gained about a factor of 5 in efficiency over
    earlier surveys, so for a small 80 K cooler this trend is pessimistic.

    References
    ----------
    1. Strobridge, T. R., "Cryogenic refrigerators — an updated survey", NBS Technical
       Note 655, National Bureau of Standards, 1974.
    2. ter Brake, H. J. M. and Wiegerinck, G. F. M., "Low-power cryocooler survey",
       Cryogenics 42 (2002) 705-718.

    Examples
    --------
    >>> round(survey_percent_carnot(1.0), 2)
    1.0
    >>> survey_percent_carnot([100.0, 1.0e4]).round(1)
    array([10., 30.])
    """
    Q = np.asarray(capacity, dtype=float)
    lo, hi = _SURVEY_RANGE
    if not np.all(np.isfinite(Q)) or np.any(Q < lo) or np.any(Q > hi):
        raise InputError(
            "the survey trend of real refrigerators covers 0.1 W to 100 kW only",
            expected="a refrigeration capacity from 0.1 W to 100 kW",
            found=f"{capacity!r} W",
        )
    x = np.minimum(np.log10(Q), _TREND_X_PEAK)
    return checks.scalar(10.0 ** (_TREND_A * x + _TREND_B * x * x))


def survey_percent_carnot_band(capacity):
    """The scatter band of real refrigerators about Strobridge's trend.

    .. math::

        \\eta_\\% / f \\le \\eta_\\% \\le f \\, \\eta_\\%, \\qquad f = 2

    Parameters
    ----------
    capacity : float or ndarray
        Refrigeration capacity, [W]; 0.1 W to 100 kW.

    Returns
    -------
    low, high : float or ndarray
        The band, [percent of Carnot]; ``high`` never above 100.

    Notes
    -----
    The factor :data:`SURVEY_SCATTER_FACTOR` is from memory of the survey's figure.

    References
    ----------
    1. Strobridge, T. R., "Cryogenic refrigerators — an updated survey", NBS Technical
       Note 655, 1974.

    Examples
    --------
    >>> low, high = survey_percent_carnot_band(100.0)
    >>> round(low, 1), round(high, 1)
    (5.0, 20.0)
    """
    mid = np.asarray(survey_percent_carnot(capacity))
    return (
        checks.scalar(mid / SURVEY_SCATTER_FACTOR),
        checks.scalar(np.minimum(mid * SURVEY_SCATTER_FACTOR, 100.0)),
    )
