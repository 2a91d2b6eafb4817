"""A continuous release into a room with fresh-air ventilation: the well-mixed balance, its
steady state, time constant and recovery, and the ventilation a level calls for.
"""

from __future__ import annotations

import numpy as np

from .. import checks
from .constants import AIR_OXYGEN_PERCENT, check_percent

# Continuous release with ventilation
# ---------------------------------------------------------------------------------------


def steady_state_percent(release_rate, ventilation):
    """Oxygen a continuous release settles at with fresh-air ventilation (well-mixed room).

    .. math:: C_\\infty = 20.9 \\, \\frac{Q}{Q + R}

    Parameters
    ----------
    release_rate : float or ndarray
        Released gas at room conditions, [m^3/s].
    ventilation : float or ndarray
        Fresh air supplied to the room, [m^3/s].

    Returns
    -------
    float or ndarray
        Steady-state oxygen, [%]; 20.9 with no release, 0 with a release and no
        ventilation.

    Notes
    -----
    Independent of the room volume; the room only sets how fast it is reached
    (:func:`time_constant`). Where a plan gives an *exhaust* flow that draws its make-up
    air from outside, the fresh air is the exhaust flow less the release.

    References
    ----------
    1. Fermilab ES&H Manual, chapter 4240, "Oxygen Deficiency Hazards (ODH)" (from
       memory).
    2. University of Oxford Safety Office, policy S4/03, Appendix 1 (normal evaporative
       losses, in linearised form).

    Examples
    --------
    >>> round(steady_state_percent(0.01, 0.05), 3)
    17.417
    """
    r = checks.nonnegative(release_rate, "release rate", "m^3/s")
    q = checks.nonnegative(ventilation, "ventilation", "m^3/s")
    with np.errstate(divide="ignore", invalid="ignore"):
        c = np.where(r > 0.0, AIR_OXYGEN_PERCENT * q / (q + r), AIR_OXYGEN_PERCENT)
    return checks.scalar(c)


def time_constant(room_volume, ventilation, release_rate=0.0):
    """Time constant of a well-mixed room: its volume over the total outflow.

    .. math:: \\tau = \\frac{V}{Q + R}

    Parameters
    ----------
    room_volume : float or ndarray
        Free volume of the room, [m^3].
    ventilation : float or ndarray
        Fresh air supplied, [m^3/s].
    release_rate : float or ndarray, optional
        Released gas at room conditions, [m^3/s].

    Returns
    -------
    float or ndarray
        Time constant, [s]; ``inf`` when nothing flows.

    Notes
    -----
    After one time constant the oxygen has gone 63 % of the way to its steady state;
    after three, 95 %.

    References
    ----------
    1. Fermilab ES&H Manual, chapter 4240 (from memory).

    Examples
    --------
    >>> time_constant(100.0, 200.0 / 3600.0) / 60.0  # 2 air changes per hour: minutes
    30.0
    """
    v = checks.positive(room_volume, "room volume", "m^3")
    q = checks.nonnegative(ventilation, "ventilation", "m^3/s")
    r = checks.nonnegative(release_rate, "release rate", "m^3/s")
    with np.errstate(divide="ignore"):
        return checks.scalar(v / (q + r))


def continuous_release_percent(
    time, release_rate, room_volume, ventilation, initial_percent=AIR_OXYGEN_PERCENT
):
    """Oxygen during a constant release into a ventilated, well-mixed room (mass balance).

    .. math::

        V \\frac{dC}{dt} = 20.9\\,Q - (Q + R)\\,C
        \\;\\Rightarrow\\;
        C(t) = C_\\infty + (C_0 - C_\\infty)\\, e^{-(Q + R)\\,t / V},
        \\quad C_\\infty = 20.9 \\frac{Q}{Q + R}

    From fresh air (:math:`C_0 = 20.9`) this is
    :math:`20.9\\,[Q/(Q+R)] + 20.9\\,[R/(Q+R)]\\,e^{-(Q+R)t/V}`, and with no ventilation
    :math:`20.9\\, e^{-R t / V}`.

    Parameters
    ----------
    time : float or ndarray
        Time since the release began, [s], 0 or more.
    release_rate : float or ndarray
        Released gas at room conditions, [m^3/s].
    room_volume : float or ndarray
        Free volume of the room, [m^3].
    ventilation : float or ndarray
        Fresh air supplied, [m^3/s].
    initial_percent : float or ndarray, optional
        Oxygen at the start, [%].

    Returns
    -------
    float or ndarray
        Oxygen, [%], broadcast over the inputs.

    Notes
    -----
    Assumes the room air is perfectly mixed at every instant and the fresh air holds
    20.9 % oxygen. With ``release_rate = 0`` this is the recovery after a release
    (:func:`recovery_percent`).

    References
    ----------
    1. Fermilab ES&H Manual, chapter 4240, "Oxygen Deficiency Hazards (ODH)" (from
       memory: the formulas with and without ventilation).
    2. EIGA Doc 44, "Hazards of inert gases and oxygen depletion" (from memory).

    Examples
    --------
    >>> round(continuous_release_percent(600.0, 0.01, 100.0, 0.0), 3)  # no ventilation
    19.683
    >>> continuous_release_percent([0.0, 1e9], 0.01, 100.0, 0.05).round(3)
    array([20.9  , 17.417])
    """
    t = checks.nonnegative(time, "time", "s", inf=True)
    r = checks.nonnegative(release_rate, "release rate", "m^3/s")
    v = checks.positive(room_volume, "room volume", "m^3")
    q = checks.nonnegative(ventilation, "ventilation", "m^3/s")
    c0 = check_percent(initial_percent, "initial oxygen")
    flow = q + r
    with np.errstate(divide="ignore", invalid="ignore"):
        c_inf = np.where(flow > 0.0, AIR_OXYGEN_PERCENT * q / flow, c0)
        decay = np.where(flow > 0.0, np.exp(-flow * t / v), 1.0)
    return checks.scalar(c_inf + (c0 - c_inf) * decay)


