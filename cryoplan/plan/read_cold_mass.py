"""The cold mass of a plan: its ``[[stage]]`` tables and their parts (a mass, a volume, or
the dimensions of a box, a solid cylinder or a tube with the material's density).

Each stage and each part is read on its own: a mistake in one is recorded and the next
is read, so that every independent mistake is reported in one run.
"""

from __future__ import annotations

import math

from .. import units
from ..errors import InputError
from .located import _Reader, shown
from .schema import PART_KEYS, STAGE_KEYS, Part, Stage

#: The shapes a part's ``dimensions`` may describe, with what they list.
SHAPES = {
    "box": (3, "three lengths: ['100 mm', '50 mm', '10 mm'] (box)"),
    "cylinder": (2, "two lengths: ['diameter', 'length'] (solid cylinder)"),
    "tube": (3, "three lengths: ['outer diameter', 'wall', 'length'] (tube)"),
}


def read_stages(reader: _Reader, raw_list, ambient: float) -> tuple[list[Stage], list[str]]:
    """The valid stages, and the names of every stage written (valid or not), so that a
    reference to a stage with a mistake of its own is not reported again as unknown."""
    stages: list[Stage] = []
    seen: dict[str, None] = {}  # every name written, in file order
    entries = reader.array(raw_list, "stage")
    for i, raw in enumerate(entries):
        key = f"stage[{i}]"
        raw = reader.table(raw, key)
        reader.keys(raw, STAGE_KEYS, key)
        name = reader.text(raw, "name", key, default=f"stage {i + 1}", required=True)
        if name in seen:
            reader.error(
                "two stages have the same name",
                f"{key}.name",
                expected="a name of its own",
                found=repr(name),
            )
        seen[name] = None
        temperature = reader.quantity(
            raw, "temperature", key, "temperature", required=True, positive=True
        )
        parts = []
        for j, praw in enumerate(reader.array(raw.get("parts"), f"{key}.parts")):
            part = _part(reader, praw, f"{key}.parts[{j}]", j, temperature)
            if part is not None:
                parts.append(part)
        if temperature is not None:
            if temperature > ambient:
                reader.error(
                    "a stage warmer than the ambient",
                    f"{key}.temperature",
                    expected=f"at most the ambient, {ambient:g} K",
                    found=shown(raw["temperature"]),
                )
            stages.append(Stage(name, temperature, parts, key, reader.lines.line_of(key)))
    if not entries:
        reader.error(
            "the plan has no stage", "stage", expected="at least one [[stage]]", found="none"
        )
    return stages, list(seen)


def _part(reader: _Reader, praw, pkey: str, j: int, temperature: float | None) -> Part | None:
    praw = reader.table(praw, pkey)
    reader.keys(praw, PART_KEYS, pkey)
    pname = reader.text(praw, "name", pkey, default=f"part {j + 1}")
    mat = reader.required(praw, "material", pkey)
    mat_id = reader.material(mat, f"{pkey}.material") if mat is not None else None
    mass = _part_mass(reader, praw, pkey, mat_id)
    start = reader.quantity(praw, "start", pkey, "temperature")
    if start is not None and temperature is not None and start < temperature:
        reader.error(
            "the part starts colder than its stage",
            f"{pkey}.start",
            expected=f"a start at or above {temperature:g} K",
            found=shown(praw["start"]),
        )
    if mat_id is None or mass is None:
        return None
    return Part(pname, mat_id, mass, start, pkey, reader.lines.line_of(pkey))


def _part_mass(reader: _Reader, raw: dict, key: str, material_id: str | None) -> float | None:
    given = [k for k in ("mass", "volume", "dimensions") if k in raw]
    if len(given) > 1:
        reader.error(
            "give one of mass, volume or dimensions",
            f"{key}.{given[1]}",
            expected="one of mass, volume, dimensions",
            found=", ".join(given),
        )
        return None
    if not given:
        reader.error(
            "the part's mass is missing",
            f"{key}.mass",
            expected="mass, or volume or dimensions with a material",
            found="nothing",
        )
        return None
    count = reader.count(raw, "count", key, 1, what="identical parts")
    if "mass" in raw:
        mass = reader.quantity(raw, "mass", key, "mass", positive=True)
        return None if mass is None else mass * count
    density = None
    if material_id is not None:
        from ..data.materials import material

        density = material(material_id).density
    if "volume" in raw:
        volume = reader.quantity(raw, "volume", key, "volume", positive=True)
    else:
        volume = _volume_from_dimensions(reader, raw, key)
    if volume is None or density is None:
        return None
    return volume * density * count


def _volume_from_dimensions(reader: _Reader, raw: dict, key: str) -> float | None:
    """The volume of a box, a solid cylinder or a tube from its lengths (exact geometry)."""
    shape = reader.choice(raw, "shape", key, list(SHAPES), None, "shape")
    if shape is None and "shape" in raw:
        return None
    shape = shape or "box"
    dims = raw["dimensions"]
    path = f"{key}.dimensions"
    n, text = SHAPES[shape]
    if not isinstance(dims, list) or len(dims) != n:
        reader.error(f"wrong dimensions for a {shape}", path, expected=text, found=shown(dims))
        return None
    values = []
    for i, d in enumerate(dims):
        try:
            v = units.parse_quantity(d, "length", **reader.where(f"{path}[{i}]", at=path))
        except InputError as exc:
            reader.errors.append(exc)
            return None
        if not (math.isfinite(v) and v > 0):
            reader.error(
                "a length that is not positive and finite",
                f"{path}[{i}]",
                expected="positive lengths",
                found=shown(dims[i]),
                at=path,
            )
            return None
        values.append(v)
    if shape == "box":
        return values[0] * values[1] * values[2]
    if shape == "cylinder":
        return math.pi / 4 * values[0] ** 2 * values[1]
    outer, wall, length = values
    if 2 * wall > outer:
        reader.error(
            "the wall is thicker than half the diameter",
            path,
            expected="wall < outer diameter / 2",
            found=shown(dims),
        )
        return None
    return math.pi / 4 * (outer**2 - (outer - 2 * wall) ** 2) * length


def material_range_check(reader: _Reader, stages: list[Stage], start: float) -> None:
    """Every part starts where its material has data (half a percent of slack)."""
    from ..data.materials import material

    for stage in stages:
        for part in stage.parts:
            m = material(part.material)
            top = part.start if part.start is not None else start
            if top > m.t_max * 1.005:
                reader.error(
                    f"'{m.id}' has data up to {m.t_max:g} K only",
                    f"{part.key}.start" if part.start is not None else "cooldown.start",
                    expected=f"a start at or below {m.t_max:g} K",
                    found=f"{top:g} K",
                )
