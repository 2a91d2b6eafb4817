"""One function per kind of ``[[load]]``: the heat it brings to each stage it reaches.

:data:`LOAD_KINDS` maps each kind to its :class:`LoadKind`: the function that gives, for a
load and the temperatures at its two ends (and at its heat sinks), the heat flow onto each
stage [W]; the text the report shows beside it; and how the cooler simulation treats it
(following the stage temperatures, constant, or held at its cold value). The static table
(:func:`cryoplan.evaluation.loads.stage_loads`), the steady state and the cooler simulation
(:func:`cryoplan.evaluation.cooler.load_function`) all call these functions; the
temperatures may be floats or numpy arrays (the simulation evaluates many states at once).

What differs between the two uses is stated in :class:`LoadContext`, in one place: the
conductivity integral (exact for the table, a precomputed table per material for the
simulation's speed), whether radiation runs one way only, and whether multilayer insulation
carries its degradation factor (today the static table does not: issue 13, item 6).

The physics is in :mod:`cryoplan.physics.heatloads` (sources there and in
:data:`cryoplan.evaluation.loads.SOURCES`).
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass, field

import numpy as np

from ..errors import InputError
from ..physics import heatloads as hl
from ..plan import Plan

#: Layer density of a blanket whose plan gives none [1/m]: 20 layers per cm (common practice).
DEFAULT_LAYER_DENSITY = 2000.0

Flows = list[tuple[str, object]]  # (stage name, W as float or ndarray)


def exact_integral(material_id: str, rrr) -> Callable:
    """The material's conductivity integral int_lo^hi k dT [W/m], extrapolated."""
    from ..data.materials import material

    m = material(material_id)
    return lambda a, b: m.conductivity_integral(a, b, rrr=rrr, extrapolate=True)


def tabulated_integral(material_id: str, rrr, t_lo: float, t_hi: float) -> Callable:
    """The conductivity integral from a running table K(T) = int_{t_lo}^T k dT on 200 log-spaced
    temperatures, interpolated linearly: int_a^b k dT = K(b) - K(a) (for the simulation)."""
    from ..data.materials import material

    m = material(material_id)
    grid = np.geomspace(t_lo, t_hi, 200)
    values = np.asarray(
        m.conductivity_integral(np.full_like(grid, t_lo), grid, rrr=rrr, extrapolate=True), float
    )
    return lambda a, b: np.interp(b, grid, values) - np.interp(a, grid, values)


@dataclass
class LoadContext:
    """How the load functions are evaluated: the static table's way or the simulation's."""

    plan: Plan
    #: True for the static table and steady state; False for the cooler simulation.
    static: bool = True
    #: Multilayer insulation times its degradation factor. The static table leaves it at 1
    #: today (issue 13, item 6: one factor everywhere is the consistency work's fix).
    mli_degradation: bool = False
    #: Heat of the other loads on a vapour-cooled neck's bath [W].
    other_on_bath: float = 0.0
    #: (material id, rrr) -> conductivity integral; exact unless the simulation tabulates.
    integral: Callable[[str, object], Callable] = exact_integral
    _integrals: dict = field(default_factory=dict, repr=False)

    def k_integral(self, material_id: str, rrr) -> Callable:
        key = (material_id, rrr)
        if key not in self._integrals:
            self._integrals[key] = self.integral(material_id, rrr)
        return self._integrals[key]


def bath_on(plan: Plan, stage: str):
    """The first bath on a stage, or None."""
    for b in plan.baths:
        if b.stage == stage:
            return b
    return None


# --- fixed ---------------------------------------------------------------------------------


def fixed_heat(load, t_cold, t_warm, ctx: LoadContext, via=()) -> Flows:
    """A stated power [W], whatever the temperatures."""
    return [(load.stage, load.values["power"])]


def fixed_detail(load, t_cold, t_warm, ctx: LoadContext) -> str:
    return ""


