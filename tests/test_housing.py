"""Checks of the enclosure heat balance against outside references.

Oracles: the Stefan–Boltzmann law with scipy.constants (CODATA 2018), the
free-convection correlations of the ``ht`` library with air properties from
CoolProp, scipy's brentq as an independent root finder, Fourier's law for the
wall, and limiting cases.
"""

from __future__ import annotations

import warnings

import CoolProp.CoolProp as CP
import numpy as np
import pytest
from ht.conv_free_immersed import Nu_horizontal_plate_McAdams, Nu_vertical_plate_Churchill
from hypothesis import given, settings
from hypothesis import strategies as st
from numpy.testing import assert_allclose
from scipy import constants, optimize

from workbench._checks import ValidityWarning
from workbench.housing import MOUNTINGS, enclosure_faces, hot_spot, solve_housing
from workbench.surfaces import natural_convection_coefficient

SIGMA = constants.Stefan_Boltzmann  # CODATA 2018 via scipy.constants
BOX = dict(length=0.2, width=0.12, height=0.06)


def solve(**kw):
    args = dict(
        BOX,
        wall_thickness=0.002,
        k=167.0,
        emissivity=0.85,
        power=5.0,
        t_ambient=298.15,
        mounting="on-table",
    )
    args.update(kw)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        return solve_housing(**args)


def air(t):
    """Air properties at 1 atm from CoolProp: k, ν, Pr."""
    k = CP.PropsSI("L", "T", t, "P", 101325.0, "Air")
    mu = CP.PropsSI("V", "T", t, "P", 101325.0, "Air")
    rho = CP.PropsSI("D", "T", t, "P", 101325.0, "Air")
    pr = CP.PropsSI("Prandtl", "T", t, "P", 101325.0, "Air")
    return k, mu / rho, pr


def grashof(ts, ta, length):
    tf = 0.5 * (ts + ta)
    k, nu, pr = air(tf)
    gr = constants.g * (1 / tf) * abs(ts - ta) * length**3 / nu**2
    return gr, pr, k


# ---------------------------------------------------------------------------
# Radiation and convection against outside references
# ---------------------------------------------------------------------------


def test_radiation_power_is_stefan_boltzmann_law():
    # Incropera 7th ed. Eq. 1.7 (from memory): q = ε σ A (Ts⁴ − Tsur⁴) for a
    # small surface in large surroundings.
    s = solve()
    expected = 0.85 * SIGMA * s.exchange_area * (s.t_surface**4 - 298.15**4)
    assert_allclose(s.radiation_power, expected, rtol=1e-10)


def test_vertical_faces_match_churchill_chu_of_ht_with_coolprop_air():
    # Churchill & Chu (1975), full-range vertical plate, as implemented by the
    # ht library; properties from CoolProp at the film temperature.
    s = solve()
    i = s.face_names.index("front")
    gr, pr, k = grashof(s.t_surface, 298.15, BOX["height"])
    h_ref = Nu_vertical_plate_Churchill(pr, gr) * k / BOX["height"]
    assert_allclose(s.face_convection_coefficients[i], h_ref, rtol=0.02)


def test_top_face_matches_mcadams_hot_side_up():
    # McAdams (1954) / Lloyd & Moran (1974) hot surface facing up,
    # Nu = 0.54 Ra^(1/4) for 1e4 < Ra < 1e7, as implemented by ht.
    s = solve()
    i = s.face_names.index("top")
    el = BOX["length"] * BOX["width"] / (2 * (BOX["length"] + BOX["width"]))
    gr, pr, k = grashof(s.t_surface, 298.15, el)
    assert 1e4 < gr * pr < 1e7
    h_ref = Nu_horizontal_plate_McAdams(pr, gr, buoyancy=True) * k / el
    assert_allclose(s.face_convection_coefficients[i], h_ref, rtol=0.02)


