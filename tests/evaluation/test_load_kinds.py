"""Tests of cryoplan.evaluation.load_kinds: one function per kind of [[load]], the same in the
static table and in the cooler simulation."""

from __future__ import annotations

import math
import textwrap

import numpy as np
import pytest

from cryoplan.evaluation import load_kinds as lk
from cryoplan.evaluation.cooler import load_function
from cryoplan.evaluation.loads import stage_loads
from cryoplan.plan import parse_plan
from cryoplan.plan.schema import LOAD_KEYS

#: Stefan-Boltzmann constant [W/(m^2 K^4)], CODATA 2018 (exact since the 2019 SI).
SIGMA = 5.670374419e-8

PLAN = textwrap.dedent(
    """\
    title = "every kind"
    ambient = "293 K"

    [[stage]]
    name = "shield"
    temperature = "50 K"
    parts = [ { name = "shield", material = "copper", mass = "5 kg" } ]

    [[stage]]
    name = "plate"
    temperature = "4.2 K"
    parts = [ { name = "plate", material = "copper", mass = "2 kg" } ]

    [[load]]
    name = "heater"
    stage = "plate"
    kind = "fixed"
    power = "0.1 W"

    [[load]]
    name = "bare"
    stage = "shield"
    kind = "radiation"
    area = "1 m^2"
    from = "293 K"
    emissivity = [0.05, 0.1]

    [[load]]
    name = "inner"
    stage = "plate"
    kind = "radiation"
    area = "0.3 m^2"
    from = "shield"
    emissivity = 0.05

    [[load]]
    name = "strut"
    stage = "plate"
    kind = "support"
    material = "g10-cr"
    area = "30 mm^2"
    length = "120 mm"
    count = 4
    from = "293 K"
    via = ["shield"]

    [[load]]
    name = "wiring"
    stage = "plate"
    kind = "wire"
    material = "phosphor-bronze"
    gauge = 32
    length = "1 m"
    count = 24
    from = "shield"

    [[load]]
    name = "leads"
    stage = "shield"
    kind = "lead"
    current = "2 A"
    from = "293 K"

    [[load]]
    name = "residual gas"
    stage = "plate"
    kind = "gas"
    area = "0.3 m^2"
    from = "shield"
    pressure = "1e-4 Pa"
    gas = "helium"

    [[load]]
    name = "tube"
    stage = "plate"
    kind = "neck"
    material = "stainless-304"
    area = "40 mm^2"
    length = "0.3 m"
    from = "shield"

    [cooler]
    input_power = "7 kW"
    stage = [
      { stage = "shield", capacity = [[30, 0], [50, 40], [80, 80]] },
      { stage = "plate", capacity = [[3, 0], [4.2, 1.5], [10, 5]] },
    ]
    """
)

MLI = textwrap.dedent(
    """\
    [[load]]
    name = "blanket"
    stage = "shield"
    kind = "radiation"
    area = "1 m^2"
    from = "293 K"
    layers = 20
    """
)


@pytest.fixture(scope="module")
def plan():
    return parse_plan(PLAN, "plan.toml")


def test_each_kind_maps_to_the_function_it_claims():
    # the table names every kind the plan reader accepts, and no other
    assert set(lk.LOAD_KINDS) == set(LOAD_KEYS)
    claimed = {
        "fixed": (lk.fixed_heat, lk.fixed_detail, "constant"),
        "radiation": (lk.radiation_heat, lk.radiation_detail, "follows"),
        "support": (lk.conduction_heat, lk.conduction_detail, "follows"),
        "wire": (lk.conduction_heat, lk.conduction_detail, "follows"),
        "lead": (lk.lead_heat, lk.lead_detail, "held"),
        "gas": (lk.gas_heat, lk.gas_detail, "held"),
        "neck": (lk.neck_heat, lk.neck_detail, "held"),
    }
    for kind, (heat, detail, rule) in claimed.items():
        entry = lk.LOAD_KINDS[kind]
        assert (entry.heat, entry.detail, entry.in_simulation) == (heat, detail, rule), kind


def test_each_kind_dispatches_to_its_own_physics(plan):
    temps = {s.name: s.temperature for s in plan.stages}
    ctx = lk.LoadContext(plan)
    by_name = {ld.values["name"]: ld for ld in plan.loads}
    # fixed: the stated power
    assert lk.load_heat(by_name["heater"], temps, ctx) == [("plate", 0.1)]
    # bare radiation: gray bodies, small body in a large enclosure (area_ratio 0):
    # q = sigma A (Tw^4 - Tc^4) / (1/e_c + 0 * (1/e_w - 1)) (Barron 1985, ch. 6)
    [(stage, q)] = lk.load_heat(by_name["bare"], temps, ctx)
    hand = SIGMA * 1.0 * (293.0**4 - 50.0**4) * 0.05
    assert stage == "shield" and q == pytest.approx(hand, rel=1e-9)  # same closed form
    # the intercepted support loads the sink and the cold end; their sum is what leaves
    # the warm end, which is below a bare 293 K -> 4.2 K support of the same length
    flows = dict(lk.load_heat(by_name["strut"], temps, ctx))
    assert set(flows) == {"shield", "plate"}
    assert 0 < flows["plate"] < flows["shield"]


