"""Logger CSV reader: a hand-made file, unit conversions against NIST SP 811, and every refusal.

Outside references:
- NIST Special Publication 811 (2008 edition), Guide for the Use of the
  International System of Units, Appendix B.8 (hour: 1 h = 3600 s exactly)
  and B.9 (temperature: T/K = (t/°F + 459.67)/1.8, and t/°C = T/K − 273.15).
  The expected values below are computed from these formulas, not by pint.
- ISO 8601 timestamps with UTC offsets: elapsed seconds worked by hand.
"""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np
import pytest

import workbench as wb
from workbench.logger import DEFAULT_MAX_GAP, load_ambient_profile

EXAMPLES = Path(__file__).resolve().parents[1] / "examples"


def _file(tmp_path, text: str, name: str = "log.csv") -> Path:
    p = tmp_path / name
    p.write_text(text, encoding="utf-8")
    return p


def _nist_f_to_k(t_f):
    # NIST SP 811 (2008), Appendix B.9: T/K = (t/°F + 459.67)/1.8
    return (np.asarray(t_f, float) + 459.67) / 1.8


def test_hand_made_file_hours_and_fahrenheit(tmp_path):
    p = _file(
        tmp_path,
        "# hand-made test file\nelapsed [h],temperature [°F]\n0,68\n0.25,77.9\n1.5,95\n\n2,32\n",
    )
    times, temps = load_ambient_profile(p)
    # NIST SP 811 (2008), Appendix B.8: 1 h = 3600 s exactly
    np.testing.assert_array_equal(times, np.array([0.0, 0.25, 1.5, 2.0]) * 3600.0)
    np.testing.assert_allclose(temps, _nist_f_to_k([68, 77.9, 95, 32]), rtol=0, atol=1e-9)
    # 68 °F is 20 °C and 32 °F is 0 °C (NIST SP 811, B.9)
    assert temps[0] - 273.15 == pytest.approx(20.0, abs=1e-9)
    assert temps[3] - 273.15 == pytest.approx(0.0, abs=1e-9)


def test_public_name_and_minutes_celsius(tmp_path):
    p = _file(tmp_path, "elapsed [min],temperature [°C]\n0,5\n15,6.5\n30,-2\n")
    times, temps = wb.load_ambient_profile(p)
    np.testing.assert_array_equal(times, [0.0, 900.0, 1800.0])
    np.testing.assert_allclose(temps, [278.15, 279.65, 271.15])


def test_timestamps_with_offsets_to_elapsed_seconds(tmp_path):
    # 06:00+02:00 is 04:00 UTC; 05:30Z is 1.5 h later; 08:00+02:00 is 2 h after the first
    p = _file(
        tmp_path,
        "timestamp,temperature [K]\n2026-07-14T06:00:00+02:00,300\n2026-07-14T05:30:00Z,301\n"
        "2026-07-14T08:00:00+02:00,299.5\n",
    )
    times, temps = load_ambient_profile(p)
    np.testing.assert_array_equal(times, [0.0, 5400.0, 7200.0])
    np.testing.assert_array_equal(temps, [300.0, 301.0, 299.5])


def test_extra_columns_only_when_named(tmp_path):
    text = "elapsed [h],temperature [°C],humidity [%]\n0,20,40\n1,21,41\n"
    p = _file(tmp_path, text)
    with pytest.raises(ValueError, match=r"log\.csv:1:3: humidity: unknown column"):
        load_ambient_profile(p)
    times, _ = load_ambient_profile(p, ignore_columns=("humidity",))
    assert times[-1] == 3600.0


@pytest.mark.parametrize(
    "text, where, what",
    [
        ("elapsed,temperature [°C]\n0,20\n", ":1:1: elapsed", "missing unit"),
        ("elapsed [h],temperature\n0,20\n", ":1:2: temperature", "missing unit"),
        ("elapsed [h],temperature [°C]\n0,20\n1,warm\n", ":3:2: temperature", "not a finite number"),
        ("elapsed [h],temperature [°C]\n0,20\nx,21\n", ":3:1: elapsed", "not a finite number"),
        ("elapsed [h],temperature [°C]\n0,20\n1,21\n1,22\n", ":4:1: elapsed", "repeats"),
        ("elapsed [h],temperature [°C]\n0,20\n1,21\n0.5,22\n", ":4:1: elapsed", "is earlier than"),
        ("elapsed [h],temperature [°C]\n0,20\n1,21\n4,22\n", ":4:1: elapsed", "max_gap"),
        ("elapsed [h],temperature [°C]\n0.5,20\n1,21\n", ":2:1: elapsed", "first reading must be at 0"),
        ("elapsed [h],temperature [°C]\n0,20\n1,210\n", ":3:2: temperature", "outside"),
        ("elapsed [°C],temperature [°C]\n0,20\n", ":1:1: elapsed", "dimension"),
        ("elapsed [h],temperature [°C]\n0,20\n1\n", ":3:2", "1 cells"),
        (
            "timestamp,temperature [°C]\n2026-01-01T00:00:00+01:00,1\n2026-01-01T00:15:00,2\n",
            ":3:1: timestamp",
            "UTC offset",
        ),
        ("timestamp,temperature [°C]\n2026-01-01T00:00,1\nyesterday,2\n", ":3:1: timestamp", "ISO 8601"),
        ("# only a comment\n", ":1:1", "empty file"),
        ("elapsed [h],temperature [°C]\n", ":1:1", "no readings"),
    ],
)
def test_refusals_name_file_line_column(tmp_path, text, where, what):
    p = _file(tmp_path, text)
    with pytest.raises(ValueError) as err:
        load_ambient_profile(p)
    msg = str(err.value)
    assert msg.startswith(str(p) + where), msg
    assert what in msg, msg


def test_gap_limit_is_a_keyword_with_a_stated_default(tmp_path):
    assert DEFAULT_MAX_GAP == 7200.0
    p = _file(tmp_path, "elapsed [h],temperature [°C]\n0,20\n3,21\n")
    with pytest.raises(ValueError, match="max_gap"):
        load_ambient_profile(p)
    assert load_ambient_profile(p, max_gap=4 * 3600.0)[0][-1] == 10800.0
    assert load_ambient_profile(p, max_gap=math.inf)[0][-1] == 10800.0
    with pytest.raises(ValueError, match="max_gap"):
        load_ambient_profile(p, max_gap=0)


def test_missing_file(tmp_path):
    with pytest.raises(ValueError, match="file not found"):
        load_ambient_profile(tmp_path / "nope.csv")


@pytest.mark.parametrize("name", ["route_summer_demo.csv", "route_winter_demo.csv"])
def test_demo_files_load_and_are_labelled_demo(name):
    path = EXAMPLES / name
    first = path.read_text(encoding="utf-8").splitlines()[0]
    assert first.startswith("#") and "DEMO DATA (invented)" in first
    times, temps = load_ambient_profile(path)
    assert times[0] == 0.0 and np.all(np.diff(times) > 0)
    assert times[-1] >= 48 * 3600.0
    wb.transient.ambient_profile((times, temps))
