"""Tests of the materials loader (workbench.materials): curated load, user-file
merge and precedence, unit conversion of user headers, error reporting, and
loading from an installed wheel.

Unit factors used as expected values are from NIST SP 811 (2008 ed.),
Appendix B.8 (from memory): 1 Btu_IT·in/(h·ft²·°F) = 0.1442279 W/(m·K);
1 lb/ft³ = 16.01846 kg/m³; 1 Btu_IT/(lb·°F) = 4186.8 J/(kg·K); °F to K from
Appendix B.9: T/K = (t/°F + 459.67) / 1.8.
"""

from __future__ import annotations

import csv
import json
import os
import subprocess
import sys
import tempfile
import textwrap
from pathlib import Path

import numpy as np
import pandas as pd
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from workbench import materials as wm
from workbench.materials import (
    FAMILIES,
    MaterialsFileError,
    check_materials_file,
    load_conductivity_curves,
    load_materials,
    load_sources,
)

REPO = Path(__file__).resolve().parent.parent
DATA = Path(__file__).resolve().parent / "data"
OK = DATA / "user_materials_ok.csv"

BTU_IN_PER_H_FT2_F = 0.1442279  # W/(m·K) — NIST SP 811 (2008) App. B.8, from memory
LB_PER_FT3 = 16.01846  # kg/m³ — NIST SP 811 (2008) App. B.8, from memory
BTU_PER_LB_F = 4186.8  # J/(kg·K) — NIST SP 811 (2008) App. B.8, from memory


def _f_to_k(t_f: float) -> float:
    return (t_f + 459.67) / 1.8  # NIST SP 811 (2008) App. B.9


def _raw_rows() -> list[dict[str, str]]:
    with open(REPO / "tables" / "materials.csv", encoding="utf-8", newline="") as f:
        return list(csv.DictReader(f))


# ---------------------------------------------------------------------------
# Curated tables
# ---------------------------------------------------------------------------
def test_default_load_shape_and_columns():
    m = load_materials()
    raw = _raw_rows()
    assert m.index.name == "id"
    assert m.index.is_unique
    assert list(m.index) == [r["id"] for r in raw]
    for col in ("name", "family", "conductivity", "density", "specific_heat"):
        assert col in m.columns
    for col in ("conductivity", "density", "specific_heat", "conductivity_temperature"):
        assert m[col].dtype == float and m[col].notna().all()
    for prop in ("conductivity", "density", "specific_heat"):
        assert (m[f"{prop}_source"].str.len() > 0).all()
        assert (m[f"{prop}_source_key"].str.len() > 0).all()
    assert set(m["family"]) <= set(FAMILIES)
    assert (m["origin"] == "curated").all()


def test_values_equal_the_csv_and_service_limits_in_kelvin():
    m = load_materials()
    for r in _raw_rows():
        row = m.loc[r["id"]]
        assert row["conductivity"] == float(r["conductivity"])
        assert row["density"] == float(r["density"])
        # the file holds °C, the frame K
        assert row["t_service_min"] == pytest.approx(float(r["t_service_min"]) + 273.15)
        assert row["t_service_max"] == pytest.approx(float(r["t_service_max"]) + 273.15)
        if r["cost"]:
            expected_per_m3 = float(r["cost"]) * (
                float(r["density"]) if r["cost_basis"] == "per_kg" else 1.0
            )
            assert row["cost_per_volume"] == pytest.approx(expected_per_m3)


def test_sources_are_resolved_and_recalled_values_flagged():
    m = load_materials()
    s = load_sources()
    row = m.loc["stainless_304"]
    assert row["conductivity_source_key"] == "incropera7-tA1-mem"
    assert "Fundamentals of Heat and Mass Transfer" in row["conductivity_source"]
    assert "Table A.1" in row["conductivity_source"]
    assert "recalled from memory" in row["conductivity_source"]
    assert row["cost_source"] == "demo"
    assert m.loc["abs", "conductivity_source"] == "common-practice"
    # every resolved text in the frame is the one load_sources gives for its key
    for col in wm._SOURCE_COLUMNS:
        keys = m[f"{col}_key"]
        used = keys != ""
        assert (m.loc[used, col] == s.loc[keys[used], "resolved"].to_numpy()).all()
    assert np.isnan(m.loc["air", "emissivity"]) and m.loc["air", "emissivity_source"] == ""


