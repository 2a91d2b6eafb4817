"""The plain-words verdict for a room, from the figures of its worst release case.

Sentences for the report, built from what :mod:`cryoplan.physics.oxygen` computes (lowest
oxygen, times to the alarm level and back, the ventilation and room volume a release calls
for). The rules are those of the trade, in the tool's own words; the sentences are a
planning aid (:data:`cryoplan.report.cautions.PLANNING_AID_NOTICE`).
"""

from __future__ import annotations

import math

from ..physics import checks
from ..physics.oxygen import DEFICIENT_PERCENT, check_percent, oxygen_effect

__all__ = ["PRACTICAL_AIR_CHANGES_PER_HOUR", "room_verdict"]


def _round_up(x: float, digits: int = 2) -> float:
    """Round up to ``digits`` significant figures (what to ask for, never less)."""
    if not x > 0.0 or not math.isfinite(x):
        return x
    step = 10.0 ** (math.floor(math.log10(x)) - digits + 1)
    return math.ceil(x / step - 1e-9) * step


def _number(x: float) -> str:
    return f"{x:,.0f}" if x >= 100 else f"{x:.3g}"


def _within(t: float, up: bool = False) -> str:
    """A time in words, rounded down (time to an alarm) or up (time to recover)."""
    whole = math.ceil if up else math.floor
    if t <= 60.0:
        return "within a minute"
    if t < 2 * 3600.0:
        return f"within {max(1, whole(t / 60.0))} minutes"
    return f"within {whole(t / 3600.0)} hours"


#: Above this many air changes per hour a ventilation figure is not worth asking for:
#: laboratories run at about 6 to 20-odd air changes per hour (common practice).
PRACTICAL_AIR_CHANGES_PER_HOUR = 30.0