def test_bottom_face_correlations_agree_with_each_other():
    # Hot surface facing down: Incropera 7th ed. Eq. 9.32 (0.52 Ra^(1/5), used
    # here) against McAdams' 0.27 Ra^(1/4) (as implemented by ht). Two
    # published correlations for the stable side; they agree within 25 % for
    # 1e4 <= Ra <= 1e8 (comparison of correlations, not a property of either).
    for ts in (305.0, 320.0, 340.0):
        for el in (0.03, 0.1):
            gr, pr, k = grashof(ts, 298.15, el)
            if not 1e4 <= gr * pr <= 1e8:
                continue
            ours = natural_convection_coefficient(ts, 298.15, el, "horizontal-down")
            ref = Nu_horizontal_plate_McAdams(pr, gr, buoyancy=False) * k / el
            assert abs(ours / ref - 1) < 0.25


# ---------------------------------------------------------------------------
# Energy balance and an independent solve
# ---------------------------------------------------------------------------


@settings(max_examples=25, deadline=None)
@given(
    power=st.floats(0.5, 40.0),
    emissivity=st.floats(0.0, 1.0),
    k=st.floats(0.15, 400.0),
    mounting=st.sampled_from(sorted(MOUNTINGS)),
)
def test_energy_balance_closes_at_the_solution(power, emissivity, k, mounting):
    s = solve(power=power, emissivity=emissivity, k=k, mounting=mounting)
    # re-evaluate the heat leaving, face by face, with the surfaces module and
    # the Stefan–Boltzmann law (scipy.constants)
    faces = enclosure_faces(BOX["length"], BOX["width"], BOX["height"], 0.002, mounting)
    conv = 0.0
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        for a, el, o in zip(
            faces.area_outside, faces.length_outside, faces.orientation_outside, strict=True
        ):
            conv += (
                a
                * natural_convection_coefficient(s.t_surface, 298.15, el, o)
                * (s.t_surface - 298.15)
            )
    rad = emissivity * SIGMA * faces.area_outside.sum() * (s.t_surface**4 - 298.15**4)
    assert_allclose(conv + rad, power, rtol=1e-5)
    assert_allclose(s.convection_power + s.radiation_power, power, rtol=1e-5)
    assert_allclose(np.sum(s.face_power), power, rtol=1e-5)


def test_vectorised_bisection_matches_scipy_brentq():
    emiss = np.array([0.05, 0.5, 0.9])
    s = solve(emissivity=emiss, mounting="free-standing")
    faces = enclosure_faces(BOX["length"], BOX["width"], BOX["height"], 0.002, "free-standing")
    for i, e in enumerate(emiss):

        def residual(ts, e=e):
            q = 0.0
            for a, el, o in zip(
                faces.area_outside, faces.length_outside, faces.orientation_outside, strict=True
            ):
                q += a * natural_convection_coefficient(ts, 298.15, el, o) * (ts - 298.15)
            return q + e * SIGMA * faces.area_outside.sum() * (ts**4 - 298.15**4) - 5.0

        with warnings.catch_warnings():
            warnings.simplefilter("ignore", ValidityWarning)
            ref = optimize.brentq(residual, 298.15, 500.0, xtol=1e-10)
        assert_allclose(s.t_surface[i], ref, atol=1e-5)


def test_wall_drop_is_fouriers_law_through_the_mean_area():
    # Fourier's law (Incropera 7th ed. Eq. 1.2): ΔT = P t / (k A_m), with
    # A_m the geometric mean of outer and inner face areas summed.
    t, k = 0.003, 0.2
    s = solve(wall_thickness=t, k=k, mounting="wall-mounted")
    L, W, H = BOX["length"], BOX["width"], BOX["height"]
    li, wi, hi = L - 2 * t, W - 2 * t, H - 2 * t
    # wall-mounted: top, bottom, front, left, right exchange
    a_mean = 2 * np.sqrt(L * W * li * wi) + np.sqrt(L * H * li * hi) + 2 * np.sqrt(W * H * wi * hi)
    assert_allclose(s.t_wall_inside - s.t_surface, 5.0 * t / (k * a_mean), rtol=1e-12)


