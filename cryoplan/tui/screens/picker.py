"""The material picker: type to find a material by id or name, enter to pick it."""

from __future__ import annotations

from textual import on
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical
from textual.screen import ModalScreen
from textual.widgets import Input, OptionList, Static
from textual.widgets.option_list import Option


class MaterialPicker(ModalScreen[str | None]):
    """Materials that match what is typed (id or name), best first."""

    BINDINGS = [
        Binding("escape", "cancel", "Cancel"),
        Binding("down", "move(1)", "Next", show=False),
        Binding("up", "move(-1)", "Previous", show=False),
    ]

    def __init__(self, materials: list[tuple[str, str]], current: str = "") -> None:
        super().__init__()
        self.materials = materials
        self.current = current

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog picker"):
            yield Static("Material: type to find, enter to pick", markup=False, classes="question")
            yield Input(id="picker-input", placeholder="e.g. copper, 304, epoxy")
            yield OptionList(id="picker-list")
            yield Static("", id="picker-count", markup=False, classes="keys")

    def on_mount(self) -> None:
        self.query_one(Input).cursor_blink = False
        self._fill("")

    def matches(self, typed: str) -> list[tuple[str, str]]:
        """Materials whose id or name contains every word typed; ids that start with the
        text first, then close spellings (difflib) when nothing contains it."""
        from ...errors import closest

        words = typed.lower().split()
        if not words:
            return list(self.materials)
        hits = [
            (i, n)
            for i, n in self.materials
            if all(w in i.lower() or w in n.lower() for w in words)
        ]
        hits.sort(key=lambda m: (not m[0].lower().startswith(words[0]), m[0]))
        if not hits:
            ids = closest(typed, [i for i, _ in self.materials], n=5)
            hits = [(i, n) for i, n in self.materials if i in ids]
        return hits

    def _fill(self, typed: str) -> None:
        found = self.matches(typed)
        options = self.query_one(OptionList)
        options.clear_options()
        options.add_options([Option(f"{i}  {n}" if n and n != i else i, id=i) for i, n in found])
        if found:
            options.highlighted = 0
        self.query_one("#picker-count", Static).update(
            f"{len(found)} of {len(self.materials)} materials    enter: pick    escape: cancel"
        )

    @on(Input.Changed)
    def _typed(self, event: Input.Changed) -> None:
        self._fill(event.value)

    @on(Input.Submitted)
    def _pick(self) -> None:
        options = self.query_one(OptionList)
        if options.highlighted is not None and options.option_count:
            self.dismiss(options.get_option_at_index(options.highlighted).id)

    @on(OptionList.OptionSelected)
    def _selected(self, event: OptionList.OptionSelected) -> None:
        self.dismiss(event.option.id)

    def action_move(self, step: int) -> None:
        options = self.query_one(OptionList)
        if not options.option_count:
            return
        now = options.highlighted if options.highlighted is not None else -1
        options.highlighted = max(0, min(options.option_count - 1, now + step))

    def action_cancel(self) -> None:
        self.dismiss(None)
