"""Touch-temperature limits: how hot an accessible surface may be.

The shipped defaults are the skin burn thresholds of ISO 13732-1:2006, all
recalled from memory, not re-read:

- long contacts (its Table 2): 1 min — uncoated and coated metals 51 °C,
  ceramics, glass and stone 56 °C, plastics and wood 60 °C; 10 min — 48 °C for
  all materials; 8 h and longer — 43 °C for all;
- short contacts (its threshold-band figures, read here as the lower edge of
  each band): 1 s — metals 65 °C, ceramics, glass and stone 80 °C, plastics
  85 °C, wood 110 °C; 10 s — metals 55 °C, ceramics 66 °C, plastics 71 °C,
  wood 89 °C. Coated metals take the uncoated values (conservative).

What was read from stored public copies of the standard's scope: it gives
burn thresholds for contact periods of 0.5 s and longer, for surfaces whose
temperature is kept up during the contact, and not for contact of more than
about 10 % of the skin. Between 1 s and 10 s the limit is interpolated in
log(time); above 10 s the next longer tabulated duration applies (the lower,
conservative value: 5 min takes the 10 min limit).

These are burn thresholds of the skin, **not** product limits. Product-safety
standards (for IT and audio/video equipment, household appliances, medical
electrical equipment, machinery ...) set their own limits for accessible
surfaces, often by part (handles, enclosures, parts touched only briefly);
look them up and enter them with :meth:`TouchLimits.with_limit` or a user file
for :func:`load_touch_limits`. A calculated surface temperature is a
first-order estimate; touch safety is decided by the applicable product
standard and by testing the product.

Temperatures are absolute in K inside the code; the CSV file holds °C.
"""

from __future__ import annotations

import csv
import math
from dataclasses import dataclass
from pathlib import Path

import numpy as np
from numpy.typing import ArrayLike

from workbench._checks import (
    absolute_temperature,
    broadcast_shape,
    positive,
    scalar,
    scalar_or_array,
)

__all__ = [
    "MATERIAL_CLASSES",
    "TOUCH_CAUTION",
    "INTERPOLATE_UP_TO",
    "CONTACT_RANGE",
    "TouchLimit",
    "TouchLimits",
    "load_touch_limits",
    "touch_class",
    "touch_limit",
    "touch_margin",
]

#: Surface material classes of ISO 13732-1 used for touch limits.
MATERIAL_CLASSES: tuple[str, ...] = (
    "metal-uncoated",
    "metal-coated",
    "ceramic-glass-stone",
    "plastic",
    "wood",
)

#: The caution every touch-temperature result carries.
TOUCH_CAUTION = (
    "Touch limits shipped here are the ISO 13732-1:2006 skin burn thresholds for contacts of "
    "1 s to 8 h (recalled from memory, not re-read); product-safety standards set their own limits for accessible "
    "surfaces, which you must look up and enter. Calculated surface temperatures are "
    "first-order estimates: touch safety is decided by the applicable product standard and "
    "by testing the product."
)

_COLUMNS = ("material_class", "contact_duration", "limit", "source", "note")

#: Up to this contact duration [s] the limit between tabulated durations is interpolated in
#: log(time), as along the standard's short-contact threshold curves; above it the next
#: longer tabulated duration applies (the lower, conservative value).
INTERPOLATE_UP_TO = 10.0
#: Contact durations :func:`touch_limit` accepts [s]: 1 s (a tap) to 8 h.
CONTACT_RANGE = (1.0, 8 * 3600.0)
_ZERO_C = 273.15

_FAMILY_CLASS = {
    "polymer": "plastic",
    "polymer_conductive": "plastic",
    "glass_ceramic": "ceramic-glass-stone",
    "masonry_concrete": "ceramic-glass-stone",
    "wood_panel": "wood",
}


def _choice(name: str, value: str, valid) -> str:
    if not isinstance(value, str) or value not in valid:
        raise ValueError(f"{name}: unknown value {value!r}; valid: {sorted(valid)}")
    return value


