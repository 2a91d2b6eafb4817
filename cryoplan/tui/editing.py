"""The plan document the dashboard edits, re-exported for the dashboard's modules.

The style-preserving TOML document (:class:`PlanDocument`, with undo, redo, the field
checks and the safe save) lives in :mod:`cryoplan.plan.document`, beside the reader whose
checks it runs; the dashboard imports it from here or from there alike.
"""

from __future__ import annotations

from ..plan.document import (
    FIELD_KINDS,
    DiskChanged,
    EditRejected,
    PartRow,
    PlanDocument,
    SettingRow,
    StageRow,
    check_value,
    reason_of,
)

__all__ = [
    "FIELD_KINDS",
    "DiskChanged",
    "EditRejected",
    "PartRow",
    "PlanDocument",
    "SettingRow",
    "StageRow",
    "check_value",
    "reason_of",
]
