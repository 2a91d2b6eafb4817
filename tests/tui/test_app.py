"""The dashboard: behaviour through Textual's headless pilot, layout through text snapshots.

Each test drives the real application (``App.run_test``): it presses keys, waits for the
evaluation worker to report back, and reads the widgets. Physics is not checked here (the
analyses have their own tests); what is checked is that the dashboard shows the analyses'
figures, follows edits, refuses bad entries, and never loses the user's file.

Snapshots of the screen text live in tests/tui/snapshots/; after reviewing a change by eye,
rewrite them with ``CRYOPLAN_UPDATE_SNAPSHOTS=1 pytest tests/test_tui.py``.
"""

from __future__ import annotations

import asyncio
import os
import re
import shutil
import time

import pytest

from cryoplan.plan import demo_plan_path, examples_dir
from cryoplan.tui.app import CryoplanApp
from cryoplan.tui.charts import draw_chart
from cryoplan.tui.editing import EditRejected, PlanDocument, check_value
from cryoplan.tui.screens import ConfirmScreen, MaterialPicker, PromptScreen, QuitScreen
from cryoplan.tui.widgets import ChartView, ColdMassTable

SNAPSHOTS = os.path.join(os.path.dirname(__file__), "snapshots")
UPDATE = os.environ.get("CRYOPLAN_UPDATE_SNAPSHOTS", "") not in ("", "0")

#: Box-drawing (U+2500-U+257F), block elements (U+2580-U+259F) and braille (U+2800-U+28FF).
FANCY = re.compile("[\u2500-\u259f\u2800-\u28ff]")
BRAILLE = re.compile("[\u2801-\u28ff]")


def run(coro):
    return asyncio.run(coro)


@pytest.fixture
def plan_file(tmp_path):
    """A copy of the demo plan with an extra comment, in a folder of its own."""
    path = tmp_path / "bay3.toml"
    text = open(demo_plan_path(), encoding="utf-8").read()
    path.write_text(
        "# kept through every save: a comment of the user's\n" + text, encoding="utf-8"
    )
    return str(path)


async def settled(app: CryoplanApp, pilot, timeout: float = 20.0) -> None:
    """Wait until the latest edit's evaluation is on the screen."""
    end = time.monotonic() + timeout
    while time.monotonic() < end:
        await pilot.pause(0.02)
        if not app.evaluating and app.shown_generation == app.generation and app.data is not None:
            await pilot.pause()
            return
    raise AssertionError("the evaluation did not come back in time")


def put_cursor(app: CryoplanApp, row_key: str, column: str) -> None:
    table = app.query_one(ColdMassTable)
    table.move_cursor(
        row=table.get_row_index(row_key), column=table.get_column_index(column), animate=False
    )
    table.focus()


def step_litres(app: CryoplanApp) -> dict[tuple, str]:
    """The nominal litres per step as shown under the cold mass (from the report table)."""
    return {
        k: v
        for k, v in app.figures().items()
        if k[0] == "plan" and k[1] == "steps" and k[3] == "Nominal [L]"
    }


def part_litres(app: CryoplanApp, step: str, part: str) -> float:
    """Litres of one part in one step, from the budget panel's "Liquid per part" table."""
    table = next(b for b in app.blocks if type(b).__name__ == "Table" and b.name == "steps_parts")
    row = next(r for r in table.rows if r[0] == step and r[2] == part)
    return float(row[-1])


async def edit_cell(app, pilot, row_key: str, column: str, value: str) -> None:
    put_cursor(app, row_key, column)
    await pilot.press("enter")
    await pilot.pause()
    entry = app.query_one("#edit-input")
    assert app.focused is entry
    entry.value = value
    await pilot.press("enter")
    await pilot.pause()


# --- opening --------------------------------------------------------------------------


def test_open_demo_shows_every_panel():
    async def go():
        app = CryoplanApp(demo_plan_path(), bundled=True)
        async with app.run_test(size=(80, 24)) as pilot:
            await settled(app, pilot)
            table = app.query_one(ColdMassTable)
            # the demo has 2 stages with 2 + 4 parts (examples/demo-magnet-bath.toml)
            assert table.row_count == 2 + 6
            assert "Harwick LTF bay 3" in app.query_one("#title").content
            screen = app.screen_text()
            assert "[1 Cold mass]" in screen and "6 Notes" in screen
            for n in range(2, 7):
                await pilot.press(str(n))
                await pilot.pause()
                assert f"[{n} " in app.screen_text()
            # the demo has no cooler: the refrigeration panel says so
            await pilot.press("4")
            await pilot.pause()
            assert "Not in this plan" in app.screen_text()

    run(go())