@dataclass(frozen=True)
class TouchLimit:
    """One touch limit: a surface class, a contact duration and the highest temperature.

    Attributes
    ----------
    material_class : str
        One of :data:`MATERIAL_CLASSES`.
    contact_duration : float
        Contact duration the limit is stated for. [s]
    limit : float
        Highest surface temperature for that contact. [K]
    source : str
        Source key or free text (a user's product standard and clause).
    note : str
        Free text.
    """

    material_class: str
    contact_duration: float
    limit: float
    source: str
    note: str = ""

    def __post_init__(self):
        _choice("material_class", self.material_class, MATERIAL_CLASSES)
        duration = float(positive("contact_duration", scalar("contact_duration", self.contact_duration, "s"), "s"))
        limit = float(absolute_temperature("limit", scalar("limit", self.limit, "K")))
        object.__setattr__(self, "contact_duration", duration)
        object.__setattr__(self, "limit", limit)
        if not str(self.source).strip():
            raise ValueError(
                "source: every touch limit needs a source (standard and clause, or a marker)"
            )


@dataclass(frozen=True)
class TouchLimits:
    """A table of touch limits, looked up by surface class and contact duration.

    For a contact duration between tabulated ones up to
    :data:`INTERPOLATE_UP_TO` the limit is interpolated linearly in
    log(duration); above it the limit of the next *longer* tabulated duration
    is used (the lower, conservative value); durations longer than the longest
    tabulated one use that longest one (in ISO 13732-1 the 8 h value holds for
    8 h and longer). Durations shorter than the shortest tabulated one raise
    ``ValueError``.
    """

    rows: tuple[TouchLimit, ...]

    def __post_init__(self):
        seen = set()
        for r in self.rows:
            key = (r.material_class, float(r.contact_duration))
            if key in seen:
                raise ValueError(f"touch limits: duplicate row for {key[0]!r} at {key[1]:g} s")
            seen.add(key)

    def classes(self) -> tuple[str, ...]:
        """Surface classes that have at least one limit."""
        return tuple(c for c in MATERIAL_CLASSES if any(r.material_class == c for r in self.rows))

    def lookup(self, material_class: str, contact_duration: float) -> TouchLimit:
        """The row that applies to a class and a contact duration [s].

        Between two tabulated durations up to :data:`INTERPOLATE_UP_TO` (10 s) the
        limit is interpolated linearly in log(duration), as along the standard's
        short-contact threshold curves; above it the next longer tabulated
        duration applies (the lower, conservative value).
        """
        _choice("material_class", material_class, self.classes() or MATERIAL_CLASSES)
        d = float(positive("contact_duration", scalar("contact_duration", contact_duration, "s"), "s"))
        rows = sorted(
            (r for r in self.rows if r.material_class == material_class),
            key=lambda r: r.contact_duration,
        )
        if d < rows[0].contact_duration * (1 - 1e-12):
            raise ValueError(
                f"contact_duration: {d:g} s is shorter than the shortest tabulated contact "
                f"({rows[0].contact_duration:g} s) for {material_class!r}; short-contact limits "
                "depend on the material (ISO 13732-1 figures) — add them as rows"
            )
        for i, r in enumerate(rows):
            if d <= r.contact_duration * (1 + 1e-12):
                if i == 0 or d >= r.contact_duration * (1 - 1e-12) or r.contact_duration > INTERPOLATE_UP_TO:
                    return r
                lo = rows[i - 1]
                w = math.log(d / lo.contact_duration) / math.log(r.contact_duration / lo.contact_duration)
                limit = lo.limit + w * (r.limit - lo.limit)
                source = lo.source if lo.source == r.source else f"{lo.source}; {r.source}"
                return TouchLimit(
                    material_class, d, limit, source,
                    f"interpolated in log(time) between {lo.contact_duration:g} s and "
                    f"{r.contact_duration:g} s",
                )
        return rows[-1]

    def limit(self, material_class: str, contact_duration: float) -> float:
        """Touch limit [K] for a class and a contact duration [s] (see :meth:`lookup`)."""
        return float(self.lookup(material_class, contact_duration).limit)

    def with_limit(
        self,
        material_class: str,
        contact_duration: float,
        limit: float,
        source: str,
        note: str = "",
    ) -> TouchLimits:
        """A copy with one row added or replaced (e.g. a product standard's limit) [s, K]."""
        new = TouchLimit(material_class, contact_duration, limit, source, note)
        rows = [
            r
            for r in self.rows
            if not (
                r.material_class == material_class
                and math.isclose(r.contact_duration, new.contact_duration)
            )
        ]
        return TouchLimits(tuple(rows) + (new,))

    def as_records(self) -> list[dict]:
        """Rows as dicts (limit in K), e.g. for a DataFrame."""
        return [
            {
                "material_class": r.material_class,
                "contact_duration": r.contact_duration,
                "limit": r.limit,
                "source": r.source,
                "note": r.note,
            }
            for r in self.rows
        ]


