"""Saved scenario files that use a renamed material id still open, with a warning naming the new id."""

import warnings

import pytest

from workbench.materials import DEPRECATED_IDS, DeprecatedMaterialIdWarning
from workbench.scenario import load_scenario, scenario_to_text, study_from_scenario

OLD, NEW = "zinc_zamak3", DEPRECATED_IDS["zinc_zamak3"]

WALL = f'''format = "heatpath-scenario"
version = 1
kind = "wall"
title = "renamed id (test)"
candidates = [
  "{OLD}",
  {{ name = "skin + foam", layers = [{{ material = "{OLD}", thickness = "1 mm" }}, {{ material = "pir_32" }}] }},
]

[inputs]
t_inside = "20 °C"
t_outside = "0 °C"
area = "1 m²"
r_si = "0.13 m²·K/W"
r_se = "0.04 m²·K/W"
budget = "10 W/m²"
thickness = "50 mm"
conductivity_vs_temperature = false

[decision]
chosen = "{OLD}"
'''


def test_old_id_opens_with_a_warning_naming_the_new_id_and_the_place(tmp_path):
    path = tmp_path / "old.toml"
    path.write_text(WALL, encoding="utf-8")
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        scen = load_scenario(path)
    msgs = [str(w.message) for w in caught if issubclass(w.category, DeprecatedMaterialIdWarning)]
    assert len(msgs) == 3 and all(NEW in m for m in msgs)
    assert any("old.toml:6:" in m for m in msgs) and any("old.toml:7:" in m for m in msgs)
    assert scen.candidates[0] == NEW and scen.decision.chosen == NEW
    assert scen.candidates[1]["layers"][0]["material"] == NEW
    study = study_from_scenario(scen)
    assert NEW in study.names
    assert OLD not in scenario_to_text(scen)  # the next save writes the new id


@pytest.mark.parametrize("old", sorted(DEPRECATED_IDS))
def test_every_alias_points_to_a_current_row(old):
    from workbench.materials import load_materials

    assert DEPRECATED_IDS[old] in load_materials().index
