"""heatpath-workbench: compare wall materials and layer build-ups between hot and cold.

The public calculation API (SI floats and numpy arrays) is re-exported here;
see DEVELOPERS.md for the glossary of names and units.
"""

from workbench._checks import ValidityWarning
from workbench.conduction import (
    SolidLayer,
    WallSolution,
    cost_per_area,
    heat_flux,
    mass_per_area,
    mean_conductivity,
    required_thickness,
    series_resistance,
    solve_wall,
    u_value,
    wall_temperatures,
)
from workbench.materials import (
    FAMILIES,
    MaterialsFileError,
    check_materials_file,
    load_conductivity_curves,
    load_materials,
    load_sources,
)
from workbench.units import UnitError, format_quantity, parse

__version__ = "0.1.0"

__all__ = [
    "ValidityWarning",
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
    "FAMILIES",
    "MaterialsFileError",
    "check_materials_file",
    "load_conductivity_curves",
    "load_materials",
    "load_sources",
    "UnitError",
    "format_quantity",
    "parse",
]