def _sim_context(plan):
    names = [s.name for s in plan.stages]
    return lk.LoadContext(
        plan,
        static=False,
        mli_degradation=True,
        integral=lambda mid, rrr: lk.tabulated_integral(mid, rrr, 1.05, 296.0),
    ), names


def test_static_table_and_simulation_give_the_same_watts_per_load(plan):
    temps = {s.name: s.temperature for s in plan.stages}
    static = lk.LoadContext(plan)
    sim, names = _sim_context(plan)
    for load in plan.loads:
        kind = lk.load_kind(load)
        if kind.in_simulation == "held":
            continue  # the simulation takes these from the static table itself (below)
        a = dict(lk.load_heat(load, temps, static))
        b = dict(lk.load_heat(load, temps, sim))
        assert set(a) == set(b)
        for stage in a:
            # the simulation's conductivity integral is K(T) tabulated on 200 log-spaced
            # temperatures and interpolated linearly: 0.5 % covers that interpolation for
            # these smooth integrals; radiation and fixed loads agree to rounding
            assert float(b[stage]) == pytest.approx(a[stage], rel=5e-3), load.values["name"]


def test_simulated_loads_at_the_targets_equal_the_static_totals(plan):
    names = [s.name for s in plan.stages]
    targets = np.array([s.temperature for s in plan.stages])
    items, totals = stage_loads(plan, dict(zip(names, targets.tolist())))
    load_fn, held = load_function(plan, names, 1.05, 296.0, items)
    assert sorted(held) == ["leads", "residual gas", "tube"]
    got = load_fn(targets)
    for k, n in enumerate(names):
        # tolerance: the tabulated conductivity integral, as above
        assert got[k] == pytest.approx(totals[n], rel=5e-3), n
    # many states at once (columns) give each state's own figures
    cols = np.array([[293.0, 120.0, 50.0], [293.0, 60.0, 4.2]])
    many = load_fn(cols)
    for j in range(cols.shape[1]):
        np.testing.assert_allclose(many[:, j], load_fn(cols[:, j]), rtol=1e-12)


def test_mli_differs_between_table_and_simulation_by_its_degradation_factor_only():
    # issue 13, item 6: the static table leaves the factor at 1 today; the simulation
    # carries it. This test pins that the difference is exactly that factor.
    plan = parse_plan(PLAN + MLI, "plan.toml")
    temps = {s.name: s.temperature for s in plan.stages}
    load = next(ld for ld in plan.loads if ld.values["name"] == "blanket")
    [(_, a)] = lk.load_heat(load, temps, lk.LoadContext(plan))
    sim, _ = _sim_context(plan)
    [(_, b)] = lk.load_heat(load, temps, sim)
    assert float(b) == pytest.approx(load.values["degradation"] * a, rel=1e-12)


def test_arrays_of_cold_end_temperatures_equal_one_by_one(plan):
    sim, _ = _sim_context(plan)
    tc = np.array([4.2, 10.0, 40.0])
    for load in plan.loads:
        if lk.load_kind(load).in_simulation != "follows":
            continue
        t_cold, t_warm, via = lk.load_ends(load, {"shield": 50.0, "plate": tc})
        many = dict(load_kind_heat(load, t_cold, t_warm, via, sim))
        for i, t in enumerate(tc):
            one = dict(
                load_kind_heat(load, *lk.load_ends(load, {"shield": 50.0, "plate": t}), sim)
            )
            for stage in one:
                # rounding only
                assert np.broadcast_to(many[stage], tc.shape)[i] == pytest.approx(
                    float(one[stage]), rel=1e-12
                )


def load_kind_heat(load, t_cold, t_warm, via, ctx):
    return lk.load_kind(load).heat(load, t_cold, t_warm, ctx, via)


def test_radiation_runs_one_way_in_the_table_and_both_ways_in_the_simulation(plan):
    load = next(ld for ld in plan.loads if ld.values["name"] == "inner")
    temps = {"shield": 4.0, "plate": 10.0}  # the "warm" side colder
    [(_, a)] = lk.load_heat(load, temps, lk.LoadContext(plan))
    sim, _ = _sim_context(plan)
    [(_, b)] = lk.load_heat(load, temps, sim)
    assert a == 0.0
    assert b < 0 and math.isfinite(b)
