"""The one safe save (cryoplan/files.py): targets checked first, writes whole or not at all.

No physics here: the expected contents are the bytes each test wrote itself.
"""

from __future__ import annotations

import os
import shutil
import stat
import threading

import pytest

from cryoplan import files
from cryoplan.cli import main
from cryoplan.errors import InputError
from cryoplan.files import (
    OUTPUT_BACKUPS,
    PLAN_BACKUPS,
    backup_path,
    check_output_path,
    write_file,
)
from cryoplan.plan import demo_plan_path


def leftovers(folder) -> list[str]:
    return sorted(n for n in os.listdir(folder) if n.startswith(files.TEMP_PREFIX))


# --- regular files and backups ---------------------------------------------------------


def test_a_new_file_is_written_with_the_usual_mode(tmp_path):
    target = tmp_path / "out.txt"
    assert write_file(str(target), "a\r\nb\n") == str(target)
    assert target.read_bytes() == b"a\r\nb\n"  # bytes as given, no newline translation
    umask = os.umask(0)
    os.umask(umask)
    assert stat.S_IMODE(target.stat().st_mode) == 0o666 & ~umask
    assert os.listdir(tmp_path) == ["out.txt"]  # no backup of nothing, no temporary


def test_backups_keep_the_stated_generations(tmp_path):
    target = str(tmp_path / "plan.toml")
    for n in range(6):
        write_file(target, f"version {n}\n", backups=PLAN_BACKUPS)
    assert PLAN_BACKUPS == 3
    assert open(target).read() == "version 5\n"
    assert open(backup_path(target)).read() == "version 4\n"
    assert open(backup_path(target, 1)).read() == "version 3\n"
    assert open(backup_path(target, 2)).read() == "version 2\n"
    assert not os.path.exists(backup_path(target, 3))  # three generations, no more
    assert leftovers(tmp_path) == []


def test_an_output_keeps_one_backup_and_keeps_the_mode(tmp_path):
    target = tmp_path / "budget.txt"
    target.write_text("old\n")
    os.chmod(target, 0o640)
    for text in ("new\n", "newer\n"):
        write_file(str(target), text)
    assert OUTPUT_BACKUPS == 1
    assert sorted(os.listdir(tmp_path)) == ["budget.txt", "budget.txt.bak"]
    assert (tmp_path / "budget.txt.bak").read_text() == "new\n"
    assert stat.S_IMODE(target.stat().st_mode) == 0o640


def test_no_empty_backup_and_no_backup_of_the_same_content(tmp_path):
    target = tmp_path / "plan.toml"
    target.write_text("")
    write_file(str(target), "first\n", backups=3)
    assert not os.path.exists(backup_path(str(target)))  # the empty file was not kept
    write_file(str(target), "first\n", backups=3)  # the same text again
    assert not os.path.exists(backup_path(str(target)))  # nothing pushed out for it
    write_file(str(target), "second\n", backups=3)
    assert open(backup_path(str(target))).read() == "first\n"


# --- a save that fails or is killed midway ------------------------------------------------


@pytest.mark.parametrize("failure", [OSError(28, "No space left on device"), KeyboardInterrupt])
def test_a_write_killed_midway_leaves_the_previous_file_and_no_temporary(
    tmp_path, monkeypatch, failure
):
    target = tmp_path / "plan.toml"
    target.write_text("version 0\n")
    write_file(str(target), "version 1\n", backups=3)
    before = {n: (tmp_path / n).read_bytes() for n in os.listdir(tmp_path)}

    def broken_fsync(fd):
        raise failure

    monkeypatch.setattr(files.os, "fsync", broken_fsync)  # after the bytes, before the rename
    expected = InputError if isinstance(failure, OSError) else KeyboardInterrupt
    with pytest.raises(expected):
        write_file(str(target), "version 2\n" * 1000, backups=3)
    after = {n: (tmp_path / n).read_bytes() for n in os.listdir(tmp_path)}
    assert after == before  # the plan, its backup and nothing else, all unchanged


def test_a_backup_copy_that_fails_leaves_no_empty_or_partial_backup(tmp_path, monkeypatch):
    target = tmp_path / "plan.toml"
    target.write_text("version 0\n")
    write_file(str(target), "version 1\n", backups=3)

    def half_copy(src, dst, *args):
        dst.write(src.read(3))
        raise OSError(5, "Input/output error")

    monkeypatch.setattr(files.shutil, "copyfileobj", half_copy)
    with pytest.raises(InputError, match="cannot write"):
        write_file(str(target), "version 2\n", backups=3)
    assert target.read_text() == "version 1\n"
    assert (tmp_path / "plan.toml.bak").read_text() == "version 0\n"
    assert sorted(os.listdir(tmp_path)) == ["plan.toml", "plan.toml.bak"]


def test_a_failed_rename_leaves_no_temporary(tmp_path, monkeypatch):
    target = tmp_path / "out.txt"
    target.write_text("kept\n")

    def no_rename(a, b):
        raise OSError(13, "Permission denied")

    monkeypatch.setattr(files.os, "replace", no_rename)
    with pytest.raises(InputError, match="Permission denied"):
        write_file(str(target), "lost\n", backups=0)
    assert target.read_text() == "kept\n" and os.listdir(tmp_path) == ["out.txt"]


# --- devices, pipes, links, folders, the inputs themselves --------------------------------


