"""Report writers: plain text, Markdown and JSON (and PDF and CSV where installed)."""

from __future__ import annotations

import json

from .budget import build_document

FORMATS = ("text", "markdown", "json")


def render(data: dict, fmt: str = "text", *, width: int = 80) -> str:
    """The printed budget in one of :data:`FORMATS`, from ``Results.to_dict()``."""
    if fmt == "json":
        return json.dumps(data, indent=2, default=_jsonable) + "\n"
    blocks = build_document(data)
    if fmt == "markdown":
        from .markdown import render_markdown

        return render_markdown(data, blocks)
    from .text import render_text

    return render_text(data, blocks, width=width)


def _jsonable(value):
    try:
        import numpy as np

        if isinstance(value, np.ndarray):
            return value.tolist()
        if isinstance(value, np.generic):
            return value.item()
    except ImportError:  # pragma: no cover
        pass
    if hasattr(value, "isoformat"):
        return value.isoformat()
    raise TypeError(f"not JSON serialisable: {type(value).__name__}")
