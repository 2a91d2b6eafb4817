"""The cryogens of a plan: the ``[cooldown]`` and its steps, the ``[[bath]]`` tables, the
``[[supply]]`` tables and the ``[[insert]]`` tables.

Every cryogen's name goes through the data layer's one resolver
(:func:`cryoplan.data.fluids.canonical_name`, by way of :meth:`_Reader.cryogen`), so that any
name or alias :func:`cryoplan.cryogen` accepts is accepted here. Each entry is read on its
own: a mistake in one is recorded and the next is read.
"""

from __future__ import annotations

from .. import units
from ..errors import InputError
from .located import _Reader, shown
from .schema import (
    BATH_KEYS,
    BOILING_POINT_SNAP_K,
    COOLDOWN_KEYS,
    INSERT_KEYS,
    MAX_TIMES,
    STEP_KEYS,
    SUPPLY_KEYS,
    Bath,
    Cooldown,
    Insert,
    Stage,
    Step,
    Supply,
)


def read_cooldown(
    reader: _Reader, raw, stages: list[Stage], ambient: float, plan_notes: list[str]
) -> tuple[Cooldown, bool]:
    """The cooldown, and whether its start was read without a mistake."""
    raw = reader.table(raw if raw is not None else {}, "cooldown")
    reader.keys(raw, COOLDOWN_KEYS, "cooldown")
    n_errors = len(reader.errors)
    start = reader.quantity(raw, "start", "cooldown", "temperature", default=ambient)
    start_ok = len(reader.errors) == n_errors
    steps: list[Step] = []
    part_temps = [p.start if p.start is not None else start for s in stages for p in s.parts]
    previous = max(part_temps, default=start)
    for i, sraw in enumerate(reader.array(raw.get("steps"), "cooldown.steps")):
        step = _step(reader, sraw, i, previous, plan_notes)
        if step is not None:
            previous = step.to
            steps.append(step)
    return Cooldown(start if start is not None else ambient, steps), start_ok


def _step(reader: _Reader, sraw, i: int, previous: float, plan_notes) -> Step | None:
    key = f"cooldown.steps[{i}]"
    sraw = reader.table(sraw, key)
    reader.keys(sraw, STEP_KEYS, key)
    cry = reader.required(sraw, "cryogen", key)
    cry = reader.cryogen(cry, f"{key}.cryogen") if cry is not None else None
    to = reader.quantity(sraw, "to", key, "temperature", required=True)
    pressure = reader.quantity(sraw, "pressure", key, "pressure", default=101325.0, positive=True)
    gas_use = reader.fraction(sraw, "gas_use", key, 0.0)
    low, high = gas_use, gas_use
    if "gas_use_range" in sraw:
        rng = sraw["gas_use_range"]
        at = f"{key}.gas_use_range"
        if not (isinstance(rng, list) and len(rng) == 2):
            reader.error(
                "not a range",
                at,
                expected="two numbers [low, high] in 0..1",
                found=shown(rng),
            )
        else:
            ends = {"gas_use_range[0]": rng[0], "gas_use_range[1]": rng[1]}
            low = reader.fraction(ends, "gas_use_range[0]", key, gas_use, at=at)
            high = reader.fraction(ends, "gas_use_range[1]", key, gas_use, at=at)
            if not low <= gas_use <= high:
                reader.error(
                    "gas_use lies outside its range",
                    at,
                    expected=f"low <= {gas_use:g} <= high",
                    found=shown(rng),
                )
    loss = reader.fraction(sraw, "transfer_loss", key, None, 0.0, 0.95)
    if cry is None or to is None or pressure is None:
        return None
    written = to
    note = ""
    tb = reader.boiling_point(cry, pressure, f"{key}.pressure")
    if tb is None:
        return None
    if to < tb - BOILING_POINT_SNAP_K:
        reader.error(
            f"{cry} boils at {tb:.2f} K at {pressure / 1000:.4g} kPa; a {cry} step cannot "
            "cool below that",
            f"{key}.to",
            expected=f"'to' at or above {tb:.2f} K (or a lower bath pressure)",
            found=shown(sraw["to"]),
        )
        return None
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
            found=shown(sraw["to"]),
        )
        return None
    return Step(
        cry, to, gas_use, low, high, pressure, loss, written, note, key, reader.lines.line_of(key)
    )


def read_baths(
    reader: _Reader, raw_list, stages: list[Stage], stage_names: list[str]
) -> tuple[list[Bath], set[str]]:
    """The valid baths, and the stages every bath written names (valid or not), so that a
    load needing a bath is not refused again for a bath with a mistake of its own;
    ``stage_names`` are every stage written, valid or not."""
    baths = []
    named = set()
    for i, raw in enumerate(reader.array(raw_list, "bath")):
        if isinstance(raw, dict) and isinstance(raw.get("stage"), str):
            named.add(raw["stage"].strip())
        bath = _bath(reader, raw, i, {s.name: s for s in stages}, stage_names)
        if bath is not None:
            baths.append(bath)
    return baths, named


