"""The fluid cache: a cryogen's tables as small JSON files, read as untrusted input.

One file per cryogen, pressure and CoolProp version, in
``$CRYOPLAN_CACHE_DIR/fluids/coolprop-VERSION`` (or under
``platformdirs.user_cache_dir("cryoplan")``). Each file carries the cache format
(:data:`CACHE_FORMAT`), the CoolProp version that computed it and a SHA-256 checksum of
its content. A file is used only when every check passes:

- it is a regular file (checked with :func:`os.lstat` before it is opened, and again on
  the open descriptor, which is opened without following a link and without blocking), so
  a symbolic link to ``/dev/zero`` or a named pipe is never read;
- it holds at most :data:`MAX_BYTES`, and no more than that is ever read;
- it is JSON (never a pickle, never anything that runs) of the current format;
- its checksum matches its content: a corrupted, truncated or edited file (a liquid
  density times ten) is caught;
- it was computed by the installed CoolProp, for this cryogen and pressure, and is a
  complete table (finite numbers, increasing temperatures).

Anything else is reported once per file on standard error as a one-line note, and the
caller rebuilds the table from CoolProp (a file of an older cache format, left by an
earlier cryoplan, is rebuilt without a note). A cache folder that cannot be written leaves
the tables in memory for the run.
"""

from __future__ import annotations

import hashlib
import json
import math
import os
import stat
import sys
from pathlib import Path

import numpy as np

from ..errors import CryoplanError, InputError
from ..files import write_file
from .cryogen import COOLPROP_NAMES, SCALARS, TABLE_COLUMNS, kpa

#: Version of the layout of the cache files; a file of another version is rebuilt.
CACHE_FORMAT = 2

#: The largest cache file read [bytes] (a table is about 30 kB).
MAX_BYTES = 16 * 1024 * 1024

_VERSION: list[str] = []
_NOTED: set[str] = set()


def coolprop_version() -> str:
    """CoolProp's installed version, read from the package metadata without importing it.

    Raises
    ------
    CryoplanError
        CoolProp is not installed.

    Examples
    --------
    >>> coolprop_version() >= "6"
    True
    """
    if not _VERSION:
        from importlib.metadata import PackageNotFoundError, version

        try:
            _VERSION.append(version("CoolProp"))
        except PackageNotFoundError:
            raise CryoplanError(
                "cryoplan needs CoolProp for fluid properties; install it with "
                "'pip install CoolProp'"
            ) from None
    return _VERSION[0]


def cache_dir() -> Path:
    """The directory of the fluid tables for the installed CoolProp version.

    ``$CRYOPLAN_CACHE_DIR/fluids/coolprop-VERSION`` when that variable is set, otherwise
    under ``platformdirs.user_cache_dir("cryoplan")``.

    Examples
    --------
    >>> cache_dir().name == "coolprop-" + coolprop_version()
    True
    """
    root = os.environ.get("CRYOPLAN_CACHE_DIR")
    if not root:
        import platformdirs

        root = platformdirs.user_cache_dir("cryoplan")
    return Path(root) / "fluids" / f"coolprop-{coolprop_version()}"


def cache_file(name: str, pressure: float) -> Path:
    """The cache file of a cryogen at a pressure [Pa] (rounded to 6 figures).

    >>> cache_file("argon", 101325.0).name
    'argon-101325Pa.json'
    """
    return cache_dir() / f"{name}-{pressure:.6g}Pa.json"


def checksum(content: dict) -> str:
    """SHA-256 of the content's canonical JSON (sorted keys, no spaces), in hexadecimal.

    JSON writes each float as its shortest round-tripping decimal, so a file read back
    gives the same canonical text, and the same checksum, as the content written.

    >>> checksum({"b": 1.5, "a": [1, 2]}) == checksum({"a": [1, 2], "b": 1.5})
    True
    """
    text = json.dumps(content, sort_keys=True, separators=(",", ":"), allow_nan=False)
    return hashlib.sha256(text.encode("utf-8")).hexdigest()


def _note(path: Path, reason: str) -> None:
    """One line on standard error, once per file and process."""
    key = str(path)
    if key in _NOTED:
        return
    _NOTED.add(key)
    print(
        f"cryoplan: note: the fluid cache file {path} {reason}; rebuilt from CoolProp",
        file=sys.stderr,
    )


