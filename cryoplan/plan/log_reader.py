"""Reading a cryostat's log: CSV or TSV readings of levels, temperatures and fills.

A log has one header line and one reading per line; lines whose first non-blank character
is ``#`` are comments, blank lines are skipped. The delimiter (comma, tab or semicolon) is
the one the header uses most. The ``time`` column holds ISO 8601 date-times (with an
offset such as ``+01:00`` or ``Z``, or local times in a time zone the caller names), or
numbers of seconds or hours from a start given once (a header ``time [h]``, or a mapping
entry ``{"what": "time", "unit": "h", "start": "2027-01-11T08:00+01:00"}``).

Columns map to the plan with no configuration when their header says what they are:

- ``<cryogen> level [<unit>]``: the level of that cryogen's bath, in ``%`` of the level
  meter's sensor length, a volume (``L``) or a height (``cm``);
- ``<stage> temperature [<unit>]``: a stage's temperature;
- ``<cryogen> fill [<unit>]``: the volume delivered into that cryogen's bath at that time
  (blank or 0 where nothing was delivered).

Anything else is mapped by a small mapping, column name -> entry, for example
``{"LHe": {"what": "level", "cryogen": "helium", "unit": "%", "sensor_length": "50 cm",
"litres_per_cm": 2.0}}``. Entry keys: ``what`` (level, temperature, fill or time),
``cryogen``, ``bath`` or ``stage``, ``unit``, and for levels ``sensor_length`` (a length
with units), ``litres_per_cm`` (a number, or a quantity such as ``"2 L/cm"``) or
``calibration`` (``[[cm, L], ...]``), ``volume_below`` (liquid below the sensor, with
units); for the time column ``unit``, ``start``, ``timezone``. An entry for a header that
maps itself adds to what the header says (a percentage needs the sensor's length and the
litres per centimetre to become litres).

Faults are reported, never silently dropped: each problem is a :class:`LogProblem` with its
line, counted per reason; the first few of each reason are kept by name. Mistakes that make
the log unreadable raise :class:`cryoplan.errors.InputError` naming the file, the line, the
column or key, what was expected and what was found. Quoted cells may not span lines.
"""

from __future__ import annotations

import csv
import os
import re
import zoneinfo
from dataclasses import dataclass, field
from datetime import datetime, timedelta, timezone
from typing import Any

import numpy as np

from ..errors import InputError, UnknownNameError
from ..physics.logfit import find_rail_runs, level_to_volume
from ..units import parse_quantity

__all__ = [
    "DROPPING_REASONS",
    "KNOWN_CRYOGENS",
    "MAX_BYTES",
    "MAX_LINE",
    "ColumnMapping",
    "LogData",
    "LogProblem",
    "LogSeries",
    "parse_header",
    "read_log",
]

#: Cryogens a ``<cryogen> level`` or ``<cryogen> fill`` header may name.
KNOWN_CRYOGENS = ("helium", "nitrogen", "neon", "hydrogen", "argon", "oxygen")
#: The largest log file read [bytes], and the longest line [characters].
MAX_BYTES = 200 * 1024**2
MAX_LINE = 10_000
#: How many problems of each reason are kept by name (all are counted).
NAMED_PER_REASON = 5

R_CELLS = "wrong number of cells"
R_BLANK_TIME = "blank time"
R_BAD_TIME = "unparseable time"
R_NO_ZONE = "time without offset among times with offsets"
R_NONEXISTENT = "nonexistent local time (daylight-saving skipped hour)"
R_DUPLICATE = "duplicate time"
R_BLANK = "blank cell"
R_BAD = "unparseable cell"
R_NAN = "NaN or infinite cell"
R_DISCONNECTED = "meter disconnected (exact 0 or 100 % between normal readings)"
R_ORDER = "out of order (sorted)"
R_GAP = "gap"
R_REPEATED = "daylight-saving: repeated local hour"
R_SKIPPED = "daylight-saving: skipped local hour"
R_AMBIGUOUS = "ambiguous local time (read as the first pass)"

#: Reasons that drop a row (all series) or a cell (one series); the others only note.
DROPPING_REASONS = frozenset(
    {R_CELLS, R_BLANK_TIME, R_BAD_TIME, R_NO_ZONE, R_NONEXISTENT, R_DUPLICATE}
    | {R_BLANK, R_BAD, R_NAN, R_DISCONNECTED}
)

