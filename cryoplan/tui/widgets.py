"""Widgets of the dashboard: the panel bar, figures from report blocks, terminal charts,
the cold-mass editor, the edit bar and the dialogs.

Figures come from the printed budget's blocks (:mod:`cryoplan.report.document`); these
widgets only lay them out. Nothing here animates or refreshes on a timer: a widget redraws
when its content changes, and not otherwise.
"""

from __future__ import annotations

import time

from rich import box
from rich.console import Group
from rich.table import Table as RichTable
from rich.text import Text
from textual import events, on
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical, VerticalScroll
from textual.message import Message
from textual.screen import ModalScreen, Screen
from textual.scrollbar import ScrollBar, ScrollBarRender
from textual.widget import Widget
from textual.widgets import DataTable, Input, Label, OptionList, Static
from textual.widgets.option_list import Option

from ..report.document import Paragraph
from .charts import draw_chart, wrap_legend
from .panels import PANELS

#: A table header rule drawn with plain characters.
PLAIN_BOX = box.Box("    \n    \n -- \n    \n    \n    \n    \n    \n", ascii=True)
#: Style of a figure that changed in the last evaluation (readable without colour).
CHANGED = "reverse bold"
#: Colours of chart series (dropped in monochrome; the numbers and marks remain).
SERIES_COLOURS = ["cyan", "yellow", "magenta", "green", "red", "blue", "bright_white"]


# --- figures from report blocks -------------------------------------------------------


def _kind(block) -> str:
    return type(block).__name__


def block_cells(blocks, prefix: str) -> dict[tuple, str]:
    """Every figure of ``blocks`` by a stable key (table, row label, column), to find
    the figures that changed between two evaluations."""
    cells: dict[tuple, str] = {}
    for n, b in enumerate(blocks):
        kind = _kind(b)
        if kind == "Table":
            tkey = b.name or b.title or f"table {n}"
            for r, row in enumerate(b.rows):
                label = row[0] if row else str(r)
                for h, value in zip(b.headers[1:], row[1:]):
                    cells[(prefix, tkey, label, h)] = str(value)
        elif kind == "Paragraph":
            cells[(prefix, "p", n)] = b.text
        elif kind == "Bullets":
            for i, item in enumerate(b.items):
                cells[(prefix, "b", n, i)] = item
    return cells


def shape_of(blocks) -> tuple:
    """The lengths of every text of ``blocks``: equal shapes lay out on equal lines."""
    out = []
    for b in blocks:
        kind = _kind(b)
        if kind == "Table":
            out.append(
                (
                    b.title,
                    tuple(b.headers),
                    tuple(tuple(len(str(c)) for c in row) for row in b.rows),
                )
            )
        elif kind == "Bullets":
            out.append(tuple(len(item) for item in b.items))
        elif kind in ("Paragraph", "Heading"):
            out.append((kind, len(b.text)))
        else:
            out.append(kind)
    return tuple(out)


def render_table(b, prefix: str, highlight: set, plain: bool, n: int = 0) -> RichTable:
    """A report Table block as a Rich table; cells in ``highlight`` stand out."""
    align = b.align or ("l" + "r" * (len(b.headers) - 1))
    table = RichTable(
        title=Text(b.title, style="italic") if b.title else None,
        title_justify="left",
        box=PLAIN_BOX if plain else box.SIMPLE_HEAD,
        show_edge=False,
        pad_edge=False,
        collapse_padding=True,
        header_style="bold",
        expand=False,
    )
    for h, a in zip(b.headers, align):
        table.add_column(
            h, justify="left" if a == "l" else "right", no_wrap=a != "l", overflow="fold"
        )
    tkey = b.name or b.title or f"table {n}"
    for r, row in enumerate(b.rows):
        label = row[0] if row else str(r)
        cells = []
        for c, value in enumerate(row):
            style = ""
            if c > 0 and (prefix, tkey, label, b.headers[c]) in highlight:
                style = CHANGED
            cells.append(Text(str(value), style=style))
        table.add_row(*cells)
    return table


