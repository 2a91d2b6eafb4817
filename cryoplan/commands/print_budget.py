"""``cryoplan print PLAN``: the printed budget as text, Markdown or JSON (PDF, CSV)."""

from __future__ import annotations

import sys

from ..errors import InputError
from ..files import check_output_path, resolve_target, write_file

FORMATS = ("text", "markdown", "json", "pdf", "csv")


def register(sub) -> None:
    p = sub.add_parser(
        "print",
        help="print the budget of a plan (text, markdown, json, pdf, csv)",
        description="Print the cooldown budget, loads, refrigeration and room "
        "checks of a plan file.",
    )
    p.add_argument("plan", nargs="?", help="a plan file (TOML)")
    p.add_argument("--demo", action="store_true", help="print the bundled demo plan")
    p.add_argument(
        "--format", "-f", default="text", choices=FORMATS, help="output format (default: text)"
    )
    p.add_argument(
        "-o",
        "--output",
        metavar="FILE",
        help="write to FILE instead of the screen (a folder for csv). An existing FILE is "
        "kept as FILE.bak; a symbolic link is followed (the file it points to is replaced, "
        "the link stays); a device or pipe such as /dev/stdout is written through; the "
        "plan itself and a folder are refused",
    )
    p.add_argument("--width", type=int, default=80, help="text width in columns (default 80)")
    p.add_argument("--paper", default="a4", help="paper size for PDF: a4 or letter")
    p.add_argument(
        "--curve",
        metavar="FILE",
        help="also write the cooldown curve T(t) as CSV (same rules as -o)",
    )
    p.set_defaults(func=run)


def plan_path(args) -> str:
    from ..plan.reader import demo_plan_path

    if args.demo or not args.plan:
        if args.plan and args.demo:
            raise InputError("give a plan file or --demo, not both", key="--demo")
        if not args.demo and not args.plan:
            raise InputError("no plan given", expected="a plan file, or --demo", found="nothing")
        return demo_plan_path()
    return args.plan


def run(args) -> int:
    from ..evaluation.chain import evaluate
    from ..plan.reader import load_plan
    from ..report import render

    path = plan_path(args)
    if args.width < 60:
        raise InputError(
            "the text width is too small",
            key="--width",
            expected="60 columns or more",
            found=str(args.width),
        )
    # every target is checked before any work is done
    if args.output:
        kind = "folder" if args.format == "csv" else "file"
        check_output_path(args.output, inputs=[path], kind=kind, key="-o")
    if args.curve:
        curve = check_output_path(args.curve, inputs=[path], what="the curve", key="--curve")
        if args.output and args.format != "csv" and curve == resolve_target(args.output):
            raise InputError(
                "the curve and the output would be one file",
                key="--curve",
                expected="a file other than -o",
                found=args.output,
            )
    results = evaluate(load_plan(path))
    data = results.to_dict()
    if args.curve:
        from ..report.export import curve_csv

        write_file(args.curve, curve_csv(data), what="the curve")
    if args.format == "pdf":
        from ..report.pdf import render_pdf

        if not args.output:
            raise InputError(
                "a PDF needs an output file", key="-o", expected="-o FILE.pdf", found="nothing"
            )
        payload = render_pdf(data, paper=args.paper)
        write_file(args.output, payload)
        return 0
    if args.format == "csv":
        from ..report.export import write_csv_folder

        if not args.output:
            raise InputError(
                "CSV tables need an output folder", key="-o", expected="-o FOLDER", found="nothing"
            )
        write_csv_folder(data, args.output)
        return 0
    text = render(data, args.format, width=args.width)
    if args.output:
        write_file(args.output, text)
    else:
        sys.stdout.write(text)
    return 0
