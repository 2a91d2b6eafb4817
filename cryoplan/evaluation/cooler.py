"""The cooler step: Carnot against real work, steady state, cooldown-time simulation.

Reads the plan's ``[cooler]`` and the loads step's static table; returns a
:class:`~cryoplan.evaluation.results.CoolerResult`. The physics is in
:mod:`cryoplan.physics.refrigeration`; each load's heat during the cooldown comes from its
kind's function in :mod:`cryoplan.evaluation.load_kinds`.
"""

from __future__ import annotations

import numpy as np

from ..errors import InputError
from ..plan import Plan
from .load_kinds import LoadContext, load_ends, load_heat, load_kind, tabulated_integral
from .results import CoolerResult, LoadsResult

SOURCE = (
    "Refrigerator efficiency trend against capacity: T. R. Strobridge, Cryogenic "
    "refrigerators - an updated survey, NBS Technical Note 655 (1974) (trend line from "
    "memory; guidance only)."
)


def load_function(plan: Plan, names: list[str], t_lo: float, t_hi: float, steady_items):
    """Static loads as a vectorised function of the stage-temperature vector (for the sim).

    Each load's heat comes from its kind's function (:data:`LOAD_KINDS`), the same the
    static table calls, here with the simulation's context: conductivity integrals
    tabulated per material between ``t_lo`` and ``t_hi`` [K], multilayer insulation with
    its degradation factor. Radiation, supports and wires follow the stage temperatures;
    fixed loads are constant; leads, necks and residual gas are held at their values in the
    static table ``steady_items`` (noted in the report).

    Returns
    -------
    (callable, list of str)
        ``load_fn(T)`` with T of shape (stages,) or (stages, m) -> W of the same shape, and
        the names of the loads held.
    """
    index = {n: i for i, n in enumerate(names)}
    ctx = LoadContext(
        plan,
        static=False,
        mli_degradation=True,
        integral=lambda mid, rrr: tabulated_integral(mid, rrr, t_lo, t_hi),
    )
    follows = []
    fixed = np.zeros(len(names))
    held = []
    for load in plan.loads:
        kind = load_kind(load)
        if kind.in_simulation == "follows":
            for mid in {load.values.get("material")} - {None}:
                ctx.k_integral(mid, load.values.get("rrr"))  # tabulate once, before the run
            follows.append((load, kind))
        elif kind.in_simulation == "constant":
            temps = {s.name: s.temperature for s in plan.stages}
            for stage, power in load_heat(load, temps, ctx):
                fixed[index[stage]] += power
        else:
            v = load.values
            power = sum(
                it["power_W"]
                for it in steady_items
                if it["name"] == v.get("name") and it["stage"] == load.stage
            )
            fixed[index[load.stage]] += power
            held.append(v.get("name", load.kind))

    class _Stages:
        """The temperature rows of T by stage name."""

        def __init__(self, T):
            self.T = T

        def __getitem__(self, name):
            return self.T[index[name]]

    def load_fn(T):
        T = np.asarray(T, float)
        out = np.zeros_like(T) + (fixed[:, None] if T.ndim == 2 else fixed)
        temps = _Stages(T)
        for load, kind in follows:
            t_cold, t_warm, via = load_ends(load, temps)
            for stage, power in kind.heat(load, t_cold, t_warm, ctx, via):
                k = index[stage]
                out[k] = out[k] + power
        return out

    return load_fn, held


