"""The housing kind of scenario file: its inputs, candidates, results columns and charts.

Everything a ``kind = "housing"`` scenario may hold is declared here once; the
generic scenario layer (:mod:`workbench.scenario`), the report and the command
line read it from :func:`study_kind` (``heatpath scenario keys housing``).
"""

from __future__ import annotations

import functools
from collections.abc import Mapping, Sequence
from types import MappingProxyType
from typing import Any

from workbench._scenario_objects import CriterionSpec, Scenario
from workbench.housing import MOUNTINGS
from workbench.studies._scenario_parts import (
    _collect,
    _duplicates,
    _quantity,
    _si_text,
    _unknown_key_why,
)
from workbench.studies.housing.study import (
    Component,
    HousingCandidate,
    HousingStudy,
    load_finishes,
)
from workbench.studykind import InputSpec, StudyKind

_HOUSING_KEYS = ("material", "thickness", "finish", "name")


@functools.lru_cache(maxsize=1)

def _finishes():
    """The finishes table, read once (as when the kind was a closure)."""
    return load_finishes()


def to_candidate(c: Mapping) -> HousingCandidate:
    return HousingCandidate(
        c["material"],
        _quantity(c["thickness"], "thickness", "thickness"),
        c.get("finish"),
        c.get("name"),
    )


def build(scenario: Scenario, x: dict, materials, curves):
    comp = None
    parts = ("component_length", "component_width", "component_power")
    given = [k for k in parts if x.get(k) is not None]
    if given and len(given) < 3:
        missing = [k for k in parts if k not in given]
        raise ValueError(
            f"{missing[0]}: missing; a component needs all of {', '.join(parts)} "
            f"(given: {', '.join(given)})"
        )
    if x.get("component_power") is not None:
        comp = Component(x["component_length"], x["component_width"], x["component_power"])
    kw = {}
    if x.get("h_inside") is not None:
        kw["h_inside"] = x["h_inside"]
    if x.get("session_duration") is not None:
        kw["session_duration"] = x["session_duration"]
    if x.get("content_heat_capacity") is not None:
        kw["content_heat_capacity"] = x["content_heat_capacity"]
    return HousingStudy(
        [to_candidate(c) for c in scenario.candidates],
        materials,
        length=x["length"],
        width=x["width"],
        height=x["height"],
        power=x["power"],
        t_ambient=x["t_ambient"],
        mounting=x["mounting"],
        t_inside_max=x.get("t_inside_max"),
        component=comp,
        contact_duration=x["contact_duration"],
        **kw,
    )


def read_back(study) -> tuple[dict, tuple]:
    inputs: dict[str, Any] = {
        "length": _si_text(study.length, "m"),
        "width": _si_text(study.width, "m"),
        "height": _si_text(study.height, "m"),
        "power": _si_text(study.power, "W"),
        "t_ambient": _si_text(study.t_ambient, "K"),
        "mounting": study.mounting,
        "contact_duration": _si_text(study.contact_duration, "s"),
    }
    if study.t_inside_max is not None:
        inputs["t_inside_max"] = _si_text(study.t_inside_max, "K")
    if study.component is not None:
        inputs["component_length"] = _si_text(study.component.length, "m")
        inputs["component_width"] = _si_text(study.component.width, "m")
        inputs["component_power"] = _si_text(study.component.power, "W")
    if study.h_inside is not None:
        inputs["h_inside"] = _si_text(study.h_inside, "W/(m^2*K)")
    inputs["session_duration"] = _si_text(study.session_duration, "s")
    inputs["content_heat_capacity"] = _si_text(study.content_heat_capacity, "J/K")
    cands = []
    for c in study.candidates:
        d: dict[str, Any] = {"material": c.material, "thickness": _si_text(c.thickness, "m")}
        if c.finish is not None:
            d["finish"] = c.finish
        if c.name:
            d["name"] = c.name
        cands.append(d)
    return inputs, tuple(cands)


