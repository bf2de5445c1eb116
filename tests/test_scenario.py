"""Scenario files: round trips, atomic writes, clear errors, migrations, recovery.

Outside checks used here: the standard library's TOML reader (:mod:`tomllib`,
a TOML 1.0.0 parser) reads everything our writer produces; SHA-256 of a file
is recomputed with :mod:`hashlib` (FIPS PUB 180-4); the ISO 6946:2017 hand
sizing d = λ (1/U − Rsi − Rse) (clause 6.7.1, Table 7 surface resistances)
checks that a scenario rebuilds the study it describes. The example files are
invented demo scenarios.
"""

from __future__ import annotations

import hashlib
import os
import re
import shutil
import tomllib
from dataclasses import replace
from pathlib import Path

import numpy as np
import pandas as pd
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from workbench import scenario as sc
from workbench.scenario import (
    ConstraintSpec,
    CriterionSpec,
    Decision,
    MaterialsSource,
    Scenario,
    ScenarioError,
    autosave,
    load_scenario,
    recover_last,
    save_scenario,
    scenario_from_study,
    scenario_from_text,
    scenario_to_text,
    starter_text,
    study_from_scenario,
)

ROOT = Path(__file__).resolve().parent.parent
EXAMPLES = ROOT / "examples"
DATA = Path(__file__).resolve().parent / "data"
KINDS = [k for k in ("wall", "shipper", "housing") if (EXAMPLES / f"{k}.toml").is_file()]


def _line_containing(text: str, needle: str) -> int:
    """1-based line of the first line containing ``needle`` (computed apart from the code)."""
    for no, line in enumerate(text.splitlines(), 1):
        if needle in line:
            return no
    raise AssertionError(f"{needle!r} not in text")


def _wall(**changes) -> Scenario:
    base = Scenario(
        kind="wall",
        inputs={
            "t_inside": "20 °C",
            "t_outside": "-10 °C",
            "area": "10 m²",
            "r_si": "0.13 m²·K/W",
            "r_se": "0.04 m²·K/W",
            "budget": "0.25 W/(m²·K)",
            "thickness": "50 mm",
            "conductivity_vs_temperature": False,
        },
        candidates=("eps_20", "pir_32"),
        criteria=(
            CriterionSpec("total_thickness"),
            CriterionSpec("cost_per_area", "minimise", 2.0),
        ),
        title="demo wall",
    )
    return replace(base, **changes)


# ---------------------------------------------------------------------------
# Round trips
# ---------------------------------------------------------------------------
@pytest.mark.parametrize("kind", KINDS)
def test_example_round_trips_exactly(kind, tmp_path):
    original = load_scenario(EXAMPLES / f"{kind}.toml")
    target = tmp_path / f"{kind}.toml"
    save_scenario(original, target)
    back = load_scenario(target)
    assert back == original
    # writing again gives the same bytes (a stable canonical form)
    again = tmp_path / "again.toml"
    save_scenario(back, again)
    assert again.read_bytes() == target.read_bytes()
    # and the standard library reads what we wrote to the same data
    assert tomllib.loads(target.read_text("utf-8"))["kind"] == kind


@pytest.mark.parametrize("kind", KINDS)
def test_study_round_trip_through_scenario(kind):
    study = study_from_scenario(load_scenario(EXAMPLES / f"{kind}.toml"))
    rebuilt = study_from_scenario(scenario_from_study(study))
    from workbench.scenario import study_kind

    a, _ = study_kind(kind).compute(study)
    b, _ = study_kind(kind).compute(rebuilt)
    num = a.select_dtypes("number").columns
    pd.testing.assert_frame_equal(a[num], b[num], check_exact=False, rtol=1e-12)


def test_wall_scenario_builds_the_iso6946_sizing():
    """ISO 6946:2017 clause 6.7.1 with Table 7: d = λ (1/U − Rsi − Rse) for U = 0.25 W/(m²·K)."""
    s = _wall()
    study = study_from_scenario(s)
    lam = study.materials.loc[["eps_20", "pir_32"], "conductivity"].to_numpy()
    np.testing.assert_allclose(
        study.required_thickness(), lam * (1 / 0.25 - 0.13 - 0.04), rtol=1e-12
    )
    assert study.t_inside == pytest.approx(293.15) and study.area == pytest.approx(10.0)


