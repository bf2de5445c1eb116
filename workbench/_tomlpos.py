"""Where a key is written in a TOML text: line and column, for ``file:line:column`` messages.

A small scanner for text that :mod:`tomllib` has already accepted (it returns
no values, only positions), and a line-based fallback.
"""

from __future__ import annotations

import re
import tomllib
from collections.abc import Sequence

_HEADER_LINE = re.compile(r"^\s*(\[\[?)\s*([^\[\]]+?)\s*\]\]?\s*(#.*)?$")
_KEY_LINE = re.compile(r"""^\s*(?:"([^"]+)"|'([^']+)'|([A-Za-z0-9_-]+))\s*=""")


def _split_dotted(name: str) -> tuple[str, ...]:
    return tuple(p.strip().strip('"').strip("'") for p in name.split("."))


def _sections(lines: Sequence[str]):
    """``(line number, text, section in force, opens a section)`` for each line.

    The section is the key path of the table a line belongs to, with the index of
    each array-of-tables entry (``("candidates", 2)``); header lines open one.
    """
    section: tuple = ()
    counts: dict[tuple, int] = {}
    for no, raw in enumerate(lines, 1):
        m = _HEADER_LINE.match(raw)
        if m and not raw.lstrip().startswith("#"):
            name = _split_dotted(m.group(2))
            if m.group(1) == "[[":
                counts[name] = counts.get(name, -1) + 1
                section = (*_with_parent_index(name, counts), counts[name])
            else:
                section = _with_parent_index(name, counts)
            yield no, raw, section, True
        else:
            yield no, raw, section, False


def _line_key(raw: str) -> tuple[str, ...] | None:
    """The (dotted) key written on a ``key = value`` line, or None."""
    k = _KEY_LINE.match(raw)
    return None if k is None else _split_dotted(k.group(1) or k.group(2) or k.group(3))


def _line_of(text: str | None, path: Sequence[str | int]) -> int | None:
    """Line (1-based) where the key ``path`` is written, or its closest enclosing line."""
    if not text:
        return None
    path = tuple(path)
    lines = text.split("\n")
    best: int | None = None
    for no, raw, section, header in _sections(lines):
        if header:
            if path[: len(section)] == section:
                best = no
            continue
        key = _line_key(raw)
        if key is None:
            continue
        full = (*section, *key)
        n = len(full)
        if path[:n] == full:
            if len(path) > n and isinstance(path[n], int) and raw.rstrip().endswith("["):
                return _element_line(lines, no, path[n])
            return no
    return best


