"""What changed between two scenario files (``workbench.review``).

Every test writes real scenario files to ``tmp_path``, starting from the
invented demo scenario ``examples/wall.toml``, changes one thing, and reads the
difference back through the loader, as ``heatpath diff`` does.

Outside checks used here:
- 2 °C and 275.15 K are the same temperature: T/K = t/°C + 273.15 (BIPM, The
  International System of Units, 9th edition 2019, section 2.3.1).
- The thickness a flux budget needs, d = λ·(ΔT/q − R_si − R_se), is the sum of
  thermal resistances of ISO 6946:2017 (clause 6.7.1), solved for the layer;
  with constant conductivity the relative change of d when ΔT changes is
  computed here by hand, apart from the code.
- Total heat flow Q = q·A (Fourier's law over an area): with the flux held at
  the budget, Q moves by exactly the relative change of A.
"""

from __future__ import annotations

import json
import math
import re
from pathlib import Path

import pandas as pd
import pytest

from workbench.report import evaluate
from workbench.review import (
    ScenarioDiff,
    changes_since_html,
    diff_files,
    diff_scenarios,
    parse_tolerance,
)
from workbench.scenario import ScenarioError, load_scenario

ROOT = Path(__file__).resolve().parent.parent
WALL = (ROOT / "examples" / "wall.toml").read_text("utf-8")


def _write(tmp_path: Path, name: str, text: str) -> Path:
    p = tmp_path / name
    p.write_text(text, "utf-8")
    return p


def _variant(old: str, new: str, text: str = WALL, count: int = 1) -> str:
    assert text.count(old) >= 1, f"{old!r} not in the demo scenario"
    return text.replace(old, new, count)


def _pair(tmp_path, new_text: str, old_text: str = WALL, tolerance=0.01) -> ScenarioDiff:
    a = _write(tmp_path, "old.toml", old_text)
    b = _write(tmp_path, "new.toml", new_text)
    return diff_files(a, b, tolerance)


def _texts(d: ScenarioDiff, section: str) -> list[str]:
    return [c.text for c in d.changes if c.section == section]


def test_identical_files_give_no_differences(tmp_path):
    d = _pair(tmp_path, WALL)
    assert d.same and not d
    assert d.lines()[-1] == "no differences"
    assert "no differences" in d.to_text()
    assert d.to_dict()["same"] is True and d.to_dict()["changes"] == []
    assert d.to_frame().empty
    assert "No differences." in d.to_html()


def test_same_value_written_in_other_units_is_no_change(tmp_path):
    # 2 °C = 275.15 K and 150 mm = 0.15 m (BIPM SI Brochure, 9th ed., 2.3.1; SI prefixes)
    text = _variant('t_inside = "2 °C"', 't_inside = "275.15 K"')
    text = _variant('max_thickness = "150 mm"', 'max_thickness = "0.15 m"', text)
    d = _pair(tmp_path, text)
    assert d.same, d.to_text()


def test_input_change_listed_with_units_and_results_follow_the_hand_sizing(tmp_path):
    base = _variant("conductivity_vs_temperature = true", "conductivity_vs_temperature = false")
    new = _variant('t_inside = "2 °C"', 't_inside = "5 °C"', base)
    d = _pair(tmp_path, new, base)
    assert _texts(d, "inputs") == ["t_inside: 2.0 °C → 5.0 °C"]
    # hand sizing, constant λ: d = λ (ΔT/q − Rsi − Rse), so d_new/d_old does not depend on λ
    q, r = 8.0, 0.13 + 0.04
    ratio = (25.0 / q - r) / (28.0 / q - r)
    expected = f"({100 * (ratio - 1):+.1f} %)"
    line = [t for t in _texts(d, "results") if t.startswith("pir_32: Total thickness")]
    assert line and line[0].endswith(expected), (line, expected)
    # the inner surface temperature moved with the inside air: listed in °C, no percentage
    assert "pir_32: Surface temperature inside 3.0 °C → 6.0 °C" in _texts(d, "results")
    assert not d.decision_changed
    assert d.lines()[-2] == "Decision: unchanged (steel/PIR/steel panel)"


