"""The plan file: load, validate, convert to SI floats.

A plan is a TOML file (see DEVELOPERS.md and examples/). Every quantity is a string with
units, parsed once here by :mod:`cryoplan.units`. Every mistake found is collected and
reported together, in the order of the file's lines, each naming the file, the line, the
key, what was expected and what was found (:class:`~cryoplan.errors.InputErrors`).

The schema (dataclasses, allowed keys, defaults and bounds) is in
:mod:`cryoplan.plan.schema`, the collector of located mistakes in
:mod:`cryoplan.plan.located`; each part of the plan has its own section reader
(:mod:`~cryoplan.plan.read_cold_mass`, :mod:`~cryoplan.plan.read_cryogens`,
:mod:`~cryoplan.plan.read_loads`, :mod:`~cryoplan.plan.read_cooler`,
:mod:`~cryoplan.plan.read_rooms`), which records a mistake and goes on with the next entry.
"""

from __future__ import annotations

import datetime as _dt
import math
import os
import re

from ..errors import CryoplanError, InputError, InputErrors
from .located import _Reader, is_number, shown
from .read_cold_mass import material_range_check, read_stages
from .read_cooler import read_cooler
from .read_cryogens import read_baths, read_cooldown, read_inserts, read_supplies
from .read_loads import read_loads
from .read_rooms import read_rooms
from .schema import MARGIN_KEYS, MAX_DAYS, OPERATION_KEYS, TOP_KEYS, Plan

try:  # Python 3.11+
    import tomllib as _toml
except ModuleNotFoundError:  # pragma: no cover - Python 3.10
    import tomli as _toml

# --- the top level ----------------------------------------------------------------------


def _operation(reader: _Reader, data: dict) -> tuple[_dt.date | None, float]:
    """The calendar: a start date and a number of days, both within what a date can hold."""
    operation = reader.table(data.get("operation", {}), "operation")
    reader.keys(operation, OPERATION_KEYS, "operation")
    start_date = None
    if "start_date" in operation:
        value = operation["start_date"]
        if isinstance(value, _dt.datetime):
            start_date = value.date()
        elif isinstance(value, _dt.date):
            start_date = value
        elif isinstance(value, str):
            try:
                start_date = _dt.date.fromisoformat(value.strip())
            except ValueError:
                pass
        if start_date is None:
            reader.error(
                "not a date",
                "operation.start_date",
                expected="a date such as 2027-01-11",
                found=shown(value),
            )
    days = operation.get("days", 30)
    if not is_number(days) or not 0 < days <= MAX_DAYS:
        reader.error(
            "not a number of days",
            "operation.days",
            expected=f"a number of days above 0 and at most {MAX_DAYS} (ten years)",
            found=shown(days),
        )
        days = 30
    if start_date is not None:
        try:
            _dt.datetime.combine(start_date, _dt.time()) + _dt.timedelta(days=days + 1)
        except OverflowError:
            last = _dt.date.max - _dt.timedelta(days=math.ceil(days) + 1)
            reader.error(
                f"the plan's {days:g} days run past the last date the calendar holds",
                "operation.start_date",
                expected=f"a start date on or before {last.isoformat()}",
                found=shown(operation["start_date"]),
            )
            start_date = None
    return start_date, float(days)


def _toml_error(exc: Exception, path: str) -> InputError:
    msg = str(exc)
    line = getattr(exc, "lineno", None)
    if line is None:
        m = re.search(r"line (\d+)", msg)
        line = int(m.group(1)) if m else None
    return InputError(
        f"not valid TOML: {msg}",
        file=path,
        line=line,
        expected="TOML syntax",
        found="a syntax error",
    )


#: Nesting of arrays and inline tables named in the message when the TOML reader runs out of
#: recursion (a plan needs three levels; the reader follows about a hundred).
MAX_NESTING = 50


