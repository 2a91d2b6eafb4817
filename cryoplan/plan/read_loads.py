"""The heat loads of a plan: its ``[[load]]`` tables, one reader per kind of load.

Each load is read on its own: a mistake in one is recorded and the next is read. A load on
a stage that has a mistake of its own is skipped without a second message.
"""

from __future__ import annotations

import math
from typing import Any

from .located import _Reader, is_number, shown
from .schema import (
    DEFAULT_EMISSIVITY,
    LOAD_COMMON,
    LOAD_KEYS,
    MAX_LAYERS,
    MLI_DEGRADATION,
    Load,
    Stage,
)

#: How a current lead is cooled.
LEAD_COOLING = ("conduction", "vapor")


def read_loads(
    reader: _Reader, raw_list, stages: list[Stage], stage_names: list[str], bath_stages: set[str]
) -> list[Load]:
    """The loads; ``stage_names`` are every stage written, ``bath_stages`` every stage a bath
    is written on (valid or not)."""
    temps = {s.name: s.temperature for s in stages}
    loads = []
    for i, raw in enumerate(reader.array(raw_list, "load")):
        load = _load(reader, raw, f"load[{i}]", temps, stage_names, bath_stages)
        if load is not None:
            loads.append(load)
    return loads


def _load(reader: _Reader, raw, key, temps, stage_names, bath_stages) -> Load | None:
    raw = reader.table(raw, key)
    kind = reader.text(raw, "kind", key, required=True)
    if kind is not None and kind not in LOAD_KEYS:
        reader.unknown("kind of load", kind, list(LOAD_KEYS), f"{key}.kind")
        return None
    if kind is None:
        return None
    reader.keys(raw, LOAD_COMMON | LOAD_KEYS[kind], key)
    stage = reader.text(raw, "stage", key, required=True)
    if stage is not None and stage not in stage_names:
        reader.unknown("stage", stage, stage_names, f"{key}.stage")
        return None
    name = reader.text(raw, "name", key, default=kind)
    if stage is None or stage not in temps:
        return None  # the stage's own mistake is reported at the stage
    hot = raw.get("from")
    if isinstance(hot, str) and hot.strip() in stage_names and hot.strip() not in temps:
        return None  # 'from' names a stage with a mistake of its own
    n_errors = len(reader.errors)
    values = _values(reader, raw, key, kind, temps, temps[stage], stage_names)
    if kind == "lead" and values.get("cooling") == "vapor" and stage not in bath_stages:
        reader.error(
            "a vapour-cooled lead needs a bath on its stage",
            f"{key}.cooling",
            expected=f"a [[bath]] on the stage {stage!r}",
            found="no bath",
        )
    if len(reader.errors) != n_errors:
        return None
    values["name"] = name
    return Load(stage, kind, values, key, reader.lines.line_of(key))


def _values(reader: _Reader, raw, key, kind, temps, stage_t, stage_names) -> dict[str, Any]:
    v: dict[str, Any] = {}
    if kind != "fixed":
        hot, hot_stage = reader.temperature_or_stage(raw, "from", key, temps)
        v["from"], v["from_stage"] = hot, hot_stage
        if hot is not None and hot <= stage_t:
            reader.error(
                "'from' is not warmer than the stage it loads",
                f"{key}.from",
                expected=f"a temperature above {stage_t:g} K",
                found=shown(raw["from"]),
            )
    if kind == "fixed":
        v["power"] = reader.quantity(raw, "power", key, "power", required=True, nonnegative=True)
    elif kind == "radiation":
        _radiation(reader, raw, key, v)
    elif kind in ("support", "wire", "neck"):
        _conduction(reader, raw, key, kind, temps, stage_names, v)
    elif kind == "lead":
        v["current"] = reader.quantity(
            raw, "current", key, "current", required=True, nonnegative=True
        )
        v["cooling"] = reader.choice(
            raw, "cooling", key, LEAD_COOLING, "conduction", "cooling of a lead"
        )
        v["count"] = reader.count(raw, "count", key, 2, what="leads")
        v["length"] = reader.quantity(raw, "length", key, "length", positive=True)
        v["area"] = reader.quantity(raw, "area", key, "area", positive=True)
        v["material"] = "copper"
        if "material" in raw:
            v["material"] = reader.material(raw["material"], f"{key}.material", conductivity=True)
    elif kind == "gas":
        from ..physics.heatloads import GASES

        v["area"] = reader.quantity(raw, "area", key, "area", required=True, positive=True)
        v["pressure"] = reader.quantity(
            raw, "pressure", key, "pressure", required=True, positive=True
        )
        v["gas"] = reader.choice(raw, "gas", key, list(GASES), "helium", "gas")
        v["accommodation"] = reader.fraction(raw, "accommodation", key, None)
    return v