def _bath(reader: _Reader, raw, i: int, names: dict[str, Stage], stage_names) -> Bath | None:
    key = f"bath[{i}]"
    raw = reader.table(raw, key)
    reader.keys(raw, BATH_KEYS, key)
    cry = reader.required(raw, "cryogen", key)
    cry = reader.cryogen(cry, f"{key}.cryogen") if cry is not None else None
    volume = reader.quantity(raw, "volume", key, "volume", required=True, positive=True)
    stage = reader.text(raw, "stage", key, required=True)
    pressure = reader.quantity(raw, "pressure", key, "pressure", default=101325.0, positive=True)
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
                    found=shown(value),
                )
    loss = reader.fraction(raw, "transfer_loss", key, None, 0.0, 0.95)
    if stage is not None and stage not in stage_names:
        reader.unknown("stage", stage, list(stage_names), f"{key}.stage")
        return None
    if None in (cry, volume, stage, pressure) or stage not in names:
        return None  # the stage's own mistake is reported at the stage
    tb = reader.boiling_point(cry, pressure, f"{key}.pressure")
    if tb is None:
        return None
    st = names[stage].temperature
    if st < tb - BOILING_POINT_SNAP_K:
        reader.error(
            f"a {cry} bath at {pressure / 1000:.4g} kPa holds {tb:.2f} K, not the stage's "
            f"{st:g} K",
            f"{key}.stage",
            expected=f"a stage at or above {tb:.2f} K, or a lower bath pressure",
            found=repr(stage),
        )
        return None
    name = reader.text(raw, "name", key, default=f"{cry} bath")
    return Bath(name, cry, volume, stage, pressure, refill, loss, key, reader.lines.line_of(key))


def read_supplies(reader: _Reader, raw_list) -> dict[str, Supply]:
    supplies: dict[str, Supply] = {}
    for i, raw in enumerate(reader.array(raw_list, "supply")):
        supply = _supply(reader, raw, i)
        if supply is None:
            continue
        if supply.cryogen in supplies:
            reader.error(
                "a second supply of the same cryogen",
                f"{supply.key}.cryogen",
                expected="one [[supply]] per cryogen",
                found=repr(supply.cryogen),
            )
            continue
        supplies[supply.cryogen] = supply
    return supplies


def _supply(reader: _Reader, raw, i: int) -> Supply | None:
    key = f"supply[{i}]"
    raw = reader.table(raw, key)
    reader.keys(raw, SUPPLY_KEYS, key)
    cry = reader.required(raw, "cryogen", key)
    cry = reader.cryogen(cry, f"{key}.cryogen") if cry is not None else None
    dewars = []
    for j, d in enumerate(reader.array(raw.get("dewars", []), f"{key}.dewars")):
        name = f"dewars[{j}]"
        v = reader.quantity({name: d}, name, key, "volume", positive=True, at=f"{key}.dewars")
        if v is not None:
            dewars.append(v)
    price, currency = None, ""
    if "price" in raw:
        try:
            price, currency, _ = units.parse_price(raw["price"], **reader.where(f"{key}.price"))
        except InputError as exc:
            reader.errors.append(exc)
    heel = reader.quantity(raw, "heel", key, "volume", default=0.0, nonnegative=True)
    if dewars and heel is not None and heel >= min(dewars):
        reader.error(
            "the heel is as large as the smallest dewar",
            f"{key}.heel",
            expected=f"less than {min(dewars) * 1000:g} L",
            found=shown(raw["heel"]),
        )
    loss = reader.fraction(raw, "transfer_loss", key, None, 0.0, 0.95)
    liq = None
    if "liquefier_energy" in raw:
        liq = reader.quantity(raw, "liquefier_energy", key, "energy per volume", positive=True)
    if cry is None:
        return None
    return Supply(cry, sorted(dewars), price, currency, heel or 0.0, loss, liq, key)


def read_inserts(reader: _Reader, raw_list, ambient: float) -> list[Insert]:
    inserts = []
    for i, raw in enumerate(reader.array(raw_list, "insert")):
        key = f"insert[{i}]"
        raw = reader.table(raw, key)
        reader.keys(raw, INSERT_KEYS, key)
        name = reader.text(raw, "name", key, default=f"insert {i + 1}")
        mat = reader.required(raw, "material", key)
        mat_id = reader.material(mat, f"{key}.material") if mat is not None else None
        mass = reader.quantity(raw, "mass", key, "mass", required=True, positive=True)
        into = reader.required(raw, "into", key)
        into = reader.cryogen(into, f"{key}.into") if into is not None else None
        start = reader.quantity(raw, "start", key, "temperature", default=ambient)
        times = reader.count(raw, "times", key, 1, high=MAX_TIMES, what="dips")
        gas_use = reader.fraction(raw, "gas_use", key, 0.0)
        if None not in (mat_id, mass, into, start):
            inserts.append(
                Insert(
                    name, mat_id, mass, into, start, times, gas_use, key, reader.lines.line_of(key)
                )
            )
    return inserts