def test_conductivity_curves_load_sorted_in_kelvin():
    curves = load_conductivity_curves()
    for rid, (t, k) in curves.items():
        assert rid in load_materials().index
        assert np.all(np.diff(t) > 0) and t.shape == k.shape
    t, k = curves["air"]
    # Incropera 7th ed. Table A.4 (from memory): air at 300 K, k = 0.0263 W/(m·K)
    assert np.interp(300.0, t, k) == pytest.approx(0.0263)
    assert wm.conductivity_curve_sources()["copper_pure"] == ["incropera7-tA1-mem"]


def test_returned_frames_are_independent_copies():
    a = load_materials()
    k_before = float(a.loc["eps_20", "conductivity"])
    a.loc["eps_20", "conductivity"] = 99.0
    assert load_materials().loc["eps_20", "conductivity"] == k_before != 99.0
    c = load_conductivity_curves()
    c["air"][1][0] = 99.0
    assert load_conductivity_curves()["air"][1][0] == pytest.approx(0.0181)


# ---------------------------------------------------------------------------
# Locating the tables
# ---------------------------------------------------------------------------
def _fake_tables(folder: Path) -> Path:
    folder.mkdir(parents=True)
    (folder / "materials.csv").write_text("id\n", encoding="utf-8")
    return folder


def test_tables_dir_prefers_package_then_repo(tmp_path):
    pkg = _fake_tables(tmp_path / "pkg" / "_tables")
    repo = _fake_tables(tmp_path / "repo" / "tables")
    assert wm._tables_dir(pkg, repo) == pkg
    assert wm._tables_dir(tmp_path / "missing", repo) == repo
    with pytest.raises(FileNotFoundError, match="materials.csv"):
        wm._tables_dir(tmp_path / "missing", tmp_path / "missing2")


def test_tables_dir_in_source_checkout_is_repo_tables():
    # in this checkout there is no workbench/_tables, so the repo folder is used
    if (REPO / "workbench" / "_tables").exists():
        pytest.skip("a workbench/_tables folder exists in the checkout")
    assert wm.tables_dir() == REPO / "tables"


# ---------------------------------------------------------------------------
# User files: merge, precedence, units
# ---------------------------------------------------------------------------
def test_user_file_merges_with_precedence_and_units():
    base = load_materials()
    m = load_materials(OK)
    # one replaced, one added
    assert len(m) == len(base) + 1
    assert set(m.index) == set(base.index) | {"demo_pu_gasket"}
    eps = m.loc["eps_20"]
    assert eps["origin"] == str(OK)
    assert eps["name"] == "EPS 20 kg/m³, supplier grade (demo)"
    # US-unit headers converted (NIST SP 811 factors above)
    assert eps["conductivity"] == pytest.approx(0.229 * BTU_IN_PER_H_FT2_F, rel=1e-6)
    assert eps["density"] == pytest.approx(1.25 * LB_PER_FT3, rel=1e-6)
    assert eps["conductivity_temperature"] == pytest.approx(_f_to_k(50.0))
    assert eps["t_service_max"] == pytest.approx(_f_to_k(176.0))
    assert eps["t_service_min"] == pytest.approx(-50.0 + 273.15)  # no unit: °C
    # the user row replaces the curated row as a whole: no curated emissivity leaks in
    assert np.isnan(eps["emissivity"]) and base.loc["eps_20", "emissivity"] == 0.9
    # companion sources file and free-text source
    assert eps["conductivity_source_key"] == "demo-sheet-eps"
    assert eps["conductivity_source"].startswith("Demo supplier datasheet EPS-20")
    new = m.loc["demo_pu_gasket"]
    assert new["density_source"] == "Demo datasheet invented for the test suite, page 1"
    assert new["density_source_key"] == ""
    assert new["conductivity"] == pytest.approx(0.278 * BTU_IN_PER_H_FT2_F, rel=1e-6)
    assert new["t_service_max"] == pytest.approx(_f_to_k(212.0))
    # every other row is untouched
    others = base.index.drop("eps_20")
    pd.testing.assert_frame_equal(m.loc[others], base.loc[others])