def test_a_plan_with_mistakes_opens_with_its_messages(tmp_path):
    path = tmp_path / "broken.toml"
    text = open(demo_plan_path(), encoding="utf-8").read()
    path.write_text(text.replace('mass = "22 kg"', 'mass = "22 kgs"'), encoding="utf-8")
    line = next(n for n, t in enumerate(text.splitlines(), 1) if 'mass = "22 kg"' in t)

    async def go():
        app = CryoplanApp(str(path))
        async with app.run_test(size=(80, 24)) as pilot:
            for _ in range(500):
                await pilot.pause(0.02)
                if app.loaded:
                    break
            await pilot.pause()
            assert app.data is None
            await pilot.press("2")
            await pilot.pause()
            screen = app.screen_text()
            # the plan's own message: file, line, key, what was expected and found
            assert f"broken.toml:{line}" in screen and "unknown unit 'kgs'" in screen
            assert "Traceback" not in screen
            await pilot.press("1")
            await pilot.press("enter")
            await pilot.pause()
            assert "fix the file" in str(app.query_one("#status").content)

    run(go())


# --- editing --------------------------------------------------------------------------


def test_edit_mass_changes_the_litres(plan_file):
    async def go():
        app = CryoplanApp(plan_file)
        async with app.run_test(size=(80, 24)) as pilot:
            await settled(app, pilot)
            before = step_litres(app)
            former_before = part_litres(app, "1", "former")
            await edit_cell(app, pilot, "p1.1", "mass", "30 kg")  # former: 22 kg -> 30 kg
            await settled(app, pilot)
            after = step_litres(app)
            assert app.document.stages()[1].parts[1].mass == "30 kg"
            assert app.document.dirty
            # both steps cool the former: both nominal litres go up
            assert all(float(after[k]) > float(before[k]) for k in before)
            # liquid is proportional to the mass cooled, dm = m c dT / (L + f dh) (DESIGN.md,
            # Ekin 2006, section 1.5); tolerance: the table rounds to 3 significant figures
            assert part_litres(app, "1", "former") == pytest.approx(
                former_before * 30 / 22, rel=0.01
            )
            # the figures that changed are marked (and the mark is a one-shot)
            assert any(k[1] == "steps" for k in app.main.highlight)
            assert app.main.mark_timer is not None

    run(go())


def test_bad_entry_is_marked_at_once_and_the_old_value_stays(plan_file):
    async def go():
        app = CryoplanApp(plan_file)
        async with app.run_test(size=(80, 24)) as pilot:
            await settled(app, pilot)
            generation = app.generation
            put_cursor(app, "p1.1", "mass")
            await pilot.press("enter")
            await pilot.pause()
            entry = app.query_one("#edit-input")
            await pilot.press("ctrl+shift+a")  # select all (it is selected on focus too)
            for key in ["1", "0", "space", "k", "g", "s"]:
                await pilot.press(key)
            await pilot.pause()
            assert entry.value == "10 kgs"
            # marked while typing, before enter
            assert entry.has_class("-invalid")
            reason = str(app.query_one("#edit-reason").content)
            assert "kgs" in reason and "mass" in reason
            await pilot.press("enter")
            await pilot.pause()
            assert entry.has_class("-invalid")
            assert app.editing is not None  # the entry stays open for a correction
            assert app.document.stages()[1].parts[1].mass == "22 kg"
            assert app.generation == generation and not app.document.dirty
            # a value that parses but the plan refuses: a start colder than the stage
            await pilot.press("escape")
            await edit_cell(app, pilot, "p1.1", "start", "2 K")
            assert "colder than its stage" in str(app.query_one("#edit-reason").content)
            assert app.document.stages()[1].parts[1].start == ""

    run(go())


def test_undo_and_redo(plan_file):
    async def go():
        app = CryoplanApp(plan_file)
        async with app.run_test(size=(80, 24)) as pilot:
            await settled(app, pilot)
            before = step_litres(app)
            await edit_cell(app, pilot, "p1.1", "mass", "300 g")
            await settled(app, pilot)
            edited = step_litres(app)
            assert edited != before
            await pilot.press("u")
            await settled(app, pilot)
            assert app.document.stages()[1].parts[1].mass == "22 kg"
            assert step_litres(app) == before
            assert not app.document.dirty
            await pilot.press("r")
            await settled(app, pilot)
            assert app.document.stages()[1].parts[1].mass == "300 g"
            assert step_litres(app) == edited

    run(go())


