"""Which part of the printed budget goes to which panel of the dashboard.

The dashboard shows the same blocks the printed budget is made of
(:func:`cryoplan.report.budget.build_document`): it splits them at their top-level
headings and sends each section to a panel by the words of its heading. A section whose
heading says nothing known lands in the notes panel, so nothing the report prints is ever
hidden. No physics and no figures are made here.
"""

from __future__ import annotations

from dataclasses import dataclass, field

#: The panels, in the order of their keys (1 to 6).
PANELS: list[tuple[str, str]] = [
    ("plan", "Cold mass"),
    ("budget", "Budget"),
    ("cold", "Once cold"),
    ("cooler", "Refrigeration"),
    ("room", "Room"),
    ("notes", "Notes"),
]

#: Headings that close the printed budget: they go to the notes panel.
_CLOSING = ("notes", "assumptions", "cautions", "sources")

#: Words of a heading, checked in this order, and the panel they send a section to.
_ROUTES: list[tuple[tuple[str, ...], str]] = [
    (_CLOSING, "notes"),
    (("summary",), "summary"),
    (("cold mass",), "plan"),
    (("refrigerat", "cooler", "carnot", "cooldown time", "cooldown curve", "steady"), "cooler"),
    (("room", "oxygen", "ventilat", "quench"), "room"),
    (("load", "boil", "hold", "refill", "once cold", "bath", "calendar", "static"), "cold"),
    (("budget", "step", "order", "dewar", "liquefaction", "insert", "cooldown"), "budget"),
]

#: What each panel shows where the plan has none of it.
ABSENT: dict[str, str] = {
    "cold": "Not in this plan: no static loads or baths ([[load]], [[bath]]), so no "
    "boil-off, hold time or refill calendar.",
    "cooler": "Not in this plan: no cryocooler ([cooler]), so no Carnot comparison, "
    "cooldown time or cooldown curve.",
    "room": "Not in this plan: no room ([[room]]), so no oxygen estimates.",
    "budget": "Not in this plan: no cooldown budget.",
    "notes": "No notes.",
    "plan": "",
}

#: Result keys whose presence (non-empty) means the panel has figures of its own.
DATA_KEYS: dict[str, tuple[str, ...]] = {
    "cold": ("loads",),
    "cooler": ("refrigeration",),
    "room": ("rooms",),
}


def heading_text(block) -> str | None:
    """The text of a top-level heading block, else None."""
    if type(block).__name__ == "Heading" and getattr(block, "level", 1) == 1:
        return block.text
    return None


def route(heading: str) -> str:
    """The panel a section goes to, by its heading.

    >>> route("Cooldown budget by temperature band"), route("Room oxygen")
    ('budget', 'room')
    >>> route("Refrigeration: Carnot against real"), route("Static heat loads")
    ('cooler', 'cold')
    >>> route("Something new")
    'notes'
    """
    lowered = heading.lower()
    for words, panel in _ROUTES:
        if any(w in lowered for w in words):
            return panel
    return "notes"


@dataclass
class Section:
    heading: str
    blocks: list = field(default_factory=list)


def split_sections(blocks: list) -> list[Section]:
    """Blocks split at top-level headings (a leading part without a heading keeps "")."""
    sections: list[Section] = []
    for b in blocks:
        text = heading_text(b)
        if text is not None:
            sections.append(Section(text, [b]))
        else:
            if not sections:
                sections.append(Section(""))
            sections[-1].blocks.append(b)
    return sections


def by_panel(blocks: list) -> dict[str, list]:
    """The blocks of each panel (and of the summary strip), in reading order."""
    out: dict[str, list] = {key: [] for key, _ in PANELS}
    out["summary"] = []
    for section in split_sections(blocks):
        out[route(section.heading) if section.heading else "notes"] += section.blocks
    return out


def present(data: dict, panel: str, blocks: list) -> bool:
    """True when the plan has something for the panel: figures in the results or blocks
    that the report prints for it."""
    keys = DATA_KEYS.get(panel)
    if keys is not None and not any(data.get(k) for k in keys):
        # the report may still print a section for it: then it is present after all
        return any(type(b).__name__ != "Heading" for b in blocks)
    return bool(blocks)
