"""The printed budget as a PDF: A4 or US Letter pages, tables, wrapped text, vector charts.

The writer lays out the blocks of :func:`cryoplan.report.budget.build_document` (headings,
tables, paragraphs, bullet lists, charts) in reading order, whatever blocks come, and draws
each page as a matplotlib figure into one PDF held in memory. It computes no physics.

- Text is measured with the font's own metrics, so paragraphs, bullets and table cells wrap
  to the page; a table too long for a page continues on the next under its repeated header.
- Charts are vector line plots, all in black, told apart by line style and an open marker,
  so a black-and-white copy reads as well as the screen.
- Fonts are embedded as TrueType (``pdf.fonttype`` 42), so the text can be searched and
  extracted (``pdftotext``, ``pypdf``).
- matplotlib is imported only here, only when a PDF is asked for, and without pyplot: no
  display and no global backend switch (figures are drawn by the PDF backend directly).
"""

from __future__ import annotations

import io
import textwrap
from dataclasses import dataclass, field
from functools import lru_cache

from ..errors import CryoplanError, InputError
from .document import Bullets, Chart, Heading, Paragraph, Table

#: Paper sizes in points (1/72 in), width x height, portrait. A4 is 210 mm x 297 mm
#: (ISO 216); US Letter is 8.5 in x 11 in (ANSI/ASME Y14.1).
PAPER_SIZES: dict[str, tuple[float, float]] = {
    "a4": (210 / 25.4 * 72, 297 / 25.4 * 72),
    "letter": (8.5 * 72, 11.0 * 72),
}

MM = 72 / 25.4  # points per millimetre

# Page geometry [pt]
MARGIN_X = 18 * MM
MARGIN_TOP = 16 * MM
MARGIN_BOTTOM = 18 * MM
FOOTER_Y = 10 * MM  # footer baseline, from the bottom edge

# Type [pt]
BODY_SIZE = 9.5
BODY_LEADING = 12.5
TABLE_SIZES = (8.5, 7.5, 7.0)  # tried in turn until a table fits the width
TABLE_LEADING = 1.25  # times the table's font size
CELL_PAD = 4.0
CHART_HEIGHT = 72 * MM
SANS = "DejaVu Sans"  # shipped with matplotlib, so every installation has it
MONO = "DejaVu Sans Mono"

#: Line styles and open markers for the series of a chart, in turn: black and white only.
LINE_STYLES = ["-", "--", "-.", ":", (0, (6, 2, 1, 2, 1, 2)), (0, (1, 3))]
MARKERS = ["o", "s", "^", "D", "v", "x", "+", "*"]

_FONTS = {"pdf.fonttype": 42, "font.family": SANS, "axes.unicode_minus": False}


def paper_size(paper: str) -> tuple[float, float]:
    """Width and height [pt] of a paper size named ``a4`` or ``letter`` (any case).

    >>> [round(v, 1) for v in paper_size("A4")], paper_size("letter")
    ([595.3, 841.9], (612.0, 792.0))
    """
    key = str(paper).strip().lower().replace("us-letter", "letter").replace("us letter", "letter")
    if key not in PAPER_SIZES:
        raise InputError(
            f"unknown paper size {paper!r}",
            key="--paper",
            expected="one of " + ", ".join(PAPER_SIZES),
            found=str(paper),
        )
    return PAPER_SIZES[key]


def _matplotlib():
    try:
        import matplotlib
        from matplotlib.backends.backend_pdf import PdfPages
        from matplotlib.figure import Figure
    except ImportError:
        raise CryoplanError(
            "PDF output needs matplotlib, which is not installed: install the pdf extra, "
            "for example  pip install 'cryoplan[pdf]'"
        ) from None
    return matplotlib, Figure, PdfPages


# --- measuring and wrapping text ------------------------------------------------------------


@lru_cache(maxsize=1)
def _measurer():
    # unhinted glyph advances, as the PDF backend places them (hinted widths at 72 dpi can
    # be 10 % off at table sizes)
    from matplotlib.textpath import TextToPath

    return TextToPath()


@lru_cache(maxsize=8)
def _props(size: float, bold: bool, mono: bool):
    from matplotlib.font_manager import FontProperties

    return FontProperties(
        family=MONO if mono else SANS, weight="bold" if bold else "normal", size=size
    )