# --- radiation -----------------------------------------------------------------------------


def radiation_heat(load, t_cold, t_warm, ctx: LoadContext, via=()) -> Flows:
    """Multilayer insulation (Lockheed correlation) or gray-body exchange onto the cold side.

    The static table counts radiation from the warm side only (none when the warm side is
    not warmer); in the simulation bare surfaces exchange both ways.
    """
    v = load.values
    if ctx.static and np.ndim(t_cold) == 0 and np.ndim(t_warm) == 0 and t_warm <= t_cold:
        return [(load.stage, 0.0)]
    if v["layers"]:
        deg = v["degradation"] if ctx.mli_degradation else 1.0
        q = np.where(
            t_warm > t_cold,
            hl.mli_load(
                v["area"],
                np.minimum(t_cold, t_warm),
                np.maximum(t_warm, t_cold + 1e-9),
                v["layers"],
                v["layer_density"] or DEFAULT_LAYER_DENSITY,
                degradation=deg,
            ),
            0.0,
        )
        return [(load.stage, float(q) if q.ndim == 0 else q)]
    ec, ew = v["emissivity"]
    q = hl.gray_body_exchange(v["area"], t_cold, t_warm, ec, ew, v["area_ratio"])
    return [(load.stage, q)]


def radiation_detail(load, t_cold, t_warm, ctx: LoadContext) -> str:
    v = load.values
    if np.ndim(t_cold) == 0 and np.ndim(t_warm) == 0 and t_warm <= t_cold:
        return ""
    if v["layers"]:
        return f"MLI, {v['layers']} layers"
    ec, ew = v["emissivity"]
    return f"e = {ec:g}/{ew:g}"


# --- supports and wires --------------------------------------------------------------------


def _cross_section(load) -> float:
    v = load.values
    if load.kind == "wire":
        d = hl.awg_diameter(v["gauge"]) if "gauge" in v else v["diameter"]
        return math.pi / 4 * d * d
    return v["area"]


def conduction_heat(load, t_cold, t_warm, ctx: LoadContext, via=()) -> Flows:
    """Conduction along a support or wire, split into equal lengths at its heat sinks.

    ``via`` are the heat sinks' temperatures (warm to cold, as the plan lists them). Each
    segment carries (count A / l) int k dT; a sink receives what arrives from above less
    what leaves below. The static table sorts the nodes warm to cold when a sink is given
    out of order.
    """
    v = load.values
    integral = ctx.k_integral(v["material"], v.get("rrr"))
    nodes = [t_warm, *via, t_cold]
    names = list(v["via"]) + [load.stage]
    if ctx.static and all(np.ndim(t) == 0 for t in nodes):
        if any(b > a for a, b in zip(nodes, nodes[1:])):
            nodes = sorted(nodes, reverse=True)
    seg = v["length"] / (len(nodes) - 1)
    area = _cross_section(load)
    if ctx.static:
        flows = [
            hl.conduction_load(integral, b, a, area, seg, v["count"])
            for a, b in zip(nodes, nodes[1:])
        ]
    else:  # the simulation's fast path: a tabulated integral is signed, K(a) - K(b)
        g = v["count"] * area / seg
        flows = [g * integral(b, a) for a, b in zip(nodes, nodes[1:])]
    out: Flows = []
    for k, name in enumerate(names):
        out.append((name, flows[k] - (flows[k + 1] if k + 1 < len(flows) else 0.0)))
    return out


def _material_id(name: str) -> str:
    from ..data.materials import material

    return material(name).id


def conduction_detail(load, t_cold, t_warm, ctx: LoadContext) -> str:
    v = load.values
    mid = _material_id(v["material"])
    if load.kind == "wire":
        detail = f"{v['count']} x {'AWG ' + str(v['gauge']) if 'gauge' in v else ''}"
        detail = detail.strip() + f" {mid}"
    else:
        detail = f"{v['count']} x {mid}"
    if v["via"]:
        detail += ", sunk at " + ", ".join(v["via"])
    return detail