_HEADER = re.compile(
    r"^\s*(?P<name>.+?)\s+(?P<what>level|temperature|fill)\s*(?:\[(?P<unit>[^\]]*)\])?\s*$",
    re.IGNORECASE,
)
_TIME_HEADER = re.compile(r"^\s*time\s*(?:\[(?P<unit>[^\]]*)\])?\s*$", re.IGNORECASE)
_ENTRY_KEYS = ("what", "cryogen", "bath", "stage", "unit", "sensor_length", "litres_per_cm")
_ENTRY_KEYS += ("calibration", "volume_below")
_TIME_KEYS = ("what", "unit", "start", "timezone")
_PERCENT = ("%", "percent", "pct")
_EPOCH = datetime(1970, 1, 1)
_US = timedelta(microseconds=1)
# Readings are kept within +-930 years of 1970 (int64 microseconds, datetimes in range).
_SPAN_S = 930 * 365 * 86400.0


@dataclass(frozen=True)
class LogProblem:
    """One problem in a log: its line (1-based, in the file), the reason, and a short text."""

    line: int
    reason: str
    text: str


@dataclass(frozen=True)
class ColumnMapping:
    """What one column holds, its unit, and what a level needs to become litres.

    ``what`` is ``"level"``, ``"temperature"`` or ``"fill"``; ``target`` the cryogen, bath
    or stage it belongs to and ``target_kind`` which of those; ``unit`` as written.
    ``sensor_length`` [m], ``volume_per_length`` [m^3/m] (litres per centimetre),
    ``calibration`` (heights [m], volumes [m^3]) and ``volume_below`` [m^3] are for levels.
    """

    column: str
    what: str
    target: str
    target_kind: str
    unit: str
    sensor_length: float | None = None
    volume_per_length: float | None = None
    calibration: tuple[tuple[float, ...], tuple[float, ...]] | None = None
    volume_below: float = 0.0


@dataclass
class LogSeries:
    """One mapped column in time order, aligned with :attr:`LogData.time`.

    ``quantity`` is the kind of the SI ``values``: ``"fraction"`` (a level in % of the
    sensor, as 0..1), ``"length"`` [m], ``"volume"`` [m^3] or ``"temperature"`` [K].
    ``valid`` marks the readings that parsed and passed the checks (``values`` is NaN
    elsewhere). ``volume`` [m^3] is a level (or fill) as a volume where its unit or the
    mapping's sensor length and litres per centimetre allow, else None.
    """

    mapping: ColumnMapping
    quantity: str
    values: np.ndarray
    valid: np.ndarray
    volume: np.ndarray | None = None

    @property
    def column(self) -> str:
        return self.mapping.column

    @property
    def what(self) -> str:
        return self.mapping.what

    @property
    def target(self) -> str:
        return self.mapping.target


@dataclass
class LogData:
    """A log read: times, the mapped series, and every problem found.

    ``time`` [s] from the first kept reading, strictly increasing; ``start`` the date-time
    of that reading (aware where the log's offsets or time zone are known, naive for local
    times in no stated zone, None for relative times with no start); ``lines`` the file
    line of each kept reading; ``series`` by column name; ``problems`` the first few of each
    reason, by line; ``counts`` every problem per reason; ``rows_read`` the data lines and
    ``rows_kept`` the readings kept; ``ignored`` the columns neither mapped nor recognised.
    """

    file: str
    time: np.ndarray
    start: datetime | None
    lines: np.ndarray
    series: dict[str, LogSeries]
    problems: list[LogProblem]
    counts: dict[str, int]
    rows_read: int
    rows_kept: int
    delimiter: str
    timezone: str | None = None
    ignored: list[str] = field(default_factory=list)

    def find(self, what: str, target: str | None = None) -> list[LogSeries]:
        """The series of one kind (``"level"``, ...), optionally of one target."""
        return [
            s
            for s in self.series.values()
            if s.what == what and (target is None or s.target.lower() == target.lower())
        ]

    def dropped(self) -> dict[str, int]:
        """Counts of the reasons that dropped a row or a cell."""
        return {k: v for k, v in self.counts.items() if k in DROPPING_REASONS}

    def notes(self) -> dict[str, int]:
        """Counts of the reasons that only note (gaps, sorting, daylight saving)."""
        return {k: v for k, v in self.counts.items() if k not in DROPPING_REASONS}

    def describe_problems(self) -> list[str]:
        """One plain sentence per reason: how many, dropped or noted, the first lines."""
        out = []
        for reason, n in sorted(self.counts.items(), key=lambda kv: -kv[1]):
            lines = [str(p.line) for p in self.problems if p.reason == reason]
            more = f" and {n - len(lines)} more" if n > len(lines) else ""
            verb = "dropped" if reason in DROPPING_REASONS else "noted"
            s = "s" if len(lines) > 1 else ""
            out.append(f"{n} {verb}: {reason} (line{s} {', '.join(lines)}{more})")
        return out


