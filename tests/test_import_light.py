"""``import workbench`` stays light, and the core stays at the numpy floor.

* A fresh interpreter that imports :mod:`workbench` (and uses the numeric core)
  has not imported pint, pandas, scipy, plotly or ipywidgets; those load only
  when a part that needs them is used (units, tables, special functions).
* Every public name of ``workbench.__all__`` still resolves, to the object of
  its defining submodule.
* The physical constants written out in the core (instead of importing
  ``scipy.constants`` at import time) equal the CODATA 2018 recommended values
  as provided by ``scipy.constants`` (the oracle; scipy is installed).
* ``heat_flux`` on a sweep grid builds the grid once and checks overflow from
  its small factors; the results agree with Fourier's law evaluated directly.

Timing goals (import time, sweep speed) are measured in ``benchmarks/``, not here.
"""

from __future__ import annotations

import importlib
import json
import math
import subprocess
import sys
import warnings

import numpy as np
import pytest
import scipy.constants

import workbench as wb

HEAVY = ("pint", "pandas", "scipy", "plotly", "ipywidgets")


def _fresh(code: str) -> dict:
    """Run ``code`` in a fresh interpreter; it prints one JSON object, returned here."""
    done = subprocess.run(
        [sys.executable, "-c", code], capture_output=True, text=True, timeout=120, check=False
    )
    assert done.returncode == 0, done.stderr
    return json.loads(done.stdout.strip().splitlines()[-1])


_LOADED = f"""
import json, sys
def loaded():
    return sorted({{m.split(".")[0] for m in sys.modules}} & set({HEAVY!r}))
"""


# ---------------------------------------------------------------------------
# Light import
# ---------------------------------------------------------------------------
def test_import_workbench_loads_no_heavy_package():
    out = _fresh(_LOADED + "import workbench\nprint(json.dumps(loaded()))")
    assert out == []


def test_heat_flux_use_loads_no_heavy_package():
    code = _LOADED + (
        "import workbench\n"
        "q = workbench.heat_flux(0.04, 0.05, 20.0)\n"
        "h = workbench.radiation_coefficient(0.9, 300.0, 290.0)\n"
        "r = workbench.air_layer_resistance(0.025, 'horizontal')\n"
        "print(json.dumps({'loaded': loaded(), 'q': q}))"
    )
    out = _fresh(code)
    assert out["loaded"] == []
    # Fourier's law, q = k ΔT / L (Incropera et al., Fundamentals of Heat and Mass
    # Transfer, 7th ed., Eq. 1.2): 0.04 · 20 / 0.05 = 16 W/m²
    assert out["q"] == pytest.approx(0.04 * 20.0 / 0.05, rel=1e-15)


def test_load_materials_works_after_a_light_import():
    code = _LOADED + (
        "import workbench\n"
        "before = loaded()\n"
        "frame = workbench.load_materials()\n"
        "print(json.dumps({'before': before, 'after': loaded(), 'rows': len(frame),\n"
        "                  'columns': list(frame.columns)}))"
    )
    out = _fresh(code)
    assert out["before"] == []
    assert "pandas" in out["after"] and "pint" not in out["after"]
    assert out["rows"] > 0
    assert {"name", "family", "conductivity", "density", "specific_heat"} <= set(out["columns"])


def test_the_unit_registry_is_created_on_first_use():
    code = _LOADED + (
        "from workbench import units\n"
        "before = loaded()\n"
        "value = units.parse('25 mm', 'thickness', 'thickness')\n"
        "from workbench.units import Q_, ureg\n"
        "print(json.dumps({'before': before, 'after': loaded(), 'value': value,\n"
        "                  'one': ureg is units.registry() and Q_ is ureg.Quantity}))"
    )
    out = _fresh(code)
    assert out["before"] == []
    assert "pint" in out["after"]
    assert out["value"] == pytest.approx(0.025, rel=1e-15)  # 1 mm = 1e-3 m, SI definition
    assert out["one"] is True


def test_every_public_name_resolves_in_a_fresh_interpreter():
    code = _LOADED + (
        "import importlib, workbench\n"
        "bad = []\n"
        "for name in workbench.__all__:\n"
        "    value = getattr(workbench, name)\n"
        "    module = importlib.import_module('workbench.' + workbench._WHERE[name])\n"
        "    if value is not getattr(module, name):\n"
        "        bad.append(name)\n"
        "print(json.dumps({'bad': bad, 'n': len(workbench.__all__),\n"
        "                  'missing_from_dir': sorted(set(workbench.__all__) - set(dir(workbench)))}))"
    )
    out = _fresh(code)
    assert out["bad"] == []
    assert out["n"] == len(wb.__all__) > 0
    assert out["missing_from_dir"] == []


@pytest.mark.parametrize("name", wb.__all__)
def test_from_workbench_import_name(name):
    namespace: dict = {}
    exec(f"from workbench import {name}", namespace)  # noqa: S102  (a fixed, listed name)
    assert namespace[name] is getattr(wb, name)


