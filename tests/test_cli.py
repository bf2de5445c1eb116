"""The ``heatpath`` command end to end, in a subprocess, on the demo examples.

Outside checks: the JSON output is read with :mod:`json` and the CSV with
:mod:`csv`; the wall sizing in the JSON is checked against the ISO 6946:2017
hand formula d = λ (R_total − Rsi − Rse − R_fixed) with R_total = ΔT / q
(clause 6.7.1; Table 7 surface resistances); the report is parsed with
:mod:`html.parser`. The example scenarios are invented demo data.
"""

from __future__ import annotations

import csv
import hashlib
import html
import io
import json
import shutil
import subprocess
import sys
from pathlib import Path

import pytest

from workbench.report import GENERAL_CAUTIONS

ROOT = Path(__file__).resolve().parent.parent
EXAMPLES = ROOT / "examples"
DATA = Path(__file__).resolve().parent / "data"
KINDS = [k for k in ("wall", "shipper", "housing") if (EXAMPLES / f"{k}.toml").is_file()]
SCRIPT = Path(sys.executable).parent / "heatpath"


def run(*args, cwd=None) -> subprocess.CompletedProcess:
    cmd = [str(SCRIPT)] if SCRIPT.exists() else [sys.executable, "-m", "workbench.cli"]
    return subprocess.run(
        [*cmd, *map(str, args)], capture_output=True, text=True, cwd=cwd, timeout=300
    )


class _Result:
    def __init__(self, returncode: int, stdout: str, stderr: str):
        self.returncode, self.stdout, self.stderr = returncode, stdout, stderr


@pytest.fixture
def main(capsys):
    """The same command in this process (faster, for the many error cases)."""
    from workbench import cli

    def call(*args) -> _Result:
        code = cli.main([str(a) for a in args])
        out = capsys.readouterr()
        return _Result(code, out.out, out.err)

    return call


def _bad(tmp_path: Path, old: str, new: str, name: str = "bad.toml") -> Path:
    text = (EXAMPLES / "wall.toml").read_text("utf-8")
    assert old in text
    p = tmp_path / name
    p.write_text(text.replace(old, new), "utf-8")
    return p


def _line(path: Path, needle: str) -> int:
    return next(
        i for i, line in enumerate(path.read_text("utf-8").splitlines(), 1) if needle in line
    )


# ---------------------------------------------------------------------------
# Reports and rankings of every example
# ---------------------------------------------------------------------------
@pytest.mark.parametrize("kind", KINDS)
def test_report_end_to_end(kind, tmp_path):
    out = tmp_path / f"{kind}.html"
    js = tmp_path / f"{kind}.json"
    r = run("report", EXAMPLES / f"{kind}.toml", "-o", out, "--json", js)
    assert r.returncode == 0, r.stderr
    assert "…" in r.stderr  # progress on stderr
    assert r.stdout == ""
    page = out.read_text("utf-8")
    data = json.loads(js.read_text("utf-8"))
    for caution in (*GENERAL_CAUTIONS, *data["cautions"]):
        assert html.escape(caution) in page
    section = page.split("<h2>Sources of the properties and methods used</h2>")[1].split("<h2>")[0]
    for src in data["sources"]:
        assert section.count(html.escape(src["citation"])) == 1
    assert data["scenario_hash"] in page
    # a second run does not overwrite without --force
    again = run("report", EXAMPLES / f"{kind}.toml", "-o", out)
    assert again.returncode == 2 and "exists" in again.stderr


def test_rank_formats_and_iso6946_sizing():
    table = run("-q", "rank", EXAMPLES / "wall.toml")
    assert table.returncode == 0, table.stderr
    assert table.stderr == ""
    lines = table.stdout.splitlines()
    assert "Total thickness [mm]" in lines[0] and "decision: steel/PIR/steel panel" in table.stdout
    as_csv = run("-q", "rank", EXAMPLES / "wall.toml", "--format", "csv", "--units", "US")
    rows = list(csv.DictReader(io.StringIO(as_csv.stdout)))
    assert rows and "Total thickness [in]" in rows[0]
    as_json = run("-q", "rank", EXAMPLES / "wall.toml", "--format", "json")
    data = json.loads(as_json.stdout)
    res = {r["candidate"]: r for r in data["results"]["rows"]}
    # examples/wall.toml: 2 °C inside, 30 °C outside, budget 8 W/m², Rsi 0.13, Rse 0.04
    r_total = 28.0 / 8.0
    for name in ("eps_20", "xps_35", "pir_32", "cork_board_120"):
        lam = res[name]["conductivity"]  # effective k at the design point (k(T) integral mean)
        assert res[name]["sized_thickness"] == pytest.approx(lam * (r_total - 0.17), rel=1e-9)
    assert [r["rank"] for r in data["ranking"]["rows"]][0] == 1


# ---------------------------------------------------------------------------
# Materials
# ---------------------------------------------------------------------------
def test_materials_list_show_check(tmp_path, main):
    r = main("materials", "list", "--family", "rigid_foam")
    assert r.returncode == 0
    ids = [line.split()[0] for line in r.stdout.splitlines()[2:]]
    assert "eps_20" in ids and "carbon_steel" not in ids
    bad_family = main("materials", "list", "--family", "foams")
    assert bad_family.returncode == 2 and "rigid_foam" in bad_family.stderr
    show = main("materials", "show", "pir_32")
    assert show.returncode == 0 and "conductivity:" in show.stdout and "source:" in show.stdout
    missing = main("materials", "show", "pir_99")
    assert missing.returncode == 2 and "unknown id 'pir_99'" in missing.stderr
    ok = main("materials", "check", DATA / "user_materials_ok.csv")
    assert ok.returncode == 0 and "ok" in ok.stdout
    bad = run("materials", "check", DATA / "bad_many.csv")
    assert bad.returncode == 2
    problems = bad.stdout.splitlines()
    assert len(problems) >= 3
    for p in problems:
        file, row, column, why = p.split(":", 3)
        assert file.endswith("bad_many.csv") and row.isdigit() and column and why
    assert any(":5:emissivity:" in p for p in problems)


