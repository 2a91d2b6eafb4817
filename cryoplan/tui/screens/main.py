"""The main screen of the dashboard: the widget tree, and the figures drawn into it.

The App owns the plan document and the evaluation's results; this screen is given them
(``show_results``) and draws them: the summary strip, the open panel (the others when they
are opened), the cold-mass and settings tables, the title and the status line. The open
panel is the reactive attribute ``panel``.
"""

from __future__ import annotations

import os
import time

from textual import events
from textual.app import ComposeResult
from textual.containers import Vertical
from textual.reactive import reactive
from textual.screen import Screen
from textual.widgets import ContentSwitcher, Input, Label, Static

from .. import panels as panel_map
from ..widgets import (
    ChartView,
    ColdMassTable,
    EditBar,
    Figures,
    KeyLine,
    PanelBar,
    ResultsPanel,
    SettingsTable,
    SummaryStrip,
    block_cells,
    summary_cells,
)

#: How long a changed figure stays marked [s].
MARK_SECONDS = 1.5


def room_caution(blocks) -> str:
    """The caution shown under the room figures: the printed budget's planning-aid notice."""
    for b in blocks or []:
        if type(b).__name__ == "Bullets":
            for item in b.items:
                if item.startswith("Planning aid: "):
                    notice = item[len("Planning aid: ") :]
                    return "Caution: " + notice + " Handling cautions: panel 6."
    return ""


def step_blocks(split) -> list:
    """The cooldown-steps table of the budget, shown under the cold mass."""
    for b in split.get("budget", []):
        if type(b).__name__ == "Table" and b.name == "steps":
            return [b]
    for b in split.get("budget", []):
        if type(b).__name__ == "Paragraph" and "cooler" in b.text:
            return [b]
    return []


