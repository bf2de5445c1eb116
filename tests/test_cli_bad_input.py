"""Bad input at the command line: CSV formula injection, unsafe output targets,
``scenario check`` agreeing with ``rank``, and work too large to finish.

Outside checks: CSV files are read back with the standard library's :mod:`csv`
reader (what a spreadsheet import sees); the list of formula-triggering first
characters follows the OWASP "CSV Injection" page (owasp.org/www-community/attacks/CSV_Injection,
as recalled from memory: ``= + - @``, tab, carriage return, and quoting every
field); the full-width forms ``＝ ＋ － ＠`` and ``|``/``DDE(`` are the variants the
issue lists. File types come from :func:`os.lstat` and :mod:`stat`. The example
scenarios are invented demo data.
"""

from __future__ import annotations

import csv
import io
import os
import stat
from pathlib import Path

import pandas as pd
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from workbench.exports import FORMULA_PREFIXES, frame_to_csv, neutralise_cell

ROOT = Path(__file__).resolve().parent.parent
EXAMPLES = ROOT / "examples"


class _Result:
    def __init__(self, returncode: int, stdout: str, stderr: str):
        self.returncode, self.stdout, self.stderr = returncode, stdout, stderr


@pytest.fixture
def main(capsys):
    from workbench import cli

    def call(*args) -> _Result:
        code = cli.main([str(a) for a in args])
        out = capsys.readouterr()
        return _Result(code, out.out, out.err)

    return call


def _bad(r: _Result, *needles: str) -> None:
    assert r.returncode == 2, (r.returncode, r.stderr)
    assert "Traceback" not in r.stderr and "internal error" not in r.stderr, r.stderr
    for n in needles:
        assert n in r.stderr, (n, r.stderr)


def _example(tmp_path: Path, kind: str, old: str = "", new: str = "", name: str = "s.toml") -> Path:
    text = (EXAMPLES / f"{kind}.toml").read_text("utf-8")
    if old:
        assert old in text, old
        text = text.replace(old, new, 1)
    p = tmp_path / name
    p.write_text(text, "utf-8")
    return p


# ---------------------------------------------------------------------------
# Reproducer 5: the CSV formula guard
# ---------------------------------------------------------------------------
_TRIGGERS = ["=", "+", "-", "@", "|", "\t", "\r", "＝", "＋", "－", "＠"]
_BLANKS = " \n\u00a0\u3000"


def _formula_like(cell: str) -> bool:
    """What a spreadsheet could run (written apart from the code under test)."""
    rest = cell
    while rest and (rest[0] in _BLANKS or rest[0] in "'\"`‘’“”"):
        rest = rest[1:]
    return any(rest.startswith(t) for t in _TRIGGERS) or rest[:4].upper() == "DDE("


def _read(text: str) -> list[list[str]]:
    return list(csv.reader(io.StringIO(text, newline="")))


@pytest.mark.parametrize(
    "name",
    [
        "\r=1+1",
        " =1+1",
        "\t=1+1",
        "＝1+1",
        "|calc",
        'DDE("cmd";"/c calc";"x")',
        "@SUM(A1)",
        '"=1+1',
        "'=1+1",
        "a\r=1+1",
        "x\n=cmd",
        "+1",
        "－1",
        "＋1",
        "＠x",
    ],
)
def test_csv_cells_are_neutralised_and_quoted(name):
    frame = pd.DataFrame(
        {"thickness [mm]": [-5.25], "note": [name]}, index=pd.Index([name], name="candidate")
    )
    text = frame_to_csv(frame)
    rows = _read(text)
    assert len(rows) == 2, rows  # a CR or LF inside a name stays inside its cell
    header, row = rows
    assert row[1] == "-5.25"  # numbers stay numbers
    for cell in (row[0], row[2]):
        if cell.startswith("'"):
            assert cell[1:] == name
        else:
            assert cell == name and not _formula_like(cell)
    again = io.StringIO()
    csv.writer(again, lineterminator="\n", quoting=csv.QUOTE_ALL).writerows(rows)
    assert again.getvalue() == text  # every field quoted (QUOTE_ALL)


def test_formula_prefixes_cover_the_owasp_list():
    assert set(_TRIGGERS) <= set(FORMULA_PREFIXES)


@settings(max_examples=300, deadline=None)
@given(st.text(alphabet=st.sampled_from(list("=+-@|\t\r\n '\"abc1＝＋－＠(DE")), max_size=8))
def test_no_text_cell_reads_back_as_a_formula(text):
    out = frame_to_csv(pd.DataFrame({"c": [text]}, index=pd.Index([0], name="i")))
    cell = _read(out)[1][1]
    assert cell in (text, "'" + text)
    assert not _formula_like(cell) or cell.startswith("'")
    assert neutralise_cell(-1.5) == -1.5


