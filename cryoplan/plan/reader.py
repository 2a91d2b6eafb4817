"""The plan file: load, validate, convert to SI floats.

A plan is a TOML file (see DEVELOPERS.md and examples/). Every quantity is a string with
units, parsed once here by :mod:`cryoplan.units`. Every mistake found is collected and
reported together, each naming the file, the line, the key, what was expected and what was
found (:class:`~cryoplan.errors.InputErrors`).
"""

from __future__ import annotations

import datetime as _dt
import math
import os
from dataclasses import dataclass, field
from typing import Any

from .. import units
from ..errors import CryoplanError, InputError, InputErrors, UnknownNameError, closest
from .positions import LineFinder

try:  # Python 3.11+
    import tomllib as _toml
except ModuleNotFoundError:  # pragma: no cover - Python 3.10
    import tomli as _toml


#: Real multilayer insulation against the calorimeter correlation (common practice: about 2).
MLI_DEGRADATION = 2.0

#: Emissivity of a clean metal surface at low temperature when neither the load nor its
#: surface materials give one (common practice for polished copper or aluminium: 0.02-0.06).
DEFAULT_EMISSIVITY = 0.05

#: Half a kelvin below a boiling point still means the boiling point ("77 K" for nitrogen).
BOILING_POINT_SNAP_K = 0.5

# Default transfer losses, by cryogen, when the plan gives none (common practice: 10-25 %
# of liquid helium is lost through a well-run transfer line and the warm dewar neck; 5-10 %
# of liquid nitrogen in a short open transfer).
DEFAULT_TRANSFER_LOSS = {"helium": 0.2, "nitrogen": 0.1}
DEFAULT_TRANSFER_LOSS_OTHER = 0.1


@dataclass
class Part:
    name: str
    material: str
    mass: float  # kg
    start: float | None  # K, None: the cooldown's start
    key: str = ""
    line: int | None = None


@dataclass
class Stage:
    name: str
    temperature: float  # K
    parts: list[Part]
    key: str = ""
    line: int | None = None


@dataclass
class Step:
    cryogen: str
    to: float  # K, after snapping to the boiling point
    gas_use: float
    gas_use_low: float
    gas_use_high: float
    pressure: float  # Pa
    transfer_loss: float | None
    written_to: float  # K, as the user wrote it
    note: str = ""
    key: str = ""
    line: int | None = None


@dataclass
class Cooldown:
    start: float  # K
    steps: list[Step]


@dataclass
class Bath:
    name: str
    cryogen: str
    volume: float  # m^3 of liquid, full
    stage: str
    pressure: float  # Pa
    refill_at: float  # m^3 of liquid left when it is refilled
    transfer_loss: float | None
    key: str = ""
    line: int | None = None


@dataclass
class Supply:
    cryogen: str
    dewars: list[float]  # m^3
    price: float | None  # currency per m^3
    currency: str
    heel: float  # m^3 left unusable in each dewar
    transfer_loss: float | None
    liquefier_energy: float | None  # J per m^3 of liquid (a real liquefier's specific energy)
    key: str = ""


@dataclass
class Insert:
    name: str
    material: str
    mass: float  # kg
    into: str  # cryogen name
    start: float  # K
    times: int
    gas_use: float
    key: str = ""
    line: int | None = None


@dataclass
class Load:
    stage: str
    kind: str
    values: dict[str, Any]  # SI floats and plain values, by key
    key: str = ""
    line: int | None = None


@dataclass
class CoolerStage:
    stage: str
    capacity: list[list[float]] | None  # [[K, W], ...]
    capacity_map: dict[str, Any] | None
    key: str = ""
    line: int | None = None


@dataclass
class Cooler:
    input_power: float | None  # W
    percent_carnot: float | None
    stages: list[CoolerStage]
    links: list[dict[str, Any]]
    max_time: float  # s
    key: str = "cooler"
    capacity_map: dict[str, Any] | None = None  # two-stage map: stages, grids, powers
    line: int | None = None


@dataclass
class Vessel:
    name: str
    cryogen: str
    liquid: float  # m^3
    boiloff: float | None  # m^3 of liquid per second, normal boil-off
    failure_rate: float | None  # m^3 of gas per second in a loss of vacuum
    quench: bool
    quench_time: float  # s
    quench_fraction: float
    key: str = ""
    line: int | None = None


@dataclass
class Room:
    name: str
    volume: float  # m^3
    ventilation: float  # m^3/s of fresh air
    alarm: float  # percent oxygen
    temperature: float  # K
    vessels: list[Vessel]
    include_baths: bool
    quench: bool = False  # the cryostat's helium bath may quench (a magnet)
    quench_time: float = 30.0  # s
    quench_fraction: float = 1.0
    key: str = ""
    line: int | None = None
    sudden_model: str = "mixed"  # see safety.SUDDEN_RELEASE_MODELS


@dataclass
class Plan:
    path: str
    title: str
    ambient: float
    stages: list[Stage]
    cooldown: Cooldown
    baths: list[Bath] = field(default_factory=list)
    supplies: dict[str, Supply] = field(default_factory=dict)
    inserts: list[Insert] = field(default_factory=list)
    loads: list[Load] = field(default_factory=list)
    cooler: Cooler | None = None
    rooms: list[Room] = field(default_factory=list)
    mass_margin: float = 0.0
    start_date: _dt.date | None = None
    horizon_days: float = 30.0
    notes: list[str] = field(default_factory=list)
    text: str = ""

    def stage(self, name: str) -> Stage:
        for s in self.stages:
            if s.name == name:
                return s
        raise KeyError(name)


# --- the schema -----------------------------------------------------------------------