class _Problems:
    """Counts every problem per reason and keeps the first few of each by name."""

    def __init__(self, named: int) -> None:
        self.named, self.kept, self.counts = named, [], {}

    def add(self, lines, reason: str, text) -> None:
        """``text``: one string, a list (texts of the first few), or a function of position."""
        lines = np.atleast_1d(np.asarray(lines))
        if lines.size == 0:
            return
        n = self.counts.get(reason, 0)
        for i in range(min(lines.size, max(0, self.named - n))):
            t = text(i) if callable(text) else text if isinstance(text, str) else text[i]
            self.kept.append(LogProblem(int(lines[i]), reason, t))
        self.counts[reason] = n + int(lines.size)


def _fail(message: str, expected: str, found: str, **where) -> InputError:
    return InputError(message, expected=expected, found=found, **where)


# --- the header and the mapping ----------------------------------------------------------


def parse_header(name: str) -> tuple[str, str, str | None] | None:
    """Read a self-mapping header into ``(target, what, unit)``, or None.

    >>> parse_header("helium level [%]")
    ('helium', 'level', '%')
    >>> parse_header("cold plate temperature [K]")
    ('cold plate', 'temperature', 'K')
    >>> parse_header("magnet current [A]") is None
    True
    """
    m = _HEADER.match(name)
    if not m:
        return None
    target, what = m.group("name").strip(), m.group("what").lower()
    if what in ("level", "fill") and target.lower() not in KNOWN_CRYOGENS:
        return None
    unit = m.group("unit")
    return target, what, (unit.strip() if unit is not None else None)


def _si_linear(unit: str, dimension: str, where: dict) -> tuple[float, float]:
    """(factor, offset) with SI = offset + factor * value, through ``parse_quantity``."""
    one = parse_quantity(f"1 {unit}", dimension, **where)
    zero = parse_quantity(f"0 {unit}", dimension, **where) if dimension == "temperature" else 0.0
    return one - zero, zero


def _quantity(m: ColumnMapping, where: dict) -> tuple[str, float, float]:
    """The SI kind of a column and its (factor, offset); a unit that does not fit raises."""
    if m.what == "level" and m.unit.lower() in _PERCENT:
        return "fraction", 0.01, 0.0
    kinds = {"level": ("volume", "length"), "temperature": ("temperature",)}
    for kind in kinds.get(m.what, ("volume",)):
        try:
            return (kind, *_si_linear(m.unit, kind, where))
        except InputError:
            continue
    expected = {
        "level": "'%' of the sensor's length, a volume such as 'L' or a height such as 'cm'",
        "temperature": "a temperature unit such as 'K' or 'mK'",
    }.get(m.what, "a volume unit such as 'L'")
    raise _fail(f"the unit does not fit a {m.what} column", expected, repr(m.unit), **where)


def _litres_per_cm(value, where: dict) -> float:
    if isinstance(value, (int, float)) and not isinstance(value, bool):
        if not value > 0:
            raise _fail("litres per cm not positive", "a number > 0", repr(value), **where)
        return float(value) * 1e-3 / 1e-2
    return parse_quantity(value, "area", **where)  # a volume per length is an area


def _calibration(value, where: dict):
    expected = "a table [[cm, L], ...] of two or more pairs, rising in cm"
    try:
        h, v = (np.array([float(p[k]) for p in value]) for k in (0, 1))
        bad = h.size < 2 or any(len(p) != 2 for p in value)
    except (TypeError, ValueError, IndexError, KeyError):
        bad = True
    if bad or not np.all(np.isfinite(h) & np.isfinite(v)) or np.any(np.diff(h) <= 0):
        raise _fail("not a usable calibration table", expected, repr(value), **where)
    if np.any(np.diff(v) < 0):
        raise _fail("a calibration table whose litres fall", expected, repr(value), **where)
    return tuple((h * 1e-2).tolist()), tuple((v * 1e-3).tolist())