def test_rank_csv_of_a_scenario_with_a_hostile_name(tmp_path, main):
    p = _example(tmp_path, "wall", 'name = "steel/PIR/steel panel"', 'name = "\\r=1+1"')
    text = p.read_text("utf-8").replace('chosen = "steel/PIR/steel panel"', 'chosen = "\\r=1+1"')
    p.write_text(text, "utf-8")
    out = tmp_path / "rank.csv"
    r = main("-q", "rank", p, "--format", "csv", "-o", out)
    assert r.returncode == 0, r.stderr
    with open(out, encoding="utf-8", newline="") as fh:  # keep a CR inside a cell as it is
        rows = _read(fh.read())
    names = [row[0] for row in rows[1:]]
    assert "'\r=1+1" in names and "\r=1+1" not in names
    assert not any(
        _formula_like(c) and not c.startswith("'") for row in rows for c in row if not _is_number(c)
    )


def _is_number(cell: str) -> bool:
    try:
        float(cell)
    except ValueError:
        return False
    return True


# ---------------------------------------------------------------------------
# Reproducer 6: --force never replaces a special file; all outputs checked first
# ---------------------------------------------------------------------------
def _fifo(tmp_path: Path) -> Path:
    p = tmp_path / "pipe"
    os.mkfifo(p)
    return p


def _symlink(tmp_path: Path) -> Path:
    target = tmp_path / "target.txt"
    target.write_text("keep me", "utf-8")
    link = tmp_path / "link.csv"
    link.symlink_to(target)
    return link


def _device(tmp_path: Path) -> Path:
    if os.geteuid() != 0:
        pytest.skip("creating a device node needs root")
    p = tmp_path / "null"
    os.mknod(p, stat.S_IFCHR | 0o600, os.makedev(1, 3))  # same numbers as /dev/null
    return p


def _directory(tmp_path: Path) -> Path:
    p = tmp_path / "adir"
    p.mkdir()
    return p


SPECIAL = {
    "fifo": (_fifo, "FIFO"),
    "symlink": (_symlink, "symbolic link"),
    "device": (_device, "device node"),
    "directory": (_directory, "directory"),
}


@pytest.mark.parametrize("what", sorted(SPECIAL))
@pytest.mark.parametrize("command", ["rank", "new", "report-o", "report-csv", "report-json"])
def test_force_refuses_special_targets(tmp_path, main, what, command):
    make, word = SPECIAL[what]
    target = make(tmp_path)
    before = os.lstat(target)
    scen = EXAMPLES / "wall.toml"
    html = tmp_path / "r.html"
    args = {
        "rank": ("-q", "rank", scen, "-o", target, "--force"),
        "new": ("scenario", "new", "wall", "-o", target, "--force"),
        "report-o": ("-q", "report", scen, "-o", target, "--force"),
        "report-csv": ("-q", "report", scen, "-o", html, "--csv", target, "--force"),
        "report-json": ("-q", "report", scen, "-o", html, "--json", target, "--force"),
    }[command]
    _bad(main(*args), str(target), word)
    after = os.lstat(target)
    assert stat.S_IFMT(after.st_mode) == stat.S_IFMT(before.st_mode)
    assert (after.st_ino, after.st_mtime_ns) == (before.st_ino, before.st_mtime_ns)
    assert not html.exists()  # nothing written before every target was checked
    if what == "symlink":
        assert (tmp_path / "target.txt").read_text("utf-8") == "keep me"


def test_dev_full_is_refused_even_with_force(main, tmp_path):
    if not Path("/dev/full").exists():
        pytest.skip("no /dev/full here")
    before = os.lstat("/dev/full")
    _bad(main("-q", "rank", EXAMPLES / "wall.toml", "-o", "/dev/full", "--force"), "device node")
    after = os.lstat("/dev/full")
    assert stat.S_ISCHR(after.st_mode) and after.st_ino == before.st_ino


def test_existing_regular_file_needs_force_and_is_checked_first(tmp_path, main):
    html, csv_out = tmp_path / "r.html", tmp_path / "r.csv"
    csv_out.write_text("old", "utf-8")
    _bad(main("-q", "report", EXAMPLES / "wall.toml", "-o", html, "--csv", csv_out), "exists")
    assert not html.exists() and csv_out.read_text("utf-8") == "old"
    r = main("-q", "report", EXAMPLES / "wall.toml", "-o", html, "--csv", csv_out, "--force")
    assert r.returncode == 0 and html.exists() and csv_out.read_text("utf-8") != "old"


