"""Shared fixtures of the test suite; the folders mirror the packages of cryoplan/."""

from __future__ import annotations

from pathlib import Path

import pytest

REPO = Path(__file__).resolve().parents[1]
EXAMPLES = REPO / "examples"


@pytest.fixture(scope="session")
def example_paths() -> list[Path]:
    """Every example plan shipped in examples/."""
    return sorted(EXAMPLES.glob("*.toml"))


@pytest.fixture(scope="session")
def demo_path() -> Path:
    """The bundled demo plan."""
    return EXAMPLES / "demo-magnet-bath.toml"