def _read(path: Path) -> list[TouchLimit]:
    rows = []
    with open(path, newline="", encoding="utf-8") as fh:
        reader = csv.reader(fh)
        try:
            header = [c.strip() for c in next(reader)]
        except StopIteration:
            raise ValueError(f"{path}: empty touch-limits file") from None
        missing = [c for c in _COLUMNS[:4] if c not in header]
        unknown = [c for c in header if c not in _COLUMNS]
        if missing or unknown:
            raise ValueError(
                f"{path}:1: columns must be {list(_COLUMNS)} (note optional); "
                f"missing {missing}, unknown {unknown}"
            )
        idx = {c: header.index(c) for c in header}
        for line, cells in enumerate(reader, start=2):
            if not cells or not "".join(cells).strip() or cells[0].lstrip().startswith("#"):
                continue
            cells = cells + [""] * (len(header) - len(cells))

            def cell(name, cells=cells):
                return cells[idx[name]].strip() if name in idx else ""

            try:
                rows.append(
                    TouchLimit(
                        material_class=cell("material_class"),
                        contact_duration=float(cell("contact_duration")),
                        limit=float(cell("limit")) + _ZERO_C,
                        source=cell("source"),
                        note=cell("note"),
                    )
                )
            except ValueError as exc:
                raise ValueError(f"{path}:{line}: {exc}") from None
    return rows


def _default_path() -> Path:
    from workbench.materials import tables_dir

    return tables_dir() / "touch_limits.csv"


def load_touch_limits(path: str | Path | None = None, replace: bool = False) -> TouchLimits:
    """Touch limits: the shipped ISO 13732-1 defaults, optionally with a user file.

    Parameters
    ----------
    path : str or Path, optional
        A CSV file with columns ``material_class, contact_duration [s],
        limit [°C], source, note``. Its rows replace shipped rows of the same
        class and duration and add the others.
    replace : bool
        If True, use the user file alone (e.g. a product standard's table).

    Returns
    -------
    TouchLimits
        Limits in K.

    Notes
    -----
    Shipped: ISO 13732-1:2006 Table 2 (long contact), recalled from memory —
    1 min: metals 51 °C, ceramics/glass/stone 56 °C, plastics and wood 60 °C;
    10 min: 48 °C; 8 h: 43 °C.

    References
    ----------
    ``iso13732-1-2006-t2-mem``: ISO 13732-1:2006, Table 2 (from memory).

    Examples
    --------
    >>> lim = load_touch_limits()
    >>> round(lim.limit("plastic", 60.0) - 273.15, 2)
    60.0
    >>> round(lim.limit("metal-coated", 300.0) - 273.15, 2)
    48.0
    """
    shipped = [] if replace else _read(_default_path())
    if path is None:
        if replace:
            raise ValueError("path: replace=True needs a user touch-limits file")
        return TouchLimits(tuple(shipped))
    user = _read(Path(path))
    keys = {(r.material_class, r.contact_duration) for r in user}
    kept = [r for r in shipped if (r.material_class, r.contact_duration) not in keys]
    return TouchLimits(tuple(kept + user))