def test_user_inside_coefficient():
    s = solve(h_inside=4.0)
    assert_allclose(s.t_air_inside - s.t_wall_inside, 5.0 / (4.0 * s.area_inside), rtol=1e-12)


def test_exchange_areas_by_mounting():
    L, W, H = BOX["length"], BOX["width"], BOX["height"]
    full = 2 * (L * W + L * H + W * H)
    assert_allclose(solve(mounting="free-standing").exchange_area, full)
    assert_allclose(solve(mounting="on-table").exchange_area, full - L * W)
    assert_allclose(solve(mounting="wall-mounted").exchange_area, full - L * H)
    # less exchanging area, hotter surface
    assert solve(mounting="on-table").t_surface > solve(mounting="free-standing").t_surface


def test_plausible_combined_coefficient():
    # common-practice: a small sealed enclosure in still room air with a
    # high-emissivity finish sheds about 8–14 W/(m²·K) (convection ~4–7,
    # radiation ~5–7 near room temperature).
    s = solve(emissivity=0.9)
    assert 8.0 < s.h_outside < 14.0
    assert 4.0 < s.h_radiation < 7.5


# ---------------------------------------------------------------------------
# Limiting cases
# ---------------------------------------------------------------------------


def test_zero_emissivity_leaves_convection_only():
    s0 = solve(emissivity=0.0)
    assert s0.radiation_power == 0.0 and s0.h_radiation == 0.0
    assert_allclose(s0.convection_power, 5.0, rtol=1e-6)
    assert s0.t_surface > solve(emissivity=0.9).t_surface + 5.0


def test_infinite_conductivity_gives_a_uniform_wall():
    s = solve(k=1e12)
    assert abs(s.t_wall_inside - s.t_surface) < 1e-9
    hs = hot_spot(s, 0.03 * 0.03, 2.0)
    assert hs.rise < 1e-6


def test_thin_wall_conductivity_barely_matters_for_mean_temperatures():
    s = solve(k=np.array([0.17, 3.0, 167.0]), wall_thickness=0.002)
    # the outer balance does not depend on k at all
    assert np.ptp(s.t_surface) < 1e-9
    # the inside air moves by the wall drop only: P t/(k A) ≈ 1 K for ABS here
    assert np.ptp(s.t_air_inside) < 2.0
    # ... while the hot spot under a 1 W, 30 mm × 30 mm component does not
    hs = hot_spot(s, 0.03 * 0.03, 1.0)
    assert hs.rise[0] > 30 * hs.rise[2]
    assert hs.spreading_length[0] < hs.source_radius[0] < hs.spreading_length[2]


def test_no_power_no_rise():
    s = solve(power=0.0)
    assert_allclose([s.t_surface, s.t_wall_inside, s.t_air_inside], 298.15, atol=1e-5)


def test_broadcasts_over_candidate_grid():
    s = solve(k=np.array([0.2, 167.0])[:, None], emissivity=np.array([0.1, 0.5, 0.9])[None, :])
    assert np.shape(s.t_surface) == (2, 3)
    assert np.all(np.diff(s.t_surface, axis=1) < 0)  # more emissive, cooler


# ---------------------------------------------------------------------------
# Errors
# ---------------------------------------------------------------------------


def test_non_convergence_is_an_error_naming_candidates():
    with pytest.raises(RuntimeError, match=r"candidates \[0, 1\]"):
        solve(emissivity=[0.1, 0.9], max_iterations=2)


def test_unbounded_balance_is_an_error_not_a_number():
    # 1 GW in a 100 mm cube has no physical steady state within the model's range
    with pytest.raises(ValueError, match=r"no solution.*candidates \[1\]"):
        solve(emissivity=0.9, power=[5.0, 1e9])


def test_validity_warning_outside_correlation_range():
    # a tiny box with a small ΔT: Rayleigh numbers below the stated ranges
    with pytest.warns(ValidityWarning):
        solve_housing(0.02, 0.02, 0.01, 0.001, 167.0, 0.9, 0.01, 298.15)