def _build_mapping(column: str, entry: dict, guess, where: dict) -> ColumnMapping:
    def at(key: str) -> dict:
        return dict(where, key=f"{column}.{key}")

    for k in entry:
        if k not in _ENTRY_KEYS:
            raise UnknownNameError("mapping key", str(k), _ENTRY_KEYS, **at(str(k)))
    what = entry.get("what", guess[1] if guess else None)
    if what not in ("level", "temperature", "fill"):
        expected = "what = 'level', 'temperature', 'fill' or 'time'"
        raise _fail("what the column holds is not known", expected, repr(what), **at("what"))
    kind = next((k for k in ("cryogen", "bath", "stage") if k in entry), None)
    target = entry.get(kind) if kind else (guess[0] if guess else None)
    kind = kind or ("stage" if what == "temperature" else "cryogen")
    if not isinstance(target, str) or not target.strip():
        need = "a stage" if what == "temperature" else "a cryogen or a bath"
        raise _fail("the column's target is missing", need, repr(target), **at(kind))
    unit = entry.get("unit", guess[2] if guess else None)
    if not isinstance(unit, str) or not unit.strip():
        expected = "a unit in the header ('helium level [%]') or the mapping's 'unit'"
        raise _fail("the column's unit is missing", expected, repr(unit), **at("unit"))
    extra: dict[str, Any] = {}
    if "sensor_length" in entry:
        extra["sensor_length"] = parse_quantity(
            entry["sensor_length"], "length", **at("sensor_length")
        )
    if "litres_per_cm" in entry:
        extra["volume_per_length"] = _litres_per_cm(entry["litres_per_cm"], at("litres_per_cm"))
    if "calibration" in entry:
        extra["calibration"] = _calibration(entry["calibration"], at("calibration"))
    if "volume_below" in entry:
        extra["volume_below"] = parse_quantity(
            entry["volume_below"], "volume", **at("volume_below")
        )
    if "volume_per_length" in extra and "calibration" in extra:
        raise _fail("both litres per cm and a calibration", "one of them", "both", **at(""))
    return ColumnMapping(column, what, target.strip(), kind, unit.strip(), **extra)


# --- times --------------------------------------------------------------------------------


def _is_data(line: str) -> bool:
    return bool(line.strip()) and not line.lstrip().startswith("#")


def _iso(cell: str):
    try:
        return datetime.fromisoformat(cell.strip())
    except ValueError:
        return None


def _parse_iso(cells) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """-> (seconds: UTC where aware, the written clock where naive; aware mask; ok mask)."""
    try:  # the usual log: every cell a date-time as written
        dts = [datetime.fromisoformat(c) for c in cells]
    except (ValueError, TypeError):
        dts = [_iso(c) for c in cells]
    ok = np.array([d is not None for d in dts], dtype=bool)
    good = [d for d in dts if d is not None] if not ok.all() else dts
    zones = {d.tzinfo for d in good}
    if zones == {None}:
        secs_good = [(d - _EPOCH).total_seconds() for d in good]
        aware = np.zeros(ok.size, bool)
    elif None not in zones:
        secs_good = [d.timestamp() for d in good]
        aware = ok.copy()
    else:
        secs_good = [d.timestamp() if d.tzinfo else (d - _EPOCH).total_seconds() for d in good]
        aware = np.zeros(ok.size, bool)
        aware[ok] = [d.tzinfo is not None for d in good]
    secs = np.full(ok.size, np.nan)
    secs[ok] = secs_good
    ok &= np.abs(np.nan_to_num(secs, nan=np.inf)) < _SPAN_S
    return secs, aware & ok, ok


def _zone_offsets(clock: np.ndarray, zone) -> tuple[np.ndarray, np.ndarray]:
    """UTC offsets [s] of local clock times [s] for fold 0 and fold 1 (PEP 495)."""
    hours = np.floor(clock / 3600.0)
    uniq, inv = np.unique(hours, return_inverse=True)
    table = np.empty((uniq.size, 2))
    uniform = np.empty(uniq.size, bool)
    for k, h in enumerate(uniq.tolist()):
        a = _EPOCH + timedelta(hours=h)
        offs = [
            d.replace(tzinfo=zone, fold=f).utcoffset().total_seconds()
            for d in (a, a + timedelta(seconds=3599))
            for f in (0, 1)
        ]
        table[k], uniform[k] = offs[:2], len(set(offs)) == 1
    off0, off1 = table[inv, 0], table[inv, 1]
    for i in np.flatnonzero(~uniform[inv]):  # an hour with a transition inside it
        d = _EPOCH + timedelta(seconds=float(clock[i]))
        off0[i], off1[i] = (
            d.replace(tzinfo=zone, fold=f).utcoffset().total_seconds() for f in (0, 1)
        )
    return off0, off1


def _hhmm(seconds: float) -> str:
    return (_EPOCH + timedelta(seconds=float(seconds))).strftime("%Y-%m-%d %H:%M")