@lru_cache(maxsize=20000)
def text_width(text: str, size: float, bold: bool = False, mono: bool = False) -> float:
    """Width [pt] of one line of text in the report's font."""
    if not text:
        return 0.0
    w, _, _ = _measurer().get_text_width_height_descent(
        text, _props(size, bold, mono), ismath=False
    )
    return float(w)


def wrap(
    text: str,
    width: float,
    size: float,
    bold: bool = False,
    mono: bool = False,
    first_width: float | None = None,
) -> list[str]:
    """Lines of ``text`` no wider than ``width`` [pt] (``first_width`` for the first line).

    Words break at spaces; a word longer than a line (a long path) breaks between characters.
    """
    lines: list[str] = []
    width += 0.01  # a cell exactly as wide as its text fits (rounding of the sums)
    limit = first_width + 0.01 if first_width is not None else width
    space = text_width(" ", size, bold, mono)
    current, current_w = "", 0.0
    for word in str(text).split():
        word_w = text_width(word, size, bold, mono)
        trial = f"{current} {word}" if current else word
        # words are measured once each and summed; only a line within half a point of the
        # limit is measured whole (kerning across words is far smaller than that)
        trial_w = current_w + space + word_w if current else word_w
        if abs(trial_w - limit) < 0.5:
            trial_w = text_width(trial, size, bold, mono)
        if trial_w <= limit:
            current, current_w = trial, trial_w
            continue
        if current:
            lines.append(current)
            limit = width
        current = ""
        while text_width(word, size, bold, mono) > limit:
            lo, hi = 1, len(word) - 1  # the longest prefix that fits: a binary search
            while lo < hi:
                mid = (lo + hi + 1) // 2
                if text_width(word[:mid], size, bold, mono) <= limit:
                    lo = mid
                else:
                    hi = mid - 1
            cut = lo
            lines.append(word[:cut])
            limit = width
            word = word[cut:]
        current, current_w = word, text_width(word, size, bold, mono)
    if current or not lines:
        lines.append(current)
    return lines


# --- page layout: a list of drawing operations per page ---------------------------------------


@dataclass
class _Page:
    ops: list = field(default_factory=list)


class _Layout:
    """A cursor running down the pages; ``y`` is measured from the top edge [pt]."""

    def __init__(self, width: float, height: float) -> None:
        self.width, self.height = width, height
        self.left, self.right = MARGIN_X, width - MARGIN_X
        self.top, self.bottom = MARGIN_TOP, height - MARGIN_BOTTOM
        self.pages: list[_Page] = [_Page()]
        self.y = self.top

    @property
    def text_width(self) -> float:
        return self.right - self.left

    def room(self) -> float:
        return self.bottom - self.y

    def new_page(self) -> None:
        self.pages.append(_Page())
        self.y = self.top

    def at_top(self) -> bool:
        return self.y <= self.top + 1e-6

    def need(self, height: float) -> None:
        """Start a new page unless ``height`` fits below the cursor (or the page is fresh)."""
        if height > self.room() and not self.at_top():
            self.new_page()

    def space(self, height: float) -> None:
        if not self.at_top():
            self.y += height

    # drawing operations (coordinates in points from the page's top-left corner)
    def text(self, x, y, s, size=BODY_SIZE, bold=False, mono=False, ha="left", gray=0.0):
        self.pages[-1].ops.append(("text", x, y, s, size, bold, mono, ha, gray))

    def rule(self, x0, x1, y, lw=0.6, gray=0.0):
        self.pages[-1].ops.append(("rule", x0, x1, y, lw, gray))

    def shade(self, x, y, w, h, gray=0.92):
        self.pages[-1].ops.append(("shade", x, y, w, h, gray))

    def chart(self, x, y, w, h, chart):
        self.pages[-1].ops.append(("chart", x, y, w, h, chart))


def _lines(
    layout: _Layout,
    lines: list[str],
    x: float,
    size: float,
    leading: float,
    bold=False,
    mono=False,
    indent_first: tuple[str, float] | None = None,
) -> None:
    """Draw wrapped lines, breaking pages between lines; ``indent_first`` = (label, width)."""
    for i, line in enumerate(lines):
        layout.need(leading)
        layout.y += leading
        if i == 0 and indent_first is not None:
            layout.text(x - indent_first[1], layout.y, indent_first[0], size, bold, mono)
        layout.text(x, layout.y, line, size, bold, mono)