def touch_class(family: str, coated: bool = False) -> str:
    """Touch-limit surface class of a material family and finish.

    Parameters
    ----------
    family : str
        Material family id of the materials table (``"metal"``, ``"polymer"``,
        ``"polymer_conductive"``, ``"glass_ceramic"``, ``"masonry_concrete"``,
        ``"wood_panel"``).
    coated : bool
        Whether the surface carries a coating (paint, powder, anodising); it
        only matters for metals.

    Returns
    -------
    str
        One of :data:`MATERIAL_CLASSES`.

    Notes
    -----
    Classes of ISO 13732-1 (uncoated metal, coated metal, ceramics/glass/stone,
    plastics, wood). A metallised plastic stays ``"plastic"`` (thin layer on
    a polymer): common practice, confirm against the product standard.

    References
    ----------
    ``iso13732-1-2006-t2-mem``: material classes of Table 2 (from memory).

    Examples
    --------
    >>> touch_class("metal", coated=True)
    'metal-coated'
    >>> touch_class("polymer_conductive")
    'plastic'
    """
    if family == "metal":
        return "metal-coated" if coated else "metal-uncoated"
    valid = ["metal", *_FAMILY_CLASS]
    if family not in _FAMILY_CLASS:
        raise ValueError(
            f"family: no touch class for {family!r}; valid: {valid} (enter a limit for other surfaces)"
        )
    return _FAMILY_CLASS[family]


def touch_limit(
    material_class: str, contact_duration: float, limits: TouchLimits | None = None
) -> float:
    """Highest surface temperature for a contact of a given duration.

    Parameters
    ----------
    material_class : str
        One of :data:`MATERIAL_CLASSES`.
    contact_duration : float
        How long the surface is touched. [s]
    limits : TouchLimits, optional
        The table to use; default the shipped ISO 13732-1 values.

    Returns
    -------
    float
        Limit. [K]

    Notes
    -----
    Contact durations from 1 s (a tap) to 8 h are accepted; outside that
    range a ``ValueError`` says so. Between 1 s and 10 s the limit is
    interpolated linearly in log(duration); above 10 s the next longer
    tabulated duration (lower limit) applies.

    References
    ----------
    ``iso13732-1-2006-t2-mem``: ISO 13732-1:2006, Table 2 (from memory);
    ``iso13732-1-2006-fig-mem``: its short-contact threshold bands, lower edge
    (from memory).

    Examples
    --------
    >>> round(touch_limit("ceramic-glass-stone", 60.0) - 273.15, 2)
    56.0
    >>> round(touch_limit("wood", 8 * 3600.0) - 273.15, 2)
    43.0
    >>> round(touch_limit("metal-uncoated", 1.0) - 273.15, 1)   # a tap
    65.0
    >>> round(touch_limit("plastic", 10.0) - 273.15, 1)          # a grab
    71.0
    """
    d = float(positive("contact_duration", scalar("contact_duration", contact_duration, "s"), "s"))
    lo, hi = CONTACT_RANGE
    if not lo * (1 - 1e-12) <= d <= hi * (1 + 1e-12):
        raise ValueError(
            f"contact_duration: {d:g} s is outside the range the burn thresholds cover here "
            f"({lo:g} s to {hi / 3600:g} h); the standard gives no threshold below 0.5 s, and "
            "8 h stands for any longer contact: enter 8 h"
        )
    table = load_touch_limits() if limits is None else limits
    return table.limit(material_class, d)


def touch_margin(t_surface: ArrayLike, limit: ArrayLike) -> float | np.ndarray:
    """Margin of a surface temperature below its touch limit.

    Parameters
    ----------
    t_surface : float or array
        Surface temperature. [K]
    limit : float or array
        Touch limit (:func:`touch_limit`). [K]

    Returns
    -------
    float or array
        :math:`T_{limit} - T_s`; positive = below the limit. [K]

    Notes
    -----
    .. math:: \\Delta T_{margin} = T_{limit} - T_s

    References
    ----------
    ``iso13732-1-2006-t2-mem``: the limits (from memory).

    Examples
    --------
    >>> round(touch_margin(318.15, 321.15), 2)
    3.0
    """
    ts = absolute_temperature("t_surface", t_surface)
    lim = absolute_temperature("limit", limit)
    broadcast_shape(t_surface=ts, limit=lim)
    return scalar_or_array(lim - ts)
