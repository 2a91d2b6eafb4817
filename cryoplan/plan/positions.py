"""Find the line of a key in a TOML text, for error messages.

The standard TOML readers give values but not positions. This scanner walks the text once
and answers "on which line is ``stage[1].parts[0].mass``?" well enough for messages: it
knows table headers, arrays of tables, dotted keys at the start of a line, and inline tables
inside arrays. Where it cannot tell, it answers the line of the nearest enclosing table.
"""

from __future__ import annotations

import re

_HEADER = re.compile(r"^\s*(\[\[?)\s*([A-Za-z0-9_.\-\" ]+?)\s*(\]\]?)\s*(#.*)?$")
_KEY = re.compile(r"^\s*([A-Za-z0-9_\-]+)\s*=")
_PATH_PART = re.compile(r"([A-Za-z0-9_\-]+)(?:\[(\d+)\])?")


class LineFinder:
    """Line numbers (1-based) of tables and keys in one TOML text."""

    def __init__(self, text: str) -> None:
        self.lines = text.splitlines()
        self.tables: dict[str, int] = {}  # "stage[1]" -> header line
        self.keys: dict[str, int] = {}  # "stage[1].name" -> line
        counts: dict[str, int] = {}
        current = ""
        for number, raw in enumerate(self.lines, start=1):
            line = _strip_comment(raw)
            header = _HEADER.match(line)
            if header and line.lstrip().startswith("["):
                name = header.group(2).replace('"', "").replace(" ", "")
                if header.group(1) == "[[":
                    # arrays of tables nested under an array use the parent's last index
                    parent, _, leaf = name.rpartition(".")
                    prefix = self._resolve(parent) if parent else ""
                    full = f"{prefix}.{leaf}" if prefix else leaf
                    index = counts.get(full, 0)
                    counts[full] = index + 1
                    current = f"{full}[{index}]"
                else:
                    current = self._resolve(name)
                self.tables[current] = number
                continue
            key = _KEY.match(line)
            if key:
                path = f"{current}.{key.group(1)}" if current else key.group(1)
                self.keys.setdefault(path, number)

    def _resolve(self, dotted: str) -> str:
        """'cooler.stage' -> 'cooler.stage[2]' when that array of tables is open."""
        parts = dotted.split(".")
        out: list[str] = []
        for part in parts:
            candidate = ".".join(out + [part])
            indexed = [k for k in self.tables if k.startswith(candidate + "[")]
            if indexed:
                last = max(indexed, key=lambda k: self.tables[k])
                out.append(last[len(".".join(out)) + (1 if out else 0) :])
            else:
                out.append(part)
        return ".".join(out)

    def line_of(self, path: str) -> int | None:
        """The line of a dotted, indexed key path such as ``stage[0].parts[1].mass``."""
        if path in self.keys:
            return self.keys[path]
        if path in self.tables:
            return self.tables[path]
        # inline tables inside an array: find the array key, then the n-th '{' after it
        parts = path.split(".")
        for cut in range(len(parts) - 1, 0, -1):
            m = _PATH_PART.fullmatch(parts[cut - 1])
            if not m or m.group(2) is None:
                continue
            array_key = ".".join(parts[: cut - 1] + [m.group(1)])
            start = self.keys.get(array_key)
            if start is None:
                continue
            found = self._nth_inline(start, int(m.group(2)))
            if found is None:
                return start
            rest = parts[cut:]
            if not rest:
                return found
            leaf = _PATH_PART.fullmatch(rest[-1]).group(1)
            return self._key_after(found, leaf) or found
        # fall back to the closest enclosing table or key
        for cut in range(len(parts) - 1, 0, -1):
            head = ".".join(parts[:cut])
            if head in self.keys:
                return self.keys[head]
            if head in self.tables:
                return self.tables[head]
        return None

    def _nth_inline(self, start: int, index: int) -> int | None:
        depth_seen = -1
        for number in range(start, len(self.lines) + 1):
            text = _strip_comment(self.lines[number - 1])
            if number == start:
                text = text.split("=", 1)[1] if "=" in text else text
            for ch in text:
                if ch == "{":
                    depth_seen += 1
                    if depth_seen == index:
                        return number
            if number > start and _HEADER.match(text) and text.lstrip().startswith("["):
                return None
        return None

    def _key_after(self, start: int, leaf: str) -> int | None:
        pattern = re.compile(r"(^|[{,\s])" + re.escape(leaf) + r"\s*=")
        for number in range(start, min(start + 12, len(self.lines)) + 1):
            if pattern.search(_strip_comment(self.lines[number - 1])):
                return number
        return None


def _strip_comment(line: str) -> str:
    out = []
    quote = None
    for ch in line:
        if quote:
            if ch == quote:
                quote = None
        elif ch in "\"'":
            quote = ch
        elif ch == "#":
            break
        out.append(ch)
    return "".join(out)