def _title_block(layout: _Layout, title: str, details: list[str]) -> None:
    layout.y += 16
    layout.text(layout.left, layout.y, "Cryoplan budget", 17, bold=True)
    layout.y += 4
    _lines(
        layout, wrap(title, layout.text_width, 12.5, bold=True), layout.left, 12.5, 16, bold=True
    )
    layout.y += 3
    for d in details:
        _lines(layout, wrap(d, layout.text_width, 9), layout.left, 9, 12)
    layout.y += 6
    layout.rule(layout.left, layout.right, layout.y, lw=1.2)
    layout.y += 4


def _heading(layout: _Layout, block: Heading, keep: float) -> None:
    size = 13.0 if block.level <= 1 else 11.0
    before = 16.0 if block.level <= 1 else 10.0
    lines = wrap(block.text, layout.text_width, size, bold=True)
    height = before + len(lines) * size * 1.3 + 6
    layout.need(height + keep)
    layout.space(before)
    _lines(layout, lines, layout.left, size, size * 1.3, bold=True)
    if block.level <= 1:
        layout.y += 3
        layout.rule(layout.left, layout.right, layout.y, lw=0.8)
    layout.y += 3


def _paragraph(layout: _Layout, block: Paragraph) -> None:
    layout.space(5)
    _lines(
        layout,
        wrap(block.text, layout.text_width, BODY_SIZE),
        layout.left,
        BODY_SIZE,
        BODY_LEADING,
    )


def _bullet_label(block: Bullets, i: int) -> str:
    return f"[{i}]" if block.numbered else "\u2022"


def _bullets(layout: _Layout, block: Bullets) -> None:
    labels = [_bullet_label(block, i) for i in range(1, len(block.items) + 1)]
    hang = max((text_width(lb, BODY_SIZE) for lb in labels), default=0.0) + 5
    x = layout.left + hang
    for label, item in zip(labels, block.items):
        layout.space(3)
        lines = wrap(item, layout.right - x, BODY_SIZE)
        layout.need(BODY_LEADING * min(2, len(lines)))
        _lines(layout, lines, x, BODY_SIZE, BODY_LEADING, indent_first=(label, hang))


# --- tables -----------------------------------------------------------------------------------


def _column_widths(headers, rows, size, available) -> tuple[list[float], bool]:
    """Column widths [pt] (padding included) and whether they fit without wrapping."""
    n = len(headers)
    natural = [text_width(str(h), size, bold=True) for h in headers]
    longest_word = [
        max((text_width(w, size, bold=True) for w in str(h).split()), default=0) for h in headers
    ]
    for row in rows:
        for i in range(n):
            cell = str(row[i])
            natural[i] = max(natural[i], text_width(cell, size))
            longest_word[i] = max([longest_word[i]] + [text_width(w, size) for w in cell.split()])
    natural = [w + 2 * CELL_PAD for w in natural]
    if sum(natural) <= available:
        return natural, True
    # share the width (water-filling): narrow columns keep their width, wide ones share the rest
    widths = [0.0] * n
    remaining = available
    order = sorted(range(n), key=lambda i: natural[i])
    for done, i in enumerate(order):
        widths[i] = min(natural[i], remaining / (n - done))
        remaining -= widths[i]
    # no column narrower than its longest word, where the page allows
    floor = [min(natural[i], longest_word[i] + 2 * CELL_PAD) for i in range(n)]
    deficit = sum(max(0.0, floor[i] - widths[i]) for i in range(n))
    if deficit > 0:
        donors = [i for i in range(n) if widths[i] > floor[i]]
        spare = sum(widths[i] - floor[i] for i in donors)
        if spare >= deficit:
            for i in donors:
                widths[i] -= (widths[i] - floor[i]) / spare * deficit
            widths = [max(widths[i], floor[i]) for i in range(n)]
    return widths, False


