"""``cryoplan open [PLAN]``: the terminal dashboard (also what ``cryoplan`` alone runs)."""

from __future__ import annotations

import os
import sys

from ..errors import InputError

#: Environment variable that turns on plain characters (no braille or box drawing).
PLAIN_ENV = "CRYOPLAN_PLAIN"


def register(subparsers) -> None:
    """Add the ``open`` command to the command line."""
    parser = subparsers.add_parser(
        "open",
        help="the dashboard: see and change a plan live (default: the demo plan)",
        description="Open a plan in the terminal dashboard: the cold mass, the cooldown "
        "budget, loads once cold, refrigeration and the room checks, recomputed on every "
        "edit. Without a plan it opens the bundled demo. A plan that does not exist can "
        "be created from the demo after a confirmation.",
    )
    parser.add_argument("plan", nargs="?", help="a plan file (TOML); default: the demo plan")
    parser.add_argument(
        "--plain",
        action="store_true",
        help=f"plain characters only, for fonts without braille or box drawing (also "
        f"{PLAIN_ENV}=1); NO_COLOR=1 turns colour off",
    )
    parser.add_argument(
        "--yes",
        "-y",
        action="store_true",
        help="create a missing plan from the demo without asking",
    )
    parser.set_defaults(func=run)


def plain_wanted(flag: bool, environ=os.environ) -> bool:
    """Plain characters by the option or by ``CRYOPLAN_PLAIN`` (any value but '', 0, no).

    >>> plain_wanted(False, {"CRYOPLAN_PLAIN": "1"}), plain_wanted(False, {})
    (True, False)
    >>> plain_wanted(False, {"CRYOPLAN_PLAIN": "0"}), plain_wanted(True, {})
    (False, True)
    """
    value = environ.get(PLAIN_ENV, "").strip().lower()
    return flag or value not in ("", "0", "no", "false", "off")


def create_from_template(path: str, *, confirm, template: str | None = None) -> bool:
    """Offer to create ``path`` from the demo plan; True when it was created.

    ``confirm(question) -> bool`` asks the user. The new file gets a first line saying
    where it came from; everything else is the demo, comments included.
    """
    from ..files import check_output_path, write_file
    from ..plan.reader import demo_plan_path

    template = template or demo_plan_path()
    check_output_path(path, inputs=[template], what="the plan")
    if not confirm(f"{path} does not exist. Create it from the demo plan? [y/N] "):
        return False
    with open(template, encoding="utf-8") as fh:
        text = fh.read()
    head = "# Made from the cryoplan demo plan; replace the demo figures with your own.\n"
    write_file(path, head + text, what="the plan")
    return True


def _ask(question: str) -> bool:
    if not sys.stdin.isatty():
        return False
    try:
        return input(question).strip().lower() in ("y", "yes")
    except EOFError:
        return False


def run(args) -> int:
    from ..plan.reader import demo_plan_path

    plain = plain_wanted(args.plain)
    if args.plan is None:
        path, bundled = demo_plan_path(), True
    else:
        path, bundled = os.path.abspath(os.path.expanduser(args.plan)), False
        if os.path.isdir(path):
            raise InputError(
                "a folder, not a plan file",
                file=args.plan,
                expected="a TOML plan file",
                found="a folder",
            )
        if not os.path.exists(path):
            confirm = (lambda q: True) if args.yes else _ask
            if not create_from_template(path, confirm=confirm):
                raise InputError(
                    "no such plan file",
                    file=args.plan,
                    expected="an existing plan, or 'y' to create one from the demo (or --yes)",
                    found="nothing at that path",
                )
            print(f"Created {path} from the demo plan.", file=sys.stderr)
    if not sys.stdout.isatty():
        raise InputError(
            "the dashboard needs a terminal",
            key="open",
            expected="a terminal on standard output",
            found="output redirected; use 'cryoplan print' for a file",
        )
    from ..tui import run as run_dashboard

    return run_dashboard(path, plain=plain, bundled=bundled)