TOP_KEYS = {
    "title",
    "ambient",
    "stage",
    "cooldown",
    "bath",
    "supply",
    "insert",
    "load",
    "cooler",
    "room",
    "margin",
    "operation",
    "notes",
}
STAGE_KEYS = {"name", "temperature", "parts"}
PART_KEYS = {"name", "material", "mass", "volume", "dimensions", "shape", "start", "count"}
COOLDOWN_KEYS = {"start", "steps"}
STEP_KEYS = {"cryogen", "to", "gas_use", "gas_use_range", "pressure", "transfer_loss"}
BATH_KEYS = {"name", "cryogen", "volume", "stage", "pressure", "refill_at", "transfer_loss"}
SUPPLY_KEYS = {"cryogen", "dewars", "price", "heel", "transfer_loss", "liquefier_energy"}
INSERT_KEYS = {"name", "material", "mass", "into", "start", "times", "gas_use"}
MARGIN_KEYS = {"mass"}
OPERATION_KEYS = {"start_date", "days"}
LOAD_KEYS = {
    "fixed": {"power"},
    "radiation": {
        "area",
        "from",
        "emissivity",
        "surfaces",
        "layers",
        "area_ratio",
        "layer_density",
        "degradation",
    },
    "support": {"material", "area", "length", "count", "from", "via", "rrr", "diameter"},
    "wire": {"material", "diameter", "gauge", "length", "count", "from", "via", "rrr"},
    "lead": {"current", "from", "cooling", "count", "material", "length", "area"},
    "gas": {"area", "from", "pressure", "gas", "accommodation"},
    "neck": {"material", "area", "length", "from", "vapor_cooled"},
}
LOAD_COMMON = {"stage", "kind", "name"}
COOLER_KEYS = {"input_power", "percent_carnot", "stage", "link", "max_time", "map"}
COOLER_MAP_KEYS = {"stages", "first_K", "second_K", "first_W", "second_W"}
COOLER_STAGE_KEYS = {"stage", "capacity", "map"}
LINK_KEYS = {"between", "conductance", "material", "area", "length", "count"}
ROOM_KEYS = {
    "name",
    "volume",
    "ventilation",
    "alarm",
    "temperature",
    "vessel",
    "include_baths",
    "quench",
    "quench_time",
    "quench_fraction",
    "sudden_model",
}
VESSEL_KEYS = {
    "name",
    "cryogen",
    "liquid",
    "boiloff",
    "failure_release",
    "quench",
    "quench_time",
    "quench_fraction",
}


class _Reader:
    """Collects every problem of one plan file, each with its line."""

    def __init__(self, path: str, text: str) -> None:
        self.path = path
        self.lines = LineFinder(text)
        self.errors: list[InputError] = []

    def where(self, key: str) -> dict:
        return {"file": self.path, "line": self.lines.line_of(key), "key": key}

    def error(self, message: str, key: str, expected=None, found=None) -> None:
        self.errors.append(InputError(message, expected=expected, found=found, **self.where(key)))

    def keys(self, table: Any, allowed: set[str], key: str) -> None:
        if not isinstance(table, dict):
            return
        for name in table:
            if name not in allowed:
                close = closest(name, sorted(allowed), n=1)
                hint = f"; did you mean '{close[0]}'?" if close else ""
                path = f"{key}.{name}" if key else name
                self.errors.append(
                    InputError(
                        f"unknown key '{name}'{hint}",
                        expected="one of " + ", ".join(sorted(allowed)),
                        found=repr(name),
                        **self.where(path),
                    )
                )

    def table(self, value, key: str) -> dict:
        if isinstance(value, dict):
            return value
        self.error("not a table", key, expected="a table of keys", found=repr(value))
        return {}

    def array(self, value, key: str) -> list:
        if value is None:
            return []
        if isinstance(value, list):
            return value
        self.error("not a list", key, expected="a list", found=repr(value))
        return []

    def required(self, table: dict, name: str, key: str):
        if name not in table:
            self.error(
                f"the key '{name}' is missing",
                f"{key}.{name}" if key else name,
                expected=f"a value for '{name}'",
                found="nothing",
            )
            return None
        return table[name]

    def text(self, table: dict, name: str, key: str, default=None, required=False) -> str | None:
        if name not in table:
            if required:
                self.required(table, name, key)
            return default
        value = table[name]
        if not isinstance(value, str) or not value.strip():
            self.error(
                "not a name", f"{key}.{name}", expected="a non-empty string", found=repr(value)
            )
            return default
        return value.strip()

    def quantity(
        self,
        table,
        name,
        key,
        dimension,
        default=None,
        required=False,
        positive=False,
        nonnegative=False,
    ):
        path = f"{key}.{name}" if key else name
        if name not in table:
            if required:
                self.required(table, name, key)
            return default
        try:
            if dimension == "temperature":
                value = units.parse_temperature(table[name], **self.where(path))
            else:
                value = units.parse_quantity(table[name], dimension, **self.where(path))
        except InputError as exc:
            self.errors.append(exc)
            return default
        if positive and not value > 0:
            self.error(
                f"a {dimension} that is not positive",
                path,
                expected=f"a {dimension} greater than zero",
                found=repr(table[name]),
            )
            return default
        if nonnegative and value < 0:
            self.error(
                f"a negative {dimension}",
                path,
                expected=f"a {dimension} of zero or more",
                found=repr(table[name]),
            )
            return default
        return value

    def fraction(self, table, name, key, default, low=0.0, high=1.0):
        if name not in table:
            return default
        try:
            return units.parse_fraction(table[name], low, high, **self.where(f"{key}.{name}"))
        except InputError as exc:
            self.errors.append(exc)
            return default

    def count(self, table, name, key, default=1):
        if name not in table:
            return default
        value = table[name]
        if isinstance(value, bool) or not isinstance(value, int) or value < 1:
            self.error(
                "not a whole number of 1 or more",
                f"{key}.{name}",
                expected="a whole number such as 3",
                found=repr(value),
            )
            return default
        return value

    def temperature_or_stage(self, table, name, key, stage_temps, required=True):
        """A temperature ('77 K') or the name of a stage; returns (K, stage name or None)."""
        path = f"{key}.{name}"
        if name not in table:
            if required:
                self.required(table, name, key)
            return None, None
        value = table[name]
        if isinstance(value, str) and value.strip() in stage_temps:
            return stage_temps[value.strip()], value.strip()
        try:
            return units.parse_temperature(value, **self.where(path)), None
        except InputError as exc:
            if isinstance(value, str) and not any(ch.isdigit() for ch in value):
                self.errors.append(
                    UnknownNameError("stage", value, list(stage_temps), **self.where(path))
                )
            else:
                self.errors.append(exc)
            return None, None