class _Scanner:
    """Positions of every key and array element of a TOML text (for error messages).

    A small reader for text that :mod:`tomllib` has already accepted: it skips
    values and records where each key path (``("inputs", "t_inside")``,
    ``("candidates", 2, "layers", 0, "thickness")``) starts, as 1-based
    ``(line, column)``. It never decides what the text means.
    """

    _BARE = re.compile(r"[A-Za-z0-9_-]+")

    def __init__(self, text: str):
        self.text = text
        self.i = 0
        self.pos: dict[tuple, tuple[int, int]] = {}
        self.starts = [0] + [m.end() for m in re.finditer("\n", text)]
        self.counts: dict[tuple, int] = {}

    def at(self, i: int) -> tuple[int, int]:
        import bisect

        line = bisect.bisect_right(self.starts, i)
        return line, i - self.starts[line - 1] + 1

    def record(self, path: tuple, i: int) -> None:
        self.pos.setdefault(path, self.at(i))

    def skip_ws(self, newlines: bool) -> None:
        t, n = self.text, len(self.text)
        while self.i < n:
            c = t[self.i]
            if c in " \t\r" or (newlines and c == "\n"):
                self.i += 1
            elif c == "#":
                j = t.find("\n", self.i)
                self.i = n if j < 0 else j
            else:
                break

    def key(self) -> list[tuple[str, int]]:
        """A (dotted) key: its parts with their start indices."""
        parts = []
        t = self.text
        while True:
            self.skip_ws(False)
            start = self.i
            c = t[self.i] if self.i < len(t) else ""
            if c == '"' or c == "'":
                end = self.string_end()
                raw = t[start:end]
                try:
                    name = tomllib.loads(f"x = {raw}")["x"]
                except tomllib.TOMLDecodeError:
                    name = raw.strip("\"'")
                self.i = end
            else:
                m = self._BARE.match(t, self.i)
                if not m:
                    break
                name = m.group(0)
                self.i = m.end()
            parts.append((name, start))
            self.skip_ws(False)
            if self.i < len(t) and t[self.i] == ".":
                self.i += 1
                continue
            break
        return parts

    def string_end(self) -> int:
        t, i = self.text, self.i
        q = t[i]
        if t.startswith(q * 3, i):
            j = i + 3
            while True:
                k = t.find(q * 3, j)
                if k < 0:
                    return len(t)
                if q == '"':
                    b = k - 1
                    nb = 0
                    while b >= j and t[b] == "\\":
                        nb += 1
                        b -= 1
                    if nb % 2:
                        j = k + 1
                        continue
                end = k + 3
                while end < len(t) and t[end] == q:  # up to two quotes may end the content
                    end += 1
                return end
        j = i + 1
        while j < len(t):
            c = t[j]
            if q == '"' and c == "\\":
                j += 2
                continue
            if c == q or c == "\n":
                return j + 1
            j += 1
        return j

    def value(self, path: tuple) -> None:
        t = self.text
        self.skip_ws(False)
        if self.i >= len(t):
            return
        c = t[self.i]
        if c in "\"'":
            self.i = self.string_end()
        elif c == "[":
            self.i += 1
            idx = 0
            while True:
                self.skip_ws(True)
                if self.i >= len(t) or t[self.i] == "]":
                    self.i += 1
                    return
                if t[self.i] == ",":
                    self.i += 1
                    continue
                self.record((*path, idx), self.i)
                self.value((*path, idx))
                idx += 1
        elif c == "{":
            self.i += 1
            while True:
                self.skip_ws(True)
                if self.i >= len(t) or t[self.i] == "}":
                    self.i += 1
                    return
                if t[self.i] == ",":
                    self.i += 1
                    continue
                self.keyval(path)
        else:
            m = re.compile(r"[^,\]\}#\s]+(?:[ T][0-9:.+Z-]+)?").match(t, self.i)
            self.i = m.end() if m else self.i + 1

    def keyval(self, section: tuple) -> None:
        parts = self.key()
        if not parts:
            self.i += 1
            return
        path = section
        for name, start in parts:
            path = (*path, name)
            self.record(path, start)
        self.skip_ws(False)
        if self.i < len(self.text) and self.text[self.i] == "=":
            self.i += 1
        self.value(path)

    def run(self) -> dict[tuple, tuple[int, int]]:
        t = self.text
        section: tuple = ()
        while True:
            self.skip_ws(True)
            if self.i >= len(t):
                return self.pos
            if t[self.i] == "[":
                start = self.i
                array = t.startswith("[[", self.i)
                self.i += 2 if array else 1
                names = [n for n, _ in self.key()]
                j = t.find("\n", self.i)
                self.i = len(t) if j < 0 else j
                name = tuple(names)
                if array:
                    self.counts[name] = self.counts.get(name, -1) + 1
                    section = (*_with_parent_index(name, self.counts), self.counts[name])
                else:
                    section = _with_parent_index(name, self.counts)
                self.record(section, start)
                continue
            self.keyval(section)


def _positions(text: str | None) -> dict[tuple, tuple[int, int]]:
    if not text:
        return {}
    try:
        return _Scanner(text).run()
    except Exception:  # a locator must never hide the real error; fall back to lines
        return {}


def _locate(text: str | None, path: Sequence[str | int]) -> tuple[int | None, int | None]:
    """``(line, column)`` where ``path`` is written, or where its closest parent is."""
    if not text:
        return None, None
    pos = _positions(text)
    path = tuple(path)
    for n in range(len(path), 0, -1):
        if path[:n] in pos:
            return pos[path[:n]]
    line = _line_of(text, path)
    return line, (1 if line is not None else None)


def _key_at_line(text: str, line: int) -> str | None:
    """Dotted key written on ``line`` (or the table opened there), for syntax errors."""
    for no, raw, section, header in _sections(text.split("\n")):
        if no != line:
            continue
        if header:
            return _dotted(section)
        key = _line_key(raw)
        if key is not None:
            return _dotted((*section, *key))
        return _dotted(section) or None
    return None


def _with_parent_index(name: tuple, counts: dict[tuple, int]) -> tuple:
    out: list = []
    for i, part in enumerate(name):
        out.append(part)
        parent = name[: i + 1]
        if i < len(name) - 1 and parent in counts:
            out.append(counts[parent])
    return tuple(out)


def _element_line(lines: list[str], start: int, index: int) -> int:
    seen = -1
    for no in range(start + 1, len(lines) + 1):
        s = lines[no - 1].strip()
        if not s or s.startswith("#"):
            continue
        if s.startswith("]"):
            break
        seen += 1
        if seen == index:
            return no
    return start


def _dotted(path: Sequence[str | int]) -> str:
    out = ""
    for p in path:
        out += f"[{p}]" if isinstance(p, int) else (f".{p}" if out else str(p))
    return out
