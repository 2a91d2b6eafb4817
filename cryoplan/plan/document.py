"""The plan as an editable, style-preserving TOML document, with undo, redo and safe saving.

Used by the dashboard (:mod:`cryoplan.tui`), which shows its rows and sends it edits; it
needs no dashboard to work and is tested on its own.

The dashboard never rewrites a plan from scratch: it edits a :mod:`tomlkit` document of
the file, so the user's comments, blank lines and key order survive a save. Every edit is
checked twice before it is kept: the field's own value at once (units, dimension, sign),
then the whole plan by :func:`cryoplan.plan.parse_plan`; an edit that fails either is
refused with the reason, and the last good value stays in force.

Saving goes through the one safe save, :func:`cryoplan.files.write_file`: a temporary file
in the plan's folder renamed over the plan, the previous versions kept as ``PLAN.bak``,
``PLAN.bak.1``, ``PLAN.bak.2``, a symbolic link followed; a file that changed on disk since
it was opened (or last saved) is not overwritten unless the caller says so.
"""

from __future__ import annotations

import hashlib
import os
from collections.abc import Callable
from dataclasses import dataclass, field
from typing import Any

import tomlkit

from ..errors import CryoplanError, InputError, InputErrors
from ..files import PLAN_BACKUPS, backup_path, resolve_target, write_file
from .reader import parse_plan, read_text

#: Kinds of field and the dimension their value is checked against.
FIELD_KINDS = ("name", "material", "mass", "temperature", "start")


class EditRejected(CryoplanError):
    """An edit that was refused; ``reason`` says why in a few plain words."""

    def __init__(self, reason: str) -> None:
        self.reason = reason
        super().__init__(reason)


class DiskChanged(CryoplanError):
    """The plan file changed on disk since it was opened or last saved."""


def reason_of(exc: Exception) -> str:
    """A short reason for a refused edit, without the file name of a full message.

    >>> reason_of(InputError("unknown unit 'kgs'", expected="a mass", found="'10 kgs'"))
    "unknown unit 'kgs'; expected a mass"
    """
    if isinstance(exc, InputErrors) and exc.errors:
        exc = exc.errors[0]
    if isinstance(exc, InputError):
        text = exc.message
        if exc.expected:
            text += f"; expected {exc.expected}"
        return text
    return str(exc)


def check_value(kind: str, text: str) -> str:
    """Check one field's new value on its own; returns the value to write (stripped).

    Raises :class:`EditRejected` with the reason when the value cannot be right whatever
    the rest of the plan says.

    >>> check_value("mass", " 300 g ")
    '300 g'
    >>> check_value("mass", "10 kgs")
    Traceback (most recent call last):
    ...
    cryoplan.plan.document.EditRejected: unknown unit 'kgs'; expected a mass such as '22 kg' or '500 g'
    """
    from .. import units

    value = text.strip()
    if kind == "start" and not value:
        return ""  # no start of its own: the part starts at the cooldown's start
    if not value:
        raise EditRejected("empty; type a value")
    try:
        if kind == "mass":
            if units.parse_quantity(value, "mass") <= 0:
                raise EditRejected("a mass must be above zero; expected a mass such as '22 kg'")
        elif kind in ("temperature", "start"):
            if units.parse_temperature(value) <= 0:
                raise EditRejected("a temperature must be above 0 K")
        elif kind == "volume":
            if units.parse_quantity(value, "volume") <= 0:
                raise EditRejected(
                    "a volume must be above zero; expected a volume such as '100 L'"
                )
        elif kind == "volumes":
            sizes = [v.strip() for v in value.split(",") if v.strip()]
            if not sizes:
                raise EditRejected("no sizes; expected sizes such as '100 L, 250 L'")
            for v in sizes:
                if units.parse_quantity(v, "volume") <= 0:
                    raise EditRejected(f"a size that is not above zero: {v!r}")
            return ", ".join(sizes)
        elif kind == "refill":
            if value.endswith("%"):
                units.parse_fraction(value)
            elif units.parse_quantity(value, "volume") < 0:
                raise EditRejected(
                    "a negative volume; expected a volume such as '20 L' or a share such as '25 %'"
                )
        elif kind == "fraction":
            units.parse_fraction(_number(value))
        elif kind == "price":
            units.parse_price(value)
    except InputError as exc:
        raise EditRejected(reason_of(exc)) from None
    return value