def _known_material(reader: _Reader, name, key: str) -> str | None:
    from ..data.materials import material

    if not isinstance(name, str):
        reader.error(
            "not a material id", key, expected="a material id such as 'copper'", found=repr(name)
        )
        return None
    try:
        return material(name).id
    except UnknownNameError:
        reader.errors.append(
            UnknownNameError("material", name, _material_ids(), **reader.where(key))
        )
        return None


def _material_ids():
    from ..data.materials import material_ids

    return material_ids()


def _known_cryogen(reader: _Reader, name, key: str) -> str | None:
    from ..data.fluids import cryogen_names

    names = cryogen_names()
    if isinstance(name, str) and name.strip().lower() in names:
        return name.strip().lower()
    aliases = {
        "he": "helium",
        "lhe": "helium",
        "ln2": "nitrogen",
        "n2": "nitrogen",
        "ne": "neon",
        "h2": "hydrogen",
        "ar": "argon",
        "o2": "oxygen",
    }
    if isinstance(name, str) and name.strip().lower() in aliases:
        return aliases[name.strip().lower()]
    reader.errors.append(UnknownNameError("cryogen", str(name), names, **reader.where(key)))
    return None


def _checked_boiling_point(reader, cryogen: str, pressure: float, key: str) -> float | None:
    """The boiling point at the pressure, or None with the problem recorded at ``key``."""
    try:
        return _boiling_point(cryogen, pressure)
    except CryoplanError as exc:
        reader.errors.append(
            InputError(
                getattr(exc, "message", str(exc)),
                expected=getattr(exc, "expected", None),
                found=getattr(exc, "found", None),
                **reader.where(key),
            )
        )
        return None


def _boiling_point(cryogen: str, pressure: float) -> float:
    from ..data.fluids import cryogen as _cryogen

    return _cryogen(cryogen, pressure=pressure).boiling_point


# --- sections ---------------------------------------------------------------------------


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
    count = reader.count(raw, "count", key, 1)
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
    shape = raw.get("shape", "box")
    dims = raw["dimensions"]
    path = f"{key}.dimensions"
    expect = {
        "box": (3, "three lengths: ['100 mm', '50 mm', '10 mm'] (box)"),
        "cylinder": (2, "two lengths: ['diameter', 'length'] (solid cylinder)"),
        "tube": (3, "three lengths: ['outer diameter', 'wall', 'length'] (tube)"),
    }
    if shape not in expect:
        reader.error(
            "unknown shape", f"{key}.shape", expected="box, cylinder or tube", found=repr(shape)
        )
        return None
    n, text = expect[shape]
    if not isinstance(dims, list) or len(dims) != n:
        reader.error(f"wrong dimensions for a {shape}", path, expected=text, found=repr(dims))
        return None
    values = []
    for i, d in enumerate(dims):
        try:
            v = units.parse_quantity(d, "length", **reader.where(path))
        except InputError as exc:
            reader.errors.append(exc)
            return None
        if v <= 0:
            reader.error(
                "a length that is not positive",
                path,
                expected="positive lengths",
                found=repr(dims[i]),
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
            found=repr(dims),
        )
        return None
    return math.pi / 4 * (outer**2 - (outer - 2 * wall) ** 2) * length


def _stages(reader: _Reader, raw_list, ambient: float) -> list[Stage]:
    stages: list[Stage] = []
    seen: set[str] = set()
    for i, raw in enumerate(reader.array(raw_list, "stage")):
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
        seen.add(name)
        temperature = reader.quantity(
            raw, "temperature", key, "temperature", required=True, positive=True
        )
        parts = []
        for j, praw in enumerate(reader.array(raw.get("parts"), f"{key}.parts")):
            pkey = f"{key}.parts[{j}]"
            praw = reader.table(praw, pkey)
            reader.keys(praw, PART_KEYS, pkey)
            pname = reader.text(praw, "name", pkey, default=f"part {j + 1}")
            mat = reader.required(praw, "material", pkey)
            mat_id = _known_material(reader, mat, f"{pkey}.material") if mat is not None else None
            mass = _part_mass(reader, praw, pkey, mat_id)
            start = reader.quantity(praw, "start", pkey, "temperature")
            if start is not None and temperature is not None and start < temperature:
                reader.error(
                    "the part starts colder than its stage",
                    f"{pkey}.start",
                    expected=f"a start at or above {temperature:g} K",
                    found=repr(praw["start"]),
                )
            if mat_id is not None and mass is not None:
                parts.append(Part(pname, mat_id, mass, start, pkey, reader.lines.line_of(pkey)))
        if temperature is not None:
            if temperature > ambient:
                reader.error(
                    "a stage warmer than the ambient",
                    f"{key}.temperature",
                    expected=f"at most the ambient, {ambient:g} K",
                    found=repr(raw["temperature"]),
                )
            stages.append(Stage(name, temperature, parts, key, reader.lines.line_of(key)))
    if not stages and not reader.errors:
        reader.error(
            "the plan has no stage", "stage", expected="at least one [[stage]]", found="none"
        )
    return stages


def _material_range_check(reader: _Reader, stages: list[Stage], start: float) -> None:
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


