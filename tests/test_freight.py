"""Box size, billable mass and landed cost.

Dimensional (volumetric) weight = L x W x H / divisor with the larger of
actual and dimensional mass billed is common carrier practice; divisors of
5000 and 6000 cm³/kg are the usual parcel values (common practice, per
contract). Geometry checks are computed independently here.
"""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from workbench.freight import (
    billable_mass,
    coolant_layer_thickness,
    landed_cost,
    outer_dimensions,
    round_up_mass,
    shell_volume,
    wall_mass,
)


def test_dimensional_weight_example_6000():
    # 30 x 45 x 65 cm = 87 750 cm³; / 6000 cm³/kg = 14.625 kg (common carrier practice)
    assert billable_mass(0.30, 0.45, 0.65, 5.0, 0.006) == pytest.approx(14.625, rel=1e-12)


def test_dimensional_weight_example_5000():
    # the same box at 5000 cm³/kg: 87 750 / 5000 = 17.55 kg
    assert billable_mass(0.30, 0.45, 0.65, 5.0, 0.005) == pytest.approx(17.55, rel=1e-12)


def test_actual_mass_wins_when_heavier():
    assert billable_mass(0.30, 0.45, 0.65, 20.0, 0.006) == 20.0


def test_billable_broadcasts_over_sweeps():
    out = billable_mass(np.array([0.3, 0.4]), 0.45, 0.65, np.array([[5.0], [30.0]]), 0.006)
    np.testing.assert_allclose(out, [[14.625, 19.5], [30.0, 30.0]])


def test_rounding_rules():
    # round up to the next 0.5 kg or 1 kg (common carrier practice, per contract)
    assert round_up_mass(14.625, 0.5) == 15.0
    assert round_up_mass(14.625, 1.0) == 15.0
    assert round_up_mass(14.1, 0.5) == 14.5
    assert round_up_mass(14.5, 0.5) == 14.5
    assert round_up_mass(0.0, 1.0) == 0.0


def test_shell_volume_and_inverse():
    # (0.4 x 0.3 x 0.2) - (0.3 x 0.2 x 0.1) = 0.018 m³
    assert shell_volume(0.3, 0.2, 0.1, 0.05) == pytest.approx(0.018, rel=1e-12)
    assert coolant_layer_thickness(0.3, 0.2, 0.1, 0.018) == pytest.approx(0.05, rel=1e-9)
    assert coolant_layer_thickness(0.3, 0.2, 0.1, 0.0) == 0.0


@settings(max_examples=50, deadline=None)
@given(
    a=st.floats(0.05, 1.0), b=st.floats(0.05, 1.0), c=st.floats(0.05, 1.0), t=st.floats(0.0, 0.2)
)
def test_coolant_layer_inverts_shell_volume(a, b, c, t):
    v = shell_volume(a, b, c, t)
    assert coolant_layer_thickness(a, b, c, v) == pytest.approx(t, abs=1e-9)


def test_outer_dimensions():
    np.testing.assert_allclose(outer_dimensions(0.3, 0.2, 0.1, 0.02, 0.05), [0.44, 0.34, 0.24])


def test_wall_mass_nested_layers():
    # two layers of the same density weigh as one layer of the summed thickness
    two = wall_mass(0.3, 0.2, 0.1, [0.02, 0.03], [30.0, 30.0])
    one = wall_mass(0.3, 0.2, 0.1, [0.05], [30.0])
    assert two == pytest.approx(one, rel=1e-12)
    # outer carton: shell from 0.4 x 0.3 x 0.2 to 0.408 x 0.308 x 0.208, 140 kg/m³
    carton = 140.0 * (0.408 * 0.308 * 0.208 - 0.4 * 0.3 * 0.2)
    assert wall_mass(0.3, 0.2, 0.1, [0.05, 0.004], [0.0, 140.0]) == pytest.approx(carton, rel=1e-12)


def test_landed_cost():
    assert landed_cost(6.0, 1.5, 15.0, 1.2, 4.0) == pytest.approx(29.5)


@pytest.mark.parametrize(
    ("call", "field"),
    [
        (lambda: billable_mass(0.3, 0.45, 0.65, -1.0, 0.006), "actual_mass"),
        (lambda: billable_mass(0.3, 0.45, 0.65, 1.0, 0.0), "divisor"),
        (lambda: billable_mass(-0.3, 0.45, 0.65, 1.0, 0.006), "length"),
        (lambda: round_up_mass(1.0, 0.0), "increment"),
        (lambda: coolant_layer_thickness(0.3, 0.2, 0.1, -1.0), "coolant_volume"),
        (lambda: landed_cost(1.0, 1.0, 1.0, -1.0), "rate_per_kg"),
        (lambda: billable_mass(np.ones(2), np.ones(3), 0.65, 1.0, 0.006), "broadcast"),
    ],
)
def test_bad_inputs_name_the_field(call, field):
    with pytest.raises(ValueError, match=field):
        call()
