"""Cooler capacity: one stage's capacity against its temperature (:class:`CapacityCurve`)
and a two-stage map of each stage's capacity against both temperatures
(:class:`CapacityMap`), read from tables of published or measured points.
"""

from __future__ import annotations

import bisect
import math
from collections.abc import Sequence

import numpy as np

from .. import checks
from ..errors import InputError, TemperatureError

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
            if not checks.is_number(base_temperature) or not math.isfinite(base_temperature):
                raise InputError(
                    "a base temperature must be a number of kelvin",
                    key=key,
                    expected="a temperature in K below the first point",
                    found=checks.short(base_temperature),
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
            found=checks.short(points),
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
            or not all(checks.is_number(v) for v in pair)
        ):
            raise InputError(
                f"entry {i + 1} of the capacity table is not a [K, W] pair of numbers",
                key=where,
                expected="a pair [temperature in K, capacity in W], e.g. [4.2, 1.5]",
                found=checks.short(pair),
            )
        k, w = float(pair[0]), float(pair[1])
        if not (math.isfinite(k) and math.isfinite(w)):
            raise InputError(
                f"entry {i + 1} of the capacity table is not finite",
                key=where,
                expected="finite numbers",
                found=checks.short(pair),
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
                found=checks.short(base_temperatures),
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
            found=checks.short(values),
        )
    if not np.all(np.isfinite(a)) or np.any(a < 0.0):
        raise InputError(
            "a capacity map's temperatures must be finite and 0 K or above",
            key=key,
            expected="temperatures of 0 K or more",
            found=checks.short(values),
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
            found=f"shape {a.shape}" if a is not None else checks.short(values),
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