def _cooldown(reader: _Reader, raw, stages: list[Stage], ambient: float, plan_notes) -> Cooldown:
    raw = reader.table(raw if raw is not None else {}, "cooldown")
    reader.keys(raw, COOLDOWN_KEYS, "cooldown")
    start = reader.quantity(raw, "start", "cooldown", "temperature", default=ambient)
    steps: list[Step] = []
    part_temps = [p.start if p.start is not None else start for s in stages for p in s.parts]
    warmest = max(part_temps, default=start)
    previous = warmest
    for i, sraw in enumerate(reader.array(raw.get("steps"), "cooldown.steps")):
        key = f"cooldown.steps[{i}]"
        sraw = reader.table(sraw, key)
        reader.keys(sraw, STEP_KEYS, key)
        cry = reader.required(sraw, "cryogen", key)
        cry = _known_cryogen(reader, cry, f"{key}.cryogen") if cry is not None else None
        to = reader.quantity(sraw, "to", key, "temperature", required=True)
        pressure = reader.quantity(
            sraw, "pressure", key, "pressure", default=101325.0, positive=True
        )
        gas_use = reader.fraction(sraw, "gas_use", key, 0.0)
        low, high = gas_use, gas_use
        if "gas_use_range" in sraw:
            rng = sraw["gas_use_range"]
            if not (isinstance(rng, list) and len(rng) == 2):
                reader.error(
                    "not a range",
                    f"{key}.gas_use_range",
                    expected="two numbers [low, high] in 0..1",
                    found=repr(rng),
                )
            else:
                low = reader.fraction({"v": rng[0]}, "v", key, gas_use)
                high = reader.fraction({"v": rng[1]}, "v", key, gas_use)
                if not low <= gas_use <= high:
                    reader.error(
                        "gas_use lies outside its range",
                        f"{key}.gas_use_range",
                        expected=f"low <= {gas_use:g} <= high",
                        found=repr(rng),
                    )
        loss = reader.fraction(sraw, "transfer_loss", key, None, 0.0, 0.95)
        if cry is None or to is None or pressure is None:
            continue
        written = to
        note = ""
        tb = _checked_boiling_point(reader, cry, pressure, f"{key}.pressure")
        if tb is None:
            continue
        if to < tb - BOILING_POINT_SNAP_K:
            reader.error(
                f"{cry} boils at {tb:.2f} K at {pressure / 1000:.4g} kPa; a {cry} step cannot "
                "cool below that",
                f"{key}.to",
                expected=f"'to' at or above {tb:.2f} K (or a lower bath pressure)",
                found=repr(sraw["to"]),
            )
            continue
        if to < tb:
            note = (
                f"step {i + 1}: 'to = {sraw['to']}' read as the boiling point of {cry}, "
                f"{tb:.2f} K at {pressure / 1000:.4g} kPa"
            )
            plan_notes.append(note)
            to = tb
        if to >= previous:
            where = "where the parts are" if i == 0 else "the previous step's end"
            reader.error(
                f"the step ends above {where} ({previous:g} K)",
                f"{key}.to",
                expected=f"a temperature below {previous:g} K",
                found=repr(sraw["to"]),
            )
            continue
        previous = to
        steps.append(
            Step(
                cry,
                to,
                gas_use,
                low,
                high,
                pressure,
                loss,
                written,
                note,
                key,
                reader.lines.line_of(key),
            )
        )
    return Cooldown(start if start is not None else ambient, steps)


def _baths(reader: _Reader, raw_list, stages: list[Stage]) -> list[Bath]:
    baths = []
    names = {s.name: s for s in stages}
    for i, raw in enumerate(reader.array(raw_list, "bath")):
        key = f"bath[{i}]"
        raw = reader.table(raw, key)
        reader.keys(raw, BATH_KEYS, key)
        cry = reader.required(raw, "cryogen", key)
        cry = _known_cryogen(reader, cry, f"{key}.cryogen") if cry is not None else None
        volume = reader.quantity(raw, "volume", key, "volume", required=True, positive=True)
        stage = reader.text(raw, "stage", key, required=True)
        pressure = reader.quantity(
            raw, "pressure", key, "pressure", default=101325.0, positive=True
        )
        refill = 0.0
        if "refill_at" in raw:
            value = raw["refill_at"]
            if (
                isinstance(value, (int, float))
                and not isinstance(value, bool)
                or (isinstance(value, str) and value.strip().endswith("%"))
            ):
                frac = reader.fraction(raw, "refill_at", key, 0.0)
                refill = frac * (volume or 0.0)
            else:
                refill = reader.quantity(
                    raw, "refill_at", key, "volume", default=0.0, nonnegative=True
                )
                if volume is not None and refill >= volume:
                    reader.error(
                        "the refill level is above the full volume",
                        f"{key}.refill_at",
                        expected=f"less than {raw.get('volume')}",
                        found=repr(value),
                    )
        loss = reader.fraction(raw, "transfer_loss", key, None, 0.0, 0.95)
        if stage is not None and stage not in names:
            reader.errors.append(
                UnknownNameError("stage", stage, list(names), **reader.where(f"{key}.stage"))
            )
            continue
        if None in (cry, volume, stage, pressure):
            continue
        tb = _checked_boiling_point(reader, cry, pressure, f"{key}.pressure")
        if tb is None:
            continue
        st = names[stage].temperature
        if st < tb - BOILING_POINT_SNAP_K:
            reader.error(
                f"a {cry} bath at {pressure / 1000:.4g} kPa holds {tb:.2f} K, not the stage's "
                f"{st:g} K",
                f"{key}.stage",
                expected=f"a stage at or above {tb:.2f} K, or a lower bath pressure",
                found=repr(stage),
            )
            continue
        name = reader.text(raw, "name", key, default=f"{cry} bath")
        baths.append(
            Bath(name, cry, volume, stage, pressure, refill, loss, key, reader.lines.line_of(key))
        )
    return baths


def _supplies(reader: _Reader, raw_list) -> dict[str, Supply]:
    supplies: dict[str, Supply] = {}
    for i, raw in enumerate(reader.array(raw_list, "supply")):
        key = f"supply[{i}]"
        raw = reader.table(raw, key)
        reader.keys(raw, SUPPLY_KEYS, key)
        cry = reader.required(raw, "cryogen", key)
        cry = _known_cryogen(reader, cry, f"{key}.cryogen") if cry is not None else None
        dewars = []
        for d in reader.array(raw.get("dewars", []), f"{key}.dewars"):
            v = reader.quantity({"d": d}, "d", key, "volume", positive=True)
            if v is not None:
                dewars.append(v)
        price, currency = None, ""
        if "price" in raw:
            try:
                price, currency, _ = units.parse_price(
                    raw["price"], **reader.where(f"{key}.price")
                )
            except InputError as exc:
                reader.errors.append(exc)
        heel = reader.quantity(raw, "heel", key, "volume", default=0.0, nonnegative=True)
        if dewars and heel is not None and heel >= min(dewars):
            reader.error(
                "the heel is as large as the smallest dewar",
                f"{key}.heel",
                expected=f"less than {min(dewars) * 1000:g} L",
                found=repr(raw["heel"]),
            )
        loss = reader.fraction(raw, "transfer_loss", key, None, 0.0, 0.95)
        liq = None
        if "liquefier_energy" in raw:
            liq = reader.quantity(raw, "liquefier_energy", key, "energy per volume", positive=True)
        if cry is None:
            continue
        if cry in supplies:
            reader.error(
                "a second supply of the same cryogen",
                f"{key}.cryogen",
                expected="one [[supply]] per cryogen",
                found=repr(cry),
            )
            continue
        supplies[cry] = Supply(cry, sorted(dewars), price, currency, heel or 0.0, loss, liq, key)
    return supplies


