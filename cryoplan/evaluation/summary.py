"""The summary's fields, defined once: each key of ``Results.to_dict()["summary"]`` with its
label, unit and whether it is given per cryogen.

The printed report (:mod:`cryoplan.report.budget`), the comparison of two plans
(:mod:`cryoplan.evaluation.compare` and ``cryoplan compare``) and the dashboard's summary
strip read their labels here. A summary key not listed (a figure added later) still gets a
label from its name and a unit from its suffix (:func:`label_and_unit`).
"""

from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class SummaryField:
    """One field of the summary.

    ``label`` names the figure ("Hold time"); ``unit`` is its unit ("" for a count; the
    plan's currency for a cost); ``per_cryogen`` says the value is an object by cryogen;
    ``report_suffix`` is what the printed report adds after it (" (full to empty)");
    ``short`` is the dashboard's short label; ``figure`` is False for a text (the
    currency).
    """

    key: str
    label: str
    unit: str
    per_cryogen: bool
    report_suffix: str = ""
    short: str = ""
    figure: bool = True


#: The summary's fields, in the order of the summary object.
SUMMARY_FIELDS: dict[str, SummaryField] = {
    f.key: f
    for f in (
        SummaryField("cooldown_liquid_L", "Cooldown liquid", "L", True, short="cooldown"),
        SummaryField("order_L", "Order", "L", True, short="order"),
        SummaryField(
            "static_boiloff_L_per_day", "Static boil-off", "L/day", True, short="boil-off"
        ),
        SummaryField("hold_time_h", "Hold time", "h", True, " (full to empty)", "hold"),
        SummaryField(
            "minimum_work_J", "Minimum work", "J", False, " (reversible)", "minimum work"
        ),
        SummaryField(
            "cooldown_time_h", "Cooldown time", "h", False, " (cooler)", "cooldown (cooler)"
        ),
        SummaryField(
            "lowest_oxygen_percent",
            "Lowest oxygen",
            "%",
            False,
            ", worst room case",
            "lowest oxygen",
        ),
        SummaryField("cost", "Cost", "", True, short="cost"),
        SummaryField("currency", "Currency", "", False, figure=False),
        SummaryField("heat_J", "Heat to remove", "J", False, short="heat"),
        SummaryField("month_order_L", "Month order", "L", True, short="month"),
    )
}

#: Units read from a key's suffix, for keys not in :data:`SUMMARY_FIELDS` (longest first).
SUFFIX_UNITS = (
    ("_L_per_day", "L/day"),
    ("_J_per_K", "J/K"),
    ("_percent", "%"),
    ("_kWh", "kWh"),
    ("_L", "L"),
    ("_J", "J"),
    ("_h", "h"),
    ("_K", "K"),
    ("_W", "W"),
    ("_kg", "kg"),
    ("_s", "s"),
    ("_m3", "m^3"),
)


def summary_field(key: str) -> SummaryField | None:
    """The field of a summary key (the part before any dot), or None if not listed.

    >>> summary_field("order_L.helium").unit
    'L'
    """
    return SUMMARY_FIELDS.get(key.partition(".")[0])


def label_and_unit(key: str, currency: str = "") -> tuple[str, str]:
    """A reader's label and the unit of a flattened summary key.

    >>> label_and_unit("order_L.helium")
    ('Order, helium', 'L')
    >>> label_and_unit("cost.helium", "USD")
    ('Cost, helium', 'USD')
    >>> label_and_unit("peak_heat_load_W.shield")
    ('Peak heat load, shield', 'W')
    """
    top, _, rest = key.partition(".")
    field = SUMMARY_FIELDS.get(top)
    if field is not None:
        label, unit = field.label, field.unit
    else:
        unit = ""
        stem = top
        for suffix, u in SUFFIX_UNITS:
            if top.endswith(suffix):
                unit, stem = u, top[: -len(suffix)]
                break
        label = stem.replace("_", " ").strip().capitalize() or top
    if top == "cost":
        unit = currency
    if rest:
        label = f"{label}, {rest.replace('.', ', ')}"
    return label, unit


def report_label(key: str, cryogen: str | None = None) -> str:
    """The printed report's label of a summary figure: label, cryogen, then its suffix.

    >>> report_label("hold_time_h", "helium")
    'Hold time, helium (full to empty)'
    >>> report_label("minimum_work_J")
    'Minimum work (reversible)'
    """
    field = SUMMARY_FIELDS[key]
    text = field.label + (f", {cryogen}" if cryogen else "")
    return text + field.report_suffix
