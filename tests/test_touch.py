"""Touch limits: the shipped defaults against ISO 13732-1:2006, lookups and user limits."""

from __future__ import annotations

import numpy as np
import pytest

from workbench.touch import (
    MATERIAL_CLASSES,
    TOUCH_CAUTION,
    TouchLimit,
    TouchLimits,
    load_touch_limits,
    touch_class,
    touch_limit,
    touch_margin,
)

# ISO 13732-1:2006, Table 2 — burn thresholds for long contact periods
# (from memory, the standard could not be opened here) [°C]:
#   1 min:  uncoated metal 51, coated metal 51, ceramics/glass/stone 56,
#           plastics 60, wood 60
#   10 min: 48 for all materials
#   8 h and longer: 43 for all materials
ISO_13732_1_TABLE_2 = {
    ("metal-uncoated", 60): 51.0,
    ("metal-coated", 60): 51.0,
    ("ceramic-glass-stone", 60): 56.0,
    ("plastic", 60): 60.0,
    ("wood", 60): 60.0,
    **{(c, 600): 48.0 for c in MATERIAL_CLASSES},
    **{(c, 8 * 3600): 43.0 for c in MATERIAL_CLASSES},
}


# ISO 13732-1:2006, short-contact burn-threshold bands (its figures for uncoated metal,
# ceramics/glass/stone, plastics and wood), read as the lower edge of each band at 1 s and
# 10 s (recalled from memory, not re-read) [°C]; coated metals take the uncoated values.
ISO_13732_1_SHORT = {
    ("metal-uncoated", 1): 65.0, ("metal-uncoated", 10): 55.0,
    ("metal-coated", 1): 65.0, ("metal-coated", 10): 55.0,
    ("ceramic-glass-stone", 1): 80.0, ("ceramic-glass-stone", 10): 66.0,
    ("plastic", 1): 85.0, ("plastic", 10): 71.0,
    ("wood", 1): 110.0, ("wood", 10): 89.0,
}


def test_shipped_defaults_equal_iso_13732_1_table_2_and_short_contact_bands():
    lim = load_touch_limits()
    shipped = {(r.material_class, int(r.contact_duration)): r.limit - 273.15 for r in lim.rows}
    expected = {**ISO_13732_1_TABLE_2, **ISO_13732_1_SHORT}
    assert set(shipped) == set(expected)
    for key, value in expected.items():
        assert shipped[key] == pytest.approx(value, abs=1e-9), key
    sources = {(r.material_class, int(r.contact_duration)): r.source for r in lim.rows}
    assert all(sources[k] == "iso13732-1-2006-t2-mem" for k in ISO_13732_1_TABLE_2)
    assert all(sources[k] == "iso13732-1-2006-fig-mem" for k in ISO_13732_1_SHORT)


def test_short_contacts_interpolate_in_log_time_and_fall_with_duration():
    # between 1 s and 10 s the standard's threshold curves are read on a log time axis
    lim = load_touch_limits()
    for cls in MATERIAL_CLASSES:
        at_1, at_10 = lim.limit(cls, 1.0), lim.limit(cls, 10.0)
        mid = lim.limit(cls, np.sqrt(10.0))
        assert mid == pytest.approx(0.5 * (at_1 + at_10), abs=1e-9)
        durations = [1.0, 2.0, 5.0, 10.0, 30.0, 60.0, 300.0, 600.0, 3600.0, 8 * 3600.0]
        limits = [touch_limit(cls, d) for d in durations]
        assert all(b <= a for a, b in zip(limits, limits[1:], strict=False)), cls
    # a tap on a metal surface tolerates more than a grab, which tolerates more than 1 min
    assert touch_limit("metal-uncoated", 1.0) > touch_limit("metal-uncoated", 10.0) > \
        touch_limit("metal-uncoated", 60.0)