_TEXT = st.text(st.characters(blacklist_categories=("Cs",)), max_size=60)


@settings(max_examples=60, deadline=None)
@given(title=_TEXT, notes=_TEXT, rationale=_TEXT)
def test_any_text_survives_the_writer(title, notes, rationale):
    """Quotes, backslashes, control characters, triple quotes, newlines: tomllib reads them back."""
    s = _wall(title=title, notes=notes, decision=Decision("eps_20", rationale, "", ""))
    text = scenario_to_text(s)
    data = tomllib.loads(text)
    assert data["title"] == title and data["notes"] == notes
    assert scenario_from_text(text) == s


def test_nested_build_up_and_constraints_round_trip():
    s = _wall(
        candidates=(
            "eps_20",
            {
                "name": "steel/PIR/steel",
                "layers": [
                    {"material": "carbon_steel", "thickness": "0.6 mm"},
                    {"material": "pir_32"},
                    {"material": "carbon_steel", "thickness": "0.6 mm"},
                ],
            },
        ),
        constraints=(
            ConstraintSpec("total_thickness", "max", "150 mm"),
            ConstraintSpec("meets_budget", "require"),
        ),
    )
    assert scenario_from_text(scenario_to_text(s)) == s


@pytest.mark.parametrize("kind", ["wall", "shipper", "housing"])
def test_starter_file_loads_and_is_commented(kind):
    text = starter_text(kind)
    assert text.count("#") > 10 and "DEMO" in text
    s = scenario_from_text(text)
    assert s.kind == kind and s.candidates


# ---------------------------------------------------------------------------
# Writing safely
# ---------------------------------------------------------------------------
def test_save_never_clobbers_silently(tmp_path):
    target = tmp_path / "s.toml"
    save_scenario(_wall(), target)
    old = target.read_bytes()
    with pytest.raises(FileExistsError):
        save_scenario(_wall(title="second"), target)
    assert target.read_bytes() == old
    save_scenario(_wall(title="second"), target, overwrite=True)
    assert (tmp_path / "s.toml.bak").read_bytes() == old
    assert load_scenario(target).title == "second"


def _litter(folder: Path) -> list[str]:
    return sorted(p.name for p in folder.iterdir() if p.name.endswith(".tmp"))


def test_interrupted_replace_keeps_the_old_file(tmp_path, monkeypatch):
    target = tmp_path / "s.toml"
    save_scenario(_wall(), target)
    old = target.read_bytes()

    def broken_replace(src, dst):
        # the temporary file is complete at this point: check, then fail like a crash would
        assert Path(src).read_text("utf-8").startswith("# heatpath scenario")
        raise OSError("simulated crash before the rename")

    monkeypatch.setattr(sc.os, "replace", broken_replace)
    with pytest.raises(OSError, match="simulated crash"):
        save_scenario(_wall(title="new"), target, overwrite=True)
    monkeypatch.undo()
    assert target.read_bytes() == old
    assert _litter(tmp_path) == []


