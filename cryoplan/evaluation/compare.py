"""Two plans side by side: the summary figures of each, their differences and percentages.

Pure logic on two ``Results.to_dict()`` dictionaries: no files, no printing, no physics.
:func:`compare_results` gives one row per summary figure; the ``compare`` command formats
the rows as text, Markdown or JSON.

Nested summary objects are flattened with dots (``order_L.helium``). A cryogen that one
plan does not use counts as zero litres (and zero cost) in the amounts it would be
ordered or boiled in (:data:`ZERO_WHEN_MISSING`, and any per-cryogen figure in litres); any
other figure missing on one side (a hold time, a cooldown time, an oxygen level) is shown
as missing, not as zero.

A figure that is itself a percentage (the lowest oxygen) changes in percentage points: its
``percent`` is left out rather than given as a percentage of a percentage. Costs in two
different currencies are shown side by side but not subtracted.
"""

from __future__ import annotations

import math
from dataclasses import asdict, dataclass

from .summary import label_and_unit

__all__ = [
    "SAME_RELATIVE",
    "ZERO_WHEN_MISSING",
    "Row",
    "compare_results",
    "compare_summaries",
    "flatten",
    "label_and_unit",
]

#: Summary keys whose figures are amounts: a cryogen absent from a plan is none of it.
ZERO_WHEN_MISSING = ("cooldown_liquid_L", "order_L", "cost", "static_boiloff_L_per_day")

#: Relative difference below which two figures count as the same (floating-point noise of
#: two evaluations; far below the 3 significant figures printed).
SAME_RELATIVE = 1e-9


@dataclass
class Row:
    """One summary figure of both plans."""

    key: str  # the flattened summary key, e.g. "order_L.helium"
    label: str  # e.g. "Order, helium"
    unit: str  # e.g. "L"; "" for a count or a cost (see the currency)
    a: float | None
    b: float | None
    difference: float | None  # b - a
    percent: float | None  # 100 (b - a) / |a|; None where a is 0 or missing, or unit is %
    same: bool


def flatten(summary: dict, prefix: str = "") -> dict:
    """Nested summary objects flattened to dotted keys, in their order.

    >>> flatten({"order_L": {"helium": 350.0}, "minimum_work_J": 1.0e7})
    {'order_L.helium': 350.0, 'minimum_work_J': 10000000.0}
    """
    out: dict = {}
    for key, value in summary.items():
        name = f"{prefix}.{key}" if prefix else str(key)
        if isinstance(value, dict):
            out.update(flatten(value, name))
        else:
            out[name] = value
    return out


def _number(value) -> float | None:
    if isinstance(value, bool) or value is None:
        return None
    try:
        value = float(value)
    except (TypeError, ValueError):
        return None
    return value if math.isfinite(value) else None


def _same(a: float | None, b: float | None) -> bool:
    if a is None or b is None:
        return a is None and b is None
    return abs(b - a) <= SAME_RELATIVE * max(abs(a), abs(b)) or a == b


def compare_summaries(a: dict, b: dict) -> list[Row]:
    """One row per numeric summary figure of either plan, A's order first.

    Parameters
    ----------
    a, b : dict
        The ``summary`` objects of two ``Results.to_dict()``.

    Returns
    -------
    list of Row
        ``difference`` is B - A in the figure's own unit; ``percent`` is relative to A.

    Examples
    --------
    >>> rows = compare_summaries({"order_L": {"helium": 200.0}},
    ...                          {"order_L": {"helium": 300.0, "nitrogen": 50.0}})
    >>> [(r.key, r.difference, r.percent) for r in rows]
    [('order_L.helium', 100.0, 50.0), ('order_L.nitrogen', 50.0, None)]
    """
    fa, fb = flatten(a), flatten(b)
    cur_a, cur_b = str(a.get("currency") or ""), str(b.get("currency") or "")
    currency = cur_a or cur_b
    two_currencies = bool(cur_a and cur_b and cur_a != cur_b)
    keys = list(fa) + [k for k in fb if k not in fa]
    rows = []
    for key in keys:
        va, vb = fa.get(key), fb.get(key)
        if isinstance(va, str) or isinstance(vb, str):
            continue  # a label such as the currency, not a figure
        na, nb = _number(va), _number(vb)
        label, unit = label_and_unit(key, currency)
        top = key.partition(".")[0]
        if "." in key and (top in ZERO_WHEN_MISSING or unit in ("L", "L/day")):
            na = 0.0 if key not in fa else na
            nb = 0.0 if key not in fb else nb
        if na is None and nb is None:
            continue  # a figure neither plan has (no cooler: no cooldown time)
        if top == "cost" and two_currencies:
            label, unit = f"{label} (A in {cur_a}, B in {cur_b})", ""
            rows.append(Row(key, label, unit, na, nb, None, None, False))
            continue
        diff = None if na is None or nb is None else nb - na
        same = _same(na, nb)
        if same and diff is not None:
            diff = 0.0
        percent = None
        if diff is not None and na and unit != "%":
            percent = 0.0 if same else 100.0 * diff / abs(na)
        rows.append(Row(key, label, unit, na, nb, diff, percent, same))
    return rows


def compare_results(a: dict, b: dict) -> dict:
    """The comparison of two plans' results, as the JSON of ``cryoplan compare``.

    Parameters
    ----------
    a, b : dict
        Two ``Results.to_dict()``.

    Returns
    -------
    dict
        ``{"a": {title, file}, "b": {...}, "currency": ..., "rows": [Row as dict, ...],
        "differences": number of rows that differ}``.

    Examples
    --------
    >>> r = {"plan": {"title": "x", "file": "x.toml"}, "summary": {"minimum_work_J": 5.0}}
    >>> compare_results(r, r)["differences"]
    0
    """
    rows = compare_summaries(a.get("summary", {}), b.get("summary", {}))

    def who(d):
        p = d.get("plan", {})
        return {"title": p.get("title", ""), "file": p.get("file", "")}

    return {
        "a": who(a),
        "b": who(b),
        "currency": str(
            a.get("summary", {}).get("currency") or b.get("summary", {}).get("currency") or ""
        ),
        "rows": [asdict(r) for r in rows],
        "differences": sum(1 for r in rows if not r.same),
    }
