"""The cryoplan dashboard: see and change the whole plan live, in a terminal.

Data flow: the plan file is opened as a :class:`~cryoplan.tui.editing.PlanDocument` (a
tomlkit document, so comments and key order survive a save). An edit is checked (the
field, then the whole plan) in the UI thread, which takes milliseconds; the evaluation and
the printed budget's blocks are built in a worker (:mod:`cryoplan.tui.worker`) and come
back as an :class:`~cryoplan.tui.worker.Evaluated` message; the main screen
(:mod:`cryoplan.tui.screens.main`) then shows those blocks. The dashboard computes no
physics of its own.

The App holds the document and the results, maps keys to actions (``BINDINGS``) and
answers the messages the widgets post up (an edit asked for, an entry typed or cancelled).

Nothing here runs on a repeating timer: the screen is redrawn when something changes, and
the only timer is a one-shot that ends the marking of changed figures.
"""

from __future__ import annotations

import os
import shutil
import subprocess
import time
from collections.abc import Callable
from dataclasses import dataclass
from typing import Any

from textual import on
from textual.app import App
from textual.binding import Binding
from textual.widgets import Input

from ..errors import CryoplanError, InputError, InputErrors
from . import panels as panel_map
from .editing import DiskChanged, EditRejected, PlanDocument, check_value
from .screens import (
    ConfirmScreen,
    FileChangedScreen,
    HelpScreen,
    MainScreen,
    MaterialPicker,
    PromptScreen,
    QuitScreen,
)
from .widgets import ColdMassTable, EditBar, SettingsTable, use_plain_scrollbars
from .worker import Evaluated, evaluate_text, freeze_heap

#: After an accepted edit, how long the screen waits for the new figures, so that the
#: edit and the figures it changes are drawn in one frame instead of two [s]. A slower
#: evaluation (a cooldown simulation) is drawn when this has passed, then again with its
#: figures.
HOLD_SECONDS = 0.04


