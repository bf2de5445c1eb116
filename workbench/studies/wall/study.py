"""Wall comparison study: candidate materials and build-ups against a heat budget.

The study object holds its inputs as plain SI state, calls the numeric core and
returns frozen results or DataFrames (with units in ``DataFrame.attrs["units"]``
and every property's source beside it). It holds no widgets.

A *candidate* is a build-up of layers, inside to outside. Exactly one layer is
the *sized* layer (its thickness is what the study varies or solves for); the
others have fixed thicknesses. A bare material id is a one-layer candidate.
"""

from __future__ import annotations

import warnings
from collections.abc import Iterable, Sequence
from dataclasses import dataclass, field

import numpy as np
import pandas as pd

from workbench import conduction, ranking, stacks, uncertainty
from workbench._checks import ValidityWarning, finite, nonnegative, positive

__all__ = ["Layer", "Candidate", "HeatBudget", "WallStudy", "WALL_ASSUMPTIONS", "WALL_CRITERIA"]

#: Default criteria of the wall ranking: result column -> direction.
WALL_CRITERIA = {
    "total_thickness": "minimise",
    "mass_per_area": "minimise",
    "cost_per_area": "minimise",
}

#: Assumptions every wall result rests on (shown in reports and the workbench).
WALL_ASSUMPTIONS = (
    "Steady one-dimensional conduction through plane layers in series (Fourier's law).",
    "Surface resistances are constants per side (ISO 6946:2017 Table 7 conventional values by default).",
    "Where a k(T) curve is tabulated, the sized layer uses the integral-mean conductivity between its "
    "own face temperatures at the design point; elsewhere the table value at its stated temperature.",
    "Edges, corners, fixings and thermal bridges are not included in a plane-wall result.",
    "Property values are typical table values with their stated sources; costs are demo values.",
)


@dataclass(frozen=True)
class Layer:
    """One layer of a candidate build-up.

    Parameters
    ----------
    material : str
        Material id in the materials table.
    thickness : float or None
        Fixed thickness [m]; ``None`` marks the sized layer.
    """

    material: str
    thickness: float | None = None

    def __post_init__(self):
        if self.thickness is not None:
            positive(f"thickness of layer {self.material!r}", self.thickness, "m")


@dataclass(frozen=True)
class Candidate:
    """A named build-up, inside to outside, with exactly one sized layer."""

    name: str
    layers: tuple[Layer, ...]

    def __post_init__(self):
        sized = [i for i, lay in enumerate(self.layers) if lay.thickness is None]
        if len(sized) != 1:
            raise ValueError(
                f"candidate {self.name!r}: needs exactly one layer without a thickness "
                f"(the layer to size), found {len(sized)}"
            )

    @property
    def sized_index(self) -> int:
        return next(i for i, lay in enumerate(self.layers) if lay.thickness is None)

    @property
    def sized_material(self) -> str:
        return self.layers[self.sized_index].material

    @classmethod
    def single(cls, material: str, name: str | None = None) -> Candidate:
        return cls(name or material, (Layer(material),))

    @classmethod
    def coerce(cls, item: str | Candidate) -> Candidate:
        if isinstance(item, Candidate):
            return item
        if isinstance(item, str):
            return cls.single(item)
        raise ValueError(f"candidates: expected a material id or a Candidate, got {item!r}")


_BUDGET_KINDS = {"flux": "W/m²", "power": "W", "u_value": "W/(m²·K)"}


@dataclass(frozen=True)
class HeatBudget:
    """The largest heat flow the wall may pass.

    ``kind`` is ``"flux"`` [W/m²], ``"power"`` [W] over the study's area, or
    ``"u_value"`` [W/(m²·K)] (air to air).
    """

    kind: str
    value: float

    def __post_init__(self):
        if self.kind not in _BUDGET_KINDS:
            raise ValueError(f"budget kind: unknown {self.kind!r}; valid: {list(_BUDGET_KINDS)}")
        positive(f"heat budget ({self.kind})", self.value, _BUDGET_KINDS[self.kind])

    def max_flux(self, delta_t, area: float):
        """Largest flux [W/m²] at temperature difference ``delta_t`` [K] over ``area`` [m²]."""
        dt = np.abs(np.asarray(delta_t, float))
        if self.kind == "flux":
            return np.broadcast_to(self.value, dt.shape) * 1.0
        if self.kind == "power":
            return np.broadcast_to(self.value / area, dt.shape) * 1.0
        return self.value * dt


