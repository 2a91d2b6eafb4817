"""The command line: ``cryoplan COMMAND ...``.

Each command lives in a module of :mod:`cryoplan.commands` with a ``register(subparsers)``
function. Any :class:`~cryoplan.errors.CryoplanError` becomes one clear message on standard
error and exit code 2, never a traceback.
"""

from __future__ import annotations

import argparse
import importlib
import sys

from . import __version__
from .errors import CryoplanError

#: Command modules, in the order they appear in ``cryoplan --help``.
COMMAND_MODULES = [
    "print_budget",
    "materials",
    "salts",
    "fluids",
    "dashboard",
    "compare",
    "bench",
]


def build_parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(
        prog="cryoplan",
        description="Plan cryostat cooldowns: cryogen budgets, heat loads, hold times, "
        "refrigeration and room oxygen checks.",
    )
    parser.add_argument("--version", action="version", version=f"cryoplan {__version__}")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND")
    for name in COMMAND_MODULES:
        try:
            module = importlib.import_module(f".commands.{name}", __package__)
        except ModuleNotFoundError as exc:
            if exc.name and exc.name.endswith(f"commands.{name}"):
                continue  # a command not written yet
            raise
        module.register(sub)
    return parser


def main(argv: list[str] | None = None) -> int:
    argv = sys.argv[1:] if argv is None else argv
    parser = build_parser()
    if not argv:
        argv = ["open"] if "open" in parser._subparsers._group_actions[0].choices else ["--help"]
    try:
        args = parser.parse_args(argv)
    except SystemExit as exc:  # argparse already printed its message
        return int(exc.code or 0) and 2
    if not getattr(args, "func", None):
        parser.print_help()
        return 2
    try:
        return int(args.func(args) or 0)
    except CryoplanError as exc:
        print(f"cryoplan: {exc}", file=sys.stderr)
        return 2
    except BrokenPipeError:  # output piped into `head`
        return 0
    except KeyboardInterrupt:
        return 130


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
