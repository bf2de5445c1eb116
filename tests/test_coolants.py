"""Checks of the coolants table against sources outside the project.

Oracles: the ``chemicals`` package (CRC enthalpies of fusion, the Clapeyron
sublimation-pressure equation), CoolProp (water and CO2 equations of state),
the IAPWS R10-06 Gibbs function of ice Ih (evaluated here, checked against the
release's own check values),
scipy.constants (CODATA 2018). Values marked demo or common-practice are only
checked for plausibility (stated as such).
"""

from __future__ import annotations

import math

import chemicals
import pytest
from CoolProp.CoolProp import PropsSI
from scipy import constants, integrate, optimize

from workbench.coolants import (
    COOLANT_COLUMNS,
    PHASE_CHANGES,
    coolant,
    load_coolants,
    specific_heats_for,
)

WATER = "7732-18-5"
CO2 = "124-38-9"


@pytest.fixture(scope="module")
def table():
    return load_coolants()


def test_required_coolants_present(table):
    assert {"water_ice", "gel_pack_water", "pcm_plus5", "pcm_plus20", "dry_ice"} <= set(table.index)
    assert set(table["phase_change"]) <= set(PHASE_CHANGES)


def test_ice_latent_heat_against_chemicals_crc(table):
    # chemicals.phase_change.Hfus, method CRC (CRC Handbook of Chemistry and
    # Physics, enthalpy of fusion of water, 6.01 kJ/mol), divided by the molar
    # mass chemicals.MW -> 333.6 kJ/kg; the table's 333.55 kJ/kg must agree to 0.1 %.
    h_fus = chemicals.Hfus(CASRN=WATER) / (chemicals.MW(WATER) / 1000.0)
    assert table.loc["water_ice", "latent_heat"] == pytest.approx(h_fus, rel=1e-3)


def test_ice_melting_point_is_the_ice_point(table):
    # scipy.constants.zero_Celsius (273.15 K): the melting point of ice at
    # 101.325 kPa lies within 0.01 K of it (Celsius scale definition, CODATA).
    assert table.loc["water_ice", "t_phase_change"] == pytest.approx(
        constants.zero_Celsius, abs=0.01
    )
    # chemicals.Tm (melting point of water, its default data source)
    assert table.loc["water_ice", "t_phase_change"] == pytest.approx(chemicals.Tm(WATER), abs=0.01)


def test_liquid_water_specific_heat_against_coolprop(table):
    # CoolProp IAPWS-95 water at 2 °C, 1 atm: 4.21 kJ/(kg·K)
    cp = PropsSI("C", "T", 275.15, "P", 101325.0, "Water")
    assert table.loc["water_ice", "specific_heat_liquid"] == pytest.approx(cp, rel=0.01)


def test_ice_density_and_specific_heat_plausible(table):
    # Ice floats: less dense than liquid water at 0 °C (CoolProp saturated
    # liquid at the triple point, 999.8 kg/m³), by about 8 % (from memory of
    # IAPWS R10-06: 916.7 kg/m³).
    rho_water = PropsSI("D", "T", 273.16, "Q", 0, "Water")
    assert 0.90 < table.loc["water_ice", "density"] / rho_water < 0.93
    # ice holds about half the specific heat of liquid water (common knowledge)
    ratio = (
        table.loc["water_ice", "specific_heat_solid"]
        / table.loc["water_ice", "specific_heat_liquid"]
    )
    assert 0.45 < ratio < 0.55