def check(cands: Sequence[Any], materials) -> list[tuple[int, str, str]]:
    problems: list = []
    known = set(materials.index)
    names = []
    for i, c in enumerate(cands):
        if not isinstance(c, Mapping):
            problems.append(
                (i, "", 'expected { material = "id", thickness = "2 mm", finish = "id" }')
            )
            continue
        for k in c:
            if k not in _HOUSING_KEYS:
                problems.append((i, k, _unknown_key_why(k, _HOUSING_KEYS)))
        mid = c.get("material")
        if not isinstance(mid, str):
            problems.append((i, "material", "missing material id"))
            continue
        if mid not in known:
            problems.append(
                (i, "material", f"unknown material id {mid!r}; see 'heatpath materials list'")
            )
        if "thickness" not in c:
            problems.append((i, "thickness", 'missing wall thickness, e.g. "2 mm"'))
        else:
            _collect(
                problems,
                i,
                "thickness",
                lambda c=c: _quantity(c["thickness"], "thickness", "thickness"),
            )
        finishes = _finishes()
        fin = c.get("finish")
        if fin is not None and fin not in finishes.index:
            problems.append(
                (i, "finish", f"unknown finish {fin!r}; valid: {', '.join(finishes.index)}")
            )
        names.append(str(c.get("name") or f"{mid} {c.get('thickness')} {fin or 'as-is'}"))
    _duplicates(names, problems)
    return problems


def results(study):
    frame = study.results()
    frame = frame.drop(columns=[c for c in frame.columns if c.endswith("_degC")])
    return frame, frame


COLUMN_LABELS = MappingProxyType(
    {
        "material": "Material",
        "finish": "Finish",
        "emissivity": "Emissivity of the outer finish",
        "t_air_inside": "Inside air temperature",
        "t_wall_inside": "Inner wall surface temperature",
        "t_surface": "Mean surface temperature",
        "t_hot_spot": "Hot-spot temperature",
        "t_air_inside_degC": "Inside air temperature",
        "t_surface_degC": "Mean surface temperature",
        "t_hot_spot_degC": "Hot-spot temperature",
        "hot_spot_rise": "Hot-spot rise above the inner wall",
        "spreading_length": "Spreading length of the wall",
        "biot_number": "Biot number of the wall",
        "h_convection": "Outside convection coefficient",
        "h_radiation": "Outside radiation coefficient",
        "radiation_share": "Share of the heat radiated",
        "dt_surface_d_emissivity": "Change of mean surface temperature per unit emissivity",
        "mass": "Shell mass",
        "cost": "Shell material cost",
        "heat_capacity": "Heat capacity of shell and contents",
        "t_surface_session_end": "Mean surface temperature at the end of the session",
        "t_surface_session_end_degC": "Mean surface temperature at the end of the session",
        "time_to_touch_limit": "Time for the mean surface to reach the touch limit",
        "touch_class": "Touch class",
        "touch_limit": "Touch limit",
        "touch_limit_degC": "Touch limit",
        "margin_surface": "Touch margin of the mean surface",
        "margin_hot_spot": "Touch margin of the hot spot",
        "passes": "Passes",
        "why_not": "Why not",
    }
)
"""Readable names of the housing results columns (the unit is added beside them)."""

CANDIDATE_FORMS = (
    '{ material = "abs", thickness = "2.5 mm", finish = "plastic_matte", name = "ABS matte" }: '
    "a housing wall; finish (see tables/finishes.csv) and name are optional",
)


