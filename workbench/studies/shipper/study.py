"""Insulated-shipper study: hold time, coolant sizing, box size and freight cost.

The question is not "which foam has the lowest k" but "which build-up keeps
this payload in range for the whole trip at the lowest landed cost per
shipment". For every candidate wall and every insulation thickness of a
sweep the study

1. sizes the coolant for the target duration (closed form, with a safety
   factor), iterating because the coolant layer makes the box bigger,
2. builds the box: payload space + coolant layer + wall layers → outer
   dimensions, actual mass, billable (dimensional) mass, landed cost,
3. checks every design with the time-stepped two-node model
   (:func:`workbench.transient.simulate_hold`, all designs in one call):
   hold time, and why the hold ends (coolant spent, payload too warm or cold),
4. picks per candidate the thickness with the lowest landed cost that meets
   the hold time.

Inputs are plain SI state (m, kg, K, s, J); results are DataFrames with units
in ``attrs["units"]``, and the cautions travel with them. The study holds no
widgets; :func:`cost_figure` (plotly, imported lazily) draws cost against
thickness with each candidate's minimum marked.

Caution: results are estimates for comparing designs. Packaging for medicines
and other temperature-sensitive goods is qualified by testing under the
applicable distribution rules.
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field

import numpy as np
import pandas as pd

from workbench import freight, transient
from workbench._checks import finite, nonnegative, positive
from workbench.air_layers import AirLayer
from workbench.coolants import load_coolants
from workbench.geometry import VacuumPanel, layered_box_conductance
from workbench.studies.wall import Layer

__all__ = [
    "ShipperCandidate",
    "ShipperStudy",
    "ShipperResults",
    "SHIPPER_ASSUMPTIONS",
    "GENERAL_CAUTIONS",
    "SINGLE_PROFILE",
    "TRACE_CAUTION",
]

#: Name of the one profile of a study made with ``t_ambient`` only.
SINGLE_PROFILE = "ambient"
#: Shown with every calculated trace.
TRACE_CAUTION = (
    "A calculated trace does not qualify a shipper; the qualification test under the applicable "
    "distribution rules does."
)

#: Assumptions every shipper result rests on.
SHIPPER_ASSUMPTIONS = (
    "Box conductance: faces, edges and corners by conduction shape factors "
    "(workbench.geometry.layered_box_conductance) around the inner space (payload + coolant layer), "
    "with still-air surface resistances on both sides.",
    "Air gaps enter as an equivalent conductivity d/R from the ISO 6946 air-layer method at the "
    "design mean temperature, heat flow horizontal (the side walls dominate), 5 K across the gap.",
    "Coolant sized by the closed-form energy balance (latent heat only) times the safety factor; "
    "the coolant packs form a uniform layer around the payload space at the stated packing fraction.",
    "Every design is checked by the time-stepped two-node model (payload node and coolant node, "
    "coupling conductance = coefficient × payload surface area); the hold ends when the coolant is "
    "spent or the payload leaves its range, whichever comes first.",
    "Billable mass = max(actual, outer volume / divisor), rounded up to the carrier's increment.",
    "Material and coolant costs are demo values; freight rate and divisor are user inputs.",
)

#: Cautions shown with every shipper result.
GENERAL_CAUTIONS = (
    "Estimate only: a shipper for medicines or other temperature-sensitive goods is qualified by "
    "testing (thermal chamber and field trials) under the applicable distribution rules before use.",
)


@dataclass(frozen=True)
class ShipperCandidate:
    """A named wall build-up, inside to outside, with exactly one sized layer.

    Layers are :class:`workbench.studies.wall.Layer` (material id; thickness
    ``None`` for the sized layer), :class:`workbench.air_layers.AirLayer`
    or :class:`workbench.geometry.VacuumPanel` (fixed thicknesses).
    """

    name: str
    layers: tuple

    def __post_init__(self):
        if not self.layers:
            raise ValueError(f"candidate {self.name!r}: layers: give at least one layer")
        for lay in self.layers:
            if not isinstance(lay, Layer | AirLayer | VacuumPanel):
                raise ValueError(
                    f"candidate {self.name!r}: layers: expected Layer, AirLayer or VacuumPanel, got {lay!r}"
                )
        sized = [
            i
            for i, lay in enumerate(self.layers)
            if isinstance(lay, Layer) and lay.thickness is None
        ]
        if len(sized) != 1:
            raise ValueError(
                f"candidate {self.name!r}: needs exactly one Layer without a thickness (the layer to size), "
                f"found {len(sized)}"
            )

    @property
    def sized_index(self) -> int:
        return next(
            i
            for i, lay in enumerate(self.layers)
            if isinstance(lay, Layer) and lay.thickness is None
        )


@dataclass(frozen=True)
class ShipperResults:
    """Frames of one study run, with the cautions that go with them.

    Attributes
    ----------
    sweep : DataFrame
        One row per candidate and sized thickness.
    optimum : DataFrame
        One row per candidate: the cheapest thickness that meets the hold time.
    cautions : tuple of str
        Warnings to show beside the numbers.
    assumptions : tuple of str
        What the numbers rest on.
    by_profile : DataFrame
        One row per candidate, sized thickness and named ambient profile:
        ``hold_time_simulated`` [s], ``end_reason``, ``meets_target``,
        ``time_coolant_spent`` [s], ``time_out_of_range`` [s],
        ``min_payload_temperature`` / ``max_payload_temperature`` [K].
        A design meets the target only if it meets it under every profile.
    """

    sweep: pd.DataFrame
    optimum: pd.DataFrame
    cautions: tuple[str, ...]
    assumptions: tuple[str, ...] = SHIPPER_ASSUMPTIONS
    by_profile: pd.DataFrame | None = None


_SWEEP_UNITS = {
    "thickness": "m",
    "wall_thickness": "m",
    "conductance": "W/K",
    "coolant_mass": "kg",
    "coolant_layer": "m",
    "outer_length": "m",
    "outer_width": "m",
    "outer_height": "m",
    "outer_volume": "m³",
    "wall_mass": "kg",
    "actual_mass": "kg",
    "dimensional_mass": "kg",
    "billable_mass": "kg",
    "packaging_cost": "currency",
    "coolant_cost": "currency",
    "freight_cost": "currency",
    "landed_cost": "currency",
    "hold_time_closed_form": "s",
    "hold_time_simulated": "s",
    "time_coolant_spent": "s",
    "time_out_of_range": "s",
    "min_payload_temperature": "K",
    "max_payload_temperature": "K",
}


@dataclass
class ShipperStudy:
    """Compare insulated-shipper build-ups on hold time and landed cost.

    Parameters
    ----------
    candidates : sequence of ShipperCandidate
        Wall build-ups to compare.
    materials : DataFrame
        :func:`workbench.materials.load_materials`.
    coolant : str
        Coolant id in :func:`workbench.coolants.load_coolants`.
    payload_length, payload_width, payload_height : float
        Payload space. [m]
    payload_mass : float
        Payload mass (with its inner packaging). [kg]
    payload_specific_heat : float
        Mean specific heat of the payload. [J/(kg·K)]
    t_payload_min, t_payload_max : float or None
        Allowed payload range; ``None`` for no limit on that side. [K]
    t_payload_start : float
        Payload temperature when packed. [K]
    t_ambient : float or (array, array)
        Ambient temperature or step profile ``(times_s, temperatures_K)``. [K]
        With ``ambient_profiles`` leave it at its default: it then becomes
        the first named profile.
    duration : float
        Required hold time. [s]
    thicknesses : array
        Sweep of the sized layer's thickness. [m]
    safety_factor : float
        Multiplier on the sized coolant mass, >= 1. [-]
    coolant_packing_fraction : float
        Share of the coolant space filled by coolant, (0, 1]. [-]
    t_coolant_start : float or None
        Coolant temperature when packed; ``None``: conditioned at its phase
        change (solid). [K]
    r_si, r_se : float
        Surface resistances inside and outside (still air by default). [m²·K/W]
    coupling_coefficient : float
        Payload-to-coolant heat-transfer coefficient over the payload surface. [W/(m²·K)]
    coolant_wall_fraction : float
        Share of the box conductance that reaches the coolant directly, 0–1;
        default 0.8 (packs cover the faces, not the edges and corners: a
        common-practice guess). [-]
    divisor : float
        Dimensional divisor of the freight contract. [m³/kg]
    mass_increment : float
        The carrier's rounding step for the billable mass. [kg]
    rate_per_kg : float
        Freight rate per billable kg. [currency/kg]
    fixed_fee : float
        Fixed freight charge per shipment. [currency]
    time_step : float
        Step of the simulation. [s]
    coolants : DataFrame, optional
        Coolants table (default: :func:`workbench.coolants.load_coolants`).
    ambient_profiles : mapping of str to profile, optional
        Several named ambient profiles at once, e.g. ``{"summer": (times_s,
        temps_K), "winter": ...}`` (each a temperature [K] or step profile as
        ``t_ambient``; :func:`workbench.load_ambient_profile` reads a logger
        file). The coolant is sized for the most demanding profile, every
        design is simulated under each, and a design meets the target only
        if it holds under all of them. ``None``: the one profile
        ``t_ambient``, named :data:`SINGLE_PROFILE`.
    """

    candidates: Sequence[ShipperCandidate]
    materials: pd.DataFrame
    coolant: str = "pcm_plus5"
    payload_length: float = 0.30
    payload_width: float = 0.20
    payload_height: float = 0.15
    payload_mass: float = 3.0
    payload_specific_heat: float = 3500.0
    t_payload_min: float | None = 275.15
    t_payload_max: float | None = 281.15
    t_payload_start: float = 278.15
    t_ambient: object = 298.15
    duration: float = 48 * 3600.0
    thicknesses: np.ndarray = field(
        default_factory=lambda: np.round(np.arange(0.01, 0.1001, 0.005), 4)
    )
    safety_factor: float = 1.2
    coolant_packing_fraction: float = 0.8
    t_coolant_start: float | None = None
    r_si: float = 0.13
    r_se: float = 0.13
    coupling_coefficient: float = 5.0
    coolant_wall_fraction: float = 0.8
    divisor: float = 0.005
    mass_increment: float = 0.5
    rate_per_kg: float = 1.5
    fixed_fee: float = 5.0
    time_step: float = 300.0
    coolants: pd.DataFrame | None = None
    ambient_profiles: Mapping[str, object] | None = None

    def __post_init__(self):
        self.candidates = list(self.candidates)
        if not self.candidates:
            raise ValueError("candidates: give at least one ShipperCandidate")
        for c in self.candidates:
            if not isinstance(c, ShipperCandidate):
                raise ValueError(f"candidates: expected ShipperCandidate, got {c!r}")
        names = [c.name for c in self.candidates]
        dup = sorted({n for n in names if names.count(n) > 1})
        if dup:
            raise ValueError(f"candidates: duplicate names {dup}")
        used = {lay.material for c in self.candidates for lay in c.layers if isinstance(lay, Layer)}
        unknown = sorted(used - set(self.materials.index))
        if unknown:
            raise ValueError(
                f"candidates: unknown material ids {unknown}; see load_materials().index"
            )
        if self.coolants is None:
            self.coolants = load_coolants()
        if self.coolant not in self.coolants.index:
            raise ValueError(
                f"coolant: unknown id {self.coolant!r}; valid: {list(self.coolants.index)}"
            )
        for name in (
            "payload_length",
            "payload_width",
            "payload_height",
            "payload_mass",
            "payload_specific_heat",
            "duration",
            "divisor",
            "mass_increment",
            "time_step",
            "coupling_coefficient",
        ):
            _one(name, getattr(self, name), positive)
        for name in ("r_si", "r_se", "rate_per_kg", "fixed_fee"):
            _one(name, getattr(self, name), nonnegative)
        _one("coolant_wall_fraction", self.coolant_wall_fraction, finite)
        if not 0.0 <= self.coolant_wall_fraction <= 1.0:
            raise ValueError(
                f"coolant_wall_fraction: must lie in [0, 1] [-], got {self.coolant_wall_fraction!r}"
            )
        _one("coolant_packing_fraction", self.coolant_packing_fraction, finite)
        if not 0.0 < self.coolant_packing_fraction <= 1.0:
            raise ValueError(
                "coolant_packing_fraction: must lie in (0, 1] [-] (share of the coolant space "
                f"filled), got {self.coolant_packing_fraction!r}"
            )
        sf = _one("safety_factor", self.safety_factor, finite)
        if not 1.0 <= sf <= 10.0:
            raise ValueError(
                f"safety_factor: must lie in [1, 10] [-] (a multiplier: 1.2 for 20 % extra), got {sf:g}"
            )
        for name in ("t_payload_min", "t_payload_max", "t_payload_start", "t_coolant_start"):
            value = getattr(self, name)
            if value is None and name != "t_payload_start":
                continue
            _one(name, value, positive)
            lo_t, hi_t = transient.TEMPERATURE_RANGE
            if not lo_t <= float(value) <= hi_t:
                raise ValueError(
                    f"{name}: must lie in [{lo_t:g}, {hi_t:g}] K, got {float(value):g} K; "
                    "temperatures are absolute, in kelvin (°C + 273.15)"
                )
        lo = -np.inf if self.t_payload_min is None else float(self.t_payload_min)
        hi = np.inf if self.t_payload_max is None else float(self.t_payload_max)
        if lo >= hi:
            raise ValueError(
                "t_payload_min, t_payload_max: the payload range is inverted (min must be below max) [K]"
            )
        if not lo <= self.t_payload_start <= hi:
            raise ValueError("t_payload_start: must lie within the payload range [K]")
        thk = positive("thicknesses", self.thicknesses, "m")
        if thk.ndim > 1 or thk.size == 0:
            raise ValueError(
                f"thicknesses: expected a list of one or more thicknesses [m], got shape {thk.shape}"
            )
        self.thicknesses = np.atleast_1d(thk)
        # the profiles, normalised to (times_s, temperatures_K) lists (a constant stays a float)
        if self.ambient_profiles is not None:
            if not isinstance(self.ambient_profiles, Mapping) or not self.ambient_profiles:
                raise ValueError(
                    "ambient_profiles: expected a mapping of names to profiles, e.g. "
                    "{'summer': (times_s, temps_K), 'winter': ...}, with at least one entry"
                )
            named = {}
            for name, prof in self.ambient_profiles.items():
                if not isinstance(name, str) or not name.strip():
                    raise ValueError(f"ambient_profiles: names must be non-empty text, got {name!r}")
                try:
                    named[name.strip()] = _normalise_profile(prof)
                except ValueError as exc:
                    raise ValueError(f"ambient_profiles[{name!r}]: {exc}") from None
            first = next(iter(named.values()))
            if not _same_profile(self.t_ambient, 298.15) and not _same_profile(self.t_ambient, first):
                raise ValueError(
                    "t_ambient: give either t_ambient (one profile) or ambient_profiles (named "
                    "profiles), not both; with ambient_profiles t_ambient becomes the first profile"
                )
            self.ambient_profiles = named
            self.t_ambient = first
        else:
            self.t_ambient = _normalise_profile(self.t_ambient)
        self._check_work()
        usable = []
        for name, prof in self.profiles.items():
            times, temps = transient.ambient_profile(prof)
            try:
                self._check_coolant_used(times, temps)
                usable.append(name)
            except ValueError as exc:
                last = exc
        if not usable:
            raise last

    def _check_work(self) -> None:
        """Refuse, before computing, runs beyond the simulation's work limits."""
        # hold_curve runs for twice the duration, the longest run the study makes
        steps = 2.0 * self.duration / self.time_step
        if steps > transient.MAX_STEPS:
            raise ValueError(
                f"time_step: the study simulates up to 2 × duration = {2 * self.duration:g} s in steps "
                f"of {self.time_step:g} s = {steps:,.0f} time steps; the limit is "
                f"{transient.MAX_STEPS:,} (workbench.transient.MAX_STEPS). Use a time_step of at least "
                f"{2 * self.duration / transient.MAX_STEPS:.4g} s or a shorter duration"
            )
        designs = len(self.candidates) * self.thicknesses.size
        cells = designs * int(np.ceil(steps))  # per profile: each is one simulate_hold call
        if cells > transient.MAX_CELLS:
            raise ValueError(
                f"thicknesses: {len(self.candidates)} candidates × {self.thicknesses.size} thicknesses "
                f"× {int(np.ceil(steps)):,} time steps = {cells:,} cells; the limit is "
                f"{transient.MAX_CELLS:,} (workbench.transient.MAX_CELLS). Use fewer thicknesses or "
                "candidates, a larger time_step or a shorter duration"
            )

    def _check_coolant_used(self, times: np.ndarray, temps: np.ndarray) -> None:
        """The study sizes coolant that melts; refuse a case where none can melt."""
        tpc = float(self.coolant_row["t_phase_change"])
        during = temps[times < self.duration]
        if during.max() <= tpc and self.t_payload_start <= tpc:
            raise ValueError(
                f"t_ambient: never above the coolant's phase change ({tpc - 273.15:.1f} °C) within "
                "the duration, so no coolant melts and none can be sized; this study keeps a payload "
                "cool: choose a coolant with a lower phase-change temperature"
            )

    # -- properties -----------------------------------------------------------
    @property
    def names(self) -> list[str]:
        return [c.name for c in self.candidates]

    @property
    def profiles(self) -> dict[str, object]:
        """Named ambient profiles (one, :data:`SINGLE_PROFILE`, without ``ambient_profiles``)."""
        if self.ambient_profiles is None:
            return {SINGLE_PROFILE: self.t_ambient}
        return dict(self.ambient_profiles)

    @property
    def coolant_row(self) -> pd.Series:
        return self.coolants.loc[self.coolant]

    @property
    def payload_heat_capacity(self) -> float:
        """Payload heat capacity. [J/K]"""
        return float(self.payload_mass * self.payload_specific_heat)

    @property
    def coupling_conductance(self) -> float:
        """Payload-to-coolant conductance: coefficient × payload surface area. [W/K]"""
        a, b, c = self.payload_length, self.payload_width, self.payload_height
        return float(self.coupling_coefficient * 2.0 * (a * b + a * c + b * c))

    def _design_t_mean(self) -> float:
        times, temps = transient.ambient_profile(self.t_ambient)
        return 0.5 * (float(np.mean(temps)) + float(self.coolant_row["t_phase_change"]))

    # -- layers ---------------------------------------------------------------
    def _layers(self, cand: ShipperCandidate, sized: np.ndarray):
        """Thicknesses, conductivities, densities, costs per m³: arrays (n_thk, n_layers)."""
        m = self.materials
        n = sized.size
        t_mean = self._design_t_mean()
        cols = {"t": [], "k": [], "rho": [], "cost": []}
        for j, lay in enumerate(cand.layers):
            if isinstance(lay, Layer):
                row = m.loc[lay.material]
                t = sized if j == cand.sized_index else np.full(n, lay.thickness)
                k, rho, cost = row["conductivity"], row["density"], _cost_per_volume(row)
            elif isinstance(lay, AirLayer):
                t = np.full(n, lay.thickness)
                r = float(lay.resistance(t_mean + 2.5, t_mean - 2.5))
                k, rho, cost = (
                    lay.thickness / r,
                    float(m.loc["air", "density"]) if "air" in m.index else 1.2,
                    0.0,
                )
            else:  # VacuumPanel: core density and cost of the table's fumed-silica panel
                t = np.full(n, lay.thickness)
                k = lay.conductivity
                row = m.loc["vip_centre"] if "vip_centre" in m.index else None
                rho = float(row["density"]) if row is not None else 190.0
                cost = _cost_per_volume(row) if row is not None else 0.0
            cols["t"].append(np.asarray(t, float))
            cols["k"].append(np.full(n, float(k)))
            cols["rho"].append(np.full(n, float(rho)))
            cols["cost"].append(np.full(n, float(cost)))
        return {key: np.stack(v, axis=-1) for key, v in cols.items()}

    def _closed_form_hold(self, conductance, mass) -> np.ndarray:
        """Closed-form hold time [s] under the most demanding named profile (the shortest)."""
        row = self.coolant_row
        return np.min(
            [
                np.asarray(
                    transient.hold_time(
                        conductance,
                        prof,
                        mass,
                        float(row["latent_heat"]),
                        float(row["t_phase_change"]),
                        self.payload_heat_capacity,
                        self.t_payload_start,
                    ),
                    float,
                )
                for prof in self.profiles.values()
            ],
            axis=0,
        )

    def _box(self, lay: dict, coolant_mass: np.ndarray) -> dict:
        """Inner dims, conductance and outer box for coolant masses (n_thk,)."""
        row = self.coolant_row
        vol = coolant_mass / float(row["density"]) / self.coolant_packing_fraction
        tc = np.asarray(
            freight.coolant_layer_thickness(
                self.payload_length, self.payload_width, self.payload_height, vol
            ),
            float,
        )
        a = self.payload_length + 2 * tc
        b = self.payload_width + 2 * tc
        c = self.payload_height + 2 * tc
        ua = layered_box_conductance(a, b, c, lay["t"], lay["k"], self.r_si, self.r_se).total
        return {"coolant_layer": tc, "a": a, "b": b, "c": c, "conductance": np.asarray(ua, float)}

    def _size(self, lay: dict) -> tuple[np.ndarray, dict]:
        """Coolant mass for the target with the box grown by its own coolant (fixed point)."""
        row = self.coolant_row
        n = lay["t"].shape[0]
        mass = np.full(n, 0.5)
        for _ in range(30):
            box = self._box(lay, mass)
            new = np.max(
                [
                    np.asarray(
                        transient.coolant_mass_for_duration(
                            self.duration,
                            box["conductance"],
                            prof,
                            float(row["latent_heat"]),
                            float(row["t_phase_change"]),
                            self.payload_heat_capacity,
                            self.t_payload_start,
                            self.safety_factor,
                        ),
                        float,
                    )
                    for prof in self.profiles.values()
                ],
                axis=0,
            )
            if np.allclose(new, mass, rtol=1e-6, atol=1e-9):
                mass = new
                break
            mass = new
        if np.any(mass <= 0):
            raise ValueError(
                "t_ambient, t_payload_start: no coolant melts within the duration for some designs "
                "(ambient not above the phase change long enough), so none can be sized; choose a "
                "coolant with a lower phase-change temperature"
            )
        return mass, self._box(lay, mass)

    # -- the sweep ------------------------------------------------------------
    def sweep(self, progress=None, cancel=None) -> pd.DataFrame:
        """Every candidate × thickness: coolant, box, masses, costs and simulated hold.

        With several named profiles the hold columns (``hold_time_simulated``,
        ``end_reason``, ``time_coolant_spent``, ``time_out_of_range``) are
        those of the limiting profile (named in ``limiting_profile``),
        ``meets_target`` is true only if the design holds under every profile
        and ``failing_profiles`` lists those it does not hold under; the
        per-profile rows are in :attr:`ShipperResults.by_profile`.

        ``progress(fraction)`` and ``cancel()`` (optional) are passed to the
        time-stepped simulation (:func:`workbench.transient.simulate_hold`),
        which takes most of the time; a True ``cancel()`` raises
        :class:`workbench._checks.Cancelled`.

        Returns
        -------
        DataFrame
            One row per candidate and sized thickness; units in ``attrs["units"]``.
        """
        return self._sweep_all(progress, cancel)[0]

    def _sweep_all(self, progress=None, cancel=None) -> tuple[pd.DataFrame, pd.DataFrame]:
        """The sweep and its per-profile rows."""
        row = self.coolant_row
        frames = []
        designs = []
        for cand in self.candidates:
            lay = self._layers(cand, self.thicknesses)
            mass, box = self._size(lay)
            wall_t = lay["t"].sum(axis=-1)
            outer = freight.outer_dimensions(
                self.payload_length,
                self.payload_width,
                self.payload_height,
                box["coolant_layer"],
                wall_t,
            )
            wall_m = np.asarray(
                freight.wall_mass(box["a"], box["b"], box["c"], lay["t"], lay["rho"]), float
            )
            vols = _layer_volumes(box["a"], box["b"], box["c"], lay["t"])
            pack_cost = (vols * lay["cost"]).sum(axis=-1)
            actual = wall_m + mass + self.payload_mass
            lo_, wo_, ho_ = outer[..., 0], outer[..., 1], outer[..., 2]
            billable = np.asarray(freight.billable_mass(lo_, wo_, ho_, actual, self.divisor), float)
            billed = np.asarray(freight.round_up_mass(billable, self.mass_increment), float)
            coolant_cost = mass * float(row["cost"])
            landed = np.asarray(
                freight.landed_cost(
                    pack_cost, coolant_cost, billed, self.rate_per_kg, self.fixed_fee
                ),
                float,
            )
            hold_cf = self._closed_form_hold(box["conductance"], mass)
            frames.append(
                pd.DataFrame(
                    {
                        "candidate": cand.name,
                        "thickness": self.thicknesses,
                        "wall_thickness": wall_t,
                        "conductance": box["conductance"],
                        "coolant_mass": mass,
                        "coolant_layer": box["coolant_layer"],
                        "outer_length": lo_,
                        "outer_width": wo_,
                        "outer_height": ho_,
                        "outer_volume": lo_ * wo_ * ho_,
                        "wall_mass": wall_m,
                        "actual_mass": actual,
                        "dimensional_mass": lo_ * wo_ * ho_ / self.divisor,
                        "billable_mass": billed,
                        "packaging_cost": pack_cost,
                        "coolant_cost": coolant_cost,
                        "freight_cost": self.rate_per_kg * billed + self.fixed_fee,
                        "landed_cost": landed,
                        "hold_time_closed_form": hold_cf,
                    }
                )
            )
            designs.append((box["conductance"], mass))
        frame = pd.concat(frames, ignore_index=True)
        per = self._simulate_profiles(
            np.concatenate([d[0] for d in designs]),
            np.concatenate([d[1] for d in designs]),
            progress=progress,
            cancel=cancel,
        )
        _combine_profiles(frame, per, self.duration)
        frame.attrs["units"] = dict(
            _SWEEP_UNITS,
            **{
                k: f"{row['currency']}"
                for k in ("packaging_cost", "coolant_cost", "freight_cost", "landed_cost")
            },
        )
        frame.attrs["assumptions"] = SHIPPER_ASSUMPTIONS
        frame.attrs["profiles"] = list(self.profiles)
        long = []
        for name, sim in per.items():
            long.append(
                pd.DataFrame(
                    {
                        "candidate": frame["candidate"],
                        "thickness": frame["thickness"],
                        "profile": name,
                        "hold_time_simulated": sim.hold_time,
                        "end_reason": sim.reason,
                        "meets_target": sim.hold_time >= self.duration * (1 - 1e-9),
                        "time_coolant_spent": sim.time_coolant_spent,
                        "time_out_of_range": sim.time_out_of_range,
                        "min_payload_temperature": sim.payload_temperature.min(axis=-1),
                        "max_payload_temperature": sim.payload_temperature.max(axis=-1),
                    }
                )
            )
        by_profile = pd.concat(long, ignore_index=True)
        by_profile.attrs["units"] = {
            "thickness": "m",
            "hold_time_simulated": "s",
            "time_coolant_spent": "s",
            "time_out_of_range": "s",
            "min_payload_temperature": "K",
            "max_payload_temperature": "K",
        }
        return frame, by_profile

    def _simulate_profiles(
        self, conductance, coolant_mass, duration=None, progress=None, cancel=None, record_every=None
    ) -> dict[str, transient.HoldSimulation]:
        """One :meth:`simulate` per named profile; progress split evenly over them."""
        out = {}
        n = len(self.profiles)
        for i, (name, prof) in enumerate(self.profiles.items()):
            part = None if progress is None else (lambda f, i=i: progress((i + f) / n))
            out[name] = self.simulate(
                conductance,
                coolant_mass,
                duration=duration,
                progress=part,
                cancel=cancel,
                t_ambient=prof,
                record_every=record_every,
            )
        return out

    def simulate(
        self,
        conductance,
        coolant_mass,
        duration: float | None = None,
        progress=None,
        cancel=None,
        t_ambient=None,
        record_every: int | None = None,
    ) -> transient.HoldSimulation:
        """Time-stepped check of designs (arrays of conductance [W/K] and coolant mass [kg]).

        ``t_ambient``: one profile (default the study's ``t_ambient``, the
        first named profile); ``record_every``: store every n-th step
        (default about every 30 min).
        """
        row = self.coolant_row
        every = max(1, int(round(1800.0 / self.time_step))) if record_every is None else record_every
        return transient.simulate_hold(
            conductance,
            self.t_ambient if t_ambient is None else t_ambient,
            coolant_mass,
            float(row["latent_heat"]),
            float(row["t_phase_change"]),
            self.duration if duration is None else duration,
            self.time_step,
            specific_heat_solid=float(row["specific_heat_solid"]),
            specific_heat_liquid=float(row["specific_heat_liquid"]),
            payload_heat_capacity=self.payload_heat_capacity,
            coupling_conductance=self.coupling_conductance,
            coolant_wall_fraction=self.coolant_wall_fraction,
            t_coolant_start=self.t_coolant_start,
            t_payload_start=self.t_payload_start,
            t_payload_min=self.t_payload_min,
            t_payload_max=self.t_payload_max,
            record_every=every,
            progress=progress,
            cancel=cancel,
        )

    def hold_curve(self, coolant_mass: float, progress=None, cancel=None) -> pd.DataFrame:
        """Hold time against thickness for each candidate with a fixed coolant mass.

        Returns closed-form and simulated hold times [s] (the simulation runs
        for twice the target duration, so longer holds show up to that); with
        several named profiles the shortest hold, its ``end_reason`` and
        ``limiting_profile``.
        ``progress``/``cancel`` as in :meth:`sweep`.
        """
        mass = float(positive("coolant_mass", coolant_mass, "kg"))
        frames = []
        for cand in self.candidates:
            lay = self._layers(cand, self.thicknesses)
            box = self._box(lay, np.full(self.thicknesses.size, mass))
            hold = self._closed_form_hold(box["conductance"], mass)
            frames.append(
                pd.DataFrame(
                    {
                        "candidate": cand.name,
                        "thickness": self.thicknesses,
                        "conductance": box["conductance"],
                        "hold_time_closed_form": hold,
                    }
                )
            )
        frame = pd.concat(frames, ignore_index=True)
        per = self._simulate_profiles(
            frame["conductance"].to_numpy(),
            mass,
            duration=2 * self.duration,
            progress=progress,
            cancel=cancel,
        )
        _combine_profiles(frame, per, 2 * self.duration, minimal=True)
        frame.attrs["units"] = {
            "thickness": "m",
            "conductance": "W/K",
            "hold_time_closed_form": "s",
            "hold_time_simulated": "s",
        }
        return frame

    def thickness_for_target(self, coolant_mass: float) -> pd.Series:
        """Sized-layer thickness [m] per candidate that holds for the target with a fixed coolant mass.

        NaN where the largest thickness of the sweep is not enough; the
        largest over the named profiles (closed form: coolant spent only).
        """
        mass = float(positive("coolant_mass", coolant_mass, "kg"))
        row = self.coolant_row
        out = {}
        for cand in self.candidates:

            def ua_of(d, cand=cand):
                d = np.asarray(d, float)
                lay = self._layers(cand, d.ravel())
                return self._box(lay, np.full(d.size, mass))["conductance"].reshape(d.shape)

            out[cand.name] = max(
                float(
                    transient.thickness_for_duration(
                        self.duration,
                        ua_of,
                        prof,
                    mass,
                    float(row["latent_heat"]),
                    float(row["t_phase_change"]),
                    thickness_max=float(self.thicknesses.max()),
                    thickness_min=float(self.thicknesses.min()) / 10,
                    payload_heat_capacity=self.payload_heat_capacity,
                    t_payload_start=self.t_payload_start,
                    on_impossible="nan",
                    )
                )
                for prof in self.profiles.values()
            )
        s = pd.Series(out, name="thickness")
        s.attrs["units"] = {"thickness": "m"}
        return s

    def cautions(
        self, sweep: pd.DataFrame | None = None, by_profile: pd.DataFrame | None = None
    ) -> tuple[str, ...]:
        """Warnings that go with this study's results (strings).

        With ``by_profile`` every failing end reason is named per profile, the
        payload too cold (freezing) as prominently as the coolant spent.
        """
        row = self.coolant_row
        out = list(GENERAL_CAUTIONS)
        tpc = float(row["t_phase_change"])
        lo = self.t_payload_min
        if (
            row["phase_change"] == "melting"
            and tpc <= 273.15 + 0.5
            and lo is not None
            and lo > 273.15
        ):
            out.append(
                f"Frozen water-based packs ({row['name']}) with a payload that must stay above "
                f"{lo - 273.15:.0f} °C: risk of freezing the payload. Common practice: condition the packs "
                "(let them warm until they start to melt) and keep them out of direct contact with the payload."
            )
        if self.t_coolant_start is not None and self.t_coolant_start < tpc and lo is not None:
            out.append(
                "Coolant packed colder than its phase change: check the payload's low limit in the simulation."
            )
        if row["phase_change"] == "sublimation":
            out.append(
                "Dry ice sublimes to CO2 gas: never use a gas-tight box (it can burst), ventilate vehicles "
                "and rooms (asphyxiation risk), wear insulated gloves; for air transport it is dangerous "
                "goods (UN 1845, Class 9): mark the net mass of dry ice and follow the carrier's and IATA rules."
            )
        if "demo" in str(row["latent_heat_source"]) and "demo" not in str(row["cautions"]).lower():
            out.append(
                f"{row['name']}: generic demo property values; use the product's measured data."
            )
        out.append(row["cautions"])
        if sweep is not None:
            cold = sweep["end_reason"] == "payload too cold"
            if cold.any():
                out.append(
                    f"{int(cold.sum())} design(s) chill the payload below its range in the simulation "
                    "(see end_reason): condition the coolant or separate it from the payload."
                )
            if not sweep["meets_target"].any():
                out.append(
                    "No design in the sweep meets the hold time: widen the thickness range or change the coolant."
                )
        if by_profile is not None:
            for reason, advice in (
                ("payload too cold", "condition the coolant, separate it from the payload or add insulation"),
                ("coolant spent", "add coolant or insulation"),
                ("payload too warm", "add insulation or move the coolant closer to the payload"),
            ):
                hit = by_profile[
                    (by_profile["end_reason"] == reason) & ~by_profile["meets_target"].astype(bool)
                ]
                for prof, grp in hit.groupby("profile", sort=False):
                    out.append(
                        f"{reason.upper()} under the {prof!r} profile: {len(grp)} design(s) end "
                        f"their hold before the target this way: {advice}."
                    )
        out.append("Material, coolant and freight costs are demo or user values, not quotes.")
        return tuple(dict.fromkeys(out))

    def results(self, progress=None, cancel=None) -> ShipperResults:
        """Sweep, optimum per candidate and cautions (``progress``/``cancel`` as in :meth:`sweep`)."""
        sweep, by_profile = self._sweep_all(progress=progress, cancel=cancel)
        rows = []
        for name in self.names:
            s = sweep[(sweep["candidate"] == name) & sweep["meets_target"]]
            if s.empty:
                empty = {col: np.nan for col in sweep.columns}
                empty.update(
                    {"candidate": name, "meets_target": False, "end_reason": "no thickness holds"}
                )
                rows.append(empty)
                continue
            best = s.loc[s["landed_cost"].idxmin()]
            rows.append(best.to_dict())
        opt = pd.DataFrame(rows).set_index("candidate")
        opt["rank"] = opt["landed_cost"].rank(method="min")
        opt.attrs["units"] = sweep.attrs["units"]
        opt.attrs["assumptions"] = SHIPPER_ASSUMPTIONS
        return ShipperResults(
            sweep=sweep,
            optimum=opt,
            cautions=self.cautions(sweep, by_profile),
            by_profile=by_profile,
        )

    def design_run(self, name: str, thickness: float, profile: str | None = None) -> pd.DataFrame:
        """Time series of one design (sized coolant): payload, coolant, ambient [K], fraction left.

        ``profile``: a name of :attr:`profiles` (default the first).
        """
        if name not in self.names:
            raise ValueError(f"candidate: unknown {name!r}; valid: {self.names}")
        cand = self.candidates[self.names.index(name)]
        th = np.atleast_1d(positive("thickness", thickness, "m"))
        lay = self._layers(cand, th)
        mass, box = self._size(lay)
        prof = self._profile(profile)
        sim = self.simulate(box["conductance"], mass, duration=1.5 * self.duration, t_ambient=prof)
        frame = pd.DataFrame(
            {
                "time": sim.times,
                "ambient": sim.ambient,
                "payload_temperature": sim.payload_temperature[0],
                "coolant_temperature": sim.coolant_temperature[0],
                "coolant_fraction_left": sim.coolant_fraction_left[0],
            }
        )
        frame.attrs["units"] = {
            "time": "s",
            "ambient": "K",
            "payload_temperature": "K",
            "coolant_temperature": "K",
            "coolant_fraction_left": "-",
        }
        frame.attrs["hold_time"] = float(sim.hold_time[0])
        frame.attrs["end_reason"] = str(sim.reason[0])
        frame.attrs["coolant_mass"] = float(mass[0])
        return frame

    def _profile(self, name: str | None):
        profiles = self.profiles
        if name is None:
            return next(iter(profiles.values()))
        if name not in profiles:
            raise ValueError(f"profile: unknown {name!r}; valid: {list(profiles)}")
        return profiles[name]

    def trace(
        self,
        designs: Sequence[tuple[str, float]],
        profiles: Sequence[str] | None = None,
        duration: float | None = None,
        record_every: int = 1,
    ) -> pd.DataFrame:
        """Temperature trace of designs over the trip, one block per design and profile.

        Parameters
        ----------
        designs : sequence of (str, float)
            ``(candidate name, sized thickness [m])``; the coolant is sized
            for the target as in :meth:`sweep`.
        profiles : sequence of str, optional
            Names of :attr:`profiles` (default all).
        duration : float, optional
            Length of the trace, default 1.5 × the target hold (so the end of
            a hold just past the target shows). [s]
        record_every : int
            Store every n-th time step.

        Returns
        -------
        DataFrame
            Tidy: ``candidate``, ``thickness`` [m], ``profile``, ``time`` [s],
            ``ambient``, ``payload_temperature``, ``coolant_temperature`` [K],
            ``coolant_fraction_left`` [-]. ``attrs``: ``units``; ``markers``
            (a DataFrame, one row per design and profile: ``coolant_mass``
            [kg], ``hold_time`` [s], ``end_reason``, ``meets_target``,
            ``time_coolant_spent`` [s] (``inf``: not within the trace),
            ``time_out_of_range`` [s]); ``band`` (``t_payload_min``,
            ``t_payload_max``) [K] (``None``: no limit); ``target`` [s];
            ``cautions`` (tuple of str, with :data:`TRACE_CAUTION`).

        Notes
        -----
        The two-node model of :func:`workbench.transient.simulate_hold`;
        the ambient column is the step-mean ambient of each time step.
        """
        designs = list(designs)
        if not designs:
            raise ValueError("designs: give at least one (candidate name, thickness [m]) pair")
        names = list(self.profiles) if profiles is None else list(profiles)
        for nm in names:
            self._profile(nm)
        run = 1.5 * self.duration if duration is None else _one("duration", duration, positive)
        conds, masses, keys = [], [], []
        for item in designs:
            if not (isinstance(item, tuple | list) and len(item) == 2):
                raise ValueError(
                    f"designs: each item must be (candidate name, thickness [m]), got {item!r:.60}"
                )
            name, thickness = item
            if name not in self.names:
                raise ValueError(f"designs: unknown candidate {name!r}; valid: {self.names}")
            th = np.atleast_1d(positive("thickness", thickness, "m")).astype(float)
            if th.size != 1:
                raise ValueError(f"designs: one thickness [m] per design, got {thickness!r:.60}")
            lay = self._layers(self.candidates[self.names.index(name)], th)
            mass, box = self._size(lay)
            conds.append(float(box["conductance"][0]))
            masses.append(float(mass[0]))
            keys.append((name, float(th[0])))
        conds, masses = np.array(conds), np.array(masses)
        blocks, marks = [], []
        for nm in names:
            sim = self.simulate(
                conds, masses, duration=run, t_ambient=self.profiles[nm], record_every=record_every
            )
            for i, (cand, th) in enumerate(keys):
                blocks.append(
                    pd.DataFrame(
                        {
                            "candidate": cand,
                            "thickness": th,
                            "profile": nm,
                            "time": sim.times,
                            "ambient": sim.ambient,
                            "payload_temperature": sim.payload_temperature[i],
                            "coolant_temperature": sim.coolant_temperature[i],
                            "coolant_fraction_left": sim.coolant_fraction_left[i],
                        }
                    )
                )
                marks.append(
                    {
                        "candidate": cand,
                        "thickness": th,
                        "profile": nm,
                        "coolant_mass": masses[i],
                        "hold_time": float(sim.hold_time[i]),
                        "end_reason": str(sim.reason[i]),
                        "meets_target": bool(sim.hold_time[i] >= self.duration * (1 - 1e-9)),
                        "time_coolant_spent": float(sim.time_coolant_spent[i]),
                        "time_out_of_range": float(sim.time_out_of_range[i]),
                    }
                )
        frame = pd.concat(blocks, ignore_index=True)
        markers = pd.DataFrame(marks)
        markers.attrs["units"] = {
            "thickness": "m",
            "coolant_mass": "kg",
            "hold_time": "s",
            "time_coolant_spent": "s",
            "time_out_of_range": "s",
        }
        frame.attrs["units"] = {
            "thickness": "m",
            "time": "s",
            "ambient": "K",
            "payload_temperature": "K",
            "coolant_temperature": "K",
            "coolant_fraction_left": "-",
        }
        frame.attrs["markers"] = markers
        frame.attrs["band"] = (self.t_payload_min, self.t_payload_max)
        frame.attrs["target"] = float(self.duration)
        frame.attrs["cautions"] = tuple(dict.fromkeys((*self.cautions(), TRACE_CAUTION)))
        return frame


