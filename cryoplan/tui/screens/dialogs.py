"""The dialogs of the dashboard: questions, a file name, the quit and file-changed
questions, and the help screen. Each returns its answer through ``dismiss``."""

from __future__ import annotations

from textual import on
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical, VerticalScroll
from textual.screen import ModalScreen
from textual.widgets import Input, Static


class ConfirmScreen(ModalScreen[bool]):
    """A yes-or-no question."""

    BINDINGS = [
        Binding("y,enter", "answer(True)", "Yes"),
        Binding("n,escape", "answer(False)", "No"),
    ]

    def __init__(self, question: str, yes: str = "yes", no: str = "no") -> None:
        super().__init__()
        self.question, self.yes, self.no = question, yes, no

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog"):
            yield Static(self.question, markup=False, classes="question")
            yield Static(
                f"y / enter: {self.yes}    n / escape: {self.no}", markup=False, classes="keys"
            )

    def action_answer(self, value: bool) -> None:
        self.dismiss(value)


class FileChangedScreen(ConfirmScreen):
    """The plan changed on disk since it was opened: overwrite it, or do not save."""

    def __init__(self, name: str) -> None:
        super().__init__(
            f"{name} changed on disk since it was opened. Overwrite it with the dashboard's "
            "version? (What is on disk now is kept as the .bak file.)",
            "overwrite",
            "do not save",
        )


class QuitScreen(ModalScreen[str]):
    """Unsaved edits: save and quit, quit without saving, or stay."""

    BINDINGS = [
        Binding("s", "answer('save')", "Save and quit"),
        Binding("d", "answer('discard')", "Discard and quit"),
        Binding("escape,c", "answer('cancel')", "Stay"),
    ]

    def __init__(self, name: str) -> None:
        super().__init__()
        self.plan_name = name

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog"):
            yield Static(f"{self.plan_name} has unsaved edits.", markup=False, classes="question")
            yield Static(
                "s: save and quit    d: quit without saving    escape: stay",
                markup=False,
                classes="keys",
            )

    def action_answer(self, value: str) -> None:
        self.dismiss(value)


class PromptScreen(ModalScreen[str | None]):
    """One line of text, such as a file name."""

    BINDINGS = [Binding("escape", "cancel", "Cancel")]

    def __init__(self, question: str, value: str = "") -> None:
        super().__init__()
        self.question, self.value = question, value

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog"):
            yield Static(self.question, markup=False, classes="question")
            yield Input(self.value, id="prompt-input")
            yield Static("enter: accept    escape: cancel", markup=False, classes="keys")

    def on_mount(self) -> None:
        self.query_one(Input).cursor_blink = False

    @on(Input.Submitted)
    def _accept(self, event: Input.Submitted) -> None:
        self.dismiss(event.value.strip() or None)

    def action_cancel(self) -> None:
        self.dismiss(None)


HELP_TEXT = """\
Keys of the cryoplan dashboard; the keyboard alone is enough.

  1 .. 6        open a panel: cold mass, budget, once cold,
                refrigeration, room, notes
  [ and ]       previous / next panel
  tab           move between the table, the figures and the edit field
  arrows, pgup  move the cursor; scroll a panel

Cold mass (panel 1)
  enter         edit the cell: a name, a temperature, a mass or a start,
                with units ("22 kg", "300 g", "4.2 K", "20 degC"); an
                empty start means the cooldown's start. A bad entry is
                marked with the reason and the last good value stays in
                force. escape cancels.
  m             pick a material (type to find it)
  a             add a part to the stage under the cursor
  n             add a stage
  x, delete     remove the part or stage under the cursor

Budget (panel 2)
  enter         edit a plan setting: a step's end temperature or gas_use,
                a bath's volume or refill level, dewar sizes ("100 L,
                250 L"), a price ("18 USD/L")

Everywhere
  u, ctrl+z     undo                 r, ctrl+y     redo
  ctrl+s        save (the previous three versions are kept as PLAN.bak,
                PLAN.bak.1, PLAN.bak.2; a linked plan saves the file linked to)
  p             print: write the printed budget to a file, then send it
                to the printer (lp or lpr) after a confirmation
  f5            reload the plan from disk
  ?, f1         this help            q             quit (asks first
                                                   when edits are unsaved)

Figures that changed with the last edit are shown reversed for a moment.
Every edit re-evaluates the plan in the background; the screen never
waits for it. Plain characters: --plain or CRYOPLAN_PLAIN=1; no colour:
NO_COLOR=1.
"""


class HelpScreen(ModalScreen[None]):
    """The keys, on a screen of their own."""

    BINDINGS = [Binding("escape,q,question_mark,f1", "close", "Close")]

    def compose(self) -> ComposeResult:
        with VerticalScroll(classes="dialog help"):
            yield Static(HELP_TEXT, markup=False)
            yield Static("escape: close", markup=False, classes="keys")

    def action_close(self) -> None:
        self.dismiss(None)