def _inserts(reader: _Reader, raw_list, ambient: float) -> list[Insert]:
    inserts = []
    for i, raw in enumerate(reader.array(raw_list, "insert")):
        key = f"insert[{i}]"
        raw = reader.table(raw, key)
        reader.keys(raw, INSERT_KEYS, key)
        name = reader.text(raw, "name", key, default=f"insert {i + 1}")
        mat = reader.required(raw, "material", key)
        mat_id = _known_material(reader, mat, f"{key}.material") if mat is not None else None
        mass = reader.quantity(raw, "mass", key, "mass", required=True, positive=True)
        into = reader.required(raw, "into", key)
        into = _known_cryogen(reader, into, f"{key}.into") if into is not None else None
        start = reader.quantity(raw, "start", key, "temperature", default=ambient)
        times = reader.count(raw, "times", key, 1)
        gas_use = reader.fraction(raw, "gas_use", key, 0.0)
        if None not in (mat_id, mass, into, start):
            inserts.append(
                Insert(
                    name, mat_id, mass, into, start, times, gas_use, key, reader.lines.line_of(key)
                )
            )
    return inserts


def _loads(reader: _Reader, raw_list, stages: list[Stage]) -> list[Load]:
    temps = {s.name: s.temperature for s in stages}
    loads = []
    for i, raw in enumerate(reader.array(raw_list, "load")):
        key = f"load[{i}]"
        raw = reader.table(raw, key)
        kind = reader.text(raw, "kind", key, required=True)
        if kind is not None and kind not in LOAD_KEYS:
            close = closest(kind, list(LOAD_KEYS), n=2)
            reader.error(
                "unknown kind of load",
                f"{key}.kind",
                expected="one of "
                + ", ".join(LOAD_KEYS)
                + (f" (did you mean {close[0]!r}?)" if close else ""),
                found=repr(kind),
            )
            continue
        if kind is None:
            continue
        reader.keys(raw, LOAD_COMMON | LOAD_KEYS[kind], key)
        stage = reader.text(raw, "stage", key, required=True)
        if stage is not None and stage not in temps:
            reader.errors.append(
                UnknownNameError("stage", stage, list(temps), **reader.where(f"{key}.stage"))
            )
            continue
        if stage is None:
            continue
        values = _load_values(reader, raw, key, kind, temps, temps[stage])
        if values is not None:
            values["name"] = raw.get("name", kind)
            loads.append(Load(stage, kind, values, key, reader.lines.line_of(key)))
    return loads


def _surface_emissivities(reader: _Reader, value, key: str) -> list[float]:
    """[cold, warm] emissivities from the materials database's values for the surfaces."""
    from ..data.materials import material

    if not (isinstance(value, list) and len(value) == 2):
        reader.error(
            "not a pair of surfaces",
            key,
            expected="two material ids: [cold surface, warm surface]",
            found=repr(value),
        )
        return [DEFAULT_EMISSIVITY, DEFAULT_EMISSIVITY]
    out = []
    for name in value:
        mat_id = _known_material(reader, name, key)
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