def _localise(secs, naive, lines, zone, problems: _Problems) -> tuple[np.ndarray, np.ndarray]:
    """UTC seconds of naive local times in ``zone`` and the mask of those that exist."""
    idx = np.flatnonzero(naive)
    clock = secs[idx]
    off0, off1 = _zone_offsets(clock, zone)
    offset = off0.copy()
    gap = off0 < off1  # fold 0 gives the offset before a forward jump: a skipped time
    problems.add(
        lines[idx[gap]], R_NONEXISTENT, [f"{_hhmm(c)} not in {zone.key}" for c in clock[gap][:9]]
    )
    amb = np.flatnonzero(off0 > off1)  # the repeated hour
    for day in np.unique(np.floor(clock[amb] / 86400.0)):
        members = amb[np.floor(clock[amb] / 86400.0) == day]
        back = np.flatnonzero(np.diff(clock[members]) < 0)
        if back.size:  # after the clock steps back: the second pass, fold 1
            second = members[back[0] + 1 :]
            offset[second] = off1[second]
        else:
            text = f"{_hhmm(clock[members[0]])} occurs twice in {zone.key}"
            problems.add(lines[idx[members[0]]], R_AMBIGUOUS, text)
    keep = ~gap
    kept, o, c = idx[keep], offset[keep], clock[keep]
    for j in np.flatnonzero(np.diff(o) != 0):
        reason = R_SKIPPED if o[j + 1] > o[j] else R_REPEATED
        text = f"local clock {_hhmm(c[j])} -> {_hhmm(c[j + 1])}, UTC offset "
        text += f"{o[j] / 3600:+g} h -> {o[j + 1] / 3600:+g} h"
        problems.add(lines[kept[j + 1]], reason, text)
    out = secs.copy()
    out[kept] = c - o
    exists = naive.copy()
    exists[idx[gap]] = False
    return out, exists


def _start(start, zone, where: dict) -> tuple[datetime, float]:
    """A start date-time -> (datetime, seconds since the epoch, UTC where known)."""
    dt = start if isinstance(start, datetime) else _iso(str(start))
    if dt is None:
        expected = "an ISO 8601 start such as '2027-01-11T08:00+01:00'"
        raise _fail("not an ISO 8601 date-time", expected, repr(start), **where)
    if dt.tzinfo is None and zone is not None:
        dt = dt.replace(tzinfo=zone)
    return dt, dt.timestamp() if dt.tzinfo else (dt - _EPOCH).total_seconds()


# --- cells --------------------------------------------------------------------------------


def _floats(cells) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """-> values (NaN where not a number), blank mask, unparseable mask."""
    n = len(cells)
    try:
        return np.array(cells, dtype=float), np.zeros(n, bool), np.zeros(n, bool)
    except ValueError:
        pass
    blank = np.array([not c.strip() for c in cells], dtype=bool)
    try:
        values = np.array([c if c.strip() else "nan" for c in cells], dtype=float)
        return values, blank, np.zeros(n, bool)
    except ValueError:
        pass
    values, bad = np.full(n, np.nan), np.zeros(n, bool)
    for i, c in enumerate(cells):
        try:
            values[i] = float(c)
        except ValueError:
            bad[i] = not blank[i]
    return values, blank, bad


# --- the file -----------------------------------------------------------------------------


def _read_lines(path: str, max_bytes: int, max_line: int) -> list[str]:
    where = {"file": path}
    if not os.path.isfile(path):
        found = "a folder" if os.path.isdir(path) else "no such file"
        raise _fail("log file not found", "an existing CSV or TSV file", found, **where)
    size = os.path.getsize(path)
    if size > max_bytes:
        expected = f"at most {max_bytes / 1024**2:g} MB (split the log, by year for example)"
        raise _fail("log file too large", expected, f"{size / 1024**2:.1f} MB", **where)
    with open(path, "rb") as fh:
        data = fh.read()
    try:
        text = data.decode("utf-8-sig")
    except UnicodeDecodeError as exc:
        line = data[: exc.start].count(b"\n") + 1
        found = f"byte {data[exc.start]:#04x}"
        raise _fail("not UTF-8 text", "a text log", found, file=path, line=line) from None
    if "\x00" in text:
        line = text[: text.index("\x00")].count("\n") + 1
        raise _fail("not a text file", "a CSV or TSV log", "a NUL byte", file=path, line=line)
    lines = text.replace("\r\n", "\n").replace("\r", "\n").split("\n")
    if max(map(len, lines)) > max_line:
        i = next(i for i, s in enumerate(lines) if len(s) > max_line)
        expected = f"at most {max_line} characters per line"
        raise _fail("line too long", expected, f"{len(lines[i])}", file=path, line=i + 1)
    return lines