def _table(layout: _Layout, block: Table) -> None:
    n = len(block.headers)
    if n == 0:
        return
    rows = [
        [("" if c is None else str(c)) for c in list(r)[:n]] + [""] * (n - len(r))
        for r in block.rows
    ]
    align = (block.align or ("l" + "r" * (n - 1))).ljust(n, "r")
    for size in TABLE_SIZES:
        widths, fits = _column_widths(block.headers, rows, size, layout.text_width)
        if fits:
            break
    leading = size * TABLE_LEADING
    xs = [layout.left]
    for w in widths:
        xs.append(xs[-1] + w)

    def cells(row, bold):
        return [wrap(c, widths[i] - 2 * CELL_PAD, size, bold=bold) for i, c in enumerate(row)]

    header = cells(block.headers, True)
    header_h = max(len(c) for c in header) * leading + 4
    body = [cells(r, False) for r in rows]
    heights = [max(len(c) for c in cl) * leading + 2.5 for cl in body]
    title_lines = wrap(block.title, layout.text_width, size + 1, bold=True) if block.title else []
    title_h = len(title_lines) * (size + 1) * 1.3

    def draw_row(lines_per_cell, height, bold):
        top = layout.y
        for i, cell_lines in enumerate(lines_per_cell):
            for k, line in enumerate(cell_lines):
                y = top + (k + 1) * leading - 0.5
                if align[i] == "r":
                    layout.text(xs[i + 1] - CELL_PAD, y, line, size, bold, ha="right")
                else:
                    layout.text(xs[i] + CELL_PAD, y, line, size, bold)
        layout.y = top + height

    def draw_head(continued: bool):
        if title_lines:
            tl = list(title_lines)
            if continued:
                tl[-1] += " (continued)"
            _lines(layout, tl, layout.left, size + 1, (size + 1) * 1.3, bold=True)
            layout.y += 3
        elif continued:
            _lines(layout, ["(continued)"], layout.left, size, leading)
            layout.y += 2
        layout.rule(xs[0], xs[-1], layout.y, lw=0.9)
        draw_row(header, header_h, True)
        layout.rule(xs[0], xs[-1], layout.y, lw=0.5)

    first_rows = sum(heights[:2])
    layout.space(7)
    layout.need(title_h + header_h + first_rows + 6)
    draw_head(False)
    for k, (cl, h) in enumerate(zip(body, heights)):
        if h > layout.room():
            layout.rule(xs[0], xs[-1], layout.y, lw=0.9)
            layout.new_page()
            draw_head(True)
        if k % 2 == 1:
            layout.shade(xs[0], layout.y, xs[-1] - xs[0], h)
        draw_row(cl, h, False)
    layout.rule(xs[0], xs[-1], layout.y, lw=0.9)


# --- charts -----------------------------------------------------------------------------------


LEGEND_SIZE = 7.5
LEGEND_ROW = 11.0  # [pt] per legend row
LEGEND_INSIDE_MAX = 3  # more series than this: the legend goes below the plot, clear of it