def test_add_and_remove_a_part_with_the_material_picker(plan_file):
    async def go():
        app = CryoplanApp(plan_file)
        async with app.run_test(size=(80, 24)) as pilot:
            await settled(app, pilot)
            table = app.query_one(ColdMassTable)
            rows = table.row_count
            put_cursor(app, "s1", "name")
            await pilot.press("a")
            await pilot.pause()
            assert isinstance(app.screen, MaterialPicker)
            for key in "coppe":
                await pilot.press(key)
            await pilot.pause()
            picker = app.screen
            found = [
                picker.query_one("#picker-list").get_option_at_index(i).id
                for i in range(picker.query_one("#picker-list").option_count)
            ]
            assert found and found[0] == "copper"
            assert all(
                "copper" in f or "copper" in dict(picker.materials)[f].lower() for f in found
            )
            await pilot.press("enter")
            await settled(app, pilot)
            assert table.row_count == rows + 1
            added = app.document.stages()[1].parts[-1]
            assert added.material == "copper" and added.mass == "1 kg"
            # the new part is in the evaluation too
            names = [p["name"] for st in app.data["cold_mass"] for p in st["parts"]]
            assert added.name in names
            put_cursor(app, f"p1.{added.index}", "name")
            await pilot.press("x")
            await settled(app, pilot)
            assert table.row_count == rows
            assert not app.document.dirty  # back to the file as it was

    run(go())


def test_edit_a_precool_step_and_a_dewar_size(plan_file):
    async def go():
        app = CryoplanApp(plan_file)
        async with app.run_test(size=(80, 24)) as pilot:
            await settled(app, pilot)
            await pilot.press("2")
            await pilot.pause()
            table = app.query_one("#settings")
            assert app.focused is table
            before = step_litres(app)

            async def set_row(key, value):
                table.move_cursor(row=table.get_row_index(key), animate=False)
                await pilot.press("enter")
                await pilot.pause()
                app.query_one("#edit-input").value = value
                await pilot.press("enter")
                await settled(app, pilot)

            await set_row("cooldown.steps[0].gas_use", "0.6")
            after = step_litres(app)
            step1 = next(k for k in before if k[2] == "1")
            # more of the cold gas's enthalpy used, less liquid boiled: the denominator
            # L + f [h_v(T) - h_v(T_b)] grows with f (DESIGN.md; Ekin 2006, section 1.5)
            assert float(after[step1]) < float(before[step1])
            assert "gas_use = 0.6" in app.document.text
            helium = next(r.key for r in app.document.settings() if r.label == "helium dewars")
            await set_row(helium, "500 L")
            # one 500 L dewar is the only size left: the order is that dewar
            assert app.data["summary"]["order_L"]["helium"] == pytest.approx(500.0)
            assert app.focused is table

    run(go())


# --- saving and quitting --------------------------------------------------------------


def toml_keys(text: str) -> list[str]:
    """Table headers and keys in the order they appear."""
    return re.findall(r"^\s*(\[\[?[^\]]+\]\]?|[A-Za-z_]+)\s*(?:=|$)", text, re.M)


def test_save_keeps_comments_and_key_order_and_writes_a_backup(plan_file):
    original = open(plan_file, encoding="utf-8").read()

    async def go():
        app = CryoplanApp(plan_file)
        async with app.run_test(size=(80, 24)) as pilot:
            await settled(app, pilot)
            await edit_cell(app, pilot, "p1.1", "mass", "25 kg")
            await settled(app, pilot)
            await pilot.press("ctrl+s")
            await pilot.pause()
            assert not app.document.dirty
            assert "Saved" in str(app.query_one("#status").content)

    run(go())
    saved = open(plan_file, encoding="utf-8").read()
    assert open(plan_file + ".bak", encoding="utf-8").read() == original
    comments = [line for line in original.splitlines() if line.lstrip().startswith("#")]
    assert comments and all(c in saved.splitlines() for c in comments)
    assert toml_keys(saved) == toml_keys(original)
    # exactly one line changed, the edited mass
    changed = [(a, b) for a, b in zip(original.splitlines(), saved.splitlines()) if a != b]
    assert len(changed) == 1 and '"25 kg"' in changed[0][1]
    leftovers = [f for f in os.listdir(os.path.dirname(plan_file)) if f.startswith(".cryoplan-")]
    assert not leftovers  # the temporary file was renamed, not left behind