@pytest.mark.parametrize(
    "kwargs, field",
    [
        (dict(wall_thickness=-0.001), "wall_thickness"),
        (dict(wall_thickness=0.05), "wall_thickness"),
        (dict(k=0.0), "k"),
        (dict(emissivity=1.2), "emissivity"),
        (dict(power=float("nan")), "power"),
        (dict(power=-1.0), "power"),
        (dict(t_ambient=float("inf")), "t_ambient"),
        (dict(mounting="ceiling"), "mounting.*free-standing"),
        (dict(length=0.0), "length"),
        (dict(h_inside=-3.0), "h_inside"),
        (dict(k=[1.0, 2.0], emissivity=[0.1, 0.2, 0.3]), "shapes"),
    ],
)
def test_bad_inputs_name_the_field(kwargs, field):
    with pytest.raises(ValueError, match=field):
        solve(**kwargs)


def test_hot_spot_bad_inputs():
    s = solve()
    with pytest.raises(ValueError, match="source_power"):
        hot_spot(s, 0.001, 6.0)
    with pytest.raises(ValueError, match="source_area"):
        hot_spot(s, 1.0, 1.0)
    with pytest.raises(ValueError, match="source_area"):
        hot_spot(s, -0.001, 1.0)


def test_extra_layers_add_in_series():
    # Fourier's law for layers in series (Incropera 7th ed. Eq. 3.19, from
    # memory): a gap pad or liner of R = 0.01 m²K/W adds P·R/A_m to the wall drop.
    base = solve(k=200.0, wall_thickness=0.002)
    lined = solve(k=200.0, wall_thickness=0.002, extra_resistance=0.01)
    faces = enclosure_faces(BOX["length"], BOX["width"], BOX["height"], 0.002, "on-table")
    a_mean = np.sqrt(faces.area_outside * faces.area_inside).sum()
    assert_allclose(lined.t_surface, base.t_surface, atol=1e-9)
    assert_allclose(
        (lined.t_wall_inside - lined.t_surface) - (base.t_wall_inside - base.t_surface),
        5.0 * 0.01 / a_mean,
        rtol=1e-9,
    )


def test_inner_faces_face_the_other_way():
    # the inside of the lid faces down, the inside of the floor faces up
    f = enclosure_faces(0.2, 0.1, 0.05, 0.002, "free-standing")
    top, bottom = f.names.index("top"), f.names.index("bottom")
    assert f.orientation_outside[top] == "horizontal-up"
    assert f.orientation_inside[top] == "horizontal-down"
    assert f.orientation_inside[bottom] == "horizontal-up"
    # A/P of the lid (Incropera 7th ed. §9.6.3, from memory)
    assert_allclose(f.length_outside[top], 0.2 * 0.1 / (2 * (0.2 + 0.1)))
    assert_allclose(f.length_inside[top], 0.196 * 0.096 / (2 * (0.196 + 0.096)))


def test_root_search_keeps_a_bracket_and_converges_superlinearly():
    # increasing residuals with known roots (common-practice check: x³ = 8 -> 2; e^x = 50 -> ln 50);
    # bisection from a 1 K start bracket needs about log2(width/tol) = 27 halvings here
    from workbench.housing import _bisect

    root, it = _bisect(lambda x: x**3 - 8.0, np.array([0.0, 0.0]), 1.0, 1e-6, 200, "test")
    assert root == pytest.approx([2.0, 2.0], abs=1e-6)
    assert it <= 15
    root, _ = _bisect(lambda x: np.exp(x) - 50.0, np.array([0.0]), 1.0, 1e-9, 200, "test")
    assert root == pytest.approx([np.log(50.0)], abs=1e-9)
    with pytest.raises(ValueError, match="no solution within"):
        _bisect(lambda x: -np.ones_like(x), np.array([0.0]), 1.0, 1e-6, 50, "test", max_rise=10.0)
