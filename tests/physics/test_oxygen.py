"""Tests of cryoplan.physics.oxygen: well-mixed room models, release cases, effects of low oxygen.

Hand calculations are written out beside each expected number, with the published formula
they come from. Abbreviations used below:

- FESHM 4240: Fermilab ES&H Manual, chapter 4240, "Oxygen Deficiency Hazards (ODH)" (from
  memory): continuous release with and without ventilation.
- Oxford S4/03: University of Oxford Safety Office, policy statement S4/03, Appendix 1,
  "Calculation of oxygen depletion due to liquid nitrogen losses" (British Compressed
  Gases Association method), with its worked example of normal evaporative losses.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from cryoplan.errors import InputError, UnknownNameError
from cryoplan.physics import oxygen as s

AIR = 20.9
Q_2ACH = 200.0 / 3600.0  # 2 air changes per hour in a 100 m^3 room [m^3/s]


# ---------------------------------------------------------------------------------------
# Constants
# ---------------------------------------------------------------------------------------


def test_air_and_deficiency_levels():
    # U.S. Standard Atmosphere 1976, dry-air O2 mole fraction 0.209476 (from memory):
    # 20.9476 %; our constant is it rounded to one decimal, hence 0.05.
    assert abs(s.AIR_OXYGEN_PERCENT - 20.9476) < 0.05
    # US OSHA 29 CFR 1910.134(b): below 19.5 % is oxygen-deficient (from memory).
    assert s.DEFICIENT_PERCENT == 19.5


# ---------------------------------------------------------------------------------------
# Gas from liquid
# ---------------------------------------------------------------------------------------


def _coolprop_ratio(fluid: str, t_room: float) -> float:
    from CoolProp.CoolProp import PropsSI

    liquid = PropsSI("D", "P", 101325.0, "Q", 0, fluid)  # saturated liquid at 1 atm
    gas = PropsSI("D", "T", t_room, "P", 101325.0, fluid)
    return liquid / gas


@pytest.mark.parametrize(
    "fluid, trade",
    [
        ("Nitrogen", 700.0),  # "1 L of liquid nitrogen makes about 700 L of gas" (common practice)
        ("Helium", 750.0),  # "about 750 L of gas per litre of liquid helium" (common practice)
    ],
)
def test_expansion_ratio_coolprop_against_trade_figure(fluid, trade):
    ratio = _coolprop_ratio(fluid, 293.15)
    # 5 %: the trade figures are rounded, and are quoted for room temperatures from 15 to
    # 21 degC, which alone moves the ratio by about 2 %.
    assert ratio == pytest.approx(trade, rel=0.05)
    # and gas_volume applies it: 1 m^3 of liquid gives `ratio` m^3 of gas
    assert s.gas_volume(1.0, ratio) == pytest.approx(ratio, rel=1e-15)


def test_gas_rate_oxford_worked_example():
    # Oxford S4/03, normal evaporative losses: five dewars losing 0.15 L/day each,
    # doubled for ageing insulation, expansion factor 700: L = 0.044 m^3/h (their figure).
    liquid_rate = 2 * 5 * 0.15e-3 / 86400.0  # m^3/s of liquid
    rate = s.gas_rate(liquid_rate, 700.0) * 3600.0
    # hand: 2 x 700 x 0.75 / 24000 = 0.04375 m^3/h; they print 0.044 (rounded), hence 5e-4
    assert rate == pytest.approx(0.044, abs=5e-4)


def test_air_change_flow_by_hand():
    # 2 air changes per hour in 100 m^3: 200 m^3/h (definition of an air-change rate)
    assert s.air_change_flow(2.0 / 3600.0, 100.0) * 3600.0 == pytest.approx(200.0, rel=1e-12)


def test_loss_of_vacuum_gas_rate_by_hand():
    # q A / (L rho) x ratio; 0.5 m^2 at 3.8 W/cm^2 (Lehmann and Zahn 1978, from memory) into
    # helium with L = 20.9 kJ/kg, rho = 125 kg/m^3 (round figures for the arithmetic only):
    # 19000 W / 2.6125e6 J/m^3 = 7.2727e-3 m^3/s of liquid, x 750 = 5.4545 m^3/s of gas.
    r = s.loss_of_vacuum_gas_rate(0.5, 20.9e3, 125.0, 750.0)
    assert r == pytest.approx(5.4545, abs=1e-4)  # hand figure kept to 5 digits
    assert s.LOSS_OF_VACUUM_HEAT_FLUX_BARE == 3.8e4  # 3.8 W/cm^2, Lehmann and Zahn (from memory)
    assert s.LOSS_OF_VACUUM_HEAT_FLUX_INSULATED == 0.6e4  # 0.6 W/cm^2, same source


# ---------------------------------------------------------------------------------------
# Sudden release
# ---------------------------------------------------------------------------------------


def test_sudden_release_250_litres_helium_by_hand():
    # 250 L liquid helium x 750 (trade ratio) = 187.5 m^3 of gas into a 100 m^3 room.
    vg = s.gas_volume(0.250, 750.0)
    assert vg == pytest.approx(187.5, rel=1e-15)
    # Mixed displacement (FESHM 4240 no-ventilation form at R t = V_gas):
    # 20.9 x exp(-1.875) = 20.9 x 0.153355 = 3.2051 % (hand, 4 decimals; tolerance 1e-4).
    assert s.mixed_release_percent(vg, 100.0) == pytest.approx(3.2051, abs=1e-4)
    # Dilution: 20.9 x 100 / 287.5 = 7.2696 % (hand, 4 decimals)
    assert s.dilution_release_percent(vg, 100.0) == pytest.approx(7.2696, abs=1e-4)
    # Displacement (Oxford S4/03, BCGA): 20.9 x (100 - 187.5)/100 < 0: no oxygen left
    assert s.displacement_release_percent(vg, 100.0) == 0.0
    # The default model is the mixed one
    assert s.sudden_release_percent(vg, 100.0) == s.mixed_release_percent(vg, 100.0)


def test_sudden_release_issue_figures_by_hand():
    # The figures of the issue brief: 189 m^3 of gas into 100 m^3.
    # 20.9 exp(-1.89) = 20.9 x 0.151072 = 3.1574 %; 20.9 x 100/289 = 7.2318 %.
    assert s.mixed_release_percent(189.0, 100.0) == pytest.approx(3.1574, abs=1e-4)
    assert s.dilution_release_percent(189.0, 100.0) == pytest.approx(7.2318, abs=1e-4)


def test_sudden_release_with_coolprop_ratio():
    ratio = _coolprop_ratio("Helium", 293.15)
    # CoolProp gives about 749.6 at 293.15 K (not 757): V_gas = 187.4 m^3. Against the hand
    # figure 3.2051 % for 187.5 m^3: 0.1 m^3 moves the result by 0.003 %, hence 0.01.
    assert s.mixed_release_percent(s.gas_volume(0.250, ratio), 100.0) == pytest.approx(
        3.2051, abs=0.01
    )


def test_displacement_oxford_style_nitrogen_by_hand():
    # Oxford S4/03 form: O2 = 100 x 0.209 (Vr - Vg) / Vr. A 10 L nitrogen dewar (x 700 =
    # 7 m^3) in a 36 m^3 room: 20.9 x 29 / 36 = 16.836 % (hand).
    assert s.displacement_release_percent(7.0, 36.0) == pytest.approx(16.836, abs=1e-3)


def test_sudden_model_table_maps_names():
    assert s.SUDDEN_RELEASE_MODELS["mixed"] is s.mixed_release_percent
    assert s.SUDDEN_RELEASE_MODELS["displacement"] is s.displacement_release_percent
    assert s.SUDDEN_RELEASE_MODELS["dilution"] is s.dilution_release_percent
    assert s.DEFAULT_SUDDEN_MODEL == "mixed"
    for name, func in s.SUDDEN_RELEASE_MODELS.items():
        assert s.sudden_release_percent(30.0, 100.0, name) == func(30.0, 100.0)


def test_mixed_release_is_the_fast_limit_of_continuous_release():
    # FESHM 4240 no ventilation: C = 20.9 exp(-R t / V); with R t = V_gas this is the
    # mixed form. Same formula, so agreement to rounding (1e-12).
    for vg in (1.0, 50.0, 400.0):
        continuous = s.continuous_release_percent(10.0, vg / 10.0, 100.0, 0.0)
        assert continuous == pytest.approx(s.mixed_release_percent(vg, 100.0), rel=1e-12)


@pytest.mark.parametrize("model", sorted(s.SUDDEN_RELEASE_MODELS))
@pytest.mark.parametrize("level", [19.5, 18.0, 10.0])
def test_minimum_room_volume_inverts_each_model(model, level):
    v = s.minimum_room_volume(187.5, level, model)
    # inverse of the model's formula: rounding only
    assert s.sudden_release_percent(187.5, v, model) == pytest.approx(level, rel=1e-12)


def test_minimum_room_volume_by_hand_and_edges():
    # mixed: V = 187.5 / ln(20.9 / 19.5) = 187.5 / 0.0693347 = 2704.3 m^3 (hand)
    assert s.minimum_room_volume(187.5, 19.5) == pytest.approx(2704.3, abs=0.1)
    assert s.minimum_room_volume(0.0, 19.5) == 0.0
    assert s.minimum_room_volume(1.0, AIR) == math.inf


# ---------------------------------------------------------------------------------------
# Continuous release
# ---------------------------------------------------------------------------------------


def test_steady_state_and_time_constant_by_hand():
    # FESHM 4240: C_inf = 20.9 Q / (Q + R). R = 0.01, Q = 0.05 m^3/s: 20.9 x 5/6 = 17.41667 %
    assert s.steady_state_percent(0.01, 0.05) == pytest.approx(17.41667, abs=1e-5)
    # tau = V / (Q + R) = 100 / 0.06 = 1666.67 s
    assert s.time_constant(100.0, 0.05, 0.01) == pytest.approx(1666.67, abs=0.01)
    # at t = tau: C_inf + (20.9 - C_inf) / e = 17.41667 + 3.48333 x 0.367879 = 18.69812 %
    c = s.continuous_release_percent(1666.6667, 0.01, 100.0, 0.05)
    assert c == pytest.approx(18.69812, abs=1e-4)  # hand to 5 decimals, tau rounded
    # long after: the steady state (exp(-600) is zero in double precision)
    assert s.continuous_release_percent(1.0e6, 0.01, 100.0, 0.05) == pytest.approx(
        17.41667, abs=1e-5
    )


def test_no_ventilation_by_hand():
    # FESHM 4240, Q = 0: C = 20.9 exp(-R t / V). R = 0.01, V = 100, t = 600:
    # 20.9 x exp(-0.06) = 20.9 x 0.941765 = 19.6829 %
    assert s.continuous_release_percent(600.0, 0.01, 100.0, 0.0) == pytest.approx(
        19.6829, abs=1e-4
    )
    assert s.steady_state_percent(0.01, 0.0) == 0.0


def test_normal_boiloff_oxford_worked_example():
    # Oxford S4/03: 36 m^3 basement room, 0.4 air changes per hour, L = 0.044 m^3/h of
    # nitrogen gas: "the oxygen depletion is 0.06%". They linearise (0.21 x 100 x L/(V N))
    # with 21 % and print two decimals, hence 0.005.
    gas = s.gas_rate(2 * 5 * 0.15e-3 / 86400.0, 700.0)
    q = s.air_change_flow(0.4 / 3600.0, 36.0)
    depletion = AIR - s.steady_state_percent(gas, q)
    assert depletion == pytest.approx(0.06, abs=0.005)


def test_recovery_after_sudden_release_by_hand():
    # FESHM 4240 with R = 0: C = 20.9 - (20.9 - C0) exp(-Q t / V). C0 = 3.2, one time
    # constant (V/Q = 1800 s): 20.9 - 17.7 / e = 20.9 - 6.51146 = 14.3885 %
    assert s.recovery_percent(1800.0, 3.2, 100.0, Q_2ACH) == pytest.approx(14.3885, abs=1e-4)


def test_scalar_and_array_inputs():
    t = np.array([[0.0, 60.0], [600.0, 6000.0]])
    out = s.continuous_release_percent(t, 0.01, 100.0, 0.05)
    assert out.shape == t.shape
    for i in range(2):
        for j in range(2):
            assert out[i, j] == s.continuous_release_percent(float(t[i, j]), 0.01, 100.0, 0.05)
    assert isinstance(s.steady_state_percent(0.01, 0.05), float)
    assert s.mixed_release_percent(np.array([0.0, 100.0]), 100.0).shape == (2,)


# ---------------------------------------------------------------------------------------
# Ventilation
# ---------------------------------------------------------------------------------------


def test_ventilation_to_hold_by_hand_and_inverts_steady_state():
    # Q = R C / (20.9 - C): R = 0.01 m^3/s, 19.5 %: 0.01 x 19.5 / 1.4 = 0.139286 m^3/s
    assert s.ventilation_to_hold(19.5, 0.01) == pytest.approx(0.139286, abs=1e-6)
    for level in (5.0, 18.0, 19.5, 20.5):
        q = s.ventilation_to_hold(level, 0.3)
        assert s.steady_state_percent(0.3, q) == pytest.approx(level, rel=1e-13)  # rounding
    assert s.ventilation_to_hold(19.5, 0.0) == 0.0
    assert s.ventilation_to_hold(AIR, 0.01) == math.inf


def test_ventilation_to_restore_inverts_recovery():
    q = s.ventilation_to_restore(19.5, 3.2, 100.0, 1800.0)
    # hand: 100/1800 x ln(17.7 / 1.4) = 0.055556 x 2.537103 = 0.140950 m^3/s
    assert q == pytest.approx(0.140950, abs=1e-6)
    assert s.recovery_percent(1800.0, 3.2, 100.0, q) == pytest.approx(19.5, rel=1e-12)
    assert s.ventilation_to_restore(19.5, 20.0, 100.0, 60.0) == 0.0


def test_ventilation_for_release_continuous_equals_closed_form():
    case = s.boiloff_case(0.02)
    q = s.ventilation_for_release(19.5, 100.0, case)
    # a release for ever: the steady-state flow; bisection to relative 1e-10
    assert q == pytest.approx(s.ventilation_to_hold(19.5, 0.02), rel=1e-8)


def test_ventilation_for_release_quench_holds_and_is_smallest():
    case = s.quench_case(0.100, 750.0, duration=30.0)
    q = s.ventilation_for_release(19.5, 1000.0, case)
    assert s.lowest_oxygen(1000.0, q, case).percent >= 19.5
    assert s.lowest_oxygen(1000.0, 0.999 * q, case).percent < 19.5
    # hand check of the level at the end of the window with this flow (FESHM 4240 form):
    # 20.9 [Q/(Q+R) + R/(Q+R) exp(-(Q+R) 30 / 1000)], R = 2.5 m^3/s
    r = 2.5
    c30 = AIR * (q / (q + r) + r / (q + r) * math.exp(-(q + r) * 30.0 / 1000.0))
    assert c30 == pytest.approx(19.5, abs=1e-6)
    # less than holding that rate for ever
    assert q < s.ventilation_to_hold(19.5, r)


def test_ventilation_for_release_with_part_of_the_ventilation_working():
    full = s.ventilation_for_release(19.5, 100.0, s.boiloff_case(0.02))
    half = s.ventilation_for_release(19.5, 100.0, s.Release("half", 0.0, ((0.0, 0.02),), 0.5))
    # with half the fans running the room needs twice the flow (Q enters only as w Q)
    assert half == pytest.approx(2.0 * full, rel=1e-8)


def test_ventilation_for_release_impossible_cases():
    sudden = s.sudden_release_case(0.250, 750.0)
    assert s.ventilation_for_release(19.5, 100.0, sudden) == math.inf
    failed = s.ventilation_failure_case(1e-3)
    assert s.ventilation_for_release(19.5, 100.0, failed) == math.inf
    assert s.ventilation_for_release(19.5, 100.0, s.boiloff_case(0.0)) == 0.0


# ---------------------------------------------------------------------------------------
# Release cases and the piecewise model
# ---------------------------------------------------------------------------------------


def _quench_hand(t: float) -> float:
    """FESHM 4240 forms typed out: 75 m^3 of helium over 30 s into 100 m^3 at 2 air changes
    per hour, then recovery."""
    q, r, v = Q_2ACH, 75.0 / 30.0, 100.0
    if t <= 30.0:
        return AIR * (q / (q + r) + r / (q + r) * math.exp(-(q + r) * t / v))
    c30 = _quench_hand(30.0)
    return AIR - (AIR - c30) * math.exp(-q * (t - 30.0) / v)


def test_quench_case_piecewise_by_hand():
    case = s.quench_case(0.100, 750.0, fraction=1.0, duration=30.0)
    assert case.schedule == ((0.0, 2.5), (30.0, 0.0))
    times = [0.0, 10.0, 30.0, 100.0, 3600.0]
    got = s.oxygen_curve(times, 100.0, Q_2ACH, case)
    want = [_quench_hand(t) for t in times]
    assert got == pytest.approx(want, rel=1e-12)  # same formulas: rounding only
    # hand to 4 decimals at the end of the window: Q+R = 2.555556, Q/(Q+R) = 0.021739,
    # exp(-0.766667) = 0.464558: 20.9 x (0.021739 + 0.978261 x 0.464558) = 9.9524 %
    assert got[2] == pytest.approx(9.9524, abs=2e-4)


def test_piecewise_continuity_and_return_to_fresh_air():
    case = s.quench_case(0.100, 750.0, fraction=0.6, duration=40.0, background_rate=1e-4)
    eps = 1e-9
    before, at, after = s.oxygen_curve([40.0 - eps, 40.0, 40.0 + eps], 100.0, Q_2ACH, case)
    # the slope is below 1 %/s, so over 1e-9 s the curve moves less than 1e-8
    assert abs(before - at) < 1e-8 and abs(after - at) < 1e-8
    # long after: back to the background steady state 20.9 Q/(Q + 1e-4)
    assert s.oxygen_curve(1e7, 100.0, Q_2ACH, case) == pytest.approx(
        AIR * Q_2ACH / (Q_2ACH + 1e-4), rel=1e-12
    )
    # with no background: back to fresh air
    plain = s.quench_case(0.100, 750.0, duration=40.0)
    assert s.oxygen_curve(1e7, 100.0, Q_2ACH, plain) == pytest.approx(AIR, rel=1e-12)


def test_piecewise_against_numerical_integration():
    from scipy.integrate import solve_ivp

    # An independent method: the room's mass balance V dC/dt = 20.9 Q - (Q + R(t)) C
    # integrated numerically (rtol 1e-10), against the exact piecewise solution.
    schedule = ((0.0, 0.2), (50.0, 1.5), (80.0, 0.0), (500.0, 0.05))
    case = s.Release("test", 10.0, schedule)
    v, q = 100.0, 0.1
    starts = [p[0] for p in schedule]

    def rhs(t, c):
        r = schedule[int(np.searchsorted(starts, t, side="right")) - 1][1]
        return [(AIR * q - (q + r) * c[0]) / v]

    c0 = s.mixed_release_percent(10.0, v)
    times = np.linspace(0.0, 2000.0, 41)
    sol = solve_ivp(rhs, (0.0, 2000.0), [c0], t_eval=times, rtol=1e-10, atol=1e-12, max_step=5.0)
    exact = s.oxygen_curve(times, v, q, case)
    # integrator error across rate steps (max_step 5 s): well under 1e-6 %
    np.testing.assert_allclose(exact, sol.y[0], atol=1e-6)


def test_ventilation_failure_time_to_alarm_by_hand():
    # FESHM 4240, Q = 0: t = V / R ln(20.9 / C). R = 1e-4 m^3/s, V = 100 m^3, C = 19.5:
    # 1e6 x ln(1.0717949) = 1e6 x 0.0693347 = 69334.7 s
    case = s.ventilation_failure_case(1e-4)
    t = s.time_to_level(19.5, 100.0, 10.0, case)  # ventilation given but not working
    assert t == pytest.approx(69334.7, abs=0.1)
    assert s.oxygen_curve(t, 100.0, 10.0, case) == pytest.approx(19.5, rel=1e-12)
    assert s.time_to_recover(19.5, 100.0, 10.0, case) == math.inf


def test_lowest_within_a_horizon_by_hand():
    # FESHM 4240, Q = 0: 20.9 exp(-R t / V), R = 2e-4 m^3/s, V = 100 m^3, t = 8 h:
    # 20.9 x exp(-0.0576) = 20.9 x 0.944028 = 19.7302 % (hand)
    case = s.ventilation_failure_case(2e-4)
    low = s.lowest_oxygen(100.0, Q_2ACH, case, horizon=8 * 3600.0)
    assert low.percent == pytest.approx(19.7302, abs=1e-4)
    assert low.time_s == 8 * 3600.0
    assert s.lowest_oxygen(100.0, Q_2ACH, case) == (0.0, math.inf)  # falls for ever
    # a horizon past the quench window changes nothing
    quench = s.quench_case(0.100, 750.0)
    assert s.lowest_oxygen(100.0, Q_2ACH, quench, horizon=3600.0) == s.lowest_oxygen(
        100.0, Q_2ACH, quench
    )


def test_loss_of_vacuum_case_lasts_until_empty():
    case = s.loss_of_vacuum_case(0.250, 750.0, 0.5, background_rate=1e-4)
    # 187.5 m^3 of gas at 0.5 m^3/s: 375 s (hand)
    assert case.schedule == ((0.0, 0.5001), (375.0, 1e-4))
    assert s.loss_of_vacuum_case(None, 750.0, 0.5).schedule == ((0.0, 0.5),)
    # gas released in the window is the inventory (plus background)
    finite = s.loss_of_vacuum_case(0.250, 750.0, 0.5)
    assert finite.total_gas == pytest.approx(187.5, rel=1e-12)


def test_time_to_level_and_recover_sudden_by_hand():
    case = s.sudden_release_case(0.250, 750.0)
    q = 600.0 / 3600.0
    assert s.time_to_level(19.5, 100.0, q, case) == 0.0
    # recovery from 3.2051 % to 19.5 % at Q = 1/6 m^3/s, V = 100 (FESHM 4240, R = 0):
    # t = 600 x ln(17.6949 / 1.4) = 600 x 2.536843 = 1522.1 s
    assert s.time_to_recover(19.5, 100.0, q, case) == pytest.approx(1522.1, abs=0.1)


def test_time_to_level_continuous_by_hand_and_never():
    # R = 0.01, Q = 0.05, V = 100: C(t) = 17.41667 + 3.48333 exp(-0.0006 t); to reach 19.5:
    # t = ln(3.48333 / 2.08333) / 0.0006 = ln(1.67200) / 0.0006 = 0.514021 / 0.0006 = 856.70 s
    case = s.boiloff_case(0.01)
    assert s.time_to_level(19.5, 100.0, 0.05, case) == pytest.approx(856.70, abs=0.01)
    # the steady state 17.42 % is approached, never reached
    assert s.time_to_level(s.steady_state_percent(0.01, 0.05), 100.0, 0.05, case) == math.inf
    assert s.time_to_level(10.0, 100.0, 0.05, case) == math.inf
    assert s.lowest_oxygen(100.0, 0.05, case) == (pytest.approx(17.41667, abs=1e-5), math.inf)


def test_assess_release_collects_the_figures():
    case = s.quench_case(0.100, 750.0, duration=30.0)
    a = s.assess_release(100.0, Q_2ACH, case, alarm_percent=19.5)
    assert a.label == "quench"
    assert a.lowest_percent == pytest.approx(_quench_hand(30.0), rel=1e-12)
    assert a.lowest_time_s == 30.0
    # time to 19.5 % inside the window: C_inf = 0.454348, k = 0.0255556 /s (hand):
    # ln((20.9 - 0.454348)/(19.5 - 0.454348)) / 0.0255556 = 0.0709337 / 0.0255556 = 2.7757 s
    assert a.time_to_alarm_s == pytest.approx(2.7757, abs=1e-3)
    assert a.time_to_deficient_s == a.time_to_alarm_s
    assert a.sudden_drop_percent == AIR
    assert a.minimum_room_volume == 0.0
    assert a.ventilation_needed == a.continuous_ventilation_needed
    assert s.lowest_oxygen(100.0, a.ventilation_needed, case).percent >= 19.5


# ---------------------------------------------------------------------------------------
# Effects of low oxygen
# ---------------------------------------------------------------------------------------


def test_effect_bands_cover_the_range_with_sources():
    bands = s.OXYGEN_EFFECTS
    assert bands[0].high_percent == AIR and bands[-1].low_percent == 0.0
    for upper, lower in zip(bands, bands[1:], strict=False):
        assert lower.high_percent == upper.low_percent  # contiguous
    # band edges of CGA SB-2 (from memory) and OSHA's 19.5 %
    assert [b.low_percent for b in bands] == [19.5, 15.0, 12.0, 10.0, 8.0, 6.0, 0.0]
    assert all(b.source and b.effect for b in bands)
    assert "1910.134" in bands[0].source
    assert s.oxygen_effect(19.5) is bands[0]
    assert s.oxygen_effect(19.49) is bands[1]
    assert s.oxygen_effect(0.0) is bands[-1]


# ---------------------------------------------------------------------------------------
# Bad input
# ---------------------------------------------------------------------------------------


@pytest.mark.parametrize("volume", [0.0, -5.0, float("nan"), float("inf")])
def test_bad_room_volume(volume):
    with pytest.raises(InputError, match="room volume") as info:
        s.mixed_release_percent(10.0, volume)
    assert isinstance(info.value, ValueError)
    assert info.value.expected and info.value.found
    with pytest.raises(InputError, match="room volume"):
        s.oxygen_curve(0.0, volume, 0.1, s.boiloff_case(0.01))


def test_bad_ventilation():
    with pytest.raises(InputError, match="ventilation must not be negative") as info:
        s.oxygen_curve(0.0, 100.0, -1.0, s.boiloff_case(0.01))
    assert "-1 m^3/s" in str(info.value)
    with pytest.raises(InputError, match="ventilation"):
        s.steady_state_percent(0.01, -0.1)


@pytest.mark.parametrize("alarm", [-1.0, 21.0, 25.0, float("nan")])
def test_alarm_level_outside_range(alarm):
    with pytest.raises(InputError, match="between 0 and 20.9 %"):
        s.check_percent(alarm, "alarm level")
    with pytest.raises(InputError, match="alarm level"):
        s.assess_release(100.0, 0.1, s.boiloff_case(0.01), alarm_percent=alarm)
    with pytest.raises(InputError, match="oxygen level"):
        s.time_to_level(alarm, 100.0, 0.1, s.boiloff_case(0.01))


def test_other_bad_inputs():
    with pytest.raises(InputError, match="liquid volume must not be negative"):
        s.gas_volume(-1.0, 700.0)
    with pytest.raises(InputError, match="expansion ratio must be above zero"):
        s.gas_volume(1.0, 0.0)
    with pytest.raises(InputError, match="starts must increase"):
        s.Release("x", 0.0, ((10.0, 1.0), (5.0, 0.0)))
    with pytest.raises(InputError, match="release rate must not be negative"):
        s.Release("x", 0.0, ((0.0, -1.0),))
    with pytest.raises(InputError, match="quench fraction"):
        s.quench_case(0.1, 750.0, fraction=1.5)
    with pytest.raises(InputError, match="quench duration must be above zero"):
        s.quench_case(0.1, 750.0, duration=0.0)
    with pytest.raises(UnknownNameError, match="did you mean 'mixed'"):
        s.sudden_release_percent(1.0, 100.0, "mixd")
    with pytest.raises(InputError, match="time must not be negative"):
        s.oxygen_curve(-1.0, 100.0, 0.1, s.boiloff_case(0.01))
    with pytest.raises(InputError, match="not a number"):
        s.gas_volume("lots", 700.0)


# ---------------------------------------------------------------------------------------
# Properties that hold everywhere
# ---------------------------------------------------------------------------------------

volumes = st.floats(1.0, 5000.0)
flows = st.floats(0.0, 5.0)
rates = st.floats(0.0, 10.0)
schedules = st.lists(st.tuples(st.floats(0.0, 3600.0), rates), max_size=4).map(
    lambda pairs: tuple(sorted({round(t, 3): r for t, r in pairs}.items()))
)
models = st.sampled_from(sorted(s.SUDDEN_RELEASE_MODELS))
TIMES = np.concatenate([np.linspace(0.0, 7200.0, 97), [1e5, 1e7]])


@settings(max_examples=150, deadline=None)
@given(volumes, flows, st.floats(0.0, 2000.0), schedules, models)
def test_oxygen_between_zero_and_fresh_air(v, q, sudden, schedule, model):
    case = s.Release("p", sudden, schedule)
    c = s.oxygen_curve(TIMES, v, q, case, sudden_model=model)
    assert np.all(c >= 0.0) and np.all(c <= AIR + 1e-12)
    low = s.lowest_oxygen(v, q, case, sudden_model=model)
    assert 0.0 <= low.percent <= c.min() + 1e-12  # the exact minimum is below any sample


@settings(max_examples=150, deadline=None)
@given(volumes, flows, st.floats(0.0, 2000.0), schedules, st.floats(1.0, 5.0), models)
def test_monotone_in_release_size(v, q, sudden, schedule, factor, model):
    small = s.Release("small", sudden, schedule)
    large = s.Release("large", sudden * factor, tuple((t, r * factor) for t, r in schedule))
    c_small = s.oxygen_curve(TIMES, v, q, small, sudden_model=model)
    c_large = s.oxygen_curve(TIMES, v, q, large, sudden_model=model)
    assert np.all(c_large <= c_small + 1e-9)  # rounding of the exponentials
    assert s.lowest_oxygen(v, q, large, sudden_model=model).percent <= (
        s.lowest_oxygen(v, q, small, sudden_model=model).percent + 1e-9
    )


@settings(max_examples=100, deadline=None)
@given(volumes, flows, st.floats(1.0, 3.0), schedules)
def test_more_ventilation_never_lowers_oxygen(v, q, factor, schedule):
    case = s.Release("p", 0.0, schedule)
    assert np.all(
        s.oxygen_curve(TIMES, v, q * factor, case) >= s.oxygen_curve(TIMES, v, q, case) - 1e-9
    )


@settings(max_examples=100, deadline=None)
@given(volumes, flows, schedules, st.floats(1.0, 20.0))
def test_time_to_level_is_the_first_crossing(v, q, schedule, level):
    case = s.Release("p", 0.0, schedule)
    t = s.time_to_level(level, v, q, case)
    if math.isfinite(t):
        assert s.oxygen_curve(t, v, q, case) == pytest.approx(level, abs=1e-9)
        before = np.linspace(0.0, t, 50)[:-1]
        assert np.all(s.oxygen_curve(before, v, q, case) > level - 1e-9)
    else:
        assert np.all(s.oxygen_curve(TIMES, v, q, case) > level - 1e-9)


@settings(max_examples=100, deadline=None)
@given(st.floats(0.0, 20.8), st.floats(1e-6, 100.0))
def test_ventilation_to_hold_inverts_steady_state_everywhere(level, rate):
    q = s.ventilation_to_hold(level, rate)
    assert s.steady_state_percent(rate, q) == pytest.approx(level, rel=1e-12, abs=1e-12)


@settings(max_examples=100, deadline=None)
@given(st.floats(0.0, 5000.0), volumes)
def test_sudden_models_ordered(vg, v):
    # 1 - x <= exp(-x) <= 1 / (1 + x)
    d = s.displacement_release_percent(vg, v)
    m = s.mixed_release_percent(vg, v)
    n = s.dilution_release_percent(vg, v)
    assert d <= m + 1e-12 and m <= n + 1e-12