def recovery_percent(time, start_percent, room_volume, ventilation):
    """Oxygen returning to fresh-air level once a release has stopped (well-mixed room).

    .. math:: C(t) = 20.9 - (20.9 - C_0)\\, e^{-Q t / V}

    Parameters
    ----------
    time : float or ndarray
        Time since the release stopped, [s].
    start_percent : float or ndarray
        Oxygen when the release stopped, [%].
    room_volume : float or ndarray
        Free volume of the room, [m^3].
    ventilation : float or ndarray
        Fresh air supplied, [m^3/s].

    Returns
    -------
    float or ndarray
        Oxygen, [%].

    Notes
    -----
    The zero-release case of :func:`continuous_release_percent`; nothing recovers
    without ventilation.

    References
    ----------
    1. Fermilab ES&H Manual, chapter 4240 (from memory).

    Examples
    --------
    >>> round(recovery_percent(1800.0, 3.2, 100.0, 200.0 / 3600.0), 2)  # one tau later
    14.39
    """
    return continuous_release_percent(time, 0.0, room_volume, ventilation, start_percent)


def ventilation_to_hold(level_percent, release_rate):
    """Fresh-air flow that keeps a continuous release at or above a level (steady state).

    The steady state :math:`20.9\\,Q/(Q+R)` solved for :math:`Q`:

    .. math:: Q = R \\, \\frac{C}{20.9 - C}

    Parameters
    ----------
    level_percent : float or ndarray
        Oxygen to hold, [%], from 0 to 20.9.
    release_rate : float or ndarray
        Released gas at room conditions, [m^3/s].

    Returns
    -------
    float or ndarray
        Fresh-air flow, [m^3/s]; ``inf`` for a level of 20.9 % with any release.

    Notes
    -----
    Holds for a release that lasts: the room never falls below the steady state, so
    this flow keeps any release of this rate above the level, however long. A release
    of limited duration needs less (:func:`ventilation_for_release`).

    References
    ----------
    1. Fermilab ES&H Manual, chapter 4240 (from memory).

    Examples
    --------
    >>> round(ventilation_to_hold(19.5, 0.01) * 3600.0, 1)  # m^3/h for 36 m^3/h of gas
    501.4
    """
    c = check_percent(level_percent, "oxygen level")
    r = checks.nonnegative(release_rate, "release rate", "m^3/s")
    with np.errstate(divide="ignore", invalid="ignore"):
        q = np.where(r > 0.0, r * c / (AIR_OXYGEN_PERCENT - c), 0.0)
    return checks.scalar(q)


def ventilation_to_restore(level_percent, start_percent, room_volume, within):
    """Fresh-air flow that brings the oxygen back to a level within a time (recovery inverted).

    .. math:: Q = \\frac{V}{t} \\ln \\frac{20.9 - C_0}{20.9 - C}

    Parameters
    ----------
    level_percent : float or ndarray
        Oxygen to get back to, [%], below 20.9.
    start_percent : float or ndarray
        Oxygen just after the release, [%].
    room_volume : float or ndarray
        Free volume of the room, [m^3].
    within : float or ndarray
        Time allowed after the release, [s], above zero.

    Returns
    -------
    float or ndarray
        Fresh-air flow, [m^3/s]; 0 where the oxygen never fell below the level; ``inf``
        for a level of 20.9 %.

    Notes
    -----
    No ventilation prevents the drop itself after a sudden release: it only shortens the
    time before the room is safe to enter. To avoid the drop, the room must be larger
    (:func:`minimum_room_volume`) or hold less liquid.

    References
    ----------
    1. Fermilab ES&H Manual, chapter 4240 (from memory).

    Examples
    --------
    >>> round(ventilation_to_restore(19.5, 3.2, 100.0, 1800.0) * 3600.0, 0)  # m^3/h
    507.0
    """
    c = check_percent(level_percent, "oxygen level")
    c0 = check_percent(start_percent, "oxygen after the release")
    v = checks.positive(room_volume, "room volume", "m^3")
    t = checks.positive(within, "time allowed", "s", inf=True)
    with np.errstate(divide="ignore", invalid="ignore"):
        q = v / t * np.log((AIR_OXYGEN_PERCENT - c0) / (AIR_OXYGEN_PERCENT - c))
    q = np.where(c0 >= c, 0.0, np.where(c >= AIR_OXYGEN_PERCENT, np.inf, q))
    return checks.scalar(q)


# ---------------------------------------------------------------------------------------
