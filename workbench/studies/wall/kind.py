"""The wall kind of scenario file: its inputs, candidates, results columns and charts.

Everything a ``kind = "wall"`` scenario may hold is declared here once; the
generic scenario layer (:mod:`workbench.scenario`), the report and the command
line read it from :func:`study_kind` (``heatpath scenario keys wall``).
"""

from __future__ import annotations

from collections.abc import Sequence
from types import MappingProxyType
from typing import Any

from workbench import units
from workbench._scenario_objects import CriterionSpec, Scenario
from workbench.studies._scenario_parts import _quantity, _si_text, _unknown_key_why
from workbench.studies.wall.study import Candidate, HeatBudget, Layer, WallStudy
from workbench.studykind import InputSpec, StudyKind


def to_candidate(c: Any) -> Candidate:
    if isinstance(c, str):
        return Candidate.single(c)
    layers = []
    for j, lay in enumerate(c["layers"]):
        t = lay.get("thickness")
        layers.append(
            Layer(
                lay["material"],
                None
                if t is None
                else units.parse(t, "thickness", f"candidates.layers[{j}].thickness"),
            )
        )
    return Candidate(
        c.get("name") or "/".join(x["material"] for x in c["layers"]), tuple(layers)
    )


def build(scenario: Scenario, x: dict, materials, curves):
    budget = None if x["budget"] is None else HeatBudget(*x["budget"])
    if budget is not None and x["t_inside"] == x["t_outside"]:
        raise ValueError(
            "t_outside: equal to t_inside; equal temperatures carry no heat, so a heat "
            "budget sizes nothing (remove the budget or change a temperature)"
        )
    return WallStudy(
        [to_candidate(c) for c in scenario.candidates],
        materials,
        t_inside=x["t_inside"],
        t_outside=x["t_outside"],
        area=x["area"],
        r_si=x["r_si"],
        r_se=x["r_se"],
        budget=budget,
        max_thickness=x["max_thickness"],
        thickness=x["thickness"],
        k_curves=curves if x["conductivity_vs_temperature"] else {},
    )


def read_back(study) -> tuple[dict, tuple]:
    inputs: dict[str, Any] = {
        "t_inside": _si_text(study.t_inside, "K"),
        "t_outside": _si_text(study.t_outside, "K"),
        "area": _si_text(study.area, "m^2"),
        "r_si": _si_text(study.r_si, "m^2*K/W"),
        "r_se": _si_text(study.r_se, "m^2*K/W"),
        "thickness": _si_text(study.thickness, "m"),
        "conductivity_vs_temperature": bool(study.k_curves),
    }
    if study.budget is not None:
        unit = {"flux": "W/m^2", "power": "W", "u_value": "W/(m^2*K)"}[study.budget.kind]
        inputs["budget"] = _si_text(study.budget.value, unit)
    if study.max_thickness is not None:
        inputs["max_thickness"] = _si_text(study.max_thickness, "m")
    cands: list[Any] = []
    for c in study.candidates:
        if len(c.layers) == 1 and c.name == c.layers[0].material:
            cands.append(c.name)
        else:
            cands.append(
                {
                    "name": c.name,
                    "layers": [
                        {"material": lay.material}
                        if lay.thickness is None
                        else {
                            "material": lay.material,
                            "thickness": _si_text(lay.thickness, "m"),
                        }
                        for lay in c.layers
                    ],
                }
            )
    return inputs, tuple(cands)


def check(cands: Sequence[Any], materials) -> list[tuple[int, str, str]]:
    problems = []
    known = set(materials.index)
    names: list[str] = []
    for i, c in enumerate(cands):
        if isinstance(c, str):
            ids = [("", c)]
            names.append(c)
        else:
            for k in c:
                if k not in ("name", "layers"):
                    problems.append((i, k, _unknown_key_why(k, ("name", "layers"))))
            layers = c.get("layers")
            if not isinstance(layers, list) or not layers:
                problems.append((i, "layers", "expected a list of {material, thickness}"))
                continue
            ids = []
            sized = 0
            for j, lay in enumerate(layers):
                for k in lay if isinstance(lay, dict) else ():
                    if k not in ("material", "thickness"):
                        problems.append(
                            (
                                i,
                                f"layers[{j}].{k}",
                                _unknown_key_why(k, ("material", "thickness")),
                            )
                        )
                if not isinstance(lay, dict) or not isinstance(lay.get("material"), str):
                    problems.append(
                        (
                            i,
                            f"layers[{j}]",
                            'expected { material = "id", '
                            'thickness = "25 mm" } (thickness omitted for the '
                            "sized layer)",
                        )
                    )
                    continue
                ids.append((f"layers[{j}].material", lay["material"]))
                if "thickness" not in lay:
                    sized += 1
                else:
                    try:
                        _quantity(lay["thickness"], "thickness", "thickness")
                    except ValueError as exc:
                        problems.append((i, f"layers[{j}].thickness", str(exc)))
            if sized != 1:
                problems.append(
                    (
                        i,
                        "layers",
                        "needs exactly one layer without a thickness "
                        f"(the layer to size), found {sized}",
                    )
                )
            names.append(str(c.get("name") or "/".join(x for _, x in ids)))
        for key, mid in ids:
            if mid not in known:
                problems.append(
                    (
                        i,
                        key,
                        f"unknown material id {mid!r}; see "
                        "'heatpath materials list' for valid ids",
                    )
                )
    dup = sorted({n for n in names if names.count(n) > 1})
    if dup:
        problems.append((0, "", f"duplicate candidate names {dup}"))
    return problems



