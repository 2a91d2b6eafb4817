"""Release cases: a sudden volume at t = 0 and a piecewise-constant rate, built for a spill, a
magnet quench, a loss of vacuum, normal boil-off and a ventilation failure.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from .. import checks
from ..errors import InputError
from .constants import DEFAULT_QUENCH_DURATION_S, DEFAULT_QUENCH_FRACTION
from .release import gas_volume

# Release cases: a sudden volume at t = 0 and a piecewise-constant rate
# ---------------------------------------------------------------------------------------


@dataclass(frozen=True)
class Release:
    """One release case in a room: a sudden gas volume at t = 0, then a rate that changes.

    Parameters
    ----------
    label : str
        A short name of the case, for tables ("quench", "vessel rupture", ...).
    sudden_volume : float
        Gas released at once at t = 0, [m^3] at room conditions.
    schedule : sequence of (float, float)
        Pairs (start [s], rate [m^3/s]): from each start on, gas enters at that rate,
        until the next start. Starts 0 or more, strictly increasing; no gas before the
        first start.
    ventilation_working : float
        Share of the room's fresh-air flow that runs during this case, 0 to 1
        (0: ventilation failure).
    """

    label: str = "release"
    sudden_volume: float = 0.0
    schedule: tuple[tuple[float, float], ...] = ()
    ventilation_working: float = 1.0

    def __post_init__(self) -> None:
        sudden = float(checks.nonnegative(self.sudden_volume, "sudden gas volume", "m^3"))
        working = float(
            checks.fraction(self.ventilation_working, "working share of ventilation", zero=True)
        )
        pairs = []
        last = -math.inf
        for item in self.schedule:
            try:
                start, rate = item
            except (TypeError, ValueError):
                raise InputError(
                    "a release schedule entry must be a pair (start, rate)",
                    expected="(start [s], rate [m^3/s])",
                    found=repr(item),
                ) from None
            start = float(checks.nonnegative(start, "release start", "s"))
            rate = float(checks.nonnegative(rate, "release rate", "m^3/s"))
            if not start > last:
                raise InputError(
                    "release schedule starts must increase",
                    expected=f"a start after {last:g} s",
                    found=f"{start:g} s",
                )
            pairs.append((start, rate))
            last = start
        object.__setattr__(self, "sudden_volume", sudden)
        object.__setattr__(self, "ventilation_working", working)
        object.__setattr__(self, "schedule", tuple(pairs))

    @property
    def total_gas(self) -> float:
        """Gas released in all [m^3]; ``inf`` if the last rate goes on for ever."""
        total = self.sudden_volume
        for (start, rate), nxt in zip(
            self.schedule, self.schedule[1:] + ((math.inf, 0.0),), strict=True
        ):
            if rate > 0.0:
                total += rate * (nxt[0] - start)
        return total


def sudden_release_case(
    liquid_volume, expansion_ratio, *, background_rate=0.0, label="vessel rupture"
):
    """Case: a vessel's whole liquid flashes to gas at once (rupture, sudden release).

    .. math:: V_{gas} = \\varepsilon V_{liquid}, \\text{ at } t = 0; \\quad
        R(t) = R_{boil-off} \\text{ after}

    Parameters
    ----------
    liquid_volume : float
        Liquid in the vessel, [m^3] (its full capacity, for the worst case).
    expansion_ratio : float
        Gas volume at room conditions per volume of liquid, [-].
    background_rate : float, optional
        Normal boil-off of every other vessel in the room, gas at room conditions,
        [m^3/s].
    label : str, optional
        Name of the case.

    Returns
    -------
    Release

    Notes
    -----
    The British Compressed Gases Association advises taking the loss of a full vessel's
    contents just after filling as the worst case (University of Oxford Safety Office,
    policy S4/03, Appendix 1).

    References
    ----------
    1. University of Oxford Safety Office, policy statement S4/03, Appendix 1.

    Examples
    --------
    >>> sudden_release_case(0.250, 750.0).sudden_volume
    187.5
    """
    volume = float(gas_volume(liquid_volume, expansion_ratio))
    background = float(checks.nonnegative(background_rate, "background boil-off", "m^3/s"))
    schedule = ((0.0, background),) if background > 0.0 else ()
    return Release(label, volume, schedule)


def quench_case(
    liquid_volume,
    expansion_ratio,
    *,
    fraction=DEFAULT_QUENCH_FRACTION,
    duration=DEFAULT_QUENCH_DURATION_S,
    background_rate=0.0,
    label="quench",
):
    """Case: a magnet quench vents a share of its helium at a steady rate over a duration.

    .. math::

        R(t) = \\frac{f \\, \\varepsilon \\, V_{liquid}}{t_q} + R_b \\;
        (0 \\le t < t_q), \\qquad R(t) = R_b \\; (t \\ge t_q)

    Parameters
    ----------
    liquid_volume : float
        Helium liquid in the magnet's cryostat, [m^3].
    expansion_ratio : float
        Gas volume at room conditions per volume of liquid, [-].
    fraction : float, optional
        Share of the liquid that the quench boils away, 0 to 1.
    duration : float, optional
        Time over which it vents, [s], above zero.
    background_rate : float, optional
        Normal boil-off of every other vessel, [m^3/s].
    label : str, optional
        Name of the case.

    Returns
    -------
    Release

    Notes
    -----
    A steady rate over the window is a planning simplification (a real quench peaks
    early). Where the quench gas is led outdoors through a vent line, only what escapes
    into the room belongs here.

    References
    ----------
    1. Fermilab ES&H Manual, chapter 4240 (from memory: a release of limited duration,
       followed by recovery).

    Examples
    --------
    >>> quench_case(0.100, 750.0, fraction=1.0, duration=30.0).schedule
    ((0.0, 2.5), (30.0, 0.0))
    """
    total = float(gas_volume(liquid_volume, expansion_ratio))
    f = float(checks.fraction(fraction, "quench fraction", zero=True))
    tq = float(checks.positive(duration, "quench duration", "s"))
    background = float(checks.nonnegative(background_rate, "background boil-off", "m^3/s"))
    return Release(label, 0.0, ((0.0, f * total / tq + background), (tq, background)))


def loss_of_vacuum_case(
    liquid_volume, expansion_ratio, gas_rate, *, background_rate=0.0, label="loss of vacuum"
):
    """Case: a failed vessel boils at a steady gas rate until its liquid is gone.

    .. math:: R(t) = R_v + R_b \\; (t < \\varepsilon V_{liquid} / R_v), \\quad R_b \\text{ after}

    Parameters
    ----------
    liquid_volume : float or None
        Liquid in the vessel, [m^3]; ``None`` for a release that goes on (a vessel kept
        topped up).
    expansion_ratio : float
        Gas volume at room conditions per volume of liquid, [-].
    gas_rate : float
        The failed vessel's gas flow at room conditions, [m^3/s] (from the plan, or
        :func:`loss_of_vacuum_gas_rate`).
    background_rate : float, optional
        Normal boil-off of every other vessel, [m^3/s].
    label : str, optional
        Name of the case.

    Returns
    -------
    Release

    Notes
    -----
    The steady rate ends when the vessel's inventory has left as gas.

    References
    ----------
    1. W. Lehmann and G. Zahn, Proc. ICEC 7, 1978 (from memory).

    Examples
    --------
    >>> loss_of_vacuum_case(0.250, 750.0, 0.5).schedule
    ((0.0, 0.5), (375.0, 0.0))
    """
    rv = float(checks.nonnegative(gas_rate, "loss-of-vacuum gas rate", "m^3/s"))
    background = float(checks.nonnegative(background_rate, "background boil-off", "m^3/s"))
    if liquid_volume is None or rv == 0.0:
        checks.positive(expansion_ratio, "expansion ratio", "")
        return Release(label, 0.0, ((0.0, rv + background),))
    total = float(gas_volume(liquid_volume, expansion_ratio))
    if total == 0.0:
        return Release(label, 0.0, ((0.0, background),))
    return Release(label, 0.0, ((0.0, rv + background), (total / rv, background)))


def boiloff_case(background_rate, *, label="normal boil-off"):
    """Case: the normal boil-off of every vessel in the room, going on for ever.

    .. math:: R(t) = R_b = \\sum_i \\varepsilon_i \\dot V_{liquid,i}

    Parameters
    ----------
    background_rate : float
        Sum of the vessels' boil-off, gas at room conditions, [m^3/s] (:func:`gas_rate`).
    label : str, optional
        Name of the case.

    Returns
    -------
    Release

    References
    ----------
    1. University of Oxford Safety Office, policy S4/03, Appendix 1 (normal evaporative
       losses).

    Examples
    --------
    >>> boiloff_case(1e-5).schedule
    ((0.0, 1e-05),)
    """
    background = float(checks.nonnegative(background_rate, "background boil-off", "m^3/s"))
    return Release(label, 0.0, ((0.0, background),))


def ventilation_failure_case(background_rate, *, label="ventilation failure"):
    """Case: the ventilation stops while the vessels keep boiling off.

    .. math:: C(t) = 20.9 \\, e^{-R_b t / V}

    Parameters
    ----------
    background_rate : float
        Sum of the vessels' normal boil-off, gas at room conditions, [m^3/s].
    label : str, optional
        Name of the case.

    Returns
    -------
    Release
        With ``ventilation_working = 0``.

    Notes
    -----
    Without any air exchange the oxygen falls for ever; the figure that matters is the
    time to the alarm level and to 19.5 % (:func:`time_to_level`). Real rooms leak some
    air, so this is conservative.

    References
    ----------
    1. Fermilab ES&H Manual, chapter 4240 (from memory: the no-ventilation formula).

    Examples
    --------
    >>> ventilation_failure_case(1e-5).ventilation_working
    0.0
    """
    background = float(checks.nonnegative(background_rate, "background boil-off", "m^3/s"))
    return Release(label, 0.0, ((0.0, background),), ventilation_working=0.0)
