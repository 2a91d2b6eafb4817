"""n variants of one plan in one pass: the cooldown litres, the order and the baths' boil-off
and hold time take arrays of masses, transfer losses and load factors and give, element by
element, the figures of n scalar evaluations (the reference: the scalar path itself, which
the chain's other tests check against hand calculations and published data)."""

from __future__ import annotations

import numpy as np
import pytest

from cryoplan.evaluation.budget import cooldown_litres
from cryoplan.evaluation.loads import bath_boiloff, stage_loads
from cryoplan.evaluation.supply import order_litres
from cryoplan.plan import demo_plan_path, load_plan

FACTORS = np.array([0.8, 1.0, 1.3, 2.0])
#: Arithmetic of n variants against one at a time: the per-kilogram integral is scaled by
#: the mass instead of scaling the integrand, so rounding only (1e-12 relative).
RTOL = 1e-12


@pytest.fixture(scope="module")
def plan():
    return load_plan(demo_plan_path())


def test_cooldown_litres_of_an_array_of_mass_factors(plan):
    many = cooldown_litres(plan, FACTORS)
    for i, f in enumerate(FACTORS):
        one = cooldown_litres(plan, float(f))
        for cry, litres in one.cooldown_L.items():
            assert np.shape(many.cooldown_L[cry]) == FACTORS.shape
            assert many.cooldown_L[cry][i] == pytest.approx(litres, rel=RTOL)
        for cry, litres in one.inserts_L.items():
            assert many.inserts_L[cry][i] == pytest.approx(litres, rel=RTOL)


def test_cooldown_litres_of_an_array_of_one_part_mass(plan):
    stage = plan.stages[-1]
    key = (stage.name, 0)
    masses = stage.parts[0].mass * FACTORS
    many = cooldown_litres(plan, masses={key: masses})
    for i, m in enumerate(masses):
        one = cooldown_litres(plan, masses={key: float(m)})
        for cry, litres in one.cooldown_L.items():
            assert many.cooldown_L[cry][i] == pytest.approx(litres, rel=RTOL)


def test_order_of_arrays_of_litres_and_transfer_losses(plan):
    losses = np.array([0.05, 0.1, 0.2, 0.3])
    cry = plan.cooldown.steps[0].cryogen
    many = order_litres(plan, cooldown_litres(plan, FACTORS), {cry: losses})
    for i, f in enumerate(FACTORS):
        one = order_litres(plan, cooldown_litres(plan, float(f)), {cry: float(losses[i])})
        for c, entry in one.items():
            for k in ("needed_L", "transfer_loss_L", "cooldown_L"):
                got = np.broadcast_to(many[c][k], FACTORS.shape)[i]
                assert got == pytest.approx(entry[k], rel=RTOL), (c, k)
    assert many[cry]["dewars"] == []  # dewar rounding is for one plan at a time


def test_boiloff_and_hold_time_of_an_array_of_load_factors(plan):
    _, totals = stage_loads(plan, {s.name: s.temperature for s in plan.stages})
    assert plan.baths
    many = bath_boiloff(plan, totals, FACTORS)
    for i, f in enumerate(FACTORS):
        one = bath_boiloff(plan, totals, float(f))
        for a, b in zip(many, one):
            for k in ("load_W", "rate_m3_s", "hold_s", "hold_to_refill_s"):
                assert np.shape(getattr(a, k)) == FACTORS.shape
                assert getattr(a, k)[i] == pytest.approx(getattr(b, k), rel=RTOL), k
    # a load factor of 1 is the chain's own figure; the rate is load / (L rho) exactly
    base = bath_boiloff(plan, totals)
    for a, b in zip(many, base):
        assert a.rate_m3_s[1] == pytest.approx(b.rate_m3_s, rel=RTOL)
