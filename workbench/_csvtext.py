"""CSV text with line numbers: the reading shared by the materials and logger files.

Blank records and records whose first cell starts with ``#`` are skipped; cells are
stripped; every record keeps the line it starts on, so errors can say file:line:column.
"""

from __future__ import annotations

import csv

__all__ = ["CsvSyntaxError", "csv_rows"]


class CsvSyntaxError(ValueError):
    """The text is not valid CSV; ``line`` is where the bad record starts."""

    def __init__(self, line: int, message: str):
        super().__init__(message)
        self.line = line


def csv_rows(text: str) -> tuple[list[str] | None, int, list[tuple[int, list[str]]]]:
    """``(header, header_line, rows)`` of CSV text; ``header`` is None when there is none.

    ``rows`` holds ``(line, cells)`` per data record.

    >>> csv_rows("# note\\n\\na, b\\n1, 2\\n")
    (['a', 'b'], 3, [(4, ['1', '2'])])
    """
    reader = csv.reader(text.splitlines(keepends=True))
    header: list[str] | None = None
    header_line = 1
    rows: list[tuple[int, list[str]]] = []
    start = 1
    try:
        for record in reader:
            line = start
            start = reader.line_num + 1
            if not record or all(not c.strip() for c in record):
                continue
            if record[0].lstrip().startswith("#"):
                continue
            cells = [c.strip() for c in record]
            if header is None:
                header, header_line = cells, line
            else:
                rows.append((line, cells))
    except csv.Error as exc:
        raise CsvSyntaxError(start, f"malformed CSV ({exc})") from None
    return header, header_line, rows
