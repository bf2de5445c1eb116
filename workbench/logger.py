"""Ambient temperature profiles from a temperature logger's CSV export.

:func:`load_ambient_profile` reads a CSV of elapsed time or ISO 8601
timestamps plus temperature, with the units in the headers in the same style
as a user materials file (``tables/README.md``)::

    # demo logger export (invented)
    elapsed [h],temperature [°F]
    0,71.6
    0.25,72.5
    ...

or::

    timestamp,temperature [°C]
    2026-07-14T06:00:00+02:00,22.5
    2026-07-14T06:15:00+02:00,23.1

Blank lines and lines starting with ``#`` are skipped. Units are read by
:func:`workbench.units.to_si` (the only pint user). Nothing is sorted, merged
or filled silently: a missing unit, a cell that is not a number or not a
timestamp, a repeated or backwards time and a gap longer than ``max_gap``
each raise ``ValueError`` naming ``file:line:column``.

A logger records readings at instants; the profile returned is the step
(zero-order hold) profile of :func:`workbench.transient.ambient_profile`:
each reading holds until the next one, the last one for ever.
"""

from __future__ import annotations

import math
import re
from datetime import datetime
from pathlib import Path

import numpy as np

from workbench import transient
from workbench._csvtext import CsvSyntaxError, csv_rows

__all__ = ["load_ambient_profile", "DEFAULT_MAX_GAP", "TIME_COLUMNS", "TEMPERATURE_COLUMN"]

#: Longest allowed time between two readings, 2 h (common practice: loggers
#: record every 1–15 min; a longer gap usually means a lost stretch). [s]
DEFAULT_MAX_GAP = 7200.0
#: Accepted time columns: elapsed time with a unit, or ISO 8601 timestamps (no unit).
TIME_COLUMNS = ("elapsed", "timestamp")
#: The temperature column (with a unit).
TEMPERATURE_COLUMN = "temperature"

_HEADER = re.compile(r"^\s*([A-Za-z_][A-Za-z0-9_ ]*?)\s*(?:\[(.*)\])?\s*$")


def _where(path: str, line: int, col: int, name: str) -> str:
    return f"{path}:{line}:{col}: {name}"


def _read_rows(path: Path) -> tuple[str, int, list[str], list[tuple[int, list[str]]]]:
    name = str(path)
    try:
        text = Path(path).read_text(encoding="utf-8-sig")
    except FileNotFoundError:
        raise ValueError(f"{name}:0:0: file not found") from None
    except (OSError, UnicodeDecodeError) as exc:
        raise ValueError(f"{name}:0:0: cannot read the file as UTF-8 text ({exc})") from None
    try:
        header, header_line, rows = csv_rows(text)
    except CsvSyntaxError as exc:
        raise ValueError(f"{name}:{exc.line}:1: {exc}") from None
    if header is None:
        raise ValueError(
            f"{name}:1:1: empty file: expected a header such as 'elapsed [h],temperature [°C]'"
        )
    return name, header_line, header, rows


def _timestamp(text: str) -> datetime:
    # Python 3.11 reads ISO 8601 with 'T' or ' ', fractions and offsets (also 'Z')
    return datetime.fromisoformat(text)


def load_ambient_profile(
    path: str | Path,
    max_gap: float = DEFAULT_MAX_GAP,
    ignore_columns: tuple[str, ...] = (),
) -> tuple[np.ndarray, np.ndarray]:
    """Read a logger CSV into an ambient step profile.

    Parameters
    ----------
    path : str or Path
        CSV file. Header: one time column, ``elapsed [unit]`` (any time unit:
        ``s``, ``min``, ``h``, ``d``) or ``timestamp`` (ISO 8601, e.g.
        ``2026-07-14T06:00:00+02:00``; all with a UTC offset or all without),
        and ``temperature [unit]`` (``°C``, ``°F``, ``K``).
    max_gap : float
        Longest allowed time between consecutive readings, default
        :data:`DEFAULT_MAX_GAP` = 7200 s (2 h); ``math.inf`` to allow any. [s]
    ignore_columns : tuple of str
        Names of other columns the file may carry (e.g. ``("humidity",)``);
        any column not named here or above is an error.

    Returns
    -------
    (ndarray, ndarray)
        Times [s] from the first reading (which is 0) and temperatures [K],
        a step profile for :func:`workbench.transient.ambient_profile`.

    Raises
    ------
    ValueError
        With ``file:line:column``: missing or unknown unit, unknown or
        missing column, a cell that is not a number (or timestamp), an
        ``elapsed`` column not starting at 0, a time equal to or earlier
        than the previous one, a gap longer than ``max_gap``, a temperature
        outside :data:`workbench.transient.AMBIENT_RANGE`.

    Notes
    -----
    Conversions :math:`t = a\\,x` and :math:`T = a\\,x + b` by
    :func:`workbench.units.to_si` (e.g. :math:`T/K = (t/°F + 459.67)/1.8`);
    timestamps: :math:`t_i = (\\tau_i - \\tau_0)` in seconds.

    References
    ----------
    ``NIST811``: NIST SP 811 (2008), Appendix B.8/B.9 (hour, degree Fahrenheit).

    Examples
    --------
    >>> import tempfile, os
    >>> f = tempfile.NamedTemporaryFile("w", suffix=".csv", delete=False, encoding="utf-8")
    >>> _ = f.write("elapsed [h],temperature [°F]\\n0,68\\n0.5,77\\n"); f.close()
    >>> load_ambient_profile(f.name)
    (array([   0., 1800.]), array([293.15, 298.15]))
    >>> os.unlink(f.name)
    """
    from workbench import units  # pint lives at the boundary only

    gap = float(max_gap) if not isinstance(max_gap, bool) else math.nan
    if not gap > 0:
        raise ValueError(f"max_gap: expected a positive time [s] (math.inf for no limit), got {max_gap!r}")
    if isinstance(ignore_columns, str):
        ignore_columns = (ignore_columns,)
    name, hline, header, rows = _read_rows(Path(path))
    cols = _header_columns(name, hline, header, ignore_columns)
    _check_row_count(name, hline, rows)
    lines, t_raw, x_raw = _readings(name, header, rows, cols)
    time_col, time_kind, time_unit, temp_col, temp_unit = cols
    times = np.atleast_1d(np.asarray(units.to_si(t_raw, time_unit, "time", "elapsed"), float)) if (
        time_kind == "elapsed"
    ) else t_raw
    temps = np.atleast_1d(np.asarray(units.to_si(x_raw, temp_unit, "temperature", "temperature"), float))
    _check_times(name, lines, times, t_raw, cols, gap)
    _check_temperatures(name, lines, temps, x_raw, cols)
    return transient.ambient_profile((times, temps))


