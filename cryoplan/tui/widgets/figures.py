"""Figures from the printed budget's blocks: tables, text, charts, scrolling panels.

Figures come from the printed budget's blocks (:mod:`cryoplan.report.document`); these
widgets only lay them out. Nothing here animates or refreshes on a timer: a widget redraws
when its content changes, and not otherwise.
"""

from __future__ import annotations

from rich import box
from rich.console import Group
from rich.table import Table as RichTable
from rich.text import Text
from textual.containers import VerticalScroll
from textual.scrollbar import ScrollBar, ScrollBarRender
from textual.widget import Widget
from textual.widgets import Static

from ...report.document import Paragraph
from ..charts import draw_chart, wrap_legend

#: A table header rule drawn with plain characters.
PLAIN_BOX = box.Box("    \n    \n -- \n    \n    \n    \n    \n    \n", ascii=True)
#: Style of a figure that changed in the last evaluation (readable without colour).
CHANGED = "reverse bold"
#: Colours of chart series (dropped in monochrome; the numbers and marks remain).
SERIES_COLOURS = ["cyan", "yellow", "magenta", "green", "red", "blue", "bright_white"]


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

    def show(self, blocks, prefix: str, highlight: set, plain: bool) -> None:
        self.blocks = blocks
        # text of the same lengths takes the same lines: then no new layout is needed
        shape = (shape_of(blocks), plain)
        same = shape == getattr(self, "_shape", None)
        self._shape = shape
        self.update(render_blocks(blocks, prefix, highlight, plain), layout=not same)


class ChartView(Widget):
    """A line chart of a report Chart block, drawn to the widget's size."""

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
