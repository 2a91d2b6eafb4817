"""The style-preserving plan document on its own (no dashboard): an edit keeps the user's
comments, a refused edit leaves the text as it was, the save goes through the one safe save
(backups kept), and a file the editor cannot follow is a located error."""

from __future__ import annotations

import pytest

from cryoplan.errors import InputError
from cryoplan.files import PLAN_BACKUPS, backup_path
from cryoplan.plan import demo_plan_path
from cryoplan.plan.document import DiskChanged, EditRejected, PlanDocument


@pytest.fixture
def plan_file(tmp_path):
    path = tmp_path / "plan.toml"
    path.write_text(open(demo_plan_path(), encoding="utf-8").read(), encoding="utf-8")
    return path


def test_an_edit_keeps_the_comments_and_a_refused_edit_changes_nothing(plan_file):
    doc = PlanDocument.open(str(plan_file))
    before = doc.text
    comments = [line for line in before.splitlines() if line.lstrip().startswith("#")]
    doc.set_part_field(0, 0, "mass", "3 kg")
    assert doc.dirty
    assert [ln for ln in doc.text.splitlines() if ln.lstrip().startswith("#")] == comments
    edited = doc.text
    with pytest.raises(EditRejected):
        doc.set_part_field(0, 0, "mass", "3 kgs")
    assert doc.text == edited
    assert doc.undo() and doc.text == before


def test_the_save_keeps_backups_and_refuses_a_file_changed_on_disk(plan_file):
    doc = PlanDocument.open(str(plan_file))
    original = plan_file.read_text(encoding="utf-8")
    for mass in ("3 kg", "4 kg", "5 kg", "6 kg"):
        doc.set_part_field(0, 0, "mass", mass)
        doc.save()
    assert 'mass = "6 kg"' in plan_file.read_text(encoding="utf-8")
    # PLAN_BACKUPS generations, the newest first: 5 kg, 4 kg, 3 kg; the original is gone
    kept = [open(backup_path(str(plan_file), g)).read() for g in range(PLAN_BACKUPS)]
    assert ['mass = "5 kg"' in kept[0], 'mass = "3 kg"' in kept[-1]] == [True, True]
    assert original not in kept
    plan_file.write_text(original, encoding="utf-8")  # someone else edits the file
    doc.set_part_field(0, 0, "mass", "7 kg")
    with pytest.raises(DiskChanged):
        doc.save()


def test_a_plan_nested_too_deep_to_edit_is_a_located_error(tmp_path):
    path = tmp_path / "deep.toml"
    path.write_text("x = " + "[" * 5000 + "]" * 5000 + "\n", encoding="utf-8")
    with pytest.raises(InputError) as info:
        PlanDocument.open(str(path))
    assert info.value.file == str(path)
