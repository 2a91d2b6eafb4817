"""The printed budget as a list of blocks (headings, tables, paragraphs), built from
``Results.to_dict()``. Text, Markdown and PDF writers render the same blocks; no physics here.
"""

from __future__ import annotations

from dataclasses import dataclass, field


@dataclass
class Heading:
    text: str
    level: int = 1


@dataclass
class Table:
    headers: list[str]
    rows: list[list[str]]
    align: str = ""  # one letter per column: l or r; default: first l, rest r
    title: str = ""
    name: str = ""  # a short file-friendly name (CSV export)


@dataclass
class Paragraph:
    text: str


@dataclass
class Bullets:
    items: list[str]
    numbered: bool = False


@dataclass
class Chart:
    """A curve for views that draw: x and y series with labels (already computed)."""

    title: str
    x_label: str
    y_label: str
    series: list[tuple[str, list[float], list[float]]] = field(default_factory=list)
    name: str = ""
    log_x: bool = False


# --- number formatting -------------------------------------------------------------------


def sig(value, digits: int = 3) -> str:
    """A number to ``digits`` significant figures, no exponent for ordinary sizes.

    >>> sig(1234.5), sig(0.012345), sig(0.0), sig(None)
    ('1234', '0.0123', '0', '-')
    """
    if value is None:
        return "-"
    value = float(value)
    if value == 0:
        return "0"
    if abs(value) >= 10**digits or abs(value) < 1e-3:
        if abs(value) >= 1e6 or abs(value) < 1e-3:
            return f"{value:.{digits - 1}e}"
        return f"{value:.0f}"
    text = f"{value:.{digits}g}"
    if "e" in text:
        text = f"{value:.{max(0, digits - 1)}f}"
    return text


def energy(joules) -> str:
    """Formatting for the budget.

    >>> energy(1.5e6), energy(2300.0), energy(12.0), energy(210e3)
    ('1.50 MJ', '2.30 kJ', '12.0 J', '210 kJ')
    """
    if joules is None:
        return "-"
    j = float(joules)
    if j == 0:
        return "-"
    for scale, unit in ((1e9, "GJ"), (1e6, "MJ"), (1e3, "kJ")):
        if abs(j) >= scale:
            return f"{_three(j / scale)} {unit}"
    return f"{_three(j)} J"


def _three(x: float) -> str:
    """Three significant figures, keeping trailing zeros but no bare trailing point."""
    text = f"{x:#.3g}"
    return text[:-1] if text.endswith(".") else text


def litres(value) -> str:
    """Formatting for the budget.

    >>> litres(12.345), litres(0.0123)
    ('12.3', '0.0123')
    """
    return sig(value, 3)


def money(value, currency: str) -> str:
    if value is None:
        return "-"
    return f"{value:,.0f} {currency}".strip()


def duration_h(hours) -> str:
    """Formatting for the budget.

    >>> duration_h(30.5), duration_h(400.0)
    ('30.5 h', '400 h (16.7 d)')
    """
    if hours is None:
        return "-"
    if hours > 72:
        return f"{hours:.0f} h ({hours / 24:.1f} d)"
    return f"{hours:.3g} h"
