"""The plan's schema: typed dataclasses, the keys each table allows, and the documented
defaults and bounds the reader applies.

Every value in these dataclasses is a plain SI float (or a plain name, count or flag): the
reader (:mod:`cryoplan.plan.reader`) converts the user's quantities once, and the
evaluation reads only these objects, never the TOML text.
"""

from __future__ import annotations

import datetime as _dt
from dataclasses import dataclass, field
from typing import Any

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


# --- bounds of counts and spans ----------------------------------------------------------
# Sanity bounds, not physics: a plan that goes beyond them is almost surely a typo (an extra
# zero, a number pasted into the wrong key), and the algorithms behind them would spend
# time and memory on it for nothing.

#: Identical items of one part, support, wire, lead or link (a box of screws, a loom of
#: wires): a hundred thousand is beyond any cryostat's count of one thing.
MAX_COUNT = 100_000

#: Times an insert is dipped into its bath within one plan.
MAX_TIMES = 1_000

#: Layers of one multilayer-insulation blanket (common practice: 10 to 80 layers; beyond a
#: few hundred the blanket's own conduction outweighs any gain).
MAX_LAYERS = 500

#: Days of operation the plan's calendar covers (ten years).
MAX_DAYS = 3660