def test_two_outputs_with_one_path_and_output_over_input(tmp_path, main):
    same = tmp_path / "same.out"
    _bad(main("-q", "report", EXAMPLES / "wall.toml", "-o", same, "--csv", same), "--csv")
    p = _example(tmp_path, "wall")
    before = p.read_text("utf-8")
    _bad(main("-q", "rank", p, "-o", p, "--force"), "input scenario")
    assert p.read_text("utf-8") == before


def test_missing_output_folder(tmp_path, main):
    _bad(
        main("-q", "rank", EXAMPLES / "wall.toml", "-o", tmp_path / "nope" / "x.txt"),
        "does not exist",
    )


# ---------------------------------------------------------------------------
# Reproducer 7: scenario check rejects what rank rejects, with the same message
# ---------------------------------------------------------------------------
CHECK_CASES = [
    ("wall", '{ material = "pir_32" }', '{ material = "pir_32", thicknes = "50 mm" }', "thicknes"),
    ("wall", 'area = "40 m²"', 'area = "0 m²"', "inputs.area"),
    ("wall", 'r_si = "0.13 m²·K/W"', 'r_si = "-0.13 m²·K/W"', "inputs.r_si"),
    ("wall", 'budget = "8 W/m²"', 'budget = "0 W/m²"', "inputs.budget"),
    ("wall", 't_inside = "2 °C"', 't_inside = "30 °C"', "inputs.t_outside"),
    ("shipper", 'rate_per_kg = "1.5 EUR/kg"', 'rate_per_kg = "1.5 USD/kg"', "inputs.rate_per_kg"),
    ("shipper", 'fixed_fee = "5 EUR"', 'fixed_fee = "5 GBP"', "inputs.fixed_fee"),
    ("shipper", 't_payload_min = "2 °C"', 't_payload_min = "9 °C"', "inputs.t_payload_min"),
    (
        "shipper",
        '["12 h", "30 °C"], ["20 h"',
        '["20 h", "30 °C"], ["12 h"',
        "inputs.ambient_profile[2][0]",
    ),
    ("shipper", "safety_factor = 1.2", "safety_factor = 0.5", "inputs.safety_factor"),
    ("shipper", "safety_factor = 1.2", "safety_factor = nan", "inputs.safety_factor"),
    (
        "shipper",
        "coolant_packing_fraction = 0.8",
        "coolant_packing_fraction = 2",
        "inputs.coolant_packing_fraction",
    ),
    ("shipper", 'time_step = "300 s"', 'time_step = "0 s"', "inputs.time_step"),
    ("shipper", 'duration = "48 h"', 'duration = "-1 h"', "inputs.duration"),
    ("shipper", 'duration = "48 h"', 'duration = "1e9 h"', "inputs."),
    (
        "housing",
        'component_length = "40 mm"',
        'component_length = "500 mm"',
        "inputs.component_length",
    ),
]


@pytest.mark.parametrize(("kind", "old", "new", "key"), CHECK_CASES)
def test_check_and_rank_agree(tmp_path, main, kind, old, new, key):
    p = _example(tmp_path, kind, old, new, "bad.toml")
    checked = main("scenario", "check", p)
    _bad(checked, f"{p}:", key)
    import re

    assert re.search(rf"{re.escape(str(p))}:\d+:\d+: ", checked.stderr), checked.stderr
    ranked = main("-q", "rank", p)
    _bad(ranked)
    assert ranked.stderr == checked.stderr  # the same message, the same location


def test_check_passes_the_examples(main):
    for kind in ("wall", "shipper", "housing"):
        r = main("scenario", "check", EXAMPLES / f"{kind}.toml")
        assert r.returncode == 0 and "ok" in r.stdout, r.stderr


# ---------------------------------------------------------------------------
# Reproducer 8: work too large is refused up front, never an internal error
# ---------------------------------------------------------------------------
def test_huge_thickness_list_is_refused_quickly(tmp_path, main):
    import time

    many = "[" + ", ".join(f'"{10 + i * 0.001:.3f} mm"' for i in range(100_000)) + "]"
    p = _example(
        tmp_path,
        "shipper",
        'thicknesses = ["20 mm", "30 mm", "40 mm", "50 mm", "60 mm", "80 mm"]',
        f"thicknesses = {many}",
    )
    t0 = time.monotonic()
    r = main("-q", "rank", p)
    assert time.monotonic() - t0 < 20.0  # refused before parsing 10⁵ entries (was about a minute)
    _bad(r, "inputs.thicknesses", "max_list_entries", "[limits]")


def test_huge_duration_is_bad_input_not_internal_error(tmp_path, main):
    p = _example(tmp_path, "shipper", 'duration = "48 h"', 'duration = "1e9 h"')
    _bad(main("-q", "rank", p), "inputs.")
