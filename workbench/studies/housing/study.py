"""Housing study: will the inside stay below its limit, and is the outside safe to touch?

For each candidate housing wall (material × thickness × finish) the study
solves the enclosure's heat balance (:func:`workbench.housing.solve_housing`),
the hot spot under a component bonded to the wall
(:func:`workbench.housing.hot_spot`) and checks the touch limits
(:mod:`workbench.touch`). It holds its inputs as plain SI state and returns
DataFrames with units in ``DataFrame.attrs["units"]``, the source of every
property beside it, and the cautions in ``attrs["cautions"]``.

For thin walls the conductivity barely changes the mean temperatures: the
films and the emissivity of the finish decide. It decides the hot spot. The
results show both, plus the sensitivity of the surface temperature to the
emissivity, so a ranking by conductivity alone is not mistaken for the answer.

Caution: first-order estimates. Touch safety depends on the applicable
product standard and on testing the product; the shipped touch limits are
skin burn thresholds (ISO 13732-1), not product limits.
"""

from __future__ import annotations

import csv
import re
import warnings
from collections.abc import Sequence
from dataclasses import dataclass
from pathlib import Path

import numpy as np
import pandas as pd

from workbench._checks import ValidityWarning, finite, in_range, positive
from workbench.housing import (
    HOUSING_ASSUMPTIONS,
    MOUNTINGS,
    WARM_UP_ASSUMPTIONS,
    WarmUp,
    _emissivity_sensitivity,
    hot_spot,
    housing_heat_capacity,
    housing_warm_up,
    solve_housing,
)
from workbench.ranking import pareto_front
from workbench.touch import TOUCH_CAUTION, TouchLimits, load_touch_limits, touch_class

__all__ = [
    "HousingCandidate",
    "Component",
    "HousingStudy",
    "HOUSING_CAUTIONS",
    "TOUCH_RESULT_CAUTION",
    "finish_text_is_coating",
    "load_finishes",
]

#: Said beside every touch result (tables, charts, notebook prints).
TOUCH_RESULT_CAUTION = (
    "Touch safety and component limits stay with the applicable product standard and "
    "measurement on the product."
)

#: Cautions attached to every housing result.
HOUSING_CAUTIONS: tuple[str, ...] = (
    TOUCH_RESULT_CAUTION,
    TOUCH_CAUTION,
    "The steady-state temperatures (inside air, surfaces, hot spot) are first-order estimates "
    "(flat-plate correlations scatter by ±20 % or more); confirm with a prototype measurement "
    "before committing to a design.",
    "The hot spot assumes the component's heat enters the wall through its footprint (bonded, "
    "no contact resistance): an upper estimate when part of it goes to the inside air.",
    "Costs are indicative demo values; replace them with your own.",
    "The warm-up over the use session is a one-node estimate of the mean surface (housing and "
    "contents at one temperature, contents' heat capacity as entered); the hot spot gets to the "
    "touch limit sooner.",
)

# a coating named in a material row's finish text ("anodised (clear or dark)", "painted");
# a word boundary before it keeps "unpainted" out
_COATING_WORDS = re.compile(
    r"\b(anodi[sz]\w*|paint(ed)?|powder[- ]coat\w*|lacquer\w*|enamel\w*|e-coat\w*|coated)\b",
    re.IGNORECASE,
)


def finish_text_is_coating(text) -> bool:
    """Whether a material row's own finish text names a coating (anodised, painted, lacquered ...).

    Examples
    --------
    >>> finish_text_is_coating("anodised (clear or dark)"), finish_text_is_coating("moulded, unpainted")
    (True, False)
    """
    return isinstance(text, str) and bool(_COATING_WORDS.search(text))

_FINISH_COLUMNS = ("id", "name", "applies_to", "emissivity", "emissivity_source", "coated", "note")
_ZERO_C = 273.15


def _tables_dir() -> Path:
    from workbench.materials import tables_dir

    return tables_dir()