def test_quitting_with_unsaved_edits_asks(plan_file):
    async def go():
        app = CryoplanApp(plan_file)
        async with app.run_test(size=(80, 24)) as pilot:
            await settled(app, pilot)
            await edit_cell(app, pilot, "p1.1", "mass", "25 kg")
            await settled(app, pilot)
            await pilot.press("q")
            await pilot.pause()
            assert isinstance(app.screen, QuitScreen)
            await pilot.press("escape")  # stay
            await pilot.pause()
            assert not isinstance(app.screen, QuitScreen) and app.is_running
            await pilot.press("q")
            await pilot.pause()
            await pilot.press("d")  # quit without saving
            await pilot.pause()
            assert not app.is_running

    run(go())
    assert "22 kg" in open(plan_file, encoding="utf-8").read()
    assert not os.path.exists(plan_file + ".bak")


def test_quitting_without_edits_does_not_ask(plan_file):
    async def go():
        app = CryoplanApp(plan_file)
        async with app.run_test(size=(80, 24)) as pilot:
            await settled(app, pilot)
            await pilot.press("q")
            await pilot.pause()
            assert not app.is_running

    run(go())


def test_a_file_changed_on_disk_is_not_overwritten_without_asking(plan_file):
    async def go():
        app = CryoplanApp(plan_file)
        async with app.run_test(size=(80, 24)) as pilot:
            await settled(app, pilot)
            await edit_cell(app, pilot, "p1.1", "mass", "25 kg")
            await settled(app, pilot)
            with open(plan_file, "a", encoding="utf-8") as fh:
                fh.write("\n# changed by someone else\n")
            await pilot.press("ctrl+s")
            await pilot.pause()
            assert isinstance(app.screen, ConfirmScreen)
            assert "changed on disk" in app.screen.question
            await pilot.press("n")
            await pilot.pause()
            assert "someone else" in open(plan_file, encoding="utf-8").read()
            assert app.document.dirty
            await pilot.press("ctrl+s")
            await pilot.pause()
            await pilot.press("y")
            await pilot.pause()
            assert not app.document.dirty

    run(go())
    assert '"25 kg"' in open(plan_file, encoding="utf-8").read()
    # what was on disk is kept as the backup
    assert "someone else" in open(plan_file + ".bak", encoding="utf-8").read()


def test_print_writes_the_budget_and_asks_before_printing(plan_file, monkeypatch):
    import subprocess

    calls = []

    class Done:
        returncode, stdout, stderr = 0, "request id is desk-1", ""

    monkeypatch.setattr(
        "cryoplan.tui.app.shutil.which", lambda name: "/usr/bin/lp" if name == "lp" else None
    )
    monkeypatch.setattr(subprocess, "run", lambda cmd, **kw: calls.append(cmd) or Done())

    async def go():
        app = CryoplanApp(plan_file)
        async with app.run_test(size=(80, 24)) as pilot:
            await settled(app, pilot)
            await pilot.press("p")
            await pilot.pause()
            assert isinstance(app.screen, PromptScreen)
            await pilot.press("enter")  # the proposed file, next to the plan
            await pilot.pause()
            assert isinstance(app.screen, ConfirmScreen)
            assert calls == []  # nothing is sent before the confirmation
            await pilot.press("y")
            for _ in range(50):
                await pilot.pause(0.02)
                if calls and "printer" in str(app.query_one("#status").content):
                    break

    run(go())
    budget = os.path.join(os.path.dirname(plan_file), "bay3-budget.txt")
    assert "CRYOPLAN BUDGET" in open(budget, encoding="utf-8").read()
    assert calls == [["/usr/bin/lp", budget]]


# --- plain characters, charts, idle ---------------------------------------------------