def test_dry_ice_sublimation_enthalpy_bracketed_by_coolprop_and_chemicals(table):
    # CoolProp's CO2 equation of state ends at the triple point (216.59 K), so
    # it cannot give the enthalpy of sublimation at 194.65 K. Two independent
    # estimates bracket it:
    #  (a) at the triple point: H_sub = H_fus (chemicals.Hfus, CRC, 9.02 kJ/mol)
    #      + H_vap (CoolProp, saturated vapour minus liquid at T_triple) ~ 555 kJ/kg;
    #      H_sub grows slowly as T falls (c_p,gas < c_p,solid), so it is a lower bound;
    #  (b) the Clausius-Clapeyron mean over 194.65 K .. T_triple from the two
    #      pressures 101.325 kPa and p_triple (CoolProp) ~ 592 kJ/kg; the ideal-gas
    #      assumption overstates it, so it is an upper bound.
    mw = chemicals.MW(CO2) / 1000.0
    t_tp = PropsSI("Ttriple", "CO2")
    p_tp = PropsSI("ptriple", "CO2")
    h_vap = PropsSI("H", "T", t_tp + 1e-6, "Q", 1, "CO2") - PropsSI(
        "H", "T", t_tp + 1e-6, "Q", 0, "CO2"
    )
    lower = chemicals.Hfus(CASRN=CO2) / mw + h_vap
    upper = constants.R * math.log(p_tp / constants.atm) / (1 / 194.65 - 1 / t_tp) / mw
    assert lower < table.loc["dry_ice", "latent_heat"] < upper


def test_dry_ice_sublimation_temperature_from_clapeyron(table):
    # chemicals.Psub_Clapeyron from the CoolProp triple point with the table's
    # enthalpy: the temperature where the sublimation pressure is 1 atm lies
    # within 2 K of the table's -78.5 °C (constant-H_sub approximation).
    mw = chemicals.MW(CO2) / 1000.0
    t_tp, p_tp = PropsSI("Ttriple", "CO2"), PropsSI("ptriple", "CO2")
    h_mol = table.loc["dry_ice", "latent_heat"] * mw
    t1 = optimize.brentq(
        lambda t: chemicals.Psub_Clapeyron(t, t_tp, p_tp, h_mol) - constants.atm, 150, 216
    )
    assert t1 == pytest.approx(table.loc["dry_ice", "t_phase_change"], abs=2.0)


def test_dry_ice_gas_volume_caution_matches_coolprop(table):
    # The caution says "about 550 litres per kg at 20 °C and 1 atm"; CoolProp CO2 gives 544 L/kg.
    v = 1000.0 / PropsSI("D", "T", 293.15, "P", constants.atm, "CO2")
    assert "550 litres per kg" in table.loc["dry_ice", "cautions"]
    assert v == pytest.approx(550.0, rel=0.03)
    assert "UN 1845" in table.loc["dry_ice", "cautions"]
    assert "gas-tight" in table.loc["dry_ice", "cautions"]


def test_pcm_values_are_marked_demo_and_near_their_nominal_temperature(table):
    for cid, nominal in (("pcm_plus5", 278.15), ("pcm_plus20", 293.15)):
        row = table.loc[cid]
        assert abs(row["t_phase_change"] - nominal) <= 2.0
        for col in (
            "t_phase_change",
            "latent_heat",
            "density",
            "specific_heat_solid",
            "specific_heat_liquid",
        ):
            assert row[f"{col}_source_key"] == "demo"
        # common-practice plausibility band for PCM latent heats: 100-350 kJ/kg
        assert 100e3 < row["latent_heat"] < 350e3


def test_every_value_has_a_resolved_source(table):
    for col in ("t_phase_change", "latent_heat", "density", "cost"):
        assert table[f"{col}_source"].astype(str).str.len().gt(0).all()
    assert (table["cost_source_key"] == "demo").all()
    assert table.attrs["units"]["latent_heat"] == "J/kg"


def test_conditioning_notes_for_frozen_packs(table):
    for cid in ("water_ice", "gel_pack_water"):
        assert "condition" in table.loc[cid, "conditioning"].lower()
    assert "freeze" in table.loc["water_ice", "cautions"]


def test_unknown_coolant_lists_valid_ids():
    with pytest.raises(ValueError, match="valid: .*water_ice"):
        coolant("ice_cubes")


