"""Coolants for insulated shippers: the curated table and its loader.

``tables/coolants.csv`` holds one row per coolant (water ice, water-based gel
pack, generic phase-change materials near +5 °C and +20 °C, dry ice) with the
phase-change temperature, latent heat, density, specific heats, a demo cost,
conditioning notes and cautions. Every numeric value has its own source key
(resolved against ``tables/sources.csv``)
or a marker (``common-practice``, ``from-memory``, ``demo``).

File units: ``t_phase_change`` in °C (converted to K here), ``latent_heat``
J/kg, ``density`` kg/m³, specific heats J/(kg·K), ``cost`` currency per kg.
An empty specific heat means "not applicable" (dry ice has no liquid phase and
stays at its sublimation point at atmospheric pressure); it loads as 0.0.

Caution: values of the generic phase-change materials are demo values; use the
product's data. A shipper for medicines is qualified by testing under the
applicable distribution rules; these numbers only support the design.
"""

from __future__ import annotations

import csv
import functools
from pathlib import Path
from typing import TYPE_CHECKING

import numpy as np

from workbench._checks import broadcast, positive
from workbench.materials import MARKERS, load_sources, tables_dir

if TYPE_CHECKING:  # pandas is imported inside the function that builds the frame
    import pandas as pd

__all__ = [
    "COOLANT_COLUMNS",
    "PHASE_CHANGES",
    "DEFAULT_COOLANT",
    "load_coolants",
    "coolant",
    "specific_heats_for",
]

#: Coolant whose specific heats :func:`specific_heats_for` gives a coolant that
#: is not in the table (ice and liquid water: water is the base of most packs).
DEFAULT_COOLANT = "water_ice"
#: Tolerances of :func:`specific_heats_for`: a coolant is the table's row when its
#: phase-change temperature lies within this many K and its latent heat within
#: this fraction.
_MATCH_T, _MATCH_L = 0.05, 0.005

#: Kinds of phase change a coolant uses.
PHASE_CHANGES: tuple[str, ...] = ("melting", "sublimation")

_NUMERIC = (
    "t_phase_change",
    "latent_heat",
    "density",
    "specific_heat_solid",
    "specific_heat_liquid",
    "cost",
)
_OPTIONAL = ("specific_heat_solid", "specific_heat_liquid")

#: Columns of ``coolants.csv`` in file order.
COOLANT_COLUMNS: tuple[str, ...] = (
    "id",
    "name",
    "phase_change",
    "t_phase_change",
    "t_phase_change_source",
    "latent_heat",
    "latent_heat_source",
    "density",
    "density_source",
    "specific_heat_solid",
    "specific_heat_solid_source",
    "specific_heat_liquid",
    "specific_heat_liquid_source",
    "cost",
    "currency",
    "cost_source",
    "conditioning",
    "cautions",
)

_UNITS = {
    "t_phase_change": "K",
    "latent_heat": "J/kg",
    "density": "kg/m³",
    "specific_heat_solid": "J/(kg·K)",
    "specific_heat_liquid": "J/(kg·K)",
}


def _sources() -> dict[str, str]:
    """Source key -> resolved citation (tables/sources.csv)."""
    return dict(load_sources()["resolved"])


def _read(path: Path) -> list[tuple[int, dict[str, str]]]:
    lines = path.read_text(encoding="utf-8").splitlines()
    keep = [
        (i + 1, ln) for i, ln in enumerate(lines) if ln.strip() and not ln.lstrip().startswith("#")
    ]
    reader = csv.reader([ln for _, ln in keep])
    rows = list(reader)
    header = [c.strip() for c in rows[0]]
    if tuple(header) != COOLANT_COLUMNS:
        raise ValueError(
            f"{path}: header must be {', '.join(COOLANT_COLUMNS)}; got {', '.join(header)}"
        )
    return [
        (keep[i + 1][0], dict(zip(header, (c.strip() for c in r), strict=True)))
        for i, r in enumerate(rows[1:])
    ]


@functools.lru_cache(maxsize=1)
def _curated() -> pd.DataFrame:
    path = tables_dir() / "coolants.csv"
    sources = _sources()
    problems: list[str] = []
    records = []
    for line, rec in _read(path):
        out: dict[str, object] = {"id": rec["id"], "name": rec["name"]}
        if rec["phase_change"] not in PHASE_CHANGES:
            problems.append(
                f"{path}:{line}:phase_change: unknown {rec['phase_change']!r}; valid: {PHASE_CHANGES}"
            )
        out["phase_change"] = rec["phase_change"]
        for col in _NUMERIC:
            text = rec[col]
            if text == "" and col in _OPTIONAL:
                out[col] = 0.0
            else:
                try:
                    value = float(text)
                except ValueError:
                    problems.append(f"{path}:{line}:{col}: not a number: {text!r}")
                    value = np.nan
                out[col] = value
            key = rec.get(f"{col}_source", rec.get("cost_source"))
            if col == "cost":
                key = rec["cost_source"]
            if text == "" and col in _OPTIONAL:
                out[f"{col}_source"] = "not applicable"
                continue
            if key not in sources and key not in MARKERS:
                problems.append(f"{path}:{line}:{col}_source: unknown source key {key!r}")
            out[f"{col}_source"] = sources.get(key, key)
            out[f"{col}_source_key"] = key
        out["t_phase_change"] = round(float(out["t_phase_change"]) + 273.15, 9)
        for col in ("currency", "conditioning", "cautions"):
            out[col] = rec[col]
        records.append(out)
    if problems:
        raise ValueError("problems in the coolants table:\n  " + "\n  ".join(problems))
    import pandas as pd

    frame = pd.DataFrame(records).set_index("id")
    frame.attrs["units"] = dict(_UNITS, cost=f"{'/'.join(sorted(set(frame['currency'])))}/kg")
    return frame