def test_user_kt_companion_merges_and_converts_celsius():
    curves = load_conductivity_curves(OK)
    t, k = curves["demo_pu_gasket"]
    np.testing.assert_allclose(t, [273.15, 313.15])
    np.testing.assert_allclose(k, [0.037, 0.043])
    assert "air" in curves  # curated curves kept


def test_user_sources_appended_to_source_table():
    s = load_sources(DATA / "user_materials_ok.sources.csv")
    assert s.loc["demo-sheet-eps", "kind"] == "datasheet"
    assert "fourier" in s.index


def test_ok_file_has_no_problems():
    assert check_materials_file(OK) == []


def test_us_units_for_specific_heat_and_cost(tmp_path):
    f = tmp_path / "us.csv"
    f.write_text(
        "id,name,family,conductivity,density,specific_heat [Btu/(lb*degF)],cost [USD/lb],cost_basis,currency,source\n"
        "demo_us,Demo,polymer,0.2,1200,0.35,2.0,per_kg,USD,demo\n",
        encoding="utf-8",
    )
    m = load_materials(f)
    assert m.loc["demo_us", "specific_heat"] == pytest.approx(0.35 * BTU_PER_LB_F, rel=1e-6)
    # 1 lb = 0.45359237 kg exactly (NIST SP 811 App. B.8)
    assert m.loc["demo_us", "cost"] == pytest.approx(2.0 / 0.45359237, rel=1e-9)


@settings(max_examples=15, deadline=None)
@given(
    k=st.floats(0.019, 0.059),
    rho=st.floats(9.0, 190.0),
    cp=st.floats(900.0, 2400.0),
    t_c=st.floats(-40.0, 60.0),
    tol_pct=st.floats(1.0, 40.0),
)
def test_unit_invariance_us_and_si_headers(k, rho, cp, t_c, tol_pct):
    """The same material written in SI and in US customary units loads identically.

    US values are made with the NIST SP 811 (2008) App. B.8/B.9 factors above.
    """
    si = (
        "id,name,family,conductivity,conductivity_temperature,density,specific_heat,"
        "conductivity_tolerance,source\n"
        f"demo_x,Demo,rigid_foam,{k!r},{t_c + 273.15!r},{rho!r},{cp!r},{tol_pct / 100!r},demo\n"
    )
    us = (
        "id,name,family,conductivity [Btu*in/(h*ft^2*degF)],conductivity_temperature [degF],"
        "density [lb/ft^3],specific_heat [Btu/(lb*degF)],conductivity_tolerance [%],source\n"
        f"demo_x,Demo,rigid_foam,{k / BTU_IN_PER_H_FT2_F!r},{t_c * 1.8 + 32!r},"
        f"{rho / LB_PER_FT3!r},{cp / BTU_PER_LB_F!r},{tol_pct!r},demo\n"
    )
    with tempfile.TemporaryDirectory() as d:
        (Path(d) / "si.csv").write_text(si, encoding="utf-8")
        (Path(d) / "us.csv").write_text(us, encoding="utf-8")
        a = load_materials(Path(d) / "si.csv").loc["demo_x"]
        b = load_materials(Path(d) / "us.csv").loc["demo_x"]
    for col in ("conductivity", "conductivity_temperature", "density", "specific_heat"):
        # 1e-6: the NIST factors above are given to 7 significant figures
        assert b[col] == pytest.approx(a[col], rel=1e-6), col
    assert b["conductivity_tolerance"] == pytest.approx(a["conductivity_tolerance"], rel=1e-12)


