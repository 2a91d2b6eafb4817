"""The one safe save of cryoplan: every file the tool writes goes through here.

Two functions, used by every writer (the printed budget and its ``--curve``, ``compare
-o``, a plan made from the demo, the dashboard's save of a plan):

- :func:`check_output_path` looks at a target *before any work is done*: a folder where a
  file is wanted is refused (and a file where a folder is wanted), so is a target that is
  one of the input files (the plan itself), a folder that does not exist, or a special
  file that is neither a terminal-like character device nor a pipe.
- :func:`write_file` writes the bytes whole or not at all. A regular file is written to a
  temporary file made by :func:`tempfile.mkstemp` in the target's own folder (an
  unpredictable name opened with ``O_EXCL``, so a planted symlink cannot redirect it),
  flushed to the disk with ``fsync``, and renamed over the target with :func:`os.replace`;
  a run killed at any moment leaves either the previous file or the new one, never a mix.
  The previous version is kept as ``NAME.bak`` and older ones as ``NAME.bak.1``,
  ``NAME.bak.2`` (:data:`PLAN_BACKUPS` = 3 generations for a plan, :data:`OUTPUT_BACKUPS`
  = 1 for a printed output). A backup is never empty and never half-written: it is copied
  to a temporary file first and renamed into place only when whole. The temporary files
  are removed in a ``finally`` whatever goes wrong.

What a target may be:

- an existing character device or pipe (``/dev/null``, ``/dev/stdout``, a terminal, a
  named FIFO) is *written through*: opened and written in place, never renamed over, and
  no backup is made;
- a symbolic link is *followed*: the file it points to is replaced atomically (and backed
  up beside that file), the link stays a link;
- a folder is refused for a file (and required for a folder of files);
- one of the input files (compared with :func:`os.path.samefile`, after following links) is
  refused: ``cryoplan print plan.toml -o plan.toml`` never replaces the plan.
"""

from __future__ import annotations

import errno
import os
import shutil
import stat
import tempfile
from collections.abc import Iterable

from .errors import InputError

#: Generations of backups kept of a plan the dashboard saves: NAME.bak, NAME.bak.1, NAME.bak.2.
PLAN_BACKUPS = 3
#: Generations of backups kept of a printed output that is written again: NAME.bak.
OUTPUT_BACKUPS = 1
#: Prefix of the temporary files (hidden, beside the target).
TEMP_PREFIX = ".cryoplan-"


def backup_path(path: str, generation: int = 0) -> str:
    """The backup of ``path`` of one generation: 0 is the newest (``NAME.bak``).

    >>> backup_path("bay3.toml"), backup_path("bay3.toml", 2)
    ('bay3.toml.bak', 'bay3.toml.bak.2')
    """
    return f"{path}.bak" if generation == 0 else f"{path}.bak.{generation}"


def resolve_target(path: str) -> str:
    """The file a write to ``path`` lands in: absolute, every symbolic link followed.

    >>> import os
    >>> resolve_target("x.txt") == os.path.realpath("x.txt")
    True
    """
    return os.path.realpath(os.path.abspath(os.path.expanduser(os.fspath(path))))


def is_write_through(path: str) -> bool:
    """True when ``path`` exists as a character device or a pipe (written in place).

    >>> is_write_through("/dev/null"), is_write_through("/no/such/file")
    (True, False)
    """
    try:
        mode = os.stat(path).st_mode
    except OSError:
        return False
    return stat.S_ISCHR(mode) or stat.S_ISFIFO(mode)


def _refuse(path: str, what: str, key: str | None, expected: str, found: str) -> InputError:
    return InputError(f"cannot write {what}", file=path, key=key, expected=expected, found=found)


def _same_file(a: str, b: str) -> bool:
    try:
        return os.path.samefile(a, b)
    except OSError:
        return resolve_target(a) == resolve_target(b)


def check_output_path(
    path: str,
    *,
    inputs: Iterable[str] = (),
    kind: str = "file",
    what: str = "the output",
    key: str | None = None,
) -> str:
    """Check an output target before any work is done; return the path to write.

    Parameters
    ----------
    path : str
        The target as the user gave it.
    inputs : iterable of str
        The files the run reads (the plan, the plans compared): the target may not be one.
    kind : {"file", "folder"}
        A file (a folder there is refused) or a folder of files (a file there is refused;
        a folder that does not exist yet is made by the writer, its parent must exist).
    what : str
        What is written, for the message ("the output", "the curve", "the plan").
    key : str, optional
        The option that named the target (``-o``, ``--curve``), for the message.

    Returns
    -------
    str
        The absolute path, symbolic links followed (the file a write lands in).

    Raises
    ------
    InputError
        When the target cannot or must not be written.

    Examples
    --------
    >>> check_output_path("/dev/null")
    '/dev/null'
    >>> check_output_path("/") # doctest: +ELLIPSIS
    Traceback (most recent call last):
    ...
    cryoplan.physics.errors.InputError: ...a folder...
    """
    if kind not in ("file", "folder"):
        raise ValueError(f"kind must be 'file' or 'folder', not {kind!r}")
    if not os.fspath(path):
        raise _refuse(str(path), what, key, f"a {kind} name", "nothing")
    given = os.fspath(path)
    target = resolve_target(given)
    for source in inputs:
        if source and os.path.exists(target) and _same_file(target, source):
            raise _refuse(
                given, what, key, f"a {kind} other than the input", f"the input file {source}"
            )
    if kind == "folder":
        if os.path.exists(target) and not os.path.isdir(target):
            raise _refuse(given, what, key, "a folder", "a file of that name")
        if not os.path.isdir(os.path.dirname(target)):
            raise _refuse(given, what, key, "a folder in an existing folder", "no such folder")
        return target
    if os.path.isdir(target):
        raise _refuse(given, what, key, "a file, not a folder", "a folder")
    if os.path.exists(target):
        mode = os.stat(target).st_mode
        if stat.S_ISCHR(mode) or stat.S_ISFIFO(mode):
            return target
        if not stat.S_ISREG(mode):
            raise _refuse(given, what, key, "a regular file, a device or a pipe", "a special file")
    folder = os.path.dirname(target)
    if not os.path.isdir(folder):
        raise _refuse(given, what, key, "a file in an existing folder", "no such folder")
    if not os.access(folder, os.W_OK | os.X_OK):
        raise _refuse(given, what, key, "a folder you may write in", "no permission")
    return target


