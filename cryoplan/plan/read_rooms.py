"""The rooms of a plan: each ``[room]`` (or ``[[room]]``) with its ventilation, oxygen alarm,
quench case and the ``[[room.vessel]]`` tables of liquid kept in it.

Each room and each vessel is read on its own: a mistake in one is recorded and the next is
read. Flags (``quench``, ``include_baths``) must be TOML's ``true`` or ``false``: the
string ``"false"`` is refused rather than read as a quench.
"""

from __future__ import annotations

from .. import units
from ..errors import InputError
from .located import _Reader, shown
from .schema import ROOM_KEYS, VESSEL_KEYS, Room, Vessel

#: The oxygen alarm when the plan gives none (percent by volume; common practice: 19.5 %,
#: the oxygen-deficiency threshold of US OSHA 29 CFR 1910.134).
DEFAULT_ALARM = 19.5

#: Oxygen in fresh dry air (percent by volume; from memory: 20.95 %, written 20.9).
FRESH_AIR_OXYGEN = 20.9

#: The room's temperature when the plan gives none (20 degC).
DEFAULT_ROOM_TEMPERATURE = 293.15

#: A quench's release time when the plan gives none (s; common practice for a magnet).
DEFAULT_QUENCH_TIME = 30.0


def read_rooms(reader: _Reader, raw) -> list[Room]:
    if raw is None:
        return []
    raws = raw if isinstance(raw, list) else [raw]
    rooms = []
    for i, rraw in enumerate(raws):
        key = "room" if not isinstance(raw, list) else f"room[{i}]"
        room = _room(reader, rraw, key, i, len(raws))
        if room is not None:
            rooms.append(room)
    return rooms


def _room(reader: _Reader, rraw, key: str, i: int, n_rooms: int) -> Room | None:
    from ..physics.oxygen import DEFAULT_SUDDEN_MODEL, SUDDEN_RELEASE_MODELS

    rraw = reader.table(rraw, key)
    reader.keys(rraw, ROOM_KEYS, key)
    name = reader.text(rraw, "name", key, default="room" if n_rooms == 1 else f"room {i + 1}")
    volume = reader.quantity(rraw, "volume", key, "volume", required=True, positive=True)
    vent = _ventilation(reader, rraw, key, volume)
    alarm = _alarm(reader, rraw, key)
    temperature = reader.quantity(
        rraw, "temperature", key, "temperature", default=DEFAULT_ROOM_TEMPERATURE, positive=True
    )
    vessels = []
    for j, vraw in enumerate(reader.array(rraw.get("vessel"), f"{key}.vessel")):
        vessel = _vessel(reader, vraw, f"{key}.vessel[{j}]", j)
        if vessel is not None:
            vessels.append(vessel)
    include = reader.flag(rraw, "include_baths", key, i == 0)
    quench = reader.flag(rraw, "quench", key, False)
    qt = reader.quantity(
        rraw, "quench_time", key, "time", default=DEFAULT_QUENCH_TIME, positive=True
    )
    qf = reader.fraction(rraw, "quench_fraction", key, 1.0)
    model = reader.choice(
        rraw,
        "sudden_model",
        key,
        list(SUDDEN_RELEASE_MODELS),
        DEFAULT_SUDDEN_MODEL,
        "sudden-release model",
    )
    if volume is None:
        return None
    return Room(
        name,
        volume,
        vent,
        alarm,
        temperature or DEFAULT_ROOM_TEMPERATURE,
        vessels,
        include,
        quench,
        qt or DEFAULT_QUENCH_TIME,
        qf,
        key,
        reader.lines.line_of(key),
        model,
    )


def _ventilation(reader: _Reader, rraw: dict, key: str, volume: float | None) -> float:
    """Fresh air in m^3/s, from air changes ('2 /h') or a flow ('300 m^3/h')."""
    if "ventilation" not in rraw:
        return 0.0
    text = rraw["ventilation"]
    path = f"{key}.ventilation"
    expected = "air changes such as '2 /h' or a flow such as '300 m^3/h'"
    try:
        try:
            vent = units.parse_quantity(text, "rate", **reader.where(path)) * (volume or 0.0)
        except InputError:
            vent = units.parse_quantity(text, "flow", **reader.where(path))
    except InputError:
        reader.error("not a ventilation rate", path, expected=expected, found=shown(text))
        return 0.0
    if not vent >= 0 or vent == float("inf"):
        reader.error(
            "a negative or endless ventilation",
            path,
            expected=expected + ", zero or more and finite",
            found=shown(text),
        )
        return 0.0
    return vent


def _alarm(reader: _Reader, rraw: dict, key: str) -> float:
    """The oxygen alarm in percent: '19 %' or 19.0, within (0, 20.9)."""
    if "alarm" not in rraw:
        return DEFAULT_ALARM
    a = rraw["alarm"]
    value = None
    if isinstance(a, str) and a.strip().endswith("%"):
        try:
            value = float(a.strip()[:-1])
        except ValueError:
            value = None
    elif isinstance(a, (int, float)) and not isinstance(a, bool):
        value = float(a)
    if value is None or not 0 < value < FRESH_AIR_OXYGEN:
        reader.error(
            f"an alarm level outside 0..{FRESH_AIR_OXYGEN} %",
            f"{key}.alarm",
            expected="an oxygen level such as '19 %' or 18.0",
            found=shown(a),
        )
        return DEFAULT_ALARM
    return value


def _vessel(reader: _Reader, vraw, vkey: str, j: int) -> Vessel | None:
    vraw = reader.table(vraw, vkey)
    reader.keys(vraw, VESSEL_KEYS, vkey)
    cry = reader.required(vraw, "cryogen", vkey)
    cry = reader.cryogen(cry, f"{vkey}.cryogen") if cry is not None else None
    liquid = reader.quantity(vraw, "liquid", vkey, "volume", required=True, positive=True)
    boiloff = None
    if "boiloff" in vraw:
        boiloff = reader.quantity(vraw, "boiloff", vkey, "flow", nonnegative=True)
    fail = None
    if "failure_release" in vraw:
        fail = reader.quantity(vraw, "failure_release", vkey, "flow", positive=True)
    quench = reader.flag(vraw, "quench", vkey, False)
    qt = reader.quantity(
        vraw, "quench_time", vkey, "time", default=DEFAULT_QUENCH_TIME, positive=True
    )
    qf = reader.fraction(vraw, "quench_fraction", vkey, 1.0)
    vname = reader.text(vraw, "name", vkey, default=f"{cry} vessel {j + 1}")
    if cry is None or liquid is None:
        return None
    return Vessel(
        vname,
        cry,
        liquid,
        boiloff,
        fail,
        quench,
        qt or DEFAULT_QUENCH_TIME,
        qf,
        vkey,
        reader.lines.line_of(vkey),
    )
