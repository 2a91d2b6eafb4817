"""The cryocooler of a plan: its ``[cooler]`` table, the capacity of each stage (a table of
[K, W] pairs, or a two-stage map of each stage's capacity against both temperatures) and
the thermal links between stages.

Each cooler stage and each link is read on its own: a mistake in one is recorded and the
next is read.
"""

from __future__ import annotations

from .located import _Reader, is_number, shown
from .schema import (
    COOLER_KEYS,
    COOLER_MAP_KEYS,
    COOLER_STAGE_KEYS,
    LINK_KEYS,
    MAX_COUNT,
    Cooler,
    CoolerStage,
    Stage,
)

#: The cooldown simulation's horizon when the plan gives none (sixty days).
DEFAULT_MAX_TIME = 60 * 86400.0


def read_cooler(
    reader: _Reader, raw, stages: list[Stage], stage_names: list[str]
) -> Cooler | None:
    """The cooler, or None when the plan has none; ``stage_names`` are every stage written."""
    if raw is None:
        return None
    key = "cooler"
    raw = reader.table(raw, key)
    reader.keys(raw, COOLER_KEYS, key)
    names = set(stage_names)
    power = reader.quantity(raw, "input_power", key, "power", positive=True)
    pc = reader.fraction(raw, "percent_carnot", key, None, 0.0, 100.0)
    max_time = reader.quantity(
        raw, "max_time", key, "time", default=DEFAULT_MAX_TIME, positive=True
    )
    cstages = []
    entries = reader.array(raw.get("stage"), "cooler.stage")
    for i, sraw in enumerate(entries):
        cs = _cooler_stage(reader, sraw, f"cooler.stage[{i}]", stage_names)
        if cs is not None:
            cstages.append(cs)
    links = []
    for i, lraw in enumerate(reader.array(raw.get("link"), "cooler.link")):
        link = _link(reader, lraw, f"cooler.link[{i}]", names)
        if link is not None:
            links.append(link)
    cmap = None
    if "map" in raw:
        cmap = _cooler_map(reader, raw["map"], names, {s.name: s.temperature for s in stages})
    if not entries and "map" not in raw and "percent_carnot" not in raw:
        reader.error(
            "the cooler has no stage",
            "cooler.stage",
            expected="at least one [[cooler.stage]] or a [cooler.map] (or percent_carnot alone "
            "for the work of the static loads)",
            found="none",
        )
    if "input_power" not in raw and "percent_carnot" not in raw:
        reader.error(
            "the cooler's input power is missing",
            "cooler.input_power",
            expected="input_power such as '7 kW' (or percent_carnot)",
            found="neither",
        )
    if cmap is not None:
        mapped = set(cmap["stages"])
        for cs in cstages:
            if cs.stage in mapped:
                reader.error(
                    "a stage both in the map and in [[cooler.stage]]",
                    f"{cs.key}.stage",
                    expected="one capacity per stage",
                    found=repr(cs.stage),
                )
    return Cooler(
        power,
        pc,
        cstages,
        links,
        max_time or DEFAULT_MAX_TIME,
        capacity_map=cmap,
        line=reader.lines.line_of("cooler"),
    )


def _cooler_stage(reader: _Reader, sraw, skey: str, stage_names: list[str]) -> CoolerStage | None:
    sraw = reader.table(sraw, skey)
    reader.keys(sraw, COOLER_STAGE_KEYS, skey)
    stage = reader.text(sraw, "stage", skey, required=True)
    if stage is not None and stage not in stage_names:
        reader.unknown("stage", stage, sorted(stage_names), f"{skey}.stage")
        return None
    cap = sraw.get("capacity")
    cmap = sraw.get("map")
    if cap is None and cmap is None:
        reader.error(
            "the stage's capacity is missing",
            f"{skey}.capacity",
            expected="capacity = [[K, W], ...] or a map",
            found="nothing",
        )
        return None
    if cap is not None:
        cap = _capacity_table(reader, cap, f"{skey}.capacity")
        if cap is None:
            return None
    if cmap is not None and not isinstance(cmap, dict):
        reader.error(
            "not a capacity map",
            f"{skey}.map",
            expected="a table with 'first', 'second' and 'power'",
            found=shown(cmap),
        )
        return None
    if stage is None:
        return None
    return CoolerStage(stage, cap, cmap, skey, reader.lines.line_of(skey))