def _normalise_profile(prof):
    """A profile as (times_s list, temps_K list), or a float for a constant."""
    times, temps = transient.ambient_profile(prof)
    if isinstance(prof, tuple | list) or np.ndim(prof) > 0:
        return (times.tolist(), temps.tolist())
    return float(temps[0])


def _same_profile(a, b) -> bool:
    try:
        ta, xa = transient.ambient_profile(a)
        tb, xb = transient.ambient_profile(b)
    except ValueError:
        return False
    return ta.shape == tb.shape and bool(np.all(ta == tb) and np.all(xa == xb))


def _combine_profiles(frame: pd.DataFrame, per: dict, duration: float, minimal: bool = False) -> None:
    """Overall hold columns from per-profile simulations: the limiting (shortest) profile's."""
    names = list(per)
    holds = np.stack([per[n].hold_time for n in names])
    lim = np.argmin(holds, axis=0)  # first profile with the shortest hold
    cols = np.arange(holds.shape[1])

    def pick(attr):
        return np.stack([getattr(per[n], attr) for n in names])[lim, cols]

    frame["hold_time_simulated"] = pick("hold_time")
    frame["end_reason"] = pick("reason")
    frame["limiting_profile"] = np.array(names, dtype=object)[lim]
    if minimal:
        return
    frame["time_coolant_spent"] = pick("time_coolant_spent")
    frame["time_out_of_range"] = pick("time_out_of_range")
    frame["min_payload_temperature"] = np.min(
        [per[n].payload_temperature.min(axis=-1) for n in names], axis=0
    )
    frame["max_payload_temperature"] = np.max(
        [per[n].payload_temperature.max(axis=-1) for n in names], axis=0
    )
    ok = holds >= duration * (1 - 1e-9)
    frame["meets_target"] = ok.all(axis=0)
    frame["failing_profiles"] = [
        ", ".join(n for n, good in zip(names, ok[:, j], strict=True) if not good)
        for j in range(holds.shape[1])
    ]