def _time_header(name: str, hline: int, pos: int, col: str, unit: str | None) -> None:
    """Check the time column's header cell: ``elapsed [unit]`` or ``timestamp``."""
    from workbench import units

    if col == "elapsed" and not unit:
        raise ValueError(
            f"{_where(name, hline, pos, col)}: missing unit; write it in the header, "
            "e.g. 'elapsed [h]' or 'elapsed [min]'"
        )
    if col == "timestamp" and unit:
        raise ValueError(
            f"{_where(name, hline, pos, col)}: ISO 8601 timestamps carry no unit; write "
            "'timestamp' or use 'elapsed [unit]'"
        )
    if unit:
        try:
            units.to_si(1.0, unit, "time", col)
        except ValueError as exc:
            raise ValueError(f"{_where(name, hline, pos, col)}: {exc}") from None


def _temperature_header(name: str, hline: int, pos: int, col: str, unit: str | None) -> None:
    """Check the temperature column's header cell: ``temperature [unit]``."""
    from workbench import units

    if not unit:
        raise ValueError(
            f"{_where(name, hline, pos, col)}: missing unit; write it in the header, "
            "e.g. 'temperature [°C]', 'temperature [°F]' or 'temperature [K]'"
        )
    try:
        units.to_si(300.0 if unit.strip() in ("K", "kelvin") else 20.0, unit, "temperature", col)
    except ValueError as exc:
        raise ValueError(f"{_where(name, hline, pos, col)}: {exc}") from None


def _header_columns(name: str, hline: int, header: list[str], ignore_columns) -> tuple:
    """``(time_col, time_kind, time_unit, temp_col, temp_unit)`` from the header (1-based columns)."""
    time_col = temp_col = None
    time_kind = time_unit = temp_unit = None
    for pos, raw in enumerate(header, start=1):
        m = _HEADER.match(raw)
        if not m:
            raise ValueError(
                f"{_where(name, hline, pos, repr(raw))}: unreadable header; expected 'name [unit]' "
                "such as 'elapsed [h]' or 'temperature [°C]'"
            )
        col, unit = m.group(1).strip().lower(), m.group(2)
        unit = None if unit is None else unit.strip()
        if col in ignore_columns:
            continue
        if col in TIME_COLUMNS:
            if time_col is not None:
                raise ValueError(
                    f"{_where(name, hline, pos, col)}: a second time column; give one of "
                    f"{list(TIME_COLUMNS)}"
                )
            _time_header(name, hline, pos, col, unit)
            time_col, time_kind, time_unit = pos, col, unit
        elif col == TEMPERATURE_COLUMN:
            if temp_col is not None:
                raise ValueError(f"{_where(name, hline, pos, col)}: a second temperature column")
            _temperature_header(name, hline, pos, col, unit)
            temp_col, temp_unit = pos, unit
        else:
            raise ValueError(
                f"{_where(name, hline, pos, col)}: unknown column; expected {list(TIME_COLUMNS)} "
                f"(one of them) and {TEMPERATURE_COLUMN!r}; name other columns in ignore_columns"
            )
    if time_col is None:
        raise ValueError(
            f"{name}:{hline}:1: no time column; expected 'elapsed [unit]' or 'timestamp'"
        )
    if temp_col is None:
        raise ValueError(f"{name}:{hline}:1: no temperature column; expected 'temperature [unit]'")
    return time_col, time_kind, time_unit, temp_col, temp_unit


