"""The shipper kind of scenario file: its inputs, candidates, results columns and charts.

Everything a ``kind = "shipper"`` scenario may hold is declared here once; the
generic scenario layer (:mod:`workbench.scenario`), the report and the command
line read it from :func:`study_kind` (``heatpath scenario keys shipper``).
"""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from types import MappingProxyType
from typing import Any

import numpy as np

from workbench import units
from workbench._scenario_objects import CriterionSpec, Scenario
from workbench.air_layers import AirLayer
from workbench.coolants import load_coolants
from workbench.geometry import VacuumPanel
from workbench.studies._scenario_parts import (
    _check_layer_list,
    _duplicates,
    _layers_name,
    _quantity,
    _si_text,
    _unknown_key_why,
)
from workbench.studies.shipper.study import ShipperCandidate, ShipperStudy
from workbench.studies.wall.study import Layer
from workbench.studykind import InputSpec, StudyKind

coolants = tuple(load_coolants().index)
#: SI unit written back for each quantity kind.
si_units = {
    "length": "m",
    "mass": "kg",
    "specific_heat": "J/(kg*K)",
    "temperature": "K",
    "time": "s",
    "dimensionless": "",
    "resistance": "m^2*K/W",
    "heat_transfer_coefficient": "W/(m^2*K)",
    "volume_per_mass": "m^3/kg",
    "cost_per_mass": "currency/kg",
    "money": "",
}


def layer_from(lay: Mapping):
    if "air_layer" in lay:
        kw = {
            "thickness": _quantity(lay["air_layer"], "thickness", "air_layer"),
            "direction": lay["direction"],
        }
        for k in ("emissivity_1", "emissivity_2"):
            if k in lay:
                kw[k] = _quantity(lay[k], "dimensionless", k, units.EMISSIVITY)
        if "method" in lay:
            kw["method"] = lay["method"]
        if "height" in lay:
            kw["height"] = _quantity(lay["height"], "length", "height")
        if "name" in lay:
            kw["name"] = lay["name"]
        return AirLayer(**kw)
    if "vacuum_panel" in lay:
        kw = {
            "thickness": _quantity(lay["vacuum_panel"], "thickness", "vacuum_panel"),
            "centre_conductivity": _quantity(
                lay["centre_conductivity"], "conductivity", "centre_conductivity"
            ),
            "length": _quantity(lay["length"], "length", "length"),
            "width": _quantity(lay["width"], "length", "width"),
            "psi_edge": _quantity(lay["psi_edge"], "conductivity", "psi_edge"),
        }
        if "name" in lay:
            kw["name"] = lay["name"]
        return VacuumPanel(**kw)
    t = lay.get("thickness")
    return Layer(lay["material"], None if t is None else _quantity(t, "thickness", "thickness"))


def to_candidate(c: Any) -> ShipperCandidate:
    if isinstance(c, str):
        return ShipperCandidate(c, (Layer(c),))
    return ShipperCandidate(
        c.get("name") or _layers_name(c["layers"]), tuple(layer_from(x) for x in c["layers"])
    )


def build(scenario: Scenario, x: dict, materials, curves):
    kw = {k: x[k] for k in quantities if x.get(k) is not None}
    kw["t_payload_min"] = x.get("t_payload_min")
    kw["t_payload_max"] = x.get("t_payload_max")
    kw["t_coolant_start"] = x.get("t_coolant_start")
    given = [k for k in ("t_ambient", "ambient_profile", "ambient_profiles")
             if x.get(k) is not None]
    if len(given) != 1:
        raise ValueError(
            "t_ambient: give exactly one of t_ambient (a constant), ambient_profile (steps "
            "or a logger file) or ambient_profiles (several named), "
            + (f"not {' and '.join(given)}" if given else "none is given")
        )
    if x.get("ambient_profile") is not None:
        kw["t_ambient"] = x["ambient_profile"]
    if x.get("ambient_profiles") is not None:
        kw.pop("t_ambient", None)
        kw["ambient_profiles"] = x["ambient_profiles"]
    return ShipperStudy(
        [to_candidate(c) for c in scenario.candidates],
        materials,
        coolant=x["coolant"],
        thicknesses=np.asarray(x["thicknesses"]),
        **kw,
    )