# --- current leads -------------------------------------------------------------------------

_VAPOR_LEAD_CACHE: dict = {}


def vapor_lead_per_ampere(cryogen_name: str, t_bath: float, t_warm: float) -> float:
    """Optimum heat per ampere of a vapour-cooled lead [W/A].

    For a helium bath near 4.2 K with the warm end near room temperature this is the
    published figure (:data:`cryoplan.physics.heatloads.VAPOR_COOLED_LEAD_HEAT_PER_AMPERE`,
    1.04 mW/A); elsewhere Lock's counterflow model is solved once per temperatures.
    """
    if cryogen_name == "helium" and abs(t_bath - 4.22) < 0.3 and 270.0 <= t_warm <= 310.0:
        return hl.VAPOR_COOLED_LEAD_HEAT_PER_AMPERE
    key = (cryogen_name, round(t_bath, 3), round(t_warm, 3))
    if key not in _VAPOR_LEAD_CACHE:
        from ..data.fluids import cryogen

        fluid = cryogen(cryogen_name)
        q, _ = hl.vapor_cooled_lead_optimum(
            1000.0, t_bath, t_warm, fluid.latent_heat, fluid.boiloff_gas_enthalpy
        )
        _VAPOR_LEAD_CACHE[key] = float(q) / 1000.0
    return _VAPOR_LEAD_CACHE[key]


def lead_heat(load, t_cold, t_warm, ctx: LoadContext, via=()) -> Flows:
    """Current leads: vapour-cooled optimum (Lock), a given shape, or the conduction-cooled
    optimum (McFee)."""
    from ..data.fluids import cryogen
    from ..data.materials import material

    v = load.values
    current, count = v["current"], v["count"]
    if v["cooling"] == "vapor":
        bath = bath_on(ctx.plan, load.stage)
        if bath is None:
            raise InputError(
                "a vapour-cooled lead needs a bath on its stage",
                key=f"{load.key}.cooling",
                file=ctx.plan.path,
                line=load.line,
                expected="a [[bath]] on this stage",
                found="no bath",
            )
        tb = cryogen(bath.cryogen, pressure=bath.pressure).boiling_point
        q = vapor_lead_per_ampere(bath.cryogen, tb, t_warm) * current
        return [(load.stage, q * count)]
    m = material(v["material"] or "copper")
    if v.get("length") and v.get("area"):
        q = hl.conduction_cooled_lead_load(
            current,
            v["length"],
            v["area"],
            lambda T, m=m: m.conductivity(T, extrapolate=True),
            t_cold,
            t_warm,
        )
    else:
        q, _ = hl.conduction_cooled_lead_optimum(current, t_cold, t_warm)
    return [(load.stage, float(q) * count)]


def lead_detail(load, t_cold, t_warm, ctx: LoadContext) -> str:
    v = load.values
    current, count = v["current"], v["count"]
    if v["cooling"] == "vapor":
        return f"{count} x {current:g} A, vapour-cooled optimum"
    if v.get("length") and v.get("area"):
        return f"{count} x {current:g} A, given shape"
    return f"{count} x {current:g} A, conduction-cooled optimum"


# --- residual gas --------------------------------------------------------------------------


def gas_heat(load, t_cold, t_warm, ctx: LoadContext, via=()) -> Flows:
    """Residual gas in the free-molecular regime (Corruccini)."""
    v = load.values
    acc = v["accommodation"] if v["accommodation"] is not None else 1.0
    q = hl.free_molecular_conduction(v["area"], t_cold, t_warm, v["pressure"], v["gas"], acc)
    return [(load.stage, q)]


def gas_detail(load, t_cold, t_warm, ctx: LoadContext) -> str:
    v = load.values
    return f"{v['gas']} at {v['pressure']:.2g} Pa"


# --- necks ---------------------------------------------------------------------------------