def cooler_step(plan: Plan, loads: LoadsResult) -> CoolerResult | None:
    """The cooler step: refrigeration table, steady state and cooldown simulation.

    Reads the static table of the loads step (``loads.items``, ``loads.totals``); None
    when the plan has no ``[cooler]``.
    """
    cooler = plan.cooler
    if cooler is None:
        return None
    from ..data.materials import material
    from ..physics import refrigeration as rf

    names = [s.name for s in plan.stages]
    targets = np.array([s.temperature for s in plan.stages])
    items, totals = loads.items, loads.totals
    load_at_target = np.array([totals.get(n, 0.0) for n in names])
    curves: list = [None] * len(names)
    for cs in cooler.stages:
        k = names.index(cs.stage)
        try:
            if cs.capacity is not None:
                curves[k] = rf.CapacityCurve(cs.capacity, key=f"{cs.key}.capacity")
            else:
                raise InputError(
                    "capacity maps are given per stage as [[K, W], ...] in this version",
                    key=f"{cs.key}.map",
                    expected="capacity = [[K, W], ...]",
                    found="a map",
                )
        except InputError as exc:
            exc.file, exc.line = plan.path, cs.line
            raise
    cmap, map_index = None, ()
    if cooler.capacity_map is not None:
        cm = cooler.capacity_map
        try:
            cmap = rf.CapacityMap(
                cm["first_K"], cm["second_K"], cm["first_W"], cm["second_W"], key="cooler.map"
            )
        except InputError as exc:
            exc.file, exc.line = plan.path, cooler.line
            raise
        map_index = (names.index(cm["stages"][0]), names.index(cm["stages"][1]))
    carnot_w_per_w = np.array([float(rf.carnot_specific_power(t, plan.ambient)) for t in targets])
    carnot_w = carnot_w_per_w * load_at_target
    capacity_at_target = np.array(
        [float(c(t)) if c is not None else np.nan for c, t in zip(curves, targets)]
    )
    if cmap is not None:
        q1, q2 = cmap(targets[map_index[0]], targets[map_index[1]])
        capacity_at_target[map_index[0]] = float(q1)
        capacity_at_target[map_index[1]] = float(q2)
    links = []
    for link in cooler.links:
        a, b = link["between"]
        if "conductance" in link:
            links.append(rf.Link(a, b, conductance=link["conductance"]))
        else:
            m = material(link["material"])
            links.append(
                rf.Link(
                    a,
                    b,
                    conductivity_integral=lambda x, y, m=m: m.conductivity_integral(
                        x, y, extrapolate=True
                    ),
                    area=link["area"] * link["count"],
                    length=link["length"],
                )
            )
    t_lo = max(0.25 * float(targets.min()), 0.5)
    t_hi = max(plan.cooldown.start, plan.ambient) * 1.01
    load_fn, held = load_function(plan, names, t_lo, t_hi, items)

    def capacity_fn(T):
        T = np.asarray(T, float)
        out = np.zeros_like(T)
        for k, c in enumerate(curves):
            if c is not None:
                out[k] = c(T[k])
        if cmap is not None:
            i, j = map_index
            q1, q2 = cmap(T[i], T[j])
            out[i], out[j] = q1, q2
        return out

    stages_out = []
    cooldown_time_h = None
    has_capacity = any(c is not None for c in curves) or cmap is not None
    steady = None
    notes = []
    try:
        if any(c is not None for c in curves) or cmap is not None:
            steady = rf.steady_state(
                capacity_fn, load_fn, links, targets=targets, ambient=plan.ambient, names=names
            )
    except InputError as exc:
        exc.file = plan.path
        exc.key = exc.key or "cooler"
        exc.line = exc.line or (cooler.stages[0].line if cooler.stages else None)
        raise
    for k, name in enumerate(names):
        cooled = curves[k] is not None or k in map_index
        flag = ""
        if cooled and load_at_target[k] > capacity_at_target[k]:
            flag = (
                f"load exceeds capacity at {targets[k]:g} K by "
                f"{load_at_target[k] - capacity_at_target[k]:.3g} W"
            )
        stages_out.append(
            {
                "stage": name,
                "temperature_K": float(targets[k]),
                "load_W": float(load_at_target[k]),
                "capacity_W": None if not cooled else float(capacity_at_target[k]),
                "carnot_W_per_W": float(carnot_w_per_w[k]),
                "carnot_W": float(carnot_w[k]),
                "steady_K": float(steady.temperatures[k]) if steady is not None else None,
                "flag": flag or ("" if cooled or not has_capacity else "not on the cooler"),
            }
        )
    carnot_total = float(carnot_w.sum())
    result = {
        "stages": stages_out,
        "carnot_total_W": carnot_total,
        "input_power_W": cooler.input_power,
        "percent_of_carnot": None,
        "notes": notes,
    }
    cold = [k for k, c in enumerate(curves) if c is not None or k in map_index]
    if cold:
        coldest = min(cold, key=lambda k: targets[k])
        cap = capacity_at_target[coldest]
        if cap > 0:
            # the trend is stated for refrigeration capacity at the cold end
            result["survey_percent"] = float(rf.survey_percent_carnot(max(cap, 0.1)))
            result["survey_source"] = "Strobridge 1974, trend from memory"
    elif load_at_target.any():
        # no cooler capacities given: the trend at the coldest loaded stage's load
        loaded = [k for k in range(len(names)) if load_at_target[k] > 0]
        coldest = min(loaded, key=lambda k: targets[k])
        result["survey_percent"] = float(
            rf.survey_percent_carnot(min(max(load_at_target[coldest], 0.1), 1e5))
        )
        result["survey_source"] = "Strobridge 1974, trend from memory"
    if cooler.input_power:
        # the cooler's own rating: its capacity at the targets against its input
        lifted = float(
            np.nansum(
                np.where(np.isnan(capacity_at_target), 0, capacity_at_target * carnot_w_per_w)
            )
        )
        result["percent_of_carnot"] = 100 * lifted / cooler.input_power
        result["rated_carnot_W"] = lifted
    elif cooler.percent_carnot:
        result["real_input_W"] = carnot_total / (cooler.percent_carnot / 100)
        result["percent_of_carnot"] = cooler.percent_carnot
    if cold:
        from ..data.materials import material as mat

        def heat_capacity_of(stage):
            parts = [(mat(p.material), p.mass) for p in stage.parts]
            return (
                (
                    lambda T, parts=parts: sum(
                        m.specific_heat(T, extrapolate=True) * w for m, w in parts
                    )
                ),
                (
                    lambda T, parts=parts: sum(
                        m.enthalpy(T, extrapolate=True) * w for m, w in parts
                    )
                ),
                (lambda T, parts=parts: sum(m.entropy(T, extrapolate=True) * w for m, w in parts)),
            )

        cstages = []
        for s in plan.stages:
            c, h, e = heat_capacity_of(s)
            start = (
                max((p.start if p.start is not None else plan.cooldown.start) for p in s.parts)
                if s.parts
                else plan.cooldown.start
            )
            if plan.cooldown.steps:  # a cryogen precool first: the cooler takes over there
                start = min(start, max(s.temperature, plan.cooldown.steps[-1].to))
            cstages.append(
                rf.CooldownStage(s.name, c, start, s.temperature, enthalpy=h, entropy=e)
            )
        sim = rf.simulate_cooldown(
            cstages,
            capacity_fn,
            load_fn,
            links,
            input_power=cooler.input_power,
            ambient=plan.ambient,
            t_max=cooler.max_time,
        )
        times = np.linspace(0.0, float(sim.t[-1]), 80)
        temps_curve = sim.temperatures_at(times)
        result["cooldown"] = {
            "time_to_target_s": {
                n: (None if t is None else float(t)) for n, t in zip(names, sim.time_to_target)
            },
            "cooldown_time_s": None if sim.cooldown_time is None else float(sim.cooldown_time),
            "not_reached": list(sim.not_reached),
            "electrical_kWh": None
            if sim.electrical_energy is None
            else sim.electrical_energy / 3.6e6,
            "minimum_work_kWh": None
            if sim.minimum_work is None
            else float(np.sum(sim.minimum_work)) / 3.6e6,
            "closure": float(sim.closure_error),
        }
        result["curve"] = {
            "time_h": (times / 3600).tolist(),
            "stages": {n: temps_curve[k].tolist() for k, n in enumerate(names)},
        }
        if sim.cooldown_time is not None:
            cooldown_time_h = float(sim.cooldown_time) / 3600
        if sim.not_reached:
            notes.append(
                "Not at target when the simulation stopped ("
                f"{cooler.max_time / 86400:g} days): " + ", ".join(sim.not_reached)
            )
        if held:
            notes.append("Held at their cold values during the cooldown: " + ", ".join(held))
    return CoolerResult(result, cooldown_time_h, [SOURCE])