# ---------------------------------------------------------------------------
# Bad files: every problem reported with file:row:column and why
# ---------------------------------------------------------------------------
BAD = [
    ("bad_missing_column.csv", ["1:density: required column is missing"]),
    ("bad_non_numeric.csv", ["3:conductivity: '0.03x' is not a finite number"]),
    (
        "bad_implausible.csv",
        [
            "2:conductivity: 65 W/(m*K) is implausible for family 'wood_panel'",
            "3:density: must be > 0",
        ],
    ),
    ("bad_unknown_unit.csv", ["1:conductivity: unknown or wrong unit"]),
    ("bad_duplicate_id.csv", ["3:id: duplicate id 'demo_a' (first on line 2)"]),
    ("bad_missing_source.csv", ["2:density_source: missing source for density"]),
    ("bad_unknown_family.csv", ["2:family: unknown family 'foam'; valid families: metal"]),
    ("bad_unknown_source_key.csv", ["2:conductivity_source: unknown source key 'no-such-key'"]),
    (
        "bad_many.csv",
        [
            "4:id: id 'Bad Id' is not snake_case",
            "5:emissivity: must lie in (0, 1]",
            "5:t_service_max: must exceed t_service_min",
            "6:specific_heat: empty value",
        ],
    ),
]


@pytest.mark.parametrize("name, expected", BAD, ids=[b[0] for b in BAD])
def test_bad_file_reports_every_problem_and_loads_nothing(name, expected):
    path = DATA / name
    before = load_materials()
    with pytest.raises(MaterialsFileError) as info:
        load_materials(path)
    problems = info.value.problems
    assert isinstance(info.value, ValueError)
    assert len(problems) == len(expected), problems
    for problem, want in zip(problems, expected, strict=True):
        assert problem.startswith(f"{path}:{want}"), (problem, want)
    assert check_materials_file(path) == problems
    for problem in problems:
        assert str(path) in str(info.value) and problem in str(info.value)
    # nothing loaded half-way: the curated data is unchanged afterwards
    pd.testing.assert_frame_equal(load_materials(), before)
    with pytest.raises(MaterialsFileError):
        load_conductivity_curves(path)


def _write(tmp_path: Path, name: str, text: str) -> Path:
    f = tmp_path / name
    f.write_text(textwrap.dedent(text).lstrip(), encoding="utf-8")
    return f


def test_unknown_column_cost_and_temperature_problems(tmp_path):
    f = _write(
        tmp_path,
        "x.csv",
        """
        id,name,family,conductivty,conductivity,density,specific_heat,t_service_min,cost [USD/kg],cost_basis,currency,source
        demo_a,Demo,rigid_foam,1,0.035,20,1400,-300,5,per_kg,EUR,demo
        demo_b,Demo,rigid_foam,1,0.035,20,1400,-40,-5,per_box,USD,demo
        """,
    )
    problems = check_materials_file(f)
    assert problems[0].startswith(f"{f}:1:conductivty: unknown column; valid columns: id, name")
    assert any(
        p.startswith(f"{f}:2:t_service_min: -300 °C is below absolute zero") for p in problems
    )
    assert any(
        p.startswith(f"{f}:2:cost: cannot convert 5 USD/kg") for p in problems
    )  # currency mismatch
    assert any(p.startswith(f"{f}:3:cost_basis: 'per_box' is not a cost basis") for p in problems)
    assert len(problems) == 4, problems


def test_kt_companion_problems_are_reported(tmp_path):
    f = _write(
        tmp_path,
        "y.csv",
        """
        id,name,family,conductivity,density,specific_heat,source
        demo_a,Demo,rigid_foam,0.035,20,1400,demo
        """,
    )
    kt = _write(
        tmp_path,
        "y.kt.csv",
        """
        id,temperature,conductivity,source
        demo_a,280,0.034,demo
        demo_a,280,0.035,demo
        nobody,300,0.03,demo
        demo_a,300,5.0,nokey
        """,
    )
    problems = check_materials_file(f)
    assert problems == [
        f"{kt}:3:temperature: temperature 280 K given twice for 'demo_a'",
        f"{kt}:4:id: unknown material id 'nobody'; it must be in the materials table or the user file",
        f"{kt}:5:source: unknown source key 'nokey'",
        f"{kt}:5:conductivity: 5 W/(m·K) is implausible for family 'rigid_foam' (k(T) band 0.009 to 0.12)",
        f"{kt}:2:id: 'demo_a' needs at least two k(T) points",
    ]
    with pytest.raises(MaterialsFileError):
        load_conductivity_curves(f)
    assert load_materials(f).loc["demo_a", "conductivity"] == 0.035  # materials alone are fine