def _source_resolver():
    from workbench.materials import load_sources

    curated = load_sources()["resolved"].to_dict()

    def resolve(key: str) -> str:
        if key in curated:
            return curated[key]
        raise ValueError(f"source: unknown key {key!r}; add it to tables/sources.csv")

    return resolve


def _results_units(cost_unit: str) -> dict[str, str]:
    """Units of the numeric columns of :meth:`HousingStudy.results` (``cost`` in ``cost_unit``)."""
    return {
        "thickness": "m",
        "emissivity": "-",
        "conductivity": "W/(m·K)",
        "t_air_inside": "K",
        "t_wall_inside": "K",
        "t_surface": "K",
        "t_hot_spot": "K",
        "t_air_inside_degC": "°C",
        "t_surface_degC": "°C",
        "t_hot_spot_degC": "°C",
        "hot_spot_rise": "K",
        "spreading_length": "m",
        "biot_number": "-",
        "h_convection": "W/(m²·K)",
        "h_radiation": "W/(m²·K)",
        "radiation_share": "-",
        "dt_surface_d_emissivity": "K",
        "mass": "kg",
        "cost": cost_unit,
        "heat_capacity": "J/K",
        "t_surface_session_end": "K",
        "t_surface_session_end_degC": "°C",
        "time_to_touch_limit": "s",
        "touch_limit": "K",
        "touch_limit_degC": "°C",
        "margin_surface": "K",
        "margin_hot_spot": "K",
    }


def load_finishes(path=None) -> pd.DataFrame:
    """Surface finishes with emissivity and source, indexed by id.

    Parameters
    ----------
    path : str or Path, optional
        A user CSV with the same columns (``id, name, applies_to,
        emissivity, emissivity_source, coated, note``); its rows replace
        shipped rows with the same id and add the others.

    Returns
    -------
    pandas.DataFrame
        Columns ``name``, ``applies_to`` (tuple of material families, or
        ``("any",)``), ``emissivity`` [-], ``emissivity_source`` (resolved
        citation), ``emissivity_source_key``, ``coated`` (bool), ``note``.

    Examples
    --------
    >>> f = load_finishes()
    >>> float(f.loc["aluminium_anodised", "emissivity"])
    0.82
    """
    resolve = _source_resolver()

    def read(p: Path) -> list[dict]:
        rows = []
        with open(p, newline="", encoding="utf-8") as fh:
            reader = csv.DictReader(fh)
            cols = reader.fieldnames or []
            missing = [c for c in _FINISH_COLUMNS[:6] if c not in cols]
            unknown = [c for c in cols if c not in _FINISH_COLUMNS]
            if missing or unknown:
                raise ValueError(f"{p}:1: missing columns {missing}, unknown columns {unknown}")
            for line, r in enumerate(reader, start=2):
                if not r["id"] or r["id"].startswith("#"):
                    continue
                try:
                    eps = float(in_range("emissivity", float(r["emissivity"]), 0.0, 1.0, "-"))
                    coated = {"yes": True, "no": False}[r["coated"].strip().lower()]
                    src = resolve(r["emissivity_source"].strip())
                except (ValueError, KeyError) as exc:
                    raise ValueError(f"{p}:{line}: finish {r['id']!r}: {exc}") from None
                rows.append(
                    {
                        "id": r["id"].strip(),
                        "name": r["name"],
                        "applies_to": tuple(s.strip() for s in r["applies_to"].split(";")),
                        "emissivity": eps,
                        "emissivity_source": src,
                        "emissivity_source_key": r["emissivity_source"].strip(),
                        "coated": coated,
                        "note": r.get("note", "") or "",
                    }
                )
        return rows

    rows = {r["id"]: r for r in read(_tables_dir() / "finishes.csv")}
    if path is not None:
        rows.update({r["id"]: r for r in read(Path(path))})
    frame = pd.DataFrame(list(rows.values())).set_index("id")
    frame.attrs["units"] = {"emissivity": "-"}
    return frame