def _write_through(target: str, payload: bytes, shown: str, what: str) -> None:
    """Write ``payload`` into an existing device or pipe, in place."""
    try:
        # non-blocking first, so that a pipe nobody reads is an error, not a hang
        fd = os.open(target, os.O_WRONLY | os.O_NONBLOCK | getattr(os, "O_CLOEXEC", 0))
    except OSError as exc:
        if exc.errno == errno.ENXIO:
            raise _refuse(shown, what, None, "a pipe that is read", "nobody reading") from None
        raise InputError(f"cannot write {what} ({exc.strerror})", file=shown) from None
    try:
        os.set_blocking(fd, True)
        view = memoryview(payload)
        while view:
            view = view[os.write(fd, view) :]
    except OSError as exc:
        raise InputError(f"cannot write {what} ({exc.strerror})", file=shown) from None
    finally:
        os.close(fd)


def _temporary(folder: str, name: str, suffix: str) -> tuple[int, str]:
    return tempfile.mkstemp(prefix=f"{TEMP_PREFIX}{name}.", suffix=suffix, dir=folder)


def _keep_backups(target: str, generations: int, payload: bytes) -> None:
    """Copy the present ``target`` to ``NAME.bak`` after moving older backups down.

    Nothing is kept of an empty file or of one that already holds ``payload``. The copy
    is made whole in a temporary file before any backup is moved.
    """
    size = os.path.getsize(target)
    if generations < 1 or size == 0:
        return
    if size == len(payload):
        with open(target, "rb") as fh:
            if fh.read() == payload:
                return
    folder, name = os.path.split(target)
    fd, tmp = _temporary(folder, name, ".bak")
    try:
        with os.fdopen(fd, "wb") as out, open(target, "rb") as src:
            shutil.copyfileobj(src, out)
            out.flush()
            os.fsync(out.fileno())
        shutil.copystat(target, tmp)
        for n in range(generations - 1, 0, -1):
            older = backup_path(target, n - 1)
            if os.path.isfile(older) and os.path.getsize(older) > 0:
                os.replace(older, backup_path(target, n))
        os.replace(tmp, backup_path(target))
    finally:
        if os.path.lexists(tmp):
            os.unlink(tmp)


def _fsync_folder(folder: str) -> None:
    try:
        fd = os.open(folder, os.O_RDONLY)
    except OSError:
        return
    try:
        os.fsync(fd)
    except OSError:
        pass
    finally:
        os.close(fd)


def write_file(
    path: str,
    payload: bytes | str,
    *,
    backups: int = OUTPUT_BACKUPS,
    what: str = "the output",
) -> str:
    """Write ``payload`` to ``path`` whole or not at all, keeping backups of what was there.

    Parameters
    ----------
    path : str
        The target (see the module's notes: a device or pipe is written through, a
        symbolic link is followed).
    payload : bytes or str
        The content; text is written as UTF-8 exactly as given (no newline translation).
    backups : int
        Generations of backups to keep of a regular file that is replaced (0: none).
    what : str
        What is written, for the message.

    Returns
    -------
    str
        The file written (absolute, links followed).

    Raises
    ------
    InputError
        When the file cannot be written; the previous file is then unchanged and no
        temporary file is left behind.

    Examples
    --------
    >>> import os, tempfile
    >>> folder = tempfile.mkdtemp()
    >>> target = os.path.join(folder, "budget.txt")
    >>> _ = write_file(target, "one\\n"); _ = write_file(target, "two\\n")
    >>> open(target).read(), open(target + ".bak").read()
    ('two\\n', 'one\\n')
    """
    data = payload.encode("utf-8") if isinstance(payload, str) else bytes(payload)
    shown = os.fspath(path)
    target = check_output_path(shown, what=what)
    if is_write_through(target):
        _write_through(target, data, shown, what)
        return target
    folder, name = os.path.split(target)
    exists = os.path.isfile(target)
    tmp = None
    try:
        fd, tmp = _temporary(folder, name, ".tmp")
        with os.fdopen(fd, "wb") as fh:
            fh.write(data)
            fh.flush()
            os.fsync(fh.fileno())
        if exists:
            mode = stat.S_IMODE(os.stat(target).st_mode)
        else:  # mkstemp makes the file private; give it the usual mode of a new file
            umask = os.umask(0)
            os.umask(umask)
            mode = 0o666 & ~umask
        os.chmod(tmp, mode)
        if exists:
            _keep_backups(target, backups, data)
        os.replace(tmp, target)
        tmp = None
        _fsync_folder(folder)
    except OSError as exc:
        raise InputError(
            f"cannot write {what} ({exc.strerror or exc.__class__.__name__})", file=shown
        ) from None
    finally:
        if tmp is not None and os.path.lexists(tmp):
            os.unlink(tmp)
    return target
