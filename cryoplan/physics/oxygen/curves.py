"""The oxygen in a room through a release case, solved exactly piece by piece: the curve, its
lowest point, the times to a level and back, the ventilation a case calls for, and the
assessment of one case.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import NamedTuple

import numpy as np

from .. import checks
from ..errors import InputError
from .cases import Release
from .constants import AIR_OXYGEN_PERCENT, DEFAULT_SUDDEN_MODEL, DEFICIENT_PERCENT, check_percent
from .release import _model, minimum_room_volume


class _Segments(NamedTuple):
    start: np.ndarray  # [s]
    end: np.ndarray  # [s], inf for the last
    c_start: np.ndarray  # [%]
    c_end: np.ndarray  # [%], the asymptote for the last
    c_inf: np.ndarray  # [%], where each segment heads
    rate: np.ndarray  # [1/s], (Q + R) / V


def _segments(room_volume, ventilation, release, sudden_model, initial_percent) -> _Segments:
    """The exact piecewise solution: in each segment C = c_inf + (c_start - c_inf) e^{-k t}."""
    if not isinstance(release, Release):
        raise InputError("not a release case", expected="a Release", found=type(release).__name__)
    v = float(checks.positive(room_volume, "room volume", "m^3"))
    q = (
        float(checks.nonnegative(ventilation, "ventilation", "m^3/s"))
        * release.ventilation_working
    )
    c = float(check_percent(initial_percent, "initial oxygen"))
    if release.sudden_volume > 0.0:
        c = float(_model(sudden_model)(release.sudden_volume, v, c))
    else:
        _model(sudden_model)
    pairs = list(release.schedule)
    if not pairs or pairs[0][0] > 0.0:
        pairs.insert(0, (0.0, 0.0))
    starts = [p[0] for p in pairs]
    ends = starts[1:] + [math.inf]
    rows = []
    for (t0, r), t1 in zip(pairs, ends, strict=True):
        flow = q + r
        if flow > 0.0:
            c_inf = AIR_OXYGEN_PERCENT * q / flow
            k = flow / v
            c_end = c_inf + (c - c_inf) * math.exp(-k * (t1 - t0)) if t1 < math.inf else c_inf
        else:
            c_inf, k, c_end = c, 0.0, c
        rows.append((t0, t1, c, c_end, c_inf, k))
        c = c_end
    return _Segments(*(np.array(col, dtype=float) for col in zip(*rows, strict=True)))


def oxygen_curve(
    time,
    room_volume,
    ventilation,
    release,
    *,
    sudden_model=DEFAULT_SUDDEN_MODEL,
    initial_percent=AIR_OXYGEN_PERCENT,
):
    """Oxygen over time for a release case in a ventilated, well-mixed room (exact, piecewise).

    A sudden volume at t = 0 (:func:`sudden_release_percent`), then in each interval of
    constant release rate :math:`R_i` the exact solution of the room's mass balance,
    each interval starting where the last one ended:

    .. math::

        C(t) = C_{\\infty,i} + (C(t_i) - C_{\\infty,i})\\, e^{-(Q + R_i)(t - t_i)/V},
        \\quad C_{\\infty,i} = 20.9 \\frac{Q}{Q + R_i}, \\quad t_i \\le t < t_{i+1}

    Parameters
    ----------
    time : float or ndarray
        Times since the case began, [s], 0 or more; any shape.
    room_volume : float
        Free volume of the room, [m^3].
    ventilation : float
        The room's fresh-air flow, [m^3/s] (scaled by the case's ``ventilation_working``).
    release : Release
        The case (:func:`quench_case`, :func:`sudden_release_case`, ...).
    sudden_model : str, optional
        Model for the sudden volume, a key of :data:`SUDDEN_RELEASE_MODELS`.
    initial_percent : float, optional
        Oxygen before the case, [%].

    Returns
    -------
    float or ndarray
        Oxygen, [%], the shape of ``time``. At t = 0 the value just after any sudden
        release.

    Notes
    -----
    Exact for a perfectly mixed room; the error of the piecewise solution is rounding
    only. Vectorised over ``time``.

    References
    ----------
    1. Fermilab ES&H Manual, chapter 4240, "Oxygen Deficiency Hazards (ODH)" (from
       memory: constant-rate release with ventilation, then recovery).

    Examples
    --------
    >>> from cryoplan.physics.oxygen import quench_case
    >>> case = quench_case(0.100, 750.0, duration=30.0)  # 75 m^3 of helium in 30 s
    >>> oxygen_curve([0.0, 30.0, 3600.0], 100.0, 200.0 / 3600.0, case).round(2)
    array([20.9 ,  9.95, 19.39])
    """
    seg = _segments(room_volume, ventilation, release, sudden_model, initial_percent)
    t = checks.nonnegative(time, "time", "s", inf=True)
    i = np.searchsorted(seg.start, t, side="right") - 1
    dt = t - seg.start[i]
    k = seg.rate[i]
    with np.errstate(invalid="ignore"):
        decay = np.where(k > 0.0, np.exp(-k * dt), 1.0)
    return checks.scalar(seg.c_inf[i] + (seg.c_start[i] - seg.c_inf[i]) * decay)


class Lowest(NamedTuple):
    """The lowest oxygen of a case and when it occurs."""

    percent: float  #: lowest oxygen [%]
    time_s: float  #: when [s]; ``inf`` where the curve only approaches it for ever


def lowest_oxygen(
    room_volume,
    ventilation,
    release,
    *,
    sudden_model=DEFAULT_SUDDEN_MODEL,
    initial_percent=AIR_OXYGEN_PERCENT,
    horizon=math.inf,
) -> Lowest:
    """Lowest oxygen of a release case, exactly (each piece of the curve is monotone).

    .. math:: C_{min} = \\min_i \\{ C(t_i), C(t_{i+1}) \\}, \\quad C(\\infty) = C_{\\infty,last}

    Parameters
    ----------
    room_volume : float
        Free volume of the room, [m^3].
    ventilation : float
        The room's fresh-air flow, [m^3/s].
    release : Release
        The case.
    sudden_model : str, optional
        Model for the sudden volume.
    initial_percent : float, optional
        Oxygen before the case, [%].
    horizon : float, optional
        Look no further than this time, [s]; default for ever. A case without
        ventilation falls for ever, towards 0 %; a horizon (a working day, the time to
        the next check) gives the lowest level within it.

    Returns
    -------
    Lowest
        ``percent`` [%] and ``time_s`` [s]; the earliest time where there is a tie.

    Notes
    -----
    On each interval of constant rate the oxygen moves monotonically towards that
    interval's steady state, so the lowest value is at an interval's end, or the last
    steady state when the last interval falls towards it for ever.

    References
    ----------
    1. As :func:`oxygen_curve`.

    Examples
    --------
    >>> from cryoplan.physics.oxygen import quench_case
    >>> low = lowest_oxygen(100.0, 200.0 / 3600.0, quench_case(0.100, 750.0))
    >>> round(low.percent, 2), low.time_s
    (9.95, 30.0)
    """
    horizon = float(checks.positive(horizon, "horizon", "s", inf=True))
    seg = _segments(room_volume, ventilation, release, sudden_model, initial_percent)
    best, when = float(seg.c_start[0]), 0.0
    for t0, t1, cs, ce, ci, k in zip(*seg, strict=True):
        if t0 >= horizon:
            break
        if t1 > horizon:  # the curve where the horizon cuts this interval
            t1, ce = horizon, ci + (cs - ci) * math.exp(-k * (horizon - t0))
        if ce < best:
            best, when = float(ce), float(t1)
    return Lowest(best, when)


def time_to_level(
    level_percent,
    room_volume,
    ventilation,
    release,
    *,
    sudden_model=DEFAULT_SUDDEN_MODEL,
    initial_percent=AIR_OXYGEN_PERCENT,
) -> float:
    """First time the oxygen falls to a level during a release case (closed form per piece).

    .. math:: t = t_i + \\frac{V}{Q + R_i} \\ln \\frac{C(t_i) - C_{\\infty,i}}{C - C_{\\infty,i}}

    in the first interval whose curve reaches the level :math:`C`.

    Parameters
    ----------
    level_percent : float
        The level, [%], 0 to 20.9 (an alarm level, or 19.5).
    room_volume : float
        Free volume of the room, [m^3].
    ventilation : float
        The room's fresh-air flow, [m^3/s].
    release : Release
        The case.
    sudden_model : str, optional
        Model for the sudden volume.
    initial_percent : float, optional
        Oxygen before the case, [%].

    Returns
    -------
    float
        Time [s]; 0 if the level is reached at once (a sudden release); ``inf`` if never.

    Notes
    -----
    "Reaching" means at or below the level. A curve that only approaches the level
    as its steady state never reaches it.

    References
    ----------
    1. As :func:`oxygen_curve`.

    Examples
    --------
    >>> from cryoplan.physics.oxygen import ventilation_failure_case
    >>> case = ventilation_failure_case(1e-4)  # 0.36 m^3/h of gas, no air change
    >>> round(time_to_level(19.5, 100.0, 0.05, case) / 3600.0, 1)  # hours
    19.3
    """
    level = float(check_percent(level_percent, "oxygen level"))
    seg = _segments(room_volume, ventilation, release, sudden_model, initial_percent)
    if seg.c_start[0] <= level:
        return 0.0
    for t0, _t1, cs, ce, ci, k in zip(*seg, strict=True):
        if ce <= level and ci < level < cs:
            return float(t0 + math.log((cs - ci) / (level - ci)) / k)
    return math.inf


def time_to_recover(
    level_percent,
    room_volume,
    ventilation,
    release,
    *,
    sudden_model=DEFAULT_SUDDEN_MODEL,
    initial_percent=AIR_OXYGEN_PERCENT,
) -> float:
    """Time after which the oxygen stays at or above a level for good (re-entry time).

    .. math:: t_r = \\sup \\{ t : C(t) < C_{level} \\}

    found in closed form on each interval of constant rate.

    Parameters
    ----------
    level_percent : float
        The level, [%], 0 to 20.9.
    room_volume : float
        Free volume of the room, [m^3].
    ventilation : float
        The room's fresh-air flow, [m^3/s].
    release : Release
        The case.
    sudden_model : str, optional
        Model for the sudden volume.
    initial_percent : float, optional
        Oxygen before the case, [%].

    Returns
    -------
    float
        Time since the case began, [s]; 0 if it never falls below; ``inf`` if it never
        comes back (the steady state is below the level, or there is no ventilation).

    Notes
    -----
    A well-mixed figure: check the air with a monitor before anyone enters.

    References
    ----------
    1. As :func:`oxygen_curve`.

    Examples
    --------
    >>> from cryoplan.physics.oxygen import sudden_release_case
    >>> case = sudden_release_case(0.250, 750.0)
    >>> round(time_to_recover(19.5, 100.0, 600.0 / 3600.0, case) / 60.0, 1)  # minutes
    25.4
    """
    level = float(check_percent(level_percent, "oxygen level"))
    seg = _segments(room_volume, ventilation, release, sudden_model, initial_percent)
    last = 0.0
    for t0, t1, cs, ce, ci, k in zip(*seg, strict=True):
        if cs < level <= ce and ci > cs:  # rises through the level in this interval
            if ci > level:
                last = max(last, float(t0 + math.log((ci - cs) / (ci - level)) / k))
            else:  # only approaches the level as its steady state
                last = math.inf
        elif ce < level:
            last = max(last, float(t1))
    return last


def ventilation_for_release(
    level_percent,
    room_volume,
    release,
    *,
    sudden_model=DEFAULT_SUDDEN_MODEL,
    initial_percent=AIR_OXYGEN_PERCENT,
) -> float:
    """Smallest fresh-air flow that keeps a release case at or above a level throughout.

    The lowest oxygen rises with the ventilation (more fresh air never lowers the
    oxygen), so the flow is found by bisection between no ventilation and the steady-state
    flow of the largest rate:

    .. math::

        \\min_t C(t; Q) = C_{level}, \\qquad
        0 \\le Q \\le \\max_i R_i \\frac{C_{level}}{20.9 - C_{level}}

    Parameters
    ----------
    level_percent : float
        The level to hold, [%], 0 to 20.9.
    room_volume : float
        Free volume of the room, [m^3].
    release : Release
        The case.
    sudden_model : str, optional
        Model for the sudden volume.
    initial_percent : float, optional
        Oxygen before the case, [%].

    Returns
    -------
    float
        The room's fresh-air flow, [m^3/s] (before the case's ``ventilation_working``
        share); 0 if none is needed; ``inf`` if no ventilation can do it (a sudden release
        below the level, a case with failed ventilation, or a level of 20.9 %).

    Notes
    -----
    Returns the upper end of the final bracket (relative width 1e-10), so the flow
    returned always holds the level.

    References
    ----------
    1. Fermilab ES&H Manual, chapter 4240 (from memory).

    Examples
    --------
    >>> from cryoplan.physics.oxygen import quench_case
    >>> case = quench_case(0.100, 750.0, duration=30.0)
    >>> round(ventilation_for_release(19.5, 1000.0, case) * 3600.0)  # m^3/h, large room
    18653
    """
    level = float(check_percent(level_percent, "oxygen level"))

    def low(q: float) -> float:
        return lowest_oxygen(
            room_volume, q, release, sudden_model=sudden_model, initial_percent=initial_percent
        ).percent

    if low(0.0) >= level:
        return 0.0
    start = _segments(room_volume, 0.0, release, sudden_model, initial_percent).c_start[0]
    if start < level or release.ventilation_working == 0.0 or level >= AIR_OXYGEN_PERCENT:
        return math.inf
    top_rate = max(rate for _, rate in release.schedule)
    hi = top_rate * level / (AIR_OXYGEN_PERCENT - level) / release.ventilation_working
    hi *= 1.0 + 1e-9
    while low(hi) < level:  # rounding at the exact bound only
        hi *= 1.0 + 1e-6
    lo = 0.0
    while hi - lo > 1e-7 * hi:  # a flow to seven figures: far finer than any fan is set
        mid = 0.5 * (lo + hi)
        if low(mid) >= level:
            hi = mid
        else:
            lo = mid
    return hi


@dataclass(frozen=True)
class ReleaseAssessment:
    """The figures of one release case in one room (see :func:`assess_release`)."""

    label: str
    lowest_percent: float  #: lowest oxygen [%]
    lowest_time_s: float  #: when [s]; inf if approached for ever
    time_to_alarm_s: float  #: first time at or below the alarm level [s]; inf if never
    time_to_deficient_s: float  #: first time at or below 19.5 % [s]; inf if never
    time_to_recover_s: float  #: after this the oxygen stays at or above the alarm level [s]
    sudden_drop_percent: float  #: oxygen just after the sudden part [%]; initial if none
    ventilation_needed: float  #: fresh air to stay at or above the alarm level [m^3/s]
    continuous_ventilation_needed: float  #: the same for the continuous part alone [m^3/s]
    minimum_room_volume: float  #: room for the sudden part to stay above the alarm [m^3]


def assess_release(
    room_volume,
    ventilation,
    release,
    *,
    alarm_percent=DEFICIENT_PERCENT,
    sudden_model=DEFAULT_SUDDEN_MODEL,
    initial_percent=AIR_OXYGEN_PERCENT,
    horizon=math.inf,
) -> ReleaseAssessment:
    """All the figures of one release case in one room, from the well-mixed room model.

    .. math::

        C_{min}, \\; t(C = C_{alarm}), \\; t(C = 19.5), \\; t_{recover}, \\;
        Q_{needed}, \\; V_{room,min}

    Parameters
    ----------
    room_volume : float
        Free volume of the room, [m^3].
    ventilation : float
        The room's fresh-air flow, [m^3/s].
    release : Release
        The case.
    alarm_percent : float, optional
        The site's alarm level, [%], 0 to 20.9; default 19.5.
    sudden_model : str, optional
        Model for the sudden volume.
    initial_percent : float, optional
        Oxygen before the case, [%].
    horizon : float, optional
        Time up to which the lowest oxygen is sought, [s] (:func:`lowest_oxygen`); the
        other figures look for ever.

    Returns
    -------
    ReleaseAssessment

    Notes
    -----
    ``continuous_ventilation_needed`` leaves out the sudden volume, so that a verdict can
    name the ventilation a continuous release calls for even where a sudden release in
    the same case is beyond any ventilation.

    References
    ----------
    1. As :func:`oxygen_curve`.

    Examples
    --------
    >>> from cryoplan.physics.oxygen import quench_case
    >>> a = assess_release(100.0, 200.0 / 3600.0, quench_case(0.100, 750.0))
    >>> round(a.lowest_percent, 2), round(a.time_to_alarm_s, 1), a.ventilation_needed > 0
    (9.95, 2.8, True)
    """
    alarm = float(check_percent(alarm_percent, "alarm level"))
    kw = {"sudden_model": sudden_model, "initial_percent": initial_percent}
    low = lowest_oxygen(room_volume, ventilation, release, horizon=horizon, **kw)
    seg = _segments(room_volume, ventilation, release, sudden_model, initial_percent)
    continuous = Release(release.label, 0.0, release.schedule, release.ventilation_working)
    if release.sudden_volume > 0.0:
        v_min = float(minimum_room_volume(release.sudden_volume, alarm, sudden_model))
    else:
        v_min = 0.0
    return ReleaseAssessment(
        label=release.label,
        lowest_percent=low.percent,
        lowest_time_s=low.time_s,
        time_to_alarm_s=time_to_level(alarm, room_volume, ventilation, release, **kw),
        time_to_deficient_s=time_to_level(
            DEFICIENT_PERCENT, room_volume, ventilation, release, **kw
        ),
        time_to_recover_s=time_to_recover(alarm, room_volume, ventilation, release, **kw),
        sudden_drop_percent=float(seg.c_start[0]),
        ventilation_needed=ventilation_for_release(alarm, room_volume, release, **kw),
        continuous_ventilation_needed=ventilation_for_release(
            alarm, room_volume, continuous, **kw
        ),
        minimum_room_volume=v_min,
    )


# ---------------------------------------------------------------------------------------
