"""The one place where the JSON of ``--format json`` is assembled from the steps' results.

:func:`results_to_dict` reads the typed results of :class:`~cryoplan.evaluation.results.Results`
and returns the dictionary of DESIGN.md, with the keys (and their order) of every earlier
version: ``summary`` first, then the plan, the cold mass, the budget, the cumulative litres,
the inserts, the steps, the order, its range, the liquefaction, and where the plan asks for
them the loads, the refrigeration and the rooms, then sources, notes and assumptions.
"""

from __future__ import annotations

import datetime as _dt
from typing import Any

from .. import __version__
from .results import Results


def summary_dict(results: Results) -> dict[str, Any]:
    """The ``summary`` object: the keys of :data:`cryoplan.evaluation.summary.SUMMARY_FIELDS`
    (``month_order_L`` only where the plan has loads or baths)."""
    budget, order, loads = results.budget, results.order, results.loads
    s: dict[str, Any] = {
        "cooldown_liquid_L": dict(budget.cases["nominal"].cooldown_L),
        "order_L": order.order_L,
        "static_boiloff_L_per_day": loads.boiloff_L_per_day if loads.shown else {},
        "hold_time_h": loads.hold_time_h if loads.shown else {},
        "minimum_work_J": budget.minimum_work_J,
        "cooldown_time_h": results.cooler.cooldown_time_h if results.cooler else None,
        "lowest_oxygen_percent": results.rooms.lowest_oxygen_percent if results.rooms else None,
        "cost": order.cost,
        "currency": order.currency,
        "heat_J": budget.heat_J,
    }
    if loads.shown:
        s["month_order_L"] = loads.month_order_L
    return s


def results_to_dict(results: Results) -> dict[str, Any]:
    """The JSON report of one evaluation (see the module's text)."""
    plan = results.plan
    budget, order, loads = results.budget, results.order, results.loads
    nominal = budget.cases["nominal"]
    data: dict[str, Any] = {"summary": summary_dict(results)}
    data["plan"] = {
        "title": plan.title,
        "file": plan.path,
        "ambient_K": plan.ambient,
        "cooldown_start_K": plan.cooldown.start,
        "mass_margin": plan.mass_margin,
        "cryoplan_version": __version__,
        "date": _dt.date.today().isoformat(),
    }
    data["cold_mass"] = results.materials.cold_mass
    data["budget"] = budget.budget
    data["cumulative_liquid"] = nominal.curves
    data["inserts"] = budget.inserts
    data["steps"] = nominal.steps
    data["order"] = order.order
    data["steps_range"] = order.steps_range
    data["liquefaction"] = order.liquefaction
    if loads.shown:
        data["loads"] = {
            "items": loads.items,
            "by_stage": loads.by_stage,
            "baths": loads.baths,
            "notes": loads.notes,
            "start_date": loads.start_date,
        }
    if results.cooler is not None:
        data["refrigeration"] = results.cooler.refrigeration
    if results.rooms is not None:
        data["rooms"] = results.rooms.rooms
        data["oxygen_effects"] = results.rooms.oxygen_effects
    data["sources"] = list(results.sources)
    data["notes"] = list(plan.notes)
    data["assumptions"] = list(results.assumptions)
    return data
