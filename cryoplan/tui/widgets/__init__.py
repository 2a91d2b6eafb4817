"""The widgets of the dashboard, by kind: figures from report blocks, the editable tables,
the one-line bars and the summary strip. Screens and dialogs are in
:mod:`cryoplan.tui.screens`."""

from __future__ import annotations

from .bars import EditBar, KeyLine, PanelBar
from .figures import (
    CHANGED,
    ChartView,
    Figures,
    ResultsPanel,
    block_cells,
    render_blocks,
    use_plain_scrollbars,
)
from .summary import SummaryStrip, summary_cells
from .tables import ColdMassTable, SettingsTable

__all__ = [
    "CHANGED",
    "ChartView",
    "ColdMassTable",
    "EditBar",
    "Figures",
    "KeyLine",
    "PanelBar",
    "ResultsPanel",
    "SettingsTable",
    "SummaryStrip",
    "block_cells",
    "render_blocks",
    "summary_cells",
    "use_plain_scrollbars",
]
