"""Terminal charts drawn with braille dots, or with plain characters for limited fonts.

A chart is drawn into a grid of character cells. In braille mode every cell holds a 2 x 4
block of dots (Unicode braille patterns, U+2800 to U+28FF), so a curve is drawn at twice
the horizontal and four times the vertical resolution of the text. In plain mode every
cell holds one mark character per series (``*``, ``o``, ``+`` ...) and the axes are drawn
with ``|``, ``-`` and ``+``, for SSH clients whose fonts lack braille and box-drawing
glyphs.

No physics here: the series arrive already computed (from the report's Chart blocks).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass

#: Dot bits of a braille cell, by (column, row) of the 2 x 4 dot grid.
_BRAILLE_BITS = {
    (0, 0): 0x01,
    (0, 1): 0x02,
    (0, 2): 0x04,
    (0, 3): 0x40,
    (1, 0): 0x08,
    (1, 1): 0x10,
    (1, 2): 0x20,
    (1, 3): 0x80,
}
_BRAILLE_BASE = 0x2800

#: Mark characters of the series in plain mode (and in the legend).
PLAIN_MARKS = "*o+x#@%&"


@dataclass
class ChartLines:
    """A drawn chart: its text lines and, per cell, the series that drew it (-1: none)."""

    lines: list[str]
    owners: list[list[int]]
    legend: list[tuple[str, str]]  # (mark, series name)


def _finite_pairs(xs: Sequence, ys: Sequence, log_x: bool) -> list[tuple[float, float]]:
    out = []
    for x, y in zip(xs, ys):
        if x is None or y is None:
            continue
        x, y = float(x), float(y)
        if not (math.isfinite(x) and math.isfinite(y)):
            continue
        if log_x:
            if x <= 0:
                continue
            x = math.log10(x)
        out.append((x, y))
    return out


def _label(value: float) -> str:
    """A short axis label: 3 significant figures, no exponent for ordinary sizes."""
    if value == 0 or not math.isfinite(value):
        return "0"
    magnitude = abs(value)
    if magnitude >= 1e5 or magnitude < 1e-2:
        return f"{value:.1e}"
    text = f"{value:.3g}"
    return text


def draw_chart(
    series: Sequence[tuple[str, Sequence[float], Sequence[float]]],
    width: int,
    height: int,
    *,
    plain: bool = False,
    x_label: str = "",
    y_label: str = "",
    log_x: bool = False,
    y_from_zero: bool = True,
) -> ChartLines:
    """Draw line charts of ``series`` into ``width`` x ``height`` character cells.

    Parameters
    ----------
    series : sequence of (name, xs, ys)
        The curves; points that are None, NaN or infinite are left out.
    width, height : int
        Size of the whole drawing in character cells, axes and labels included.
    plain : bool
        Plain characters only (no braille, no box drawing).
    x_label, y_label : str
        Axis titles, written under the x axis.
    log_x : bool
        A logarithmic x axis.
    y_from_zero : bool
        Start the y axis at zero where every value is positive.

    Returns
    -------
    ChartLines
        The lines (each exactly ``width`` characters), the series owning each cell, and
        the legend entries.

    Examples
    --------
    >>> c = draw_chart([("a", [0, 1, 2], [0, 1, 4])], 30, 8, plain=True)
    >>> len(c.lines), {len(line) for line in c.lines}
    (8, {30})
    >>> any("*" in line for line in c.lines)
    True
    """
    width = max(int(width), 12)
    height = max(int(height), 5)
    pairs = [(name, _finite_pairs(xs, ys, log_x)) for name, xs, ys in series]
    pairs = [(name, pts) for name, pts in pairs if pts]
    marks = [PLAIN_MARKS[k % len(PLAIN_MARKS)] for k in range(len(pairs))]
    legend = [(marks[k], name) for k, (name, _) in enumerate(pairs)]
    if not pairs:
        blank = " " * width
        lines = [blank] * height
        lines[height // 2] = "(no points to draw)".center(width)[:width]
        return ChartLines(lines, [[-1] * width for _ in range(height)], [])

    xs = [x for _, pts in pairs for x, _ in pts]
    ys = [y for _, pts in pairs for _, y in pts]
    x0, x1 = min(xs), max(xs)
    y0, y1 = min(ys), max(ys)
    if y_from_zero and y0 > 0:
        y0 = 0.0
    if x1 == x0:
        x0, x1 = x0 - 0.5, x1 + 0.5
    if y1 == y0:
        y0, y1 = y0 - 0.5, y1 + 0.5

    y_labels = [_label(y1), _label((y0 + y1) / 2), _label(y0)]
    label_w = max(len(s) for s in y_labels)
    plot_w = width - label_w - 1  # one column for the axis line
    plot_h = height - 2  # x tick labels and axis titles below
    grid = [[" "] * plot_w for _ in range(plot_h)]
    owner = [[-1] * plot_w for _ in range(plot_h)]

    if plain:
        sub_x, sub_y = 1, 1
    else:
        sub_x, sub_y = 2, 4
        bits = [[0] * plot_w for _ in range(plot_h)]
    dots_w, dots_h = plot_w * sub_x, plot_h * sub_y

    def to_dot(x: float, y: float) -> tuple[int, int]:
        dx = int(round((x - x0) / (x1 - x0) * (dots_w - 1)))
        dy = int(round((y1 - y) / (y1 - y0) * (dots_h - 1)))
        return dx, dy

    def plot(k: int, dx: int, dy: int) -> None:
        cx, cy = dx // sub_x, dy // sub_y
        if not (0 <= cx < plot_w and 0 <= cy < plot_h):
            return
        if plain:
            grid[cy][cx] = marks[k]
        else:
            bits[cy][cx] |= _BRAILLE_BITS[(dx % 2, dy % 4)]
        owner[cy][cx] = k

    ends: list[tuple[int, int]] = []
    for k, (_, pts) in enumerate(pairs):
        previous = None
        for x, y in pts:
            here = to_dot(x, y)
            if previous is None:
                plot(k, *here)
            else:
                # a straight line between neighbouring points (Bresenham's line algorithm)
                (ax, ay), (bx, by) = previous, here
                steps = max(abs(bx - ax), abs(by - ay), 1)
                for s in range(steps + 1):
                    plot(k, ax + round((bx - ax) * s / steps), ay + round((by - ay) * s / steps))
            previous = here
        ends.append(previous)

    if len(pairs) > 1 and not plain:
        # each series' number at its last point, readable without colour; drawn after
        # every curve so that no curve hides it, moved left where two numbers meet
        taken: set[tuple[int, int]] = set()
        for k, (dx, dy) in enumerate(ends):
            cx, cy = min(dx // sub_x, plot_w - 1), min(dy // sub_y, plot_h - 1)
            while (cx, cy) in taken and cx > 0:
                cx -= 1
            taken.add((cx, cy))
            grid[cy][cx] = str(k + 1) if k < 9 else "+"
            bits[cy][cx] = -1
            owner[cy][cx] = k

    if not plain:
        for r in range(plot_h):
            for c in range(plot_w):
                if bits[r][c] > 0:
                    grid[r][c] = chr(_BRAILLE_BASE + bits[r][c])

    axis_v = "|" if plain else "│"
    corner = "+" if plain else "└"
    axis_h = "-" if plain else "─"
    lines, owners = [], []
    middle = plot_h // 2
    for r in range(plot_h):
        label = (
            y_labels[0]
            if r == 0
            else y_labels[2]
            if r == plot_h - 1
            else (y_labels[1] if r == middle and plot_h > 4 else "")
        )
        lines.append(f"{label:>{label_w}}{axis_v}" + "".join(grid[r]))
        owners.append([-1] * (label_w + 1) + owner[r])
    # the x axis line carries the tick labels: low end, middle, high end
    lo_x, mid_x, hi_x = x0, (x0 + x1) / 2, x1
    if log_x:
        lo_x, mid_x, hi_x = 10**lo_x, 10**mid_x, 10**hi_x
    lo, mid, hi = _label(lo_x), _label(mid_x), _label(hi_x)
    ticks = list(axis_h * plot_w)
    ticks[: len(lo)] = lo
    start = max(len(lo) + 1, plot_w // 2 - len(mid) // 2)
    if start + len(mid) < plot_w - len(hi) - 1:
        ticks[start : start + len(mid)] = mid
    ticks[plot_w - len(hi) :] = hi
    lines.append(" " * label_w + corner + "".join(ticks)[:plot_w])
    owners.append([-1] * width)
    title = f"x: {x_label}" + ("  (log)" if log_x else "") + f"   y: {y_label}"
    lines.append((" " * (label_w + 1) + title)[:width].ljust(width))
    owners.append([-1] * width)
    return ChartLines([line.ljust(width)[:width] for line in lines], owners, legend)


def wrap_legend(legend: list[tuple[str, str]], plain: bool, width: int) -> list[str]:
    """The legend in lines of at most ``width`` characters, breaking between series.

    >>> wrap_legend([("*", "a" * 10), ("o", "b" * 10)], True, 16)
    ['* aaaaaaaaaa', 'o bbbbbbbbbb']
    """
    if not legend:
        return []
    if len(legend) == 1 and not plain:
        return [legend[0][1][:width]]
    entries = [f"{mark if plain else k + 1} {name}" for k, (mark, name) in enumerate(legend)]
    lines = [entries[0][:width]]
    for entry in entries[1:]:
        if len(lines[-1]) + 3 + len(entry) <= width:
            lines[-1] += "   " + entry
        else:
            lines.append(entry[:width])
    return lines