INPUTS: tuple[InputSpec, ...] = (
    InputSpec("length", "length", "200 mm", "Outer length", label="Outer length"),
    InputSpec("width", "length", "120 mm", "Outer width", label="Outer width"),
    InputSpec("height", "length", "60 mm", "Outer height (vertical)", label="Outer height"),
    InputSpec("power", "power", "8 W", "Power dissipated inside", label="Power inside"),
    InputSpec("t_ambient", "temperature", "25 °C", "Room temperature", label="Room temperature"),
    InputSpec("mounting", "choice", "on-table", "How it is mounted", choices=tuple(MOUNTINGS), label="Mounting"),
    InputSpec(
        "t_inside_max",
        "temperature",
        "60 °C",
        "Highest allowed inside air temperature",
        required=False,
        label="Inside air limit",
    ),
    InputSpec(
        "component_length",
        "length",
        None,
        "Footprint length of a component bonded to the wall",
        required=False,
        label="Component length",
    ),
    InputSpec(
        "component_width",
        "length",
        None,
        "Footprint width of that component",
        required=False,
        label="Component width",
    ),
    InputSpec("component_power", "power", None, "Power of that component", required=False, label="Component power"),
    InputSpec("contact_duration", "time", "10 min", "How long a user touches the housing", label="Contact time"),
    InputSpec(
        "h_inside",
        "heat_transfer_coefficient",
        None,
        "Inside convective coefficient (default: correlations)",
        required=False,
        label="Inside convection coefficient",
    ),
    InputSpec(
        "session_duration",
        "time",
        "20 min",
        "Length of a use session for the warm-up from room temperature (default 20 min)",
        required=False,
        bounds=(1.0, 7 * 86400.0),
        label="Use session",
    ),
    InputSpec(
        "content_heat_capacity",
        "heat_capacity",
        "100 J/K",
        "Heat capacity of the contents (boards, battery, brackets) for the warm-up; "
        "the wall's own is added (default 100 J/K)",
        required=False,
        label="Heat capacity of the contents",
    ),
)
"""Inputs of a housing scenario, in starter-file order."""


def study_kind() -> StudyKind:
    """The scenario-file declaration of the housing kind."""
    from workbench.studies.housing.charts import charts

    return StudyKind(
        name="housing",
        title="Device housing",
        job=(
            "Choose the wall material, thickness and finish of a sealed device housing that "
            "dissipates a power inside: will the inside air stay below its limit, and is the "
            "outside (including the hot spot over a component bonded to the wall) safe to touch?"
        ),
        inputs=INPUTS,
        column_kinds=MappingProxyType(
            {
                "thickness": "thickness",
                "emissivity": None,
                "conductivity": "conductivity",
                "t_air_inside": "temperature",
                "t_wall_inside": "temperature",
                "t_surface": "temperature",
                "t_hot_spot": "temperature",
                "hot_spot_rise": "temperature_difference",
                "spreading_length": "length",
                "biot_number": None,
                "h_convection": "heat_transfer_coefficient",
                "h_radiation": "heat_transfer_coefficient",
                "radiation_share": None,
                "dt_surface_d_emissivity": "temperature_difference",
                "mass": "mass",
                "cost": None,
                "heat_capacity": "heat_capacity",
                "t_surface_session_end": "temperature",
                "time_to_touch_limit": "time",
                "touch_limit": "temperature",
                "margin_surface": "temperature_difference",
                "margin_hot_spot": "temperature_difference",
            }
        ),
        flag_columns=("passes", "pareto"),
        build=build,
        read_back=read_back,
        default_criteria=(
            CriterionSpec("t_hot_spot", "minimise", 2.0),
            CriterionSpec("mass", "minimise", 1.0),
            CriterionSpec("cost", "minimise", 1.0),
        ),
        formula_sources=("fourier", "churchill-chu-1975", "incropera7", "iso13732-1-2006"),
        property_sources=(
            "conductivity_source",
            "density_source",
            "t_service_source",
            "cost_source",
        ),
        cautions=(
            "Touch temperatures: the shipped limits are skin burn thresholds (ISO 13732-1) for "
            "healthy adults; the limits that apply to a product come from its product safety "
            "standard, and surface temperatures must be measured on the product under the worst "
            "intended use.",
            "Plastic housings burn; their flammability rating and the fire enclosure rules of the "
            "applicable product standard decide, not this comparison.",
        ),
        starter_candidates=(
            {"material": "abs", "thickness": "2.5 mm"},
            {"material": "aluminium_6063_t6_anodised", "thickness": "2 mm"},
        ),
        check_candidates=check,
        study_type=HousingStudy,
        results=results,
        candidate_name=lambda c: to_candidate(c).label,
        charts=charts,
        column_labels=COLUMN_LABELS,
        flag_reasons=MappingProxyType({"passes": ("why_not",)}),
        candidate_forms=CANDIDATE_FORMS,
        candidate_words=("candidate", "thickness of", "finish", "layers"),
    )