def test_user_sources_companion_cannot_redefine_curated_keys(tmp_path):
    f = _write(
        tmp_path,
        "z.csv",
        """
        id,name,family,conductivity,density,specific_heat,source
        demo_a,Demo,rigid_foam,0.035,20,1400,demo
        """,
    )
    side = _write(
        tmp_path,
        "z.sources.csv",
        """
        key,citation,locator,kind,note
        fourier,My own Fourier,-,other,
        """,
    )
    assert check_materials_file(f) == [f"{side}:2:key: source key 'fourier' is defined twice"]


def test_missing_file_is_a_problem_not_a_crash(tmp_path):
    missing = tmp_path / "nope.csv"
    assert check_materials_file(missing) == [f"{missing}:0:-: file not found"]
    with pytest.raises(MaterialsFileError, match="file not found"):
        load_materials(missing)


def test_comment_lines_keep_physical_line_numbers(tmp_path):
    f = _write(
        tmp_path,
        "c.csv",
        """
        # a comment line
        id,name,family,conductivity,density,specific_heat,source

        demo_a,Demo,rigid_foam,abc,20,1400,demo
        """,
    )
    assert check_materials_file(f) == [f"{f}:4:conductivity: 'abc' is not a finite number"]


# ---------------------------------------------------------------------------
# Built wheel (slow: builds and installs the package, about 5-10 s)
# ---------------------------------------------------------------------------
@pytest.mark.wheel
def test_loading_from_built_wheel_matches_source_tree(tmp_path):
    """The curated tables ship inside the wheel (workbench/_tables) and load there."""
    wheels = tmp_path / "wheels"
    site = tmp_path / "site"
    pip = [sys.executable, "-m", "pip", "--disable-pip-version-check", "-q"]
    subprocess.run(
        [*pip, "wheel", "--no-deps", "--no-build-isolation", "-w", str(wheels), str(REPO)],
        check=True,
        capture_output=True,
        timeout=120,
    )
    (wheel,) = wheels.glob("heatpath_workbench-*.whl")
    subprocess.run(
        [*pip, "install", "--no-deps", "--no-index", "--target", str(site), str(wheel)],
        check=True,
        capture_output=True,
        timeout=120,
    )
    code = textwrap.dedent("""
        import json, workbench, workbench.materials as wm
        m = wm.load_materials()
        print(json.dumps({
            "module": workbench.__file__,
            "tables": str(wm.tables_dir()),
            "n": len(m),
            "k_eps20": float(m.loc["eps_20", "conductivity"]),
            "curves": len(wm.load_conductivity_curves()),
            "sources": len(wm.load_sources()),
        }))
    """)
    env = {**os.environ, "PYTHONPATH": str(site)}
    out = subprocess.run(
        [sys.executable, "-c", code],
        cwd=tmp_path,
        env=env,
        check=True,
        capture_output=True,
        text=True,
        timeout=120,
    )
    info = json.loads(out.stdout.strip().splitlines()[-1])
    assert Path(info["module"]).resolve().is_relative_to(site.resolve())
    assert Path(info["tables"]).resolve() == (site / "workbench" / "_tables").resolve()
    assert info["n"] == len(load_materials())
    assert info["k_eps20"] == float(load_materials().loc["eps_20", "conductivity"])
    assert info["curves"] == len(load_conductivity_curves())
    assert info["sources"] == len(load_sources())