def _load_values(reader: _Reader, raw, key, kind, temps, stage_t) -> dict | None:
    n_errors = len(reader.errors)
    v: dict[str, Any] = {}
    if kind != "fixed":
        hot, hot_stage = reader.temperature_or_stage(raw, "from", key, temps)
        v["from"], v["from_stage"] = hot, hot_stage
        if hot is not None and hot <= stage_t:
            reader.error(
                "'from' is not warmer than the stage it loads",
                f"{key}.from",
                expected=f"a temperature above {stage_t:g} K",
                found=repr(raw["from"]),
            )
    if kind == "fixed":
        v["power"] = reader.quantity(raw, "power", key, "power", required=True, nonnegative=True)
    elif kind == "radiation":
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
                found=repr(em),
            )
            ems = [0.05, 0.05]
        out = []
        for e in ems:
            if isinstance(e, bool) or not isinstance(e, (int, float)) or not 0 < e <= 1:
                reader.error(
                    "an emissivity outside (0, 1]",
                    f"{key}.emissivity",
                    expected="a number greater than 0 and at most 1",
                    found=repr(em),
                )
                out.append(0.05)
            else:
                out.append(float(e))
        v["emissivity"] = out
        v["layers"] = 0
        if "layers" in raw:
            layers = raw["layers"]
            if isinstance(layers, bool) or not isinstance(layers, int) or layers < 0:
                reader.error(
                    "not a number of layers",
                    f"{key}.layers",
                    expected="a whole number of 0 or more",
                    found=repr(layers),
                )
            else:
                v["layers"] = layers
        v["area_ratio"] = reader.fraction(raw, "area_ratio", key, 0.0)
        # real blankets, with seams and penetrations, leak about twice the calorimeter
        # figure of the correlation (common practice)
        v["degradation"] = reader.fraction(raw, "degradation", key, MLI_DEGRADATION, 1.0, 10.0)
        v["layer_density"] = reader.quantity(
            raw, "layer_density", key, "per length", positive=True
        )
    elif kind in ("support", "wire", "neck"):
        mat = reader.required(raw, "material", key)
        mat_id = _known_material(reader, mat, f"{key}.material") if mat is not None else None
        if mat_id is not None:
            from ..data.materials import material

            if not material(mat_id).has_conductivity:
                reader.error(
                    f"'{mat_id}' has no thermal-conductivity data",
                    f"{key}.material",
                    expected="a material with conductivity data",
                    found=repr(mat),
                )
        v["material"] = mat_id
        v["length"] = reader.quantity(raw, "length", key, "length", required=True, positive=True)
        v["count"] = reader.count(raw, "count", key, 1)
        if kind == "wire":
            if "gauge" in raw:
                g = raw["gauge"]
                if isinstance(g, bool) or not isinstance(g, int) or not 0 <= g <= 50:
                    reader.error(
                        "not a wire gauge",
                        f"{key}.gauge",
                        expected="an AWG number from 0 to 50",
                        found=repr(g),
                    )
                v["gauge"] = g
            else:
                v["diameter"] = reader.quantity(
                    raw, "diameter", key, "length", required=True, positive=True
                )
        else:
            if "diameter" in raw and "area" not in raw:
                d = reader.quantity(raw, "diameter", key, "length", positive=True)
                v["area"] = None if d is None else math.pi / 4 * d * d
            else:
                v["area"] = reader.quantity(raw, "area", key, "area", required=True, positive=True)
        v["rrr"] = None
        if "rrr" in raw:
            r = raw["rrr"]
            if isinstance(r, bool) or not isinstance(r, (int, float)) or r < 1:
                reader.error(
                    "not a residual-resistance ratio",
                    f"{key}.rrr",
                    expected="a number of 1 or more",
                    found=repr(r),
                )
            else:
                v["rrr"] = float(r)
        via = []
        for name in reader.array(raw.get("via", []), f"{key}.via"):
            if name not in temps:
                reader.errors.append(
                    UnknownNameError("stage", str(name), list(temps), **reader.where(f"{key}.via"))
                )
            else:
                via.append(name)
        v["via"] = via
        if kind == "neck":
            v["vapor_cooled"] = bool(raw.get("vapor_cooled", False))
    elif kind == "lead":
        v["current"] = reader.quantity(
            raw, "current", key, "current", required=True, nonnegative=True
        )
        cooling = raw.get("cooling", "conduction")
        if cooling not in ("conduction", "vapor"):
            reader.error(
                "unknown cooling of a lead",
                f"{key}.cooling",
                expected="'conduction' or 'vapor'",
                found=repr(cooling),
            )
        v["cooling"] = cooling
        v["count"] = reader.count(raw, "count", key, 2)
        v["length"] = reader.quantity(raw, "length", key, "length", positive=True)
        v["area"] = reader.quantity(raw, "area", key, "area", positive=True)
        v["material"] = raw.get("material", "copper")
    elif kind == "gas":
        v["area"] = reader.quantity(raw, "area", key, "area", required=True, positive=True)
        v["pressure"] = reader.quantity(
            raw, "pressure", key, "pressure", required=True, positive=True
        )
        from ..physics.heatloads import GASES

        v["gas"] = raw.get("gas", "helium")
        if v["gas"] not in GASES:
            reader.errors.append(
                UnknownNameError("gas", str(v["gas"]), list(GASES), **reader.where(f"{key}.gas"))
            )
        v["accommodation"] = reader.fraction(raw, "accommodation", key, None)
    return v if len(reader.errors) == n_errors else None


def _cooler(reader: _Reader, raw, stages: list[Stage]) -> Cooler | None:
    if raw is None:
        return None
    key = "cooler"
    raw = reader.table(raw, key)
    reader.keys(raw, COOLER_KEYS, key)
    names = {s.name for s in stages}
    power = reader.quantity(raw, "input_power", key, "power", positive=True)
    pc = reader.fraction(raw, "percent_carnot", key, None, 0.0, 100.0)
    max_time = reader.quantity(raw, "max_time", key, "time", default=60 * 86400.0, positive=True)
    cstages = []
    for i, sraw in enumerate(reader.array(raw.get("stage"), "cooler.stage")):
        skey = f"cooler.stage[{i}]"
        sraw = reader.table(sraw, skey)
        reader.keys(sraw, COOLER_STAGE_KEYS, skey)
        stage = reader.text(sraw, "stage", skey, required=True)
        if stage is not None and stage not in names:
            reader.errors.append(
                UnknownNameError("stage", stage, sorted(names), **reader.where(f"{skey}.stage"))
            )
            continue
        cap = sraw.get("capacity")
        cmap = sraw.get("map")
        if cap is None and cmap is None:
            reader.error(
                "the stage's capacity is missing",
                f"{skey}.capacity",
                expected="capacity = [[K, W], ...] or a map",
                found="nothing",
            )
            continue
        if cap is not None:
            ok = (
                isinstance(cap, list)
                and len(cap) >= 1
                and all(
                    isinstance(p, list)
                    and len(p) == 2
                    and all(isinstance(x, (int, float)) and not isinstance(x, bool) for x in p)
                    for p in cap
                )
            )
            if not ok:
                reader.error(
                    "not a capacity table",
                    f"{skey}.capacity",
                    expected="a list of [K, W] pairs such as [[4.2, 1.5], [10, 5]]",
                    found=repr(cap),
                )
                continue
            ks = [p[0] for p in cap]
            if any(b <= a for a, b in zip(ks, ks[1:])):
                reader.error(
                    "capacity temperatures not increasing",
                    f"{skey}.capacity",
                    expected="[K, W] pairs in increasing K",
                    found=repr(cap),
                )
                continue
            if any(p[1] < 0 for p in cap) or any(p[0] <= 0 for p in cap):
                reader.error(
                    "a negative capacity or temperature",
                    f"{skey}.capacity",
                    expected="K > 0 and W >= 0",
                    found=repr(cap),
                )
                continue
            cap = [[float(a), float(b)] for a, b in cap]
        if cmap is not None and not isinstance(cmap, dict):
            reader.error(
                "not a capacity map",
                f"{skey}.map",
                expected="a table with 'first', 'second' and 'power'",
                found=repr(cmap),
            )
            continue
        if stage is not None:
            cstages.append(CoolerStage(stage, cap, cmap, skey, reader.lines.line_of(skey)))
    links = []
    for i, lraw in enumerate(reader.array(raw.get("link"), "cooler.link")):
        lkey = f"cooler.link[{i}]"
        lraw = reader.table(lraw, lkey)
        reader.keys(lraw, LINK_KEYS, lkey)
        between = lraw.get("between")
        if not (
            isinstance(between, list) and len(between) == 2 and all(b in names for b in between)
        ):
            reader.error(
                "a link names two stages",
                f"{lkey}.between",
                expected="two stage names",
                found=repr(between),
            )
            continue
        link = {"between": between}
        if "conductance" in lraw:
            link["conductance"] = reader.quantity(
                lraw, "conductance", lkey, "thermal conductance", positive=True
            )
        else:
            mat = reader.required(lraw, "material", lkey)
            link["material"] = _known_material(reader, mat, f"{lkey}.material") if mat else None
            link["area"] = reader.quantity(
                lraw, "area", lkey, "area", required=True, positive=True
            )
            link["length"] = reader.quantity(
                lraw, "length", lkey, "length", required=True, positive=True
            )
            link["count"] = reader.count(lraw, "count", lkey, 1)
        links.append(link)
    cmap = None
    if "map" in raw:
        cmap = _cooler_map(reader, raw["map"], names)
    if not cstages and cmap is None and pc is None and not reader.errors:
        reader.error(
            "the cooler has no stage",
            "cooler.stage",
            expected="at least one [[cooler.stage]] or a [cooler.map] (or percent_carnot alone "
            "for the work of the static loads)",
            found="none",
        )
    if power is None and pc is None:
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
        max_time or 60 * 86400.0,
        capacity_map=cmap,
        line=reader.lines.line_of("cooler"),
    )