def render_blocks(blocks, prefix: str, highlight: set, plain: bool):
    """Headings, tables, paragraphs and bullets as one Rich renderable (charts excluded)."""
    parts: list = []
    for n, b in enumerate(blocks):
        kind = _kind(b)
        if kind == "Heading":
            if parts:
                parts.append(Text(""))
            style = "bold underline" if b.level == 1 else "bold"
            parts.append(Text(b.text, style=style))
        elif kind == "Table":
            parts.append(Text(""))
            parts.append(render_table(b, prefix, highlight, plain, n))
        elif kind == "Paragraph":
            style = CHANGED if (prefix, "p", n) in highlight else ""
            parts.append(Text(""))
            parts.append(Text(b.text, style=style))
        elif kind == "Bullets":
            grid = RichTable.grid(padding=(0, 1))
            grid.add_column(no_wrap=True)
            grid.add_column(ratio=1)
            for i, item in enumerate(b.items, start=1):
                head = f"[{i}]" if b.numbered else "-"
                style = CHANGED if (prefix, "b", n, i - 1) in highlight else ""
                grid.add_row(head, Text(item, style=style))
            parts.append(grid)
    return Group(*parts)


class Figures(Static):
    """Report blocks (no charts) rendered as text and tables."""

    DEFAULT_CSS = "Figures { height: auto; }"

    def show(self, blocks, prefix: str, highlight: set, plain: bool) -> None:
        self.blocks = blocks
        # text of the same lengths takes the same lines: then no new layout is needed
        shape = (shape_of(blocks), plain)
        same = shape == getattr(self, "_shape", None)
        self._shape = shape
        self.update(render_blocks(blocks, prefix, highlight, plain), layout=not same)


