"""The screens of the dashboard: the main screen and its dialogs."""

from __future__ import annotations

from .dialogs import ConfirmScreen, FileChangedScreen, HelpScreen, PromptScreen, QuitScreen
from .main import MainScreen
from .picker import MaterialPicker

__all__ = [
    "ConfirmScreen",
    "FileChangedScreen",
    "HelpScreen",
    "MainScreen",
    "MaterialPicker",
    "PromptScreen",
    "QuitScreen",
]