def _neck_is_vapor_cooled(load, ctx: LoadContext) -> bool:
    # the simulation holds a neck at its static value, so only the static table solves it
    return bool(
        ctx.static
        and load.values.get("vapor_cooled")
        and bath_on(ctx.plan, load.stage) is not None
    )


def neck_heat(load, t_cold, t_warm, ctx: LoadContext, via=()) -> Flows:
    """A neck: cooled by the bath's boil-off gas (counterflow, perfect exchange) where the
    plan says so and a bath is on its stage, else bare conduction."""
    from ..data.fluids import cryogen
    from ..data.materials import material

    v = load.values
    m = material(v["material"])
    if _neck_is_vapor_cooled(load, ctx):
        bath = bath_on(ctx.plan, load.stage)
        fluid = cryogen(bath.cryogen, pressure=bath.pressure)
        q = hl.vapor_cooled_neck_load(
            lambda T, m=m: m.conductivity(T, extrapolate=True),
            v["area"],
            v["length"],
            fluid.boiling_point,
            t_warm,
            fluid.latent_heat,
            fluid.boiloff_gas_enthalpy,
            other_load=ctx.other_on_bath,
        )
        return [(load.stage, float(q) * v["count"])]
    q = hl.conduction_load(
        ctx.k_integral(v["material"], None), t_cold, t_warm, v["area"], v["length"], v["count"]
    )
    return [(load.stage, q)]


def neck_detail(load, t_cold, t_warm, ctx: LoadContext) -> str:
    if _neck_is_vapor_cooled(load, ctx):
        return f"{_material_id(load.values['material'])}, cooled by the boil-off gas"
    return f"{_material_id(load.values['material'])}, not gas-cooled"


# --- the table -----------------------------------------------------------------------------


@dataclass(frozen=True)
class LoadKind:
    """A kind of ``[[load]]``: its heat function, its report text and its simulation rule."""

    heat: Callable  # heat(load, t_cold, t_warm, ctx, via=()) -> [(stage, W), ...]
    detail: Callable  # detail(load, t_cold, t_warm, ctx) -> str
    #: "follows": evaluated at the simulated temperatures; "constant": a fixed power;
    #: "held": held at its value at the stage targets during the cooldown (noted).
    in_simulation: str


LOAD_KINDS: dict[str, LoadKind] = {
    "fixed": LoadKind(fixed_heat, fixed_detail, "constant"),
    "radiation": LoadKind(radiation_heat, radiation_detail, "follows"),
    "support": LoadKind(conduction_heat, conduction_detail, "follows"),
    "wire": LoadKind(conduction_heat, conduction_detail, "follows"),
    "lead": LoadKind(lead_heat, lead_detail, "held"),
    "gas": LoadKind(gas_heat, gas_detail, "held"),
    "neck": LoadKind(neck_heat, neck_detail, "held"),
}


def load_ends(load, temps) -> tuple:
    """(t_cold, t_warm, via temperatures) of a load from the stage temperatures ``temps``
    (a mapping or anything indexed by stage name; floats or arrays)."""
    v = load.values
    t_cold = temps[load.stage]
    t_warm = temps[v["from_stage"]] if v.get("from_stage") else v.get("from")
    via = tuple(temps[s] for s in v.get("via", ()) or ())
    return t_cold, t_warm, via


def load_kind(load) -> LoadKind:
    """The :class:`LoadKind` of a load."""
    kind = LOAD_KINDS.get(load.kind)
    if kind is None:  # pragma: no cover - the plan reader refuses unknown kinds
        raise InputError(f"unknown kind of load {load.kind!r}", key=f"{load.key}.kind")
    return kind


def load_heat(load, temps, ctx: LoadContext) -> Flows:
    """The heat of one load onto each stage it reaches at the stage temperatures ``temps``."""
    t_cold, t_warm, via = load_ends(load, temps)
    return load_kind(load).heat(load, t_cold, t_warm, ctx, via)
