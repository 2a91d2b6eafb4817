"""Refrigeration: Carnot and real work, cooler capacity curves and maps, cooldown time, steady state.

The pure physics of cooling a cryostat with a cryocooler. SI floats and numpy arrays in and
out: kelvin, watts, joules, seconds. Nothing here reads files, parses units or prints.

Contents
--------
- Ideal work: :func:`carnot_specific_power`, :func:`carnot_power`,
  :func:`fraction_of_carnot`, :func:`input_power_at_fraction`.
- Real refrigerators as guidance: :func:`survey_percent_carnot` and
  :func:`survey_percent_carnot_band` (the trend of Strobridge's 1974 survey).
- Cooler capacity: :class:`CapacityCurve` (one stage, W against K) and
  :class:`CapacityMap` (two stages, each stage's capacity against both temperatures).
- Thermal links between stages: :class:`Link`, :func:`link_conductance`.
- Cooldown-time integration: :class:`CooldownStage`, :func:`simulate_cooldown`,
  :class:`CooldownResult`.
- Steady state under load: :func:`steady_state`, :class:`SteadyStateResult`.
- Reversible work to cool a mass: :func:`reversible_work`,
  :func:`reversible_work_from_heat_capacity`.

Shapes
------
Wherever a function takes "the stage-temperature vector" ``T``, it has shape ``(n,)`` or
``(n, k)`` (``n`` stages, ``k`` states evaluated at once) and the function returns the same
shape: row ``i`` belongs to stage ``i``.
"""

from __future__ import annotations

import bisect
import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass

import numpy as np
from scipy import integrate, optimize

from . import checks
from .errors import InputError, TemperatureError

__all__ = [
    "carnot_specific_power",
    "carnot_power",
    "fraction_of_carnot",
    "input_power_at_fraction",
    "survey_percent_carnot",
    "survey_percent_carnot_band",
    "SURVEY_SCATTER_FACTOR",
    "STROBRIDGE_TREND_POINTS",
    "CapacityCurve",
    "CapacityMap",
    "Link",
    "link_conductance",
    "CooldownStage",
    "CooldownResult",
    "simulate_cooldown",
    "SteadyStateResult",
    "steady_state",
    "CoolingShortfallError",
    "reversible_work",
    "reversible_work_from_heat_capacity",
]

SECONDS_PER_DAY = 86400.0


class CoolingShortfallError(InputError):
    """A stage whose cooler capacity is below its load at every temperature up to ambient.

    The stage never gets cold. ``shortfall`` is the smallest amount [W] by which the
    capacity falls short of the load over the range, and ``temperature`` [K] where it is
    smallest; ``stage`` names the stage. A subclass of
    :class:`~cryoplan.errors.InputError`: the command line shows it and exits with code 2;
    the caller may set ``file``, ``line`` and ``key``.

    Examples
    --------
    >>> curve = CapacityCurve([[4.2, 1.5], [10, 5], [300, 5]])
    >>> try:
    ...     steady_state([curve], [7.0], targets=[4.2], ambient=300.0, names=["cold plate"])
    ... except CoolingShortfallError as err:
    ...     print(err.stage, round(err.shortfall, 3))
    cold plate 2.0
    """

    def __init__(
        self, message: str, *, stage: str, shortfall: float, temperature: float, **where
    ) -> None:
        self.stage = stage
        self.shortfall = shortfall
        self.temperature = temperature
        super().__init__(message, **where)


# --------------------------------------------------------------------------------------
# small helpers


def _short(obj, limit: int = 60) -> str:
    text = repr(obj)
    return text if len(text) <= limit else text[: limit - 3] + "..."


def _is_number(x) -> bool:
    return isinstance(x, (int, float, np.integer, np.floating)) and not isinstance(
        x, (bool, np.bool_)
    )


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


# --------------------------------------------------------------------------------------
# cooler capacity

_PAIRS_EXPECTED = "a list of [K, W] pairs, e.g. [[4.2, 1.5], [10, 5], [300, 5]]"


def _table_key(key: str | None, i: int) -> str | None:
    return f"{key}[{i}]" if key else None


class CapacityCurve:
    """Capacity of one cooler stage against its temperature, linear between datasheet points.

    .. math::

        Q(T) = Q_i + (Q_{i+1} - Q_i) \\frac{T - T_i}{T_{i+1} - T_i}, \\quad T_i \\le T \\le T_{i+1}

    Parameters
    ----------
    points : sequence of [K, W] pairs
        Temperatures [K] strictly increasing, 0 K or above; capacities [W], 0 or more.
        As a datasheet gives them; a TOML list of lists or an ``(m, 2)`` array.
    base_temperature : float, optional
        The stage's no-load base temperature, [K], below the first point: the capacity
        falls linearly from the first point to zero there. By default, the temperature
        where the first segment extrapolates to zero capacity (not below 0 K), or 0 K where
        the first segment does not fall toward low temperature or there is one point.
        Moot where the first point already has zero capacity.
    key : str, optional
        Where the table sits in the plan (e.g. ``cooler.stage[0].capacity``), for messages.

    Raises
    ------
    cryoplan.errors.InputError
        Not a list of [K, W] pairs; temperatures not increasing; a negative temperature or
        capacity; a base temperature not below the first point. ``expected`` and ``found``
        are filled; the caller may set ``file`` and ``line`` on the error.

    Notes
    -----
    Above the last point the capacity stays at the last value. Below the first point a
    cooler has at most the first point's capacity, falling to zero at its base
    temperature: near its base temperature a cooler's capacity is close to linear in
    temperature (common practice in reading datasheets). Below the base temperature the
    capacity is 0.

    Examples
    --------
    >>> curve = CapacityCurve([[4.2, 1.5], [10, 5], [300, 5]])
    >>> curve([4.2, 7.1, 400.0]).round(3)
    array([1.5 , 3.25, 5.  ])
    >>> round(curve.base_temperature, 3)
    1.714
    >>> curve(1.0)
    0.0
    """

    def __init__(
        self,
        points,
        *,
        base_temperature: float | None = None,
        key: str | None = None,
    ) -> None:
        T, Q = _parse_pairs(points, key)
        if T[0] == 0.0 and Q[0] > 0.0:
            raise InputError(
                "a cooler has no capacity at 0 K (third law)",
                key=_table_key(key, 0),
                expected="a capacity of 0 W at 0 K, or a first point above 0 K",
                found=f"{Q[0]:g} W at 0 K",
            )
        if base_temperature is None:
            if Q[0] == 0.0:
                base = T[0]
            elif len(T) >= 2 and Q[1] > Q[0]:
                slope = (Q[1] - Q[0]) / (T[1] - T[0])
                base = max(T[0] - Q[0] / slope, 0.0)
            else:
                base = 0.0
        else:
            if not _is_number(base_temperature) or not math.isfinite(base_temperature):
                raise InputError(
                    "a base temperature must be a number of kelvin",
                    key=key,
                    expected="a temperature in K below the first point",
                    found=_short(base_temperature),
                )
            base = float(base_temperature)
            if base < 0.0 or (base >= T[0] and Q[0] > 0.0):
                raise InputError(
                    "the base temperature must lie at or above 0 K and below the first point",
                    key=key,
                    expected=f"0 K to below {T[0]:g} K",
                    found=f"{base:g} K",
                )
        self.points = np.column_stack([T, Q])
        self.base_temperature = float(min(base, T[0]))
        if Q[0] > 0.0 and self.base_temperature < T[0]:
            self._T = np.concatenate([[self.base_temperature], T])
            self._Q = np.concatenate([[0.0], Q])
        else:
            self._T, self._Q = T, Q

    def __call__(self, T):
        """Capacity at temperature ``T`` [K] (float or ndarray), [W]."""
        a = np.asarray(T, dtype=float)
        if not np.all(np.isfinite(a)) or np.any(a < 0.0):
            raise TemperatureError(f"a stage temperature must be 0 K or above, found {T!r}")
        return checks.scalar(np.interp(a, self._T, self._Q, left=0.0))

    def _fast(self, T: np.ndarray) -> np.ndarray:
        return np.interp(T, self._T, self._Q, left=0.0)

    @property
    def maximum(self) -> float:
        """The largest capacity in the table, [W]."""
        return float(self._Q.max())

    def __repr__(self) -> str:
        return (
            f"CapacityCurve({self.points.tolist()!r}, base_temperature={self.base_temperature:g})"
        )