@dataclass
class WallStudy:
    """Compare candidate walls between a hot and a cold side.

    Parameters
    ----------
    candidates : sequence of str or Candidate
        Material ids (one-layer candidates) or build-ups.
    materials : DataFrame
        As returned by :func:`workbench.materials.load_materials`.
    t_inside, t_outside : float
        Air temperatures on the first-layer side and the last-layer side. [K]
    area : float
        Wall area, for total heat flow and the power budget. [m²]
    r_si, r_se : float
        Surface resistances. [m²·K/W]
    budget : HeatBudget or None
        The heat budget that sets each candidate's required thickness.
    max_thickness : float or None
        Largest acceptable sized-layer thickness. [m]
    thickness : float
        Design thickness of the sized layer where no budget is set, and the
        current point of the thickness sweep. [m]
    k_curves : dict, optional
        ``id -> (temperatures [K], k [W/(m·K)])`` tabulated k(T).
    """

    candidates: Sequence[str | Candidate]
    materials: pd.DataFrame
    t_inside: float = 293.15
    t_outside: float = 273.15
    area: float = 1.0
    r_si: float = 0.13
    r_se: float = 0.04
    budget: HeatBudget | None = None
    max_thickness: float | None = None
    thickness: float = 0.05
    k_curves: dict = field(default_factory=dict)

    def __post_init__(self):
        self.candidates = [Candidate.coerce(c) for c in self.candidates]
        if not self.candidates:
            raise ValueError("candidates: choose at least one material or build-up")
        names = [c.name for c in self.candidates]
        dup = sorted({n for n in names if names.count(n) > 1})
        if dup:
            raise ValueError(f"candidates: duplicate names {dup}")
        unknown = sorted(
            {lay.material for c in self.candidates for lay in c.layers} - set(self.materials.index)
        )
        if unknown:
            raise ValueError(f"candidates: unknown material ids {unknown}; see load_materials().index")
        finite("t_inside", self.t_inside, "K")
        finite("t_outside", self.t_outside, "K")
        positive("area", self.area, "m²")
        nonnegative("r_si", self.r_si, "m²·K/W")
        nonnegative("r_se", self.r_se, "m²·K/W")
        positive("thickness", self.thickness, "m")
        if self.max_thickness is not None:
            positive("max_thickness", self.max_thickness, "m")
        self._arrays = self._layer_arrays()

    # -- property arrays ---------------------------------------------------
    def _layer_arrays(self) -> dict[str, np.ndarray]:
        """Per-candidate arrays, layers padded on the last axis (inside to outside).

        ``L``/``k`` hold the fixed layers (NaN at the sized layer and in padding);
        ``sized`` marks the sized layer; ``pad`` marks padding; service limits
        are ±inf in padding.
        """
        m = self.materials
        n = len(self.candidates)
        width = max(len(c.layers) for c in self.candidates)
        mats = np.full((n, width), "", dtype=object)
        thick = np.full((n, width), np.nan)
        sized = np.zeros((n, width), bool)
        for i, c in enumerate(self.candidates):
            for j, lay in enumerate(c.layers):
                mats[i, j] = lay.material
                thick[i, j] = np.nan if lay.thickness is None else lay.thickness
            sized[i, c.sized_index] = True
        pad = mats == ""
        ids = np.where(pad, mats[~pad][0], mats).ravel()

        def column(name: str, fill: float) -> np.ndarray:
            vals = m[name].reindex(ids).to_numpy(float).reshape(n, width)
            return np.where(pad, fill, vals)

        k_all = column("conductivity", 1.0)
        rho_all = column("density", 0.0)
        cv_all = column("cost_per_volume", 0.0)
        fixed = ~sized & ~pad
        l_fix = np.where(fixed, thick, 0.0)
        sized_idx = np.array([c.sized_index for c in self.candidates])
        rows = np.arange(n)
        return {
            "k_table": k_all[rows, sized_idx],
            "density": rho_all[rows, sized_idx],
            "cost_per_volume": cv_all[rows, sized_idx],
            "r_fixed": np.sum(l_fix / k_all, axis=-1),
            "r_before": np.sum(np.where(np.arange(width) < sized_idx[:, None], l_fix / k_all, 0.0), axis=-1),
            "mass_fixed": np.sum(l_fix * rho_all, axis=-1),
            "cost_fixed": np.sum(l_fix * cv_all, axis=-1),
            "l_fixed": np.sum(l_fix, axis=-1),
            "layer_material": mats,
            "layer_thickness": l_fix,
            "layer_k": k_all,
            "sized": sized,
            "pad": pad,
            "t_min": column("t_service_min", -np.inf),
            "t_max": column("t_service_max", np.inf),
        }

    def _state(self) -> tuple:
        """Inputs the effective k depends on (the set thickness only when not sizing)."""
        thickness = None if self.budget is not None else self.thickness
        return (self.t_inside, self.t_outside, self.area, self.r_si, self.r_se,
                self.budget, thickness)

    def _k(self) -> np.ndarray:
        """Effective conductivity of each sized layer at the design point. [W/(m·K)]

        The table value, or for a material with a k(T) curve the integral mean
        between the layer's own face temperatures at the design point (found by
        fixed-point iteration; cached per input state).
        """
        key = self._state()
        if getattr(self, "_k_key", None) != key:
            self._k_cache = self._solve_k_of_t()
            self._k_key = key
        return self._k_cache

    @property
    def names(self) -> list[str]:
        return [c.name for c in self.candidates]

    @property
    def delta_t(self) -> float:
        """Design temperature difference, inside minus outside. [K]"""
        return float(self.t_inside - self.t_outside)

    @property
    def other_resistance(self) -> np.ndarray:
        """Films plus fixed layers of each candidate. [m²·K/W]"""
        return self.r_si + self.r_se + self._arrays["r_fixed"]

    def max_flux(self, delta_t=None):
        """The budget as a flux at ``delta_t`` (design ΔT by default) [W/m²], or None."""
        if self.budget is None:
            return None
        return self.budget.max_flux(self.delta_t if delta_t is None else delta_t, self.area)

    # -- sweeps (vectorised; the widgets call these on every slider move) ---
    def flux(self, thicknesses, delta_t=None) -> np.ndarray:
        """Air-to-air heat flux [W/m²] for sized-layer thicknesses [m].

        The size of the flux, whichever way it flows (``results()`` states the
        direction). Returns shape ``(n_candidates,) + np.shape(thicknesses)``; with
        ``delta_t`` an array [K], its axes follow (``delta_t`` broadcasts
        against the thickness axes as given).
        """
        a = self._arrays
        lt = positive("thicknesses", thicknesses, "m")
        dt = finite("delta_t", self.delta_t if delta_t is None else delta_t, "K")
        extra = (1,) * lt.ndim
        k = self._k().reshape(-1, *extra)
        r = (self.r_si + self.r_se + a["r_fixed"]).reshape(-1, *extra) + lt / k
        return np.abs(dt) / r

    def sweep(self, thicknesses, delta_ts) -> np.ndarray:
        """Flux size over candidates x thicknesses x temperature differences. [W/m²]"""
        lt = positive("thicknesses", thicknesses, "m").reshape(-1, 1)
        dt = finite("delta_ts", delta_ts, "K").reshape(1, -1)
        return self.flux(lt, dt)

    def required_thickness(self, delta_t=None) -> np.ndarray:
        """Sized-layer thickness that meets the budget, per candidate. [m]"""
        return self._required(self._k(), delta_t)

    def _required(self, k: np.ndarray, delta_t=None) -> np.ndarray:
        if self.budget is None:
            raise ValueError("budget: set a heat budget (flux, power or U-value) to size the walls")
        dt = self.delta_t if delta_t is None else delta_t
        if dt == 0:
            raise ValueError("t_inside, t_outside: equal temperatures carry no heat; nothing to size")
        return conduction.required_thickness(
            k, dt, self.max_flux(dt), other_resistance=self.other_resistance
        )

    def mass_per_area(self, thicknesses) -> np.ndarray:
        """Mass per area [kg/m²] of each candidate at sized thicknesses [m]."""
        a = self._arrays
        lt = np.asarray(thicknesses, float)
        extra = (1,) * lt.ndim
        return a["mass_fixed"].reshape(-1, *extra) + a["density"].reshape(-1, *extra) * lt

    def cost_per_area(self, thicknesses) -> np.ndarray:
        """Material cost per area [currency/m²] at sized thicknesses [m]."""
        a = self._arrays
        lt = np.asarray(thicknesses, float)
        extra = (1,) * lt.ndim
        return a["cost_fixed"].reshape(-1, *extra) + a["cost_per_volume"].reshape(-1, *extra) * lt

    def design_mass_per_area(self, thicknesses=None) -> np.ndarray:
        """Mass per area [kg/m²] with one sized thickness [m] per candidate (design by default)."""
        a = self._arrays
        lt = self.design_thickness() if thicknesses is None else np.asarray(thicknesses, float)
        return a["mass_fixed"] + a["density"] * lt

    def design_cost_per_area(self, thicknesses=None) -> np.ndarray:
        """Cost per area [currency/m²] with one sized thickness [m] per candidate (design by default)."""
        a = self._arrays
        lt = self.design_thickness() if thicknesses is None else np.asarray(thicknesses, float)
        return a["cost_fixed"] + a["cost_per_volume"] * lt

    # -- design point ----------------------------------------------------------
    def design_thickness(self) -> np.ndarray:
        """Sized thickness per candidate at the design point [m]: required, else the set thickness."""
        if self.budget is not None and self.delta_t != 0:
            return self.required_thickness()
        return np.full(len(self.candidates), float(self.thickness))

    def _solve_k_of_t(self) -> np.ndarray:
        """Fixed point: each sized layer's k is the integral mean between its own faces."""
        a = self._arrays
        k = a["k_table"].copy()
        groups = {}
        for i, c in enumerate(self.candidates):
            if c.sized_material in self.k_curves:
                groups.setdefault(c.sized_material, []).append(i)
        if not groups or self.delta_t == 0:
            return k
        groups = {mat: np.array(idx) for mat, idx in groups.items()}
        sizing = self.budget is not None
        r_films = self.r_si + self.r_se
        for _ in range(100):
            k_old = k.copy()
            lt = self._required(k) if sizing else np.full(k.shape, float(self.thickness))
            lt = np.maximum(lt, 1e-9)
            q = self.delta_t / (r_films + a["r_fixed"] + lt / k)
            t_a = self.t_inside - q * (self.r_si + a["r_before"])
            t_b = t_a - q * lt / k
            with warnings.catch_warnings():
                warnings.simplefilter("ignore", ValidityWarning)
                for mat, idx in groups.items():
                    k[idx] = conduction.mean_conductivity(*self.k_curves[mat], t_a[idx], t_b[idx])
            if np.allclose(k, k_old, rtol=1e-12, atol=0):
                return k
        raise RuntimeError("k(T): effective conductivity did not converge in 100 iterations")

    def _profile(self, i: int, sized_thickness: float, k_sized: float | None = None
                 ) -> tuple[list[str], np.ndarray, np.ndarray]:
        """Layer names, thicknesses [m] and conductivities [W/(m·K)] of candidate i."""
        c = self.candidates[i]
        names, ls, ks = [], [], []
        for j, lay in enumerate(c.layers):
            names.append(lay.material)
            if j == c.sized_index:
                ls.append(sized_thickness)
                ks.append(self._k()[i] if k_sized is None else k_sized)
            else:
                ls.append(lay.thickness)
                ks.append(float(self.materials.loc[lay.material, "conductivity"]))
        return names, np.array(ls), np.array(ks)

    def temperature_profile(self, name: str, sized_thickness: float | None = None) -> pd.DataFrame:
        """Positions [m] and temperatures [K] through one candidate's wall, air to air."""
        i = self._index(name)
        lt = self.design_thickness()[i] if sized_thickness is None else sized_thickness
        names, ls, ks = self._profile(i, max(float(lt), 1e-9))
        t = conduction.wall_temperatures(ls, ks, self.t_inside, self.t_outside, self.r_si, self.r_se)
        x = np.concatenate([[0.0], np.cumsum(ls)])
        frame = pd.DataFrame({
            "position": np.concatenate([[x[0]], x, [x[-1]]]),
            "temperature": np.concatenate([[self.t_inside], t, [self.t_outside]]),
            "where": ["inside air", *(f"face of {n}" for n in names[:1]),
                      *(f"{a} | {b}" for a, b in zip(names[:-1], names[1:], strict=True)),
                      f"face of {names[-1]}", "outside air"],
        })
        frame.attrs["units"] = {"position": "m", "temperature": "K"}
        return frame

    def _index(self, name: str) -> int:
        try:
            return self.names.index(name)
        except ValueError:
            raise ValueError(f"candidate: unknown {name!r}; valid: {self.names}") from None

    def results(self) -> pd.DataFrame:
        """One row per candidate at its design point, with units and sources.

        Columns: sized thickness, total thickness [m]; effective k [W/(m·K)];
        U-value [W/(m²·K)]; heat flux [W/m²] and heat flow [W] (sizes, with
        ``heat_flow_direction`` saying which way, seen from the inside); mass and cost per
        area; the face temperatures of the wall [K]; whether every layer's
        face temperatures lie within its service range, and why not; whether
        the budget and thickness limit are met; and the sources of k and ρ.
        """
        a = self._arrays
        m = self.materials
        lt = self.design_thickness()
        k = self._k()
        ls = np.where(a["sized"], np.maximum(lt, 1e-9)[:, None], a["layer_thickness"])
        ks = np.where(a["sized"], k[:, None], a["layer_k"])
        r_layers = ls / ks
        r_total = self.r_si + self.r_se + r_layers.sum(axis=-1)
        q_signed = self.delta_t / r_total
        q = np.abs(q_signed)
        t0 = self.t_inside - q_signed * self.r_si
        drops = np.cumsum(q_signed[:, None] * r_layers, axis=-1)
        faces = np.concatenate([t0[:, None], t0[:, None] - drops], axis=-1)
        lo = np.minimum(faces[:, :-1], faces[:, 1:])
        hi = np.maximum(faces[:, :-1], faces[:, 1:])
        too_hot = hi > a["t_max"]
        too_cold = lo < a["t_min"]
        problems = [""] * len(k)
        for i in np.flatnonzero(np.any(too_hot | too_cold, axis=-1)):
            why = []
            for j in range(ls.shape[1]):
                mat = a["layer_material"][i, j]
                if too_hot[i, j]:
                    why.append(f"{mat} face at {hi[i, j] - 273.15:.0f} °C above its limit "
                               f"{a['t_max'][i, j] - 273.15:.0f} °C")
                if too_cold[i, j]:
                    why.append(f"{mat} face at {lo[i, j] - 273.15:.0f} °C below its limit "
                               f"{a['t_min'][i, j] - 273.15:.0f} °C")
            problems[i] = "; ".join(why)
        sized_ids = [c.sized_material for c in self.candidates]
        direction = ("out through the wall" if self.delta_t > 0 else
                     "in through the wall" if self.delta_t < 0 else "none")
        q_max = None if self.budget is None else float(self.max_flux())
        frame = pd.DataFrame({
            "candidate": self.names,
            "sized_material": sized_ids,
            "family": m["family"].reindex(sized_ids).to_numpy(),
            "sized_thickness": lt,
            "total_thickness": lt + a["l_fixed"],
            "conductivity": k,
            "density": a["density"],
            "u_value": 1.0 / r_total,
            "heat_flux": q,
            "heat_flow": q * self.area,
            "heat_flow_direction": direction,
            "mass_per_area": a["mass_fixed"] + a["density"] * lt,
            "cost_per_area": a["cost_fixed"] + a["cost_per_volume"] * lt,
            "t_surface_inside": faces[:, 0],
            "t_surface_outside": faces[:, -1],
            "within_service_limits": [not p for p in problems],
            "service_problems": problems,
            "meets_budget": True if q_max is None else q <= q_max * (1 + 1e-9),
            "within_max_thickness": True if self.max_thickness is None else lt <= self.max_thickness,
            "conductivity_source": m["conductivity_source"].reindex(sized_ids).to_numpy(),
            "density_source": m["density_source"].reindex(sized_ids).to_numpy(),
        }).set_index("candidate")
        frame.attrs["units"] = {
            "sized_thickness": "m", "total_thickness": "m", "conductivity": "W/(m·K)",
            "density": "kg/m³", "u_value": "W/(m²·K)", "heat_flux": "W/m²", "heat_flow": "W",
            "mass_per_area": "kg/m²", "cost_per_area": f"{_currency(m)}/m²",
            "t_surface_inside": "K", "t_surface_outside": "K",
        }
        frame.attrs["assumptions"] = WALL_ASSUMPTIONS
        return frame


    # -- trade-offs (the ranking engine applied to this study) ------------------
    def _criteria(self, criteria) -> tuple[list[str], list[str], pd.DataFrame]:
        res = self.results()
        crit = dict(WALL_CRITERIA if criteria is None else criteria)
        unknown = sorted(set(crit) - set(res.columns))
        if unknown:
            raise ValueError(f"criteria: unknown result columns {unknown}; valid: {list(res.columns)}")
        bad = sorted({d for d in crit.values()} - {"minimise", "maximise"})
        if bad:
            raise ValueError(f"criteria: unknown directions {bad}; valid: ['minimise', 'maximise']")
        return list(crit), list(crit.values()), res

    def ranking(
        self,
        criteria: dict[str, str] | None = None,
        weights: Sequence[float] | None = None,
        max_mass_per_area: float | None = None,
        max_cost_per_area: float | None = None,
        resolution: int = 20,
    ) -> pd.DataFrame:
        """Rank the candidates on several criteria at once.

        Hard limits first (service temperatures of every layer, the thickness
        limit, the heat budget, and the optional mass and cost limits): a
        candidate that fails one is excluded, with the reason. Among the rest:
        the Pareto front (``pareto``), the weighted score (min–max normalised
        per criterion over the feasible candidates, 0 = best, weights
        normalised to sum 1) and its ``rank``, and the rank stability over the
        weight simplex at ``resolution`` steps per axis (``share_first``,
        ``best_rank``, ``worst_rank``).

        Parameters
        ----------
        criteria : dict, optional
            Result column -> ``"minimise"`` or ``"maximise"``;
            :data:`WALL_CRITERIA` by default.
        weights : sequence of float, optional
            One per criterion (equal by default).
        max_mass_per_area, max_cost_per_area : float, optional
            Hard limits. [kg/m²], [currency/m²]

        Returns
        -------
        DataFrame
            Indexed by candidate; units in ``attrs["units"]``.
        """
        names, dirs, res = self._criteria(criteria)
        w = np.ones(len(names)) if weights is None else nonnegative("weights", weights, "-")
        if w.shape != (len(names),) or w.sum() <= 0:
            raise ValueError(f"weights: need {len(names)} non-negative numbers, not all zero")
        limits = [ranking.Limit("heat_budget", (~res["meets_budget"]).to_numpy(float), 0.5, "max")]
        hard = {"limits": limits}
        if self.max_thickness is not None:
            hard.update(thickness=res["sized_thickness"].to_numpy(float), max_thickness=self.max_thickness)
        if max_mass_per_area is not None:
            hard.update(mass_per_area=res["mass_per_area"].to_numpy(float), max_mass_per_area=max_mass_per_area)
        if max_cost_per_area is not None:
            hard.update(cost_per_area=res["cost_per_area"].to_numpy(float), max_cost_per_area=max_cost_per_area)
        screen = ranking.screen_candidates(**hard)
        keep = screen.keep & res["within_service_limits"].to_numpy(bool)
        reasons = []
        for i, name in enumerate(res.index):
            why = [r for r in (screen.reasons[i] if screen.reasons[i] else "").split("; ") if r]
            why = ["heat budget not met" if r.startswith("heat_budget") else r for r in why]
            if res.loc[name, "service_problems"]:
                why.append(res.loc[name, "service_problems"])
            reasons.append("; ".join(why))
        values = res[names].to_numpy(float)
        finite_rows = np.all(np.isfinite(values), axis=1)
        for i in np.flatnonzero(keep & ~finite_rows):
            reasons[i] = "; ".join(filter(None, [reasons[i], "a criterion has no value (e.g. no cost)"]))
        keep &= finite_rows
        table = res[names].copy()
        table["feasible"] = keep
        table["excluded_because"] = reasons
        n = len(table)
        pareto = np.zeros(n, bool)
        score = np.full(n, np.nan)
        rank = np.full(n, np.nan)
        share = np.full(n, np.nan)
        best = np.full(n, np.nan)
        worst = np.full(n, np.nan)
        idx = np.flatnonzero(keep)
        if idx.size:
            v = values[idx]
            pareto[idx] = ranking.pareto_front(ranking.oriented(v, dirs))
            sc = ranking.weighted_scores(v, dirs, w / w.sum())
            score[idx] = sc
            rank[idx] = 1 + np.sum(sc[None, :] < sc[:, None] - 1e-12, axis=1)
            stab = ranking.rank_stability(v, dirs, resolution=resolution)
            share[idx], best[idx], worst[idx] = stab.share_first, stab.best_rank, stab.worst_rank
        table["pareto"] = pareto
        table["score"] = score
        table["rank"] = rank
        table["share_first"] = share
        table["best_rank"] = best
        table["worst_rank"] = worst
        units = res.attrs["units"]
        table.attrs["units"] = {**{c: units.get(c, "-") for c in names}, "score": "-", "share_first": "-"}
        table.attrs["criteria"] = dict(zip(names, dirs, strict=True))
        table.attrs["weights"] = tuple(float(x) for x in w / w.sum())
        table.attrs["normalisation"] = (
            "min-max over the feasible candidates per criterion, direction-aware, 0 = best"
        )
        return table.sort_values(["feasible", "score"], ascending=[False, True])

    def front(self, criteria: dict[str, str] | None = None) -> pd.DataFrame:
        """The feasible non-dominated candidates (see :meth:`ranking`)."""
        table = self.ranking(criteria)
        return table[table["pareto"]]

    def material_indices(self) -> pd.DataFrame:
        """Ashby's material indices of each sized material for a wall of given R.

        For a wall of prescribed thermal resistance R: least thickness
        minimises k, least mass minimises ρ·k, least cost minimises c_m·ρ·k
        (L = R·k, m/A = ρ·R·k, C/A = c_m·ρ·R·k). Ashby, *Materials Selection
        in Mechanical Design*, 4th ed. (``ashby-2011``).
        """
        m = self.materials
        ids = [c.sized_material for c in self.candidates]
        idx = ranking.material_indices(
            self._k(), m.loc[ids, "density"].to_numpy(float), m.loc[ids, "cost_per_mass"].to_numpy(float)
        )
        frame = pd.DataFrame(
            {"thickness_index": idx.thickness_index, "mass_index": idx.mass_index,
             "cost_index": idx.cost_index},
            index=pd.Index(self.names, name="candidate"),
        )
        frame.attrs["units"] = {"thickness_index": "W/(m·K)", "mass_index": "kg·W/(m⁴·K)",
                                "cost_index": f"{_currency(m)}·W/(m⁴·K)"}
        return frame

    def uncertainty(self, n_samples: int = 2000, seed: int = 0, tolerance_override=None,
                    progress=None, cancel=None) -> pd.DataFrame:
        """Monte Carlo over the sized layers' conductivity tolerances, all candidates at once.

        Each sized material's conductivity is drawn from a normal distribution
        (truncated to stay positive) whose standard deviation is its table
        tolerance, a relative half-range, divided by √3 — the rectangular
        distribution of GUM (JCGM 100:2008, clause 4.3.7; ``jcgm100-2008``);
        propagation by Monte Carlo per JCGM 101:2008 (``jcgm101-2008``).
        Criteria per sample: the heat flux at the nominal design thickness, and
        the thickness, mass and cost needed to meet the budget (with a budget).

        Returns
        -------
        DataFrame
            P10/P50/P90 of each criterion, the probability of meeting the heat
            budget at the nominal design thickness with its standard error, and
            the probability of being the thinnest / lightest / cheapest;
            ``attrs["n_samples"]``, ``attrs["seed"]``, ``attrs["cancelled"]``.
        """
        m = self.materials
        ids = [c.sized_material for c in self.candidates]
        half_range = m.loc[ids, "conductivity_tolerance"].to_numpy(float)
        half_range = np.where(np.isfinite(half_range), half_range, 0.0)
        if tolerance_override is not None:
            half_range = nonnegative("tolerance_override", np.broadcast_to(tolerance_override, half_range.shape), "-")
        sigma = half_range / np.sqrt(3.0)
        a = self._arrays
        l_design = self.design_thickness()
        r_other = self.other_resistance
        dt = abs(self.delta_t)
        sizing = self.budget is not None and dt > 0
        q_max = float(self.max_flux()) if self.budget is not None else None

        def model(samples):
            k = samples["k"]
            q = dt / (r_other + l_design / k)
            lt = np.maximum(0.0, k * (dt / q_max - r_other)) if sizing else np.broadcast_to(l_design, k.shape)
            return np.stack([q, lt + a["l_fixed"], a["mass_fixed"] + a["density"] * lt,
                             a["cost_fixed"] + a["cost_per_volume"] * lt], axis=-1)

        mc = uncertainty.monte_carlo(
            model, {"k": self._k()}, {"k": sigma}, n_samples=n_samples, rng=seed,
            limit=q_max, limit_criterion=0, limit_direction="max",
            progress=progress, cancel=cancel,
        )
        crit = ["heat_flux", "total_thickness", "mass_per_area", "cost_per_area"]
        frame = pd.DataFrame(index=pd.Index(self.names, name="candidate"))
        for j, c in enumerate(crit):
            frame[f"{c}_p10"], frame[f"{c}_p50"], frame[f"{c}_p90"] = mc.p10[:, j], mc.p50[:, j], mc.p90[:, j]
        if mc.prob_meets is not None:
            frame["p_meets_budget"] = mc.prob_meets
            frame["p_meets_budget_se"] = mc.prob_meets_se
        for j, word in ((1, "thinnest"), (2, "lightest"), (3, "cheapest")):
            frame[f"p_{word}"] = mc.prob_best[:, j]
        units = self.results().attrs["units"]
        frame.attrs["units"] = {f"{c}_{p}": units[c] for c in crit for p in ("p10", "p50", "p90")}
        frame.attrs.update(n_samples=mc.n_samples, seed=seed, cancelled=mc.cancelled,
                           distribution="normal, sigma = table half-range / sqrt(3), truncated at 0")
        return frame

    def buildup_search(self, thickness_options=None, max_layers: int = 3, progress=None,
                       cancel=None) -> pd.DataFrame:
        """Non-dominated build-ups of 1 to ``max_layers`` of the candidates' sized materials.

        Every stack of different materials (each layer one of the thickness
        options, total within ``max_thickness``) is scored on its thermal
        resistance (more is better), mass and cost per area; the exact Pareto
        front of those stacks is returned (:func:`workbench.stacks.stack_front`;
        cost drops out when a material has no price). Each layer uses its table
        conductivity at the table's stated temperature (no k(T) here; the layer
        order does not change the criteria, so it is chosen afterwards).

        Parameters
        ----------
        thickness_options : array_like, optional
            Layer thicknesses to combine [m]; default 5 mm steps up to the
            maximum thickness (or up to 100 mm without one).
        max_layers : int
            1 to 3.
        progress, cancel : callable, optional
            Passed to :func:`~workbench.stacks.stack_front` (fraction done;
            a True ``cancel()`` raises :class:`workbench._checks.Cancelled`).

        Returns
        -------
        DataFrame
            One row per non-dominated build-up: its layers as text, material
            ids and layer thicknesses [m] as tuples, number of layers, total thickness [m], resistance of the layers [m²·K/W],
            U-value with this study's surface resistances [W/(m²·K)], heat flux
            at the design ΔT [W/m²], mass and cost per area, and whether it meets
            the heat budget; sorted so that build-ups meeting the budget come
            first, cheapest (or lightest) first. ``attrs``: ``units``,
            ``n_stacks`` (stacks scored, before the thickness limit),
            ``objectives``.

        Notes
        -----
        :math:`R = \\sum_i L_i/k_i`, :math:`U = 1/(R_{si} + R + R_{se})`,
        :math:`q = U\\,|\\Delta T|` (Fourier's law, layers in series).

        References
        ----------
        ``incropera7``: 7th ed., §3.1 (resistances in series);
        ``iso6946-2017``: clause 6.7.1 (total thermal resistance, U-value).
        """
        ids = list(dict.fromkeys(c.sized_material for c in self.candidates))
        m = self.materials.loc[ids]
        k = m["conductivity"].to_numpy(float)
        rho = m["density"].to_numpy(float)
        cv = m["cost_per_volume"].to_numpy(float) if "cost_per_volume" in m else np.full(len(ids), np.nan)
        priced = bool(np.all(np.isfinite(cv)))
        top = self.max_thickness if self.max_thickness is not None else 0.1
        if thickness_options is None:
            opts = np.arange(1, int(np.floor(top / 0.005 + 1e-9)) + 1) * 0.005
            opts = opts if opts.size else np.array([top])
        else:
            opts = positive("thickness_options", np.atleast_1d(np.asarray(thickness_options, float)), "m")
        if max_layers not in (1, 2, 3):
            raise ValueError(f"max_layers: must be 1, 2 or 3, got {max_layers}")
        objectives = ("resistance", "mass_per_area", "cost_per_area") if priced else ("resistance", "mass_per_area")
        front = stacks.stack_front(k, rho, np.where(np.isfinite(cv), cv, 0.0), opts, max_layers=max_layers,
                                   objectives=objectives, max_total_thickness=self.max_thickness,
                                   progress=progress, cancel=cancel)
        names = m["name"].to_numpy(str) if "name" in m else np.array(ids)
        lt = front.layer_thickness
        text = [" + ".join(f"{names[j]} {lt[r, c] * 1000:.0f} mm" for c, j in enumerate(front.material[r]) if j >= 0)
                for r in range(len(front))]
        u = front.u_value(self.r_si, self.r_se)
        q = u * abs(self.delta_t)
        q_max = None if self.budget is None else float(self.max_flux())
        frame = pd.DataFrame({
            "build_up": text,
            "materials": [tuple(ids[j] for j in row if j >= 0) for row in front.material],
            "layer_thickness": [tuple(float(t) for t, j in zip(lt[r], front.material[r], strict=True) if j >= 0)
                                for r in range(len(front))],
            "layers": front.n_layers,
            "total_thickness": front.thickness,
            "resistance": front.resistance,
            "u_value": u,
            "heat_flux": q,
            "mass_per_area": front.mass_per_area,
            "cost_per_area": front.cost_per_area if priced else np.nan,
            "meets_budget": True if q_max is None else q <= q_max * (1 + 1e-9),
        })
        order = ["meets_budget", "cost_per_area" if priced else "mass_per_area", "mass_per_area"]
        frame = frame.sort_values(order, ascending=[False, True, True], kind="stable").reset_index(drop=True)
        n = len(ids)
        n_stacks = sum(int(np.prod([n - i for i in range(j)]) / np.prod(range(1, j + 1))) * opts.size ** j
                       for j in range(1, max_layers + 1))
        frame.attrs["units"] = {"total_thickness": "m", "resistance": "m²·K/W", "u_value": "W/(m²·K)",
                                "heat_flux": "W/m²", "mass_per_area": "kg/m²",
                                "cost_per_area": f"{_currency(self.materials)}/m²"}
        frame.attrs.update(n_stacks=n_stacks, objectives=objectives)
        return frame


def _cost_per_volume(row) -> float:
    """Cost per m³ of a material row [currency/m³] (NaN where no cost is known)."""
    return float(row["cost_per_volume"])


def _currency(materials: pd.DataFrame) -> str:
    """The currency code of the table's costs (codes joined by "/" if they differ)."""
    codes = materials.get("currency", pd.Series(["EUR"])).dropna().astype(str).str.strip()
    cur = sorted({c for c in codes if c})
    return "/".join(cur) if cur else "EUR"


def candidates_from(items: Iterable[str | Candidate]) -> list[Candidate]:
    """Coerce material ids and candidates into a list of :class:`Candidate`."""
    return [Candidate.coerce(c) for c in items]
