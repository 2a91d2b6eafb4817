"""The rooms step: the oxygen cases of every room, run through :mod:`cryoplan.physics.oxygen`.

Reads the plan's rooms and the loads step's bath boil-off; returns a
:class:`~cryoplan.evaluation.results.RoomsResult`.
"""

from __future__ import annotations

import copy
import math

import numpy as np

from ..physics import oxygen as safety
from ..plan import Plan
from .results import LoadsResult, RoomsResult
from .rooms_verdict import room_verdict

#: Normal boil-off of a storage dewar when the plan gives none: about 1 % of its contents
#: a day for helium and nitrogen transport dewars (common practice; makers' figures range
#: 0.5-2 %/day).
DEFAULT_DEWAR_BOILOFF_PER_DAY = 0.01

#: A ventilation failure is followed over a working day (8 h) for its lowest oxygen.
VENTILATION_FAILURE_HORIZON_S = 8 * 3600.0

#: Oxygen curves are drawn over the first two hours of each case.
CURVE_SPAN_S = 2 * 3600.0

SOURCE = (
    "Oxygen in a well-mixed room, sudden and continuous releases with ventilation: the "
    "well-mixed room model of the oxygen-deficiency guides, e.g. Fermilab ES&H Manual "
    "chapter 4240 (Oxygen Deficiency Hazards) and EIGA Doc. 44 (Hazards of inert gases and "
    "oxygen depletion); 19.5 % as the oxygen-deficient limit: US OSHA 29 CFR 1910.134(b)."
)


def _vessels(plan: Plan, room, loads: LoadsResult | None) -> list[dict]:
    """The vessels of a room: listed ones, plus the cryostat's baths where included (their
    boil-off from the loads step)."""
    from ..data.fluids import cryogen

    out = []
    for v in room.vessels:
        fluid = cryogen(v.cryogen)
        boil = v.boiloff
        source = "plan"
        if boil is None:
            boil = v.liquid * DEFAULT_DEWAR_BOILOFF_PER_DAY / 86400.0
            source = "1 %/day, common practice"
        out.append(
            {
                "name": v.name,
                "cryogen": v.cryogen,
                "liquid_m3": v.liquid,
                "boiloff_liquid_m3_s": boil,
                "boiloff_source": source,
                "failure_gas_m3_s": v.failure_rate,
                "quench": v.quench,
                "quench_time_s": v.quench_time,
                "quench_fraction": v.quench_fraction,
                "ratio": fluid.expansion_ratio(room.temperature),
                "bath": False,
            }
        )
    if room.include_baths:
        for b in plan.baths:
            fluid = cryogen(b.cryogen)
            found = loads.boiloff_of(b.name) if loads is not None and loads.shown else None
            boil = 0.0 if found is None else float(found.rate_m3_s)
            out.append(
                {
                    "name": b.name,
                    "cryogen": b.cryogen,
                    "liquid_m3": b.volume,
                    "boiloff_liquid_m3_s": boil,
                    "boiloff_source": "static loads",
                    "failure_gas_m3_s": None,
                    "quench": room.quench and b.cryogen == "helium",
                    "quench_time_s": room.quench_time,
                    "quench_fraction": room.quench_fraction,
                    "ratio": fluid.expansion_ratio(room.temperature),
                    "bath": True,
                }
            )
    return out


def _finite(x):
    return None if x is None or not math.isfinite(x) else float(x)


_ROOM_CACHE: dict = {}


def _room_key(room, vessels) -> tuple:
    """Everything a room's figures depend on (the dashboard re-evaluates on every edit)."""
    return (
        room.name,
        room.volume,
        room.ventilation,
        room.alarm,
        room.temperature,
        room.sudden_model,
        tuple(tuple(sorted((k, str(v)) for k, v in vessel.items())) for vessel in vessels),
    )