INPUTS: tuple[InputSpec, ...] = (
    InputSpec("t_inside", "temperature", "20 °C", "Air temperature on the first-layer side",
              label="Inside air temperature"),
    InputSpec("t_outside", "temperature", "-10 °C", "Air temperature on the last-layer side",
              label="Outside air temperature"),
    InputSpec("area", "area", "10 m²", "Wall area (for total heat flow and a power budget)",
              label="Wall area"),
    InputSpec(
        "r_si",
        "resistance",
        "0.13 m²·K/W",
        "Inside surface resistance (ISO 6946:2017 Table 7: 0.13 horizontal flow)",
        label="Inside surface resistance",
    ),
    InputSpec("r_se", "resistance", "0.04 m²·K/W", "Outside surface resistance",
              label="Outside surface resistance"),
    InputSpec(
        "budget",
        "budget",
        "0.25 W/(m²·K)",
        "Heat budget: a flux (W/m²), a power (W) or a U-value (W/(m²·K))",
        required=False,
        label="Heat budget",
    ),
    InputSpec(
        "max_thickness",
        "thickness",
        "200 mm",
        "Largest acceptable thickness of the sized layer",
        required=False,
        label="Largest thickness",
    ),
    InputSpec(
        "thickness",
        "thickness",
        "50 mm",
        "Sized-layer thickness where no budget is set; current sweep point",
        label="Sized-layer thickness",
    ),
    InputSpec(
        "conductivity_vs_temperature",
        "bool",
        True,
        "Use tabulated k(T) curves (integral mean over the layer) where available",
        label="Conductivity against temperature",
    ),
)
"""Inputs of a wall scenario, in starter-file order."""

COLUMN_KINDS = MappingProxyType(
    {
        "sized_thickness": "thickness",
        "total_thickness": "thickness",
        "conductivity": "conductivity",
        "density": "density",
        "u_value": "u_value",
        "heat_flux": "heat_flux",
        "heat_flow": "power",
        "mass_per_area": "mass_per_area",
        "cost_per_area": "cost_per_area",
        "t_surface_inside": "temperature",
        "t_surface_outside": "temperature",
    }
)
"""Numeric results columns -> quantity kind."""

CANDIDATE_FORMS = (
    '"pir_32": a material id: one layer of it, sized',
    '{ name = "steel/PIR/steel", layers = [{ material = "carbon_steel", thickness = "0.6 mm" }, '
    '{ material = "pir_32" }] }: a build-up, inside to outside; exactly one layer without a '
    "thickness (the layer sized)",
)


def study_kind() -> StudyKind:
    """The scenario-file declaration of the wall kind."""
    from workbench.studies.wall.charts import charts

    return StudyKind(
        name="wall",
        title="Wall comparison",
        job=(
            "Choose the material and thickness of a plane wall between a warm and a cold side: "
            "each candidate build-up is sized (or evaluated at a set thickness) against a heat "
            "budget, and compared on thickness, mass, cost and heat flow."
        ),
        inputs=INPUTS,
        column_kinds=COLUMN_KINDS,
        flag_columns=("within_service_limits", "meets_budget", "within_max_thickness"),
        build=build,
        read_back=read_back,
        default_criteria=(
            CriterionSpec("total_thickness", "minimise", 1.0),
            CriterionSpec("mass_per_area", "minimise", 1.0),
            CriterionSpec("cost_per_area", "minimise", 1.0),
        ),
        formula_sources=("fourier", "iso6946-2017"),
        property_sources=(
            "conductivity_source",
            "density_source",
            "t_service_source",
            "cost_source",
        ),
        cautions=(
            "Foam insulants (EPS, XPS, PIR/PUR, phenolic, PE foam) burn and may give off toxic "
            "smoke; their fire behaviour, and the facings and fire barriers they need, are set by "
            "local building and fire codes and product tests, not by this comparison.",
        ),
        starter_candidates=("eps_20", "xps_35", "pir_32", "glass_wool_32"),
        check_candidates=check,
        candidate_name=lambda c: to_candidate(c).name,
        study_type=WallStudy,
        magnitude_columns=("heat_flux", "heat_flow"),
        charts=charts,
        flag_reasons=MappingProxyType({"within_service_limits": ("service_problems",)}),
        candidate_forms=CANDIDATE_FORMS,
        candidate_words=("candidate", "thickness of", "finish", "layers"),
        message_inputs=MappingProxyType({"heat budget": "budget", "budget": "budget"}),
    )