def _columns(body: list[str], delimiter: str, ncol: int, keep_min: int):
    """Cells by column of the lines that have (or can be given) ``ncol`` cells.

    Returns (columns, fits mask, cell counts). A row with more cells than the header is
    kept when the extra cells are blank (trailing delimiters), one with fewer when it has
    the time cell (trailing blanks left off); others do not fit.
    """
    if not body:
        return [[] for _ in range(ncol)], np.ones(0, bool), []
    if '"' in "".join(body):
        rows = [next(csv.reader([s], delimiter=delimiter), []) for s in body]
    else:
        counts = np.fromiter((s.count(delimiter) for s in body), int, len(body))
        if np.all(counts == ncol - 1):
            flat = delimiter.join(body).split(delimiter)
            return [flat[j::ncol] for j in range(ncol)], np.ones(len(body), bool), None
        rows = [s.split(delimiter) for s in body]
    sizes = [len(r) for r in rows]
    fits = np.ones(len(rows), bool)
    for i, r in enumerate(rows):
        if len(r) > ncol and not any(c.strip() for c in r[ncol:]):
            rows[i] = r[:ncol]
        elif keep_min < len(r) < ncol:
            rows[i] = r + [""] * (ncol - len(r))
        elif len(r) != ncol:
            fits[i] = False
    good = [r for r, f in zip(rows, fits) if f]
    cols = [[r[j] for r in good] for j in range(ncol)]
    return cols, fits, sizes


