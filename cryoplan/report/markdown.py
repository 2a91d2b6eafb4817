"""Markdown of the printed budget."""

from __future__ import annotations

from .document import Bullets, Chart, Heading, Paragraph, Table
from .text import ascii_chart


def _cell(text) -> str:
    return str(text).replace("|", "\\|")


def render_markdown(data: dict, blocks) -> str:
    p = data["plan"]
    out = [
        f"# Cryoplan budget: {p['title']}",
        "",
        f"Plan file: `{p['file']}`  ",
        f"Printed {p['date']} by cryoplan {p['cryoplan_version']}",
    ]
    for b in blocks:
        out.append("")
        if isinstance(b, Heading):
            out.append("#" * (b.level + 1) + " " + b.text)
        elif isinstance(b, Table):
            if b.title:
                out += [f"**{b.title}**", ""]
            align = b.align or ("l" + "r" * (len(b.headers) - 1))
            out.append("| " + " | ".join(_cell(h) for h in b.headers) + " |")
            out.append("|" + "|".join(":---" if a == "l" else "---:" for a in align) + "|")
            for row in b.rows:
                out.append("| " + " | ".join(_cell(c) for c in row) + " |")
        elif isinstance(b, Paragraph):
            out.append(b.text)
        elif isinstance(b, Bullets):
            for i, item in enumerate(b.items, start=1):
                out.append(f"{i}. {item}" if b.numbered else f"- {item}")
        elif isinstance(b, Chart):
            out += ["```"] + ascii_chart(b) + ["```"]
    return "\n".join(out) + "\n"