def test_plain_mode_has_no_box_or_braille_characters():
    async def go():
        app = CryoplanApp(demo_plan_path(), plain=True, bundled=True)
        async with app.run_test(size=(120, 40)) as pilot:
            await settled(app, pilot)
            for n in range(1, 7):
                await pilot.press(str(n))
                await pilot.pause()
                assert not FANCY.search(app.screen_text()), f"panel {n}"
            for chart in app.query(ChartView):
                if chart.chart is not None:
                    text = chart.chart_text(70, 14).plain
                    assert not FANCY.search(text) and "*" in text

    run(go())
    # the same chart drawn for a capable terminal uses braille dots and box lines
    drawn = draw_chart([("a", [0, 1, 2], [0, 1, 4])], 30, 8)
    assert BRAILLE.search("".join(drawn.lines)) and "│" in "".join(drawn.lines)


def screen_row(app: CryoplanApp, label: str) -> str:
    """The first line of the screen that holds ``label``."""
    return next(line for line in app.screen_text().split("\n") if label in line)


def test_edited_cells_are_drawn_again_on_screen(plan_file):
    """The table draws only the cells that changed: the edited mass and its stage's total
    show on the screen, after the focus went to the edit bar and back, and after undo."""

    async def go():
        app = CryoplanApp(plan_file)
        async with app.run_test(size=(80, 24)) as pilot:
            await settled(app, pilot)
            # the demo plan's cold plate: 14 + 22 + 3.5 + 0.8 kg = 40.3 kg (its parts)
            assert "40.3 kg" in screen_row(app, "cold plate")
            await edit_cell(app, pilot, "p1.1", "mass", "30 kg")  # former: 22 kg -> 30 kg
            await settled(app, pilot)
            assert "30 kg" in screen_row(app, "former")
            assert "48.3 kg" in screen_row(app, "cold plate")  # 40.3 - 22 + 30
            await pilot.press("2", "1")  # another panel and back: the focus moves
            await pilot.pause()
            assert "30 kg" in screen_row(app, "former")
            await pilot.press("u")
            await settled(app, pilot)
            assert "22 kg" in screen_row(app, "former")
            assert "40.3 kg" in screen_row(app, "cold plate")

    run(go())


def test_key_line_follows_the_focus_and_takes_clicks(plan_file):
    async def go():
        app = CryoplanApp(plan_file)
        async with app.run_test(size=(80, 24)) as pilot:
            await settled(app, pilot)
            keys = app.screen_text().split("\n")[-1]
            assert "enter Edit" in keys and "m Material" in keys and "q Quit" in keys
            put_cursor(app, "p1.1", "mass")
            await pilot.press("enter")
            await pilot.pause()
            assert "esc Cancel" in app.screen_text().split("\n")[-1]
            await pilot.press("escape")
            await pilot.pause()
            keys = app.screen_text().split("\n")[-1]
            assert "esc Cancel" not in keys and "enter Edit" in keys
            await pilot.click("#keys", offset=(keys.index("? Help") + 2, 0))
            await pilot.pause()
            assert type(app.screen).__name__ == "HelpScreen"

    run(go())


def test_a_slow_evaluation_does_not_hold_the_screen(plan_file, monkeypatch):
    """The screen waits for new figures only HOLD_SECONDS; a slow evaluation (a cooldown
    simulation) leaves the edit drawn and the screen working meanwhile."""
    import cryoplan
    from cryoplan.tui import app as app_module

    async def go():
        app = CryoplanApp(plan_file)
        async with app.run_test(size=(80, 24)) as pilot:
            await settled(app, pilot)
            evaluate = cryoplan.evaluate

            def slow(plan):
                time.sleep(1.0)
                return evaluate(plan)

            monkeypatch.setattr(cryoplan, "evaluate", slow)
            await edit_cell(app, pilot, "p1.1", "mass", "30 kg")
            await pilot.pause(app_module.HOLD_SECONDS + 0.2)
            assert app.evaluating  # still computing ...
            screen = app.screen_text()
            assert "Mass set to 30 kg" in screen and "Mass of former" not in screen
            assert "30 kg" in screen_row(app, "former")  # ... and the edit is drawn
            await pilot.press("2")  # keys work meanwhile
            await pilot.pause()
            assert "[2 Budget]" in app.screen_text()
            await settled(app, pilot)

    run(go())


def test_no_redraws_while_idle():
    async def go():
        app = CryoplanApp(demo_plan_path(), bundled=True)
        async with app.run_test(size=(80, 24)) as pilot:
            await settled(app, pilot)
            await pilot.pause(0.1)
            drawn = []
            original = app._display
            app._display = lambda screen, update: (
                drawn.append(update is not None),
                original(screen, update),
            )
            await asyncio.sleep(0.6)  # longer than a cursor blink (0.5 s)
            await pilot.pause()
            assert not any(drawn), f"{sum(drawn)} redraws while idle"

    run(go())