def _nesting_error(text: str, path: str) -> InputError | None:
    """Where brackets first nest deeper than :data:`MAX_NESTING` (counted outside strings and
    comments, without recursion), as a located error; None when they never do. Asked only
    once the TOML reader has run out of recursion, to name the line."""
    depth = 0
    quote = None
    for number, line in enumerate(text.splitlines(), start=1):
        i = 0
        while i < len(line):
            ch = line[i]
            if quote:
                if ch == "\\" and quote == '"':
                    i += 1
                elif ch == quote:
                    quote = None
            elif ch in "\"'":
                quote = ch
            elif ch == "#":
                break
            elif ch in "[{":
                depth += 1
                if depth > MAX_NESTING:
                    return InputError(
                        "arrays or tables nested too deep",
                        file=path,
                        line=number,
                        expected=f"at most {MAX_NESTING} levels of brackets",
                        found=f"more than {MAX_NESTING}",
                    )
            elif ch in "]}":
                depth = max(0, depth - 1)
            i += 1
        if quote == "'" or (quote == '"' and not line.rstrip().endswith("\\")):
            quote = None  # a one-line string ends with its line (multi-line ones: TOML's job)
    return None


def _load_toml(text: str, path: str) -> dict:
    try:
        return _toml.loads(text)
    except _toml.TOMLDecodeError as exc:
        raise _toml_error(exc, path) from None
    except RecursionError:
        deep = _nesting_error(text, path)
        raise deep or InputError(
            "arrays or tables nested too deep",
            file=path,
            expected=f"at most {MAX_NESTING} levels of brackets",
            found="more than the reader can follow",
        ) from None


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
    """Validate a plan given as TOML text; every problem is collected and raised together.

    Parameters
    ----------
    text : str
        The plan's TOML text.
    path : str, optional
        The file's name, for the messages.

    Returns
    -------
    Plan
        Validated, in SI floats.

    Raises
    ------
    InputError, InputErrors
        One problem, or several in the order of the file's lines.

    Examples
    --------
    >>> plan = parse_plan('[[stage]]\\nname = "plate"\\ntemperature = "77 K"\\n')
    >>> plan.stages[0].temperature
    77.0
    >>> parse_plan('[[stage]]\\nname = "plate"\\ntemperature = "77 K"\\nlayers = 2\\n')
    Traceback (most recent call last):
    ...
    cryoplan.physics.errors.InputError: <plan>:4, key 'stage[0].layers': unknown key 'layers'...
    """
    data = _load_toml(text, path)
    reader = _Reader(path, text)
    try:
        reader.keys(data, TOP_KEYS, "")
        title = data.get("title", os.path.splitext(os.path.basename(path))[0])
        if not isinstance(title, str):
            reader.error("not a title", "title", expected="a string", found=shown(title))
            title = str(title)
        ambient = reader.quantity(
            data, "ambient", "", "temperature", default=293.15, positive=True
        )
        if ambient is None:
            ambient = 293.15
        notes: list[str] = []
        stages, stage_names = read_stages(reader, data.get("stage"), ambient)
        stages.sort(key=lambda s: -s.temperature)
        cooldown, start_ok = read_cooldown(reader, data.get("cooldown"), stages, ambient, notes)
        if start_ok:
            material_range_check(reader, stages, cooldown.start)
        baths, bath_stages = read_baths(reader, data.get("bath"), stages, stage_names)
        supplies = read_supplies(reader, data.get("supply"))
        inserts = read_inserts(reader, data.get("insert"), ambient)
        loads = read_loads(reader, data.get("load"), stages, stage_names, bath_stages)
        cooler = read_cooler(reader, data.get("cooler"), stages, stage_names)
        rooms = read_rooms(reader, data.get("room"))
        margin = reader.table(data.get("margin", {}), "margin")
        reader.keys(margin, MARGIN_KEYS, "margin")
        mass_margin = reader.fraction(margin, "mass", "margin", 0.0, 0.0, 1.0)
        start_date, days = _operation(reader, data)
    except RecursionError:
        reader.errors.append(
            InputError(
                "values nested too deep to read",
                file=path,
                expected=f"at most {MAX_NESTING} levels of brackets",
                found="more than the reader can follow",
            )
        )
    if reader.errors:
        errors = reader.sorted_errors()
        if len(errors) == 1:
            raise errors[0]
        raise InputErrors(errors)
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
        days,
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