# ---------------------------------------------------------------------------
# Scenario files
# ---------------------------------------------------------------------------
@pytest.mark.parametrize("kind", KINDS)
def test_scenario_new_writes_a_loadable_starter(kind, tmp_path, main):
    r = main("scenario", "new", kind)
    assert r.returncode == 0 and r.stdout.startswith("# heatpath scenario")
    out = tmp_path / "new.toml"
    assert main("scenario", "new", kind, "-o", out).returncode == 0
    assert main("scenario", "new", kind, "-o", out).returncode == 2  # no silent clobbering
    check = main("scenario", "check", out)
    assert check.returncode == 0, check.stderr


def test_scenario_new_and_check_in_a_subprocess(tmp_path):
    out = tmp_path / "new.toml"
    r = run("scenario", "new", "wall", "-o", out)
    assert r.returncode == 0 and out.read_text("utf-8").startswith("# heatpath scenario")
    check = run("scenario", "check", out)
    assert check.returncode == 0 and "ok (wall" in check.stdout


def test_scenario_new_unknown_kind(main):
    r = main("scenario", "new", "roof")
    assert r.returncode == 2 and "valid kinds" in r.stderr and "Traceback" not in r.stderr


# ---------------------------------------------------------------------------
# Malformed files: exit 2, key and line named, no traceback
# ---------------------------------------------------------------------------
def _assert_bad(r, *needles):
    assert r.returncode == 2, (r.returncode, r.stderr)
    assert "Traceback" not in r.stderr
    for n in needles:
        assert n in r.stderr, (n, r.stderr)


def test_truncated_file(tmp_path):
    text = (EXAMPLES / "wall.toml").read_text("utf-8")
    p = tmp_path / "cut.toml"
    p.write_text(text[: text.index('budget = "8') + 10], "utf-8")
    n = len(p.read_text("utf-8").splitlines())
    _assert_bad(run("rank", p), f"cut.toml:{n}:", "inputs.budget", "truncated")


def test_wrong_type(tmp_path, main):
    p = _bad(tmp_path, 'area = "40 m²"', "area = 40")
    _assert_bad(
        main("report", p, "-o", tmp_path / "x.html"),
        f"bad.toml:{_line(p, 'area = 40')}:",
        "inputs.area",
    )
    assert not (tmp_path / "x.html").exists()


def test_newer_version(tmp_path, main):
    p = _bad(tmp_path, "version = 1", "version = 2")
    _assert_bad(main("rank", p), f"bad.toml:{_line(p, 'version = 2')}:", "version", "newer")


def test_unknown_kind(tmp_path, main):
    p = _bad(tmp_path, 'kind = "wall"', 'kind = "roof"')
    _assert_bad(main("rank", p), f"bad.toml:{_line(p, 'kind =')}:", "kind", "valid kinds")


def test_unknown_material_id(tmp_path, main):
    p = _bad(tmp_path, '"xps_35",', '"xps_350",')
    _assert_bad(main("rank", p), f"bad.toml:{_line(p, 'xps_350')}:", "candidates[1]", "xps_350")


def test_hash_mismatch_of_user_materials(tmp_path, main):
    for name in (
        "user_materials_ok.csv",
        "user_materials_ok.sources.csv",
        "user_materials_ok.kt.csv",
    ):
        shutil.copy(DATA / name, tmp_path / name)
    digest = {
        n: hashlib.sha256((tmp_path / f"user_materials_ok{n}").read_bytes()).hexdigest()
        for n in (".csv", ".sources.csv", ".kt.csv")
    }
    text = (EXAMPLES / "wall.toml").read_text("utf-8").split("[[criteria]]")[0]
    text += (
        f'\n[materials]\npath = "user_materials_ok.csv"\nsha256 = "{digest[".csv"]}"\n'
        f'sources_sha256 = "{digest[".sources.csv"]}"\nkt_sha256 = "{digest[".kt.csv"]}"\n'
    )
    p = tmp_path / "pinned.toml"
    p.write_text(text, "utf-8")
    assert main("-q", "rank", p).returncode == 0
    with open(tmp_path / "user_materials_ok.csv", "a", encoding="utf-8") as fh:
        fh.write("# edited after the meeting\n")
    _assert_bad(
        main("rank", p), f"pinned.toml:{_line(p, 'sha256 = ')}:", "materials.sha256", "changed"
    )


def test_debug_shows_the_traceback(tmp_path, main):
    p = _bad(tmp_path, 'kind = "wall"', 'kind = "roof"')
    r = main("--debug", "rank", p)
    assert r.returncode == 2 and "Traceback" in r.stderr


def test_internal_error_exit_code(monkeypatch, capsys):
    """An unexpected exception is an internal error (exit 1), said without a traceback."""
    from workbench import cli, report

    def broken(*args, **kwargs):
        raise RuntimeError("boom")

    monkeypatch.setattr(report, "evaluate", broken)
    code = cli.main(["-q", "rank", str(EXAMPLES / "wall.toml")])
    err = capsys.readouterr().err
    assert code == 1 and "internal error: RuntimeError: boom" in err and "Traceback" not in err