def _room_entry(room, vessels) -> dict:
    """The cases, verdict and curves of one room (pure: same inputs, same figures)."""
    key = _room_key(room, vessels)
    if key in _ROOM_CACHE:
        return copy.deepcopy(_ROOM_CACHE[key])
    background = sum(safety.gas_rate(v["boiloff_liquid_m3_s"], v["ratio"]) for v in vessels)
    cases = []
    for v in vessels:
        cases.append(
            (
                safety.sudden_release_case(
                    v["liquid_m3"],
                    v["ratio"],
                    background_rate=background,
                    label=f"sudden release: {v['name']}",
                ),
                math.inf,
            )
        )
        if v["quench"]:
            cases.append(
                (
                    safety.quench_case(
                        v["liquid_m3"],
                        v["ratio"],
                        fraction=v["quench_fraction"],
                        duration=v["quench_time_s"],
                        background_rate=background,
                        label=f"quench: {v['name']}",
                    ),
                    math.inf,
                )
            )
        if v["failure_gas_m3_s"]:
            cases.append(
                (
                    safety.loss_of_vacuum_case(
                        v["liquid_m3"],
                        v["ratio"],
                        v["failure_gas_m3_s"],
                        background_rate=background,
                        label=f"loss of vacuum: {v['name']}",
                    ),
                    math.inf,
                )
            )
    if background > 0:
        cases.append((safety.boiloff_case(background), math.inf))
        cases.append((safety.ventilation_failure_case(background), VENTILATION_FAILURE_HORIZON_S))
    out_cases = []
    times = np.linspace(0.0, CURVE_SPAN_S, 121)
    curves = []
    for release, horizon in cases:
        a = safety.assess_release(
            room.volume,
            room.ventilation,
            release,
            alarm_percent=room.alarm,
            horizon=horizon,
            sudden_model=room.sudden_model,
        )
        out_cases.append(
            {
                "case": release.label,
                "lowest_percent": float(a.lowest_percent),
                "time_to_alarm_s": _finite(a.time_to_alarm_s),
                "time_to_deficient_s": _finite(a.time_to_deficient_s),
                "time_to_recover_s": _finite(a.time_to_recover_s),
                "ventilation_needed_m3_per_h": _finite(a.ventilation_needed * 3600.0),
                "minimum_room_volume_m3": _finite(a.minimum_room_volume),
                "sudden_drop_percent": float(a.sudden_drop_percent),
                "horizon_h": _finite(horizon / 3600.0),
                "fans_running": release.ventilation_working > 0,
                "_a": a,
            }
        )
        curves.append(
            {
                "case": release.label,
                "time_min": (times / 60).tolist(),
                "oxygen_percent": np.asarray(
                    safety.oxygen_curve(
                        times,
                        room.volume,
                        room.ventilation,
                        release,
                        sudden_model=room.sudden_model,
                    )
                ).tolist(),
            }
        )
    worst = min(out_cases, key=lambda c: c["lowest_percent"]) if out_cases else None
    verdict = []
    if worst is not None:
        cont = [
            c
            for c in out_cases
            if c["_a"].continuous_ventilation_needed > 0 and "sudden" not in c["case"]
        ]
        need = max(cont, key=lambda c: c["_a"].continuous_ventilation_needed) if cont else None
        sudden = [c for c in out_cases if c["case"].startswith("sudden")]
        worst_sudden = min(sudden, key=lambda c: c["sudden_drop_percent"]) if sudden else None
        recover = [
            c["_a"].time_to_recover_s
            for c in out_cases
            if math.isfinite(c["_a"].time_to_recover_s)
        ]
        verdict = room_verdict(
            worst["lowest_percent"],
            min(c["_a"].time_to_alarm_s for c in out_cases),
            room.alarm,
            ventilation=room.ventilation,
            ventilation_needed=None if need is None else need["_a"].continuous_ventilation_needed,
            ventilation_case=None if need is None else need["case"],
            sudden_drop_percent=None
            if worst_sudden is None
            else worst_sudden["sudden_drop_percent"],
            minimum_room_volume=None
            if worst_sudden is None
            else worst_sudden["_a"].minimum_room_volume,
            room_volume=room.volume,
            time_to_recover_s=max(recover) if recover else None,
        )
    for c in out_cases:
        del c["_a"]
    entry = {
        "name": room.name,
        "volume_m3": room.volume,
        "ventilation_m3_per_h": room.ventilation * 3600.0,
        "air_changes_per_h": room.ventilation * 3600.0 / room.volume,
        "alarm_percent": room.alarm,
        "sudden_model": room.sudden_model,
        "vessels": [
            {k: v[k] for k in ("name", "cryogen", "liquid_m3", "ratio", "bath", "boiloff_source")}
            | {"gas_m3": v["liquid_m3"] * v["ratio"]}
            for v in vessels
        ],
        "cases": out_cases,
        "worst_case": None if worst is None else worst["case"],
        "lowest_percent": None if worst is None else worst["lowest_percent"],
        "verdict": verdict,
        "curves": curves,
    }
    if len(_ROOM_CACHE) > 64:
        _ROOM_CACHE.clear()
    _ROOM_CACHE[key] = copy.deepcopy(entry)
    return entry


ASSUMPTION = (
    "Rooms: the released gas mixes evenly through the room at once (well-mixed model); "
    "dewars without a boil-off figure lose 1 % of their contents a day (common "
    "practice); a ventilation failure is followed for 8 h."
)


def rooms_step(plan: Plan, loads: LoadsResult | None = None) -> RoomsResult | None:
    """The rooms step: oxygen cases, verdicts and cautions for every room; None without rooms.

    The baths' continuous boil-off comes from the loads step (``loads.boiloff``).
    """
    if not plan.rooms:
        return None
    rooms_out = []
    worst_all = None
    for room in plan.rooms:
        entry = _room_entry(room, _vessels(plan, room, loads))
        rooms_out.append(entry)
        low = entry["lowest_percent"]
        if low is not None and (worst_all is None or low < worst_all):
            worst_all = low
    effects = [
        {
            "from_percent": b.low_percent,
            "to_percent": b.high_percent,
            "effect": b.effect,
            "source": b.source,
        }
        for b in safety.OXYGEN_EFFECTS
    ]
    sources = [SOURCE]
    for b in safety.OXYGEN_EFFECTS:
        if b.source not in sources:
            sources.append(b.source)
    return RoomsResult(rooms_out, effects, worst_all, sources, [ASSUMPTION])