def _cooler_map(reader: _Reader, raw, names: set[str]) -> dict | None:
    """A two-stage capacity map: each stage's capacity against both stage temperatures."""
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
            found=repr(stages),
        )
    grids = {}
    for g in ("first_K", "second_K"):
        v = raw.get(g)
        ok = (
            isinstance(v, list)
            and len(v) >= 2
            and all(isinstance(x, (int, float)) and not isinstance(x, bool) and x > 0 for x in v)
        )
        if not ok or any(b <= a for a, b in zip(v, v[1:])):
            reader.error(
                "not a temperature grid",
                f"{key}.{g}",
                expected="two or more temperatures in K, increasing",
                found=repr(v),
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
                    and all(
                        isinstance(x, (int, float)) and not isinstance(x, bool) and x >= 0
                        for x in r
                    )
                    for r in v
                )
            )
            if not ok:
                reader.error(
                    "not a capacity table",
                    f"{key}.{p}",
                    expected=f"{rows} rows (first_K) of {cols} powers in W "
                    "(second_K), none negative",
                    found=repr(v),
                )
            else:
                powers[p] = [[float(x) for x in r] for r in v]
    if len(reader.errors) != n:
        return None
    return {"stages": list(stages), **grids, **powers}


def _rooms(reader: _Reader, raw) -> list[Room]:
    if raw is None:
        return []
    raws = raw if isinstance(raw, list) else [raw]
    rooms = []
    for i, rraw in enumerate(raws):
        key = "room" if not isinstance(raw, list) else f"room[{i}]"
        rraw = reader.table(rraw, key)
        reader.keys(rraw, ROOM_KEYS, key)
        name = reader.text(
            rraw, "name", key, default="room" if len(raws) == 1 else f"room {i + 1}"
        )
        volume = reader.quantity(rraw, "volume", key, "volume", required=True, positive=True)
        vent = 0.0
        if "ventilation" in rraw:
            text = rraw["ventilation"]
            path = f"{key}.ventilation"
            try:
                try:
                    ach = units.parse_quantity(text, "rate", **reader.where(path))
                    vent = ach * (volume or 0.0)
                except InputError:
                    vent = units.parse_quantity(text, "flow", **reader.where(path))
                if vent < 0:
                    reader.error(
                        "a negative ventilation",
                        path,
                        expected="air changes such as '2 /h' or a flow such as "
                        "'300 m^3/h', zero or more",
                        found=repr(text),
                    )
            except InputError:
                reader.error(
                    "not a ventilation rate",
                    path,
                    expected="air changes such as '2 /h' or a flow such as '300 m^3/h'",
                    found=repr(text),
                )
        alarm = 19.5
        if "alarm" in rraw:
            a = rraw["alarm"]
            value = None
            if isinstance(a, str) and a.strip().endswith("%"):
                try:
                    value = float(a.strip()[:-1])
                except ValueError:
                    value = None
            elif isinstance(a, (int, float)) and not isinstance(a, bool):
                value = float(a)
            if value is None or not 0 < value < 20.9:
                reader.error(
                    "an alarm level outside 0..20.9 %",
                    f"{key}.alarm",
                    expected="an oxygen level such as '19 %' or 18.0",
                    found=repr(a),
                )
            else:
                alarm = value
        temperature = reader.quantity(
            rraw, "temperature", key, "temperature", default=293.15, positive=True
        )
        vessels = []
        for j, vraw in enumerate(reader.array(rraw.get("vessel"), f"{key}.vessel")):
            vkey = f"{key}.vessel[{j}]"
            vraw = reader.table(vraw, vkey)
            reader.keys(vraw, VESSEL_KEYS, vkey)
            cry = reader.required(vraw, "cryogen", vkey)
            cry = _known_cryogen(reader, cry, f"{vkey}.cryogen") if cry is not None else None
            liquid = reader.quantity(vraw, "liquid", vkey, "volume", required=True, positive=True)
            boiloff = None
            if "boiloff" in vraw:
                boiloff = reader.quantity(vraw, "boiloff", vkey, "flow", nonnegative=True)
            fail = None
            if "failure_release" in vraw:
                fail = reader.quantity(vraw, "failure_release", vkey, "flow", positive=True)
            quench = bool(vraw.get("quench", False))
            qt = reader.quantity(vraw, "quench_time", vkey, "time", default=30.0, positive=True)
            qf = reader.fraction(vraw, "quench_fraction", vkey, 1.0)
            vname = reader.text(vraw, "name", vkey, default=f"{cry} vessel {j + 1}")
            if cry is not None and liquid is not None:
                vessels.append(
                    Vessel(
                        vname,
                        cry,
                        liquid,
                        boiloff,
                        fail,
                        quench,
                        qt or 30.0,
                        qf,
                        vkey,
                        reader.lines.line_of(vkey),
                    )
                )
        include = bool(rraw.get("include_baths", i == 0))
        quench = bool(rraw.get("quench", False))
        qt = reader.quantity(rraw, "quench_time", key, "time", default=30.0, positive=True)
        qf = reader.fraction(rraw, "quench_fraction", key, 1.0)
        from ..physics.oxygen import DEFAULT_SUDDEN_MODEL, SUDDEN_RELEASE_MODELS

        model = rraw.get("sudden_model", DEFAULT_SUDDEN_MODEL)
        if model not in SUDDEN_RELEASE_MODELS:
            reader.errors.append(
                UnknownNameError(
                    "sudden-release model",
                    str(model),
                    list(SUDDEN_RELEASE_MODELS),
                    **reader.where(f"{key}.sudden_model"),
                )
            )
            model = DEFAULT_SUDDEN_MODEL
        if volume is not None:
            rooms.append(
                Room(
                    name,
                    volume,
                    vent,
                    alarm,
                    temperature or 293.15,
                    vessels,
                    include,
                    quench,
                    qt or 30.0,
                    qf,
                    key,
                    reader.lines.line_of(key),
                    model,
                )
            )
    return rooms