@dataclass(frozen=True)
class HousingCandidate:
    """One housing wall: a material, a thickness and a finish.

    Parameters
    ----------
    material : str
        Material id of the materials table.
    thickness : float
        Wall thickness. [m]
    finish : str or None
        Finish id of :func:`load_finishes`; ``None`` = the material's own
        surface (emissivity from the materials table).
    name : str, optional
        Label; default ``"<material> <t> mm <finish>"``.
    """

    material: str
    thickness: float
    finish: str | None = None
    name: str | None = None

    def __post_init__(self):
        positive(f"thickness of candidate {self.material!r}", self.thickness, "m")

    @property
    def label(self) -> str:
        if self.name:
            return self.name
        return f"{self.material} {self.thickness * 1e3:g} mm {self.finish or 'as-is'}"


@dataclass(frozen=True)
class Component:
    """A component bonded to the inside of the wall: footprint [m] and power [W]."""

    length: float
    width: float
    power: float

    def __post_init__(self):
        positive("component length", self.length, "m")
        positive("component width", self.width, "m")
        finite("component power", self.power, "W")
        if self.power < 0:
            raise ValueError("component power: must be >= 0 W")

    @property
    def area(self) -> float:
        return self.length * self.width


@dataclass
class HousingStudy:
    """Compare housing walls for a sealed enclosure dissipating a power.

    Parameters
    ----------
    candidates : sequence of HousingCandidate
    materials : DataFrame
        :func:`workbench.materials.load_materials`.
    length, width, height : float
        Outer dimensions (height vertical). [m]
    power : float
        Dissipated power inside. [W]
    t_ambient : float
        Room temperature. [K]
    mounting : str
        ``"free-standing"``, ``"on-table"`` or ``"wall-mounted"``.
    t_inside_max : float or None
        Highest allowed inside air temperature. [K]
    component : Component or None
        A component bonded to the wall, for the hot spot.
    contact_duration : float
        How long a user touches the housing. [s]
    finishes : DataFrame, optional
        :func:`load_finishes` (default: the shipped table).
    touch_limits : TouchLimits, optional
        Default: the shipped ISO 13732-1 values; enter the product standard's.
    h_inside : float or None
        Inside convective coefficient [W/(m²·K)]; None = correlations.
    session_duration : float
        Length of a use session for the warm-up (:meth:`warm_up`). [s]
    content_heat_capacity : float
        Heat capacity of the contents (boards, battery, brackets), added to
        the wall's for the warm-up. [J/K]
    """

    candidates: Sequence[HousingCandidate]
    materials: pd.DataFrame
    length: float = 0.2
    width: float = 0.1
    height: float = 0.05
    power: float = 5.0
    t_ambient: float = 298.15
    mounting: str = "on-table"
    t_inside_max: float | None = None
    component: Component | None = None
    contact_duration: float = 600.0
    finishes: pd.DataFrame | None = None
    touch_limits: TouchLimits | None = None
    h_inside: float | None = None
    session_duration: float = 1200.0
    content_heat_capacity: float = 100.0

    def __post_init__(self):
        self.candidates = list(self.candidates)
        if not self.candidates:
            raise ValueError("candidates: choose at least one housing candidate")
        for c in self.candidates:
            if not isinstance(c, HousingCandidate):
                raise ValueError(f"candidates: expected HousingCandidate, got {c!r}")
        names = [c.label for c in self.candidates]
        dup = sorted({n for n in names if names.count(n) > 1})
        if dup:
            raise ValueError(f"candidates: duplicate names {dup}")
        if self.finishes is None:
            self.finishes = load_finishes()
        if self.touch_limits is None:
            self.touch_limits = load_touch_limits()
        unknown = sorted({c.material for c in self.candidates} - set(self.materials.index))
        if unknown:
            raise ValueError(
                f"candidates: unknown material ids {unknown}; see load_materials().index"
            )
        for c in self.candidates:
            if c.finish is None:
                if not np.isfinite(self.materials.loc[c.material, "emissivity"]):
                    raise ValueError(
                        f"finish: material {c.material!r} has no emissivity; choose a finish"
                    )
                continue
            if c.finish not in self.finishes.index:
                raise ValueError(
                    f"finish: unknown {c.finish!r}; valid: {sorted(self.finishes.index)}"
                )
            fam = self.materials.loc[c.material, "family"]
            applies = self.finishes.loc[c.finish, "applies_to"]
            if "any" not in applies and fam not in applies:
                raise ValueError(
                    f"finish: {c.finish!r} applies to {list(applies)}, not to {c.material!r} ({fam})"
                )
        for name in ("length", "width", "height"):
            positive(name, getattr(self, name), "m")
        finite("power", self.power, "W")
        if self.power < 0:
            raise ValueError("power: must be >= 0 W")
        positive("t_ambient", self.t_ambient, "K")
        if self.mounting not in MOUNTINGS:
            raise ValueError(f"mounting: unknown {self.mounting!r}; valid: {list(MOUNTINGS)}")
        if self.t_inside_max is not None:
            positive("t_inside_max", self.t_inside_max, "K")
        positive("contact_duration", self.contact_duration, "s")
        positive("session_duration", self.session_duration, "s")
        if self.session_duration > 7 * 86400.0:
            raise ValueError(
                f"session_duration: at most 7 days ({7 * 86400.0:g} s) for a use session; "
                f"got {self.session_duration:g} s"
            )
        finite("content_heat_capacity", self.content_heat_capacity, "J/K")
        if self.content_heat_capacity < 0:
            raise ValueError(
                f"content_heat_capacity: must be >= 0 J/K (got {self.content_heat_capacity:g})"
            )
        if self.component is not None and self.component.power > self.power:
            raise ValueError("component power: must not exceed the dissipated power (W)")
        dims = (self.length, self.width, self.height)
        for c in self.candidates:
            if 2.0 * c.thickness >= min(dims):
                raise ValueError(
                    f"thickness of candidate {c.label!r}: two walls of {c.thickness * 1e3:g} mm "
                    f"leave no inside in a box whose smallest outer dimension is "
                    f"{min(dims) * 1e3:g} mm [m]"
                )
        if self.component is not None:
            comp = sorted((self.component.length, self.component.width))
            t_max = max(c.thickness for c in self.candidates)
            inner = [d - 2.0 * t_max for d in dims]
            faces = [sorted((inner[i], inner[j])) for i, j in ((0, 1), (0, 2), (1, 2))]
            if not any(comp[0] <= f[0] and comp[1] <= f[1] for f in faces):
                raise ValueError(
                    f"component length, component width: a {self.component.length * 1e3:g} mm × "
                    f"{self.component.width * 1e3:g} mm component does not fit on any inside face "
                    f"of the housing ({inner[0] * 1e3:g} × {inner[1] * 1e3:g} × "
                    f"{inner[2] * 1e3:g} mm inside the thickest wall) [m]"
                )

    # -- per-candidate arrays ---------------------------------------------
    @property
    def names(self) -> list[str]:
        return [c.label for c in self.candidates]

    def _arrays(self) -> dict[str, np.ndarray]:
        """Per-candidate properties from the tables (one vectorised lookup per table)."""
        m, f = self.materials, self.finishes
        mats = [c.material for c in self.candidates]
        rows = m.loc[mats, ["conductivity", "density", "specific_heat", "cost_per_volume",
                            "emissivity", "emissivity_finish"]]
        eps = rows["emissivity"].to_numpy(float).copy()
        # an anodised or painted material row counts as coated, as its finish would
        coated = np.array([finish_text_is_coating(x) for x in rows["emissivity_finish"]], bool)
        with_finish = [i for i, c in enumerate(self.candidates) if c.finish is not None]
        if with_finish:
            fin = f.loc[[self.candidates[i].finish for i in with_finish], ["emissivity", "coated"]]
            eps[with_finish] = fin["emissivity"].to_numpy(float)
            coated[with_finish] = fin["coated"].to_numpy(bool)
        return {
            "t": np.array([c.thickness for c in self.candidates], float),
            "k": rows["conductivity"].to_numpy(float),
            "rho": rows["density"].to_numpy(float),
            "cp": rows["specific_heat"].to_numpy(float),
            "eps": eps,
            "cost_v": rows["cost_per_volume"].to_numpy(float),
            "coated": coated,
        }

    def _solve(self, emissivity=None, power=None):
        a = self._arrays()
        eps = a["eps"] if emissivity is None else emissivity
        return solve_housing(
            self.length,
            self.width,
            self.height,
            a["t"],
            a["k"],
            eps,
            self.power if power is None else power,
            self.t_ambient,
            self.mounting,
            h_inside=self.h_inside,
        )

    def solution(self):
        """The enclosure solution over all candidates (a :class:`~workbench.housing.HousingSolution`)."""
        return self._solve()

    def heat_capacities(self) -> np.ndarray:
        """Heat capacity of each candidate's shell plus the contents. [J/K]"""
        a = self._arrays()
        bad = [c.material for c, v in zip(self.candidates, a["cp"] * a["rho"], strict=True)
               if not np.isfinite(v) or v <= 0]
        if bad:
            raise ValueError(
                f"specific_heat, density: materials {sorted(set(bad))} have no density or specific "
                "heat in the table; the warm-up needs both [kg/m³, J/(kg·K)]"
            )
        return np.asarray(
            housing_heat_capacity(
                self.length, self.width, self.height, a["t"], a["rho"], a["cp"],
                self.content_heat_capacity,
            ),
            float,
        ).reshape(len(self.candidates))

    def warm_up(self, time_step: float | None = None) -> WarmUp:
        """Warm-up of every candidate over the use session from room temperature.

        Returns a :class:`~workbench.housing.WarmUp` (candidates on axis 0,
        time on axis 1) of :func:`~workbench.housing.housing_warm_up` with
        the study's power, room and heat capacities (:meth:`heat_capacities`).
        """
        a = self._arrays()
        return housing_warm_up(
            self.length, self.width, self.height, a["t"], a["k"], a["eps"], self.power,
            self.t_ambient, self.heat_capacities(), self.session_duration, self.mounting,
            time_step=time_step, h_inside=self.h_inside,
        )

    def _touch_limits_per_candidate(self) -> tuple[list[str], np.ndarray]:
        a = self._arrays()
        classes = [
            touch_class(self.materials.loc[c.material, "family"], bool(a["coated"][i]))
            for i, c in enumerate(self.candidates)
        ]
        lim = np.array([self.touch_limits.lookup(cls, self.contact_duration).limit for cls in classes])
        return classes, lim

    def warm_up_frame(self, time_step: float | None = None, warm: WarmUp | None = None) -> pd.DataFrame:
        """Surface and inside-air temperatures [K] over the session [s] (long format).

        Columns ``candidate``, ``time``, ``t_surface``, ``t_air_inside``,
        ``touch_limit`` (the candidate's limit for the chosen contact
        duration). ``attrs["time_to_touch_limit"]`` maps each candidate to
        the time its mean surface reaches that limit [s] (``inf``: not within
        the session).
        """
        if warm is None:
            with warnings.catch_warnings():
                warnings.simplefilter("ignore", ValidityWarning)
                warm = self.warm_up(time_step)
        w = warm
        classes, lim = self._touch_limits_per_candidate()
        n, nt = len(self.candidates), w.time.size
        frame = pd.DataFrame(
            {
                "candidate": np.repeat(self.names, nt),
                "time": np.tile(w.time, n),
                "t_surface": w.t_surface.ravel(),
                "t_air_inside": w.t_air_inside.ravel(),
                "touch_limit": np.repeat(lim, nt),
                "touch_class": np.repeat(classes, nt),
            }
        )
        frame.attrs["units"] = {"time": "s", "t_surface": "K", "t_air_inside": "K",
                                "touch_limit": "K"}
        frame.attrs["time_to_touch_limit"] = dict(
            zip(self.names, np.asarray(w.time_to_limit(lim), float).tolist(), strict=True)
        )
        frame.attrs["session_duration"] = self.session_duration
        frame.attrs["cautions"] = HOUSING_CAUTIONS
        frame.attrs["assumptions"] = WARM_UP_ASSUMPTIONS
        return frame

    def emissivity_sensitivity(self, solution=None) -> np.ndarray:
        """∂T_surface/∂ε per candidate at its own emissivity [K].

        From the surface balance itself (implicit function theorem; see
        :func:`workbench.housing._emissivity_sensitivity`), so no further
        balance is solved; ``solution`` is :meth:`solution` when already at hand.
        """
        sol = self._solve() if solution is None else solution
        n = len(self.candidates)
        return np.broadcast_to(
            _emissivity_sensitivity(sol, self.length, self.width, self.height), (n,)
        ).copy()

    def _touch_limit_rows(self, coated) -> tuple[list[str], np.ndarray, list[str]]:
        """Touch class, touch limit [K] and readable source of the limit, per candidate."""
        resolve = _source_resolver()
        classes, lim, lim_src = [], [], []
        for i, c in enumerate(self.candidates):
            cls = touch_class(self.materials.loc[c.material, "family"], bool(coated[i]))
            row = self.touch_limits.lookup(cls, self.contact_duration)
            classes.append(cls)
            lim.append(row.limit)
            try:
                lim_src.append(resolve(row.source))
            except ValueError:
                lim_src.append(row.source)  # a user's free-text source (e.g. a product standard)
        return classes, np.array(lim), lim_src

    def _why_not(self, t_air, ts, t_hot, lim, classes, t_service_max) -> list[str]:
        """Why each candidate fails its inside-air, touch or service limit [K]; '' if none."""
        reasons = []
        for i, c in enumerate(self.candidates):
            why = []
            if self.t_inside_max is not None and t_air[i] > self.t_inside_max:
                why.append(
                    f"inside air {t_air[i] - _ZERO_C:.1f} °C above the limit "
                    f"{self.t_inside_max - _ZERO_C:.1f} °C"
                )
            if ts[i] > lim[i]:
                why.append(
                    f"mean surface {ts[i] - _ZERO_C:.1f} °C above the touch limit "
                    f"{lim[i] - _ZERO_C:.1f} °C ({classes[i]})"
                )
            if t_hot[i] > lim[i]:
                why.append(
                    f"hot spot {t_hot[i] - _ZERO_C:.1f} °C above the touch limit "
                    f"{lim[i] - _ZERO_C:.1f} °C ({classes[i]})"
                )
            if t_hot[i] > t_service_max[i]:
                why.append(
                    f"hot spot {t_hot[i] - _ZERO_C:.1f} °C above the service limit of "
                    f"{c.material} {t_service_max[i] - _ZERO_C:.0f} °C"
                )
            reasons.append("; ".join(why))
        return reasons

    def results(self, warm: WarmUp | None = None) -> pd.DataFrame:
        """One row per candidate: temperatures, hot spot, touch margins, mass, cost, pass/fail.

        Temperatures in K (columns ending ``_degC`` repeat them in °C for
        reading); units in ``attrs["units"]``, cautions in
        ``attrs["cautions"]``, assumptions in ``attrs["assumptions"]``,
        validity warnings met while solving in ``attrs["validity_warnings"]``.
        ``time_to_touch_limit`` [s] is when the mean surface reaches the touch
        limit during the use session (:meth:`warm_up`), ``inf`` when not
        within the session; ``t_surface_session_end`` [K] is the mean surface
        at the end of the session.
        """
        m, f = self.materials, self.finishes
        a = self._arrays()
        with warnings.catch_warnings(record=True) as caught:
            warnings.simplefilter("always", ValidityWarning)
            sol = self._solve()
            hs = None
            if self.component is not None:
                hs = hot_spot(sol, self.component.area, self.component.power)
            if warm is None:
                warm = self.warm_up()
        messages = sorted(
            {str(w.message) for w in caught if issubclass(w.category, ValidityWarning)}
        )
        for msg in messages:
            warnings.warn(f"housing study: {msg}", ValidityWarning, stacklevel=2)
        n = len(self.candidates)
        ts = np.broadcast_to(sol.t_surface, (n,))
        t_hot = np.broadcast_to(hs.t_hot_spot, (n,)) if hs is not None else ts.copy()
        classes, lim, lim_src = self._touch_limit_rows(a["coated"])
        # shell volume (all six faces, whatever the mounting)
        t = a["t"]
        v_out = self.length * self.width * self.height
        v_in = (self.length - 2 * t) * (self.width - 2 * t) * (self.height - 2 * t)
        mass = a["rho"] * (v_out - v_in)
        cost = a["cost_v"] * (v_out - v_in)
        sens = self.emissivity_sensitivity(sol)
        t_reach = np.asarray(warm.time_to_limit(lim), float).reshape(n)
        t_end = np.asarray(warm.t_surface, float).reshape(n, -1)[:, -1]
        t_service_max = m.loc[[c.material for c in self.candidates], "t_service_max"].to_numpy(
            float
        )
        t_air = np.broadcast_to(sol.t_air_inside, (n,))

        reasons = self._why_not(t_air, ts, t_hot, lim, classes, t_service_max)
        passes = np.array([not r for r in reasons])
        objectives = np.column_stack([t_air, t_hot, mass, cost])
        front = pareto_front(objectives) if np.all(np.isfinite(objectives)) else np.zeros(n, bool)

        frame = pd.DataFrame(
            {
                "candidate": self.names,
                "material": [c.material for c in self.candidates],
                "family": [m.loc[c.material, "family"] for c in self.candidates],
                "thickness": t,
                "finish": [c.finish or "as-is" for c in self.candidates],
                "emissivity": a["eps"],
                "conductivity": a["k"],
                "t_air_inside": t_air,
                "t_wall_inside": np.broadcast_to(sol.t_wall_inside, (n,)),
                "t_surface": ts,
                "t_hot_spot": t_hot,
                "t_air_inside_degC": t_air - _ZERO_C,
                "t_surface_degC": ts - _ZERO_C,
                "t_hot_spot_degC": t_hot - _ZERO_C,
                "hot_spot_rise": np.broadcast_to(hs.rise, (n,)) if hs is not None else np.zeros(n),
                "spreading_length": (
                    np.broadcast_to(hs.spreading_length, (n,))
                    if hs is not None
                    else np.full(n, np.nan)
                ),
                "biot_number": (
                    np.broadcast_to(hs.biot_number, (n,)) if hs is not None else np.full(n, np.nan)
                ),
                "h_convection": np.broadcast_to(sol.h_convection, (n,)),
                "h_radiation": np.broadcast_to(sol.h_radiation, (n,)),
                "radiation_share": np.broadcast_to(
                    np.asarray(sol.radiation_power) / max(self.power, 1e-300), (n,)
                ),
                "dt_surface_d_emissivity": sens,
                "mass": mass,
                "cost": cost,
                "heat_capacity": np.asarray(warm.heat_capacity, float).reshape(n),
                "t_surface_session_end": t_end,
                "t_surface_session_end_degC": t_end - _ZERO_C,
                "time_to_touch_limit": t_reach,
                "touch_class": classes,
                "touch_limit": lim,
                "touch_limit_degC": lim - _ZERO_C,
                "margin_surface": lim - ts,
                "margin_hot_spot": lim - t_hot,
                "passes": passes,
                "why_not": reasons,
                "pareto": front,
                "conductivity_source": [
                    m.loc[c.material, "conductivity_source"] for c in self.candidates
                ],
                "emissivity_source": [
                    m.loc[c.material, "emissivity_source"]
                    if c.finish is None
                    else f.loc[c.finish, "emissivity_source"]
                    for c in self.candidates
                ],
                "touch_limit_source": lim_src,
            }
        ).set_index("candidate")
        currency = sorted({str(c).strip() for c in m.get("currency", pd.Series(["EUR"])).dropna()} - {""})
        frame.attrs["units"] = _results_units("/".join(currency) or "EUR")
        frame.attrs["cautions"] = HOUSING_CAUTIONS
        frame.attrs["assumptions"] = HOUSING_ASSUMPTIONS + WARM_UP_ASSUMPTIONS
        frame.attrs["session_duration"] = self.session_duration
        frame.attrs["validity_warnings"] = tuple(messages)
        frame.attrs["pareto_objectives"] = ("t_air_inside", "t_hot_spot", "mass", "cost")
        return frame

    def emissivity_sweep(self, emissivities) -> pd.DataFrame:
        """Mean surface temperature [K] of each candidate over emissivities [-] (long format)."""
        e = in_range("emissivities", emissivities, 0.0, 1.0, "-").ravel()
        a = self._arrays()
        n = len(self.candidates)
        with warnings.catch_warnings():
            warnings.simplefilter("ignore", ValidityWarning)
            sol = solve_housing(
                self.length,
                self.width,
                self.height,
                a["t"][:, None],
                a["k"][:, None],
                e[None, :],
                self.power,
                self.t_ambient,
                self.mounting,
                h_inside=self.h_inside,
            )
        ts = np.broadcast_to(sol.t_surface, (n, e.size))
        frame = pd.DataFrame(
            {
                "candidate": np.repeat(self.names, e.size),
                "emissivity": np.tile(e, n),
                "t_surface": ts.ravel(),
                "t_air_inside": np.broadcast_to(sol.t_air_inside, (n, e.size)).ravel(),
            }
        )
        frame.attrs["units"] = {"emissivity": "-", "t_surface": "K", "t_air_inside": "K"}
        frame.attrs["cautions"] = HOUSING_CAUTIONS
        return frame

    def power_sweep(self, powers) -> pd.DataFrame:
        """Surface, inside-air and hot-spot temperatures [K] over dissipated powers [W] (long format).

        The component keeps its share of the power (component power / study power).
        """
        p = finite("powers", powers, "W").ravel()
        if np.any(p < 0):
            raise ValueError("powers: must be >= 0 W")
        a = self._arrays()
        n = len(self.candidates)
        with warnings.catch_warnings():
            warnings.simplefilter("ignore", ValidityWarning)
            sol = solve_housing(
                self.length,
                self.width,
                self.height,
                a["t"][:, None],
                a["k"][:, None],
                a["eps"][:, None],
                p[None, :],
                self.t_ambient,
                self.mounting,
                h_inside=self.h_inside,
            )
            if self.component is not None and self.power > 0:
                share = self.component.power / self.power
                t_hot = np.asarray(
                    hot_spot(sol, self.component.area, share * p[None, :]).t_hot_spot
                )
            else:
                t_hot = np.asarray(sol.t_surface)
        shape = (n, p.size)
        frame = pd.DataFrame(
            {
                "candidate": np.repeat(self.names, p.size),
                "power": np.tile(p, n),
                "t_surface": np.broadcast_to(sol.t_surface, shape).ravel(),
                "t_air_inside": np.broadcast_to(sol.t_air_inside, shape).ravel(),
                "t_hot_spot": np.broadcast_to(t_hot, shape).ravel(),
            }
        )
        frame.attrs["units"] = {
            "power": "W",
            "t_surface": "K",
            "t_air_inside": "K",
            "t_hot_spot": "K",
        }
        frame.attrs["cautions"] = HOUSING_CAUTIONS
        return frame

    def touch_limits_frame(self) -> pd.DataFrame:
        """The touch limits in use (limit in K and °C, duration in s) with their sources."""
        frame = pd.DataFrame(self.touch_limits.as_records())
        frame["limit_degC"] = frame["limit"] - _ZERO_C
        frame.attrs["units"] = {"contact_duration": "s", "limit": "K", "limit_degC": "°C"}
        frame.attrs["cautions"] = (TOUCH_CAUTION,)
        return frame
