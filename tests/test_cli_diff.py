"""`heatpath diff` and `heatpath report --since` from the command line.

The expected sizing follows the wall study's own published basis (Fourier's law through
layers in series with ISO 6946 surface resistances): a warmer outside with the same heat
budget needs a thicker layer, so the sized thickness of every candidate rises.
"""

import json
import shutil
from pathlib import Path

import pytest

from workbench.cli import main

EXAMPLES = Path(__file__).resolve().parent.parent / "examples"


def _pair(tmp_path):
    old = tmp_path / "old.toml"
    new = tmp_path / "new.toml"
    shutil.copy(EXAMPLES / "wall.toml", old)
    text = old.read_text(encoding="utf-8")
    assert 't_outside = "30 °C"' in text
    new.write_text(text.replace('t_outside = "30 °C"', 't_outside = "35 °C"'), encoding="utf-8")
    return old, new


def test_diff_text_lists_the_input_and_the_results_that_moved(tmp_path, capsys):
    old, new = _pair(tmp_path)
    assert main(["diff", str(old), str(new)]) == 0
    out = capsys.readouterr().out
    assert "t_outside: 30.0 °C → 35.0 °C" in out
    assert "Sized thickness" in out and "Decision: unchanged" in out


def test_diff_json_and_identical_files(tmp_path, capsys):
    old, new = _pair(tmp_path)
    assert main(["diff", str(old), str(new), "--format", "json"]) == 0
    data = json.loads(capsys.readouterr().out)
    inputs = [c for c in data["changes"] if c["section"] == "inputs"]
    assert inputs == [{"section": "inputs", "item": "t_outside", "old": "30.0 °C", "new": "35.0 °C",
                       "text": "t_outside: 30.0 °C → 35.0 °C"}]
    assert data["same"] is False and data["decision_changed"] is False
    assert main(["diff", str(old), str(old)]) == 0
    assert "no differences" in capsys.readouterr().out


def test_diff_tolerance_hides_small_moves(tmp_path, capsys):
    old, new = _pair(tmp_path)
    main(["diff", str(old), str(new), "--tolerance", "50%"])
    out = capsys.readouterr().out
    assert "Sized thickness" not in out and "t_outside" in out


@pytest.mark.parametrize("broken", ["missing", "bad"])
def test_diff_refuses_a_missing_or_broken_file_with_its_place(tmp_path, capsys, broken):
    old, _ = _pair(tmp_path)
    other = tmp_path / "other.toml"
    if broken == "bad":
        other.write_text(old.read_text(encoding="utf-8").replace('area = "40 m²"', 'area = "40 kg"'),
                         encoding="utf-8")
    assert main(["diff", str(old), str(other)]) == 2
    err = capsys.readouterr().err
    assert "other.toml" in err and (broken == "missing" or "inputs.area" in err)
    if broken == "bad":
        assert ":24:" in err or any(f"other.toml:{n}:" in err for n in range(1, 60))


def test_report_since_adds_the_changes_section(tmp_path, capsys):
    old, new = _pair(tmp_path)
    out = tmp_path / "r.html"
    assert main(["-q", "report", str(new), "--since", str(old), "-o", str(out)]) == 0
    html = out.read_text(encoding="utf-8")
    assert "Changes since the previous review" in html and "35.0 °C" in html
    # the earlier file is an input: it may not be the output
    assert main(["-q", "report", str(new), "--since", str(old), "-o", str(old), "--force"]) == 2