def _problem(data, name: str, pressure: float, version: str) -> str | None:
    """Why a parsed cache file may not be used (None: it may)."""
    if not isinstance(data, dict):
        return "is not a table"
    stored = data.get("sha256")
    content = {k: v for k, v in data.items() if k != "sha256"}
    try:
        good = isinstance(stored, str) and stored == checksum(content)
    except (TypeError, ValueError):  # NaN or infinity written into the file
        good = False
    if not good:
        return "fails its checksum (a corrupted, truncated or edited file)"
    if data.get("coolprop") != version:
        return f"was computed by CoolProp {data.get('coolprop')!r}, not {version}"
    try:
        if (
            data["fluid"] != name
            or data["coolprop_fluid"] != COOLPROP_NAMES[name]
            or float(data["pressure"]) != pressure
        ):
            return f"is not the table of {name} at {kpa(pressure)}"
        table = data["table"]
        columns = [np.asarray(table[k], dtype=float) for k in TABLE_COLUMNS]
        n = len(columns[0])
        if n < 2 or any(c.shape != (n,) or not np.all(np.isfinite(c)) for c in columns):
            return "holds a table that is not complete"
        if not np.all(np.diff(columns[0]) > 0):
            return "holds temperatures that do not increase"
        if not all(math.isfinite(float(data[k])) for k in SCALARS):
            return "holds a value that is not finite"
        if not isinstance(data["eos_reference"], str):
            return "has no reference of its equation of state"
    except (KeyError, TypeError, ValueError, AttributeError):
        return "is not a complete table"
    return None


def _read_bytes(path: Path) -> bytes | str | None:
    """The file's bytes, None when it does not exist, or the reason it may not be read."""
    try:
        info = os.lstat(path)
    except FileNotFoundError:
        return None
    except OSError as exc:
        return f"cannot be examined ({exc.strerror})"
    if not stat.S_ISREG(info.st_mode):
        return "is not a regular file"
    if info.st_size > MAX_BYTES:
        return f"is larger than {MAX_BYTES // 2**20} MB"
    flags = os.O_RDONLY | getattr(os, "O_NOFOLLOW", 0) | getattr(os, "O_NONBLOCK", 0)
    try:
        fd = os.open(path, flags)
    except OSError as exc:
        return f"cannot be read ({exc.strerror})"
    with os.fdopen(fd, "rb") as fh:
        if not stat.S_ISREG(os.fstat(fh.fileno()).st_mode):  # replaced since the lstat
            return "is not a regular file"
        raw = fh.read(MAX_BYTES + 1)
    if len(raw) > MAX_BYTES:
        return f"is larger than {MAX_BYTES // 2**20} MB"
    return raw


def read(path: Path, name: str, pressure: float, version: str) -> dict | None:
    """The checked content of a cache file, or None when it is absent or fails a check.

    A file that fails is reported once on standard error (see the module's notes); the
    caller then rebuilds it with :func:`cryoplan.data.fluid_build.build`.
    """
    raw = _read_bytes(path)
    if raw is None:
        return None
    if isinstance(raw, str):
        _note(path, raw)
        return None
    try:
        data = json.loads(raw.decode("utf-8"))
    except (UnicodeDecodeError, ValueError, RecursionError):
        _note(path, "is not valid JSON (a corrupted or truncated file)")
        return None
    old = isinstance(data, dict) and data.get("format")
    if old != CACHE_FORMAT:
        if not (isinstance(old, int) and not isinstance(old, bool) and 0 < old < CACHE_FORMAT):
            _note(path, f"is of an unknown cache format ({old!r})")
        return None  # an older format, left by an earlier cryoplan: rebuilt quietly
    reason = _problem(data, name, pressure, version)
    if reason is not None:
        _note(path, reason)
        return None
    return data


def write(path: Path, content: dict) -> bool:
    """Write the content with its format and checksum, atomically; False if unwritable.

    An entry of that name that is not a regular file (a planted link or pipe) is removed
    first, so the write never lands anywhere but in the cache folder.
    """
    data = dict(content, format=CACHE_FORMAT)
    data["sha256"] = checksum(data)
    try:
        path.parent.mkdir(parents=True, exist_ok=True)
        if os.path.lexists(path) and not stat.S_ISREG(os.lstat(path).st_mode):
            os.unlink(path)
        text = json.dumps(data, sort_keys=True, separators=(",", ":"), allow_nan=False)
        write_file(str(path), text, backups=0, what="the fluid cache")
    except (OSError, InputError, ValueError):
        return False
    return True
