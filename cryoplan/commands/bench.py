"""``cryoplan bench [NAME ...]``: run the benchmarks of a source checkout.

Each benchmark (``benchmarks/bench_<name>.py``) prints the figures it measures in one run
and their ratio to a reference measured in the same run.
"""

from __future__ import annotations

import os
import subprocess
import sys

from ..errors import CryoplanError, UnknownNameError


def _folder() -> str:
    here = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
    folder = os.path.normpath(os.path.join(here, "..", "benchmarks"))
    if not os.path.isdir(folder):
        raise CryoplanError(
            "the benchmarks live in the source checkout (benchmarks/), not in an installed "
            "package: run cryoplan from a clone of the repository"
        )
    return folder


def available() -> list[str]:
    folder = _folder()
    return sorted(
        f[len("bench_") : -3]
        for f in os.listdir(folder)
        if f.startswith("bench_") and f.endswith(".py")
    )


def register(sub) -> None:
    p = sub.add_parser(
        "bench",
        help="run the benchmarks (source checkout)",
        description="Run benchmarks/bench_NAME.py, each printing its ratio.",
    )
    p.add_argument(
        "names",
        nargs="*",
        metavar="NAME",
        help="solids, fluids, budget, heatloads, refrigeration, tui (default: all)",
    )
    p.set_defaults(func=run)


def run(args) -> int:
    names = available()
    chosen = args.names or names
    for name in chosen:
        if name not in names:
            raise UnknownNameError("benchmark", name, names, key="NAME")
    folder = _folder()
    status = 0
    for name in chosen:
        print(f"== {name}", flush=True)
        done = subprocess.run([sys.executable, os.path.join(folder, f"bench_{name}.py")])
        status = status or done.returncode
    return status