def test_tolerance_decides_which_results_are_listed(tmp_path):
    # area +0.5 %: the heat flow at the flux budget moves by exactly +0.5 % (Q = q·A)
    new = _variant('area = "40 m²"', 'area = "40.2 m²"')
    coarse = _pair(tmp_path, new, tolerance="1%")
    assert _texts(coarse, "inputs") == ["area: 40 m² → 40.2 m²"]
    assert not [t for t in _texts(coarse, "results") if "Heat flow" in t]
    fine = _pair(tmp_path, new, tolerance="0.1%")
    flows = [t for t in _texts(fine, "results") if "Heat flow" in t]
    assert len(flows) == 5 and all(t.endswith("(+0.5 %)") for t in flows), flows


def test_candidates_added_removed_and_build_up_changed(tmp_path):
    new = _variant('  "cork_board_120",\n', '  "glass_wool_32",\n')
    new = _variant('{ material = "carbon_steel", thickness = "0.6 mm" }, { material = "pir_32" }',
                   '{ material = "carbon_steel", thickness = "0.8 mm" }, { material = "pir_32" }', new)
    d = _pair(tmp_path, new)
    texts = _texts(d, "candidates")
    assert "added: glass_wool_32" in texts
    assert "removed: cork_board_120" in texts
    changed = [t for t in texts if t.startswith("steel/PIR/steel panel: build-up changed")]
    assert changed and "carbon_steel 0.6 mm" in changed[0] and "carbon_steel 0.8 mm" in changed[0]
    # a thickness written in other units is the same build-up (0.6 mm = 0.0006 m)
    same = _variant('thickness = "0.6 mm" }, { material = "pir_32" }',
                    'thickness = "0.0006 m" }, { material = "pir_32" }')
    assert not _texts(_pair(tmp_path, same), "candidates")


def test_weights_criteria_and_constraints_changed(tmp_path):
    new = _variant("weight = 2.0", "weight = 0.5")
    new = _variant('[[constraints]]\nquantity = "total_thickness"\nmax = "150 mm"',
                   '[[constraints]]\nquantity = "total_thickness"\nmax = "100 mm"', new)
    d = _pair(tmp_path, new)
    assert _texts(d, "criteria") == ["cost_per_area: weight 2 → 0.5"]
    assert _texts(d, "constraints") == ["total_thickness: max 150 mm → 100 mm"]
    # ranking movements agree with the report's own ranking of each file
    ev_old = evaluate(load_scenario(tmp_path / "old.toml"))
    ev_new = evaluate(load_scenario(tmp_path / "new.toml"))
    def rank(ev, name):  # "excluded" where a hard limit removes the candidate
        r = ev.ranking.loc[name, "rank"]
        return "excluded" if r is pd.NA else str(int(r))

    moved = {n for n in ev_new.ranking.index if rank(ev_old, n) != rank(ev_new, n)}
    listed = {c.item for c in d.changes if c.section == "ranking" and c.item != "best ranked"}
    assert "cork_board_120" in moved  # 130 mm needed, above the new 100 mm limit
    assert listed == moved
    for name in moved:
        line = next(c for c in d.changes if c.section == "ranking" and c.item == name)
        assert (line.old, line.new) == (rank(ev_old, name), rank(ev_new, name))
    cork = next(c.text for c in d.changes if c.section == "ranking" and c.item == "cork_board_120")
    assert cork.startswith("cork_board_120: rank 5 → excluded (Total thickness 130 mm above the maximum 100 mm")


def test_removed_criterion_falls_back_to_the_kind_defaults_and_says_so(tmp_path):
    text = WALL
    for block in re.findall(r"\[\[criteria\]\]\n(?:[^\[\n][^\n]*\n)+\n", WALL):
        text = text.replace(block, "")
    d = _pair(tmp_path, text)
    crit = _texts(d, "criteria")
    assert "the later scenario ranks on the kind's default criteria" in crit
    assert "cost_per_area: weight 2 → 1" in crit


