"""Timing helpers shared by the benchmarks (each prints figures measured in one run)."""

from __future__ import annotations

import os
import subprocess
import sys
import time
from pathlib import Path

REPO = Path(__file__).resolve().parents[1]


def best(fn, n: int) -> float:
    """Wall time of the fastest of ``n`` calls of ``fn()`` [s]."""
    times = []
    for _ in range(n):
        t = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t)
    return min(times)


def repo_env() -> dict:
    """The environment with this checkout first on PYTHONPATH."""
    env = dict(os.environ)
    env["PYTHONPATH"] = str(REPO) + os.pathsep + env.get("PYTHONPATH", "")
    return env


def best_of_process(args: list[str], runs: int = 3) -> float:
    """Wall time of the fastest of ``runs`` fresh interpreters run with ``args`` [s]."""
    return best(
        lambda: subprocess.run(
            [sys.executable, *args], env=repo_env(), check=True, capture_output=True
        ),
        runs,
    )