class ChartView(Widget):
    """A line chart of a report Chart block, drawn to the widget's size."""

    DEFAULT_CSS = "ChartView { height: 14; }"

    def __init__(self, chart=None, plain: bool = False, **kwargs) -> None:
        super().__init__(**kwargs)
        self.chart = chart
        self.plain = plain

    def set_chart(self, chart, plain: bool) -> None:
        self.chart, self.plain = chart, plain
        # room for a longer legend where a chart has many curves (about two a line)
        series = len(chart.series) if chart is not None else 0
        if "chart" in self.classes:
            self.styles.height = 14 + max(0, (series - 1) // 2)
        self.refresh()

    def chart_text(self, width: int, height: int) -> Text:
        c = self.chart
        if c is None:
            return Text("")

        def draw(rows: int):
            return draw_chart(
                c.series,
                width,
                max(rows, 5),
                plain=self.plain,
                x_label=c.x_label,
                y_label=c.y_label,
                log_x=getattr(c, "log_x", False),
            )

        drawn = draw(height - 2)
        legend = wrap_legend(drawn.legend, self.plain, width)
        if len(legend) > 1:
            drawn = draw(height - 1 - len(legend))
        out = Text(c.title[:width], style="bold")
        for line, owners in zip(drawn.lines, drawn.owners):
            out.append("\n")
            row = Text(line)
            if not self.plain:
                for col, k in enumerate(owners):
                    if k >= 0:
                        row.stylize(SERIES_COLOURS[k % len(SERIES_COLOURS)], col, col + 1)
            out.append_text(row)
        for line in legend:
            out.append("\n")
            out.append(Text(line))
        return out

    def render(self):
        return self.chart_text(self.size.width, self.size.height)


class PlainScrollBarRender(ScrollBarRender):
    """Scroll bars without block glyphs: the thumb is reversed blanks only."""

    VERTICAL_BARS = [" "] * 8
    HORIZONTAL_BARS = [" "] * 8


def use_plain_scrollbars(plain: bool) -> None:
    """Draw every scroll bar of the process with plain glyphs (or the usual ones)."""
    ScrollBar.renderer = PlainScrollBarRender if plain else ScrollBarRender


class ResultsPanel(VerticalScroll):
    """A scrolling panel of report blocks: runs of text and tables, and charts."""

    DEFAULT_CSS = "ResultsPanel { height: 1fr; }"

    def __init__(self, prefix: str, **kwargs) -> None:
        super().__init__(**kwargs)
        self.prefix = prefix
        self._shape: list[str] = []

    def show(self, blocks, highlight: set, plain: bool, absent: str = "") -> None:
        runs: list[tuple[str, object]] = []
        for b in blocks:
            if _kind(b) == "Chart":
                runs.append(("chart", b))
            elif runs and runs[-1][0] == "text":
                runs[-1][1].append(b)
            else:
                runs.append(("text", [b]))
        if not runs:
            runs = [("text", [Paragraph(absent)])]
        shape = [kind for kind, _ in runs]
        if shape != self._shape:
            self.remove_children()
            widgets = [ChartView(classes="chart") if k == "chart" else Figures() for k in shape]
            self.mount_all(widgets)
            self._shape = shape
        for widget, (kind, content) in zip(self.children, runs):
            if kind == "chart":
                widget.set_chart(content, plain)
            else:
                widget.show(content, self.prefix, highlight, plain)


class PanelBar(Static):
    """One line naming the panels and their keys; the open one is bracketed."""

    def __init__(self, **kwargs) -> None:
        super().__init__(**kwargs)
        self.active = 0

    def set_active(self, index: int) -> None:
        self.active = index
        out = Text()
        for n, (_, title) in enumerate(PANELS):
            label = f"{n + 1} {title}"
            if n == self.active:
                out.append(f"[{label}]", style="reverse bold")
            else:
                out.append(f" {label} ")
            out.append(" ")
        self.update(out)


class KeyLine(Static):
    """The keys that work now, on one line, as Textual's compact footer shows them.

    Drawn as one line of text: the footer builds a widget for every key each time the
    focus moves (twice an edit), which costs more than the redraw of the figures.
    A key is pressed by clicking it, as in the footer.
    """

    DEFAULT_CSS = """
    KeyLine {
        dock: bottom;
        height: 1;
        text-wrap: nowrap;
        text-overflow: clip;
        color: $footer-foreground;
        background: $footer-background;
    }
    KeyLine > .keyline--key {
        color: $footer-key-foreground;
        background: $footer-key-background;
        text-style: bold;
    }
    KeyLine > .keyline--description {
        color: $footer-description-foreground;
        background: $footer-description-background;
    }
    """
    COMPONENT_CLASSES = {"keyline--key", "keyline--description"}
    ALLOW_SELECT = False

    def __init__(self, **kwargs) -> None:
        super().__init__("", markup=False, **kwargs)
        self._keys: list[tuple[int, int, str]] = []  # (from column, to column, key)
        self._shown: tuple | None = None

    def on_mount(self) -> None:
        self.screen.bindings_updated_signal.subscribe(self, self._bindings_changed)
        self.call_after_refresh(self.draw)

    def on_unmount(self) -> None:
        self.screen.bindings_updated_signal.unsubscribe(self)

    def _bindings_changed(self, screen) -> None:
        if self.is_attached and screen is self.screen:
            self.draw()

    def entries(self) -> list[tuple[str, str, str, bool]]:
        """(key, shown key, description, enabled) of each action shown, in footer order."""
        by_action: dict[str, tuple[str, str, str, bool]] = {}
        for _, binding, enabled, _tip in self.screen.active_bindings.values():
            if binding.show and binding.action not in by_action:
                shown = self.app.get_key_display(binding)
                by_action[binding.action] = (binding.key, shown, binding.description, enabled)
        return list(by_action.values())

    def draw(self) -> None:
        """Show the keys of the focused widget and of the dashboard (if they changed)."""
        if not self.is_attached:
            return
        entries = self.entries()
        if entries == self._shown:
            return
        self._shown = entries
        key_style = self.get_component_rich_style("keyline--key")
        text_style = self.get_component_rich_style("keyline--description")
        out = Text(no_wrap=True, overflow="crop")
        self._keys = []
        for key, shown, description, enabled in entries:
            start = len(out)
            dim = "" if enabled else " dim"
            out.append(shown, style=f"{key_style}{dim}")
            if description:
                out.append(" " + description, style=f"{text_style}{dim}")
            self._keys.append((start, len(out), key))
            out.append(" ")
        self.update(out, layout=False)

    def on_mouse_down(self, event: events.MouseDown) -> None:
        for start, end, key in self._keys:
            if start <= event.x < end:
                self.app.simulate_key(key)
                return


# --- the cold-mass editor --------------------------------------------------------------


class _SteadyTable(DataTable):
    """A table that renders again only the cells that changed.

    ``DataTable`` renders every visible cell again (about 0.1 ms each) after any change
    of a cell, any resize and any change of focus. Here a changed cell drops only its own
    renders; a new height (the edit bar opening or closing) drops none, the columns having
    fixed widths; and the cells rendered with and without the focus are both kept, so
    moving the focus to the edit bar and back renders nothing again.
    """

    _rendered_width: int | None = None
    _style_key: tuple | None = None

    def _on_resize(self, event: events.Resize) -> None:
        if event.size.width == self._rendered_width:
            event.prevent_default()  # skips DataTable's handler, which drops every cell
        self._rendered_width = event.size.width

    def _style_signature(self) -> tuple:
        app = self.app
        return (
            self.get_pseudo_class_state(),
            frozenset(self.classes),
            frozenset(app.classes),
            getattr(app, "theme", None),
        )

    def _kept_cells(self) -> dict:
        if "_cells_by_style" not in self.__dict__:
            self._cells_by_style = {}
        return self._cells_by_style

    def notify_style_update(self) -> None:
        try:
            from textual.cache import LRUCache

            rendered, before = self._cell_render_cache, self._style_key
            self._cell_render_cache = LRUCache(rendered.maxsize)
            super().notify_style_update()  # drops the other caches, as it should
            now = self._style_signature()
        except (AttributeError, ImportError, TypeError):
            super().notify_style_update()
            return
        kept = self._kept_cells()
        if before is not None:
            kept[before] = rendered
        if len(kept) > 4:  # a theme or class change: start afresh
            kept.clear()
        self._cell_render_cache = kept.pop(now, self._cell_render_cache)
        self._style_key = now

    def _clear_caches(self) -> None:
        super()._clear_caches()
        self._kept_cells().clear()

    def set_cell(self, row_key: str, column_key: str, value) -> None:
        """Change one cell; only that cell is rendered again, only its row redrawn.

        Falls back to ``update_cell`` where the table's caches are not as expected.
        """
        try:
            from textual.widgets._data_table import ColumnKey, RowKey

            row, column = RowKey(row_key), ColumnKey(column_key)
            self._data[row][column] = value
            for cells in [self._cell_render_cache, *self._kept_cells().values()]:
                for key in [k for k in cells.keys() if k[0] == row and k[1] == column]:
                    cells.discard(key)
            index = self._row_locations.get(row)
            self._row_renderable_cache.discard((self._update_count, index))
            self._row_render_cache.clear()
            self._line_cache.clear()
        except (AttributeError, ImportError, KeyError, TypeError):
            self.update_cell(row_key, column_key, value)
            return
        self.refresh_row(index)  # the other rows' lines stay as drawn


class ColdMassTable(_SteadyTable):
    """Stages and parts as written in the plan; enter edits the cell under the cursor."""

    BINDINGS = [
        Binding("enter", "edit", "Edit", key_display="enter"),
        Binding("m", "material", "Material"),
        Binding("a", "add_part", "Add part"),
        Binding("n", "add_stage", "New stage", show=False),
        Binding("x,delete", "remove", "Remove", key_display="x"),
    ]

    COLUMNS = [
        ("name", "Stage / part", 22),
        ("temperature", "T", 8),
        ("material", "Material", 20),
        ("mass", "Mass", 10),
        ("start", "Start", 9),
    ]

    class EditRequested(Message):
        """The user asked to change a field (or add, remove, pick a material)."""

        def __init__(self, action: str, row: str, column: str) -> None:
            super().__init__()
            self.action, self.row, self.column = action, row, column

    def on_mount(self) -> None:
        self.cursor_type = "cell"
        self.zebra_stripes = False
        for key, label, width in self.COLUMNS:
            self.add_column(label, key=key, width=width)

    def fill(self, stages, totals: dict[str, str], default_start: str) -> None:
        """Show ``stages`` (:class:`~cryoplan.tui.editing.StageRow`), keeping the cursor.

        When the rows are the same as before (an edited value), only the cells that
        changed are redrawn; when rows came or went, the table is rebuilt.
        """
        rows = []
        for st in stages:
            mass = totals.get(st.name, "")
            rows.append(
                (
                    f"s{st.index}",
                    [
                        Text(st.name, style="bold"),
                        Text(st.temperature),
                        Text(""),
                        Text(mass, style="dim"),
                        Text(""),
                    ],
                )
            )
            for p in st.parts:
                if p.how == "mass":
                    mass_text = Text(p.mass + (f" x{p.count}" if p.count > 1 else ""))
                else:
                    mass_text = Text(f"({p.how})", style="dim")
                start = Text(p.start) if p.start else Text(f"({default_start})", style="dim")
                rows.append(
                    (
                        f"p{st.index}.{p.index}",
                        [Text("  " + p.name), Text(""), Text(p.material), mass_text, start],
                    )
                )
        shown = getattr(self, "_shown", None)
        if shown is not None and [k for k, _ in shown] == [k for k, _ in rows]:
            columns = [key for key, _, _ in self.COLUMNS]
            for (key, cells), (_, before) in zip(rows, shown):
                for column, new, old in zip(columns, cells, before):
                    if (new.plain, str(new.style)) != (old.plain, str(old.style)):
                        self.set_cell(key, column, new)
            self._shown = rows
            return
        row, col = self.cursor_coordinate
        self.clear()
        for key, cells in rows:
            self.add_row(*cells, key=key)
        self._shown = rows
        if self.row_count:
            self.move_cursor(row=min(row, self.row_count - 1), column=col, animate=False)

    def current(self) -> tuple[str, str]:
        """(row key, column key) under the cursor."""
        if not self.row_count:
            return "", ""
        keys = self.coordinate_to_cell_key(self.cursor_coordinate)
        return str(keys.row_key.value), str(keys.column_key.value)

    def _ask(self, action: str) -> None:
        row, col = self.current()
        self.post_message(self.EditRequested(action, row, col))

    def action_edit(self) -> None:
        self._ask("edit")

    def action_material(self) -> None:
        self._ask("material")

    def action_add_part(self) -> None:
        self._ask("add_part")

    def action_add_stage(self) -> None:
        self._ask("add_stage")

    def action_remove(self) -> None:
        self._ask("remove")


class SettingsTable(_SteadyTable):
    """The cooldown steps, baths and supplies as written; enter edits the value."""

    BINDINGS = [Binding("enter", "edit", "Edit", key_display="enter")]

    class EditRequested(Message):
        def __init__(self, key: str) -> None:
            super().__init__()
            self.key = key

    def on_mount(self) -> None:
        self.cursor_type = "row"
        self.add_column("Plan setting", key="label", width=34)
        self.add_column("Value", key="value", width=26)

    def fill(self, rows) -> None:
        """Show ``rows`` (:class:`~cryoplan.tui.editing.SettingRow`), keeping the cursor."""
        shown = getattr(self, "_shown", None)
        keys = [r.key for r in rows]
        if shown is not None and [r.key for r in shown] == keys:
            for new, old in zip(rows, shown):
                if new.value != old.value:
                    self.set_cell(new.key, "value", new.value)
        else:
            row = self.cursor_row
            self.clear()
            for r in rows:
                self.add_row(r.label, r.value, key=r.key)
            if self.row_count:
                self.move_cursor(row=min(row, self.row_count - 1), animate=False)
        self._shown = rows

    def action_edit(self) -> None:
        if self.row_count:
            key = self.coordinate_to_cell_key(self.cursor_coordinate).row_key.value
            self.post_message(self.EditRequested(str(key)))


class EditBar(Vertical):
    """The field being edited: what it is, the entry, and the reason a bad entry is refused."""

    BINDINGS = [Binding("escape", "cancel", "Cancel", show=True)]

    class Cancelled(Message):
        pass

    def compose(self) -> ComposeResult:
        with Horizontal(id="edit-line"):
            yield Label("", id="edit-label")
            yield Input(id="edit-input", select_on_focus=True)
        yield Static("", id="edit-reason", markup=False)

    def on_mount(self) -> None:
        self.query_one(Input).cursor_blink = False

    def action_cancel(self) -> None:
        self.post_message(self.Cancelled())


# --- screens ----------------------------------------------------------------------------


class DashboardScreen(Screen):
    """The dashboard's screen: a change is drawn as soon as the screen is idle.

    Textual draws at the next slot of its frame timer, which after a long frame is up to
    two frames (33 ms at 60 frames a second) away even when nothing else is to be done;
    here the frame is drawn at once, never more often than that frame rate allows. An
    idle screen draws nothing, as before.
    """

    #: The shortest time between two frames drawn here [s] (Textual's frame rate).
    FRAME_SECONDS = 1 / 60
    _last_frame = 0.0

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


# --- dialogs ----------------------------------------------------------------------------


class ConfirmScreen(ModalScreen[bool]):
    """A yes-or-no question."""

    BINDINGS = [
        Binding("y,enter", "answer(True)", "Yes"),
        Binding("n,escape", "answer(False)", "No"),
    ]

    def __init__(self, question: str, yes: str = "yes", no: str = "no") -> None:
        super().__init__()
        self.question, self.yes, self.no = question, yes, no

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog"):
            yield Static(self.question, markup=False, classes="question")
            yield Static(
                f"y / enter: {self.yes}    n / escape: {self.no}", markup=False, classes="keys"
            )

    def action_answer(self, value: bool) -> None:
        self.dismiss(value)


class QuitScreen(ModalScreen[str]):
    """Unsaved edits: save and quit, quit without saving, or stay."""

    BINDINGS = [
        Binding("s", "answer('save')", "Save and quit"),
        Binding("d", "answer('discard')", "Discard and quit"),
        Binding("escape,c", "answer('cancel')", "Stay"),
    ]

    def __init__(self, name: str) -> None:
        super().__init__()
        self.plan_name = name

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog"):
            yield Static(f"{self.plan_name} has unsaved edits.", markup=False, classes="question")
            yield Static(
                "s: save and quit    d: quit without saving    escape: stay",
                markup=False,
                classes="keys",
            )

    def action_answer(self, value: str) -> None:
        self.dismiss(value)


class PromptScreen(ModalScreen[str | None]):
    """One line of text, such as a file name."""

    BINDINGS = [Binding("escape", "cancel", "Cancel")]

    def __init__(self, question: str, value: str = "") -> None:
        super().__init__()
        self.question, self.value = question, value

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog"):
            yield Static(self.question, markup=False, classes="question")
            yield Input(self.value, id="prompt-input")
            yield Static("enter: accept    escape: cancel", markup=False, classes="keys")

    def on_mount(self) -> None:
        self.query_one(Input).cursor_blink = False

    @on(Input.Submitted)
    def _accept(self, event: Input.Submitted) -> None:
        self.dismiss(event.value.strip() or None)

    def action_cancel(self) -> None:
        self.dismiss(None)


class MaterialPicker(ModalScreen[str | None]):
    """Materials that match what is typed (id or name), best first."""

    BINDINGS = [
        Binding("escape", "cancel", "Cancel"),
        Binding("down", "move(1)", "Next", show=False),
        Binding("up", "move(-1)", "Previous", show=False),
    ]

    def __init__(self, materials: list[tuple[str, str]], current: str = "") -> None:
        super().__init__()
        self.materials = materials
        self.current = current

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog picker"):
            yield Static("Material: type to find, enter to pick", markup=False, classes="question")
            yield Input(id="picker-input", placeholder="e.g. copper, 304, epoxy")
            yield OptionList(id="picker-list")
            yield Static("", id="picker-count", markup=False, classes="keys")

    def on_mount(self) -> None:
        self.query_one(Input).cursor_blink = False
        self._fill("")

    def matches(self, typed: str) -> list[tuple[str, str]]:
        """Materials whose id or name contains every word typed; ids that start with the
        text first, then close spellings (difflib) when nothing contains it."""
        from ..errors import closest

        words = typed.lower().split()
        if not words:
            return list(self.materials)
        hits = [
            (i, n)
            for i, n in self.materials
            if all(w in i.lower() or w in n.lower() for w in words)
        ]
        hits.sort(key=lambda m: (not m[0].lower().startswith(words[0]), m[0]))
        if not hits:
            ids = closest(typed, [i for i, _ in self.materials], n=5)
            hits = [(i, n) for i, n in self.materials if i in ids]
        return hits

    def _fill(self, typed: str) -> None:
        found = self.matches(typed)
        options = self.query_one(OptionList)
        options.clear_options()
        options.add_options([Option(f"{i}  {n}" if n and n != i else i, id=i) for i, n in found])
        if found:
            options.highlighted = 0
        self.query_one("#picker-count", Static).update(
            f"{len(found)} of {len(self.materials)} materials    enter: pick    escape: cancel"
        )

    @on(Input.Changed)
    def _typed(self, event: Input.Changed) -> None:
        self._fill(event.value)

    @on(Input.Submitted)
    def _pick(self) -> None:
        options = self.query_one(OptionList)
        if options.highlighted is not None and options.option_count:
            self.dismiss(options.get_option_at_index(options.highlighted).id)

    @on(OptionList.OptionSelected)
    def _selected(self, event: OptionList.OptionSelected) -> None:
        self.dismiss(event.option.id)

    def action_move(self, step: int) -> None:
        options = self.query_one(OptionList)
        if not options.option_count:
            return
        now = options.highlighted if options.highlighted is not None else -1
        options.highlighted = max(0, min(options.option_count - 1, now + step))

    def action_cancel(self) -> None:
        self.dismiss(None)


HELP_TEXT = """\
Keys of the cryoplan dashboard; the keyboard alone is enough.

  1 .. 6        open a panel: cold mass, budget, once cold,
                refrigeration, room, notes
  [ and ]       previous / next panel
  tab           move between the table, the figures and the edit field
  arrows, pgup  move the cursor; scroll a panel

Cold mass (panel 1)
  enter         edit the cell: a name, a temperature, a mass or a start,
                with units ("22 kg", "300 g", "4.2 K", "20 degC"); an
                empty start means the cooldown's start. A bad entry is
                marked with the reason and the last good value stays in
                force. escape cancels.
  m             pick a material (type to find it)
  a             add a part to the stage under the cursor
  n             add a stage
  x, delete     remove the part or stage under the cursor

Budget (panel 2)
  enter         edit a plan setting: a step's end temperature or gas_use,
                a bath's volume or refill level, dewar sizes ("100 L,
                250 L"), a price ("18 USD/L")

Everywhere
  u, ctrl+z     undo                 r, ctrl+y     redo
  ctrl+s        save (the previous file is kept as PLAN.bak)
  p             print: write the printed budget to a file, then send it
                to the printer (lp or lpr) after a confirmation
  f5            reload the plan from disk
  ?, f1         this help            q             quit (asks first
                                                   when edits are unsaved)

Figures that changed with the last edit are shown reversed for a moment.
Every edit re-evaluates the plan in the background; the screen never
waits for it. Plain characters: --plain or CRYOPLAN_PLAIN=1; no colour:
NO_COLOR=1.
"""


class HelpScreen(ModalScreen[None]):
    """The keys, on a screen of their own."""

    BINDINGS = [Binding("escape,q,question_mark,f1", "close", "Close")]

    def compose(self) -> ComposeResult:
        with VerticalScroll(classes="dialog help"):
            yield Static(HELP_TEXT, markup=False)
            yield Static("escape: close", markup=False, classes="keys")

    def action_close(self) -> None:
        self.dismiss(None)