def test_decision_changed_and_recorded_fields(tmp_path):
    new = _variant('chosen = "steel/PIR/steel panel"', 'chosen = "pir_32"')
    new = _variant('decided_by = "demo review team"', 'decided_by = "demo chair"', new)
    d = _pair(tmp_path, new)
    assert d.decision_changed and d.decision == "pir_32"
    texts = _texts(d, "decision")
    assert texts[0] == "decision changed: steel/PIR/steel panel → pir_32"
    assert "decided by: demo review team → demo chair" in texts
    assert not any(line.startswith("Decision: unchanged") for line in d.lines())
    # a decision added where there was none
    no_decision = WALL[: WALL.index("[decision]")]
    d2 = _pair(tmp_path, WALL, no_decision)
    assert _texts(d2, "decision")[0] == "decision recorded: steel/PIR/steel panel"


def test_renderings_agree_and_escape_user_text(tmp_path):
    new = _variant('rationale = "Demo: thin enough, self-supporting faces, mid-range cost."',
                   'rationale = "Demo <script>alert(1)</script> & more"')
    new = _variant('t_outside = "30 °C"', 't_outside = "32 °C"', new)
    d = _pair(tmp_path, new)
    data = json.loads(json.dumps(d.to_dict()))
    assert data["same"] is False and len(data["changes"]) == len(d.changes)
    assert data["tolerance"] == pytest.approx(0.01)
    frame = d.to_frame()
    assert list(frame.columns) == ["section", "item", "old", "new", "change"]
    assert list(frame["change"]) == [c.text for c in d.changes]
    page = d.to_html()
    assert "<script>" not in page and "&lt;script&gt;" in page
    assert page.count("<tr>") == len(d.changes) + len(d.by_section())
    assert "t_outside: 30.0 °C → 32.0 °C" in d.to_text()


def test_changes_since_html_reuses_the_report_evaluation(tmp_path):
    old = _write(tmp_path, "old.toml", WALL)
    new = _write(tmp_path, "new.toml", _variant('budget = "8 W/m²"', 'budget = "6 W/m²"'))
    ev = evaluate(load_scenario(new))
    section = changes_since_html(old, ev)
    assert section.startswith('<section class="changes-since"><h2>Changes since the previous review</h2>')
    assert "budget: 8 W/m² → 6 W/m²" in section
    assert changes_since_html(old, load_scenario(old)).count("No differences.") == 1


def test_different_kinds_are_named_and_not_compared_further(tmp_path):
    shipper = (ROOT / "examples" / "shipper.toml").read_text("utf-8")
    d = _pair(tmp_path, shipper)
    assert [c.text for c in d.changes][0].startswith("job kind changed: wall → shipper")
    assert not _texts(d, "results")


def test_missing_and_broken_files_are_refused_with_their_place(tmp_path):
    good = _write(tmp_path, "good.toml", WALL)
    with pytest.raises(FileNotFoundError, match="nope.toml"):
        diff_files(tmp_path / "nope.toml", good)
    broken = _write(tmp_path, "broken.toml", _variant('area = "40 m²"', 'area = "40 kg"'))
    with pytest.raises(ScenarioError) as err:
        diff_files(good, broken)
    line = next(i for i, t in enumerate(broken.read_text("utf-8").splitlines(), 1) if t.startswith("area ="))
    assert re.search(rf"broken\.toml:{line}:\d+:", str(err.value)), str(err.value)
    with pytest.raises(TypeError, match="old: expected a Scenario"):
        diff_scenarios("old.toml", load_scenario(good))


@pytest.mark.parametrize("text, value", [("1%", 0.01), (" 2.5 % ", 0.025), ("0.05", 0.05), (0, 0.0)])
def test_parse_tolerance(text, value):
    assert math.isclose(parse_tolerance(text), value)


@pytest.mark.parametrize("text", ["", "1 percent", "-2%", "nan", "inf%"])
def test_parse_tolerance_refuses(text):
    with pytest.raises(ValueError, match="--tolerance"):
        parse_tolerance(text)
