"""Plain text that fits 80 columns and prints well on paper."""

from __future__ import annotations

import textwrap

from .document import Bullets, Chart, Heading, Paragraph, Table


def _wrap_table(table: Table, width: int) -> list[str]:
    ncol = len(table.headers)
    align = table.align or ("l" + "r" * (ncol - 1))
    cells = [table.headers] + table.rows
    widths = [max(len(str(r[i])) for r in cells) for i in range(ncol)]
    gap = 2
    while sum(widths) + gap * (ncol - 1) > width:
        candidates = [i for i in range(ncol) if widths[i] > 6]
        if not candidates:
            break
        i = max(candidates, key=lambda k: widths[k])
        widths[i] -= 1

    def lines_of(row):
        wrapped = [textwrap.wrap(str(c), widths[i]) or [""] for i, c in enumerate(row)]
        height = max(len(w) for w in wrapped)
        out = []
        for k in range(height):
            parts = []
            for i, w in enumerate(wrapped):
                text = w[k] if k < len(w) else ""
                parts.append(text.ljust(widths[i]) if align[i] == "l" else text.rjust(widths[i]))
            out.append((" " * gap).join(parts).rstrip())
        return out

    out = []
    if table.title:
        out += textwrap.wrap(table.title, width)
    out += lines_of(table.headers)
    out.append("-" * min(width, sum(widths) + gap * (ncol - 1)))
    for row in table.rows:
        out += lines_of(row)
    return out


def ascii_chart(chart: Chart, width: int = 72, height: int = 14) -> list[str]:
    """A plain-character chart of the chart's series (marks 1, 2, 3 ... per series)."""
    xs = [x for _, sx, _ in chart.series for x in sx]
    ys = [y for _, _, sy in chart.series for y in sy]
    if not xs:
        return []
    x0, x1 = min(xs), max(xs)
    y0, y1 = min(0.0, min(ys)), max(ys)
    if x1 == x0:
        x1 = x0 + 1
    if y1 == y0:
        y1 = y0 + 1
    label_w = max(len(f"{y1:.3g}"), len(f"{y0:.3g}"))
    plot_w = width - label_w - 2
    grid = [[" "] * plot_w for _ in range(height)]
    marks = "*o+x#@%=~"
    for k, (_, sx, sy) in enumerate(chart.series):
        for x, y in zip(sx, sy):
            col = int(round((x - x0) / (x1 - x0) * (plot_w - 1)))
            row = int(round((y1 - y) / (y1 - y0) * (height - 1)))
            grid[row][col] = marks[k % len(marks)]
    out = [chart.title]
    for r, row in enumerate(grid):
        label = f"{y1:.3g}" if r == 0 else (f"{y0:.3g}" if r == height - 1 else "")
        out.append(f"{label:>{label_w}} |" + "".join(row).rstrip())
    out.append(" " * label_w + " +" + "-" * plot_w)
    lo, hi = f"{x0:.4g}", f"{x1:.4g}"
    out.append(" " * (label_w + 2) + lo + " " * max(1, plot_w - len(lo) - len(hi)) + hi)
    out.append(" " * (label_w + 2) + f"x: {chart.x_label}; y: {chart.y_label}")
    legend = "; ".join(
        f"{marks[k % len(marks)]} {name}" for k, (name, _, _) in enumerate(chart.series)
    )
    out += textwrap.wrap(
        legend, width, initial_indent=" " * (label_w + 2), subsequent_indent=" " * (label_w + 2)
    )
    return out


def render_blocks(blocks, width: int = 80) -> list[str]:
    out: list[str] = []
    for b in blocks:
        if isinstance(b, Heading):
            lines = textwrap.wrap(b.text.upper() if b.level == 1 else b.text, width)
            out += ["", *lines, ("=" if b.level == 1 else "-") * max(len(x) for x in lines)]
        elif isinstance(b, Table):
            out.append("")
            out += _wrap_table(b, width)
        elif isinstance(b, Paragraph):
            out.append("")
            out += textwrap.wrap(b.text, width)
        elif isinstance(b, Bullets):
            out.append("")
            for i, item in enumerate(b.items, start=1):
                head = f"[{i}] " if b.numbered else "- "
                out += textwrap.wrap(
                    item, width, initial_indent=head, subsequent_indent=" " * len(head)
                )
        elif isinstance(b, Chart):
            out.append("")
            out += ascii_chart(b, width=min(width, 78))
    return out


def _tail(label: str, path: str, width: int) -> str:
    """A label and a path, cut from the left to fit (the file name stays whole)."""
    room = width - len(label)
    return label + (path if len(path) <= room else "..." + path[-(room - 3) :])


def render_text(data: dict, blocks, width: int = 80) -> str:
    p = data["plan"]
    head = [
        "=" * width,
        textwrap.shorten(f"CRYOPLAN BUDGET: {p['title']}", width),
        _tail("Plan file: ", p["file"], width),
        f"Printed {p['date']} by cryoplan {p['cryoplan_version']}",
        "=" * width,
    ]
    return "\n".join(head + render_blocks(blocks, width)) + "\n"
