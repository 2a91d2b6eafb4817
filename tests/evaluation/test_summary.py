"""The summary's fields defined once (cryoplan.evaluation.summary) and the typed chain."""

from __future__ import annotations

import cryoplan
from cryoplan.evaluation import results as R
from cryoplan.evaluation.summary import SUMMARY_FIELDS, label_and_unit, report_label
from cryoplan.plan import demo_plan_path


def test_every_summary_key_of_the_demo_is_a_defined_field_in_order():
    data = cryoplan.evaluate(cryoplan.load_plan(demo_plan_path())).to_dict()
    keys = list(data["summary"])
    assert keys == [k for k in SUMMARY_FIELDS if k in keys]
    assert set(keys) == set(SUMMARY_FIELDS)  # the demo has baths, so month_order_L too
    for key, value in data["summary"].items():
        assert isinstance(value, dict) == SUMMARY_FIELDS[key].per_cryogen, key


def test_labels_are_the_printed_ones():
    assert report_label("hold_time_h", "helium") == "Hold time, helium (full to empty)"
    assert report_label("lowest_oxygen_percent") == "Lowest oxygen, worst room case"
    assert label_and_unit("static_boiloff_L_per_day.nitrogen") == (
        "Static boil-off, nitrogen",
        "L/day",
    )
    assert label_and_unit("cost.helium", "EUR") == ("Cost, helium", "EUR")


def test_the_chain_passes_typed_results():
    r = cryoplan.evaluate(cryoplan.load_plan(demo_plan_path()))
    assert isinstance(r.materials, R.MaterialsResult)
    assert isinstance(r.budget, R.BudgetResult)
    assert isinstance(r.order, R.OrderResult)
    assert isinstance(r.loads, R.LoadsResult)
    assert isinstance(r.invariants, R.InvariantsResult)
    d = r.to_dict()
    # the JSON is built from the typed results: the same figures, one place
    assert d["summary"]["order_L"] == r.order.order_L
    assert d["summary"]["minimum_work_J"] == r.budget.minimum_work_J
    for bath, fig in zip(d["loads"]["baths"], r.loads.boiloff):
        assert bath["boiloff_L_per_h"] == fig.rate_m3_s * 3.6e6
    if r.rooms is not None:
        assert d["summary"]["lowest_oxygen_percent"] == r.rooms.lowest_oxygen_percent