# --- entry points -----------------------------------------------------------------------


def read_text(path: str) -> str:
    try:
        with open(path, encoding="utf-8") as fh:
            return fh.read()
    except FileNotFoundError:
        raise InputError(
            "no such plan file",
            file=path,
            expected="an existing TOML file",
            found="nothing at that path",
        ) from None
    except (IsADirectoryError, PermissionError, UnicodeDecodeError) as exc:
        raise InputError(
            f"cannot read the plan file ({exc.__class__.__name__})", file=path
        ) from None


def parse_plan(text: str, path: str = "<plan>") -> Plan:
    """Validate a plan given as TOML text; every problem is collected and raised together."""
    try:
        data = _toml.loads(text)
    except _toml.TOMLDecodeError as exc:
        msg = str(exc)
        line = getattr(exc, "lineno", None)
        if line is None and "line " in msg:
            try:
                line = int(msg.split("line ")[1].split(",")[0].split(")")[0])
            except (ValueError, IndexError):
                line = None
        raise InputError(
            f"not valid TOML: {msg}",
            file=path,
            line=line,
            expected="TOML syntax",
            found="a syntax error",
        ) from None
    reader = _Reader(path, text)
    reader.keys(data, TOP_KEYS, "")
    title = data.get("title", os.path.splitext(os.path.basename(path))[0])
    if not isinstance(title, str):
        reader.error("not a title", "title", expected="a string", found=repr(title))
        title = str(title)
    ambient = reader.quantity(data, "ambient", "", "temperature", default=293.15, positive=True)
    if ambient is None:
        ambient = 293.15
    notes: list[str] = []
    stages = _stages(reader, data.get("stage"), ambient)
    stages.sort(key=lambda s: -s.temperature)
    cooldown = _cooldown(reader, data.get("cooldown"), stages, ambient, notes)
    if not reader.errors:
        _material_range_check(reader, stages, cooldown.start)
    baths = _baths(reader, data.get("bath"), stages)
    supplies = _supplies(reader, data.get("supply"))
    inserts = _inserts(reader, data.get("insert"), ambient)
    loads = _loads(reader, data.get("load"), stages)
    cooler = _cooler(reader, data.get("cooler"), stages)
    rooms = _rooms(reader, data.get("room"))
    margin = reader.table(data.get("margin", {}), "margin")
    reader.keys(margin, MARGIN_KEYS, "margin")
    mass_margin = reader.fraction(margin, "mass", "margin", 0.0, 0.0, 1.0)
    operation = reader.table(data.get("operation", {}), "operation")
    reader.keys(operation, OPERATION_KEYS, "operation")
    start_date = None
    if "start_date" in operation:
        value = operation["start_date"]
        if isinstance(value, _dt.datetime):
            start_date = value.date()
        elif isinstance(value, _dt.date):
            start_date = value
        else:
            try:
                start_date = _dt.date.fromisoformat(str(value))
            except ValueError:
                reader.error(
                    "not a date",
                    "operation.start_date",
                    expected="a date such as 2027-01-11",
                    found=repr(value),
                )
    days = operation.get("days", 30)
    if isinstance(days, bool) or not isinstance(days, (int, float)) or days <= 0:
        reader.error(
            "not a number of days",
            "operation.days",
            expected="a positive number of days",
            found=repr(days),
        )
        days = 30
    if reader.errors:
        if len(reader.errors) == 1:
            raise reader.errors[0]
        raise InputErrors(reader.errors)
    return Plan(
        path,
        title,
        ambient,
        stages,
        cooldown,
        baths,
        supplies,
        inserts,
        loads,
        cooler,
        rooms,
        mass_margin,
        start_date,
        float(days),
        notes,
        text,
    )


def load_plan(path) -> Plan:
    """Load and validate a plan file.

    Parameters
    ----------
    path : str or path-like
        A TOML plan file.

    Returns
    -------
    Plan
        Validated, in SI floats.

    Raises
    ------
    InputError, InputErrors
        Each problem names the file, the line, the key, what was expected and what was found.
    """
    path = os.fspath(path)
    return parse_plan(read_text(path), path)


def demo_plan_path() -> str:
    """The bundled demo plan (installed package or source checkout)."""
    return os.path.join(examples_dir(), "demo-magnet-bath.toml")


def examples_dir() -> str:
    from ..resources import bundled

    folder = bundled("examples")
    if folder is not None:
        return str(folder)
    raise CryoplanError("the bundled examples are missing from this installation")