def test_dev_null_is_written_through_not_replaced():
    before = os.stat("/dev/null")
    assert check_output_path("/dev/null") == "/dev/null"
    assert write_file("/dev/null", b"x" * 10000) == "/dev/null"
    after = os.stat("/dev/null")
    assert stat.S_ISCHR(after.st_mode) and after.st_ino == before.st_ino
    assert not os.path.exists("/dev/null.bak")


def test_a_fifo_is_written_through(tmp_path):
    fifo = tmp_path / "pipe"
    os.mkfifo(fifo)
    got = []
    reader = threading.Thread(target=lambda: got.append(open(fifo, "rb").read()))
    reader.start()
    payload = b"budget\n" * 20000  # more than a pipe's buffer (64 KiB on Linux)
    for _ in range(200):  # wait for the reader to open its end (at most 2 s)
        try:
            write_file(str(fifo), payload)
            break
        except InputError as exc:
            assert "nobody reading" in str(exc)
            threading.Event().wait(0.01)
    reader.join(5)
    assert got == [payload]
    assert stat.S_ISFIFO(os.lstat(fifo).st_mode)  # still a pipe
    assert os.listdir(tmp_path) == ["pipe"]


def test_a_fifo_nobody_reads_is_an_error_not_a_hang(tmp_path):
    fifo = tmp_path / "pipe"
    os.mkfifo(fifo)
    with pytest.raises(InputError, match="nobody reading"):
        write_file(str(fifo), b"x")


def test_a_symlink_is_followed_and_stays_a_link(tmp_path):
    real_folder = tmp_path / "real"
    real_folder.mkdir()
    real = real_folder / "plan.toml"
    real.write_text("old\n")
    link = tmp_path / "link.toml"
    link.symlink_to(real)
    assert check_output_path(str(link)) == str(real)
    write_file(str(link), "new\n", backups=3)
    assert link.is_symlink() and os.readlink(link) == str(real)
    assert real.read_text() == "new\n"
    assert (real_folder / "plan.toml.bak").read_text() == "old\n"  # beside the real file
    assert sorted(os.listdir(tmp_path)) == ["link.toml", "real"]


def test_a_folder_is_refused_for_a_file_and_required_for_files(tmp_path):
    with pytest.raises(InputError, match="a folder"):
        check_output_path(str(tmp_path), kind="file")
    assert check_output_path(str(tmp_path), kind="folder") == str(tmp_path)
    assert check_output_path(str(tmp_path / "new"), kind="folder") == str(tmp_path / "new")
    (tmp_path / "a-file").write_text("x")
    with pytest.raises(InputError, match="a file of that name"):
        check_output_path(str(tmp_path / "a-file"), kind="folder")
    with pytest.raises(InputError, match="no such folder"):
        check_output_path(str(tmp_path / "no" / "x.txt"))
    with pytest.raises(InputError, match="no such folder"):
        check_output_path(str(tmp_path / "no" / "x"), kind="folder")


def test_an_input_file_is_refused_under_any_of_its_names(tmp_path, monkeypatch):
    plan = tmp_path / "plan.toml"
    plan.write_text("title = 'x'\n")
    alias = tmp_path / "alias.toml"
    alias.symlink_to(plan)
    hard = tmp_path / "hard.toml"
    os.link(plan, hard)
    monkeypatch.chdir(tmp_path)
    for name in (str(plan), "plan.toml", "./sub/../plan.toml", str(alias), str(hard)):
        os.makedirs(tmp_path / "sub", exist_ok=True)
        with pytest.raises(InputError, match="the input file"):
            check_output_path(name, inputs=[str(plan)], key="-o")
    assert check_output_path("other.toml", inputs=[str(plan)]) == str(tmp_path / "other.toml")


# --- the command line checks its targets before any work ----------------------------------


@pytest.fixture
def plan_copy(tmp_path):
    path = tmp_path / "bay3.toml"
    shutil.copy(demo_plan_path(), path)
    return path


@pytest.mark.parametrize("option", ["-o", "--curve"])
def test_print_never_replaces_the_plan(plan_copy, capsys, option):
    before = plan_copy.read_bytes()
    assert main(["print", str(plan_copy), option, str(plan_copy)]) == 2
    err = capsys.readouterr().err
    assert "the input file" in err and "Traceback" not in err
    assert plan_copy.read_bytes() == before
    assert os.listdir(plan_copy.parent) == ["bay3.toml"]


def test_print_refuses_a_folder_and_a_csv_target_that_is_a_file(plan_copy, capsys):
    assert main(["print", str(plan_copy), "--curve", str(plan_copy.parent)]) == 2
    assert "a folder" in capsys.readouterr().err
    other = plan_copy.parent / "notes.txt"
    other.write_text("kept\n")
    assert main(["print", str(plan_copy), "-f", "csv", "-o", str(other)]) == 2
    assert "a file of that name" in capsys.readouterr().err
    assert sorted(os.listdir(plan_copy.parent)) == ["bay3.toml", "notes.txt"]
    assert other.read_text() == "kept\n"


def test_print_writes_through_dev_null(plan_copy):
    assert main(["print", str(plan_copy), "-o", "/dev/null"]) == 0
    assert stat.S_ISCHR(os.stat("/dev/null").st_mode)


def test_print_follows_a_symlink_and_keeps_a_backup(plan_copy, tmp_path):
    real = tmp_path / "budget.txt"
    real.write_text("an older budget\n")
    link = tmp_path / "latest.txt"
    link.symlink_to(real)
    assert main(["print", str(plan_copy), "-o", str(link)]) == 0
    assert link.is_symlink() and "CRYOPLAN BUDGET" in real.read_text()
    assert (tmp_path / "budget.txt.bak").read_text() == "an older budget\n"
