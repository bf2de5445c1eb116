"""nbval reads a marker only when the whole comment line is the marker.

A line such as ``# NBVAL_IGNORE_OUTPUT  (why)`` is not recognised, so its cell's output
would be compared after all. The oracle is nbval's own table of markers and its own
parser (``nbval.plugin``), so the check follows the installed nbval.
"""

import json
from pathlib import Path

import pytest
from nbval.plugin import comment_markers, find_comment_markers

NOTEBOOKS = sorted((Path(__file__).resolve().parent.parent / "notebooks").glob("*.ipynb"))


def _code_cells(path):
    nb = json.loads(path.read_text(encoding="utf-8"))
    for number, cell in enumerate(nb["cells"]):
        if cell["cell_type"] == "code":
            source = cell["source"]
            yield number, "".join(source) if isinstance(source, list) else source


def marker_problems(source: str) -> list[str]:
    """Lines that mention ``NBVAL_`` in a comment but are not a marker nbval recognises."""
    problems = []
    for line in source.splitlines():
        stripped = line.strip()
        if "NBVAL_" not in stripped or "#" not in stripped:
            continue
        comment = stripped[stripped.index("#"):]
        if not stripped.startswith("#") or comment.lstrip("#").strip() not in comment_markers:
            problems.append(line)
    return problems


def test_the_checker_agrees_with_nbval_on_examples():
    good = "# NBVAL_IGNORE_OUTPUT\nx = 1"
    bad = "# NBVAL_IGNORE_OUTPUT  (a figure)\nx = 1"
    trailing = "x = 1  # NBVAL_SKIP"
    assert marker_problems(good) == [] and dict(find_comment_markers(good)) == {"check": False}
    assert marker_problems(bad) and dict(find_comment_markers(bad)) == {}
    assert marker_problems(trailing) and dict(find_comment_markers(trailing)) == {}


@pytest.mark.parametrize("path", NOTEBOOKS, ids=lambda p: p.name)
def test_every_nbval_marker_is_one_nbval_recognises(path):
    found = [f"Cell {n}: {line.strip()!r}" for n, src in _code_cells(path) for line in marker_problems(src)]
    assert not found, (f"{path.name}: nbval ignores these lines, so the cell's output is compared; "
                       "write the marker alone on its line and the reason on the next: " + "; ".join(found))


@pytest.mark.parametrize("path", NOTEBOOKS, ids=lambda p: p.name)
def test_compared_outputs_are_formatted_by_us_not_by_a_library_default(path):
    """A compared cell prints text we format (f-strings, explicit column formats).

    A DataFrame's or a figure's default display depends on the library version's layout.
    """
    nb = json.loads(path.read_text(encoding="utf-8"))
    offenders = []
    for number, cell in enumerate(nb["cells"]):
        if cell["cell_type"] != "code":
            continue
        source = "".join(cell["source"]) if isinstance(cell["source"], list) else cell["source"]
        if dict(find_comment_markers(source)).get("check", True) is False or "NBVAL_SKIP" in source:
            continue
        for out in cell.get("outputs", []):
            data = out.get("data", {})
            if out.get("output_type") in ("execute_result", "display_data") and (
                    "text/html" in data or "application/vnd.plotly.v1+json" in data
                    or "application/vnd.jupyter.widget-view+json" in data):
                offenders.append(f"Cell {number}")
    assert not offenders, f"{path.name}: compared cells showing a library's rich display: {offenders}"
