"""``cryoplan print PLAN``: the printed budget as text, Markdown or JSON (PDF, CSV)."""

from __future__ import annotations

import os
import sys
import tempfile

from ..errors import InputError

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
    p.add_argument("-o", "--output", metavar="FILE", help="write to FILE instead of the screen")
    p.add_argument("--width", type=int, default=80, help="text width in columns (default 80)")
    p.add_argument("--paper", default="a4", help="paper size for PDF: a4 or letter")
    p.add_argument("--curve", metavar="FILE", help="also write the cooldown curve T(t) as CSV")
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


def write_atomic(path: str, payload: bytes) -> None:
    """Write a file whole or not at all: a temporary file in the same folder, then a rename."""
    folder = os.path.dirname(os.path.abspath(path)) or "."
    if not os.path.isdir(folder):
        raise InputError(
            "cannot write the output",
            file=path,
            expected="a file in an existing folder",
            found="no such folder",
        )
    try:
        fd, tmp = tempfile.mkstemp(prefix=".cryoplan-", dir=folder)
    except OSError as exc:
        raise InputError(f"cannot write the output ({exc.strerror})", file=path) from None
    try:
        with os.fdopen(fd, "wb") as fh:
            fh.write(payload)
        # mkstemp makes the file private; give it the usual permissions of a new file
        umask = os.umask(0)
        os.umask(umask)
        os.chmod(tmp, 0o666 & ~umask)
        os.replace(tmp, path)
    except OSError as exc:
        try:
            os.unlink(tmp)
        except OSError:
            pass
        raise InputError(f"cannot write the output ({exc.strerror})", file=path) from None


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
    if args.output and args.format != "csv":
        folder = os.path.dirname(os.path.abspath(args.output))
        if not os.path.isdir(folder) or os.path.isdir(args.output):
            raise InputError(
                "cannot write the output",
                file=args.output,
                expected="a file in an existing folder",
                found="a folder" if os.path.isdir(args.output) else "no such folder",
            )
    results = evaluate(load_plan(path))
    data = results.to_dict()
    if args.curve:
        from ..report.export import curve_csv

        write_atomic(args.curve, curve_csv(data).encode())
    if args.format == "pdf":
        from ..report.pdf import render_pdf

        if not args.output:
            raise InputError(
                "a PDF needs an output file", key="-o", expected="-o FILE.pdf", found="nothing"
            )
        payload = render_pdf(data, paper=args.paper)
        write_atomic(args.output, payload)
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
        write_atomic(args.output, text.encode())
    else:
        sys.stdout.write(text)
    return 0
