"""heatpath-workbench: compare wall materials and layer build-ups between hot and cold.

The public calculation API (SI floats and numpy arrays) is re-exported here;
see DEVELOPERS.md for the glossary of names and units.

``import workbench`` is light: the public names are loaded on first use (PEP 562
module ``__getattr__``), so pint, pandas and scipy are imported only by the
parts that need them (units, tables, a few special functions); only
:func:`air_properties` (numpy only) is bound eagerly, see below.
``workbench.heat_flux`` imports :mod:`workbench.conduction` (numpy only);
``workbench.load_materials`` imports pandas; ``workbench.parse`` imports pint.
"""

from __future__ import annotations

import importlib
from typing import Any

# ``air_properties`` is both a submodule and a public function. Importing the
# submodule (directly or through air_layers, surfaces, housing ...) binds the
# module to ``workbench.air_properties``; so the function is bound here, eagerly,
# after the submodule is loaded. The submodule needs numpy only.
from workbench.air_properties import air_properties

__version__ = "0.1.0"

#: Submodule of ``workbench`` that defines each public name (loaded on first use).
_EXPORTS: dict[str, tuple[str, ...]] = {
    "_checks": ("ValidityWarning",),
    "conduction": (
        "SolidLayer",
        "WallSolution",
        "cost_per_area",
        "heat_flux",
        "mass_per_area",
        "mean_conductivity",
        "required_thickness",
        "series_resistance",
        "solve_wall",
        "u_value",
        "wall_temperatures",
    ),
    "air_layers": (
        "AirLayer",
        "air_layer_resistance",
        "air_layer_resistance_detailed",
        "convection_onset_width",
        "gap_equivalent_conductivity",
        "ventilation_class",
    ),
    "air_properties": ("air_properties",),
    "geometry": (
        "BoxConductance",
        "VacuumPanel",
        "box_conductance",
        "box_conductance_breakdown",
        "critical_insulation_radius",
        "cylinder_conductance",
        "layered_box_conductance",
        "vacuum_panel_effective_conductivity",
    ),
    "surfaces": (
        "SURFACE_RESISTANCES",
        "SurfaceFilm",
        "combined_film_resistance",
        "conventional_surface_resistance",
        "flat_plate_convection_coefficient",
        "iso6946_convection_coefficient",
        "natural_convection_coefficient",
        "radiation_coefficient",
        "surface_film",
    ),
    "housing": (
        "HousingSolution",
        "hot_spot",
        "solve_housing",
        "housing_warm_up",
        "housing_heat_capacity",
    ),
    "spreading": ("spreading_length", "spreading_resistance", "wall_biot_number"),
    "touch": ("load_touch_limits", "touch_limit", "touch_margin"),
    "coolants": ("load_coolants",),
    "freight": ("billable_mass", "landed_cost", "outer_dimensions", "round_up_mass"),
    "transient": (
        "HoldSimulation",
        "coolant_mass_for_duration",
        "hold_time",
        "simulate_hold",
        "thickness_for_duration",
    ),
    "ranking": (
        "Criterion",
        "Limit",
        "material_indices",
        "pareto_front",
        "rank_stability",
        "screen_candidates",
        "weighted_scores",
    ),
    "stacks": ("check_service_limits", "enumerate_stacks", "stack_catalogue", "stack_front"),
    "uncertainty": ("MonteCarloResult", "monte_carlo"),
    "logger": ("load_ambient_profile",),
    "materials": (
        "FAMILIES",
        "MaterialsFileError",
        "check_materials_file",
        "load_conductivity_curves",
        "load_materials",
        "load_sources",
    ),
    "units": ("UnitError", "format_quantity", "parse"),
}
_WHERE: dict[str, str] = {name: module for module, names in _EXPORTS.items() for name in names}

__all__ = ["air_properties", *_WHERE]


def __getattr__(name: str) -> Any:
    """Import the submodule that defines ``name`` on first access (PEP 562).

    Public names resolve to the object of their submodule and are then cached in
    this module's namespace; submodule names (``workbench.units``) import that
    submodule. Anything else raises :class:`AttributeError` as usual.
    """
    module_name = _WHERE.get(name)
    if module_name is not None:
        value = getattr(importlib.import_module(f"{__name__}.{module_name}"), name)
        globals()[name] = value
        return value
    if not name.startswith("__"):
        try:
            return importlib.import_module(f"{__name__}.{name}")
        except ModuleNotFoundError as error:
            if error.name != f"{__name__}.{name}":
                raise
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")


def __dir__() -> list[str]:
    """Names of the module, the lazily loaded public names included."""
    return sorted(set(globals()) | set(__all__))