def read_log(
    path: str | os.PathLike,
    mapping: dict[str, dict] | None = None,
    *,
    timezone_name: str | None = None,
    time_column: str | None = None,
    time_unit: str | None = None,
    start: str | datetime | None = None,
    gap_factor: float = 10.0,
    jump: float = 0.05,
    named: int = NAMED_PER_REASON,
    max_bytes: int = MAX_BYTES,
    max_line: int = MAX_LINE,
) -> LogData:
    """Read a CSV or TSV log of levels, temperatures and fills into SI arrays.

    Parameters
    ----------
    path : str or path-like
        The log file.
    mapping : dict, optional
        Column name -> entry (see the module's docstring), merged over what headers say.
    timezone_name : str, optional
        IANA zone (``"Europe/Berlin"``) of times written without an offset. Daylight-saving
        changes are then resolved and noted: in a repeated hour the readings after the
        clock steps back take the standard-time offset; a skipped hour is noted, and a
        reading inside it dropped as nonexistent. Without a zone, naive times are read as
        written (and a clock stepping back shows as out-of-order rows).
    time_column : str, optional
        The time column, when it is not headed ``time``.
    time_unit : str, optional
        ``"s"``, ``"min"``, ``"h"``...: the time column holds numbers from ``start``.
    start : str or datetime, optional
        The date-time of time 0 for relative times.
    gap_factor : float, optional
        A step longer than this many median steps is noted as a gap.
    jump : float, optional
        A run of exact 0 (or 100 %) in a level bordered on each side by a jump of more than
        this share of full scale (100 % for a percentage, the largest reading otherwise)
        is a disconnected meter (:func:`cryoplan.physics.logfit.find_rail_runs`).
    named : int, optional
        Problems kept by name per reason (all are counted).
    max_bytes, max_line : int, optional
        The largest file [bytes] and the longest line [characters] read.

    Returns
    -------
    LogData

    Raises
    ------
    InputError
        No such file, too large, not text, a line too long, no header or no time column,
        a mapping naming a missing column (with the closest one) or an unknown key, a unit
        that does not fit the column's kind, an unknown time zone, no valid time at all.

    Examples
    --------
    >>> import pathlib, tempfile
    >>> p = pathlib.Path(tempfile.mkdtemp()) / "log.csv"
    >>> _ = p.write_text("# invented\\ntime,helium level [L]\\n2027-01-11T00:00Z,80\\n"
    ...                  "2027-01-11T01:00Z,79.5\\n2027-01-11T01:00Z,79.5\\n")
    >>> log = read_log(p)
    >>> log.time.tolist(), log.series["helium level [L]"].volume.tolist(), log.counts
    ([0.0, 3600.0], [0.08, 0.0795], {'duplicate time': 1})
    >>> log.problems
    [LogProblem(line=5, reason='duplicate time', text='same time as an earlier reading')]
    """
    path = os.fspath(path)
    lines = _read_lines(path, max_bytes, max_line)
    problems = _Problems(named)
    data = [i for i, s in enumerate(lines) if s and (s[0] not in "# \t" or _is_data(s))]
    if not data:
        expected = "a header such as 'time,helium level [%]'"
        raise _fail("no header line", expected, "an empty log", file=path)
    htext = lines[data[0]]
    delimiter = max((",", "\t", ";"), key=lambda d: (htext.count(d), d == ","))
    header = [h.strip() for h in next(csv.reader([htext], delimiter=delimiter))]
    where = {"file": path, "line": data[0] + 1}
    if len(set(header)) != len(header):
        twice = next(h for h in header if header.count(h) > 1)
        raise _fail("a column header twice", "unique headers", repr(twice), **where, key=twice)
    mapping = dict(mapping or {})
    zone_name = timezone_name
    for name, entry in mapping.items():
        if name not in header:
            raise UnknownNameError("column", str(name), header, **where, key=str(name))
        if not isinstance(entry, dict):
            raise _fail("a mapping entry is not a table", "{what = ...}", repr(entry), **where)
        if entry.get("what") == "time":
            for k in entry:
                if k not in _TIME_KEYS:
                    raise UnknownNameError("key", str(k), _TIME_KEYS, **where, key=f"{name}.{k}")
            time_column = name
            time_unit = entry.get("unit", time_unit)
            start = entry.get("start", start)
            zone_name = entry.get("timezone", zone_name)
    if time_column is None:
        time_column = next((h for h in header if _TIME_HEADER.match(h)), None)
        if time_column is None:
            close = [h for h in header if "time" in h.lower() or "date" in h.lower()]
            found = ", ".join(repr(h) for h in header)
            found += f"; map {close[0]!r} as the time column?" if close else ""
            raise _fail("no time column", "a column headed 'time'", found, **where)
    elif time_column not in header:
        raise UnknownNameError("column", time_column, header, **where, key="time column")
    written = _TIME_HEADER.match(time_column)
    if time_unit is None and written and written.group("unit"):
        time_unit = written.group("unit").strip()
    zone = None
    if zone_name is not None:
        try:
            zone = zoneinfo.ZoneInfo(str(zone_name))
        except (zoneinfo.ZoneInfoNotFoundError, ValueError, TypeError, OSError):
            expected = "an IANA zone such as 'Europe/Berlin'"
            raise _fail("unknown time zone", expected, repr(zone_name), **where) from None
    maps, ignored = [], []
    for h in header:
        guess = parse_header(h) if h != time_column else None
        if h != time_column and (h in mapping or guess is not None):
            maps.append(_build_mapping(h, mapping.get(h, {}), guess, where))
        elif h != time_column:
            ignored.append(h)
    kinds = [_quantity(m, dict(where, key=m.column)) for m in maps]
    # rows and cells
    body = [lines[i] for i in data[1:]]
    line_no = np.array(data[1:], dtype=np.int64) + 1
    ti = header.index(time_column)
    columns, fits, sizes = _columns(body, delimiter, len(header), ti + 1)
    if not fits.all():
        bad = np.flatnonzero(~fits)
        texts = [f"{sizes[i]} cells, the header has {len(header)}" for i in bad[:named]]
        problems.add(line_no[bad], R_CELLS, texts)
        line_no = line_no[fits]
    tcells = columns[ti]
    blank_t = np.fromiter((not c.strip() for c in tcells), bool, len(tcells))
    problems.add(line_no[blank_t], R_BLANK_TIME, "no time")
    start_dt = None
    if time_unit is not None:  # numbers from a start
        factor, _ = _si_linear(time_unit, "time", dict(where, key=time_column))
        secs = _floats(tcells)[0] * factor
        ok = np.abs(np.nan_to_num(secs, nan=np.inf)) < _SPAN_S
        if start is not None:
            start_dt, start_s = _start(start, zone, dict(where, key="start"))
            secs, ok = secs + start_s, ok & (abs(start_s) < _SPAN_S)
        aware = ok & (start_dt is not None and start_dt.tzinfo is not None)
    else:
        secs, aware, ok = _parse_iso(tcells)
        naive = ok & ~aware
        if naive.any() and zone is not None:
            secs, exists = _localise(secs, naive, line_no, zone, problems)
            ok = ok & (exists | aware)
            aware = ok.copy()
        elif naive.any() and aware.any():
            problems.add(line_no[naive], R_NO_ZONE, "give the log's time zone, or the offset")
            ok &= aware
        checked = ok | (naive & ~ok)  # nonexistent local times are already reported
        bad_t = ~checked & ~blank_t
        shown = [repr(tcells[i][:40]) for i in np.flatnonzero(bad_t)[:named]]
        problems.add(line_no[bad_t], R_BAD_TIME, shown)
    if time_unit is not None:
        bad_t = ~ok & ~blank_t
        shown = [repr(tcells[i][:40]) for i in np.flatnonzero(bad_t)[:named]]
        problems.add(line_no[bad_t], R_BAD_TIME, shown)
    # order, duplicates, gaps
    kept = np.flatnonzero(ok)
    stamp = np.round(secs[kept] * 1e6).astype(np.int64)
    if stamp.size:
        late = stamp < np.maximum.accumulate(np.concatenate(([stamp[0]], stamp[:-1])))
        problems.add(line_no[kept[late]], R_ORDER, "earlier than a reading above it")
    order = np.argsort(stamp, kind="stable")
    kept, stamp = kept[order], stamp[order]
    dup = np.zeros(stamp.size, bool)
    dup[1:] = stamp[1:] == stamp[:-1]
    problems.add(line_no[kept[dup]], R_DUPLICATE, "same time as an earlier reading")
    kept, stamp = kept[~dup], stamp[~dup]
    if kept.size == 0:
        found = f"{len(body)} data lines"
        raise _fail("no reading with a valid time", "ISO 8601 date-times", found, file=path)
    time = (stamp - stamp[0]) / 1e6
    lines_kept = line_no[kept]
    steps = np.diff(time)
    if steps.size and np.median(steps) > 0:
        gaps = np.flatnonzero(steps > gap_factor * np.median(steps))
        texts = [
            f"no reading for {steps[g] / 3600:.3g} h after line {lines_kept[g]}" for g in gaps
        ]
        problems.add(lines_kept[gaps + 1], R_GAP, texts)
    series = {m.column: _series(m, k, columns, header, kept, lines_kept, jump, problems)
              for m, k in zip(maps, kinds)}  # fmt: skip
    first = _first_time(stamp[0], start_dt, time_unit, aware[kept[0]], zone)
    return LogData(
        path, time, first, lines_kept, series,
        sorted(problems.kept, key=lambda p: (p.line, p.reason)), problems.counts,
        len(body), int(kept.size), delimiter, zone.key if zone else None, ignored,
    )  # fmt: skip