def _check_row_count(name: str, hline: int, rows: list) -> None:
    if not rows:
        raise ValueError(f"{name}:{hline}:1: no readings below the header")
    if len(rows) > transient.MAX_PROFILE_POINTS:
        raise ValueError(
            f"{name}:{rows[transient.MAX_PROFILE_POINTS][0]}:1: {len(rows)} readings; the limit is "
            f"{transient.MAX_PROFILE_POINTS} (workbench.transient.MAX_PROFILE_POINTS): export the "
            "logger at a coarser interval or split the trip"
        )


def _readings(name: str, header: list[str], rows: list, cols: tuple):
    """``(lines, t_raw, x_raw)``: file lines, times in the file's unit (timestamps: s from
    the first) and temperatures in the file's unit."""
    time_col, time_kind, time_unit, temp_col, temp_unit = cols
    lines = np.empty(len(rows), dtype=np.int64)
    t_raw = np.empty(len(rows))
    x_raw = np.empty(len(rows))
    aware = None
    t_first = None
    for i, (line, cells) in enumerate(rows):
        lines[i] = line
        if len(cells) != len(header):
            raise ValueError(
                f"{name}:{line}:{min(len(cells), len(header)) + 1}: this row has {len(cells)} "
                f"cells, the header {len(header)}"
            )
        cell = cells[time_col - 1]
        if time_kind == "timestamp":
            try:
                stamp = _timestamp(cell)
            except ValueError:
                raise ValueError(
                    f"{_where(name, line, time_col, 'timestamp')}: {cell!r} is not an ISO 8601 "
                    "timestamp such as 2026-07-14T06:00:00+02:00"
                ) from None
            has_tz = stamp.utcoffset() is not None
            if aware is None:
                aware, t_first = has_tz, stamp
            elif has_tz != aware:
                raise ValueError(
                    f"{_where(name, line, time_col, 'timestamp')}: mixes timestamps with and "
                    "without a UTC offset; give all with an offset (or all without)"
                )
            t_raw[i] = (stamp - t_first).total_seconds()
        else:
            t_raw[i] = _number(cell, name, line, time_col, "elapsed", time_unit)
        x_raw[i] = _number(cells[temp_col - 1], name, line, temp_col, "temperature", temp_unit)
    return lines, t_raw, x_raw


def _check_times(name: str, lines, times, t_raw, cols: tuple, gap: float) -> None:
    """Elapsed time starts at 0; times increase strictly, with no gap over ``gap`` [s]."""
    time_col, time_kind, time_unit = cols[:3]
    if time_kind == "elapsed" and times[0] != 0.0:
        raise ValueError(
            f"{_where(name, int(lines[0]), time_col, 'elapsed')}: the first reading must be at 0 "
            f"(got {t_raw[0]:g} {time_unit}); elapsed time counts from the start of the trip"
        )
    step = np.diff(times)
    bad = np.flatnonzero(step <= 0)
    if bad.size:
        i = int(bad[0]) + 1
        what = "repeats" if step[i - 1] == 0 else "is earlier than"
        raise ValueError(
            f"{_where(name, int(lines[i]), time_col, time_kind)}: this time {what} the previous "
            f"reading (line {int(lines[i - 1])}); times must increase strictly; the file is not "
            "sorted or merged for you"
        )
    long = np.flatnonzero(step > gap)
    if long.size:
        i = int(long[0]) + 1
        raise ValueError(
            f"{_where(name, int(lines[i]), time_col, time_kind)}: {step[i - 1] / 3600:.3g} h since "
            f"the previous reading (line {int(lines[i - 1])}); the limit is max_gap = "
            f"{gap / 3600:.3g} h: check for a lost stretch, or raise max_gap [s] on purpose"
        )


def _check_temperatures(name: str, lines, temps, x_raw, cols: tuple) -> None:
    """Temperatures [K] within :data:`workbench.transient.AMBIENT_RANGE`."""
    temp_col, temp_unit = cols[3:]
    lo, hi = transient.AMBIENT_RANGE
    out = np.flatnonzero((temps < lo) | (temps > hi))
    if out.size:
        i = int(out[0])
        raise ValueError(
            f"{_where(name, int(lines[i]), temp_col, 'temperature')}: {x_raw[i]:g} {temp_unit} "
            f"= {temps[i]:.2f} K lies outside [{lo:g}, {hi:g}] K (−100 … +100 °C); check the unit "
            "in the header"
        )


def _number(cell: str, path: str, line: int, col: int, column: str, unit: str | None) -> float:
    try:
        value = float(cell)
    except ValueError:
        value = math.nan
    if not math.isfinite(value):
        raise ValueError(
            f"{_where(path, line, col, column)}: {cell!r} is not a finite number"
            + (f" [{unit}]" if unit else "")
        )
    return value