@dataclass
class Editing:
    """The field in the edit bar: its kind (for the check while typing), how to apply a
    value to the document, and where the focus goes back to."""

    kind: str
    apply: Callable[[PlanDocument, str], Any]
    what: str
    back_to: str  # a selector


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
        self.editing: Editing | None = None  # the field in the edit bar
        self.plan = None  # the plan validated with the last accepted edit
        self.main = MainScreen(id="_default")
        self._hold = None  # the one-shot timer that ends a wait for new figures
        self._edit_started: float | None = None
        #: seconds from the last accepted edit to the redraw of its figures
        self.last_edit_seconds: float | None = None
        self.last_evaluation_seconds: float | None = None
        self.redraws = 0
        self.loaded = False  # the first evaluation has come back
        self.eval_error: str | None = None
        #: wall-clock time of the first screen, and an event set at each redraw after an edit
        self.first_screen_time: float | None = None
        self.figures_time: float | None = None
        self.edit_redrawn = None

    # --- layout ---------------------------------------------------------------------

    def get_default_screen(self) -> MainScreen:
        return self.main

    def on_mount(self) -> None:
        import asyncio

        self.edit_redrawn = asyncio.Event()
        use_plain_scrollbars(self.plain)
        if self.plain:
            self.add_class("-plain")
        self._open()

    def _open(self) -> None:
        if self.document is None and self.open_error is None:
            try:
                self.document = PlanDocument.open(self.plan_path)
            except CryoplanError as exc:
                self.open_error = str(exc)

    def main_mounted(self) -> None:
        """The main screen's widgets exist: fill them, then evaluate once drawn."""
        self._open()
        self.main.show_plan()
        self.main.status(
            "Reading the plan and evaluating ..." if self.document else self.open_error or ""
        )
        self.main.query_one(ColdMassTable).focus()
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
        plan = self.plan
        self.run_worker(
            lambda: self.post_message(evaluate_text(generation, text, path, plan, first)),
            thread=True,
            group="evaluate",
            exit_on_error=False,
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
            self.main.status(f"No figures: {first_line} (details in the panels)")
            self.main.show_results(None, None)
            self.redraws += 1
            self._release_frames()
            return
        first = self.data is None
        self.data, self.blocks = message.data, message.blocks
        self.shown_generation = message.generation
        self.main.show_results(self.data, self.blocks, mark=not first)
        self.redraws += 1
        self.main.fill_cold_mass()
        self.main.show_title()
        if first:
            self.main.status("Ready: enter edits the cell under the cursor; ? shows every key.")
            self.call_after_refresh(lambda: setattr(self, "figures_time", time.time()))
            self.call_after_refresh(freeze_heap)
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

    def _row(self, row_key: str) -> tuple[str, int, int | None]:
        """('stage', i, None) or ('part', i, j) from a row key."""
        if row_key.startswith("s"):
            return "stage", int(row_key[1:]), None
        i, j = row_key[1:].split(".")
        return "part", int(i), int(j)

    @on(ColdMassTable.EditRequested)
    def _edit_requested(self, message: ColdMassTable.EditRequested) -> None:
        if self.document is None:
            self.main.status(self.open_error or "No plan is open.")
            return
        if self.plan is None and self.data is None:
            self.main.status(
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
                self.main.status("A stage has no material: pick one of its parts.")
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
            self.main.status("The material list is still loading; try again in a moment.")
            return

        def picked(mid: str | None) -> None:
            if mid:
                then(mid)

        self.push_screen(MaterialPicker(self.materials, current), picked)

    def _open_edit_bar(self, kind: str, i: int, j: int | None, column: str) -> None:
        stages = self.document.stages()
        if kind == "stage":
            if column not in ("name", "temperature"):
                self.main.status("For a stage, edit its name or its temperature.")
                return
            st = stages[i]
            value = st.name if column == "name" else st.temperature
            what = f"{'Name' if column == 'name' else 'Temperature'} of stage {st.name}:"
            field_kind = "name" if column == "name" else "temperature"

            def apply(d, text):
                return d.set_stage_field(i, column, text)

        else:
            if column not in ("name", "mass", "start"):
                self.main.status("For a part, edit its name, material, mass or start.")
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
        self.main.open_edit_bar(label, value)

    def _close_edit_bar(self) -> None:
        back_to = self.editing.back_to if self.editing else "#coldmass"
        self.editing = None
        self.main.close_edit_bar(back_to)

    @on(SettingsTable.EditRequested)
    def _setting_requested(self, message: SettingsTable.EditRequested) -> None:
        if self.document is None or (self.plan is None and self.data is None):
            self.main.status("The plan is not ready for editing (see the panels).")
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

    @on(EditBar.Cancelled)
    def _edit_cancelled(self) -> None:
        self._close_edit_bar()
        self.main.status("Edit cancelled; the value is unchanged.")

    @on(Input.Changed, "#edit-input")
    def _edit_typed(self, event: Input.Changed) -> None:
        """Mark a bad entry at once, while it is typed."""
        if self.editing is None:
            return
        try:
            check_value(self.editing.kind, event.value)
        except EditRejected as exc:
            self.main.edit_reason(("! " if self.plain else "✗ ") + exc.reason, invalid=True)
            return
        self.main.edit_reason("enter: apply   escape: cancel", invalid=False)

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
                self.main.edit_reason(f"{mark}{exc.reason} (the last good value stays)")
            self.main.status(f"Not applied: {exc.reason}")
            return False
        self._accepted(plan, done, started)
        return True

    def _accepted(self, plan, done: str, started: float | None = None) -> None:
        self.plan = plan
        self.generation += 1
        self._edit_started = time.perf_counter() if started is None else started
        self.main.show_plan()
        self.main.status(done)
        self._hold_frames()
        self._evaluate()

    # --- undo, redo, reload ---------------------------------------------------------

    def _after_history(self, moved: bool, what: str) -> None:
        if not moved:
            self.main.status(f"Nothing to {what}.")
            return
        try:
            plan = self.document.validate()
        except (InputError, InputErrors) as exc:  # pragma: no cover - history was valid
            self.main.status(str(exc))
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
                self.main.status(self.open_error)
                return
            self.plan = None
            self.generation += 1
            self.main.show_plan()
            self.main.status("Reloaded from disk.")
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
        self.main.panel = index

    def action_step_panel(self, step: int) -> None:
        self.action_panel((self.main.panel + step) % len(panel_map.PANELS))

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
                    self.main.status("Not saved: the file on disk was left as it is.")

            self.push_screen(FileChangedScreen(os.path.basename(doc.path)), answer)
            return
        except CryoplanError as exc:
            self.main.status(f"Not saved: {exc}")
            return
        self.plan_path = written
        self.main.show_title()
        backup = doc.backup_path(written)
        kept = (
            f"; the previous file is {os.path.basename(backup)}" if os.path.exists(backup) else ""
        )
        self.main.status(f"Saved {written}{kept}.")
        if then is not None:
            then()

    # --- printing ---------------------------------------------------------------------

    def action_print_budget(self) -> None:
        if self.data is None:
            self.main.status("Nothing to print yet: the plan has not evaluated.")
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
            self.main.status(f"Not written: {exc}")
            return
        command = next((c for c in ("lp", "lpr") if shutil.which(c)), None)
        if command is None:
            self.main.status(
                f"Budget written to {path}. No print command (lp or lpr) found on this system."
            )
            return

        def answer(yes: bool) -> None:
            if not yes:
                self.main.status(f"Budget written to {path}; not sent to the printer.")
                return
            self.main.status(f"Sending {os.path.basename(path)} to the printer with {command} ...")
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
        self.call_from_thread(self.main.status, text)

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
        return dict(self.main.cells)