# --- the document model on its own ----------------------------------------------------


def test_field_values_are_checked_before_the_plan():
    assert check_value("mass", "300 g") == "300 g"
    assert check_value("start", "  ") == ""  # no start of its own
    for kind, text, word in (
        ("mass", "10 kgs", "kgs"),
        ("mass", "4.2 K", "wrong kind"),
        ("mass", "-1 kg", "above zero"),
        ("temperature", "-3 K", "below"),
        ("name", "", "empty"),
    ):
        with pytest.raises(EditRejected) as info:
            check_value(kind, text)
        assert word in info.value.reason


def test_a_renamed_stage_is_renamed_where_the_plan_refers_to_it(plan_file):
    doc = PlanDocument.open(plan_file)
    doc.set_stage_field(1, "name", "mixing plate")
    text = doc.text
    assert 'stage = "mixing plate"' in text and '"cold plate"' not in text
    with pytest.raises(EditRejected):
        doc.set_stage_field(1, "name", "nitrogen shield")  # taken by the other stage


def test_add_and_remove_a_stage_in_the_document(plan_file):
    doc = PlanDocument.open(plan_file)
    plan = doc.add_stage()
    assert [s.name for s in doc.stages()][-1] == "new stage"
    assert any(s.name == "new stage" and not s.parts for s in plan.stages)
    doc.add_part(2, "copper")
    assert doc.stages()[2].parts[0].material == "copper"
    doc.remove_stage(2)
    assert doc.text == open(plan_file, encoding="utf-8").read()
    # the plan's baths and loads name the cold plate: removing it is refused, with the reason
    with pytest.raises(EditRejected) as info:
        doc.remove_stage(1)
    assert "cold plate" in info.value.reason
    assert not doc.dirty


# --- the command ----------------------------------------------------------------------


def test_open_command_and_template(tmp_path, monkeypatch):
    from cryoplan.cli import build_parser
    from cryoplan.commands.dashboard import create_from_template, plain_wanted

    parser = build_parser()
    assert "open" in parser._subparsers._group_actions[0].choices  # `cryoplan` alone opens
    args = parser.parse_args(["open", "--plain", "x.toml"])
    assert args.plain and args.plan == "x.toml"
    assert plain_wanted(False, {"CRYOPLAN_PLAIN": "1"})
    new = tmp_path / "new.toml"
    assert not create_from_template(str(new), confirm=lambda q: False)
    assert not new.exists()
    asked = []
    assert create_from_template(str(new), confirm=lambda q: asked.append(q) or True)
    assert "does not exist" in asked[0]
    from cryoplan.plan import load_plan

    assert load_plan(str(new)).title  # the template is a valid plan


# --- layout snapshots -----------------------------------------------------------------


def layout_of(text: str) -> str:
    """The screen with every digit made '#' and the inside of chart rows reduced to '~':
    what the snapshots compare, so that they catch changes of layout (the panels, tables,
    wrapping, the chart frames) while the physics modules' figures are tested elsewhere.
    Scroll-bar thumbs are left out: they move with the length of the text."""
    out = []
    for line in text.split("\n"):
        line = re.sub(r"\d", "#", line)
        line = re.sub("[\u2580-\u259f]", " ", line).rstrip()  # scroll-bar thumb ends
        chart_row = re.match(r"^( *[#.e+-]*[│|])(.*)$", line)
        if chart_row:
            line = chart_row.group(1) + ("~" if chart_row.group(2).strip() else "")
        out.append(line)
    return "\n".join(out)