def _parse_pairs(points, key: str | None) -> tuple[np.ndarray, np.ndarray]:
    if isinstance(points, np.ndarray):
        if points.ndim != 2 or points.shape[1] != 2 or points.shape[0] == 0:
            raise InputError(
                "a cooler capacity table must be a list of [K, W] pairs",
                key=key,
                expected=_PAIRS_EXPECTED,
                found=f"an array of shape {points.shape}",
            )
        points = points.tolist()
    if isinstance(points, (str, bytes, dict)) or not isinstance(points, Sequence):
        raise InputError(
            "a cooler capacity table must be a list of [K, W] pairs",
            key=key,
            expected=_PAIRS_EXPECTED,
            found=_short(points),
        )
    if len(points) == 0:
        raise InputError(
            "a cooler capacity table needs at least one [K, W] pair",
            key=key,
            expected=_PAIRS_EXPECTED,
            found="an empty list",
        )
    T = np.empty(len(points))
    Q = np.empty(len(points))
    for i, pair in enumerate(points):
        where = _table_key(key, i)
        if (
            isinstance(pair, (str, bytes, dict))
            or not isinstance(pair, (Sequence, np.ndarray))
            or len(pair) != 2
            or not all(_is_number(v) for v in pair)
        ):
            raise InputError(
                f"entry {i + 1} of the capacity table is not a [K, W] pair of numbers",
                key=where,
                expected="a pair [temperature in K, capacity in W], e.g. [4.2, 1.5]",
                found=_short(pair),
            )
        k, w = float(pair[0]), float(pair[1])
        if not (math.isfinite(k) and math.isfinite(w)):
            raise InputError(
                f"entry {i + 1} of the capacity table is not finite",
                key=where,
                expected="finite numbers",
                found=_short(pair),
            )
        if k < 0.0:
            raise InputError(
                f"entry {i + 1} of the capacity table has a temperature below 0 K",
                key=where,
                expected="a temperature of 0 K or more",
                found=f"{k:g} K",
            )
        if w < 0.0:
            raise InputError(
                f"entry {i + 1} of the capacity table has a negative capacity",
                key=where,
                expected="a capacity of 0 W or more",
                found=f"{w:g} W",
            )
        if i > 0 and k <= T[i - 1]:
            raise InputError(
                "the temperatures of a capacity table must increase from pair to pair",
                key=where,
                expected=f"a temperature above {T[i - 1]:g} K",
                found=f"{k:g} K after {T[i - 1]:g} K",
            )
        T[i], Q[i] = k, w
    return T, Q


