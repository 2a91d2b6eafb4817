"""Tests of cryoplan.physics.refrigeration: Carnot work, survey trend, capacity curves and maps,
cooldown-time integration, steady state, and the refusals of bad input.

Every expected number names its source beside it. Analytic results are derived in the
comment beside the test from the equation the module integrates,
C(T) dT/dt = -Q_cooler(T) + Q_load(T) + links.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import cryoplan
from cryoplan.errors import InputError, TemperatureError
from cryoplan.physics.refrigeration import (
    STROBRIDGE_TREND_POINTS,
    SURVEY_SCATTER_FACTOR,
    CapacityCurve,
    CapacityMap,
    CooldownStage,
    CoolingShortfallError,
    Link,
    carnot_power,
    carnot_specific_power,
    fraction_of_carnot,
    input_power_at_fraction,
    link_conductance,
    reversible_work,
    reversible_work_from_heat_capacity,
    simulate_cooldown,
    steady_state,
    survey_percent_carnot,
    survey_percent_carnot_band,
)


def constant(q: float) -> CapacityCurve:
    """A capacity of q watts at every temperature down to 1 K (below: falls to 0 at 0 K)."""
    return CapacityCurve([[1.0, q], [400.0, q]])


def linear(a: float) -> CapacityCurve:
    """A capacity Q = a T [W] from 0 K to 400 K."""
    return CapacityCurve([[0.0, 0.0], [400.0, 400.0 * a]])


# --------------------------------------------------------------------------------------
# Carnot


def test_carnot_specific_power_exact_values():
    # Second law, ideal refrigerator: W/Q = T0/Tc - 1 (Barron, Cryogenic Systems, 1985,
    # ch. 5). 300/4.2 - 1 = 70.428571..., 300/77 - 1 = 2.896103...; exact arithmetic,
    # so the tolerance is round-off.
    assert carnot_specific_power(4.2, 300.0) == pytest.approx(300.0 / 4.2 - 1.0, rel=1e-15)
    assert round(carnot_specific_power(4.2, 300.0), 2) == 70.43
    assert round(carnot_specific_power(77.0, 300.0), 3) == 2.896


def test_carnot_public_contract_and_vectorised():
    # DESIGN.md public contract: cryoplan.carnot_specific_power
    assert cryoplan.carnot_specific_power is carnot_specific_power
    Tc = np.array([[4.2, 20.0], [77.0, 150.0]])
    out = carnot_specific_power(Tc, 300.0)
    assert out.shape == (2, 2)
    np.testing.assert_allclose(out, 300.0 / Tc - 1.0, rtol=1e-15)  # same formula, round-off
    assert isinstance(carnot_specific_power(77.0, 300.0), float)


def test_carnot_no_work_at_or_above_ambient():
    # Documented decision: heat at or above ambient flows out by itself, no work.
    assert carnot_specific_power(300.0, 300.0) == 0.0
    assert carnot_specific_power(350.0, 300.0) == 0.0


@pytest.mark.parametrize("bad", [0.0, -4.0, float("nan"), float("inf")])
def test_carnot_refuses_bad_temperature(bad):
    with pytest.raises(TemperatureError):
        carnot_specific_power(bad, 300.0)
    with pytest.raises(TemperatureError):
        carnot_specific_power(4.2, bad)


def test_carnot_power_and_fraction():
    # 1.5 W at 4.2 K, rejecting at 300 K: 1.5 (300/4.2 - 1) = 105.643 W (exact arithmetic).
    assert carnot_power(1.5, 4.2, 300.0) == pytest.approx(1.5 * (300 / 4.2 - 1), rel=1e-15)
    # On a 7 kW compressor (the example cooler): 105.643 / 7000 = 1.509 %.
    assert fraction_of_carnot(1.5, 4.2, 300.0, 7000.0) == pytest.approx(0.0150918, rel=1e-5)
    # Two stages share one input power: the elements add up to the cooler's fraction;
    # 40 (300/45 - 1) + 1.5 (300/4.2 - 1) = 332.31 W over 7 kW = 4.747 % (exact arithmetic).
    shares = fraction_of_carnot([40.0, 1.5], [45.0, 4.2], 300.0, 7000.0)
    assert shares.sum() == pytest.approx((40 * (300 / 45 - 1) + 1.5 * (300 / 4.2 - 1)) / 7000)
    with pytest.raises(InputError):
        fraction_of_carnot(1.5, 4.2, 300.0, 0.0)
    with pytest.raises(InputError):
        carnot_power(-1.0, 4.2, 300.0)


@settings(max_examples=50, deadline=None)
@given(
    load=st.floats(0.01, 1e4),
    T_cold=st.floats(1.0, 290.0),
    fraction=st.floats(0.001, 1.0),
)
def test_fraction_and_input_power_are_inverse(load, T_cold, fraction):
    # input_power_at_fraction inverts fraction_of_carnot by definition; round-off only.
    P = input_power_at_fraction(load, T_cold, 300.0, fraction)
    assert fraction_of_carnot(load, T_cold, 300.0, P) == pytest.approx(fraction, rel=1e-12)


def test_input_power_at_fraction_refuses_bad_fraction():
    for bad in (0.0, -0.1, 1.5):
        with pytest.raises(InputError):
            input_power_at_fraction(1.0, 4.2, 300.0, bad)


# --------------------------------------------------------------------------------------
# survey trend


def test_survey_trend_through_its_anchor_points():
    # The trend is set by three recalled points (Strobridge, NBS TN 655, 1974, figure of
    # percent Carnot against capacity; from memory): 1 W -> 1 %, 100 W -> 10 %,
    # 10 kW -> 30 %. This checks the algebra of the fit (round-off).
    for capacity, percent in ((1.0, 1.0), (100.0, 10.0), (1.0e4, 30.0)):
        assert survey_percent_carnot(capacity) == pytest.approx(percent, rel=1e-12)


def test_survey_trend_shape_against_the_other_recalled_points():
    # Points of the same trend NOT used in the fit (Strobridge 1974; from memory):
    # 10 W -> about 4 %, 1 kW -> about 20 %. 15 % because a value read from memory off a
    # log-scale figure is no better than that.
    for capacity, percent in STROBRIDGE_TREND_POINTS:
        assert survey_percent_carnot(capacity) == pytest.approx(percent, rel=0.15)


def test_survey_trend_against_machines_within_the_scatter():
    # Independent machines, each within the survey's scatter factor (2, from memory):
    # - a 1.5 W at 4.2 K two-stage cooler on a 7 kW compressor (the example; common
    #   practice for coolers of that class): 1.5 (300/4.2 - 1) / 7000 = 1.51 % of Carnot;
    # - a large helium refrigerator of about 18 kW at 4.5 K near 30 % of Carnot (the LHC
    #   4.5 K refrigerators; from memory), past the trend's peak, where it is held flat.
    machines = [(1.5, 100 * fraction_of_carnot(1.5, 4.2, 300.0, 7000.0)), (1.8e4, 29.0)]
    for capacity, percent in machines:
        trend = survey_percent_carnot(capacity)
        assert trend / SURVEY_SCATTER_FACTOR <= percent <= trend * SURVEY_SCATTER_FACTOR
        low, high = survey_percent_carnot_band(capacity)
        assert low <= percent <= high


def test_survey_trend_rises_and_refuses_outside_range():
    Q = np.geomspace(0.1, 1e5, 200)
    trend = survey_percent_carnot(Q)
    assert np.all(np.diff(trend) >= 0.0)  # never falls with capacity (held past its peak)
    assert trend.max() < 40.0  # best machines in the survey stay below ~40 % (from memory)
    for bad in (0.05, 2e5, -1.0):
        with pytest.raises(InputError):
            survey_percent_carnot(bad)


# --------------------------------------------------------------------------------------
# capacity curves


def test_capacity_curve_linear_between_points_and_flat_above():
    curve = CapacityCurve([[4.2, 1.5], [10, 5], [300, 5]])  # the example table
    # Linear interpolation by hand: halfway from 4.2 K to 10 K, (1.5 + 5)/2 = 3.25 W.
    assert curve(7.1) == pytest.approx(3.25, rel=1e-12)
    assert curve(4.2) == pytest.approx(1.5, rel=1e-12)
    assert curve(500.0) == 5.0  # constant above the last point (documented)
    np.testing.assert_allclose(curve(np.array([4.2, 10.0])), [1.5, 5.0], rtol=1e-12)


def test_capacity_curve_below_first_point_falls_to_base():
    # Default base: the first segment extrapolated to zero, 4.2 - 1.5 / (3.5/5.8) = 1.7143 K.
    curve = CapacityCurve([[4.2, 1.5], [10, 5], [300, 5]])
    assert curve.base_temperature == pytest.approx(4.2 - 1.5 * 5.8 / 3.5, rel=1e-12)
    assert curve(1.0) == 0.0
    # Given base 2.7 K: linear from 0 W at 2.7 K to 1.5 W at 4.2 K; at 3.45 K, 0.75 W.
    curve = CapacityCurve([[4.2, 1.5], [10, 5]], base_temperature=2.7)
    assert curve(3.45) == pytest.approx(0.75, rel=1e-12)
    assert curve(2.0) == 0.0
    # A first point of zero capacity is the base itself.
    assert CapacityCurve([[2.5, 0.0], [4.2, 1.0]]).base_temperature == 2.5
    # A flat first segment: falls to zero at 0 K (documented default).
    assert CapacityCurve([[4.0, 2.0], [10.0, 2.0]])(2.0) == pytest.approx(1.0, rel=1e-12)


@pytest.mark.parametrize(
    "table, says",
    [
        ("4.2 K: 1.5 W", "list of [K, W] pairs"),
        ({"4.2": 1.5}, "list of [K, W] pairs"),
        (1.5, "list of [K, W] pairs"),
        ([], "at least one"),
        ([[4.2, 1.5], [10]], "not a [K, W] pair"),
        ([[4.2, 1.5], [10, 5, 7]], "not a [K, W] pair"),
        ([[4.2, 1.5], ["10 K", 5]], "not a [K, W] pair"),
        ([[4.2, True]], "not a [K, W] pair"),
        ([[4.2, 1.5], [4.2, 5]], "increase"),
        ([[10, 5], [4.2, 1.5]], "increase"),
        ([[4.2, -1.5], [10, 5]], "negative capacity"),
        ([[-4.2, 1.5]], "below 0 K"),
        ([[4.2, float("nan")]], "not finite"),
        ([[0.0, 1.5], [10, 5]], "no capacity at 0 K"),
        (np.zeros((3, 3)), "list of [K, W] pairs"),
    ],
)
def test_capacity_curve_refuses_bad_tables(table, says):
    with pytest.raises(InputError) as info:
        CapacityCurve(table, key="cooler.stage[0].capacity")
    err = info.value
    assert says in err.message
    assert err.expected and err.found  # the caller fills file and line
    assert err.key.startswith("cooler.stage[0].capacity")


def test_capacity_curve_error_names_the_entry():
    with pytest.raises(InputError) as info:
        CapacityCurve([[4.2, 1.5], [10, 5], [8, 6]], key="cooler.stage[0].capacity")
    assert info.value.key == "cooler.stage[0].capacity[2]"
    assert "8 K after 10 K" in info.value.found
    info.value.file = "plan.toml"  # the caller fills the file: the message follows
    assert str(info.value).startswith("plan.toml, key 'cooler.stage[0].capacity[2]'")


def test_capacity_curve_refuses_bad_base_and_temperature():
    with pytest.raises(InputError):
        CapacityCurve([[4.2, 1.5]], base_temperature=5.0)
    with pytest.raises(TemperatureError):
        CapacityCurve([[4.2, 1.5]])(-1.0)


# --------------------------------------------------------------------------------------
# capacity maps


def small_map(**kw) -> CapacityMap:
    return CapacityMap([30, 60], [3, 10], [[10, 10], [70, 70]], [[1, 4], [0, 3]], **kw)


def test_capacity_map_bilinear_and_clamped():
    cmap = small_map()
    # At the nodes, the table itself; at the centre, the mean of the four corners (bilinear
    # interpolation by hand): Q1 = (10+10+70+70)/4 = 40, Q2 = (1+4+0+3)/4 = 2.
    q1, q2 = cmap(np.array([30.0, 60.0, 45.0]), np.array([3.0, 10.0, 6.5]))
    np.testing.assert_allclose(q1, [10.0, 70.0, 40.0], rtol=1e-12)
    np.testing.assert_allclose(q2, [1.0, 3.0, 2.0], rtol=1e-12)
    # Above the grid: the edge values (clamped).
    q1, q2 = cmap(100.0, 50.0)
    assert (q1, q2) == (pytest.approx(70.0), pytest.approx(3.0))
    # The fast scalar path of the integrator agrees with the array path (round-off).
    T = np.array([[45.0, 20.0, 80.0, 31.0], [6.5, 2.0, 20.0, 1.0]])
    np.testing.assert_allclose(
        cmap.stage_capacities(T),
        np.column_stack([cmap.stage_capacities(T[:, k]) for k in range(T.shape[1])]),
        rtol=1e-13,
    )


def test_capacity_map_below_grid_falls_to_base():
    # Second stage below its grid (3 K): linear to 0 at its base 1 K; at 2 K, half of the
    # edge value Q2(45, 3) = 0.5 W, so 0.25 W (by hand).
    cmap = small_map(base_temperatures=(20.0, 1.0))
    q1, q2 = cmap(45.0, 2.0)
    assert q2 == pytest.approx(0.25, rel=1e-12)
    assert q1 == pytest.approx(40.0, rel=1e-12)  # other stage clamped to its edge
    assert cmap(45.0, 0.5)[1] == 0.0
    assert cmap(20.0, 5.0)[0] == 0.0


@pytest.mark.parametrize(
    "args, says",
    [
        (([30], [3, 10], [[1, 1]], [[1, 1]]), "at least two temperatures"),
        (([60, 30], [3, 10], [[1, 1], [1, 1]], [[1, 1], [1, 1]]), "increase"),
        (([30, 60], [3, 10], [[1, 1, 1], [1, 1, 1]], [[1, 1], [1, 1]]), "one row per"),
        (([30, 60], [3, 10], [[1, 1], [1, -1]], [[1, 1], [1, 1]]), "0 W or more"),
        (([30, 60], [3, 10], [[1, 1], [1, 1]], "none"), "one row per"),
    ],
)
def test_capacity_map_refuses_bad_maps(args, says):
    with pytest.raises(InputError) as info:
        CapacityMap(*args, key="cooler.map")
    assert says in info.value.message
    assert info.value.key.startswith("cooler.map.")
    assert info.value.expected and info.value.found


# --------------------------------------------------------------------------------------
# cooldown time against closed forms


def test_constant_capacity_debye_plus_linear_heat_capacity():
    # C = g T + b T^3 (electronic plus Debye T^3 terms, Kittel, Introduction to Solid
    # State Physics, 2005, ch. 5-6), constant Q, no load: t = [H(T1) - H(T2)] / Q with
    # H = g T^2/2 + b T^4/4 (integral by hand). 0.1 %: the heat-capacity table (600 log
    # points, linear interpolation) is good to about 1e-4, the integrator to 1e-6.
    g, b, Q = 0.5, 2e-4, 12.0

    def C(T):
        return g * T + b * T**3

    def H(T):
        return g * T**2 / 2 + b * T**4 / 4

    result = simulate_cooldown([CooldownStage("plate", C, 300.0, 4.2, enthalpy=H)], [constant(Q)])
    expected = (H(300.0) - H(4.2)) / Q
    assert result.time_to_target[0] == pytest.approx(expected, rel=1e-3)
    assert result.cooldown_time == result.time_to_target[0]
    assert result.not_reached == []
    assert result.T[0, -1] == pytest.approx(4.2, rel=1e-6)  # stopped at the event


def test_constant_capacity_copper_from_the_library():
    # t = m [H(T1) - H(T2)] / Q with the library's own copper enthalpy (DESIGN.md
    # contract). 0.5 %: the bar; the table of c(T) adds about 1e-4.
    library = pytest.importorskip("cryoplan.data.materials")
    try:
        cu = library.material("copper")
    except Exception as exc:  # the library exists but has no copper yet
        pytest.skip(f"no copper in the library: {exc}")
    m, Q = 40.0, 25.0

    def C(T):
        return m * cu.specific_heat(T)

    def H(T):
        return m * cu.enthalpy(T)

    result = simulate_cooldown(
        [CooldownStage("plate", C, 300.0, 4.2, enthalpy=H)], [constant(Q)], ambient=300.0
    )
    expected = m * (cu.enthalpy(300.0) - cu.enthalpy(4.2)) / Q
    assert result.time_to_target[0] == pytest.approx(expected, rel=5e-3)
    assert result.closure_error < 5e-3


def test_capacity_linear_in_T_with_heat_capacity_linear_in_T():
    # Q = a T, C = b T: b T dT/dt = -a T, so T = T0 - (a/b) t and t = b (T0 - T1) / a
    # (derived by hand). 0.1 % (the bar for closed forms); exact in fact, as the
    # table of C = b T is exact under linear interpolation.
    a, b = 0.05, 3.0
    result = simulate_cooldown([CooldownStage("plate", lambda T: b * T, 300.0, 10.0)], [linear(a)])
    assert result.time_to_target[0] == pytest.approx(b * (300.0 - 10.0) / a, rel=1e-3)
    # and the straight line in between: at t = half the time, T = (300 + 10) / 2
    t_half = 0.5 * b * (300.0 - 10.0) / a
    assert result.temperatures_at(t_half)[0] == pytest.approx(155.0, rel=1e-3)


def test_capacity_linear_in_T_with_constant_heat_capacity():
    # Q = a T, C constant: C dT/dt = -a T, T = T0 exp(-a t / C), t = (C/a) ln(T0/T1)
    # (derived by hand). 0.1 %, the bar.
    a, C = 0.05, 500.0
    result = simulate_cooldown(
        [CooldownStage("plate", lambda T: np.full_like(T, C), 300.0, 10.0)], [linear(a)]
    )
    assert result.time_to_target[0] == pytest.approx(C / a * math.log(30.0), rel=1e-3)


def test_precool_from_77K_saves_the_time_from_ambient_to_77K():
    # Precool (a liquid-nitrogen step before the cooler): start the stage at 77 K. With
    # Q = a T and C = b T the time is linear in the start temperature (closed form above):
    # t(300 -> 10) - t(77 -> 10) = b (300 - 77) / a. 0.1 %, the closed-form bar.
    a, b = 0.05, 3.0
    warm = simulate_cooldown([CooldownStage("p", lambda T: b * T, 300.0, 10.0)], [linear(a)])
    cold = simulate_cooldown([CooldownStage("p", lambda T: b * T, 77.0, 10.0)], [linear(a)])
    saved = warm.time_to_target[0] - cold.time_to_target[0]
    assert saved == pytest.approx(b * (300.0 - 77.0) / a, rel=1e-3)


def test_stage_already_at_target_takes_no_time():
    result = simulate_cooldown([CooldownStage("p", lambda T: 3.0 * T, 4.0, 10.0)], [linear(0.05)])
    assert result.time_to_target == [0.0]
    assert result.t.size == 1


# --------------------------------------------------------------------------------------
# energy conservation and work


def demo_two_stage(**kw):
    """Shield and cold plate on a small two-stage map, with loads and a support link."""
    t1 = [10.0, 30.0, 60.0, 300.0]
    t2 = [2.5, 4.2, 20.0, 300.0]
    q1 = [[0, 0, 0, 0], [20, 20, 19, 18], [50, 50, 48, 45], [150, 150, 145, 140]]
    q2 = [[0, 1.6, 8, 25], [0, 1.5, 7, 22], [0, 1.2, 6, 20], [0, 0.8, 4, 12]]
    cmap = CapacityMap(t1, t2, q1, q2)

    def C1(T):  # g T + b T^3, a synthetic metal (Kittel 2005 form)
        return 30.0 * (0.05 * T + 2e-5 * T**3) + 1.0

    def H1(T):
        return 30.0 * (0.05 * T**2 / 2 + 2e-5 * T**4 / 4) + T

    def C2(T):
        return 60.0 * (0.02 * T + 1e-5 * T**3) + 0.05

    def H2(T):
        return 60.0 * (0.02 * T**2 / 2 + 1e-5 * T**4 / 4) + 0.05 * T

    def loads(T):
        return np.stack([5.0 * (1 - (T[0] / 293.0) ** 4), 0.05 + 0.0 * T[1]])

    stages = [
        CooldownStage("shield", C1, 293.0, 40.0, enthalpy=H1),
        CooldownStage("plate", C2, 293.0, 4.2, enthalpy=H2),
    ]
    args = dict(links=[Link("shield", "plate", conductance=0.01)], ambient=293.0)
    args.update(kw)
    return simulate_cooldown(stages, cmap, loads, **args)


def test_energy_conservation_two_stages_with_loads_and_links():
    # First law per stage: the integral of Q_cooler dt equals -dH plus the integrated load
    # plus the heat in through links. 0.5 %, the bar; the enthalpy here is the
    # closed form, independent of the integrator's heat-capacity tables.
    result = demo_two_stage()
    assert result.not_reached == []
    assert result.closure_error < 5e-3
    assert np.all(result.stage_closure_error < 5e-3)
    # links move heat between stages, they create none: their integrals cancel
    assert result.link_heat.sum() == pytest.approx(0.0, abs=1e-9 * result.cooler_heat.sum())
    assert np.all(result.enthalpy_change < 0.0)
    assert np.all(result.load_heat > 0.0)


def test_electrical_energy_constant_and_callable_power_agree():
    # E = P t for a constant power (definition); a callable returning the same constant
    # integrates to the same energy (integrator rtol 1e-6, so 1e-5).
    a = demo_two_stage(input_power=7000.0)
    b = demo_two_stage(input_power=lambda T: 7000.0)
    assert a.electrical_energy == pytest.approx(7000.0 * a.t[-1], rel=1e-12)
    assert b.electrical_energy == pytest.approx(a.electrical_energy, rel=1e-5)
    assert 0.0 < a.fraction_of_carnot < 1.0  # no cooler beats Carnot


def test_carnot_work_of_lifted_heat_equals_reversible_work_without_loads():
    # With no load and no link, the cooler lifts exactly the stage's enthalpy, each joule at
    # the stage's temperature: the integral of Q (T0/T - 1) dt = the integral of
    # C (T0/T - 1) dT = the reversible work (Barron 1985, ch. 5). For C = b T:
    # W = b [T0 (T1 - T2) - (T1^2 - T2^2)/2] (by hand). 0.5 %, the bar.
    b, T0 = 3.0, 300.0
    result = simulate_cooldown(
        [CooldownStage("p", lambda T: b * T, 300.0, 10.0)], [linear(0.05)], ambient=T0
    )
    expected = b * (T0 * (300.0 - 10.0) - (300.0**2 - 10.0**2) / 2)
    assert result.minimum_work[0] == pytest.approx(expected, rel=5e-3)
    assert result.carnot_work[0] == pytest.approx(expected, rel=5e-3)


def test_reversible_work_helpers():
    # C = 1 J/K from 300 K to 150 K, T0 = 300 K: W = 300 ln 2 - 150 = 57.944 J (by hand).
    expected = 300.0 * math.log(2.0) - 150.0
    assert reversible_work(lambda T: T, np.log, 300.0, 150.0, 300.0) == pytest.approx(expected)
    assert reversible_work_from_heat_capacity(lambda T: 1.0, 300.0, 150.0, 300.0) == pytest.approx(
        expected, rel=1e-9
    )  # quad to 1e-10


# --------------------------------------------------------------------------------------
# coupled stages


def test_passive_stage_never_colder_than_the_cooled_stage():
    # A stage with no cooler, linked to a cooled one, can only lose heat into it: it is
    # never colder than the cooled stage (second law), up to the integrator's tolerance.
    stages = [
        CooldownStage("cooled", lambda T: 2.0 * T, 300.0, 20.0),
        CooldownStage("passive", lambda T: 1.0 * T, 300.0, 25.0),
    ]
    result = simulate_cooldown(
        stages, [linear(0.2), None], links=[Link(0, 1, conductance=0.05)], t_max=3e6
    )
    assert np.all(result.T[1] >= result.T[0] - 1e-6)
    assert result.T.min() >= 0.0
    # first law, stage by stage, with a stage that has no cooler (0.5 %, the bar)
    assert np.all(result.stage_closure_error < 5e-3)
    assert result.not_reached == []
    assert result.time_to_target[1] > result.time_to_target[0]


def test_stiff_link_behaves_as_one_stage_of_summed_heat_capacity():
    # G -> infinity: both stages share one temperature, so the pair cools like one stage of
    # heat capacity C1 + C2 on capacity Q1 + Q2. With C = (b1 + b2) T and Q = a T the time
    # is (b1 + b2)(T0 - T1)/a (closed form above). 0.5 %: G = 1e3 W/K leaves a lag of
    # Q/G ~ 1e-2 K between the stages.
    b1, b2, a = 2.0, 1.0, 0.2
    stages = [
        CooldownStage("one", lambda T: b1 * T, 300.0, 20.0),
        CooldownStage("two", lambda T: b2 * T, 300.0, 20.0),
    ]
    result = simulate_cooldown(stages, [linear(a), None], links=[Link(0, 1, conductance=1e3)])
    expected = (b1 + b2) * (300.0 - 20.0) / a
    assert result.cooldown_time == pytest.approx(expected, rel=5e-3)
    assert np.max(np.abs(result.T[0] - result.T[1])) < 0.05


def test_link_from_conductivity_matches_constant_conductance():
    # A conductor of constant k: G = k A / L (Fourier's law) exactly; conductivity and
    # conductivity-integral forms give the same cooldown as the constant conductance.
    k, A, L = 2.0, 1e-4, 0.1
    G = k * A / L
    assert link_conductance(lambda lo, hi: k * (hi - lo), A, L, 4.0, 50.0) == pytest.approx(G)

    def run(link):
        stages = [
            CooldownStage("cooled", lambda T: 2.0 * T, 300.0, 20.0),
            CooldownStage("passive", lambda T: 0.01 * T, 300.0, 150.0),
        ]
        return simulate_cooldown(stages, [linear(0.2), None], links=[link], t_max=2e6)

    ref = run(Link(0, 1, conductance=G))
    for link in (
        Link(0, 1, conductivity=lambda T: np.full_like(T, k), area=A, length=L),
        Link(0, 1, conductivity_integral=lambda lo, hi: k * (hi - lo), area=A, length=L),
    ):
        # 1e-4: the same ODE; only the integrator's tolerance differs
        assert run(link).time_to_target[1] == pytest.approx(ref.time_to_target[1], rel=1e-4)


def test_bad_links_are_refused():
    with pytest.raises(InputError):
        Link(0, 1)
    with pytest.raises(InputError):
        Link(0, 1, conductance=1.0, conductivity=lambda T: T, area=1.0, length=1.0)
    with pytest.raises(InputError):
        Link(0, 1, conductivity=lambda T: T, area=1e-4)
    with pytest.raises(InputError):
        Link(0, 1, conductance=-1.0)
    stages = [
        CooldownStage("cold plate", lambda T: T, 300.0, 20.0),
        CooldownStage("shield", lambda T: T, 300.0, 50.0),
    ]
    with pytest.raises(InputError):
        simulate_cooldown(stages, [linear(0.1)] * 2, links=[Link(0, 3, conductance=1.0)])
    with pytest.raises(InputError):
        simulate_cooldown(stages, [linear(0.1)] * 2, links=[Link(1, 1, conductance=1.0)])
    with pytest.raises(InputError, match="did you mean 'cold plate'"):
        simulate_cooldown(
            stages, [linear(0.1)] * 2, links=[Link("cold plat", "shield", conductance=1.0)]
        )


def test_load_function_of_one_state_only_is_called_per_column():
    # A load written for shape (n,) only (a Python float per stage) still works; the same
    # constant load as an array gives the same time (same ODE; integrator tolerance).
    def scalar_load(T):
        return np.array([float(0.5 + 0.0 * T[0])])

    stage = [CooldownStage("p", lambda T: 3.0 * T, 300.0, 20.0)]
    a = simulate_cooldown(stage, [linear(0.05)], scalar_load)
    b = simulate_cooldown(stage, [linear(0.05)], [0.5])
    assert a.time_to_target[0] == pytest.approx(b.time_to_target[0], rel=1e-6)


# --------------------------------------------------------------------------------------
# stages that do not get cold: refused up front, or reported; never a hang


def test_stage_that_never_gets_cold_is_refused_with_its_shortfall():
    # Capacity 1 W everywhere, load 3 W: short by 2 W at every temperature (by hand).
    stage = [CooldownStage("cold plate", lambda T: 3.0 * T, 300.0, 4.2)]
    with pytest.raises(CoolingShortfallError) as info:
        simulate_cooldown(stage, [constant(1.0)], [3.0])
    err = info.value
    assert isinstance(err, InputError)  # exit code 2 through the command line
    assert "never gets cold" in err.message
    assert "cold plate" in err.message
    assert "2 W" in err.message
    assert err.shortfall == pytest.approx(2.0, rel=1e-9)
    with pytest.raises(CoolingShortfallError):
        steady_state([constant(1.0)], [3.0], targets=[4.2], ambient=300.0)


def test_stage_that_stalls_above_target_is_reported_not_hung():
    # Q = 0.05 T against a load of 1 W balances at 20 K (by hand): a 4.2 K target is never
    # reached; the integration ends at t_max and names the stage.
    stage = [CooldownStage("cold plate", lambda T: 3.0 * T, 300.0, 4.2)]
    result = simulate_cooldown(stage, [linear(0.05)], [1.0], t_max=10 * 86400.0)
    assert result.not_reached == ["cold plate"]
    assert result.time_to_target == [None]
    assert result.cooldown_time is None
    assert result.t[-1] == pytest.approx(10 * 86400.0)
    assert result.T[0, -1] == pytest.approx(20.0, rel=1e-3)  # at its balance, 1 W / 0.05


# --------------------------------------------------------------------------------------
# steady state


def test_steady_state_linear_capacity_against_constant_load():
    # Q = 0.6 (T - 2.5) W against 1 W: T = 2.5 + 1/0.6 = 4.1667 K (by hand). The bisection
    # goes to 1e-12 relative; 1e-9 allows for round-off in the interpolation.
    curve = CapacityCurve([[2.5, 0.0], [12.5, 6.0]])
    result = steady_state([curve], [1.0], targets=[4.2], ambient=300.0)
    assert result.temperatures[0] == pytest.approx(2.5 + 1.0 / 0.6, rel=1e-9)
    assert not result.over_capacity[0]
    assert result.margin_at_target[0] == pytest.approx(0.6 * (4.2 - 2.5) - 1.0, rel=1e-9)
    assert result.converged
    # With a 4 K target the same stage is over capacity there: 0.6 (4 - 2.5) = 0.9 W < 1 W.
    flagged = steady_state([curve], [1.0], targets=[4.0], ambient=300.0)
    assert flagged.over_capacity[0]
    assert flagged.load_at_target[0] > flagged.capacity_at_target[0]


@pytest.mark.parametrize("G", [0.4, 1e3])
def test_steady_state_with_a_passive_stage_on_a_link(G):
    # Cooled stage A: a (T_A - T_b) = L_A + L_B (it carries B's load too); passive stage B:
    # G (T_B - T_A) = L_B. So T_A = T_b + (L_A + L_B)/a, T_B = T_A + L_B/G (by hand).
    # 1e-7: the coupled solve's tolerance.
    # G = 1e3 W/K: stages locked together, which a stage-by-stage solve settles slowly.
    a, Tb, LA, LB = 0.5, 2.0, 0.3, 0.2
    curve = CapacityCurve([[Tb, 0.0], [302.0, a * 300.0]])
    result = steady_state(
        [curve, None],
        [LA, LB],
        [Link(0, 1, conductance=G)],
        targets=[4.2, 5.0],
        ambient=300.0,
        names=["plate", "sample"],
    )
    TA = Tb + (LA + LB) / a
    np.testing.assert_allclose(result.temperatures, [TA, TA + LB / G], rtol=1e-7)
    assert result.converged


def test_steady_state_matches_the_end_of_a_long_cooldown():
    # The steady temperatures are where the cooldown settles: run the demo three weeks
    # without stopping. 1e-3: the last state of the integration is within its tolerance of
    # equilibrium after many time constants.
    result = demo_two_stage(stop_when_cold=False, t_max=21 * 86400.0)
    t1 = [10.0, 30.0, 60.0, 300.0]
    t2 = [2.5, 4.2, 20.0, 300.0]
    q1 = [[0, 0, 0, 0], [20, 20, 19, 18], [50, 50, 48, 45], [150, 150, 145, 140]]
    q2 = [[0, 1.6, 8, 25], [0, 1.5, 7, 22], [0, 1.2, 6, 20], [0, 0.8, 4, 12]]

    def loads(T):
        return np.stack([5.0 * (1 - (T[0] / 293.0) ** 4), 0.05 + 0.0 * T[1]])

    steady = steady_state(
        CapacityMap(t1, t2, q1, q2),
        loads,
        [Link(0, 1, conductance=0.01)],
        targets=[40.0, 4.2],
        ambient=293.0,
    )
    np.testing.assert_allclose(steady.temperatures, result.T[:, -1], rtol=1e-3)