@pytest.mark.parametrize("size", [(80, 24), (120, 40)])
def test_layout_snapshots(size):
    """The screen text of panels 1, 2 and 5 at two sizes, against reviewed snapshots."""

    async def go():
        shots = {}
        app = CryoplanApp(demo_plan_path(), bundled=True)
        async with app.run_test(size=size) as pilot:
            await settled(app, pilot)
            for n in (1, 2, 5):
                await pilot.press(str(n))
                await pilot.pause()
                shots[n] = app.screen_text()
            # survives a resize down to 80x24 and back
            await pilot.resize_terminal(60, 20)
            await pilot.pause()
            await pilot.resize_terminal(*size)
            await pilot.pause()
            await pilot.press("1")
            await pilot.pause()
            assert app.screen_text() == shots[1]
        return shots

    shots = run(go())
    width, height = size
    for n, text in shots.items():
        lines = text.split("\n")
        assert len(lines) == height and max(len(line) for line in lines) <= width
        name = os.path.join(SNAPSHOTS, f"panel{n}_{width}x{height}.txt")
        if UPDATE or not os.path.exists(name):
            os.makedirs(SNAPSHOTS, exist_ok=True)
            with open(name, "w", encoding="utf-8") as fh:
                fh.write(text + "\n")
            if not UPDATE:
                pytest.fail(f"wrote a new snapshot {name}: review it, then run again")
        with open(name, encoding="utf-8") as fh:
            assert layout_of(text + "\n") == layout_of(fh.read()), (
                f"the screen differs from {name}; if the change is right, rerun with "
                "CRYOPLAN_UPDATE_SNAPSHOTS=1 and review the diff"
            )


def test_every_example_opens():
    """Each bundled example evaluates in the dashboard without an error on screen."""

    async def go(path):
        app = CryoplanApp(path)
        async with app.run_test(size=(80, 24)) as pilot:
            await settled(app, pilot)
            assert app.data is not None

    for name in sorted(os.listdir(examples_dir())):
        if name.endswith(".toml"):
            run(go(os.path.join(examples_dir(), name)))


@pytest.mark.skipif(shutil.which("tmux") is None, reason="needs tmux")
def test_smoke_in_a_real_terminal(tmp_path):
    """`cryoplan open --plain` in a tmux pane of 80x24: the first screen, then q quits."""
    import subprocess
    import sys

    session = f"cryoplan-test-{os.getpid()}"
    env = dict(
        os.environ,
        PYTHONPATH=os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__)))),
    )
    command = f"{sys.executable} -m cryoplan open --plain; sleep 5"

    def tmux(*args):
        return subprocess.run(["tmux", *args], capture_output=True, text=True, env=env)

    assert (
        tmux("new-session", "-d", "-s", session, "-x", "80", "-y", "24", command).returncode == 0
    )
    try:
        screen = ""
        end = time.monotonic() + 20
        while time.monotonic() < end and "order" not in screen:
            time.sleep(0.2)
            screen = tmux("capture-pane", "-p", "-t", session).stdout
        assert "[1 Cold mass]" in screen and "order" in screen, screen
        assert "Traceback" not in screen and not FANCY.search(screen)
        tmux("send-keys", "-t", session, "q")
        end = time.monotonic() + 10
        while time.monotonic() < end and "Cold mass" in screen:
            time.sleep(0.2)
            screen = tmux("capture-pane", "-p", "-t", session).stdout
        assert "Cold mass" not in screen  # the dashboard closed and left the shell's screen
    finally:
        tmux("kill-session", "-t", session)


def test_saving_a_plan_that_is_a_symlink_saves_the_file_it_points_to(tmp_path):
    real_folder = tmp_path / "plans"
    real_folder.mkdir()
    real = real_folder / "bay3.toml"
    original = open(demo_plan_path(), encoding="utf-8").read()
    real.write_text(original, encoding="utf-8")
    link = tmp_path / "current.toml"
    link.symlink_to(real)

    async def go():
        app = CryoplanApp(str(link))
        async with app.run_test(size=(80, 24)) as pilot:
            await settled(app, pilot)
            for mass in ("25 kg", "26 kg"):  # two saves: two generations of backups
                await edit_cell(app, pilot, "p1.1", "mass", mass)
                await settled(app, pilot)
                await pilot.press("ctrl+s")
                await pilot.pause()
                assert "Saved" in str(app.query_one("#status").content)

    run(go())
    assert link.is_symlink() and os.readlink(link) == str(real)
    assert '"26 kg"' in real.read_text(encoding="utf-8")
    # the backups sit beside the real file: the file as opened, then the first save
    assert (real_folder / "bay3.toml.bak.1").read_text(encoding="utf-8") == original
    assert '"25 kg"' in (real_folder / "bay3.toml.bak").read_text(encoding="utf-8")
    assert sorted(os.listdir(tmp_path)) == ["current.toml", "plans"]
    assert sorted(os.listdir(real_folder)) == ["bay3.toml", "bay3.toml.bak", "bay3.toml.bak.1"]
