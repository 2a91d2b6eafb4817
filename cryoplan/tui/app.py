"""The cryoplan dashboard: see and change the whole plan live, in a terminal.

Data flow: the plan file is opened as a :class:`~cryoplan.tui.editing.PlanDocument` (a
tomlkit document, so comments and key order survive a save). An edit is checked (the
field, then the whole plan) in the UI thread, which takes milliseconds; the evaluation and
the printed budget's blocks are built in a worker thread and come back as an
:class:`Evaluated` message; the panels then show those blocks. The dashboard computes no
physics of its own.

Nothing here runs on a repeating timer: the screen is redrawn when something changes, and
the only timer is a one-shot that ends the marking of changed figures.
"""

from __future__ import annotations

import gc
import os
import shutil
import subprocess
import time
from collections.abc import Callable
from dataclasses import dataclass
from typing import Any

from rich.text import Text
from textual import events, on
from textual.app import App, ComposeResult
from textual.binding import Binding
from textual.containers import Vertical
from textual.message import Message
from textual.widgets import ContentSwitcher, Input, Label, Static

from ..errors import CryoplanError, InputError, InputErrors
from . import panels as panel_map
from .editing import DiskChanged, EditRejected, PlanDocument, check_value
from .widgets import (
    CHANGED,
    ChartView,
    ColdMassTable,
    ConfirmScreen,
    DashboardScreen,
    EditBar,
    Figures,
    HelpScreen,
    KeyLine,
    MaterialPicker,
    PanelBar,
    PromptScreen,
    QuitScreen,
    ResultsPanel,
    SettingsTable,
    block_cells,
    use_plain_scrollbars,
)

#: How long a changed figure stays marked [s].
MARK_SECONDS = 1.5

#: After an accepted edit, how long the screen waits for the new figures, so that the
#: edit and the figures it changes are drawn in one frame instead of two [s]. A slower
#: evaluation (a cooldown simulation) is drawn when this has passed, then again with its
#: figures.
HOLD_SECONDS = 0.04

#: The short deferral that stands beside every oxygen figure.
OXYGEN_DEFERRAL = (
    "planning aid only: local codes, the site's safety office and licensed practice decide"
)


_heap_frozen = False


def _freeze_heap() -> None:
    """Leave what is alive once the first figures show (modules, fluid tables, widgets)
    out of later garbage collections, once a process: a full collection then looks at the
    objects made since, which keeps it from pausing an edit's redraw by tens of ms."""
    global _heap_frozen
    if not _heap_frozen:
        _heap_frozen = True
        gc.collect()
        gc.freeze()


@dataclass
class Editing:
    """The field in the edit bar: its kind (for the check while typing), how to apply a
    value to the document, and where the focus goes back to."""

    kind: str
    apply: Callable[[PlanDocument, str], Any]
    what: str
    back_to: str  # a selector


class Evaluated(Message):
    """The results of one evaluation, from the worker thread."""

    def __init__(
        self,
        generation: int,
        data: dict | None,
        blocks: list | None,
        error: str | None,
        seconds: float,
        materials=None,
    ) -> None:
        super().__init__()
        self.generation = generation
        self.data = data
        self.blocks = blocks
        self.error = error
        self.seconds = seconds
        self.materials = materials