def read_back(study) -> tuple[dict, tuple]:
    inputs: dict[str, Any] = {"coolant": study.coolant}
    code = str(study.coolant_row.get("currency", "EUR"))
    code = code if code in units.CURRENCIES else "EUR"
    def rows(profile):
        times, temps = profile
        return [
            [_si_text(t, "s"), _si_text(tk, "K")]
            for t, tk in zip(np.asarray(times, float), np.asarray(temps, float), strict=True)
        ]

    named = getattr(study, "ambient_profiles", None)
    if named:
        inputs["ambient_profiles"] = {
            n: (rows(v) if isinstance(v, tuple | list) else [["0 s", _si_text(v, "K")]])
            for n, v in named.items()
        }
    for name, q in quantities.items():
        v = getattr(study, name)
        if name == "t_ambient" and named:
            continue
        if name == "t_ambient" and not np.isscalar(v) and not isinstance(v, float):
            inputs["ambient_profile"] = rows(v)
            continue
        if v is None:
            continue
        unit = si_units[q].replace("currency", code)
        inputs[name] = (
            f"{float(v)!r} {code}"
            if q == "money"
            else float(v)
            if q == "dimensionless"
            else _si_text(v, unit)
        )
    inputs["thicknesses"] = [_si_text(t, "m") for t in np.asarray(study.thicknesses, float)]
    cands = []
    for c in study.candidates:
        if (
            len(c.layers) == 1
            and isinstance(c.layers[0], Layer)
            and c.name == c.layers[0].material
        ):
            cands.append(c.name)
            continue
        layers = []
        for lay in c.layers:
            if isinstance(lay, Layer):
                layers.append(
                    {"material": lay.material}
                    if lay.thickness is None
                    else {"material": lay.material, "thickness": _si_text(lay.thickness, "m")}
                )
            elif isinstance(lay, AirLayer):
                d = {
                    "air_layer": _si_text(lay.thickness, "m"),
                    "direction": lay.direction,
                    "emissivity_1": float(lay.emissivity_1),
                    "emissivity_2": float(lay.emissivity_2),
                    "method": lay.method,
                    "name": lay.name,
                }
                if lay.height is not None:
                    d["height"] = _si_text(lay.height, "m")
                layers.append(d)
            else:
                layers.append(
                    {
                        "vacuum_panel": _si_text(lay.thickness, "m"),
                        "centre_conductivity": _si_text(lay.centre_conductivity, "W/(m*K)"),
                        "length": _si_text(lay.length, "m"),
                        "width": _si_text(lay.width, "m"),
                        "psi_edge": _si_text(lay.psi_edge, "W/(m*K)"),
                        "name": lay.name,
                    }
                )
        cands.append({"name": c.name, "layers": layers})
    return inputs, tuple(cands)


def check(cands: Sequence[Any], materials) -> list[tuple[int, str, str]]:
    problems: list = []
    known = set(materials.index)
    names = []
    for i, c in enumerate(cands):
        if isinstance(c, str):
            if c not in known:
                problems.append(
                    (i, "", f"unknown material id {c!r}; see 'heatpath materials list'")
                )
            names.append(c)
            continue
        for k in c:
            if k not in ("name", "layers"):
                problems.append((i, k, _unknown_key_why(k, ("name", "layers"))))
        _check_layer_list(i, c, known, problems, allow_special=True)
        names.append(str(c.get("name") or _layers_name(c.get("layers") or [])))
    _duplicates(names, problems)
    return problems


def results(study):
    raw = study.results()
    frame = raw.optimum.copy()
    frame.attrs["units"] = dict(raw.optimum.attrs.get("units", {}))
    frame.attrs["assumptions"] = tuple(raw.assumptions)
    frame.attrs["cautions"] = tuple(raw.cautions)
    return frame, raw


def cost_sources(s: Scenario) -> list[tuple[str, str]]:
    """The coolant's currency: its cost is added up with the materials' (no conversion)."""
    cid = s.inputs.get("coolant")
    if not isinstance(cid, str):
        return []
    cool = load_coolants()
    if cid in cool.index and isinstance(cool.loc[cid].get("currency"), str):
        return [(str(cool.loc[cid, "currency"]).strip(), f"coolant {cid!r}")]
    return []


def work(s: Scenario, x: Mapping[str, Any], n_cand: int):
    """Cells simulated: candidates × swept thicknesses × time steps (None: inputs not usable)."""
    thk = x.get("thicknesses") or []
    duration, step = x.get("duration"), x.get("time_step")
    if duration is None or step is None or not step > 0 or not duration > 0:
        return None  # the study's own checks name these
    steps = math.ceil(duration / step)
    cells = n_cand * len(thk) * steps
    detail = (
        f"{n_cand} candidates × {len(thk)} thicknesses × {steps:.3g} time steps "
        f"(duration / time_step) = {cells:.3g} cells"
    )
    return cells, detail, ("inputs", "duration")


