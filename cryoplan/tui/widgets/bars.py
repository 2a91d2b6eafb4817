"""The one-line bars of the dashboard: the panel bar, the key line and the edit bar."""

from __future__ import annotations

from rich.text import Text
from textual import events
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical
from textual.message import Message
from textual.reactive import reactive
from textual.widgets import Input, Label, Static

from ..panels import PANELS


class PanelBar(Static):
    """One line naming the panels and their keys; the open one (``active``) is bracketed."""

    active: reactive[int] = reactive(0, init=False)

    def on_mount(self) -> None:
        self.watch_active(self.active)

    def watch_active(self, index: int) -> None:
        out = Text()
        for n, (_, title) in enumerate(PANELS):
            label = f"{n + 1} {title}"
            if n == index:
                out.append(f"[{label}]", style="reverse bold")
            else:
                out.append(f" {label} ")
            out.append(" ")
        self.update(out)


class KeyLine(Static):
    """The keys that work now, on one line, as Textual's compact footer shows them.

    Drawn as one line of text: the footer builds a widget for every key each time the
    focus moves (twice an edit), which costs more than the redraw of the figures.
    A key is pressed by clicking it, as in the footer. Its style is in dashboard.tcss.
    """

    COMPONENT_CLASSES = {"keyline--key", "keyline--description"}
    ALLOW_SELECT = False

    def __init__(self, **kwargs) -> None:
        super().__init__("", markup=False, **kwargs)
        self._keys: list[tuple[int, int, str]] = []  # (from column, to column, key)
        self._shown: tuple | None = None

    def on_mount(self) -> None:
        self.screen.bindings_updated_signal.subscribe(self, self._bindings_changed)
        self.call_after_refresh(self.draw)

    def on_unmount(self) -> None:
        self.screen.bindings_updated_signal.unsubscribe(self)

    def _bindings_changed(self, screen) -> None:
        if self.is_attached and screen is self.screen:
            self.draw()

    def entries(self) -> list[tuple[str, str, str, bool]]:
        """(key, shown key, description, enabled) of each action shown, in footer order."""
        by_action: dict[str, tuple[str, str, str, bool]] = {}
        for _, binding, enabled, _tip in self.screen.active_bindings.values():
            if binding.show and binding.action not in by_action:
                shown = self.app.get_key_display(binding)
                by_action[binding.action] = (binding.key, shown, binding.description, enabled)
        return list(by_action.values())

    def draw(self) -> None:
        """Show the keys of the focused widget and of the dashboard (if they changed)."""
        if not self.is_attached:
            return
        entries = self.entries()
        if entries == self._shown:
            return
        self._shown = entries
        key_style = self.get_component_rich_style("keyline--key")
        text_style = self.get_component_rich_style("keyline--description")
        out = Text(no_wrap=True, overflow="crop")
        self._keys = []
        for key, shown, description, enabled in entries:
            start = len(out)
            dim = "" if enabled else " dim"
            out.append(shown, style=f"{key_style}{dim}")
            if description:
                out.append(" " + description, style=f"{text_style}{dim}")
            self._keys.append((start, len(out), key))
            out.append(" ")
        self.update(out, layout=False)

    def on_mouse_down(self, event: events.MouseDown) -> None:
        for start, end, key in self._keys:
            if start <= event.x < end:
                self.app.simulate_key(key)
                return


class EditBar(Vertical):
    """The field being edited: what it is, the entry, and the reason a bad entry is refused."""

    BINDINGS = [Binding("escape", "cancel", "Cancel", show=True)]

    class Cancelled(Message):
        pass

    def compose(self) -> ComposeResult:
        with Horizontal(id="edit-line"):
            yield Label("", id="edit-label")
            yield Input(id="edit-input", select_on_focus=True)
        yield Static("", id="edit-reason", markup=False)

    def on_mount(self) -> None:
        self.query_one(Input).cursor_blink = False

    def action_cancel(self) -> None:
        self.post_message(self.Cancelled())
