"""``cryoplan compare A.toml B.toml``: two plans' summary figures side by side.

For deciding between two plans (say, with and without a nitrogen precool): each summary
figure of A and of B, the difference B - A and the change in percent of A; as text that
fits 80 columns, Markdown, or JSON. The comparison itself is :mod:`cryoplan.compare`.
"""

from __future__ import annotations

import json
import os
import sys
import textwrap

from ..errors import CryoplanError, InputError

FORMATS = ("text", "markdown", "json")


def register(sub) -> None:
    p = sub.add_parser(
        "compare",
        help="compare the summary figures of two plans",
        description="Show the summary figures of two plan files side by side, "
        "with the difference B - A and the change in percent of A.",
    )
    p.add_argument("plan_a", metavar="A", help="the first plan file (TOML)")
    p.add_argument("plan_b", metavar="B", help="the second plan file (TOML)")
    p.add_argument(
        "--format", "-f", default="text", choices=FORMATS, help="output format (default: text)"
    )
    p.add_argument(
        "-o",
        "--output",
        metavar="FILE",
        help="write to FILE instead of the screen (kept as FILE.bak if it exists; a link "
        "is followed, a device or pipe written through; a plan or a folder is refused)",
    )
    p.add_argument("--width", type=int, default=80, help="text width in columns (default 80)")
    p.set_defaults(func=run)


def _evaluate_both(path_a: str, path_b: str) -> tuple[dict, dict]:
    """Both plans' results; a plan that fails to load or evaluate stops the comparison with
    its own message (both messages when both fail)."""
    from ..evaluation.chain import evaluate
    from ..plan.reader import load_plan

    results: list[dict | None] = []
    errors: list[CryoplanError] = []
    same_file = os.path.realpath(path_a) == os.path.realpath(path_b)
    for path in [path_a] if same_file else [path_a, path_b]:
        try:
            results.append(evaluate(load_plan(path)).to_dict())
        except CryoplanError as exc:
            errors.append(exc)
            results.append(None)
    if len(errors) == 1:
        raise errors[0]
    if errors:
        raise CryoplanError(
            f"neither plan can be loaded for the comparison:\nA: {errors[0]}\nB: {errors[1]}"
        )
    if same_file:
        return results[0], results[0]
    return results[0], results[1]


# --- formatting ----------------------------------------------------------------------------

_ENERGY_SCALES = ((1e9, "GJ"), (1e6, "MJ"), (1e3, "kJ"), (1.0, "J"))


def _scaled(row: dict) -> tuple[str, float]:
    """The unit to print a row in and the factor to divide by (energies in kJ, MJ, GJ)."""
    if row["unit"] != "J":
        return row["unit"], 1.0
    size = max(abs(v) for v in (row["a"], row["b"], 0.0) if v is not None)
    for scale, unit in _ENERGY_SCALES:
        if size >= scale:
            return unit, scale
    return "J", 1.0


def _value(v: float | None, scale: float, signed: bool = False, money: bool = False) -> str:
    from ..report.document import sig

    if v is None:
        return "-"
    text = f"{v / scale:,.0f}" if money and abs(v / scale) >= 100 else sig(v / scale, 3)
    return ("+" + text) if signed and v > 0 else text


def _change(row: dict) -> str:
    if row["same"]:
        return "same"
    if row["a"] is None:
        return "only B"
    if row["b"] is None:
        return "only A"
    if row["difference"] is None:
        return "-"
    if row["unit"] == "%":
        return f"{row['difference']:+.3g} pt"
    if row["percent"] is None:
        return "new" if row["a"] == 0 else "-"
    return f"{row['percent']:+.1f} %"


def table_rows(comparison: dict) -> list[list[str]]:
    """The printed rows: figure [unit], A, B, B - A, change."""
    out = []
    for row in comparison["rows"]:
        unit, scale = _scaled(row)
        label = f"{row['label']} [{unit}]" if unit else row["label"]
        money = row["key"].startswith("cost")
        diff = "-" if row["same"] else _value(row["difference"], scale, True, money)
        out.append(
            [
                label,
                _value(row["a"], scale, money=money),
                _value(row["b"], scale, money=money),
                diff,
                _change(row),
            ]
        )
    return out


HEADERS = ["Figure", "A", "B", "B - A", "Change"]


def _verdict(comparison: dict) -> str:
    n, total = comparison["differences"], len(comparison["rows"])
    if n == 0:
        return "No differences: the two plans give the same summary figures."
    points = any(r["unit"] == "%" and not r["same"] for r in comparison["rows"])
    return f"{n} of {total} summary figures differ. Change: in percent of A" + (
        "; for a figure that is itself a percentage, in percentage points (pt)." if points else "."
    )


def _cautions(comparison: dict) -> list[str]:
    if any(r["key"].startswith("lowest_oxygen") for r in comparison["rows"]):
        from ..report.cautions import PLANNING_AID_NOTICE

        return [PLANNING_AID_NOTICE]
    return []


def render_comparison(comparison: dict, fmt: str = "text", width: int = 80) -> str:
    """The comparison of :func:`cryoplan.compare.compare_results` as text, Markdown or JSON."""
    if fmt == "json":
        return json.dumps(comparison, indent=2) + "\n"
    a, b = comparison["a"], comparison["b"]
    rows = table_rows(comparison)
    if fmt == "markdown":
        out = [
            "# Cryoplan comparison",
            "",
            f"- **A**: {a['title']} (`{a['file']}`)",
            f"- **B**: {b['title']} (`{b['file']}`)",
            "",
            "| " + " | ".join(HEADERS) + " |",
            "|:---|---:|---:|---:|---:|",
        ]
        out += ["| " + " | ".join(c.replace("|", "\\|") for c in r) + " |" for r in rows]
        out += ["", _verdict(comparison)]
        for caution in _cautions(comparison):
            out += ["", f"> Caution: {caution}"]
        return "\n".join(out) + "\n"
    from ..report.document import Paragraph, Table
    from ..report.text import render_blocks

    head = ["=" * width, "CRYOPLAN COMPARISON"]
    for tag, who in (("A", a), ("B", b)):
        head += textwrap.wrap(f"{tag}: {who['title']}", width, subsequent_indent="   ")
        head += textwrap.wrap(
            who["file"],
            width,
            initial_indent="   ",
            subsequent_indent="   ",
            break_on_hyphens=False,
        )
    head.append("=" * width)
    blocks = [Table(HEADERS, rows, "lrrrr"), Paragraph(_verdict(comparison))]
    blocks += [Paragraph(f"Caution: {c}") for c in _cautions(comparison)]
    return "\n".join(head + render_blocks(blocks, width)) + "\n"


def run(args) -> int:
    from ..evaluation.compare import compare_results
    from ..files import check_output_path, write_file

    if args.width < 60:
        raise InputError(
            "the text width is too small",
            key="--width",
            expected="60 columns or more",
            found=str(args.width),
        )
    if args.output:  # checked before any work is done
        check_output_path(args.output, inputs=[args.plan_a, args.plan_b], key="-o")
    data_a, data_b = _evaluate_both(args.plan_a, args.plan_b)
    text = render_comparison(compare_results(data_a, data_b), args.format, width=args.width)
    if args.output:
        write_file(args.output, text)
    else:
        sys.stdout.write(text)
    return 0