def load_coolants() -> pd.DataFrame:
    """The curated coolants table, one row per coolant, values in SI.

    Returns
    -------
    pandas.DataFrame
        Indexed by ``id``; numeric columns ``t_phase_change`` [K],
        ``latent_heat`` [J/kg], ``density`` [kg/m³], ``specific_heat_solid``
        and ``specific_heat_liquid`` [J/(kg·K)] (0.0 where not applicable),
        ``cost`` [currency/kg, demo]; beside each a ``<column>_source`` with
        the resolved citation or marker and ``<column>_source_key``; text
        columns ``name``, ``phase_change``, ``currency``, ``conditioning``,
        ``cautions``. Units are in ``attrs["units"]``.

    References
    ----------
    Per value, see the ``*_source`` columns (``crc-hcp97-fusion-mem``,
    ``iapws-r10-06-mem``, ``co2-sublimation-mem``, ``coolprop``, markers).

    Examples
    --------
    >>> c = load_coolants()
    >>> float(c.loc["water_ice", "latent_heat"]), float(c.loc["dry_ice", "t_phase_change"])
    (333550.0, 194.65)
    """
    return _curated().copy()


def coolant(coolant_id: str) -> pd.Series:
    """One coolant's row; an unknown id raises ``ValueError`` listing the valid ids.

    Examples
    --------
    >>> float(coolant("pcm_plus5")["t_phase_change"])
    278.15
    """
    if not isinstance(coolant_id, str):
        raise TypeError(f"coolant_id: expected a coolant id (text), got {coolant_id!r:.60}")
    frame = _curated()
    if coolant_id not in frame.index:
        raise ValueError(f"coolant_id: unknown id {coolant_id!r}; valid: {list(frame.index)}")
    return frame.loc[coolant_id].copy()


def specific_heats_for(t_phase_change, latent_heat) -> tuple[np.ndarray, np.ndarray]:
    """Specific heats of a coolant below and above its phase change, from the coolants table.

    Parameters
    ----------
    t_phase_change : float or array
        Phase-change temperature. [K]
    latent_heat : float or array
        Latent heat of melting or sublimation. [J/kg]

    Returns
    -------
    (ndarray, ndarray)
        ``specific_heat_solid`` and ``specific_heat_liquid`` [J/(kg·K)],
        broadcast over the inputs: those of the table's coolant whose
        phase-change temperature lies within 0.05 K and latent heat within
        0.5 % of the given ones; for any other coolant those of
        :data:`DEFAULT_COOLANT` (ice and liquid water). 0.0 where the table
        has no such phase (dry ice has no liquid at atmospheric pressure).

    Notes
    -----
    The table's specific heats are means over the range each phase passes
    through in a shipper, so the sensible heat between those ends is exact.

    References
    ----------
    Per value, see the ``*_source`` columns of :func:`load_coolants`
    (water: ``iapws-r10-06``, ``iapws-95``).

    Examples
    --------
    >>> cs, cl = specific_heats_for(273.15, 333550.0)
    >>> float(cs), float(cl)
    (2023.0, 4191.0)
    >>> [float(x) for x in specific_heats_for(194.65, 571000.0)]
    [0.0, 0.0]
    """
    tpc = positive("t_phase_change", t_phase_change, "K")
    lat = positive("latent_heat", latent_heat, "J/kg")
    for name, arr, unit in (("t_phase_change", tpc, "K"), ("latent_heat", lat, "J/kg")):
        if arr.size == 0:
            raise ValueError(f"{name}: empty; give at least one value [{unit}]")
    tpc, lat = (np.array(a, float) for a in broadcast(t_phase_change=tpc, latent_heat=lat))
    frame = _curated()
    default = frame.loc[DEFAULT_COOLANT]
    cs = np.full(tpc.shape, float(default["specific_heat_solid"]))
    cl = np.full(tpc.shape, float(default["specific_heat_liquid"]))
    for _, row in frame.iterrows():
        same = (np.abs(tpc - float(row["t_phase_change"])) <= _MATCH_T) & (
            np.abs(lat - float(row["latent_heat"])) <= _MATCH_L * float(row["latent_heat"])
        )
        cs = np.where(same, float(row["specific_heat_solid"]), cs)
        cl = np.where(same, float(row["specific_heat_liquid"]), cl)
    return cs, cl
