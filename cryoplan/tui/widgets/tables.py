"""The editable tables: the cold mass (stages and parts) and the plan settings.

Both post an ``EditRequested`` message up to the dashboard, which owns the plan document;
they only show rows and say what the user asked for.
"""

from __future__ import annotations

from rich.text import Text
from textual import events
from textual.binding import Binding
from textual.message import Message
from textual.widgets import DataTable


class _SteadyTable(DataTable):
    """A table that renders again only the cells that changed.

    ``DataTable`` renders every visible cell again (about 0.1 ms each) after any change
    of a cell, any resize and any change of focus. Here a changed cell drops only its own
    renders; a new height (the edit bar opening or closing) drops none, the columns having
    fixed widths; and the cells rendered with and without the focus are both kept, so
    moving the focus to the edit bar and back renders nothing again.
    """

    _rendered_width: int | None = None
    _style_key: tuple | None = None

    def _on_resize(self, event: events.Resize) -> None:
        if event.size.width == self._rendered_width:
            event.prevent_default()  # skips DataTable's handler, which drops every cell
        self._rendered_width = event.size.width

    def _style_signature(self) -> tuple:
        app = self.app
        return (
            self.get_pseudo_class_state(),
            frozenset(self.classes),
            frozenset(app.classes),
            getattr(app, "theme", None),
        )

    def _kept_cells(self) -> dict:
        if "_cells_by_style" not in self.__dict__:
            self._cells_by_style = {}
        return self._cells_by_style

    def notify_style_update(self) -> None:
        try:
            from textual.cache import LRUCache

            rendered, before = self._cell_render_cache, self._style_key
            self._cell_render_cache = LRUCache(rendered.maxsize)
            super().notify_style_update()  # drops the other caches, as it should
            now = self._style_signature()
        except (AttributeError, ImportError, TypeError):
            super().notify_style_update()
            return
        kept = self._kept_cells()
        if before is not None:
            kept[before] = rendered
        if len(kept) > 4:  # a theme or class change: start afresh
            kept.clear()
        self._cell_render_cache = kept.pop(now, self._cell_render_cache)
        self._style_key = now

    def _clear_caches(self) -> None:
        super()._clear_caches()
        self._kept_cells().clear()

    def set_cell(self, row_key: str, column_key: str, value) -> None:
        """Change one cell; only that cell is rendered again, only its row redrawn.

        Falls back to ``update_cell`` where the table's caches are not as expected.
        """
        try:
            from textual.widgets._data_table import ColumnKey, RowKey

            row, column = RowKey(row_key), ColumnKey(column_key)
            self._data[row][column] = value
            for cells in [self._cell_render_cache, *self._kept_cells().values()]:
                for key in [k for k in cells.keys() if k[0] == row and k[1] == column]:
                    cells.discard(key)
            index = self._row_locations.get(row)
            self._row_renderable_cache.discard((self._update_count, index))
            self._row_render_cache.clear()
            self._line_cache.clear()
        except (AttributeError, ImportError, KeyError, TypeError):
            self.update_cell(row_key, column_key, value)
            return
        self.refresh_row(index)  # the other rows' lines stay as drawn