class MainScreen(Screen):
    """The dashboard's screen: a change is drawn as soon as the screen is idle.

    Textual draws at the next slot of its frame timer, which after a long frame is up to
    two frames (33 ms at 60 frames a second) away even when nothing else is to be done;
    here the frame is drawn at once, never more often than that frame rate allows. An
    idle screen draws nothing, as before.
    """

    #: The shortest time between two frames drawn here [s] (Textual's frame rate).
    FRAME_SECONDS = 1 / 60
    #: Terminal height from which the cold-mass panel also shows the liquid chart.
    PLAN_CHART_HEIGHT = 34

    #: The open panel: an index into :data:`cryoplan.tui.panels.PANELS`.
    panel: reactive[int] = reactive(0, init=False)

    _last_frame = 0.0

    def __init__(self, **kwargs) -> None:
        super().__init__(**kwargs)
        self.cells: dict = {}  # every figure shown, by (panel, table, row, column)
        self.highlight: set = set()  # the figures that changed with the last evaluation
        self.mark_timer = None
        self._stale: set[str] = set()  # panels not yet drawn from the last evaluation

    async def _on_idle(self, event: events.Idle) -> None:
        try:
            due = (
                not self.app._batch_count
                and self.is_current
                and (
                    self._layout_required
                    or self._scroll_required
                    or self._repaint_required
                    or self._dirty_widgets
                )
            )
            now = time.perf_counter()
            if due and now - self._last_frame >= self.FRAME_SECONDS:
                self._last_frame = now
                self._on_timer_update()
        except AttributeError:  # another Textual: leave the drawing to its timer
            pass
        # Screen._on_idle runs next: it draws what is left, then runs the callbacks

    def compose(self) -> ComposeResult:
        yield Static("", id="title", markup=False)
        yield SummaryStrip("", id="summary", markup=False)
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
        self.app.main_mounted()

    # --- the panels ---------------------------------------------------------------------

    def watch_panel(self, index: int) -> None:
        key = panel_map.PANELS[index][0]
        self.paint_panel(key)
        self.query_one(ContentSwitcher).current = key
        self.query_one(PanelBar).active = index
        target = {"plan": "#coldmass", "room": "#room-figures", "budget": "#settings"}.get(
            key, f"#{key}"
        )
        self.query_one(target).focus()

    # --- the figures --------------------------------------------------------------------

    def show_results(self, data, blocks, mark: bool = False) -> None:
        """Show an evaluation's results; with ``mark``, the figures that changed stand out
        for :data:`MARK_SECONDS`."""
        split = panel_map.by_panel(blocks or [])
        cells: dict = {}
        for key, _ in panel_map.PANELS:
            cells.update(block_cells(split[key], key))
        cells.update(summary_cells(data))
        cells.update(block_cells(step_blocks(split), "plan"))
        if mark and self.cells:
            changed = {k for k, v in cells.items() if k in self.cells and self.cells[k] != v}
        else:
            changed = set()
        self.cells = cells
        self.highlight = changed
        with self.app.batch_update():
            self._paint(data, split)
        if self.mark_timer is not None:
            self.mark_timer.stop()
            self.mark_timer = None
        if changed:
            self.mark_timer = self.set_timer(MARK_SECONDS, self._unmark)

    def _unmark(self) -> None:
        self.mark_timer = None
        self.highlight = set()
        with self.app.batch_update():
            self._paint(self.app.data, panel_map.by_panel(self.app.blocks or []))

    def _paint(self, data, split) -> None:
        app = self.app
        plain, marked = app.plain, self.highlight
        if data is None:
            message = app.open_error or app.eval_error or "No figures yet."
            if app.plan is None and not app.open_error:
                message += "\n\nFix the plan file in an editor, then press f5 to reload it here."
            else:
                message += "\n\nu undoes the last edit."
            for key in ("budget-figures", "cold", "cooler", "notes"):
                self.query_one(f"#{key}", ResultsPanel).show([], marked, plain, message)
            self.query_one("#room-figures", ResultsPanel).show([], marked, plain, message)
            self.query_one("#room-cautions", Static).update("")
            self.query_one("#plan-steps", Figures).show([], "plan", marked, plain)
            self.query_one(SummaryStrip).show(None, self.size.width)
            return
        # only the open panel is drawn now; the others when they are opened
        self._stale = {"budget", "cold", "cooler", "room", "notes"}
        self.paint_panel(panel_map.PANELS[self.panel][0])
        self.query_one("#plan-steps", Figures).show(step_blocks(split), "plan", marked, plain)
        chart = next((b for b in split["budget"] if type(b).__name__ == "Chart"), None)
        self.query_one("#plan-chart", ChartView).set_chart(chart, plain)
        self.fit_plan_chart()
        self.query_one(SummaryStrip).show(data, self.app.size.width, marked)

    def paint_panel(self, key: str) -> None:
        """Draw one results panel from the last evaluation, if it is out of date."""
        data = self.app.data
        if key not in self._stale or data is None:
            return
        self._stale.discard(key)
        split = panel_map.by_panel(self.app.blocks or [])
        plain, marked = self.app.plain, self.highlight
        present = panel_map.present(data, key, split[key])
        blocks = split[key] if present else []
        if key == "room":
            self.query_one("#room-figures", ResultsPanel).show(
                blocks, marked, plain, panel_map.ABSENT["room"]
            )
            cautions = self.query_one("#room-cautions", Static)
            cautions.update(room_caution(self.app.blocks) if present else "")
            cautions.display = present
        else:
            target = "#budget-figures" if key == "budget" else f"#{key}"
            self.query_one(target, ResultsPanel).show(blocks, marked, plain, panel_map.ABSENT[key])

    def fit_plan_chart(self, height: int | None = None) -> None:
        """Use a tall terminal: the liquid chart under the cold mass, every plan setting."""
        chart = self.query_one("#plan-chart", ChartView)
        height = self.app.size.height if height is None else height
        tall = height >= self.PLAN_CHART_HEIGHT
        chart.display = chart.chart is not None and tall
        self.query_one(SettingsTable).styles.max_height = 16 if tall else 6

    def on_resize(self, event: events.Resize) -> None:
        self.fit_plan_chart(event.size.height)
        if self.app.data is not None:
            self.query_one(SummaryStrip).show(self.app.data, event.size.width, self.highlight)

    # --- the title, the status line and the tables ------------------------------------------

    def show_title(self) -> None:
        app = self.app
        doc = app.document
        name = os.path.basename(app.plan_path if doc is None else doc.path)
        title = (app.data or {}).get("plan", {}).get("title", "")
        flags = []
        if doc is not None and doc.dirty:
            flags.append("edited, not saved")
        if app.bundled:
            flags.append("demo")
        line = f"cryoplan  {name}" + (f"  [{', '.join(flags)}]" if flags else "")
        if title:
            line += f"  {title}"
        self.query_one("#title", Static).update(line, layout=False)

    def status(self, text: str) -> None:
        self.query_one("#status", Static).update(text, layout=False)

    def fill_cold_mass(self) -> None:
        table = self.query_one(ColdMassTable)
        doc = self.app.document
        if doc is None:
            table.clear()
            return
        from ...report.document import sig

        totals = {}  # each stage's mass, as the budget gives it
        for st in (self.app.data or {}).get("budget", {}).get("stages", []):
            totals[st["stage"]] = f"{sig(st['mass_kg'])} kg"
        table.fill(doc.stages(), totals, doc.cooldown_start())

    def fill_settings(self) -> None:
        if self.app.document is not None:
            self.query_one(SettingsTable).fill(self.app.document.settings())

    def show_plan(self) -> None:
        """The tables and the title after the document changed."""
        self.fill_cold_mass()
        self.fill_settings()
        self.show_title()

    # --- the edit bar ---------------------------------------------------------------------

    def open_edit_bar(self, label: str, value: str) -> None:
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

    def close_edit_bar(self, back_to: str) -> None:
        self.query_one(EditBar).display = False
        self.query_one(back_to).focus()

    def edit_reason(self, text: str, invalid: bool | None = None) -> None:
        """Say why an entry is refused (or how to go on); mark the entry when ``invalid``."""
        self.query_one("#edit-reason", Static).update(text)
        if invalid is not None:
            self.query_one("#edit-input", Input).set_class(invalid, "-invalid")