def test_dir_lists_every_public_name_and_unknown_names_raise():
    assert set(wb.__all__) <= set(dir(wb))
    with pytest.raises(AttributeError, match="no_such_name"):
        wb.no_such_name  # noqa: B018
    assert callable(wb.air_properties)  # the function, not the submodule of the same name


def _modules(*names: str):
    # ``workbench.air_properties`` is the function of that name; take the submodules
    return tuple(importlib.import_module(f"workbench.{n}") for n in names)


# ---------------------------------------------------------------------------
# Constants written out in the core, against scipy.constants as the oracle
# ---------------------------------------------------------------------------
def test_constants_equal_codata_2018_as_given_by_scipy():
    air_layers, air_properties, housing, surfaces = _modules(
        "air_layers", "air_properties", "housing", "surfaces"
    )

    # CODATA Recommended Values of the Fundamental Physical Constants: 2018
    # (Tiesinga et al., Rev. Mod. Phys. 93, 025010, 2021), through scipy.constants.
    assert surfaces.STEFAN_BOLTZMANN == scipy.constants.Stefan_Boltzmann
    assert surfaces.STANDARD_GRAVITY == scipy.constants.g
    assert air_properties.MOLAR_GAS_CONSTANT == scipy.constants.R
    assert air_properties.STANDARD_ATMOSPHERE == scipy.constants.atm
    # the modules that use σ and g share the one value
    assert air_layers._SIGMA == housing._SIGMA == surfaces.STEFAN_BOLTZMANN
    assert air_layers._G == surfaces.STANDARD_GRAVITY


def test_stefan_boltzmann_and_gas_constant_from_the_exact_si_defining_constants():
    # 2019 SI: h, k, c and N_A are exact (BIPM, The International System of Units,
    # 9th ed., 2019, Table 1); σ = 2π⁵k⁴/(15h³c²) and R = N_A k.
    air_properties, surfaces = _modules("air_properties", "surfaces")

    h, k, c, n_a = 6.62607015e-34, 1.380649e-23, 299792458.0, 6.02214076e23
    sigma = 2.0 * math.pi**5 * k**4 / (15.0 * h**3 * c**2)
    assert surfaces.STEFAN_BOLTZMANN == pytest.approx(sigma, rel=1e-15)
    assert air_properties.MOLAR_GAS_CONSTANT == pytest.approx(n_a * k, rel=1e-15)


# ---------------------------------------------------------------------------
# heat_flux on a sweep grid: one grid, overflow checked on the small factors
# ---------------------------------------------------------------------------
def _grid(n_k: int = 40, n_l: int = 30, n_t: int = 20):
    rng = np.random.default_rng(7)
    k = rng.uniform(0.02, 200.0, n_k)[:, None, None]
    length = np.linspace(0.001, 0.2, n_l)[None, :, None]
    dt = np.linspace(-80.0, 80.0, n_t)[None, None, :]
    return k, length, dt


@pytest.mark.parametrize("order", [(0, 1, 2), (2, 0, 1), (1, 2, 0)])
def test_heat_flux_grid_agrees_with_fourier_in_any_axis_layout(order):
    # Fourier's law q = k ΔT / L (Incropera et al., 7th ed., Eq. 1.2), evaluated
    # directly; whichever pair the function combines first, it differs by rounding only.
    k, length, dt = (np.moveaxis(a, (0, 1, 2), order) for a in _grid())
    with warnings.catch_warnings():
        warnings.simplefilter("error", RuntimeWarning)
        q = wb.heat_flux(k, length, dt)
    ref = k * dt / length
    assert q.shape == ref.shape
    np.testing.assert_allclose(q, ref, rtol=1e-15, atol=0)


def test_heat_flux_grid_overflow_raises_without_runtime_warning():
    k, length, dt = _grid()
    with warnings.catch_warnings():
        warnings.simplefilter("error", RuntimeWarning)
        with pytest.raises(ValueError, match="heat_flux.*not finite.*k, thickness, delta_t"):
            wb.heat_flux(k * 1e305, length, dt)  # 2e307 · 8e4 W/m² overflows


def test_heat_flux_grid_with_a_loose_bound_still_checks_each_value():
    # k and ΔT share an axis: max|k/L| · max|ΔT| overflows (1e300 · 1e300) although no
    # single product does (1e300 · 1 and 1e-300 · 1e300), so every value is checked.
    k = np.array([1e300, 1e-300])[:, None]
    length = np.array([[1.0]])
    dt = np.vstack([np.ones(5000), np.full(5000, 1e300)])
    with warnings.catch_warnings():
        warnings.simplefilter("error", RuntimeWarning)
        q = wb.heat_flux(k, length, dt)
    np.testing.assert_allclose(q, k * dt / length, rtol=1e-15)
    dt[0, 17] = -1e10  # one product that does overflow: 1e300 · 1e10
    with warnings.catch_warnings():
        warnings.simplefilter("error", RuntimeWarning)
        with pytest.raises(ValueError, match="heat_flux.*not finite"):
            wb.heat_flux(k, length, dt)