CANDIDATE_FORMS = (
    '"eps_20": a material id: a box wall of that material, sized',
    '{ name = "EPS + VIP", layers = [{ material = "eps_20" }, { vacuum_panel = "20 mm", '
    'centre_conductivity = "0.004 W/(m·K)", length = "300 mm", width = "200 mm", '
    'psi_edge = "0.01 W/(m·K)" }] }: a build-up, inside to outside; exactly one material '
    "layer without a thickness (the layer sized)",
    '{ air_layer = "20 mm", direction = "horizontal", emissivity_1 = 0.9, emissivity_2 = 0.05 }: '
    "an unventilated air layer inside a build-up (ISO 6946 method; method and height optional)",
)


INPUTS: tuple[InputSpec, ...] = (
    InputSpec(
        "coolant",
        "choice",
        "pcm_plus5",
        "Coolant id (heatpath: see tables/coolants.csv)",
        choices=coolants,
        label="Coolant",
    ),
    InputSpec("payload_length", "length", "300 mm", "Payload space length", label="Payload length"),
    InputSpec("payload_width", "length", "200 mm", "Payload space width", label="Payload width"),
    InputSpec("payload_height", "length", "150 mm", "Payload space height", label="Payload height"),
    InputSpec("payload_mass", "mass", "3 kg", "Payload mass with its inner packaging", label="Payload mass"),
    InputSpec("payload_specific_heat", "specific_heat", "3500 J/(kg·K)", "Mean payload specific heat", label="Payload specific heat"),
    InputSpec(
        "t_payload_min",
        "temperature",
        "2 °C",
        "Lowest allowed payload temperature",
        required=False,
        label="Lowest payload temperature",
    ),
    InputSpec(
        "t_payload_max",
        "temperature",
        "8 °C",
        "Highest allowed payload temperature",
        required=False,
        label="Highest payload temperature",
    ),
    InputSpec("t_payload_start", "temperature", "5 °C", "Payload temperature when packed", label="Payload temperature when packed"),
    InputSpec(
        "t_ambient",
        "temperature",
        "25 °C",
        "Ambient temperature (constant), or give ambient_profile instead",
        required=False,
        label="Ambient temperature",
    ),
    InputSpec(
        "ambient_profile",
        "profile",
        None,
        'Ambient step profile instead: [["0 h", "25 °C"], ["12 h", "30 °C"], ...], '
        'or a temperature logger\'s CSV: { file = "route.csv" } (heatpath records its sha256)',
        required=False,
        label="Ambient profile",
    ),
    InputSpec(
        "ambient_profiles",
        "profiles",
        None,
        "Several named ambient profiles instead, each a step list or a logger file: "
        '{ summer = { file = "summer.csv" }, winter = { file = "winter.csv" } }; '
        "a design passes only if it holds under every one",
        required=False,
        label="Named ambient profiles",
    ),
    InputSpec("duration", "time", "48 h", "Required hold time", label="Hold time"),
    InputSpec(
        "thicknesses",
        "thickness_list",
        ["10 mm", "20 mm", "30 mm", "40 mm", "50 mm", "60 mm", "80 mm", "100 mm"],
        "Sized-layer thicknesses to sweep",
        label="Thicknesses swept",
    ),
    InputSpec(
        "safety_factor",
        "dimensionless",
        1.2,
        "Multiplier on the sized coolant mass (>= 1)",
        bounds=(1.0, None),
        label="Coolant safety factor",
    ),
    InputSpec(
        "coolant_packing_fraction",
        "dimensionless",
        0.8,
        "Share of the coolant space filled by coolant (0.001 to 1)",
        bounds=(1e-3, 1.0),
        label="Coolant packing fraction",
    ),
    InputSpec(
        "t_coolant_start",
        "temperature",
        None,
        "Coolant temperature when packed (default: at its phase change)",
        required=False,
        label="Coolant temperature when packed",
    ),
    InputSpec("r_si", "resistance", "0.13 m²·K/W", "Inside surface resistance", label="Inside surface resistance"),
    InputSpec("r_se", "resistance", "0.13 m²·K/W", "Outside surface resistance", label="Outside surface resistance"),
    InputSpec(
        "coupling_coefficient",
        "heat_transfer_coefficient",
        "5 W/(m²·K)",
        "Payload-to-coolant heat-transfer coefficient",
        label="Payload-coolant coupling",
    ),
    InputSpec(
        "coolant_wall_fraction",
        "dimensionless",
        0.8,
        "Share of the box conductance reaching the coolant directly (0 to 1)",
        bounds=units.FRACTION,
        label="Coolant share of the wall",
    ),
    InputSpec(
        "divisor",
        "volume_per_mass",
        "5000 cm³/kg",
        "Dimensional-weight divisor of the contract",
        label="Dimensional-weight divisor",
    ),
    InputSpec("mass_increment", "mass", "0.5 kg", "Carrier's rounding step for billable mass", label="Billing mass step"),
    InputSpec("rate_per_kg", "cost_per_mass", "1.5 EUR/kg", "Freight rate per billable kg (demo)", label="Freight rate"),
    InputSpec("fixed_fee", "money", "5 EUR", "Fixed freight charge per shipment (demo)", label="Fixed freight fee"),
    InputSpec("time_step", "time", "300 s", "Time step of the hold simulation", label="Simulation time step"),
)