def _capacity_table(reader: _Reader, cap, key: str) -> list[list[float]] | None:
    """[[K, W], ...] in increasing K, K > 0 and W >= 0, all finite."""
    ok = (
        isinstance(cap, list)
        and len(cap) >= 1
        and all(isinstance(p, list) and len(p) == 2 and all(is_number(x) for x in p) for p in cap)
    )
    if not ok:
        reader.error(
            "not a capacity table",
            key,
            expected="a list of [K, W] pairs of finite numbers such as [[4.2, 1.5], [10, 5]]",
            found=shown(cap),
        )
        return None
    ks = [p[0] for p in cap]
    if any(b <= a for a, b in zip(ks, ks[1:])):
        reader.error(
            "capacity temperatures not increasing",
            key,
            expected="[K, W] pairs in increasing K",
            found=shown(cap),
        )
        return None
    if any(p[1] < 0 for p in cap) or any(p[0] <= 0 for p in cap):
        reader.error(
            "a negative capacity or temperature",
            key,
            expected="K > 0 and W >= 0",
            found=shown(cap),
        )
        return None
    return [[float(a), float(b)] for a, b in cap]


def _link(reader: _Reader, lraw, lkey: str, names: set[str]) -> dict | None:
    lraw = reader.table(lraw, lkey)
    reader.keys(lraw, LINK_KEYS, lkey)
    between = lraw.get("between")
    if not (
        isinstance(between, list)
        and len(between) == 2
        and all(isinstance(b, str) and b in names for b in between)
    ):
        reader.error(
            "a link names two stages",
            f"{lkey}.between",
            expected="two stage names",
            found=shown(between),
        )
        return None
    link = {"between": between}
    if "conductance" in lraw:
        link["conductance"] = reader.quantity(
            lraw, "conductance", lkey, "thermal conductance", positive=True
        )
    else:
        mat = reader.required(lraw, "material", lkey)
        link["material"] = reader.material(mat, f"{lkey}.material") if mat else None
        link["area"] = reader.quantity(lraw, "area", lkey, "area", required=True, positive=True)
        link["length"] = reader.quantity(
            lraw, "length", lkey, "length", required=True, positive=True
        )
        link["count"] = reader.count(lraw, "count", lkey, 1, high=MAX_COUNT, what="links")
    return link


def _cooler_map(reader: _Reader, raw, names: set[str], temps: dict[str, float]) -> dict | None:
    """A two-stage capacity map: each stage's capacity against both stage temperatures,
    the warmer stage first."""
    key = "cooler.map"
    raw = reader.table(raw, key)
    reader.keys(raw, COOLER_MAP_KEYS, key)
    n = len(reader.errors)
    stages = raw.get("stages")
    if not (
        isinstance(stages, list)
        and len(stages) == 2
        and all(isinstance(x, str) and x in names for x in stages)
    ):
        reader.error(
            "the map names its two stages",
            f"{key}.stages",
            expected="two stage names, warmer first",
            found=shown(stages),
        )
    elif all(x in temps for x in stages) and temps[stages[0]] <= temps[stages[1]]:
        reader.error(
            "the map's stages are the wrong way round",
            f"{key}.stages",
            expected=f"the warmer stage first: [{stages[1]!r}, {stages[0]!r}]",
            found=shown(stages),
        )
    grids = {}
    for g in ("first_K", "second_K"):
        v = raw.get(g)
        ok = isinstance(v, list) and len(v) >= 2 and all(is_number(x) and x > 0 for x in v)
        if not ok or any(b <= a for a, b in zip(v, v[1:])):
            reader.error(
                "not a temperature grid",
                f"{key}.{g}",
                expected="two or more temperatures in K, increasing",
                found=shown(v),
            )
        else:
            grids[g] = [float(x) for x in v]
    powers = {}
    for p in ("first_W", "second_W"):
        v = raw.get(p)
        if len(grids) == 2:
            rows, cols = len(grids["first_K"]), len(grids["second_K"])
            ok = (
                isinstance(v, list)
                and len(v) == rows
                and all(
                    isinstance(r, list)
                    and len(r) == cols
                    and all(is_number(x) and x >= 0 for x in r)
                    for r in v
                )
            )
            if not ok:
                reader.error(
                    "not a capacity table",
                    f"{key}.{p}",
                    expected=f"{rows} rows (first_K) of {cols} powers in W "
                    "(second_K), none negative",
                    found=shown(v),
                )
            else:
                powers[p] = [[float(x) for x in r] for r in v]
    if len(reader.errors) != n:
        return None
    return {"stages": list(stages), **grids, **powers}