def room_verdict(
    lowest_percent,
    time_to_alarm_s,
    alarm_percent=DEFICIENT_PERCENT,
    *,
    ventilation=None,
    ventilation_needed=None,
    ventilation_case="a continuous release",
    sudden_drop_percent=None,
    minimum_room_volume=None,
    room_volume=None,
    time_to_recover_s=None,
    practical_air_changes_per_hour=PRACTICAL_AIR_CHANGES_PER_HOUR,
) -> list[str]:
    """Plain-words verdict for a room from its worst case (rules of the trade, our words).

    .. math:: C_{min} < C_{alarm} \\Rightarrow \\text{monitor, alarm, no entry, ...}

    Parameters
    ----------
    lowest_percent : float
        Lowest oxygen over the room's cases, [%].
    time_to_alarm_s : float
        Shortest time to the alarm level over the cases, [s]; ``inf`` if never.
    alarm_percent : float, optional
        The site's alarm level, [%], 0 to 20.9.
    ventilation : float, optional
        The room's fresh-air flow now, [m^3/s].
    ventilation_needed : float, optional
        Fresh air that keeps the releases without a sudden part above the alarm level,
        [m^3/s] (the largest ``continuous_ventilation_needed`` of the cases).
    ventilation_case : str, optional
        What that flow is for, in words ("a quench", "a loss of vacuum").
    sudden_drop_percent : float, optional
        Lowest oxygen just after a sudden release, [%].
    minimum_room_volume : float, optional
        Room a sudden release needs to stay above the alarm level, [m^3].
    room_volume : float, optional
        The room's free volume, [m^3]; needed to judge whether a flow is practical.
    time_to_recover_s : float, optional
        Longest time before the oxygen is back above the alarm level for good, [s].
    practical_air_changes_per_hour : float, optional
        Above this, a flow is reported as beyond practical ventilation, [1/h].

    Returns
    -------
    list of str
        Short sentences, most important first.

    Notes
    -----
    Flows are given in m^3/h and rounded up to two significant figures; the time to the
    alarm level is rounded down, the time to recover up. The sentences are a planning
    aid: local codes, the site's safety office and licensed practice decide
    (:data:`cryoplan.report.cautions.PLANNING_AID_NOTICE`).

    References
    ----------
    1. US OSHA 29 CFR 1910.134 (from memory: 19.5 %).
    2. Fermilab ES&H Manual, chapter 4240 (from memory: monitors, alarms and ventilation
       as controls).

    Examples
    --------
    >>> for line in room_verdict(3.2, 0.0, 19.5)[:2]:
    ...     print(line)
    An oxygen monitor with an audible and visible alarm is needed in this room, set to alarm at 19.5 %.
    After a sudden release the oxygen would fall below the alarm level at once: leave as soon as the alarm sounds.
    """
    low = float(check_percent(lowest_percent, "lowest oxygen"))
    alarm = float(check_percent(alarm_percent, "alarm level"))
    t_alarm = float(checks.nonnegative(time_to_alarm_s, "time to the alarm level", "s", inf=True))
    v_room = None
    if room_volume is not None:
        v_room = float(checks.positive(room_volume, "room volume", "m^3"))
    safe = max(alarm, DEFICIENT_PERCENT)
    lines: list[str] = []
    if low >= safe:
        lines.append(
            f"In every case estimated the oxygen stays at or above {low:.1f} %, above the "
            f"alarm level of {alarm:.1f} %: these figures alone do not call for an oxygen "
            "monitor, but the safety office may still ask for one."
        )
        return lines
    if low >= alarm:
        lines.append(
            f"The oxygen could fall to {low:.1f} %, below the {DEFICIENT_PERCENT} % that "
            f"defines an oxygen-deficient atmosphere, without reaching the alarm level of "
            f"{alarm:.1f} %: set the alarm higher."
        )
    else:
        lines.append(
            "An oxygen monitor with an audible and visible alarm is needed in this room, "
            f"set to alarm at {alarm:.1f} %."
        )
        if t_alarm <= 1.0:
            lines.append(
                "After a sudden release the oxygen would fall below the alarm level at "
                "once: leave as soon as the alarm sounds."
            )
        elif math.isfinite(t_alarm):
            lines.append(
                f"The oxygen could reach the alarm level {_within(t_alarm)} of a release "
                "starting: leave as soon as the alarm sounds."
            )
    lines.append(
        f"Do not enter after an alarm until the monitor shows the oxygen back above "
        f"{safe:.1f} %, and never go in to help someone who has collapsed: raise the "
        "alarm and wait for rescuers with breathing apparatus."
    )
    if time_to_recover_s is not None:
        t_rec = float(checks.nonnegative(time_to_recover_s, "time to recover", "s", inf=True))
        if math.isfinite(t_rec) and t_rec > 0.0:
            lines.append(
                f"With the present ventilation the oxygen is back above {alarm:.1f} % "
                f"{_within(t_rec, up=True)} of the start of the worst case."
            )
        elif not math.isfinite(t_rec):
            lines.append(
                f"With the present ventilation the oxygen does not come back above "
                f"{alarm:.1f} % while the release lasts."
            )
    if ventilation_needed is not None:
        need = float(
            checks.nonnegative(ventilation_needed, "ventilation needed", "m^3/s", inf=True)
        )
        now = (
            None
            if ventilation is None
            else float(checks.nonnegative(ventilation, "ventilation", "m^3/s"))
        )
        if math.isfinite(need) and need > 0.0 and (now is None or need > now):
            ask = _number(_round_up(need * 3600.0))
            changes = None if v_room is None else need * 3600.0 / v_room
            if changes is not None and changes > practical_air_changes_per_hour:
                lines.append(
                    f"No practical ventilation keeps the oxygen above the alarm level during "
                    f"{ventilation_case}: it would take {ask} m^3/h of fresh air, "
                    f"{_number(changes)} air changes per hour. Lead the gas outdoors or keep "
                    "less liquid in this room."
                )
            else:
                have = "" if now is None else f" (it has {_number(now * 3600.0)} m^3/h)"
                lines.append(
                    f"Ask the facility for at least {ask} m^3/h of fresh air{have} to keep "
                    f"the oxygen above the alarm level during {ventilation_case}."
                )
    if sudden_drop_percent is not None:
        drop = float(check_percent(sudden_drop_percent, "oxygen after a sudden release"))
        if drop < alarm:
            text = (
                "No ventilation prevents the drop after a sudden release: the room is too "
                "small for this inventory."
            )
            if minimum_room_volume is not None:
                need_v = float(
                    checks.nonnegative(minimum_room_volume, "minimum room volume", "m^3", inf=True)
                )
                if math.isfinite(need_v):
                    has = "" if v_room is None else f" (it has {_number(v_room)} m^3)"
                    text += (
                        f" It would need at least {_number(_round_up(need_v))} m^3{has}; keep "
                        "less liquid here or move it to a larger room."
                    )
            lines.append(text)
    band = oxygen_effect(low)
    lines.append(f"At the lowest estimate, {low:.1f} %: {band.effect}")
    return lines
