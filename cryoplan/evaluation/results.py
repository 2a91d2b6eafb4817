"""The typed results of the evaluation chain's steps, and :class:`Results` that holds them.

Each step of :func:`cryoplan.evaluation.chain.evaluate` returns one of these dataclasses; a
later step reads an earlier step's attributes, never a dictionary it parses back. Inner
rows (a part of the cold mass, a load of the static table, a room case) stay lists of plain
dicts where they are the JSON's own rows. :meth:`Results.to_dict` (:func:`results_to_dict`, at
the end of this module) is the one place where the JSON of ``--format json`` is assembled
from them, with the keys and their order of every earlier version.

Figures that a plan gives as numbers (a mass, a transfer loss, a load factor) may be numpy
arrays of shape (n,) in the steps that accept them: n variants of one plan in one pass
(see :func:`cryoplan.evaluation.budget.cooldown_litres`,
:func:`cryoplan.evaluation.supply.order_litres` and
:func:`cryoplan.evaluation.loads.bath_boiloff`).
"""

from __future__ import annotations

import datetime as _dt
from dataclasses import dataclass, field
from typing import Any

import numpy as np

from .. import __version__
from ..plan import Plan

#: A figure of one plan (float) or of n variants of it (ndarray of shape (n,)).
Figure = float | np.ndarray


@dataclass
class MaterialsResult:
    """The materials step: the cold mass as the JSON lists it and the materials' sources."""

    cold_mass: list[dict]
    sources: list[str]


@dataclass
class CooldownLitres:
    """Litres of one cryogen case (low, nominal or high masses) of the cooldown steps."""

    steps: list[dict]  # the JSON rows of ``steps`` ("liquid_L" per step)
    cooldown_L: dict[str, Figure]  # litres boiled per cryogen over the cooldown steps
    inserts_L: dict[str, Figure]  # litres boiled per cryogen by the inserts (all times)
    curves: list[dict] = field(default_factory=list)  # cumulative litres (nominal case)


@dataclass
class BudgetResult:
    """The cooldown-budget step: heat, entropy and minimum work by band; litres per case."""

    budget: dict  # bands, parts, stages, total (the JSON's ``budget``)
    heat_J: float
    minimum_work_J: float
    cases: dict[str, CooldownLitres]  # "low", "nominal", "high"
    inserts: list[dict]  # the JSON rows of ``inserts``


@dataclass
class OrderResult:
    """The supply-and-order step: what to order per cryogen and its liquefaction work."""

    cases: dict[str, dict[str, dict]]  # case -> cryogen -> order entry
    order: dict[str, dict]  # the nominal entries with their low/nominal/high ``range``
    steps_range: list[dict]
    liquefaction: dict[str, dict]

    @property
    def order_L(self) -> dict[str, float]:
        return {c: e["order_L"] for c, e in self.order.items()}

    @property
    def cost(self) -> dict[str, float]:
        return {c: e["cost"] for c, e in self.order.items() if e["cost"] is not None}

    @property
    def currency(self) -> str:
        return next((e["currency"] for e in self.order.values() if e["currency"]), "")


@dataclass
class BathBoiloff:
    """Boil-off and hold time of one bath under a static load (floats or arrays (n,))."""

    name: str
    load_W: Figure
    rate_m3_s: Figure  # liquid boiled, [m^3/s]
    hold_s: Figure  # full to empty, [s] (inf without load)
    hold_to_refill_s: Figure  # full to the refill level, [s]


@dataclass
class LoadsResult:
    """The loads step: the static table at the stage temperatures and the baths' boil-off."""

    items: list[dict]  # one row per load and stage it reaches
    totals: dict[str, float]  # W per stage
    by_stage: list[dict]
    baths: list[dict]  # the JSON rows of ``loads.baths``
    boiloff: list[BathBoiloff]  # one per bath, in the plan's order
    notes: list[str]
    start_date: str
    shown: bool  # whether the plan has loads or baths (the JSON's ``loads`` object)
    sources: list[str]
    assumptions: list[str]

    def boiloff_of(self, bath_name: str) -> BathBoiloff | None:
        """The (last) bath of that name, or None."""
        found = [b for b in self.boiloff if b.name == bath_name]
        return found[-1] if found else None

    @property
    def boiloff_L_per_day(self) -> dict[str, float]:
        out: dict[str, float] = {}
        for b in self.baths:
            out[b["cryogen"]] = out.get(b["cryogen"], 0.0) + b["boiloff_L_per_day"]
        return out

    @property
    def hold_time_h(self) -> dict[str, float]:
        out: dict[str, float] = {}
        for b in self.baths:
            if b["hold_h"] is not None:
                out[b["cryogen"]] = min(out.get(b["cryogen"], float("inf")), b["hold_h"])
        return out

    @property
    def month_order_L(self) -> dict[str, float]:
        out: dict[str, float] = {}
        for b in self.baths:
            out[b["cryogen"]] = out.get(b["cryogen"], 0.0) + b["month_order_L"]
        return out


@dataclass
class CoolerResult:
    """The cooler step: refrigeration table, steady state and the cooldown simulation."""

    refrigeration: dict  # the JSON's ``refrigeration``
    cooldown_time_h: float | None
    sources: list[str]


@dataclass
class RoomsResult:
    """The rooms step: every room's oxygen cases, verdicts and curves."""

    rooms: list[dict]
    oxygen_effects: list[dict]
    lowest_oxygen_percent: float | None
    sources: list[str]
    assumptions: list[str]


@dataclass
class InvariantsResult:
    """The invariants step (energy and mass balances, second law): filled by the consistency
    work; today it checks nothing and records that."""

    checked: list[str] = field(default_factory=list)


@dataclass
class Results:
    """Everything the chain found for one plan; :meth:`to_dict` is the JSON report."""

    plan: Plan
    materials: MaterialsResult
    budget: BudgetResult
    order: OrderResult
    loads: LoadsResult
    cooler: CoolerResult | None
    rooms: RoomsResult | None
    invariants: InvariantsResult
    sources: list[str]
    assumptions: list[str]
    _dict: dict[str, Any] | None = field(default=None, repr=False, compare=False)

    def to_dict(self) -> dict[str, Any]:
        """The JSON of ``--format json`` (built once, then the same dict is returned)."""
        if self._dict is None:
            self._dict = results_to_dict(self)
        return self._dict

    @property
    def data(self) -> dict[str, Any]:
        return self.to_dict()

    @property
    def summary(self) -> dict[str, Any]:
        return self.to_dict()["summary"]


# --- the JSON ---------------------------------------------------------------------------


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
