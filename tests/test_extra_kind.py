"""Proof that a study kind plugs in from its own declaration only.

A small extra kind (a one-layer tank wall, one input, material candidates) is
defined here, registered, and run through a scenario file, the report and the
command line, with no change anywhere else. The fixture unregisters it so
other tests see only the built-in kinds.
"""

from __future__ import annotations

import html
from types import MappingProxyType

import pandas as pd
import pytest
from ht.conduction import k_to_R  # reference library (PyPI "ht") used as the oracle

from workbench import conduction
from workbench.scenario import (
    CriterionSpec,
    InputSpec,
    Scenario,
    StudyKind,
    available_kinds,
    load_scenario,
    register_study_kind,
    save_scenario,
    scenario_keys_text,
    study_from_scenario,
    unregister_study_kind,
)

KIND = "tank_wall"
DELTA_T = 30.0  # K, fixed difference between the tank's contents and the room (demo scenario)


class TankWallStudy:
    """One plane layer of each candidate material at one thickness (demo study)."""

    def __init__(self, candidates, materials, thickness: float):
        self.candidates = list(candidates)
        self.materials = materials
        self.thickness = float(thickness)
        self.names = list(self.candidates)

    def results(self) -> pd.DataFrame:
        k = self.materials.loc[self.candidates, "conductivity"].to_numpy(float)
        frame = pd.DataFrame(
            {
                "u_value": conduction.u_value([self.thickness], k[:, None]),
                "heat_flux": conduction.heat_flux(k, self.thickness, DELTA_T),
                "conductivity_source": self.materials.loc[self.candidates, "conductivity_source"],
            },
            index=pd.Index(self.candidates, name="candidate"),
        )
        frame.attrs["units"] = {"u_value": "W/(m^2*K)", "heat_flux": "W/m^2"}
        frame.attrs["assumptions"] = ("Steady conduction through one plane layer (demo kind).",)
        frame.attrs["cautions"] = ()
        return frame


def _check(cands, materials):
    return [(i, "", f"unknown material id {c!r}") for i, c in enumerate(cands)
            if c not in materials.index]


def _tank_kind() -> StudyKind:
    return StudyKind(
        name=KIND,
        title="Tank wall (demo kind)",
        job="Compare one-layer tank walls at one thickness (a demo kind defined in a test).",
        inputs=(InputSpec("thickness", "thickness", "40 mm", "Wall thickness",
                          label="Wall thickness"),),
        column_kinds=MappingProxyType({"u_value": "u_value", "heat_flux": "heat_flux"}),
        flag_columns=(),
        build=lambda s, x, materials, curves: TankWallStudy(s.candidates, materials,
                                                            x["thickness"]),
        read_back=lambda st: ({"thickness": f"{st.thickness!r} m"}, tuple(st.candidates)),
        default_criteria=(CriterionSpec("heat_flux", "minimise", 1.0),),
        formula_sources=("fourier",),
        property_sources=("conductivity_source",),
        cautions=("Demo kind: not a design method.",),
        starter_candidates=("eps_20", "pir_32"),
        check_candidates=_check,
        study_type=TankWallStudy,
        column_labels=MappingProxyType({"heat_flux": "Heat flux through the tank wall"}),
    )


@pytest.fixture
def tank_kind():
    register_study_kind(KIND, _tank_kind)
    try:
        yield
    finally:
        unregister_study_kind(KIND)
    assert KIND not in available_kinds()


@pytest.fixture
def tank_file(tank_kind, tmp_path):
    s = Scenario(kind=KIND, inputs={"thickness": "40 mm"}, candidates=("eps_20", "pir_32"),
                 title="Tank wall (demo data)")
    return save_scenario(s, tmp_path / "tank.toml")


def test_scenario_round_trip_builds_the_study(tank_file):
    s = load_scenario(tank_file)
    assert s.kind == KIND and s.candidates == ("eps_20", "pir_32")
    study = study_from_scenario(s)
    r = study.results()
    k = study.materials.loc[["eps_20", "pir_32"], "conductivity"].to_numpy(float)
    # oracle: ht.conduction.k_to_R(k, t) = t / k [m²·K/W]; U = 1 / R for one bare layer
    expected_u = [1.0 / k_to_R(ki, 0.040) for ki in k]
    assert r["u_value"].to_numpy() == pytest.approx(expected_u, rel=1e-12)
    assert r["heat_flux"].to_numpy() == pytest.approx([u * DELTA_T for u in expected_u])


def test_report_uses_the_kind_declaration(tank_file, tmp_path):
    from workbench.report import evaluate, render_html, write_report

    ev = evaluate(load_scenario(tank_file))
    page = html.unescape(render_html(ev, generated="fixed"))
    assert "Tank wall (demo kind)" in page
    assert "Heat flux through the tank wall [W/m²]" in page  # the kind's label, with its unit
    assert "Demo kind: not a design method." in page
    out = write_report(ev, tmp_path / "tank.html")
    assert out.read_text("utf-8").startswith("<!DOCTYPE html>")


def test_cli_rank_report_and_keys(tank_file, tmp_path, capsys):
    from workbench.cli import main

    assert main(["rank", str(tank_file)]) == 0
    out = capsys.readouterr().out
    assert "eps_20" in out and "pir_32" in out
    assert main(["-q", "report", str(tank_file), "-o", str(tmp_path / "r.html")]) == 0
    assert (tmp_path / "r.html").is_file()
    capsys.readouterr()
    assert main(["scenario", "keys", KIND]) == 0
    keys = capsys.readouterr().out
    assert keys == scenario_keys_text(KIND)
    assert "Wall thickness" in keys and '"40 mm"' in keys and "heat_flux" in keys


def test_unknown_kind_is_refused_after_unregistering(tank_kind):
    unregister_study_kind(KIND)
    with pytest.raises(ValueError, match="kind: unknown 'tank_wall'"):
        scenario_keys_text(KIND)
    register_study_kind(KIND, _tank_kind)  # the fixture removes it again