def test_columns_constant():
    assert COOLANT_COLUMNS[0] == "id" and "latent_heat_source" in COOLANT_COLUMNS


# --- specific heats of water ice and liquid water (defaults of the two-node model) ----------
# IAPWS R10-06(2009), Revised Release on the Equation of State 2006 for H2O Ice Ih
# (Feistel & Wagner, J. Phys. Chem. Ref. Data 35 (2006) 1021): Gibbs function
# g(T, p); c_p = -T d2g/dT2 needs only the complex terms r1, t1, r2(p), t2
# (release Eq. (1) and Table 2). The coefficients were typed from memory; the
# first assertion re-derives the release's own check values of c_p (Table 6,
# from memory: 2096.78431622 J/(kg·K) at the triple point, 2096.71391024 at
# 273.152519 K and 101.325 kPa, 866.333195517 at 100 K and 100 MPa), so a
# mistyped coefficient fails here rather than passing silently.
_TT, _PT, _P0 = 273.16, 611.657, 101325.0
_T1 = 0.368017112855051e-1 + 0.510878114959572e-1j
_R1 = 0.447050716285388e2 + 0.656876847463481e2j
_T2 = 0.337315741065416 + 0.335449415919309j
_R2 = (
    -0.725974574329220e2 - 0.781008427112870e2j,
    -0.557107698030123e-4 + 0.464578634580806e-4j,
    0.234801409215913e-10 - 0.285651142904972e-10j,
)


def _ice_cp(t, p=101325.0):
    tau, pi = t / _TT, (p - _P0) / _PT
    r2 = sum(c * pi**k for k, c in enumerate(_R2))
    s = sum(r * (1 / (tk - tau) + 1 / (tk + tau) - 2 / tk) for r, tk in ((_R1, _T1), (r2, _T2)))
    return -t * s.real / _TT


def test_ice_specific_heat_against_iapws_r10_06(table):
    assert _ice_cp(273.16, 611.657) == pytest.approx(2096.78431622, rel=1e-9)
    assert _ice_cp(273.152519, 101325.0) == pytest.approx(2096.71391024, rel=1e-9)
    assert _ice_cp(100.0, 1e8) == pytest.approx(866.333195517, rel=1e-9)
    # the table's value: the mean over -20 .. 0 °C at 1 atm (frozen packs from a freezer)
    mean = integrate.quad(_ice_cp, 253.15, 273.15)[0] / 20.0
    assert table.loc["water_ice", "specific_heat_solid"] == pytest.approx(mean, rel=1e-3)
    assert table.loc["water_ice", "specific_heat_solid_source_key"] == "iapws-r10-06"


def test_liquid_water_mean_specific_heat_against_coolprop_iapws95(table):
    # CoolProp (IAPWS-95 for water): mean c_p over 0.01 .. 30 °C at 1 atm as the
    # enthalpy difference over the temperature difference
    h = lambda t: PropsSI("H", "T", t, "P", 101325.0, "Water")  # noqa: E731
    mean = (h(303.15) - h(273.16)) / (303.15 - 273.16)
    assert table.loc["water_ice", "specific_heat_liquid"] == pytest.approx(mean, rel=1e-3)
    assert table.loc["water_ice", "specific_heat_liquid_source_key"] == "iapws-95"


def test_specific_heats_for_picks_the_matching_row(table):
    for cid in table.index:
        row = table.loc[cid]
        cs, cl = specific_heats_for(row["t_phase_change"], row["latent_heat"])
        assert (float(cs), float(cl)) == (row["specific_heat_solid"], row["specific_heat_liquid"])
    cs, cl = specific_heats_for([273.15, 194.65], [333550.0, 571000.0])
    assert cs.tolist() == [table.loc["water_ice", "specific_heat_solid"], 0.0]
    with pytest.raises(ValueError, match="latent_heat"):
        specific_heats_for(273.15, -1.0)
    with pytest.raises(TypeError, match="coolant_id"):
        coolant(None)