def _legend_shape(block: Chart, width: float) -> tuple[int, int]:
    """Columns and rows of a legend set below the plot; (0, 0) when it sits inside."""
    labels = [str(label) for label, xs, _ in block.series if len(xs)]
    if len(labels) <= LEGEND_INSIDE_MAX:
        return 0, 0
    widest = max(text_width(label, LEGEND_SIZE) for label in labels) + 45  # handle and gap
    ncol = max(1, min(3, int(width // widest)))
    return ncol, -(-len(labels) // ncol)


def _chart_block(layout: _Layout, block: Chart) -> None:
    title_lines = wrap(block.title, layout.text_width, 10, bold=True) if block.title else []
    _, rows = _legend_shape(block, layout.text_width)
    chart_h = CHART_HEIGHT + (rows * LEGEND_ROW + 6 if rows else 0)
    height = len(title_lines) * 13 + 4 + chart_h
    layout.space(9)
    layout.need(height)
    _lines(layout, title_lines, layout.left, 10, 13, bold=True)
    layout.y += 4
    layout.chart(layout.left, layout.y, layout.text_width, chart_h, block)
    layout.y += chart_h


def _finite_series(block: Chart):
    import math

    out = []
    for label, xs, ys in block.series:
        pts = []
        for x, y in zip(xs, ys):
            try:
                x, y = float(x), float(y)
            except (TypeError, ValueError):
                continue
            if math.isfinite(x) and math.isfinite(y) and (x > 0 or not block.log_x):
                pts.append((x, y))
        out.append((str(label), [p[0] for p in pts], [p[1] for p in pts]))
    return out


def _draw_chart(fig, page_w, page_h, x, y, w, h, block: Chart) -> None:
    left, bottom, right, top = 50.0, 30.0, 8.0, 4.0  # room for ticks and axis labels [pt]
    ncol, rows = _legend_shape(block, w)
    plot_h = h - (rows * LEGEND_ROW + 6 if rows else 0)
    ax = fig.add_axes(
        [
            (x + left) / page_w,
            (page_h - y - plot_h + bottom) / page_h,
            (w - left - right) / page_w,
            (plot_h - bottom - top) / page_h,
        ]
    )
    series = _finite_series(block)
    drawn = 0
    for k, (label, xs, ys) in enumerate(series):
        if not xs:
            continue
        step = max(1, len(xs) // 8)
        ax.plot(
            xs,
            ys,
            color="black",
            linewidth=1.1,
            linestyle=LINE_STYLES[k % len(LINE_STYLES)],
            marker=MARKERS[k % len(MARKERS)],
            markersize=4.5,
            fillstyle="none",
            markevery=(min(k * max(1, step // 3), len(xs) - 1), step),
            label=label.replace("$", r"\$"),
        )
        drawn += 1
    if block.log_x and drawn:
        ax.set_xscale("log")
    ax.set_xlabel(block.x_label, fontsize=8.5, parse_math=False)
    ax.set_ylabel(block.y_label, fontsize=8.5, parse_math=False)
    ax.tick_params(labelsize=8, direction="in", top=True, right=True)
    ax.grid(True, color="0.75", linewidth=0.4, linestyle=":")
    if not drawn:
        ax.text(
            0.5,
            0.5,
            "(no data)",
            transform=ax.transAxes,
            ha="center",
            va="center",
            fontsize=9,
            parse_math=False,
        )
    elif rows:
        fig.legend(
            *ax.get_legend_handles_labels(),
            loc="upper center",
            bbox_to_anchor=((x + w / 2) / page_w, 1 - (y + plot_h) / page_h),
            bbox_transform=fig.transFigure,
            ncol=ncol,
            fontsize=LEGEND_SIZE,
            frameon=False,
            handlelength=3.5,
            columnspacing=1.5,
        )
    elif drawn > 1 or series[0][0]:
        ax.legend(
            fontsize=LEGEND_SIZE,
            frameon=True,
            framealpha=1.0,
            edgecolor="0.3",
            loc="best",
            handlelength=3.5,
        )


# --- drawing the pages ------------------------------------------------------------------------


def _draw_page(Figure, page: _Page, w: float, h: float, footer_left: str, footer_right: str):
    fig = Figure(figsize=(w / 72, h / 72), dpi=72)
    for op in page.ops:
        kind = op[0]
        if kind == "text":
            _, x, y, s, size, bold, mono, ha, gray = op
            fig.text(
                x / w,
                1 - y / h,
                s,
                fontsize=size,
                fontweight="bold" if bold else "normal",
                family=MONO if mono else SANS,
                ha=ha,
                va="baseline",
                color=str(gray),
                parse_math=False,
            )
        elif kind == "rule":
            _, x0, x1, y, lw, gray = op
            fig.add_artist(_line(x0 / w, x1 / w, 1 - y / h, lw, gray))
        elif kind == "shade":
            _, x, y, bw, bh, gray = op
            fig.add_artist(_rect(x / w, 1 - (y + bh) / h, bw / w, bh / h, gray))
        elif kind == "chart":
            _, x, y, cw, ch, block = op
            _draw_chart(fig, w, h, x, y, cw, ch, block)
    fy = 1 - (h - FOOTER_Y) / h
    fig.text(
        MARGIN_X / w,
        fy,
        footer_left,
        fontsize=7.5,
        color="0.3",
        ha="left",
        va="baseline",
        parse_math=False,
    )
    fig.text(
        1 - MARGIN_X / w,
        fy,
        footer_right,
        fontsize=7.5,
        color="0.3",
        ha="right",
        va="baseline",
        parse_math=False,
    )
    return fig


def _line(x0, x1, y, lw, gray):
    from matplotlib.lines import Line2D

    return Line2D([x0, x1], [y, y], linewidth=lw, color=str(gray), solid_capstyle="butt")


def _rect(x, y, w, h, gray):
    from matplotlib.patches import Rectangle

    return Rectangle((x, y), w, h, facecolor=str(gray), edgecolor="none", zorder=-1)


def _keep_height(layout: _Layout, block) -> float:
    """Room to keep below a heading so that it does not stand alone at a page's foot."""
    if isinstance(block, Chart):
        return CHART_HEIGHT + 30
    if isinstance(block, Table):
        return 60.0
    if isinstance(block, (Paragraph, Bullets)):
        return 2 * BODY_LEADING + 6
    return 0.0


def layout_blocks(blocks, paper: str = "a4", title: str = "", details: list[str] | None = None):
    """Lay the blocks out on pages; returns the pages' drawing operations (no matplotlib)."""
    w, h = paper_size(paper)
    layout = _Layout(w, h)
    _title_block(layout, title, details or [])
    blocks = list(blocks)
    for i, b in enumerate(blocks):
        if isinstance(b, Heading):
            # keep the heading with what follows it, through any headings right below it
            keep, j = 0.0, i + 1
            while j < len(blocks) and isinstance(blocks[j], Heading):
                keep += 16.0 + 13 * 1.3 + 6
                j += 1
            keep += _keep_height(layout, blocks[j]) if j < len(blocks) else 0.0
            _heading(layout, b, keep)
        elif isinstance(b, Table):
            _table(layout, b)
        elif isinstance(b, Paragraph):
            _paragraph(layout, b)
        elif isinstance(b, Bullets):
            _bullets(layout, b)
        elif isinstance(b, Chart):
            _chart_block(layout, b)
        else:  # a block kind this writer does not know: print it as text, never drop it
            _paragraph(layout, Paragraph(str(getattr(b, "text", b))))
    return layout


def render_blocks_pdf(
    blocks,
    *,
    paper: str = "a4",
    title: str = "",
    details: list[str] | None = None,
    footer: str = "",
    metadata: dict | None = None,
) -> bytes:
    """A PDF (bytes) of document blocks under a title block.

    Parameters
    ----------
    blocks : list
        :mod:`cryoplan.report.document` blocks, in reading order.
    paper : str
        ``"a4"`` or ``"letter"``; anything else raises :class:`~cryoplan.errors.InputError`.
    title : str
        The plan's title, printed large on the first page.
    details : list of str
        Lines under the title (file, date, version).
    footer : str
        Printed at the foot of every page, beside the page number.
    metadata : dict, optional
        PDF document information (``Title``, ``Subject``, ...).
    """
    w, h = paper_size(paper)
    matplotlib, Figure, PdfPages = _matplotlib()
    layout = layout_blocks(blocks, paper, title, details)
    buf = io.BytesIO()
    info = {"Creator": "cryoplan", "Title": title}
    info.update(metadata or {})
    with matplotlib.rc_context(_FONTS):
        with PdfPages(buf, metadata=info) as pdf:
            n = len(layout.pages)
            for k, page in enumerate(layout.pages, start=1):
                fig = _draw_page(Figure, page, w, h, footer, f"page {k} of {n}")
                pdf.savefig(fig)
    return buf.getvalue()


def render_pdf(data: dict, paper: str = "a4") -> bytes:
    """The printed budget of ``Results.to_dict()`` as a PDF (bytes), on A4 or US Letter.

    A title block (plan title, file, date, cryoplan version), then every block of
    :func:`~cryoplan.report.budget.build_document` in order: the summary figures first,
    the sections, the charts, and the closing assumptions, cautions and sources.

    Raises
    ------
    InputError
        For a paper size other than ``a4`` or ``letter``.
    CryoplanError
        When matplotlib (the ``pdf`` extra) is not installed.
    """
    from .. import __version__
    from .budget import build_document

    paper_size(paper)  # refuse a bad paper size before any work
    p = data.get("plan", {})
    title = str(p.get("title") or "(untitled plan)")
    version = p.get("cryoplan_version", __version__)
    details = [
        f"Plan file: {p.get('file', '-')}",
        f"Printed {p.get('date', '-')} by cryoplan {version}",
    ]
    footer = textwrap.shorten(f"cryoplan budget: {title}", 90, placeholder=" ...")
    return render_blocks_pdf(
        build_document(data),
        paper=paper,
        title=title,
        details=details,
        footer=footer,
        metadata={
            "Title": f"Cryoplan budget: {title}",
            "Subject": "Cryogenic cooldown budget",
            "Creator": f"cryoplan {version}",
        },
    )
