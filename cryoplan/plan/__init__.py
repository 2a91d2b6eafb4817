"""Plans: the schema as typed dataclasses, the reader with located errors, and the
style-preserving document the dashboard edits."""

from .reader import (
    BOILING_POINT_SNAP_K,
    DEFAULT_TRANSFER_LOSS,
    DEFAULT_TRANSFER_LOSS_OTHER,
    Plan,
    demo_plan_path,
    examples_dir,
    load_plan,
    parse_plan,
    read_text,
)

__all__ = [
    "BOILING_POINT_SNAP_K",
    "DEFAULT_TRANSFER_LOSS",
    "DEFAULT_TRANSFER_LOSS_OTHER",
    "Plan",
    "demo_plan_path",
    "examples_dir",
    "load_plan",
    "parse_plan",
    "read_text",
]