def _one(name: str, value, check) -> float:
    """One number checked by ``check``; an array or a boolean is refused naming the field and unit."""
    arr = check(name, value, _INPUT_UNITS[name])
    if arr.size != 1:
        raise ValueError(
            f"{name}: expected one number [{_INPUT_UNITS[name]}], got an array of shape {arr.shape}"
        )
    return float(arr.reshape(()))


_INPUT_UNITS = {
    "payload_length": "m",
    "payload_width": "m",
    "payload_height": "m",
    "payload_mass": "kg",
    "payload_specific_heat": "J/(kg·K)",
    "duration": "s",
    "divisor": "m³/kg",
    "mass_increment": "kg",
    "time_step": "s",
    "coupling_coefficient": "W/(m²·K)",
    "t_payload_start": "K",
    "t_payload_min": "K",
    "t_payload_max": "K",
    "t_coolant_start": "K",
    "r_si": "m²·K/W",
    "r_se": "m²·K/W",
    "rate_per_kg": "currency/kg",
    "fixed_fee": "currency",
    "coolant_wall_fraction": "-",
    "coolant_packing_fraction": "-",
    "safety_factor": "-",
}


def _cost_per_volume(row) -> float:
    value = row.get("cost_per_volume", np.nan)
    if pd.notna(value):
        return float(value)
    if row.get("cost_basis") == "per_kg" and pd.notna(row.get("cost")):
        return float(row["cost"]) * float(row["density"])
    if row.get("cost_basis") == "per_m3" and pd.notna(row.get("cost")):
        return float(row["cost"])
    return 0.0


def _layer_volumes(a, b, c, t):
    """Shell volume of each nested layer (n, n_layers). [m³]"""
    inner = np.cumsum(t, axis=-1) - t
    a_, b_, c_ = (np.asarray(x, float)[..., None] for x in (a, b, c))
    outer = inner + t
    return (a_ + 2 * outer) * (b_ + 2 * outer) * (c_ + 2 * outer) - (a_ + 2 * inner) * (
        b_ + 2 * inner
    ) * (c_ + 2 * inner)