class ColdMassTable(_SteadyTable):
    """Stages and parts as written in the plan; enter edits the cell under the cursor."""

    BINDINGS = [
        Binding("enter", "edit", "Edit", key_display="enter"),
        Binding("m", "material", "Material"),
        Binding("a", "add_part", "Add part"),
        Binding("n", "add_stage", "New stage", show=False),
        Binding("x,delete", "remove", "Remove", key_display="x"),
    ]

    COLUMNS = [
        ("name", "Stage / part", 22),
        ("temperature", "T", 8),
        ("material", "Material", 20),
        ("mass", "Mass", 10),
        ("start", "Start", 9),
    ]

    class EditRequested(Message):
        """The user asked to change a field (or add, remove, pick a material)."""

        def __init__(self, action: str, row: str, column: str) -> None:
            super().__init__()
            self.action, self.row, self.column = action, row, column

    def on_mount(self) -> None:
        self.cursor_type = "cell"
        self.zebra_stripes = False
        for key, label, width in self.COLUMNS:
            self.add_column(label, key=key, width=width)

    def fill(self, stages, totals: dict[str, str], default_start: str) -> None:
        """Show ``stages`` (:class:`~cryoplan.tui.editing.StageRow`), keeping the cursor.

        When the rows are the same as before (an edited value), only the cells that
        changed are redrawn; when rows came or went, the table is rebuilt.
        """
        rows = []
        for st in stages:
            mass = totals.get(st.name, "")
            rows.append(
                (
                    f"s{st.index}",
                    [
                        Text(st.name, style="bold"),
                        Text(st.temperature),
                        Text(""),
                        Text(mass, style="dim"),
                        Text(""),
                    ],
                )
            )
            for p in st.parts:
                if p.how == "mass":
                    mass_text = Text(p.mass + (f" x{p.count}" if p.count > 1 else ""))
                else:
                    mass_text = Text(f"({p.how})", style="dim")
                start = Text(p.start) if p.start else Text(f"({default_start})", style="dim")
                rows.append(
                    (
                        f"p{st.index}.{p.index}",
                        [Text("  " + p.name), Text(""), Text(p.material), mass_text, start],
                    )
                )
        shown = getattr(self, "_shown", None)
        if shown is not None and [k for k, _ in shown] == [k for k, _ in rows]:
            columns = [key for key, _, _ in self.COLUMNS]
            for (key, cells), (_, before) in zip(rows, shown):
                for column, new, old in zip(columns, cells, before):
                    if (new.plain, str(new.style)) != (old.plain, str(old.style)):
                        self.set_cell(key, column, new)
            self._shown = rows
            return
        row, col = self.cursor_coordinate
        self.clear()
        for key, cells in rows:
            self.add_row(*cells, key=key)
        self._shown = rows
        if self.row_count:
            self.move_cursor(row=min(row, self.row_count - 1), column=col, animate=False)

    def current(self) -> tuple[str, str]:
        """(row key, column key) under the cursor."""
        if not self.row_count:
            return "", ""
        keys = self.coordinate_to_cell_key(self.cursor_coordinate)
        return str(keys.row_key.value), str(keys.column_key.value)

    def _ask(self, action: str) -> None:
        row, col = self.current()
        self.post_message(self.EditRequested(action, row, col))

    def action_edit(self) -> None:
        self._ask("edit")

    def action_material(self) -> None:
        self._ask("material")

    def action_add_part(self) -> None:
        self._ask("add_part")

    def action_add_stage(self) -> None:
        self._ask("add_stage")

    def action_remove(self) -> None:
        self._ask("remove")


class SettingsTable(_SteadyTable):
    """The cooldown steps, baths and supplies as written; enter edits the value."""

    BINDINGS = [Binding("enter", "edit", "Edit", key_display="enter")]

    class EditRequested(Message):
        def __init__(self, key: str) -> None:
            super().__init__()
            self.key = key

    def on_mount(self) -> None:
        self.cursor_type = "row"
        self.add_column("Plan setting", key="label", width=34)
        self.add_column("Value", key="value", width=26)

    def fill(self, rows) -> None:
        """Show ``rows`` (:class:`~cryoplan.tui.editing.SettingRow`), keeping the cursor."""
        shown = getattr(self, "_shown", None)
        keys = [r.key for r in rows]
        if shown is not None and [r.key for r in shown] == keys:
            for new, old in zip(rows, shown):
                if new.value != old.value:
                    self.set_cell(new.key, "value", new.value)
        else:
            row = self.cursor_row
            self.clear()
            for r in rows:
                self.add_row(r.label, r.value, key=r.key)
            if self.row_count:
                self.move_cursor(row=min(row, self.row_count - 1), animate=False)
        self._shown = rows

    def action_edit(self) -> None:
        if self.row_count:
            key = self.coordinate_to_cell_key(self.cursor_coordinate).row_key.value
            self.post_message(self.EditRequested(str(key)))