#: Inputs read straight into the study (name -> quantity kind): every input whose kind
#: is a single quantity (the coolant, the ambient profiles and the thicknesses are read apart).
quantities = {s.name: s.kind for s in INPUTS if s.kind in si_units}
"""Inputs of a shipper scenario, in starter-file order."""


def study_kind() -> StudyKind:
    """The scenario-file declaration of the shipper kind."""
    from workbench.studies.shipper.charts import charts

    money = None
    return StudyKind(
        name="shipper",
        title="Insulated shipper",
        job=(
            "Choose the wall build-up and insulation thickness of an insulated shipper that keeps "
            "its payload within range for the whole trip at the lowest landed cost per shipment: "
            "coolant sized for the hold time, box and billable mass, packaging, coolant and "
            "freight cost, each design checked by a time-stepped simulation."
        ),
        inputs=INPUTS,
        column_kinds=MappingProxyType(
            {
                "thickness": "thickness",
                "wall_thickness": "thickness",
                "conductance": "conductance",
                "coolant_mass": "mass",
                "coolant_layer": "thickness",
                "outer_length": "length",
                "outer_width": "length",
                "outer_height": "length",
                "outer_volume": "volume",
                "wall_mass": "mass",
                "actual_mass": "mass",
                "dimensional_mass": "mass",
                "billable_mass": "mass",
                "packaging_cost": money,
                "coolant_cost": money,
                "freight_cost": money,
                "landed_cost": money,
                "hold_time_closed_form": "time",
                "hold_time_simulated": "time",
                "time_coolant_spent": "time",
                "time_out_of_range": "time",
                "min_payload_temperature": "temperature",
                "max_payload_temperature": "temperature",
            }
        ),
        flag_columns=("meets_target",),
        build=build,
        read_back=read_back,
        default_criteria=(
            CriterionSpec("landed_cost", "minimise", 2.0),
            CriterionSpec("actual_mass", "minimise", 1.0),
            CriterionSpec("outer_volume", "minimise", 1.0),
        ),
        formula_sources=("fourier", "iso6946-2017", "incropera7"),
        property_sources=("conductivity_source", "density_source", "cost_source"),
        cautions=(
            "Medicines and other temperature-sensitive goods: a shipper is qualified by testing "
            "(thermal chamber and field trials) under the applicable distribution rules before use; "
            "this estimate does not qualify a shipper.",
            "Dry ice (solid CO2) sublimes to gas: never seal it gas-tight, ventilate vehicles and "
            "rooms (asphyxiation risk), handle it with insulated gloves; it is dangerous goods for "
            "air transport (UN 1845, Class 9: from common knowledge of the IATA rules; check the "
            "carrier's current rules).",
            "Foam boxes (EPS, PUR) burn; their fire behaviour in storage and transport is set by "
            "local codes and carriers' rules, not by this comparison.",
        ),
        starter_candidates=("eps_20", "pir_32", "epp_45"),
        check_candidates=check,
        study_type=ShipperStudy,
        results=results,
        candidate_name=lambda c: to_candidate(c).name,
        charts=charts,
        candidate_forms=CANDIDATE_FORMS,
        cost_sources=cost_sources,
        costs_from="materials, coolant",
        work=work,
        candidate_words=("candidate", "thickness of", "finish", "layers"),
        input_alternatives=MappingProxyType({"t_ambient": ("ambient_profile",)}),
    )
