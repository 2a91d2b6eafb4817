"""The summary strip at the top of the dashboard: order, cost, boil-off and hold per
cryogen, then minimum work, the cooler's cooldown time and the lowest oxygen level.

The figures are the evaluation's summary (``Results.to_dict()["summary"]``), formatted by
the printed budget's own formatters; nothing is computed here.
"""

from __future__ import annotations

from rich.text import Text
from textual.widgets import Static

from .figures import CHANGED

#: The short deferral that stands beside every oxygen figure.
OXYGEN_DEFERRAL = (
    "planning aid only: local codes, the site's safety office and licensed practice decide"
)


def summary_items(data: dict | None) -> list[tuple[str, list[tuple[str, str]]]]:
    """(group, [(label, value)]) of the strip: one group per cryogen, then the rest."""
    from ...evaluation.summary import SUMMARY_FIELDS
    from ...report.document import duration_h, energy, litres, money, sig

    def short(key: str) -> str:
        return SUMMARY_FIELDS[key].short

    s = data.get("summary", {}) if data else {}
    groups: list[tuple[str, list[tuple[str, str]]]] = []
    cryogens = list(dict.fromkeys(list(s.get("order_L", {})) + list(s.get("hold_time_h", {}))))
    for cry in cryogens:
        items = []
        if cry in s.get("order_L", {}):
            items.append((short("order_L"), f"{litres(s['order_L'][cry])} L"))
        if cry in s.get("cost", {}):
            items.append((short("cost"), money(s["cost"][cry], s.get("currency", ""))))
        if cry in s.get("static_boiloff_L_per_day", {}):
            items.append(
                (
                    short("static_boiloff_L_per_day"),
                    f"{litres(s['static_boiloff_L_per_day'][cry])} L/day",
                )
            )
        if cry in s.get("hold_time_h", {}):
            items.append((short("hold_time_h"), duration_h(s["hold_time_h"][cry])))
        groups.append((cry, items))
    rest = []
    if s.get("minimum_work_J") is not None:
        rest.append(
            (
                short("minimum_work_J"),
                f"{energy(s['minimum_work_J'])} ({sig(s['minimum_work_J'] / 3.6e6)} kWh)",
            )
        )
    if s.get("cooldown_time_h") is not None:
        rest.append((short("cooldown_time_h"), duration_h(s["cooldown_time_h"])))
    if s.get("lowest_oxygen_percent") is not None:
        rest.append((short("lowest_oxygen_percent"), f"{s['lowest_oxygen_percent']:.1f} %"))
    if rest:
        groups.append(("", rest))
    return groups


def summary_cells(data: dict | None) -> dict:
    """Every figure of the strip by (``"summary"``, group, label), to mark changes."""
    return {
        ("summary", g, label): value for g, items in summary_items(data) for label, value in items
    }


def summary_text(data: dict | None, width: int, highlight: set) -> Text:
    """The summary strip, wrapped by hand so that a figure never parts from its unit or
    its label: one line or more per cryogen, then the rest."""
    width = max(20, width - 2)
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

    for n, (group, items) in enumerate(summary_items(data)):
        if n:
            out.append("\n")
            line = 0
        for k, (label, value) in enumerate(items):
            piece = Text()
            if group and k == 0:
                piece.append(f"{group}: ", style="bold")
            style = CHANGED if ("summary", group, label) in highlight else "bold"
            piece.append(f"{label} ")
            piece.append(value, style=style)
            put(piece, "  ")
            if label == "lowest oxygen":
                for word in f"({OXYGEN_DEFERRAL})".split(" "):
                    put(Text(word), " ")
    return out


class SummaryStrip(Static):
    """The summary strip; a new layout only when its lines change length."""

    _shape: list[int] | None = None

    def show(self, data: dict | None, width: int, highlight: set = frozenset()) -> None:
        if data is None:
            self._shape = None
            self.update("")
            return
        text = summary_text(data, width, highlight)
        shape = [len(line) for line in text.plain.split("\n")]
        same = shape == self._shape
        self._shape = shape
        self.update(text, layout=not same)