class CapacityMap:
    """Capacities of a two-stage cooler against both stage temperatures, bilinear on a grid.

    .. math::

        Q_s(T_1, T_2) = \\sum_{a,b \\in \\{0,1\\}} w_a(T_1)\\, w_b(T_2)\\,
        Q_s[i + a, j + b], \\qquad s = 1, 2

    with :math:`w` the linear weights within the grid cell :math:`(i, j)`.

    Parameters
    ----------
    first_stage_temperatures : sequence of float
        Grid of first-stage temperatures, [K], strictly increasing, at least two.
    second_stage_temperatures : sequence of float
        Grid of second-stage temperatures, [K], strictly increasing, at least two.
    first_stage_capacity : 2-D sequence of float
        First-stage capacity, [W], shape ``(len(first), len(second))``: row ``i`` at the
        ``i``-th first-stage temperature, column ``j`` at the ``j``-th second-stage one.
    second_stage_capacity : 2-D sequence of float
        Second-stage capacity, [W], same shape.
    base_temperatures : (float, float), optional
        No-load base temperature of each stage, [K] (default 0 K, 0 K). Below the grid's
        lowest temperature of a stage, that stage's capacity falls linearly to zero at its
        base temperature. Moot where the grid's lowest line already has zero capacity, as a
        datasheet's no-load line has.
    key : str, optional
        Where the map sits in the plan, for messages.

    Raises
    ------
    cryoplan.errors.InputError
        Grids not increasing or too short; shapes that do not match; negative or undefined
        capacities.

    Notes
    -----
    Above the grid each capacity stays at its edge value (clamped); below the grid the
    other stage's capacity is clamped too. Datasheets often give the map the other way
    round (a grid of applied loads, with the stage temperatures they produce); such a map
    must be turned into a temperature grid before it is given here.

    Examples
    --------
    >>> cmap = CapacityMap([30, 60], [3, 10], [[10, 10], [70, 70]], [[1, 4], [0, 3]])
    >>> q1, q2 = cmap(45.0, 3.0)
    >>> float(q1), float(q2)
    (40.0, 0.5)
    >>> cmap.stage_capacities(np.array([45.0, 1.5])).round(3)
    array([40.  ,  0.25])
    """

    def __init__(
        self,
        first_stage_temperatures,
        second_stage_temperatures,
        first_stage_capacity,
        second_stage_capacity,
        *,
        base_temperatures: tuple[float, float] = (0.0, 0.0),
        key: str | None = None,
    ) -> None:
        def sub(name: str) -> str | None:
            return f"{key}.{name}" if key else None

        t1 = _grid_axis(first_stage_temperatures, sub("first_stage_temperatures"))
        t2 = _grid_axis(second_stage_temperatures, sub("second_stage_temperatures"))
        q1 = _grid_values(first_stage_capacity, (t1.size, t2.size), sub("first_stage_capacity"))
        q2 = _grid_values(second_stage_capacity, (t1.size, t2.size), sub("second_stage_capacity"))
        try:
            b1, b2 = (float(b) for b in base_temperatures)
        except (TypeError, ValueError):
            raise InputError(
                "base temperatures must be a pair of temperatures in K",
                key=sub("base_temperatures"),
                expected="two temperatures in K",
                found=_short(base_temperatures),
            ) from None
        for b, t, name in ((b1, t1, "first"), (b2, t2, "second")):
            if not (math.isfinite(b) and 0.0 <= b < t[0]):
                raise InputError(
                    f"the {name} stage's base temperature must lie at or above 0 K and "
                    "below its grid",
                    key=sub("base_temperatures"),
                    expected=f"0 K to below {t[0]:g} K",
                    found=f"{b:g} K",
                )
        self.first_stage_temperatures = t1
        self.second_stage_temperatures = t2
        self.first_stage_capacity = q1
        self.second_stage_capacity = q2
        self.base_temperatures = (b1, b2)
        # evaluation tables: both stages' capacities side by side, and plain lists for the
        # scalar path the integrator uses
        self._flat = np.stack([q1.ravel(), q2.ravel()])
        self._lo = np.array([[t1[0]], [t2[0]]])
        self._hi = np.array([[t1[-1]], [t2[-1]]])
        self._base = np.array([[b1], [b2]])
        self._x, self._y = t1.tolist(), t2.tolist()
        self._q1, self._q2 = q1.tolist(), q2.tolist()

    def __call__(self, T1, T2):
        """Capacities ``(Q1, Q2)`` [W] at first- and second-stage temperatures [K]."""
        a1 = np.asarray(T1, dtype=float)
        a2 = np.asarray(T2, dtype=float)
        for a, raw in ((a1, T1), (a2, T2)):
            if not np.all(np.isfinite(a)) or np.any(a < 0.0):
                raise TemperatureError(f"a stage temperature must be 0 K or above, found {raw!r}")
        a1, a2 = np.broadcast_arrays(a1, a2)
        q1, q2 = self._fast(a1, a2)
        return checks.scalar(q1), checks.scalar(q2)

    def stage_capacities(self, T: np.ndarray) -> np.ndarray:
        """Capacities of both stages, [W], from the stage-temperature vector ``T`` [K].

        ``T`` has shape ``(2,)`` or ``(2, k)``; the result has the same shape.
        """
        T = np.asarray(T, dtype=float)
        if T.size == 2:
            return np.array(self._scalar(float(T.flat[0]), float(T.flat[1]))).reshape(T.shape)
        return self._both(T.reshape(2, -1)).reshape(T.shape)

    def _scalar(self, t1: float, t2: float) -> tuple[float, float]:
        """The same bilinear interpolation in plain Python, for one state (fast)."""
        x, y = self._x, self._y
        u = min(max(t1, x[0]), x[-1])
        v = min(max(t2, y[0]), y[-1])
        i = min(bisect.bisect_right(x, u) - 1, len(x) - 2)
        j = min(bisect.bisect_right(y, v) - 1, len(y) - 2)
        wu = (u - x[i]) / (x[i + 1] - x[i])
        wv = (v - y[j]) / (y[j + 1] - y[j])
        out = []
        for q, t, edge, base in (
            (self._q1, t1, x[0], self.base_temperatures[0]),
            (self._q2, t2, y[0], self.base_temperatures[1]),
        ):
            a, b = q[i], q[i + 1]
            val = (1.0 - wv) * ((1.0 - wu) * a[j] + wu * b[j]) + wv * (
                (1.0 - wu) * a[j + 1] + wu * b[j + 1]
            )
            if t < edge:
                val *= min(max((t - base) / (edge - base), 0.0), 1.0)
            out.append(val)
        return out[0], out[1]

    def _fast(self, T1: np.ndarray, T2: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        shape = T1.shape
        q = self._both(np.stack([T1.ravel(), T2.ravel()]))
        return q[0].reshape(shape), q[1].reshape(shape)

    def _both(self, T: np.ndarray) -> np.ndarray:
        """Bilinear capacities of both stages for T of shape (2, k); a few ufuncs only."""
        x, y = self.first_stage_temperatures, self.second_stage_temperatures
        c = np.minimum(np.maximum(T, self._lo), self._hi)
        i = np.minimum(np.searchsorted(x, c[0], side="right") - 1, x.size - 2)
        j = np.minimum(np.searchsorted(y, c[1], side="right") - 1, y.size - 2)
        wu = (c[0] - x[i]) / (x[i + 1] - x[i])
        wv = (c[1] - y[j]) / (y[j + 1] - y[j])
        k = i * y.size + j
        q = self._flat
        val = (1.0 - wv) * ((1.0 - wu) * q[:, k] + wu * q[:, k + y.size]) + wv * (
            (1.0 - wu) * q[:, k + 1] + wu * q[:, k + y.size + 1]
        )
        scale = np.minimum(np.maximum((T - self._base) / (self._lo - self._base), 0.0), 1.0)
        return val * scale

    def __repr__(self) -> str:
        return (
            f"CapacityMap({self.first_stage_temperatures.tolist()!r}, "
            f"{self.second_stage_temperatures.tolist()!r}, ...)"
        )


def _grid_axis(values, key: str | None) -> np.ndarray:
    try:
        a = np.asarray(values, dtype=float)
    except (TypeError, ValueError):
        a = None
    if a is None or a.ndim != 1 or a.size < 2:
        raise InputError(
            "a capacity map needs a list of at least two temperatures for each stage",
            key=key,
            expected="a list of temperatures in K, e.g. [30, 45, 60, 300]",
            found=_short(values),
        )
    if not np.all(np.isfinite(a)) or np.any(a < 0.0):
        raise InputError(
            "a capacity map's temperatures must be finite and 0 K or above",
            key=key,
            expected="temperatures of 0 K or more",
            found=_short(values),
        )
    if np.any(np.diff(a) <= 0.0):
        k = int(np.argmax(np.diff(a) <= 0.0)) + 1
        raise InputError(
            "the temperatures of a capacity map must increase from one to the next",
            key=f"{key}[{k}]" if key else None,
            expected=f"a temperature above {a[k - 1]:g} K",
            found=f"{a[k]:g} K after {a[k - 1]:g} K",
        )
    return a


def _grid_values(values, shape: tuple[int, int], key: str | None) -> np.ndarray:
    try:
        a = np.asarray(values, dtype=float)
    except (TypeError, ValueError):
        a = None
    if a is None or a.shape != shape:
        raise InputError(
            "a capacity map's capacities must form a table of one row per first-stage "
            "temperature and one column per second-stage temperature",
            key=key,
            expected=f"{shape[0]} rows of {shape[1]} capacities in W",
            found=f"shape {a.shape}" if a is not None else _short(values),
        )
    if not np.all(np.isfinite(a)) or np.any(a < 0.0):
        raise InputError(
            "a capacity map's capacities must be finite and 0 W or more",
            key=key,
            expected="capacities of 0 W or more",
            found=f"{float(np.nanmin(a)) if np.any(np.isfinite(a)) else a.flat[0]:g} W",
        )
    return a


# --------------------------------------------------------------------------------------
# links between stages


@dataclass(frozen=True)
class Link:
    """A thermal link between two stages: a given conductance, or a conductor of given shape.

    Heat flows into ``first`` at :math:`G (T_{second} - T_{first})`, or, for a conductor of
    cross-section :math:`A` and length :math:`L`, at
    :math:`(A/L) \\int_{T_{first}}^{T_{second}} k\\,dT`; the same heat leaves ``second``.

    Parameters
    ----------
    first, second : int or str
        The two stages, by index or by name.
    conductance : float, optional
        A given conductance, [W/K].
    conductivity : callable, optional
        ``k(T)``, [W/(m K)], vectorised in ``T`` [K].
    conductivity_integral : callable, optional
        ``I(T_low, T_high)``, [W/m], the integral of ``k dT``.
    area : float, optional
        Total cross-section of the conductor(s), [m^2].
    length : float, optional
        Length, [m].

    Give exactly one of ``conductance``, ``conductivity`` or ``conductivity_integral``; the
    last two need ``area`` and ``length``.

    Examples
    --------
    >>> Link(0, 1, conductance=0.5).conductance
    0.5
    """

    first: int | str
    second: int | str
    conductance: float | None = None
    conductivity: Callable | None = None
    conductivity_integral: Callable | None = None
    area: float | None = None
    length: float | None = None

    def __post_init__(self) -> None:
        given = [
            self.conductance is not None,
            self.conductivity is not None,
            self.conductivity_integral is not None,
        ]
        if sum(given) != 1:
            raise InputError(
                "a link between stages needs exactly one of a conductance, a conductivity "
                "or a conductivity integral",
                expected="conductance in W/K, or a material with area and length",
                found=f"{sum(given)} of them",
            )
        if self.conductance is not None:
            g = self.conductance
            if not _is_number(g) or not math.isfinite(g) or g < 0.0:
                raise InputError(
                    "a link's conductance must be 0 W/K or more",
                    expected="a conductance of 0 W/K or more",
                    found=_short(g),
                )
        else:
            for name in ("area", "length"):
                v = getattr(self, name)
                if v is None or not _is_number(v) or not math.isfinite(v) or v <= 0.0:
                    raise InputError(
                        f"a link through a conductor needs a {name} above 0",
                        key=name,
                        expected=f"a {name} above 0",
                        found=_short(v),
                    )


def link_conductance(conductivity_integral, area, length, T_cold, T_warm):
    """Mean conductance of a conductor between two temperatures, from its conductivity integral.

    .. math::

        G = \\frac{A}{L} \\frac{\\int_{T_c}^{T_w} k\\,dT}{T_w - T_c}

    Parameters
    ----------
    conductivity_integral : callable
        ``I(T_low, T_high)``, [W/m].
    area : float
        Cross-section, [m^2].
    length : float
        Length, [m].
    T_cold, T_warm : float
        End temperatures, [K], ``T_cold < T_warm``.

    Returns
    -------
    float
        Conductance, [W/K].

    Notes
    -----
    Exact for the heat flow between those two end temperatures (steady conduction, no
    heat sunk along the way).

    References
    ----------
    1. Ekin, J. W., *Experimental Techniques for Low-Temperature Measurements*, Oxford
       University Press, 2006, section 2.2 (conductivity integrals).

    Examples
    --------
    A conductor with k = 2 W/(m K), 1 cm^2 by 0.1 m:

    >>> round(link_conductance(lambda a, b: 2.0 * (b - a), 1e-4, 0.1, 4.0, 50.0), 6)
    0.002
    """
    Tc = float(checks.temperature(T_cold, "T_cold"))
    Tw = float(checks.temperature(T_warm, "T_warm"))
    if Tw <= Tc:
        raise TemperatureError(f"T_warm ({Tw:g} K) must lie above T_cold ({Tc:g} K)")
    return float(area) / float(length) * float(conductivity_integral(Tc, Tw)) / (Tw - Tc)


# --------------------------------------------------------------------------------------
# the network of stages: capacity, load and links as fast functions of T (n, k)


def _resolve_stage(ref, names: Sequence[str]) -> int:
    if isinstance(ref, str):
        if ref not in names:
            from .errors import UnknownNameError

            raise UnknownNameError("stage", ref, names)
        return list(names).index(ref)
    if not isinstance(ref, (int, np.integer)) or not 0 <= int(ref) < len(names):
        raise InputError(
            "a link names a stage that does not exist",
            expected=f"a stage index 0 to {len(names) - 1} or a stage name",
            found=_short(ref),
        )
    return int(ref)


def _column_safe(func: Callable, n: int, probe: np.ndarray, what: str) -> Callable:
    """Wrap ``func(T)`` so that it takes (n, k) arrays, calling it per column if it must."""
    out1 = np.asarray(func(probe), dtype=float)
    if out1.shape != (n,):
        raise InputError(
            f"the {what} function must return one value per stage",
            expected=f"an array of {n} values in W",
            found=f"shape {out1.shape}",
        )
    probe2 = np.stack([probe, probe], axis=1)
    try:
        out2 = np.asarray(func(probe2), dtype=float)
        ok = (
            out2.shape == (n, 2)
            and np.allclose(out2[:, 0], out1)
            and np.allclose(out2[:, 1], out1)
        )
    except Exception:  # not vectorised over columns: call column by column
        ok = False
    if ok:
        return lambda T: np.asarray(func(T), dtype=float)

    def per_column(T: np.ndarray) -> np.ndarray:
        if T.ndim == 1:
            return np.asarray(func(T), dtype=float)
        return np.stack([np.asarray(func(T[:, c]), dtype=float) for c in range(T.shape[1])], 1)

    return per_column


class _Network:
    """Capacity, load and links of ``n`` stages, evaluated fast on (n,) or (n, k) arrays."""

    def __init__(self, n, names, capacity, load, links, grid, probe):
        self.n = n
        self.grid = grid
        self._cap = self._capacity(capacity, n, probe)
        self._load = self._loads(load, n, probe)
        self._links = []
        for link in links:
            if not isinstance(link, Link):
                raise InputError(
                    "a link between stages must be a Link",
                    expected="Link(first, second, conductance=...)",
                    found=_short(link),
                )
            a = _resolve_stage(link.first, names)
            b = _resolve_stage(link.second, names)
            if a == b:
                raise InputError(
                    "a link must join two different stages",
                    expected="two different stages",
                    found=f"stage {names[a]!r} twice",
                )
            if link.conductance is not None:
                self._links.append((a, b, float(link.conductance), None))
            else:
                geometry = float(link.area) / float(link.length)
                if link.conductivity is not None:
                    k = np.asarray(link.conductivity(grid), dtype=float)
                    F = np.concatenate([[0.0], np.cumsum(0.5 * (k[1:] + k[:-1]) * np.diff(grid))])
                else:
                    # F(T) = integral of k from the grid's foot to T; F(foot) = 0
                    integral = link.conductivity_integral
                    try:
                        rest = np.asarray(integral(grid[0], grid[1:]), dtype=float)
                        if rest.shape != grid[1:].shape:
                            raise ValueError("not vectorised")
                    except (TypeError, ValueError):
                        rest = np.array([float(integral(grid[0], t)) for t in grid[1:]])
                    F = np.concatenate([[0.0], rest])
                self._links.append((a, b, geometry, F))

    @staticmethod
    def _capacity(capacity, n, probe):
        if isinstance(capacity, CapacityMap):
            if n != 2:
                raise InputError(
                    "a two-stage capacity map needs exactly two stages",
                    expected="2 stages",
                    found=f"{n}",
                )
            return capacity.stage_capacities
        if isinstance(capacity, CapacityCurve):
            capacity = [capacity]
        if callable(capacity):
            return _column_safe(capacity, n, probe, "cooler capacity")
        if isinstance(capacity, Sequence) and not isinstance(capacity, str):
            if len(capacity) != n:
                raise InputError(
                    "the cooler needs one capacity curve per stage (None for a stage it "
                    "does not cool)",
                    expected=f"{n} entries",
                    found=f"{len(capacity)}",
                )
            rows = []
            for c in capacity:
                if c is None:
                    rows.append(None)
                elif isinstance(c, CapacityCurve):
                    rows.append(c._fast)
                elif callable(c):
                    rows.append(lambda t, c=c: np.asarray(c(t), dtype=float) * np.ones_like(t))
                else:
                    raise InputError(
                        "a stage's capacity must be a CapacityCurve, a function of its "
                        "temperature, or None",
                        expected="a CapacityCurve",
                        found=_short(c),
                    )

            def per_stage(T: np.ndarray) -> np.ndarray:
                out = np.zeros_like(T)
                for i, f in enumerate(rows):
                    if f is not None:
                        out[i] = f(T[i])
                return out

            return per_stage
        raise InputError(
            "the cooler capacity must be a CapacityMap, a list of CapacityCurve, or a function",
            expected="a CapacityMap or a list of CapacityCurve",
            found=_short(capacity),
        )

    @staticmethod
    def _loads(load, n, probe):
        if load is None:
            return lambda T: np.zeros_like(T)
        if callable(load):
            return _column_safe(load, n, probe, "load")
        q = np.asarray(load, dtype=float)
        if q.shape != (n,) or not np.all(np.isfinite(q)):
            raise InputError(
                "constant loads must give one value per stage",
                expected=f"{n} loads in W",
                found=_short(load),
            )
        col = q[:, None]
        return lambda T: np.broadcast_to(col if T.ndim == 2 else q, T.shape).copy()

    def capacity(self, T: np.ndarray) -> np.ndarray:
        return self._cap(T)

    def load(self, T: np.ndarray) -> np.ndarray:
        return self._load(T)

    def link_heat(self, T: np.ndarray) -> np.ndarray:
        """Net heat into each stage through the links, [W]."""
        out = np.zeros_like(T)
        for a, b, g, F in self._links:
            if F is None:
                q = g * (T[b] - T[a])
            else:
                q = g * (np.interp(T[b], self.grid, F) - np.interp(T[a], self.grid, F))
            out[a] += q
            out[b] -= q
        return out

    def net_cooling(self, T: np.ndarray) -> np.ndarray:
        """Capacity minus load minus heat arriving through links, [W], per stage."""
        return self.capacity(T) - self.load(T) - self.link_heat(T)


def _check_gets_cold(net, names, targets, highs, probe_others, points=400):
    """Refuse a stage whose capacity is below its load at every temperature up to ambient.

    Stage ``i`` is scanned from its target to ``highs[i]`` with the other stages at
    ``probe_others`` (their targets): the most favourable case a plan can hope for.
    """
    n = len(names)
    for i in range(n):
        lo = targets[i]
        hi = max(highs[i], lo * 1.0001)
        scan = np.geomspace(lo, hi, points)
        T = np.repeat(probe_others[:, None], points, axis=1)
        T[i] = scan
        margin = net.net_cooling(T)[i]
        if np.all(margin < 0.0):
            k = int(np.argmax(margin))
            short = float(-margin[k])
            raise CoolingShortfallError(
                f"stage {names[i]!r} never gets cold: its cooler capacity is below its load "
                f"at every temperature from {lo:g} K to {hi:g} K; it falls short by at "
                f"least {short:.3g} W (the least shortfall, at {scan[k]:.3g} K)",
                stage=names[i],
                shortfall=short,
                temperature=float(scan[k]),
                expected="a cooler capacity above the stage's load at some temperature",
                found=f"a shortfall of {short:.3g} W or more",
            )


# --------------------------------------------------------------------------------------
# cooldown-time integration


@dataclass
class CooldownStage:
    """One stage of a cryostat for the cooldown integration.

    Parameters
    ----------
    name : str
        The stage's name (for results and messages).
    heat_capacity : callable
        Total heat capacity of the stage's parts, ``C(T)`` [J/K], vectorised in ``T`` [K]:
        the sum of mass times specific heat of its parts.
    initial_temperature : float
        Temperature at the start, [K] (ambient, or 77 K after a liquid-nitrogen precool).
    target_temperature : float
        Temperature at which the stage counts as cold, [K].
    enthalpy : callable, optional
        Total enthalpy ``H(T)`` [J] of the stage's parts (any zero): used for the
        energy-closure check instead of the integral of ``heat_capacity``.
    entropy : callable, optional
        Total entropy ``S(T)`` [J/K]; with ``enthalpy``, gives the reversible work exactly.

    Examples
    --------
    A cold plate precooled to 77 K, to be cooled to 4.2 K, with a stand-in heat capacity
    C = 4 T J/K (a plan builds ``heat_capacity`` from the material library: the sum of
    mass times ``specific_heat`` of the stage's parts):

    >>> stage = CooldownStage("cold plate", lambda T: 40.0 * 0.1 * T, 77.0, 4.2)
    >>> stage.initial_temperature, stage.target_temperature
    (77.0, 4.2)
    """

    name: str
    heat_capacity: Callable
    initial_temperature: float
    target_temperature: float
    enthalpy: Callable | None = None
    entropy: Callable | None = None


@dataclass
class CooldownResult:
    """The outcome of :func:`simulate_cooldown`. Units: s, K, J.

    Attributes
    ----------
    names : tuple of str
        Stage names, in order.
    t : ndarray, shape (m,)
        Times of the solution, [s].
    temperatures : ndarray, shape (n, m)
        Stage temperatures at those times, [K] (also as ``T``).
    targets : ndarray, shape (n,)
        Target temperatures, [K].
    time_to_target : list of float or None
        Time each stage first reached its target, [s]; None where it did not.
    cooldown_time : float or None
        Time at which every stage had reached its target, [s]; None if one did not.
    not_reached : list of str
        Stages that did not reach their target by the end.
    electrical_energy : float or None
        Electrical energy into the cooler over the run, [J]; None without an input power.
    cooler_heat, load_heat, link_heat : ndarray, shape (n,)
        Integrals over the run of the cooler's capacity, the loads, and the net heat in
        through links, per stage, [J].
    enthalpy_change : ndarray, shape (n,)
        H(end) - H(start) of each stage, [J] (negative on cooling).
    stage_closure_error, closure_error : ndarray, float
        Relative energy-closure error per stage and over all stages:
        ``|∫Q_cooler dt - (-ΔH + ∫Q_load dt + ∫Q_link dt)|`` over the largest of those
        terms (per stage), or over the largest of the summed terms (all stages).
    minimum_work : ndarray or None
        Reversible work to cool each stage's parts from start to end temperature with heat
        rejected at ambient, [J]; None without ``ambient``.
    carnot_work : ndarray or None
        Carnot work of the heat the cooler actually lifted, ``∫Q_cooler (T0/T - 1) dt``,
        per stage, [J]; None without ``ambient``.
    ambient : float or None
        Heat-rejection temperature, [K].
    evaluations : int
        Right-hand-side evaluations used by the integrator.
    """

    names: tuple[str, ...]
    t: np.ndarray
    temperatures: np.ndarray
    targets: np.ndarray
    time_to_target: list
    cooldown_time: float | None
    not_reached: list
    electrical_energy: float | None
    cooler_heat: np.ndarray
    load_heat: np.ndarray
    link_heat: np.ndarray
    enthalpy_change: np.ndarray
    stage_closure_error: np.ndarray
    closure_error: float
    minimum_work: np.ndarray | None
    carnot_work: np.ndarray | None
    ambient: float | None
    evaluations: int = 0
    message: str = ""

    @property
    def T(self) -> np.ndarray:
        """Alias of :attr:`temperatures`, [K], shape (n, m)."""
        return self.temperatures

    def temperatures_at(self, times) -> np.ndarray:
        """Stage temperatures [K] at the given times [s], linear between solution points.

        Returns shape ``(n,) + shape(times)``; times beyond the run take its end values.
        """
        times = np.asarray(times, dtype=float)
        return np.stack([np.interp(times, self.t, row) for row in self.temperatures])

    @property
    def fraction_of_carnot(self) -> float | None:
        """Carnot work of the lifted heat over the electrical energy, [-]."""
        if self.carnot_work is None or not self.electrical_energy:
            return None
        return float(np.sum(self.carnot_work) / self.electrical_energy)


def _tables(stages, lo: float, hi: float, points: int):
    grid = np.geomspace(lo, hi, points)
    C = np.empty((len(stages), points))
    for i, s in enumerate(stages):
        c = np.asarray(s.heat_capacity(grid), dtype=float)
        if c.shape != grid.shape:
            c = np.array([float(s.heat_capacity(float(t))) for t in grid])
        if not np.all(np.isfinite(c)) or np.any(c <= 0.0):
            raise InputError(
                f"stage {s.name!r} has a heat capacity that is not positive between "
                f"{lo:.3g} K and {hi:.3g} K",
                expected="a heat capacity above 0 J/K (does the stage have parts?)",
                found=f"{float(np.nanmin(c)):.3g} J/K",
            )
        C[i] = c
    # H(T) - H(lo): the exact integral of the piecewise-linear table.
    H = np.concatenate(
        [np.zeros((len(stages), 1)), np.cumsum(0.5 * (C[:, 1:] + C[:, :-1]) * np.diff(grid), 1)],
        axis=1,
    )
    return grid, C, H


def simulate_cooldown(
    stages: Sequence[CooldownStage],
    capacity,
    load=None,
    links: Sequence[Link] = (),
    *,
    input_power=None,
    ambient: float | None = None,
    t_max: float = 30.0 * SECONDS_PER_DAY,
    stop_when_cold: bool = True,
    rtol: float = 1.0e-6,
    method: str = "LSODA",
    table_points: int = 600,
) -> CooldownResult:
    """Cooldown time of cryostat stages on a cryocooler: the stages' energy balances integrated.

    .. math::

        C_i(T_i) \\frac{dT_i}{dt} = -Q_{cooler,i}(\\mathbf T) + Q_{load,i}(\\mathbf T)
        + \\sum_j Q_{link,ij}(T_i, T_j)

    integrated with a stiff-capable solver (LSODA, or backward differentiation formulae),
    with an event per stage at its target temperature.

    Parameters
    ----------
    stages : sequence of CooldownStage
        The stages: heat capacity [J/K], start and target temperatures [K].
    capacity : CapacityMap, sequence of CapacityCurve or None, or callable
        The cooler: a two-stage map; one curve per stage (None for a stage it does not
        cool); or ``f(T) -> Q`` [W] of the stage-temperature vector.
    load : callable or sequence of float, optional
        Static heat loads [W]: ``f(T)`` of the stage-temperature vector (shape (n,) or
        (n, k), returning the same shape; a function of (n,) only is called per column), or
        one constant per stage. Default: no load.
    links : sequence of Link, optional
        Thermal links between stages.
    input_power : float or callable, optional
        Electrical input of the cooler, [W]: a constant while it runs, or ``f(T)`` of the
        stage-temperature vector (shape (n,) -> float).
    ambient : float, optional
        Heat-rejection temperature, [K], for the reversible and Carnot work; also the top
        of the "never gets cold" check (default: the highest start temperature).
    t_max : float, optional
        Longest simulated time, [s] (default 30 days).
    stop_when_cold : bool, optional
        Stop once every stage has reached its target (default); otherwise run to ``t_max``.
    rtol : float, optional
        Relative tolerance of the integrator (default 1e-6).
    method : str, optional
        ``"LSODA"`` (default: switches between Adams and BDF formulae as the problem turns
        stiff), ``"BDF"`` or ``"Radau"``: solvers of :func:`scipy.integrate.solve_ivp`.
    table_points : int, optional
        Points of the heat-capacity tables (default 600, log-spaced).

    Returns
    -------
    CooldownResult
        Temperatures against time, time to each target, energies and the closure check.

    Raises
    ------
    CoolingShortfallError
        A stage whose cooler capacity is below its load at every temperature from its
        target up to ambient (checked before integrating, with the other stages at their
        targets); the message says by how much it falls short.
    cryoplan.errors.InputError
        Inconsistent inputs (a capacity map for other than two stages, a link to a stage
        that does not exist, a heat capacity that is not positive).

    Notes
    -----
    Each stage's heat capacity is tabulated once on a log-spaced grid from a quarter of the
    lowest target (or start) temperature to the highest start (or ambient) temperature and
    interpolated linearly; below the grid it is held at the grid's first value (a stage
    far below its target cools more slowly than it would, which changes no time to target).
    The integration goes on physically after a stage reaches its target (it is not held
    there); the time recorded is the first crossing. The cooler's heat, the loads, the link
    heat and the electrical energy are integrated alongside the temperatures, so the
    energy closure measures the integration itself. The problem is stiff at low
    temperature (heat capacities fall as T^3), hence a stiff solver.

    References
    ----------
    1. Shampine, L. F. and Reichelt, M. W., "The MATLAB ODE suite", SIAM J. Sci. Comput.
       18 (1997) 1-22 (the BDF/NDF method of scipy's ``BDF``).
    2. Petzold, L., "Automatic selection of methods for solving stiff and nonstiff systems
       of ordinary differential equations", SIAM J. Sci. Stat. Comput. 4 (1983) 136-148.
    3. Barron, R. F., *Cryogenic Systems*, 2nd ed., Oxford University Press, 1985.

    Examples
    --------
    10 kg with c = 0.1 T J/(kg K) on a constant 10 W from 300 K to 10 K: the time is
    m a (T1^2 - T2^2) / (2 Q) = 4495 s.

    >>> stage = CooldownStage("cold plate", lambda T: 10 * 0.1 * T, 300.0, 10.0)
    >>> result = simulate_cooldown([stage], [CapacityCurve([[1, 10], [300, 10]])])
    >>> round(result.time_to_target[0])
    4495
    >>> result.closure_error < 1e-4
    True
    """
    stages = list(stages)
    n = len(stages)
    if n == 0:
        raise InputError(
            "a cooldown needs at least one stage", expected="1 stage or more", found="none"
        )
    names = tuple(s.name for s in stages)
    T_start = np.array(
        [
            float(checks.temperature(s.initial_temperature, f"start temperature of {s.name!r}"))
            for s in stages
        ]
    )
    targets = np.array(
        [float(checks.temperature(s.target_temperature, f"target of {s.name!r}")) for s in stages]
    )
    if ambient is not None:
        ambient = float(checks.temperature(ambient, "ambient"))
    if not (t_max > 0.0 and math.isfinite(t_max)):
        raise InputError(
            "t_max must be a time above 0", expected="seconds above 0", found=_short(t_max)
        )

    lo = 0.25 * float(min(targets.min(), T_start.min()))
    hi = float(max(T_start.max(), ambient or 0.0))
    hi = max(hi, 1.001 * float(targets.max()))
    grid, Ctab, Htab = _tables(stages, lo, hi, table_points)
    net = _Network(n, names, capacity, load, links, grid, probe=T_start.copy())
    _check_gets_cold(net, names, targets, np.full(n, hi), targets)

    if input_power is None:
        power_const, power_func = None, None
    elif callable(input_power):
        power_const, power_func = None, input_power
        float(power_func(T_start))  # fails early on a bad function
    else:
        power_const = float(checks.nonnegative(input_power, "the cooler's input power", "W"))
        power_func = None
    T0 = ambient

    # state: T (n) | cooler heat (n) | load heat (n) | link heat (n) | Carnot work (n) | E_el
    nT = n
    S = 5 * n + 1
    floor = grid[0] * 1e-3

    def rhs(t, y):
        T = np.maximum(y[:nT], floor)
        C = np.empty_like(T)
        for i in range(n):
            C[i] = np.interp(T[i], grid, Ctab[i])
        qc = net.capacity(T)
        ql = net.load(T)
        qk = net.link_heat(T)
        dT = (ql + qk - qc) / C
        if T0 is not None:
            wc = qc * np.maximum(T0 / T - 1.0, 0.0)
        else:
            wc = np.zeros_like(qc)
        if power_func is not None:
            pe = np.array([[float(power_func(T[:, c])) for c in range(T.shape[1])]])
        else:
            pe = np.zeros((1, T.shape[1]))
        return np.concatenate([dT, qc, ql, qk, wc, pe], axis=0)

    y0 = np.concatenate([T_start, np.zeros(S - n)])
    energy_scale = float(np.max(np.interp(T_start, grid, Htab.max(axis=0)))) + 1.0
    atol = np.concatenate(
        [np.full(n, 1e-6 * float(targets.min())), np.full(S - n, 1e-9 * energy_scale)]
    )

    time_to_target: list = [None] * n
    for i in range(n):
        if T_start[i] <= targets[i]:
            time_to_target[i] = 0.0

    ts = [np.array([0.0])]
    ys = [y0[:, None]]
    t_now, y_now = 0.0, y0
    evaluations = 0
    message = ""
    while True:
        pending = [i for i in range(n) if time_to_target[i] is None]
        if stop_when_cold and not pending:
            message = "every stage reached its target"
            break
        if t_now >= t_max:
            message = "reached t_max"
            break
        events = []
        for i in pending:

            def ev(t, y, i=i):
                return y[i] - targets[i]

            ev.terminal = True
            ev.direction = -1.0
            events.append(ev)
        sol = integrate.solve_ivp(
            rhs,
            (t_now, t_max),
            y_now,
            method=method,
            rtol=rtol,
            atol=atol,
            vectorized=True,
            events=events or None,
        )
        evaluations += int(sol.nfev)
        if sol.status < 0:
            raise InputError(
                "the cooldown integration failed",
                expected="an integrable cooldown",
                found=sol.message,
            )
        ts.append(sol.t[1:])
        ys.append(sol.y[:, 1:])
        t_now, y_now = float(sol.t[-1]), sol.y[:, -1].copy()
        if sol.status == 1:
            for k, i in enumerate(pending):
                if len(sol.t_events[k]) and time_to_target[i] is None:
                    time_to_target[i] = float(sol.t_events[k][0])
        else:
            message = "reached t_max"
            break

    t = np.concatenate(ts)
    Y = np.concatenate(ys, axis=1)
    temps = Y[:n]
    y_end = Y[:, -1]
    Ec, El, Ek, Wc = (y_end[n * (k + 1) : n * (k + 2)] for k in range(4))
    t_end = float(t[-1])

    T_end = temps[:, -1]
    dH = np.empty(n)
    for i, s in enumerate(stages):
        if s.enthalpy is not None:
            dH[i] = float(s.enthalpy(T_end[i])) - float(s.enthalpy(T_start[i]))
        else:
            dH[i] = float(
                np.interp(T_end[i], grid, Htab[i]) - np.interp(T_start[i], grid, Htab[i])
            )
    # ∫Q_cooler dt = -ΔH + ∫Q_load dt + ∫Q_link dt
    # relative to the largest term of each balance (a stage without a cooler has Ec = 0)
    rhs_side = -dH + El + Ek
    terms = np.stack([np.abs(Ec), np.abs(dH), np.abs(El), np.abs(Ek)])
    stage_closure = np.abs(Ec - rhs_side) / np.maximum(terms.max(axis=0), 1e-300)
    total_closure = float(
        abs(Ec.sum() - rhs_side.sum()) / max(abs(Ec.sum()), abs(dH.sum()), abs(El.sum()), 1e-300)
    )

    if power_func is not None:
        electrical = float(y_end[-1])
    elif power_const is not None:
        electrical = power_const * t_end
    else:
        electrical = None

    minimum = carnot = None
    if T0 is not None:
        carnot = Wc.copy()
        minimum = np.empty(n)
        for i, s in enumerate(stages):
            a, b = float(T_end[i]), float(T_start[i])
            if s.enthalpy is not None and s.entropy is not None:
                minimum[i] = reversible_work(s.enthalpy, s.entropy, b, a, T0)
            else:
                fine = np.geomspace(min(a, b), max(a, b), 2001)
                c = np.interp(fine, grid, Ctab[i])
                w = np.trapezoid(c * (T0 / fine - 1.0), fine)
                minimum[i] = w if b >= a else -w

    reached = [x for x in time_to_target if x is not None]
    cooldown_time = max(reached) if len(reached) == n else None
    return CooldownResult(
        names=names,
        t=t,
        temperatures=temps,
        targets=targets,
        time_to_target=time_to_target,
        cooldown_time=cooldown_time,
        not_reached=[names[i] for i in range(n) if time_to_target[i] is None],
        electrical_energy=electrical,
        cooler_heat=Ec.copy(),
        load_heat=El.copy(),
        link_heat=Ek.copy(),
        enthalpy_change=dH,
        stage_closure_error=stage_closure,
        closure_error=total_closure,
        minimum_work=minimum,
        carnot_work=carnot,
        ambient=T0,
        evaluations=evaluations,
        message=message,
    )


# --------------------------------------------------------------------------------------
# steady state


@dataclass
class SteadyStateResult:
    """The outcome of :func:`steady_state`. Units: K, W.

    Attributes
    ----------
    names : tuple of str
        Stage names.
    temperatures : ndarray, shape (n,)
        Steady temperatures, where each stage's capacity meets its load, [K].
    capacity, load : ndarray, shape (n,)
        Cooler capacity and load (static load plus heat in through links) there, [W].
    targets : ndarray, shape (n,)
        Target temperatures, [K].
    capacity_at_target, load_at_target : ndarray, shape (n,)
        Capacity and load with every stage at its target, [W].
    over_capacity : ndarray of bool, shape (n,)
        True where the load exceeds the capacity at the target: the stage sits above it.
    margin_at_target : ndarray, shape (n,)
        ``capacity_at_target - load_at_target``, [W].
    converged : bool
        Whether the coupled solution met its tolerance.
    """

    names: tuple[str, ...]
    temperatures: np.ndarray
    capacity: np.ndarray
    load: np.ndarray
    targets: np.ndarray
    capacity_at_target: np.ndarray
    load_at_target: np.ndarray
    over_capacity: np.ndarray
    margin_at_target: np.ndarray
    converged: bool


def _highest_balance(f: Callable[[np.ndarray], np.ndarray], lo: float, hi: float) -> float:
    """The highest temperature in [lo, hi] below which the net cooling ``f`` is not positive.

    A stage cooling from ``hi`` stops there. Scan on a log grid, then bisect on the sign.
    """
    scan = np.geomspace(lo, hi, 801)
    g = f(scan)
    bad = np.nonzero(g <= 0.0)[0]
    if bad.size == 0:
        return lo
    k = int(bad[-1])
    if k == scan.size - 1:
        return hi
    a, b = scan[k], scan[k + 1]  # f(a) <= 0 < f(b)
    for _ in range(60):
        m = 0.5 * (a + b)
        if float(f(np.array([m]))[0]) > 0.0:
            b = m
        else:
            a = m
        if b - a <= 1e-12 * b:
            break
    return 0.5 * (a + b)


def steady_state(
    capacity,
    load=None,
    links: Sequence[Link] = (),
    *,
    targets,
    ambient: float,
    names: Sequence[str] | None = None,
    lowest: float | None = None,
) -> SteadyStateResult:
    """Steady stage temperatures under load: where each stage's cooler capacity meets its load.

    .. math::

        Q_{cooler,i}(\\mathbf T) = Q_{load,i}(\\mathbf T) + \\sum_j Q_{link,ij}(T_i, T_j)

    solved stage by stage (the highest balance below ambient, which a stage cooling from
    ambient stops at), repeated until the stages agree, then polished by a Newton-type
    root finder on the coupled system.

    Parameters
    ----------
    capacity : CapacityMap, sequence of CapacityCurve or None, or callable
        The cooler, as in :func:`simulate_cooldown`.
    load : callable or sequence of float, optional
        Static loads [W], as in :func:`simulate_cooldown`.
    links : sequence of Link, optional
        Thermal links between stages.
    targets : sequence of float
        Target temperature of each stage, [K].
    ambient : float
        Ambient temperature, [K]: the top of the search.
    names : sequence of str, optional
        Stage names (default ``stage 1``, ``stage 2``, ...).
    lowest : float, optional
        Bottom of the search, [K] (default a tenth of the lowest target). A stage whose
        capacity exceeds its load all the way down is reported there.

    Returns
    -------
    SteadyStateResult
        Temperatures, capacities and loads there, and a flag per stage whose load exceeds
        its capacity at its target.

    Raises
    ------
    CoolingShortfallError
        A stage whose capacity is below its load at every temperature from its target up to
        ambient (other stages at their targets); the message says by how much.

    Notes
    -----
    Where capacity and load cross more than once, the highest crossing below ambient is
    taken: a stage cooling down from ambient stops at the first balance it meets.

    References
    ----------
    1. Powell, M. J. D., "A hybrid method for nonlinear equations", in *Numerical Methods
       for Nonlinear Algebraic Equations*, ed. Rabinowitz, Gordon and Breach, 1970
       (scipy's ``hybr``).

    Examples
    --------
    A capacity of 0.6 W/K above 2.5 K against a constant 1 W: 2.5 + 1/0.6 = 4.1667 K.

    >>> curve = CapacityCurve([[2.5, 0.0], [12.5, 6.0]])
    >>> result = steady_state([curve], [1.0], targets=[4.2], ambient=300.0)
    >>> round(float(result.temperatures[0]), 4), bool(result.over_capacity[0])
    (4.1667, False)
    """
    targets = np.array([float(x) for x in np.atleast_1d(np.asarray(targets, dtype=float))])
    checks.temperature(targets, "a target temperature")
    n = targets.size
    names = tuple(names) if names is not None else tuple(f"stage {i + 1}" for i in range(n))
    if len(names) != n:
        raise InputError("one name per stage", expected=f"{n} names", found=f"{len(names)}")
    ambient = float(checks.temperature(ambient, "ambient"))
    lo = float(lowest) if lowest is not None else 0.1 * float(targets.min())
    checks.temperature(lo, "lowest")
    hi = ambient
    grid = np.geomspace(lo, hi, 800)
    net = _Network(n, names, capacity, load, links, grid, probe=targets.copy())
    _check_gets_cold(net, names, targets, np.full(n, hi), targets)

    def residual(T: np.ndarray) -> np.ndarray:
        return net.net_cooling(T)

    def balanced(T: np.ndarray) -> bool:
        """Capacity meets load at every stage not pinned at an end of the search."""
        inside = (T > lo * (1 + 1e-9)) & (T < hi * (1 - 1e-9))
        scale = np.abs(net.capacity(T)) + np.abs(net.load(T)) + np.abs(net.link_heat(T))
        return bool(np.all(np.abs(residual(T))[inside] <= 1e-7 * scale[inside] + 1e-12))

    # stage by stage (Gauss-Seidel), each at its highest balance with the others fixed
    T = targets.copy()
    settled = False
    for _sweep in range(100):
        previous = T.copy()
        for i in range(n):

            def f(x, i=i, T=T):
                M = np.repeat(T[:, None], x.size, axis=1)
                M[i] = x
                return net.net_cooling(M)[i]

            T[i] = _highest_balance(f, lo, hi)
        if np.all(np.abs(T - previous) <= 1e-10 * T):
            settled = True
            break
    converged = settled and balanced(T)
    if not converged and n > 1:
        # strongly coupled stages settle slowly stage by stage: finish with Powell's method
        sol = optimize.root(residual, T, method="hybr")
        if sol.success and np.all(sol.x > lo) and np.all(sol.x < hi) and balanced(sol.x):
            T, converged = sol.x, True

    cap_t = net.capacity(targets)
    load_t = net.load(targets) + net.link_heat(targets)
    return SteadyStateResult(
        names=names,
        temperatures=T,
        capacity=net.capacity(T),
        load=net.load(T) + net.link_heat(T),
        targets=targets,
        capacity_at_target=cap_t,
        load_at_target=load_t,
        over_capacity=load_t > cap_t,
        margin_at_target=cap_t - load_t,
        converged=converged,
    )


# --------------------------------------------------------------------------------------
# reversible work of a cooldown


def reversible_work(enthalpy, entropy, T_start, T_end, T_ambient):
    """Reversible (minimum) work to cool a body, from its enthalpy and entropy: the exergy change.

    .. math::

        W = T_0 [S(T_1) - S(T_2)] - [H(T_1) - H(T_2)]

    Parameters
    ----------
    enthalpy : callable
        ``H(T)`` of the body, [J] (total; any zero).
    entropy : callable
        ``S(T)`` of the body, [J/K].
    T_start, T_end : float or ndarray
        Start and end temperatures, [K].
    T_ambient : float
        Heat-rejection temperature, [K].

    Returns
    -------
    float or ndarray
        Minimum work, [J].

    Notes
    -----
    For a body cooled below ambient; the cooler's heat is rejected at ``T_ambient``.

    References
    ----------
    1. Barron, R. F., *Cryogenic Systems*, 2nd ed., Oxford University Press, 1985, chapter 5.

    Examples
    --------
    A constant heat capacity of 1 J/K from 300 K to 150 K with T0 = 300 K:
    W = 300 ln 2 - 150 = 57.94 J.

    >>> round(reversible_work(lambda T: T, np.log, 300.0, 150.0, 300.0), 2)
    57.94
    """
    T1 = checks.temperature(T_start, "T_start")
    T2 = checks.temperature(T_end, "T_end")
    T0 = checks.temperature(T_ambient, "T_ambient")
    dS = np.asarray(entropy(T1), dtype=float) - np.asarray(entropy(T2), dtype=float)
    dH = np.asarray(enthalpy(T1), dtype=float) - np.asarray(enthalpy(T2), dtype=float)
    return checks.scalar(T0 * dS - dH)


def reversible_work_from_heat_capacity(heat_capacity, T_start, T_end, T_ambient):
    """Reversible (minimum) work to cool a body from its heat capacity alone.

    .. math::

        W = \\int_{T_2}^{T_1} C(T) \\left( \\frac{T_0}{T} - 1 \\right) dT

    Parameters
    ----------
    heat_capacity : callable
        ``C(T)`` of the body, [J/K].
    T_start, T_end : float
        Start and end temperatures, [K].
    T_ambient : float
        Heat-rejection temperature, [K].

    Returns
    -------
    float
        Minimum work, [J].

    Notes
    -----
    The same quantity as :func:`reversible_work`; integrated by adaptive quadrature
    (scipy ``quad``) with a relative tolerance of 1e-10.

    References
    ----------
    1. Barron, R. F., *Cryogenic Systems*, 2nd ed., Oxford University Press, 1985, chapter 5.

    Examples
    --------
    >>> round(reversible_work_from_heat_capacity(lambda T: 1.0, 300.0, 150.0, 300.0), 2)
    57.94
    """
    T1 = float(checks.temperature(T_start, "T_start"))
    T2 = float(checks.temperature(T_end, "T_end"))
    T0 = float(checks.temperature(T_ambient, "T_ambient"))

    def integrand(T: float) -> float:
        return float(np.asarray(heat_capacity(T), dtype=float)) * (T0 / T - 1.0)

    value, _ = integrate.quad(integrand, T2, T1, epsrel=1e-10, limit=200)
    return float(value)
