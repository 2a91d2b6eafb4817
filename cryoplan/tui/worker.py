"""The evaluation worker: a plan's text in, the printed budget's blocks out, by message.

The dashboard computes no physics of its own: a worker thread reads and evaluates the
plan (:func:`cryoplan.evaluate`) and builds the printed budget's blocks
(:func:`cryoplan.report.budget.build_document`); the figures come back to the screen as an
:class:`Evaluated` message, so the screen never waits for them.
"""

from __future__ import annotations

import gc
import time

from textual.message import Message

from ..errors import CryoplanError

_heap_frozen = False


def freeze_heap() -> None:
    """Leave what is alive once the first figures show (modules, fluid tables, widgets)
    out of later garbage collections, once a process: a full collection then looks at the
    objects made since, which keeps it from pausing an edit's redraw by tens of ms."""
    global _heap_frozen
    if not _heap_frozen:
        _heap_frozen = True
        gc.collect()
        gc.freeze()


class Evaluated(Message):
    """The results of one evaluation, from the worker thread.

    ``generation`` counts the accepted edits: a message of an older generation than the
    document's is superseded. ``data`` is ``Results.to_dict()``, ``blocks`` the printed
    budget's blocks, ``error`` the message of a plan that did not evaluate, ``materials``
    the (id, name) of every material (on the first evaluation only).
    """

    def __init__(
        self,
        generation: int,
        data: dict | None,
        blocks: list | None,
        error: str | None,
        seconds: float,
        materials=None,
    ) -> None:
        super().__init__()
        self.generation = generation
        self.data = data
        self.blocks = blocks
        self.error = error
        self.seconds = seconds
        self.materials = materials


def evaluate_text(generation: int, text: str, path: str, plan, first: bool) -> Evaluated:
    """Evaluate a plan (the parsed ``plan``, or else its ``text``) into an :class:`Evaluated`.

    Runs in a worker thread; any failure comes back as the message's ``error``, never as
    a traceback on the user's screen.
    """
    start = time.perf_counter()
    data = blocks = error = materials = None
    try:
        import cryoplan

        from ..plan.reader import parse_plan
        from ..report.budget import build_document

        if plan is None:
            plan = parse_plan(text, path)
        data = cryoplan.evaluate(plan).to_dict()
        blocks = build_document(data)
        if first:
            materials = material_names()
    except CryoplanError as exc:
        error = str(exc)
    except Exception as exc:  # never a traceback on the user's screen
        error = f"the evaluation failed: {exc.__class__.__name__}: {exc}"
    return Evaluated(generation, data, blocks, error, time.perf_counter() - start, materials)


def material_names() -> list[tuple[str, str]]:
    """(id, name) of every material of the library that loads, for the picker."""
    from ..data.materials import material, material_ids

    found = []
    for mid in material_ids():
        try:
            found.append((mid, material(mid).name))
        except CryoplanError:
            continue
    return found
