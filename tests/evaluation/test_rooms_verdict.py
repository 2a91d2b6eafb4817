"""Tests of cryoplan.evaluation.rooms_verdict: the plain-words verdict of a room.

The figures the sentences quote are worked out by hand beside each assertion, from the
published formulas of the room models (FESHM 4240: Fermilab ES&H Manual, chapter 4240,
"Oxygen Deficiency Hazards (ODH)", from memory); the rounding is the verdict's own rule
(flows up to two significant figures, the time to the alarm down, the time to recover up).
"""

from __future__ import annotations

import math

import pytest

from cryoplan.errors import InputError
from cryoplan.evaluation.rooms_verdict import room_verdict
from cryoplan.physics import oxygen as ox

Q_2ACH = 200.0 / 3600.0  # 2 air changes per hour in a 100 m^3 room [m^3/s]


def test_verdict_sudden_release_in_small_room():
    a = ox.assess_release(100.0, Q_2ACH, ox.sudden_release_case(0.250, 750.0))
    lines = room_verdict(
        a.lowest_percent,
        a.time_to_alarm_s,
        19.5,
        ventilation=Q_2ACH,
        ventilation_needed=a.continuous_ventilation_needed,
        sudden_drop_percent=a.sudden_drop_percent,
        minimum_room_volume=a.minimum_room_volume,
        room_volume=100.0,
        time_to_recover_s=a.time_to_recover_s,
    )
    text = "\n".join(lines)
    assert all(isinstance(x, str) for x in lines)
    assert "oxygen monitor with an audible and visible alarm is needed" in text
    assert "Do not enter after an alarm" in text
    assert "No ventilation prevents the drop" in text
    # 2704.3 m^3 rounded up to two figures: 2,800 m^3
    assert "at least 2,800 m^3 (it has 100 m^3)" in text
    assert "at once" in text
    # recovery 1800 s ln(17.6949/1.4) = 4566.3 s at 2 air changes per hour (FESHM 4240,
    # R = 0, hand): 76.1 minutes, rounded up to 77
    assert "back above 19.5 % within 77 minutes" in text
    assert lines[-1].startswith("At the lowest estimate, 3.2 %")


def test_verdict_asks_for_ventilation():
    # need 0.139286 m^3/s = 501.4 m^3/h (hand, above), rounded up to two figures: 510
    need = ox.ventilation_to_hold(19.5, 0.01)
    lines = room_verdict(17.4, 856.8, 19.5, ventilation=Q_2ACH, ventilation_needed=need)
    text = "\n".join(lines)
    assert "Ask the facility for at least 510 m^3/h of fresh air (it has 200 m^3/h)" in text
    assert "within 14 minutes" in text  # 856.8 s = 14.3 min, rounded down


def test_verdict_impractical_ventilation_for_a_quench():
    a = ox.assess_release(100.0, Q_2ACH, ox.quench_case(0.100, 750.0))
    lines = room_verdict(
        a.lowest_percent,
        a.time_to_alarm_s,
        ventilation=Q_2ACH,
        ventilation_needed=a.continuous_ventilation_needed,
        ventilation_case="a quench",
        room_volume=100.0,
    )
    text = "\n".join(lines)
    # 2.5 m^3/s x 19.5/1.4 = 34.82 m^3/s = 125,357 m^3/h (hand): over 1,000 air changes
    # per hour in 100 m^3, far beyond the practical limit of 30
    assert (
        "No practical ventilation keeps the oxygen above the alarm level during a quench" in text
    )
    assert "130,000 m^3/h" in text
    assert "within a minute of a release starting" in text  # 2.8 s
    assert "Ask the facility" not in text


def test_verdict_safe_room_and_low_alarm(capsys):
    lines = room_verdict(20.5, math.inf, 19.5)
    assert len(lines) == 1 and "do not call for an oxygen monitor" in lines[0]
    low_alarm = room_verdict(18.5, math.inf, 18.0)
    assert "set the alarm higher" in low_alarm[0]
    assert capsys.readouterr().out == ""  # pure: prints nothing


@pytest.mark.parametrize("alarm", [-1.0, 21.0, 25.0, float("nan")])
def test_alarm_level_outside_range(alarm):
    # an oxygen level lies between 0 and fresh air's 20.9 % (U.S. Standard Atmosphere 1976)
    with pytest.raises(InputError, match="between 0 and 20.9 %"):
        room_verdict(10.0, 0.0, alarm)