def test_between_durations_the_longer_lower_limit_applies():
    lim = load_touch_limits()
    # 5 min lies between 1 min (51 °C) and 10 min (48 °C) for coated metal:
    # the conservative (lower) 10-min value is used.
    assert lim.limit("metal-coated", 300.0) == pytest.approx(48.0 + 273.15)
    assert lim.limit("plastic", 60.0) == pytest.approx(60.0 + 273.15)
    # 8 h and longer: 43 °C
    assert lim.limit("wood", 24 * 3600.0) == pytest.approx(43.0 + 273.15)
    assert touch_limit("ceramic-glass-stone", 60.0) == pytest.approx(56.0 + 273.15)


def test_contact_outside_1_s_to_8_h_is_refused():
    for d in (0.5, 9 * 3600.0):
        with pytest.raises(ValueError, match="contact_duration.*1 s to 8 h"):
            touch_limit("metal-uncoated", d)
    with pytest.raises(ValueError, match="contact_duration"):
        load_touch_limits().limit("metal-uncoated", 0.5)  # shorter than any tabulated row


def test_unknown_class_lists_valid_names():
    with pytest.raises(ValueError, match="material_class.*plastic"):
        load_touch_limits().limit("rubber", 60.0)


def test_product_standard_limit_entered_by_the_user(tmp_path):
    # A user enters a (hypothetical, demo) product-standard limit for plastic
    # enclosures touched for 10 min: 70 °C, and a 1 s limit for metal handles.
    lim = load_touch_limits().with_limit(
        "plastic", 600.0, 70.0 + 273.15, "demo product standard, clause X"
    )
    assert lim.limit("plastic", 600.0) == pytest.approx(343.15)
    assert lim.limit("metal-coated", 600.0) == pytest.approx(321.15)  # untouched
    f = tmp_path / "limits.csv"
    f.write_text(
        "material_class,contact_duration,limit,source,note\n"
        "metal-uncoated,1,65,demo,short touch\n"
        "plastic,600,70,demo,\n"
    )
    merged = load_touch_limits(f)
    assert merged.limit("metal-uncoated", 1.0) == pytest.approx(338.15)
    assert merged.limit("plastic", 600.0) == pytest.approx(343.15)
    assert merged.limit("wood", 600.0) == pytest.approx(321.15)
    alone = load_touch_limits(f, replace=True)
    assert alone.classes() == ("metal-uncoated", "plastic")


def test_bad_user_file_names_line_and_field(tmp_path):
    f = tmp_path / "bad.csv"
    f.write_text("material_class,contact_duration,limit,source\nplastic,-60,60,demo\n")
    with pytest.raises(ValueError, match=r"bad.csv:2: contact_duration"):
        load_touch_limits(f)
    g = tmp_path / "nosource.csv"
    g.write_text("material_class,contact_duration,limit,source\nplastic,60,60,\n")
    with pytest.raises(ValueError, match="source"):
        load_touch_limits(g)
    h = tmp_path / "cols.csv"
    h.write_text("class,duration,limit,source\n")
    with pytest.raises(ValueError, match="columns"):
        load_touch_limits(h)


def test_duplicate_rows_rejected():
    row = TouchLimit("plastic", 60.0, 333.15, "demo")
    with pytest.raises(ValueError, match="duplicate"):
        TouchLimits((row, row))


def test_touch_class_mapping():
    assert touch_class("metal") == "metal-uncoated"
    assert touch_class("metal", coated=True) == "metal-coated"
    assert touch_class("polymer", coated=True) == "plastic"
    assert touch_class("glass_ceramic") == "ceramic-glass-stone"
    assert touch_class("wood_panel") == "wood"
    with pytest.raises(ValueError, match="family.*metal"):
        touch_class("rigid_foam")


def test_margin_sign_and_broadcast():
    m = touch_margin(np.array([318.15, 330.15]), 321.15)
    np.testing.assert_allclose(m, [3.0, -9.0])
    with pytest.raises(ValueError, match="t_surface"):
        touch_margin(float("nan"), 321.15)


def test_caution_defers_to_product_standard_and_testing():
    text = TOUCH_CAUTION.lower()
    assert "product" in text and "standard" in text and "testing" in text