def _number(text: str):
    """'0.4' -> 0.4 and '40 %' stays a percentage string; anything else is left as is."""
    text = text.strip()
    if text.endswith("%"):
        return text
    try:
        return float(text)
    except ValueError:
        return text


@dataclass
class PartRow:
    """One part as written in the file (raw strings), by its place in the file."""

    stage: int
    index: int
    name: str
    material: str
    mass: str  # as written; "" when the part gives a volume or dimensions instead
    start: str  # as written; "" when the part starts at the cooldown's start
    count: int
    how: str  # "mass", "volume" or "dimensions"


@dataclass
class StageRow:
    """One stage as written in the file, by its place in the file."""

    index: int
    name: str
    temperature: str
    parts: list[PartRow] = field(default_factory=list)


@dataclass
class SettingRow:
    """One setting of the plan outside the cold mass: a cooldown step, a bath, a supply."""

    key: str  # dotted key, as in the plan's messages: "cooldown.steps[0].to"
    path: tuple  # the way into the document: ("cooldown", "steps", 0, "to")
    label: str
    value: str  # as written (numbers as text, lists joined with ", ")
    kind: str  # a kind of check_value


def _written(value: Any) -> str:
    value = _plain(value)
    if isinstance(value, list):
        return ", ".join(str(v) for v in value)
    return "" if value is None else str(value)


def _plain(value: Any) -> Any:
    """A tomlkit item as a plain Python value."""
    return value.unwrap() if hasattr(value, "unwrap") else value


def _signature(path: str) -> str | None:
    try:
        with open(path, "rb") as fh:
            return hashlib.sha256(fh.read()).hexdigest()
    except OSError:
        return None


def _inline_table(values: dict[str, str]):
    """An inline table written the way the examples write them: ``{ key = "v", ... }``."""
    body = ", ".join(f"{k} = {tomlkit.item(v).as_string()}" for k, v in values.items())
    return tomlkit.parse(f"x = {{ {body} }}")["x"]