def _first_time(stamp_us, start_dt, time_unit, aware, zone) -> datetime | None:
    if time_unit is not None and start_dt is None:
        return None
    if start_dt is not None and start_dt.tzinfo is None:
        return _EPOCH + timedelta(microseconds=int(stamp_us))
    if not aware and start_dt is None:
        return _EPOCH + timedelta(microseconds=int(stamp_us))
    utc = datetime(1970, 1, 1, tzinfo=timezone.utc) + timedelta(microseconds=int(stamp_us))
    tz = start_dt.tzinfo if start_dt is not None else zone
    return utc.astimezone(tz) if tz is not None else utc


def _series(m, kind, columns, header, kept, lines_kept, jump, problems) -> LogSeries:
    """One column's cells (kept rows, time order) -> a checked series in SI."""
    quantity, factor, offset = kind
    cells = columns[header.index(m.column)]
    raw, blank, bad = (a[kept] for a in _floats(cells))
    n = problems.named
    if m.what != "fill":  # a fill column is blank where nothing was delivered
        problems.add(lines_kept[blank], R_BLANK, f"no value in {m.column!r}")
    shown = [f"{m.column!r}: {cells[kept[i]][:40]!r}" for i in np.flatnonzero(bad)[:n]]
    problems.add(lines_kept[bad], R_BAD, shown)
    problems.add(lines_kept[~np.isfinite(raw) & ~blank & ~bad], R_NAN, f"{m.column!r}")
    valid = np.isfinite(raw)
    if m.what == "level":
        at = np.flatnonzero(valid)
        percent = quantity == "fraction"
        scale = 100.0 if percent else float(np.max(np.abs(raw[at]), initial=0.0))
        rails = (0.0, 100.0) if percent else (0.0,)
        cut = at[find_rail_runs(raw[at], rails, jump * scale)] if scale > 0 else at[:0]
        shown = [f"{m.column!r} reads {raw[i]:g}" for i in cut[:n]]
        problems.add(lines_kept[cut], R_DISCONNECTED, shown)
        valid[cut] = False
    if m.what == "fill":
        valid &= raw != 0
    values = np.where(valid, offset + factor * np.where(valid, raw, 0.0), np.nan)
    volume = values if quantity == "volume" else None
    length = m.sensor_length if quantity == "fraction" else 1.0
    if quantity in ("fraction", "length") and length is not None:
        if m.volume_per_length is not None or m.calibration is not None:
            cal = None if m.calibration is None else tuple(map(np.array, m.calibration))
            volume = np.asarray(
                level_to_volume(values, length, m.volume_per_length, cal, m.volume_below)
            )
    return LogSeries(m, quantity, values, valid, volume)