def _radiation(reader: _Reader, raw, key, v) -> None:
    v["area"] = reader.quantity(raw, "area", key, "area", required=True, positive=True)
    em = raw.get("emissivity", DEFAULT_EMISSIVITY)
    if "surfaces" in raw and "emissivity" not in raw:
        em = _surface_emissivities(reader, raw["surfaces"], f"{key}.surfaces")
    ems = em if isinstance(em, list) else [em, em]
    if len(ems) != 2:
        reader.error(
            "wrong emissivity",
            f"{key}.emissivity",
            expected="one number, or [cold, warm]",
            found=shown(em),
        )
        ems = [DEFAULT_EMISSIVITY, DEFAULT_EMISSIVITY]
    out = []
    for e in ems:
        if not is_number(e) or not 0 < e <= 1:
            reader.error(
                "an emissivity outside (0, 1]",
                f"{key}.emissivity",
                expected="a number greater than 0 and at most 1",
                found=shown(em),
            )
            out.append(DEFAULT_EMISSIVITY)
        else:
            out.append(float(e))
    v["emissivity"] = out
    v["layers"] = 0
    if "layers" in raw:
        layers = raw["layers"]
        if isinstance(layers, bool) or not isinstance(layers, int) or not 0 <= layers:
            reader.error(
                "not a number of layers",
                f"{key}.layers",
                expected="a whole number of 0 or more",
                found=shown(layers),
            )
        elif layers > MAX_LAYERS:
            reader.error(
                "more layers than a blanket can have",
                f"{key}.layers",
                expected=f"a whole number from 0 to {MAX_LAYERS}",
                found=shown(layers),
            )
        else:
            v["layers"] = layers
    v["area_ratio"] = reader.fraction(raw, "area_ratio", key, 0.0)
    # real blankets, with seams and penetrations, leak about twice the calorimeter
    # figure of the correlation (common practice)
    v["degradation"] = reader.fraction(raw, "degradation", key, MLI_DEGRADATION, 1.0, 10.0)
    v["layer_density"] = reader.quantity(raw, "layer_density", key, "per length", positive=True)


def _surface_emissivities(reader: _Reader, value, key: str) -> list[float]:
    """[cold, warm] emissivities from the materials database's values for the surfaces."""
    from ..data.materials import material

    if not (isinstance(value, list) and len(value) == 2):
        reader.error(
            "not a pair of surfaces",
            key,
            expected="two material ids: [cold surface, warm surface]",
            found=shown(value),
        )
        return [DEFAULT_EMISSIVITY, DEFAULT_EMISSIVITY]
    out = []
    for name in value:
        mat_id = reader.material(name, key)
        e = material(mat_id).emissivity if mat_id else None
        if mat_id and e is None:
            reader.error(
                f"'{mat_id}' has no emissivity in the database",
                key,
                expected="a material with an emissivity, or 'emissivity ='",
                found=repr(name),
            )
        out.append(e if e is not None else DEFAULT_EMISSIVITY)
    return out


def _conduction(reader: _Reader, raw, key, kind, temps, stage_names, v) -> None:
    """A support, a wire or a neck: a solid conducting from a warmer place."""
    mat = reader.required(raw, "material", key)
    v["material"] = (
        reader.material(mat, f"{key}.material", conductivity=True) if mat is not None else None
    )
    v["length"] = reader.quantity(raw, "length", key, "length", required=True, positive=True)
    v["count"] = reader.count(raw, "count", key, 1, what=f"{kind}s")
    if kind == "wire":
        if "gauge" in raw:
            g = raw["gauge"]
            if isinstance(g, bool) or not isinstance(g, int) or not 0 <= g <= 50:
                reader.error(
                    "not a wire gauge",
                    f"{key}.gauge",
                    expected="an AWG number from 0 to 50",
                    found=shown(g),
                )
            v["gauge"] = g
        else:
            v["diameter"] = reader.quantity(
                raw, "diameter", key, "length", required=True, positive=True
            )
    elif "diameter" in raw and "area" not in raw:
        d = reader.quantity(raw, "diameter", key, "length", positive=True)
        v["area"] = None if d is None else math.pi / 4 * d * d
    else:
        v["area"] = reader.quantity(raw, "area", key, "area", required=True, positive=True)
    v["rrr"] = None
    if "rrr" in raw:
        r = raw["rrr"]
        if not is_number(r) or r < 1:
            reader.error(
                "not a residual-resistance ratio",
                f"{key}.rrr",
                expected="a finite number of 1 or more",
                found=shown(r),
            )
        else:
            v["rrr"] = float(r)
    via = []
    for j, name in enumerate(reader.array(raw.get("via", []), f"{key}.via")):
        if not isinstance(name, str):
            reader.error(
                "not a stage's name",
                f"{key}.via[{j}]",
                expected="names of stages",
                found=shown(name),
                at=f"{key}.via",
            )
        elif name not in stage_names:
            reader.unknown("stage", name, stage_names, f"{key}.via[{j}]", at=f"{key}.via")
        elif name in temps:  # else the stage's own mistake is reported at the stage
            via.append(name)
    v["via"] = via
    if kind == "neck":
        v["vapor_cooled"] = reader.flag(raw, "vapor_cooled", key, False)
