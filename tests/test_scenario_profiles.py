"""Ambient profiles from temperature-logger files and several named profiles in scenario files.

Expected values come from the files themselves, read independently here with the standard
library's csv module, and from NIST SP 811 (2008) Appendix B.8/B.9 for the unit conversions
(1 h = 3600 s; t/°C = (t/°F − 32)/1.8). The pass-on-every-profile rule is the issue's
definition (a design passes only if it holds under all named profiles; common practice for
seasonal qualification).
"""

import csv
import datetime as dt
import shutil
from pathlib import Path

import numpy as np
import pytest

from workbench.report import evaluate, render_html
from workbench.scenario import (
    ScenarioError,
    check_scenario,
    load_scenario,
    save_scenario,
    study_from_scenario,
)

EXAMPLES = Path(__file__).resolve().parent.parent / "examples"
TWO_ROUTES = EXAMPLES / "shipper_two_routes.toml"


def _summer_by_hand():
    """The summer demo file read with csv only: elapsed [h] → s, °C → K (NIST SP 811 B.8)."""
    rows = [r for r in csv.reader((EXAMPLES / "route_summer_demo.csv").read_text().splitlines())
            if r and not r[0].startswith("#")]
    assert rows[0] == ["elapsed [h]", "temperature [°C]"]
    data = np.array(rows[1:], float)
    return data[:, 0] * 3600.0, data[:, 1] + 273.15


def _winter_by_hand():
    """The winter demo file: ISO 8601 timestamps → elapsed s, °F → K (NIST SP 811 B.9)."""
    rows = [r for r in csv.reader((EXAMPLES / "route_winter_demo.csv").read_text().splitlines())
            if r and not r[0].startswith("#")]
    stamps = [dt.datetime.fromisoformat(r[0]) for r in rows[1:]]
    t = np.array([(s - stamps[0]).total_seconds() for s in stamps])
    f = np.array([float(r[1]) for r in rows[1:]])
    return t, (f - 32.0) / 1.8 + 273.15


def _copy(tmp_path, text_change=None, name="s.toml"):
    for f in ("route_summer_demo.csv", "route_winter_demo.csv"):
        shutil.copy(EXAMPLES / f, tmp_path / f)
    text = TWO_ROUTES.read_text(encoding="utf-8")
    if text_change:
        text = text_change(text)
    path = tmp_path / name
    path.write_text(text, encoding="utf-8")
    return path


def test_named_logger_profiles_reach_the_study_as_read_from_the_files():
    study = study_from_scenario(load_scenario(TWO_ROUTES))
    assert list(study.profiles) == ["summer", "winter"]
    for name, expected in (("summer", _summer_by_hand()), ("winter", _winter_by_hand())):
        times, temps = (np.asarray(v, float) for v in study.profiles[name])
        np.testing.assert_allclose(times, expected[0], rtol=0, atol=1e-9)
        np.testing.assert_allclose(temps, expected[1], rtol=0, atol=1e-9)


def test_a_design_passes_only_if_it_holds_on_every_profile():
    res = study_from_scenario(load_scenario(TWO_ROUTES)).results()
    per = res.by_profile
    for (cand, thk), grp in per.groupby(["candidate", "thickness"]):
        row = res.sweep[(res.sweep["candidate"] == cand) & np.isclose(res.sweep["thickness"], thk)]
        assert bool(row["meets_target"].iloc[0]) == bool(grp["meets_target"].all()), (cand, thk)


def test_one_logger_file_as_ambient_profile(tmp_path):
    path = _copy(tmp_path, lambda t: t.replace(
        'ambient_profiles = { summer = { file = "route_summer_demo.csv" }, '
        'winter = { file = "route_winter_demo.csv" } }',
        'ambient_profile = { file = "route_summer_demo.csv" }'))
    study = study_from_scenario(load_scenario(path))
    times, temps = (np.asarray(v, float) for v in study.t_ambient)
    np.testing.assert_allclose(temps, _summer_by_hand()[1], atol=1e-9)


def test_saving_records_each_files_sha256_and_a_changed_file_is_refused(tmp_path):
    path = _copy(tmp_path)
    saved = save_scenario(load_scenario(path), tmp_path / "saved.toml")
    text = saved.read_text(encoding="utf-8")
    assert text.count("sha256 = ") == 2
    load_scenario(saved)  # the files are unchanged: loads
    with open(tmp_path / "route_winter_demo.csv", "a", encoding="utf-8") as f:
        f.write("2026-01-21T18:15:00+01:00,35.0\n")
    with pytest.raises(ScenarioError) as err:
        load_scenario(saved)
    msg = str(err.value)
    line = next(i for i, ln in enumerate(text.splitlines(), 1) if "ambient_profiles.winter" in ln)
    assert f"saved.toml:{line}:" in msg and "route_winter_demo.csv has changed" in msg


def test_missing_logger_file_names_the_key_and_the_file(tmp_path):
    path = _copy(tmp_path)
    (tmp_path / "route_summer_demo.csv").unlink()
    with pytest.raises(ScenarioError, match=r"s\.toml:\d+:\d+: inputs\.ambient_profiles.*no such logger file"):
        load_scenario(path)


def test_a_bad_cell_in_the_logger_file_is_reported_with_its_own_line(tmp_path):
    path = _copy(tmp_path)
    lines = (tmp_path / "route_summer_demo.csv").read_text().splitlines()
    lines[10] = "2.0,warm"
    (tmp_path / "route_summer_demo.csv").write_text("\n".join(lines) + "\n")
    with pytest.raises(ScenarioError, match=r"route_summer_demo\.csv:11:\d+"):
        load_scenario(path)


def test_only_one_way_of_giving_the_ambient(tmp_path):
    path = _copy(tmp_path, lambda t: t.replace('coolant = "pcm_plus5"', 'coolant = "pcm_plus5"\nt_ambient = "25 °C"'))
    with pytest.raises(ScenarioError, match="exactly one of t_ambient"):
        check_scenario(load_scenario(path))


def test_report_names_each_profiles_source_file_and_hash():
    ev = evaluate(load_scenario(TWO_ROUTES))
    html = render_html(ev, generated="test")
    assert "logger file route_summer_demo.csv (sha256" in html
    assert "logger file route_winter_demo.csv (sha256" in html
    assert "Temperatures over the trip" in html