class CryoplanApp(App):
    """The dashboard of one plan file.

    Parameters
    ----------
    path : str
        The plan file.
    plain : bool
        Plain characters only: no braille, no box drawing (for limited fonts).
    bundled : bool
        The plan is the bundled demo: saving asks for a file of the user's own.
    """

    CSS_PATH = "dashboard.tcss"
    ENABLE_COMMAND_PALETTE = False
    TITLE = "cryoplan"

    BINDINGS = [
        Binding("q", "quit_dashboard", "Quit"),
        Binding("question_mark,f1", "help", "Help", key_display="?"),
        Binding("ctrl+s", "save", "Save"),
        Binding("p", "print_budget", "Print"),
        Binding("u,ctrl+z", "undo", "Undo", key_display="u"),
        Binding("r,ctrl+y", "redo", "Redo", key_display="r", show=False),
        Binding("f5", "reload", "Reload", show=False),
        Binding("left_square_bracket", "step_panel(-1)", "Previous panel", show=False),
        Binding("right_square_bracket", "step_panel(1)", "Next panel", show=False),
    ] + [
        Binding(str(n + 1), f"panel({n})", title, show=False)
        for n, (_, title) in enumerate(panel_map.PANELS)
    ]

    def __init__(self, path: str, *, plain: bool = False, bundled: bool = False) -> None:
        super().__init__()
        self.plan_path = path
        self.plain = plain
        self.bundled = bundled
        self.document: PlanDocument | None = None
        self.open_error: str | None = None
        self.data: dict | None = None
        self.blocks: list | None = None
        self.materials: list[tuple[str, str]] = []
        self.generation = 0
        self.shown_generation = -1
        self.evaluating = False
        self.pending = False
        self.panel = 0
        self.editing: Editing | None = None  # the field in the edit bar
        self._plan = None  # the plan validated with the last accepted edit
        self._cells: dict = {}
        self._highlight: set = set()
        self._mark_timer = None
        self._hold = None  # the one-shot timer that ends a wait for new figures
        self._edit_started: float | None = None
        #: seconds from the last accepted edit to the redraw of its figures
        self.last_edit_seconds: float | None = None
        self.last_evaluation_seconds: float | None = None
        self.redraws = 0
        self.loaded = False  # the first evaluation has come back
        self._stale: set[str] = set()  # panels not yet drawn from the last evaluation
        self.eval_error: str | None = None
        #: wall-clock time of the first screen, and an event set at each redraw after an edit
        self.first_screen_time: float | None = None
        self.figures_time: float | None = None
        self.edit_redrawn = None

    # --- layout ---------------------------------------------------------------------

    def get_default_screen(self) -> DashboardScreen:
        return DashboardScreen(id="_default")

    def compose(self) -> ComposeResult:
        yield Static("", id="title", markup=False)
        yield Static("", id="summary", markup=False)
        yield PanelBar(id="panels", markup=False)
        with ContentSwitcher(initial="plan", id="switcher"):
            with Vertical(id="plan"):
                yield ColdMassTable(id="coldmass")
                yield Figures(id="plan-steps")
                yield ChartView(id="plan-chart")
            with Vertical(id="budget"):
                yield SettingsTable(id="settings")
                yield ResultsPanel("budget", id="budget-figures")
            yield ResultsPanel("cold", id="cold")
            yield ResultsPanel("cooler", id="cooler")
            with Vertical(id="room"):
                yield ResultsPanel("room", id="room-figures")
                yield Static("", id="room-cautions", markup=False)
            yield ResultsPanel("notes", id="notes")
        yield EditBar(id="editbar")
        yield Static("", id="status", markup=False)
        yield KeyLine(id="keys")

    def on_mount(self) -> None:
        import asyncio

        self.edit_redrawn = asyncio.Event()
        use_plain_scrollbars(self.plain)
        if self.plain:
            self.add_class("-plain")
        self.query_one(PanelBar).set_active(0)
        try:
            self.document = PlanDocument.open(self.plan_path)
        except CryoplanError as exc:
            self.open_error = str(exc)
        self._fill_cold_mass()
        self._fill_settings()
        self._show_title()
        self._status(
            "Reading the plan and evaluating ..." if self.document else self.open_error or ""
        )
        self.query_one(ColdMassTable).focus()
        # the heavy imports of the evaluation start once the first screen is drawn
        self.call_after_refresh(self._first_screen_drawn)

    def _first_screen_drawn(self) -> None:
        self.first_screen_time = time.time()
        if self.document is not None:
            self._evaluate(first=True)

    # --- evaluation in a worker -----------------------------------------------------

    def _evaluate(self, first: bool = False) -> None:
        """Evaluate the current text in a worker; at most one runs, the latest text wins."""
        if self.evaluating:
            self.pending = True
            return
        self.evaluating = True
        self.pending = False
        generation = self.generation
        text = self.document.text
        path = self.document.path
        plan = self._plan
        self.run_worker(
            lambda: self._evaluate_thread(generation, text, path, plan, first),
            thread=True,
            group="evaluate",
            exit_on_error=False,
        )

    def _evaluate_thread(self, generation, text, path, plan, first) -> None:
        start = time.perf_counter()
        data = blocks = error = materials = None
        try:
            import cryoplan

            from ..plan.reader import parse_plan
            from ..report.budget import build_document

            if plan is None:
                plan = parse_plan(text, path)
            data = cryoplan.evaluate(plan).to_dict()
            blocks = build_document(data)
            if first:
                from ..data.materials import material, material_ids

                materials = []
                for mid in material_ids():
                    try:
                        materials.append((mid, material(mid).name))
                    except CryoplanError:
                        continue
        except (InputError, InputErrors, CryoplanError) as exc:
            error = str(exc)
        except Exception as exc:  # never a traceback on the user's screen
            error = f"the evaluation failed: {exc.__class__.__name__}: {exc}"
        self.post_message(
            Evaluated(generation, data, blocks, error, time.perf_counter() - start, materials)
        )

    @on(Evaluated)
    def _evaluated(self, message: Evaluated) -> None:
        self.evaluating = False
        if message.materials is not None:
            self.materials = message.materials
        if self.pending or message.generation != self.generation:
            self._evaluate()  # a newer edit came in meanwhile: show that one
            if message.generation != self.generation:
                return
        self.last_evaluation_seconds = message.seconds
        self.loaded = True
        self.eval_error = message.error
        if message.error:
            self.data = self.blocks = None
            first_line = message.error.splitlines()[0]
            self._status(f"No figures: {first_line} (details in the panels)")
            self._show_results(None, None)
            self._release_frames()
            return
        first = self.data is None
        self.data, self.blocks = message.data, message.blocks
        self.shown_generation = message.generation
        self._show_results(self.data, self.blocks, mark=not first)
        self._fill_cold_mass()
        self._show_title()
        if first:
            self._status("Ready: enter edits the cell under the cursor; ? shows every key.")
            self.call_after_refresh(lambda: setattr(self, "figures_time", time.time()))
            self.call_after_refresh(_freeze_heap)
        if self._edit_started is not None:
            started, self._edit_started = self._edit_started, None
            self.call_after_refresh(self._redrawn, started)
        self._release_frames()

    def _hold_frames(self) -> None:
        """Draw nothing until the new figures are shown or HOLD_SECONDS have passed."""
        if self._hold is None:
            self._begin_batch()
            self._hold = self.set_timer(HOLD_SECONDS, self._release_frames)

    def _release_frames(self) -> None:
        if self._hold is not None:
            self._hold.stop()
            self._hold = None
            self._end_batch()

    def _redrawn(self, started: float) -> None:
        self.last_edit_seconds = time.perf_counter() - started
        if self.edit_redrawn is not None:
            self.edit_redrawn.set()

    # --- showing results ------------------------------------------------------------

    def _show_results(self, data, blocks, mark: bool = False) -> None:
        split = panel_map.by_panel(blocks or [])
        cells: dict = {}
        for key, _ in panel_map.PANELS:
            cells.update(block_cells(split[key], key))
        cells.update(self._summary_cells(data))
        cells.update(block_cells(self._step_blocks(split), "plan"))
        if mark and self._cells:
            changed = {k for k, v in cells.items() if k in self._cells and self._cells[k] != v}
        else:
            changed = set()
        self._cells = cells
        self._highlight = changed
        with self.batch_update():
            self._paint(data, split)
        if self._mark_timer is not None:
            self._mark_timer.stop()
            self._mark_timer = None
        if changed:
            self._mark_timer = self.set_timer(MARK_SECONDS, self._unmark)
        self.redraws += 1

    def _unmark(self) -> None:
        self._mark_timer = None
        self._highlight = set()
        with self.batch_update():
            self._paint(self.data, panel_map.by_panel(self.blocks or []))

    def _paint(self, data, split) -> None:
        plain, marked = self.plain, self._highlight
        if data is None:
            message = self.open_error or self.eval_error or "No figures yet."
            if self._plan is None and not self.open_error:
                message += "\n\nFix the plan file in an editor, then press f5 to reload it here."
            else:
                message += "\n\nu undoes the last edit."
            for key in ("budget-figures", "cold", "cooler", "notes"):
                self.query_one(f"#{key}", ResultsPanel).show([], marked, plain, message)
            self.query_one("#room-figures", ResultsPanel).show([], marked, plain, message)
            self.query_one("#room-cautions", Static).update("")
            self.query_one("#plan-steps", Figures).show([], "plan", marked, plain)
            self.query_one("#summary", Static).update("")
            return
        # only the open panel is drawn now; the others when they are opened
        self._stale = {"budget", "cold", "cooler", "room", "notes"}
        self._paint_panel(panel_map.PANELS[self.panel][0])
        self.query_one("#plan-steps", Figures).show(
            self._step_blocks(split), "plan", marked, plain
        )
        chart = next((b for b in split["budget"] if type(b).__name__ == "Chart"), None)
        self.query_one("#plan-chart", ChartView).set_chart(chart, plain)
        self._fit_plan_chart()
        summary = self._summary_text(data)
        shape = [len(line) for line in summary.plain.split("\n")]
        same = shape == getattr(self, "_summary_shape", None)
        self._summary_shape = shape
        self.query_one("#summary", Static).update(summary, layout=not same)

    def _paint_panel(self, key: str) -> None:
        """Draw one results panel from the last evaluation, if it is out of date."""
        if key not in self._stale or self.data is None:
            return
        self._stale.discard(key)
        data, split = self.data, panel_map.by_panel(self.blocks or [])
        plain, marked = self.plain, self._highlight
        present = panel_map.present(data, key, split[key])
        blocks = split[key] if present else []
        if key == "room":
            self.query_one("#room-figures", ResultsPanel).show(
                blocks, marked, plain, panel_map.ABSENT["room"]
            )
            cautions = self.query_one("#room-cautions", Static)
            cautions.update(self._room_caution() if present else "")
            cautions.display = present
        else:
            target = "#budget-figures" if key == "budget" else f"#{key}"
            self.query_one(target, ResultsPanel).show(blocks, marked, plain, panel_map.ABSENT[key])

    #: Terminal height from which the cold-mass panel also shows the liquid chart.
    PLAN_CHART_HEIGHT = 34

    def _fit_plan_chart(self, height: int | None = None) -> None:
        """Use a tall terminal: the liquid chart under the cold mass, every plan setting."""
        chart = self.query_one("#plan-chart", ChartView)
        height = self.size.height if height is None else height
        tall = height >= self.PLAN_CHART_HEIGHT
        chart.display = chart.chart is not None and tall
        self.query_one(SettingsTable).styles.max_height = 16 if tall else 6

    def on_resize(self, event: events.Resize) -> None:
        self._fit_plan_chart(event.size.height)
        if self.data is not None:
            self.query_one("#summary", Static).update(
                self._summary_text(self.data, event.size.width)
            )

    @staticmethod
    def _room_caution() -> str:
        from ..physics.oxygen import PLANNING_AID_NOTICE

        return "Caution: " + PLANNING_AID_NOTICE + " Handling cautions: panel 6."

    @staticmethod
    def _step_blocks(split) -> list:
        """The cooldown-steps table of the budget, shown under the cold mass."""
        for b in split.get("budget", []):
            if type(b).__name__ == "Table" and b.name == "steps":
                return [b]
        for b in split.get("budget", []):
            if type(b).__name__ == "Paragraph" and "cooler" in b.text:
                return [b]
        return []

    # --- the summary strip ----------------------------------------------------------

    def _summary_items(self, data) -> list[tuple[str, list[tuple[str, str]]]]:
        """(group, [(label, value)]) of the strip: one group per cryogen, then the rest."""
        from ..report.document import duration_h, energy, litres, money, sig

        s = data.get("summary", {}) if data else {}
        groups: list[tuple[str, list[tuple[str, str]]]] = []
        cryogens = list(dict.fromkeys(list(s.get("order_L", {})) + list(s.get("hold_time_h", {}))))
        for cry in cryogens:
            items = []
            if cry in s.get("order_L", {}):
                items.append(("order", f"{litres(s['order_L'][cry])} L"))
            if cry in s.get("cost", {}):
                items.append(("cost", money(s["cost"][cry], s.get("currency", ""))))
            if cry in s.get("static_boiloff_L_per_day", {}):
                items.append(("boil-off", f"{litres(s['static_boiloff_L_per_day'][cry])} L/day"))
            if cry in s.get("hold_time_h", {}):
                items.append(("hold", duration_h(s["hold_time_h"][cry])))
            groups.append((cry, items))
        rest = []
        if s.get("minimum_work_J") is not None:
            rest.append(
                (
                    "minimum work",
                    f"{energy(s['minimum_work_J'])} ({sig(s['minimum_work_J'] / 3.6e6)} kWh)",
                )
            )
        if s.get("cooldown_time_h") is not None:
            rest.append(("cooldown (cooler)", duration_h(s["cooldown_time_h"])))
        if s.get("lowest_oxygen_percent") is not None:
            rest.append(("lowest oxygen", f"{s['lowest_oxygen_percent']:.1f} %"))
        if rest:
            groups.append(("", rest))
        return groups

    def _summary_cells(self, data) -> dict:
        return {
            ("summary", g, label): value
            for g, items in self._summary_items(data)
            for label, value in items
        }

    def _summary_text(self, data, width: int | None = None) -> Text:
        """The summary strip, wrapped by hand so that a figure never parts from its unit
        or its label: one line or more per cryogen, then the rest."""
        width = max(20, (self.size.width if width is None else width) - 2)
        out = Text()
        line = 0  # length of the current line

        def put(piece: Text, gap: str) -> None:
            nonlocal line
            if line and line + len(gap) + len(piece) > width:
                out.append("\n")
                line = 0
            elif line:
                out.append(gap)
                line += len(gap)
            out.append_text(piece)
            line += len(piece)

        for n, (group, items) in enumerate(self._summary_items(data)):
            if n:
                out.append("\n")
                line = 0
            for k, (label, value) in enumerate(items):
                piece = Text()
                if group and k == 0:
                    piece.append(f"{group}: ", style="bold")
                style = CHANGED if ("summary", group, label) in self._highlight else "bold"
                piece.append(f"{label} ")
                piece.append(value, style=style)
                put(piece, "  ")
                if label == "lowest oxygen":
                    words = f"({OXYGEN_DEFERRAL})".split(" ")
                    for word in words:
                        put(Text(word), " ")
        return out

    def _show_title(self) -> None:
        doc = self.document
        name = os.path.basename(self.plan_path if doc is None else doc.path)
        title = (self.data or {}).get("plan", {}).get("title", "")
        flags = []
        if doc is not None and doc.dirty:
            flags.append("edited, not saved")
        if self.bundled:
            flags.append("demo")
        line = f"cryoplan  {name}" + (f"  [{', '.join(flags)}]" if flags else "")
        if title:
            line += f"  {title}"
        self.query_one("#title", Static).update(line, layout=False)

    def _status(self, text: str) -> None:
        self.query_one("#status", Static).update(text, layout=False)

    # --- the cold-mass editor -------------------------------------------------------

    def _fill_cold_mass(self) -> None:
        table = self.query_one(ColdMassTable)
        if self.document is None:
            table.clear()
            return
        from ..report.document import sig

        totals = {}  # each stage's mass, as the budget gives it
        for st in (self.data or {}).get("budget", {}).get("stages", []):
            totals[st["stage"]] = f"{sig(st['mass_kg'])} kg"
        table.fill(self.document.stages(), totals, self.document.cooldown_start())

    def _row(self, row_key: str) -> tuple[str, int, int | None]:
        """('stage', i, None) or ('part', i, j) from a row key."""
        if row_key.startswith("s"):
            return "stage", int(row_key[1:]), None
        i, j = row_key[1:].split(".")
        return "part", int(i), int(j)

    @on(ColdMassTable.EditRequested)
    def _edit_requested(self, message: ColdMassTable.EditRequested) -> None:
        if self.document is None:
            self._status(self.open_error or "No plan is open.")
            return
        if self._plan is None and self.data is None:
            self._status(
                "The plan has problems (see the panels): fix the file, then f5."
                if self.loaded
                else "Still evaluating the plan; edit in a moment."
            )
            return
        action, row, column = message.action, message.row, message.column
        if action == "add_stage":
            self._apply(lambda d: d.add_stage(), "Stage added: edit its name and temperature.")
            return
        if not row:
            return
        kind, i, j = self._row(row)
        if action == "add_part":
            self._pick_material(
                "",
                lambda mid: self._apply(
                    lambda d: d.add_part(i, mid), f"Part of {mid} added: edit its name and mass."
                ),
            )
            return
        if action == "remove":
            if kind == "part":
                self._apply(lambda d: d.remove_part(i, j), "Part removed (u undoes it).")
            else:
                self._apply(lambda d: d.remove_stage(i), "Stage removed (u undoes it).")
            return
        if action == "material" or column == "material":
            if kind != "part":
                self._status("A stage has no material: pick one of its parts.")
                return
            current = self.document.stages()[i].parts[j].material
            self._pick_material(
                current,
                lambda mid: self._apply(
                    lambda d: d.set_part_field(i, j, "material", mid), f"Material: {mid}."
                ),
            )
            return
        self._open_edit_bar(kind, i, j, column)

    def _pick_material(self, current: str, then) -> None:
        if not self.materials:
            self._status("The material list is still loading; try again in a moment.")
            return

        def picked(mid: str | None) -> None:
            if mid:
                then(mid)

        self.push_screen(MaterialPicker(self.materials, current), picked)

    def _open_edit_bar(self, kind: str, i: int, j: int | None, column: str) -> None:
        stages = self.document.stages()
        if kind == "stage":
            if column not in ("name", "temperature"):
                self._status("For a stage, edit its name or its temperature.")
                return
            st = stages[i]
            value = st.name if column == "name" else st.temperature
            what = f"{'Name' if column == 'name' else 'Temperature'} of stage {st.name}:"
            field_kind = "name" if column == "name" else "temperature"

            def apply(d, text):
                return d.set_stage_field(i, column, text)

        else:
            if column not in ("name", "mass", "start"):
                self._status("For a part, edit its name, material, mass or start.")
                return
            p = stages[i].parts[j]
            value = {"name": p.name, "mass": p.mass, "start": p.start}[column]
            what = {
                "name": f"Name of part {p.name}:",
                "mass": f"Mass of {p.name}:",
                "start": f"Start of {p.name} (empty: cooldown start):",
            }[column]
            field_kind = column

            def apply(d, text):
                return d.set_part_field(i, j, column, text)

        self._start_editing(Editing(field_kind, apply, column, "#coldmass"), what, value)

    def _start_editing(self, editing: Editing, label: str, value: str) -> None:
        self.editing = editing
        bar = self.query_one(EditBar)
        bar.display = True
        bar.query_one("#edit-label", Label).update(label)
        entry = bar.query_one("#edit-input", Input)
        entry.value = value
        entry.remove_class("-invalid")
        bar.query_one("#edit-reason", Static).update(
            "enter: apply   escape: cancel   units as you like: 22 kg, 300 g, 4.2 K, 20 degC"
        )
        entry.focus()

    def _close_edit_bar(self) -> None:
        back_to = self.editing.back_to if self.editing else "#coldmass"
        self.editing = None
        bar = self.query_one(EditBar)
        bar.display = False
        self.query_one(back_to).focus()

    @on(SettingsTable.EditRequested)
    def _setting_requested(self, message: SettingsTable.EditRequested) -> None:
        if self.document is None or (self._plan is None and self.data is None):
            self._status("The plan is not ready for editing (see the panels).")
            return
        row = next((r for r in self.document.settings() if r.key == message.key), None)
        if row is None:
            return

        def apply(d, text, key=row.key):
            now = next(r for r in d.settings() if r.key == key)
            return d.set_setting(now, text)

        hint = {"volumes": " (sizes, comma-separated)", "fraction": " (0 to 1, or %)"}
        self._start_editing(
            Editing(row.kind, apply, row.label, "#settings"),
            f"{row.label.capitalize()}{hint.get(row.kind, '')}:",
            row.value,
        )

    def _fill_settings(self) -> None:
        if self.document is not None:
            self.query_one(SettingsTable).fill(self.document.settings())

    @on(EditBar.Cancelled)
    def _edit_cancelled(self) -> None:
        self._close_edit_bar()
        self._status("Edit cancelled; the value is unchanged.")

    @on(Input.Changed, "#edit-input")
    def _edit_typed(self, event: Input.Changed) -> None:
        """Mark a bad entry at once, while it is typed."""
        if self.editing is None:
            return
        field_kind = self.editing.kind
        reason = self.query_one("#edit-reason", Static)
        try:
            check_value(field_kind, event.value)
        except EditRejected as exc:
            event.input.add_class("-invalid")
            reason.update(("! " if self.plain else "✗ ") + exc.reason)
            return
        event.input.remove_class("-invalid")
        reason.update("enter: apply   escape: cancel")

    @on(Input.Submitted, "#edit-input")
    def _edit_submitted(self, event: Input.Submitted) -> None:
        if self.editing is None:
            return
        editing, value = self.editing, event.value

        def change(d):
            return editing.apply(d, value)

        done = f"{editing.what.capitalize()} set to {value.strip() or 'the default'}."
        if self._apply(change, done):
            self._close_edit_bar()
        else:
            event.input.add_class("-invalid")

    def _apply(self, change, done: str) -> bool:
        """Apply an edit to the document; re-evaluate; False (reason shown) if refused."""
        started = time.perf_counter()
        try:
            plan = change(self.document)
        except EditRejected as exc:
            mark = "! " if self.plain else "✗ "
            if self.editing is not None:
                self.query_one("#edit-reason", Static).update(
                    f"{mark}{exc.reason} (the last good value stays)"
                )
            self._status(f"Not applied: {exc.reason}")
            return False
        self._accepted(plan, done, started)
        return True

    def _accepted(self, plan, done: str, started: float | None = None) -> None:
        self._plan = plan
        self.generation += 1
        self._edit_started = time.perf_counter() if started is None else started
        self._fill_cold_mass()
        self._fill_settings()
        self._show_title()
        self._status(done)
        self._hold_frames()
        self._evaluate()

    # --- undo, redo, reload ---------------------------------------------------------

    def _after_history(self, moved: bool, what: str) -> None:
        if not moved:
            self._status(f"Nothing to {what}.")
            return
        try:
            plan = self.document.validate()
        except (InputError, InputErrors) as exc:  # pragma: no cover - history was valid
            self._status(str(exc))
            return
        self._accepted(plan, "Undone." if what == "undo" else "Redone.")

    def action_undo(self) -> None:
        if self.document is not None:
            self._after_history(self.document.undo(), "undo")

    def action_redo(self) -> None:
        if self.document is not None:
            self._after_history(self.document.redo(), "redo")

    def action_reload(self) -> None:
        def go(yes: bool) -> None:
            if not yes:
                return
            try:
                self.document = PlanDocument.open(
                    self.document.path if self.document else self.plan_path
                )
                self.open_error = None
            except CryoplanError as exc:
                self.open_error = str(exc)
                self._status(self.open_error)
                return
            self._plan = None
            self.generation += 1
            self._fill_cold_mass()
            self._fill_settings()
            self._show_title()
            self._status("Reloaded from disk.")
            self._evaluate()

        if self.document is not None and self.document.dirty:
            self.push_screen(
                ConfirmScreen(
                    "Reload the plan from disk and lose the unsaved edits?",
                    "reload",
                    "keep editing",
                ),
                go,
            )
        else:
            go(True)

    # --- panels -----------------------------------------------------------------------

    def action_panel(self, index: int) -> None:
        self.panel = index
        key = panel_map.PANELS[index][0]
        self._paint_panel(key)
        self.query_one(ContentSwitcher).current = key
        self.query_one(PanelBar).set_active(index)
        target = {"plan": "#coldmass", "room": "#room-figures", "budget": "#settings"}.get(
            key, f"#{key}"
        )
        self.query_one(target).focus()

    def action_step_panel(self, step: int) -> None:
        self.action_panel((self.panel + step) % len(panel_map.PANELS))

    def action_help(self) -> None:
        self.push_screen(HelpScreen())

    # --- saving -----------------------------------------------------------------------

    def action_save(self, then=None) -> None:
        doc = self.document
        if doc is None:
            return
        if self.bundled:
            default = os.path.join(os.getcwd(), os.path.basename(doc.path))

            def chosen(path: str | None) -> None:
                if path:
                    self.bundled = False
                    self._save(os.path.abspath(os.path.expanduser(path)), then=then)

            self.push_screen(
                PromptScreen("This is the bundled demo plan. Save your copy as:", default), chosen
            )
            return
        self._save(None, then=then)

    def _save(self, path: str | None, overwrite: bool = False, then=None) -> None:
        doc = self.document
        try:
            written = doc.save(path, overwrite=overwrite)
        except DiskChanged:

            def answer(yes: bool) -> None:
                if yes:
                    self._save(path, overwrite=True, then=then)
                else:
                    self._status("Not saved: the file on disk was left as it is.")

            self.push_screen(
                ConfirmScreen(
                    f"{os.path.basename(doc.path)} changed on disk since it was opened. "
                    "Overwrite it with the dashboard's version? (What is on disk now is kept "
                    "as the .bak file.)",
                    "overwrite",
                    "do not save",
                ),
                answer,
            )
            return
        except CryoplanError as exc:
            self._status(f"Not saved: {exc}")
            return
        self.plan_path = written
        self._show_title()
        backup = doc.backup_path(written)
        kept = (
            f"; the previous file is {os.path.basename(backup)}" if os.path.exists(backup) else ""
        )
        self._status(f"Saved {written}{kept}.")
        if then is not None:
            then()

    # --- printing ---------------------------------------------------------------------

    def action_print_budget(self) -> None:
        if self.data is None:
            self._status("Nothing to print yet: the plan has not evaluated.")
            return
        doc = self.document
        stem = os.path.splitext(os.path.basename(doc.path))[0]
        folder = os.getcwd() if self.bundled else os.path.dirname(os.path.abspath(doc.path))
        default = os.path.join(folder, f"{stem}-budget.txt")
        self.push_screen(
            PromptScreen("Write the printed budget (text) to:", default), self._print_to
        )

    def _print_to(self, path: str | None) -> None:
        if not path:
            return
        from ..files import write_file
        from ..report import render

        path = os.path.abspath(os.path.expanduser(path))
        try:
            write_file(path, render(self.data, "text"))
        except CryoplanError as exc:
            self._status(f"Not written: {exc}")
            return
        command = next((c for c in ("lp", "lpr") if shutil.which(c)), None)
        if command is None:
            self._status(
                f"Budget written to {path}. No print command (lp or lpr) found on this system."
            )
            return

        def answer(yes: bool) -> None:
            if not yes:
                self._status(f"Budget written to {path}; not sent to the printer.")
                return
            self._status(f"Sending {os.path.basename(path)} to the printer with {command} ...")
            self.run_worker(
                lambda: self._print_thread(command, path),
                thread=True,
                group="print",
                exit_on_error=False,
            )

        self.push_screen(
            ConfirmScreen(
                f"Budget written to {path}. Send it to the printer with `{command}`?",
                "print",
                "do not print",
            ),
            answer,
        )

    def _print_thread(self, command: str, path: str) -> None:
        try:
            done = subprocess.run(
                [shutil.which(command) or command, path],
                capture_output=True,
                text=True,
                timeout=60,
                check=False,
            )
            if done.returncode == 0:
                text = f"Sent to the printer: {(done.stdout or '').strip() or path}"
            else:
                text = f"{command} failed: {(done.stderr or done.stdout).strip()}"
        except (OSError, subprocess.SubprocessError) as exc:
            text = f"{command} failed: {exc}"
        self.call_from_thread(self._status, text)

    # --- quitting ---------------------------------------------------------------------

    def action_quit_dashboard(self) -> None:
        if self.document is None or not self.document.dirty:
            self.exit(0)
            return

        def answer(choice: str) -> None:
            if choice == "save":
                self.action_save(then=lambda: self.exit(0))
            elif choice == "discard":
                self.exit(0)

        self.push_screen(QuitScreen(os.path.basename(self.document.path)), answer)

    # --- for tests and the benchmark --------------------------------------------------

    def screen_text(self) -> str:
        """The characters on the screen now, one line per row (no colours)."""
        import io

        from rich.console import Console

        width, height = self.size
        console = Console(
            width=width,
            height=height,
            file=io.StringIO(),
            record=True,
            color_system=None,
            legacy_windows=False,
            force_terminal=True,
            safe_box=False,
        )
        update = self.screen._compositor.render_update(
            full=True, screen_stack=self._background_screens
        )
        console.print(update)
        text = console.export_text(styles=False)
        lines = text.split("\n")[:height]
        return "\n".join(line.rstrip() for line in lines)

    def figures(self) -> dict[Any, str]:
        """Every figure shown, by (panel, table, row, column): for tests."""
        return dict(self._cells)