class PlanDocument:
    """A plan file open for editing.

    Parameters
    ----------
    path : str
        The plan file.
    text : str
        Its text (read by :meth:`open`).
    validate : callable, optional
        ``validate(text, path)`` returns the validated plan or raises
        :class:`~cryoplan.errors.InputError` / :class:`~cryoplan.errors.InputErrors`;
        default :func:`cryoplan.plan.parse_plan`.
    """

    def __init__(self, path: str, text: str, validate: Callable | None = None) -> None:
        self.path = path
        self.doc = tomlkit.parse(text)
        self._text = text
        self.saved_text = text
        self.disk_signature = hashlib.sha256(text.encode()).hexdigest()
        self._undo: list[str] = []
        self._redo: list[str] = []
        self._validate = validate

    @classmethod
    def open(cls, path: str, validate: Callable | None = None) -> PlanDocument:
        text = read_text(path)
        try:
            document = cls(path, text, validate)
        except tomlkit.exceptions.ParseError as exc:
            raise InputError(
                f"not valid TOML: {exc}",
                file=path,
                line=getattr(exc, "line", None),
                expected="TOML syntax",
                found="a syntax error",
            ) from None
        except RecursionError:
            raise InputError(
                "arrays or tables nested too deep to edit",
                file=path,
                expected="a plan with a few levels of brackets",
                found="more than the editor can follow",
            ) from None
        with open(path, "rb") as fh:
            document.disk_signature = hashlib.sha256(fh.read()).hexdigest()
        return document

    # --- reading ------------------------------------------------------------------------

    @property
    def text(self) -> str:
        """The plan's text now (kept in step with every edit, undo and redo)."""
        return self._text

    def _set(self, text: str, doc=None) -> None:
        self.doc = tomlkit.parse(text) if doc is None else doc
        self._text = text

    @property
    def dirty(self) -> bool:
        """True when there are edits not yet saved."""
        return self.text != self.saved_text

    def validate(self, text: str | None = None):
        """The validated plan of ``text`` (default: the current text)."""
        if self._validate is None:
            self._validate = parse_plan
        return self._validate(self.text if text is None else text, self.path)

    def stages(self) -> list[StageRow]:
        """The stages and parts as written, in file order."""
        rows = []
        for i, st in enumerate(self._stage_list()):
            row = StageRow(
                i,
                str(_plain(st.get("name", f"stage {i + 1}"))),
                str(_plain(st.get("temperature", ""))),
            )
            for j, p in enumerate(self._parts(st)):
                how = next((k for k in ("mass", "volume", "dimensions") if k in p), "mass")
                count = _plain(p.get("count", 1))
                row.parts.append(
                    PartRow(
                        i,
                        j,
                        str(_plain(p.get("name", f"part {j + 1}"))),
                        str(_plain(p.get("material", ""))),
                        str(_plain(p.get("mass", ""))),
                        str(_plain(p.get("start", ""))),
                        count if isinstance(count, int) else 1,
                        how,
                    )
                )
            rows.append(row)
        return rows

    def cooldown_start(self) -> str:
        cooldown = self.doc.get("cooldown") or {}
        return str(_plain(cooldown.get("start", self.doc.get("ambient", "293.15 K"))))

    def settings(self) -> list[SettingRow]:
        """The cooldown, bath and supply settings the dashboard edits, as written."""
        rows: list[SettingRow] = []
        cooldown = self.doc.get("cooldown") or {}
        rows.append(
            SettingRow(
                "cooldown.start",
                ("cooldown", "start"),
                "cooldown start",
                self.cooldown_start(),
                "temperature",
            )
        )
        steps = cooldown.get("steps") if isinstance(cooldown, dict) else None
        for i, step in enumerate(steps if isinstance(steps, list) else []):
            cry = _written(step.get("cryogen", "?"))
            if "to" in step:
                rows.append(
                    SettingRow(
                        f"cooldown.steps[{i}].to",
                        ("cooldown", "steps", i, "to"),
                        f"step {i + 1} ({cry}): to",
                        _written(step["to"]),
                        "temperature",
                    )
                )
            rows.append(
                SettingRow(
                    f"cooldown.steps[{i}].gas_use",
                    ("cooldown", "steps", i, "gas_use"),
                    f"step {i + 1} ({cry}): gas_use",
                    _written(step.get("gas_use", 0)),
                    "fraction",
                )
            )
        for i, bath in enumerate(self._array("bath")):
            name = _written(bath.get("name", bath.get("cryogen", f"bath {i + 1}")))
            if "volume" in bath:
                rows.append(
                    SettingRow(
                        f"bath[{i}].volume",
                        ("bath", i, "volume"),
                        f"bath {name}: volume",
                        _written(bath["volume"]),
                        "volume",
                    )
                )
            if "refill_at" in bath:
                rows.append(
                    SettingRow(
                        f"bath[{i}].refill_at",
                        ("bath", i, "refill_at"),
                        f"bath {name}: refill at",
                        _written(bath["refill_at"]),
                        "refill",
                    )
                )
        for i, supply in enumerate(self._array("supply")):
            cry = _written(supply.get("cryogen", f"supply {i + 1}"))
            if "dewars" in supply:
                rows.append(
                    SettingRow(
                        f"supply[{i}].dewars",
                        ("supply", i, "dewars"),
                        f"{cry} dewars",
                        _written(supply["dewars"]),
                        "volumes",
                    )
                )
            if "price" in supply:
                rows.append(
                    SettingRow(
                        f"supply[{i}].price",
                        ("supply", i, "price"),
                        f"{cry} price",
                        _written(supply["price"]),
                        "price",
                    )
                )
        return rows

    def set_setting(self, row: SettingRow, text: str):
        """Set one of :meth:`settings` (the same key and kind)."""
        value = check_value(row.kind, text)

        def mutate(doc):
            node = doc
            for step in row.path[:-1]:
                if isinstance(step, str) and step not in node:
                    node[step] = tomlkit.table()  # [cooldown] for its start
                node = node[step]
            last = row.path[-1]
            if row.kind == "fraction":
                number = _number(value)
                node[last] = number if isinstance(number, float) else value
            elif row.kind == "volumes":
                node[last] = [v.strip() for v in value.split(",")]
            else:
                node[last] = value

        return self._change(mutate)

    def _array(self, name: str) -> list:
        """An array of tables ([[bath]], [[supply]]); nothing for anything else."""
        value = self.doc.get(name)
        return value if isinstance(value, list) else []

    def _stage_list(self):
        stages = self.doc.get("stage")
        if stages is None:
            return []
        return stages if isinstance(stages, list) else [stages]

    @staticmethod
    def _parts(stage):
        parts = stage.get("parts")
        return parts if isinstance(parts, list) else []

    # --- editing ------------------------------------------------------------------------

    def _change(self, mutate: Callable[[Any], None]):
        """Apply ``mutate`` to a copy of the document, validate the whole plan, keep it.

        Returns the validated plan; raises :class:`EditRejected` and leaves the document
        as it was when the plan does not validate.
        """
        before = self.text
        try:
            mutate(self.doc)  # in place; put back from ``before`` when refused
            after = self.doc.as_string()
            if after == before:
                raise EditRejected("no change")
            plan = self.validate(after)
        except (InputError, InputErrors) as exc:
            self._set(before)
            raise EditRejected(reason_of(exc)) from None
        except EditRejected:
            self._set(before)
            raise
        except (KeyError, IndexError, TypeError, ValueError) as exc:
            self._set(before)
            raise EditRejected(f"cannot change this part of the file ({exc})") from None
        self._text = after
        self._undo.append(before)
        self._redo.clear()
        return plan

    def _stage(self, doc, i: int):
        stages = doc.get("stage")
        stages = stages if isinstance(stages, list) else [stages]
        return stages[i]

    def set_stage_field(self, stage: int, key: str, text: str):
        """Set a stage's ``name`` or ``temperature``; a renamed stage is renamed where
        the plan refers to it (baths, loads, cooler stages and links, rooms)."""
        kind = "name" if key == "name" else "temperature"
        value = check_value(kind, text)
        if key == "name":
            names = [s.name for s in self.stages()]
            old = names[stage]
            if value in names and value != old:
                raise EditRejected(f"a stage is already called {value!r}; names must differ")

        def mutate(doc):
            self._stage(doc, stage)[key] = value
            if key == "name":
                _rename_stage(doc, old, value)

        return self._change(mutate)

    def set_part_field(self, stage: int, part: int, key: str, text: str):
        """Set a part's ``name``, ``material``, ``mass`` or ``start``.

        A mass replaces a volume or dimensions the part had; an empty start removes the
        part's own start (it then starts at the cooldown's start).
        """
        kind = {"name": "name", "material": "material", "mass": "mass", "start": "start"}[key]
        value = check_value(kind, text)

        def mutate(doc):
            p = self._parts(self._stage(doc, stage))[part]
            if key == "start" and not value:
                if "start" in p:
                    del p["start"]
                return
            if key == "mass":
                for other in ("volume", "dimensions", "shape"):
                    if other in p:
                        del p[other]
            p[key] = value

        return self._change(mutate)

    def add_part(self, stage: int, material: str, name: str | None = None, mass: str = "1 kg"):
        """Add a part to a stage (after its last part)."""
        taken = {p.name for s in self.stages() for p in s.parts}
        base = name or "new part"
        name, n = base, 2
        while name in taken:
            name, n = f"{base} {n}", n + 1

        def mutate(doc):
            st = self._stage(doc, stage)
            parts = st.get("parts")
            values = {"name": name, "material": material, "mass": mass}
            if parts is None:
                st["parts"] = tomlkit.parse("parts = [\n]\n")["parts"]
                parts = st["parts"]
            if isinstance(parts, tomlkit.items.AoT):
                table = tomlkit.table()
                table.update(values)
                parts.append(table)
            else:
                parts.append(_inline_table(values))

        return self._change(mutate)

    def add_stage(self, name: str | None = None, temperature: str | None = None):
        """Add a stage (after the last), colder than the coldest, with no parts yet."""
        rows = self.stages()
        names = {s.name for s in rows}
        base = name or "new stage"
        name, n = base, 2
        while name in names:
            name, n = f"{base} {n}", n + 1
        if temperature is None:
            temperature = "4.2 K"
        snippet = tomlkit.parse(
            f"[[stage]]\nname = {tomlkit.item(name).as_string()}\n"
            f"temperature = {tomlkit.item(temperature).as_string()}\nparts = [\n]\n\n"
        )["stage"][0]

        def mutate(doc):
            stages = doc.get("stage")
            if stages is None:
                doc["stage"] = tomlkit.aot()
                stages = doc["stage"]
            stages.append(snippet)

        return self._change(mutate)

    def remove_part(self, stage: int, part: int):
        def mutate(doc):
            del self._parts(self._stage(doc, stage))[part]

        return self._change(mutate)

    def remove_stage(self, stage: int):
        name = self.stages()[stage].name
        rows = self.stages()
        if len(rows) <= 1:
            raise EditRejected("a plan needs at least one stage")
        del name

        def mutate(doc):
            stages = doc.get("stage")
            del stages[stage]

        return self._change(mutate)

    # --- undo and redo ------------------------------------------------------------------

    @property
    def can_undo(self) -> bool:
        return bool(self._undo)

    @property
    def can_redo(self) -> bool:
        return bool(self._redo)

    def undo(self) -> bool:
        """Go back one edit; False when there is none."""
        if not self._undo:
            return False
        self._redo.append(self.text)
        self._set(self._undo.pop())
        return True

    def redo(self) -> bool:
        """Do again the edit last undone; False when there is none."""
        if not self._redo:
            return False
        self._undo.append(self.text)
        self._set(self._redo.pop())
        return True

    # --- saving -------------------------------------------------------------------------

    def changed_on_disk(self) -> bool:
        """True when the file on disk is not what was opened or last saved (a file that
        was removed counts as unchanged: writing it loses nothing)."""
        now = _signature(self.path)
        return now is not None and now != self.disk_signature

    def backup_path(self, path: str | None = None) -> str:
        """The newest backup of the plan (beside the file a symbolic link points to)."""
        return backup_path(resolve_target(path or self.path))

    def save(self, path: str | None = None, *, overwrite: bool = False) -> str:
        """Write the plan with :func:`cryoplan.files.write_file`: the previous versions are
        kept as ``.bak``, ``.bak.1``, ``.bak.2``; a plan that is a symbolic link saves the
        file it points to. Returns the path written.

        Raises :class:`DiskChanged` when the file changed on disk since it was opened
        (unless ``overwrite``), and :class:`~cryoplan.errors.InputError` when the file
        cannot be written.
        """
        target = os.path.abspath(path or self.path)
        same = os.path.abspath(self.path) == target
        if same and not overwrite and self.changed_on_disk():
            raise DiskChanged(f"{self.path} changed on disk since it was opened")
        text = self.text
        write_file(target, text, backups=PLAN_BACKUPS, what="the plan")
        self.path = target if not same else self.path
        self.saved_text = text
        self.disk_signature = hashlib.sha256(text.encode()).hexdigest()
        return target


#: Keys that name a stage, by table: (array of tables, key) and nested arrays.
def _rename_stage(doc, old: str, new: str) -> None:
    """Rename references to a stage where the plan's schema allows them."""

    def each(name):
        value = doc.get(name)
        if value is None:
            return []
        return value if isinstance(value, list) else [value]

    for bath in each("bath"):
        if _plain(bath.get("stage")) == old:
            bath["stage"] = new
    for load in each("load"):
        for key in ("stage", "from"):
            if _plain(load.get(key)) == old:
                load[key] = new
        via = load.get("via")
        if isinstance(via, list):
            for k, v in enumerate(list(via)):
                if _plain(v) == old:
                    via[k] = new
    cooler = doc.get("cooler")
    if cooler is not None:
        for cs in cooler.get("stage", []) or []:
            if _plain(cs.get("stage")) == old:
                cs["stage"] = new
        for link in cooler.get("link", []) or []:
            between = link.get("between")
            if isinstance(between, list):
                for k, v in enumerate(list(between)):
                    if _plain(v) == old:
                        between[k] = new