def test_interrupted_write_midway_keeps_the_old_file(tmp_path, monkeypatch):
    target = tmp_path / "s.toml"
    save_scenario(_wall(), target)
    old = target.read_bytes()
    real_fdopen = os.fdopen

    class HalfWriter:
        def __init__(self, fh):
            self.fh = fh

        def __enter__(self):
            return self

        def __exit__(self, *exc):
            self.fh.close()

        def write(self, text):
            self.fh.write(text[: len(text) // 2])  # half of it reaches the disk
            self.fh.flush()
            raise OSError("simulated disk full")

    monkeypatch.setattr(sc.os, "fdopen", lambda fd, *a, **k: HalfWriter(real_fdopen(fd, *a, **k)))
    with pytest.raises(OSError, match="disk full"):
        save_scenario(_wall(title="new"), target, overwrite=True)
    monkeypatch.undo()
    assert target.read_bytes() == old
    assert _litter(tmp_path) == []


# ---------------------------------------------------------------------------
# Clear errors: key and line
# ---------------------------------------------------------------------------
def _write(tmp_path: Path, text: str, name: str = "bad.toml") -> Path:
    p = tmp_path / name
    p.write_text(text, "utf-8")
    return p


def test_truncated_file_names_the_line(tmp_path):
    text = (EXAMPLES / "wall.toml").read_text("utf-8")
    cut = text[: text.index('max_thickness = "150') + len('max_thickness = "15')]
    p = _write(tmp_path, cut)
    with pytest.raises(ScenarioError) as err:
        load_scenario(p)
    assert err.value.line == len(cut.splitlines())
    assert f"bad.toml:{err.value.line}" in str(err.value) and "truncated" in str(err.value)
    assert err.value.key == "inputs.max_thickness"


def test_truncated_at_a_line_boundary_names_the_missing_key(tmp_path):
    text = (EXAMPLES / "wall.toml").read_text("utf-8")
    cut = text[: text.index("candidates = [")]
    with pytest.raises(ScenarioError, match=r"candidates: missing required key .*truncated"):
        load_scenario(_write(tmp_path, cut))


def test_wrong_type_names_key_and_line(tmp_path):
    text = (
        (EXAMPLES / "wall.toml").read_text("utf-8").replace('t_outside = "30 °C"', "t_outside = 30")
    )
    with pytest.raises(ScenarioError) as err:
        load_scenario(_write(tmp_path, text))
    assert err.value.key == "inputs.t_outside"
    assert err.value.line == _line_containing(text, "t_outside = 30")
    assert "text with a unit" in str(err.value)


def test_wrong_dimension_names_key_and_line(tmp_path):
    text = (
        (EXAMPLES / "wall.toml")
        .read_text("utf-8")
        .replace('thickness = "100 mm"', 'thickness = "100 kg"')
    )
    with pytest.raises(ScenarioError) as err:
        load_scenario(_write(tmp_path, text))
    assert err.value.key == "inputs.thickness"
    assert err.value.line == _line_containing(text, 'thickness = "100 kg"')


def test_wrong_type_in_an_array_of_tables(tmp_path):
    text = (EXAMPLES / "wall.toml").read_text("utf-8").replace("weight = 2.0", 'weight = "two"')
    with pytest.raises(ScenarioError) as err:
        load_scenario(_write(tmp_path, text))
    assert err.value.key == "criteria[2].weight"
    assert err.value.line == _line_containing(text, 'weight = "two"')


def test_newer_version_is_refused(tmp_path):
    text = (EXAMPLES / "wall.toml").read_text("utf-8").replace("version = 1", "version = 7")
    with pytest.raises(ScenarioError, match=r"version 7, newer") as err:
        load_scenario(_write(tmp_path, text))
    assert err.value.key == "version" and err.value.line == _line_containing(text, "version = 7")


def test_unknown_kind_lists_the_valid_ones(tmp_path):
    text = (EXAMPLES / "wall.toml").read_text("utf-8").replace('kind = "wall"', 'kind = "roof"')
    with pytest.raises(ScenarioError, match=r"unknown 'roof'; valid kinds: .*wall") as err:
        load_scenario(_write(tmp_path, text))
    assert err.value.line == _line_containing(text, 'kind = "roof"')


def test_unknown_material_id_names_the_candidate_line(tmp_path):
    text = (EXAMPLES / "wall.toml").read_text("utf-8").replace('"xps_35",', '"xps_99",')
    with pytest.raises(ScenarioError, match=r"unknown material id 'xps_99'") as err:
        load_scenario(_write(tmp_path, text))
    assert err.value.key == "candidates[1]"
    assert err.value.line == _line_containing(text, '"xps_99"')


def test_unknown_key_is_reported(tmp_path):
    text = (
        (EXAMPLES / "wall.toml")
        .read_text("utf-8")
        .replace("[inputs]", '[inputs]\nt_insid = "5 °C"')
    )
    with pytest.raises(ScenarioError, match=r"inputs\.t_insid: unknown input"):
        load_scenario(_write(tmp_path, text))


def test_decision_must_name_a_candidate(tmp_path):
    text = (
        (EXAMPLES / "wall.toml")
        .read_text("utf-8")
        .replace('chosen = "steel/PIR/steel panel"', 'chosen = "granite"')
    )
    with pytest.raises(ScenarioError, match=r"decision\.chosen: unknown candidate 'granite'"):
        load_scenario(_write(tmp_path, text))


# ---------------------------------------------------------------------------
# User materials: pinned files and inline rows
# ---------------------------------------------------------------------------
def _user_files(tmp_path: Path) -> Path:
    for name in (
        "user_materials_ok.csv",
        "user_materials_ok.sources.csv",
        "user_materials_ok.kt.csv",
    ):
        shutil.copy(DATA / name, tmp_path / name)
    return tmp_path / "user_materials_ok.csv"


def _pinned_scenario(tmp_path: Path) -> Path:
    csv_path = _user_files(tmp_path)
    sha = hashlib.sha256(csv_path.read_bytes()).hexdigest()
    side = hashlib.sha256((tmp_path / "user_materials_ok.sources.csv").read_bytes()).hexdigest()
    kt = hashlib.sha256((tmp_path / "user_materials_ok.kt.csv").read_bytes()).hexdigest()
    text = (EXAMPLES / "wall.toml").read_text("utf-8").split("[[criteria]]")[0]
    text = text.replace('"cork_board_120",', '"demo_pu_gasket",')
    text += (
        f'\n[materials]\npath = "user_materials_ok.csv"\nsha256 = "{sha}"\n'
        f'sources_sha256 = "{side}"\nkt_sha256 = "{kt}"\n'
    )
    return _write(tmp_path, text, "pinned.toml")


def test_user_materials_file_is_pinned_and_used(tmp_path):
    s = load_scenario(_pinned_scenario(tmp_path))
    study = study_from_scenario(s)
    assert "demo_pu_gasket" in study.names
    assert study.materials.loc["eps_20", "origin"] != "curated"  # the user row replaced it


def test_changed_materials_file_is_refused(tmp_path):
    path = _pinned_scenario(tmp_path)
    with open(tmp_path / "user_materials_ok.csv", "a", encoding="utf-8") as fh:
        fh.write("\n")
    with pytest.raises(ScenarioError, match=r"materials\.sha256: .*changed") as err:
        load_scenario(path)
    assert err.value.line == _line_containing(path.read_text("utf-8"), "sha256 = ")


def test_scenario_from_study_pins_the_user_file(tmp_path):
    s = load_scenario(_pinned_scenario(tmp_path))
    again = scenario_from_study(study_from_scenario(s))
    expected = hashlib.sha256((tmp_path / "user_materials_ok.csv").read_bytes()).hexdigest()
    assert again.materials.sha256 == expected
    assert Path(again.materials.path).is_absolute()


def test_inline_rows_with_units_and_their_errors(tmp_path):
    row = {
        "id": "demo_board",
        "name": "Demo board (demo)",
        "family": "rigid_foam",
        "conductivity": "0.24 Btu·in/(h·ft²·°F)",
        "density": "30 kg/m³",
        "specific_heat": 1400,
        "source": "demo",
    }
    s = _wall(candidates=("demo_board", "eps_20"), materials=MaterialsSource(rows=(row,)))
    text = scenario_to_text(s)
    back = scenario_from_text(text)
    assert back == s
    k = study_from_scenario(back).materials.loc["demo_board", "conductivity"]
    # NIST SP 811 (2008), Appendix B.8: 1 Btu_IT·in/(h·ft²·°F) = 0.144 227 9 W/(m·K)
    assert k == pytest.approx(0.24 * 0.1442279, rel=1e-6)
    bad = text.replace('density = "30 kg/m³"', 'density = "30 kg/m"')
    with pytest.raises(ScenarioError) as err:
        scenario_from_text(bad)
    assert err.value.key == "materials.rows[0].density"
    assert err.value.line == _line_containing(bad, 'density = "30 kg/m"')


# ---------------------------------------------------------------------------
# Older versions
# ---------------------------------------------------------------------------
V0 = """# a version-0 scenario (before the format marker)
job = "wall"
units = "US"
title = "old layout (demo)"
candidates = ["eps_20", "pir_32"]

[inputs]
t_inside = "68 °F"
t_outside = "14 °F"
area = "100 ft²"
r_si = "0.13 m²·K/W"
r_se = "0.04 m²·K/W"
thickness = "2 in"
conductivity_vs_temperature = false

[weights]
total_thickness = 1.0
cost_per_area = 3
"""


def test_version_0_migrates(tmp_path):
    s = load_scenario(_write(tmp_path, V0, "v0.toml"))
    assert s.kind == "wall" and s.display_system == "US"
    assert s.criteria == (
        CriterionSpec("total_thickness", "minimise", 1.0),
        CriterionSpec("cost_per_area", "minimise", 3.0),
    )
    # NIST SP 811 Appendix B.8/B.9: 68 °F = 293.15 K, 1 ft² = 0.09290304 m², 1 in = 0.0254 m
    study = study_from_scenario(s)
    assert study.t_inside == pytest.approx(293.15)
    assert study.area == pytest.approx(9.290304)
    assert study.thickness == pytest.approx(0.0508)
    # saving writes the current version
    out = tmp_path / "v1.toml"
    save_scenario(s, out)
    assert tomllib.loads(out.read_text("utf-8"))["version"] == sc.FORMAT_VERSION


def test_version_0_materials_file_gets_pinned_at_migration(tmp_path):
    _user_files(tmp_path)
    text = V0.replace(
        'title = "old layout (demo)"', 'title = "old"\nmaterials_file = "user_materials_ok.csv"'
    )
    s = load_scenario(_write(tmp_path, text, "v0m.toml"))
    assert (
        s.materials.sha256
        == hashlib.sha256((tmp_path / "user_materials_ok.csv").read_bytes()).hexdigest()
    )
    assert "migrated from format version 0" in s.notes


# ---------------------------------------------------------------------------
# Last-used recovery
# ---------------------------------------------------------------------------
def test_autosave_and_recover(tmp_path, monkeypatch):
    monkeypatch.setenv("HEATPATH_STATE_DIR", str(tmp_path / "state"))
    assert recover_last() is None
    s = _wall(notes="before the kernel restart")
    path = autosave(s)
    assert path.parent == tmp_path / "state"
    assert recover_last() == s
    autosave(_wall(notes="later"))
    assert recover_last().notes == "later"
    assert [p.name for p in (tmp_path / "state").iterdir()] == [path.name]


def test_state_dir_default(monkeypatch):
    monkeypatch.delenv("HEATPATH_STATE_DIR", raising=False)
    monkeypatch.delenv("XDG_STATE_HOME", raising=False)
    assert sc.state_dir() == Path.home() / ".local" / "state" / "heatpath"


def test_line_finder_on_hand_written_text():
    text = (
        'kind = "wall"\n[inputs]\n t_inside = "1 °C"\n\n[[criteria]]\nquantity = "a"\n'
        '[[criteria]]\nquantity = "b"\nweight = 3\n'
    )
    assert sc._line_of(text, ("inputs", "t_inside")) == 3
    assert sc._line_of(text, ("criteria", 1, "weight")) == 9
    assert sc._line_of(text, ("criteria", 1, "direction")) == 7  # falls back to the table header
    assert re.match(r"^\d+$", str(sc._line_of(text, ("kind",))))


def test_workbench_snapshot_and_open(tmp_path):
    """What the workbench's Save and Load buttons call: the study survives, the choice too."""
    study = study_from_scenario(_wall())
    s = sc.snapshot(study, system="US", chosen="pir_32", title="meeting", notes="n")
    path = save_scenario(s, tmp_path / "meeting.toml")
    again, loaded = sc.open_scenario(path)
    assert loaded.decision.chosen == "pir_32" and loaded.display_system == "US"
    np.testing.assert_allclose(again.required_thickness(), study.required_thickness(), rtol=1e-12)
    with pytest.raises(ValueError, match="unknown candidate"):
        sc.snapshot(study, chosen="granite")
