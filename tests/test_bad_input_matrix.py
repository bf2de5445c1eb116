"""Bad-input matrix: every public function of the numeric core against bad values.

Each public callable of the core modules gets one valid base call written by
hand (physical values of a wall, a shipper or a housing). Each numeric argument
of that call is replaced in turn by each value of ``BAD``; the call must then
either raise ``ValueError``/``TypeError`` whose message names the argument, or
return a result in which every float is finite. Where the argument's physical
domain excludes the value (a zero thickness, a negative absolute temperature,
an emissivity above 1, an empty layer list ...) the call must raise. A
``ValidityWarning`` (correlation extrapolated) is allowed; a numpy
``RuntimeWarning`` (overflow, invalid operation) is turned into a failure.

The physical domains are common practice (a thickness is > 0, an absolute
temperature is > 0 K, an emissivity lies in [0, 1]); no published value is
asserted here.
"""

from __future__ import annotations

import dataclasses
import importlib
import warnings
from dataclasses import dataclass, field

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import workbench as wb
from workbench._checks import MAX_TEMPERATURE, ValidityWarning

_NAMES = ("conduction", "surfaces", "air_layers", "air_properties", "geometry", "touch", "housing",
          "spreading", "ranking", "uncertainty", "stacks", "freight")
MODULES = tuple(importlib.import_module(f"workbench.{n}") for n in _NAMES)
(conduction, surfaces, air_layers, air_properties, geometry, touch, housing, spreading, ranking,
 uncertainty, stacks, freight) = MODULES
OTHER_MODULES = ("transient", "coolants", "units", "scenario", "exports", "report", "materials")

_WRONG_SHAPE = object()
_RAGGED = [[1.0, 2.0], [3.0]]

# label -> value (None/_WRONG_SHAPE handled specially; numbers keep the base shape)
BAD = {
    "nan": np.nan,
    "+inf": np.inf,
    "-inf": -np.inf,
    "zero": 0.0,
    "negative": -1.0,
    "empty": [],
    "true": True,
    "text": "text",
    "none": None,
    "huge": 1e300,
    "tiny": 1e-300,
    "wrong_shape": _WRONG_SHAPE,
    "ragged": _RAGGED,
}
ALWAYS_RAISE = {"nan", "+inf", "-inf", "true", "text", "ragged"}

# Domains: which bad labels must raise for an argument of that kind (beyond ALWAYS_RAISE).
KINDS = {
    "real": set(),  # any finite number (a temperature difference, a criterion value)
    "nonneg": {"negative"},
    "pos": {"zero", "negative"},
    "temp": {"zero", "negative", "huge"},  # absolute temperature [K]
    "unit": {"negative", "huge"},  # 0..1 (emissivity)
    "nonzero": {"zero"},  # a temperature difference that must not vanish
    "int": {"tiny"},  # an integer count or index
}


@dataclass
class Case:
    id: str
    func: object
    kwargs: dict
    kinds: dict  # argument (or "dict_arg.key") -> kind
    layers: tuple = ()  # arguments with layers on the last axis: "empty" must raise
    scalar: tuple = ()  # single-number arguments: wrong shape must raise
    optional: tuple = ()  # None is a valid value ("not given")
    names: dict = field(default_factory=dict)  # argument -> words its message may use
    no_partner: tuple = ()  # arguments not made (2,) for the wrong-shape case
    valid: tuple = ()  # (argument, label) pairs that are valid inputs here


def _flux_model(s):
    with np.errstate(divide="ignore", invalid="ignore"):  # monte_carlo must catch the result
        return s["k"] * 20.0 / s["L"]


_FOAM = dict(thickness=0.05, conductivity=0.04)
_WALL = dict(thicknesses=[0.1, 0.05], conductivities=[1.0, 0.04])
_HOUSING = housing.solve_housing(0.2, 0.1, 0.05, 0.002, [167.0, 0.2], 0.85, 5.0, 298.15, "on-table")
_WARM = housing.housing_warm_up(0.2, 0.1, 0.05, 0.002, [167.0, 0.2], 0.85, 5.0, 298.15, 300.0,
                                1200.0, "on-table")
_VALUES = [[1.0, 10.0], [3.0, 30.0], [2.0, 20.0]]
_DIRS = ["min", "max"]
_STACK = dict(conductivity=[0.04, 0.2], density=[30.0, 1200.0], cost_per_volume=[100.0, 900.0],
              thicknesses=[0.01, 0.02])
_STACK_KINDS = dict(conductivity="pos", density="pos", cost_per_volume="nonneg", thicknesses="pos")
# thickness options: one list for all materials (any length) or one list per material
_STACK_VALID = (("thicknesses", "wrong_shape"), ("thicknesses", "ragged"))
_BOX = dict(length=0.3, width=0.2, height=0.1)
_BOX_KINDS = dict(length="pos", width="pos", height="pos")


def _check_limit(values, limit):
    return ranking.check_limit(ranking.Limit("thickness", values, limit, "max", "m"))


def _air_layer_resistance(t_a, t_b):
    return air_layers.AirLayer(0.025, "horizontal", method="detailed", height=1.0).resistance(t_a, t_b)


def _with_limit(contact_duration, limit):
    return touch.load_touch_limits().with_limit("plastic", contact_duration, limit, "test value")


CASES = [
    # conduction
    Case("heat_flux", wb.heat_flux, dict(k=0.04, thickness=0.05, delta_t=20.0),
         dict(k="pos", thickness="pos", delta_t="real")),
    Case("series_resistance", wb.series_resistance, dict(**_WALL, r_si=0.13, r_se=0.04),
         dict(thicknesses="pos", conductivities="pos", r_si="nonneg", r_se="nonneg"),
         layers=("thicknesses", "conductivities")),
    Case("u_value", wb.u_value, dict(**_WALL, r_si=0.13, r_se=0.04),
         dict(thicknesses="pos", conductivities="pos", r_si="nonneg", r_se="nonneg"),
         layers=("thicknesses", "conductivities")),
    Case("wall_temperatures", wb.wall_temperatures,
         dict(**_WALL, t_inside=293.15, t_outside=273.15, r_si=0.13, r_se=0.04),
         dict(thicknesses="pos", conductivities="pos", t_inside="temp", t_outside="temp",
              r_si="nonneg", r_se="nonneg"),
         layers=("thicknesses", "conductivities")),
    Case("required_thickness", wb.required_thickness,
         dict(k=0.035, delta_t=40.0, max_flux=10.0, other_resistance=0.5),
         dict(k="pos", delta_t="real", max_flux="pos", other_resistance="nonneg")),
    Case("mass_per_area", wb.mass_per_area, dict(densities=[2700.0, 30.0], thicknesses=[0.002, 0.05]),
         dict(densities="pos", thicknesses="pos"), layers=("densities", "thicknesses")),
    Case("cost_per_area", wb.cost_per_area,
         dict(unit_costs=[3.0, 120.0], thicknesses=[0.002, 0.05], densities=[2700.0, 30.0],
              basis=["per_kg", "per_m3"]),
         dict(unit_costs="nonneg", thicknesses="pos", densities="pos"),
         layers=("unit_costs", "thicknesses", "densities")),
    Case("mean_conductivity", wb.mean_conductivity,
         dict(temperatures=[250.0, 350.0], conductivities=[0.02, 0.03], t1=280.0, t2=320.0),
         dict(temperatures="temp", conductivities="pos", t1="temp", t2="temp"),
         layers=("temperatures", "conductivities")),
    Case("SolidLayer", conduction.SolidLayer, dict(_FOAM),
         dict(thickness="pos", conductivity="pos"), scalar=("thickness", "conductivity")),
    Case("solve_wall", wb.solve_wall,
         dict(layers=[conduction.SolidLayer(**_FOAM)], t_inside=293.15, t_outside=273.15,
              r_si=0.13, r_se=0.04, rtol=1e-10, max_iter=200),
         dict(t_inside="temp", t_outside="temp", r_si="nonneg", r_se="nonneg", rtol="pos",
              max_iter="int"),
         scalar=("rtol", "max_iter")),
    # surfaces
    Case("iso6946_convection_coefficient", surfaces.iso6946_convection_coefficient,
         dict(side="outside", direction="horizontal", wind_speed=4.0), dict(wind_speed="nonneg")),
    Case("iso6946_surface_resistance", surfaces.iso6946_surface_resistance,
         dict(side="outside", direction="down", emissivity=0.9, t_mean=273.15, wind_speed=4.0),
         dict(emissivity="unit", t_mean="temp", wind_speed="nonneg"), optional=("t_mean",)),
    Case("plate_characteristic_length", surfaces.plate_characteristic_length,
         dict(length=0.4, width=0.3), dict(length="pos", width="pos")),
    Case("natural_convection_coefficient", wb.natural_convection_coefficient,
         dict(t_surface=313.15, t_ambient=293.15, length=0.5, orientation="vertical"),
         dict(t_surface="temp", t_ambient="temp", length="pos")),
    Case("natural_convection_coefficient_up", wb.natural_convection_coefficient,
         dict(t_surface=313.15, t_ambient=293.15, length=0.1, orientation="horizontal-up"),
         dict(t_surface="temp", t_ambient="temp", length="pos")),
    Case("flat_plate_convection_coefficient", wb.flat_plate_convection_coefficient,
         dict(velocity=2.0, length=0.5, t_surface=303.15, t_air=293.15, re_transition=5e5),
         dict(velocity="nonneg", length="pos", t_surface="temp", t_air="temp", re_transition="pos"),
         scalar=("re_transition",)),
    Case("radiation_coefficient", wb.radiation_coefficient,
         dict(emissivity=0.9, t_surface=300.0, t_ambient=280.0),
         dict(emissivity="unit", t_surface="temp", t_ambient="temp")),
    Case("blackbody_radiation_coefficient", surfaces.blackbody_radiation_coefficient,
         dict(t_mean=283.15), dict(t_mean="temp")),
    Case("combined_film_resistance", wb.combined_film_resistance,
         dict(t_surface=303.15, t_air=293.15, length=0.5, orientation="vertical", emissivity=0.9,
              wind_speed=1.0),
         dict(t_surface="temp", t_air="temp", length="pos", emissivity="unit", wind_speed="nonneg")),
    Case("SurfaceFilm", wb.SurfaceFilm,
         dict(length=0.3, orientation="vertical", emissivity=0.9, wind_speed=1.0),
         dict(length="pos", emissivity="unit", wind_speed="nonneg"),
         scalar=("length", "emissivity", "wind_speed")),
    Case("surface_film", wb.surface_film,
         dict(length=0.3, orientation="vertical", emissivity=0.9, wind_speed=1.0),
         dict(length="pos", emissivity="unit", wind_speed="nonneg"),
         scalar=("length", "emissivity", "wind_speed")),
    # air layers
    Case("effective_emissivity", air_layers.effective_emissivity,
         dict(emissivity_1=0.9, emissivity_2=0.5), dict(emissivity_1="unit", emissivity_2="unit")),
    Case("parallel_plate_radiation_coefficient", air_layers.parallel_plate_radiation_coefficient,
         dict(emissivity_1=0.9, emissivity_2=0.9, t_1=285.65, t_2=280.65),
         dict(emissivity_1="unit", emissivity_2="unit", t_1="temp", t_2="temp")),
    Case("air_layer_resistance", wb.air_layer_resistance,
         dict(width=0.025, direction="horizontal", emissivity_1=0.9, emissivity_2=0.9,
              t_mean=283.15, delta_t=5.0),
         dict(width="pos", emissivity_1="unit", emissivity_2="unit", t_mean="temp", delta_t="real")),
    Case("nusselt_horizontal_layer", air_layers.nusselt_horizontal_layer, dict(rayleigh=1e5),
         dict(rayleigh="nonneg")),
    Case("nusselt_tilted_layer", air_layers.nusselt_tilted_layer, dict(rayleigh=1e4, tilt=45.0),
         dict(rayleigh="nonneg", tilt="real")),
    Case("nusselt_vertical_cavity", air_layers.nusselt_vertical_cavity,
         dict(rayleigh=1e5, aspect_ratio=20.0), dict(rayleigh="nonneg", aspect_ratio="pos")),
    Case("air_layer_resistance_detailed", wb.air_layer_resistance_detailed,
         dict(width=0.025, direction="horizontal", emissivity_1=0.9, emissivity_2=0.9,
              t_mean=283.15, delta_t=5.0, height=1.0),
         dict(width="pos", emissivity_1="unit", emissivity_2="unit", t_mean="temp",
              delta_t="real", height="pos")),
    Case("air_layer_resistance_detailed_tilt", wb.air_layer_resistance_detailed,
         dict(width=0.02, direction="up", t_mean=283.15, delta_t=10.0, tilt=30.0),
         dict(width="pos", t_mean="temp", delta_t="real", tilt="real"), optional=("tilt",)),
    Case("gap_equivalent_conductivity", wb.gap_equivalent_conductivity,
         dict(width=0.01, direction="horizontal", emissivity_1=0.9, emissivity_2=0.9,
              t_mean=283.15, delta_t=5.0, method="detailed", height=1.0),
         dict(width="pos", emissivity_1="unit", emissivity_2="unit", t_mean="temp",
              delta_t="real", height="pos")),
    Case("gap_equivalent_conductivity_iso", wb.gap_equivalent_conductivity,
         dict(width=0.01, direction="up", t_mean=283.15, delta_t=5.0, method="iso6946"),
         dict(width="pos", t_mean="temp", delta_t="real")),
    Case("convection_onset_width", wb.convection_onset_width,
         dict(direction="horizontal", delta_t=10.0, t_mean=293.15, height=1.0, nusselt_excess=0.05),
         dict(delta_t="nonzero", t_mean="temp", height="pos", nusselt_excess="pos"),
         optional=("height",), scalar=("nusselt_excess",)),
    Case("convection_onset_width_up", wb.convection_onset_width,
         dict(direction="up", delta_t=10.0, t_mean=293.15),
         dict(delta_t="nonzero", t_mean="temp")),
    Case("ventilation_class", wb.ventilation_class, dict(opening_area=800e-6),
         dict(opening_area="nonneg")),
    Case("ventilated_component_resistance", air_layers.ventilated_component_resistance,
         dict(opening_area=1000e-6, r_total_unventilated=2.0, r_total_ventilated=1.5),
         dict(opening_area="nonneg", r_total_unventilated="pos", r_total_ventilated="pos")),
    Case("AirLayer", wb.AirLayer,
         dict(thickness=0.025, direction="horizontal", emissivity_1=0.9, emissivity_2=0.9,
              method="detailed", height=1.0),
         dict(thickness="pos", emissivity_1="unit", emissivity_2="unit", height="pos"),
         scalar=("thickness", "emissivity_1", "emissivity_2", "height")),
    Case("AirLayer.resistance", _air_layer_resistance, dict(t_a=290.0, t_b=280.0),
         dict(t_a="temp", t_b="temp")),
    # air properties
    Case("air_properties", wb.air_properties, dict(t=300.0, pressure=101325.0),
         dict(t="temp", pressure="pos")),
    Case("air_conductivity", air_properties.air_conductivity, dict(t=300.0), dict(t="temp")),
    Case("air_viscosity", air_properties.air_viscosity, dict(t=300.0), dict(t="temp")),
    Case("air_specific_heat", air_properties.air_specific_heat, dict(t=300.0), dict(t="temp")),
    Case("air_density", air_properties.air_density, dict(t=300.0, pressure=101325.0),
         dict(t="temp", pressure="pos")),
    # geometry
    Case("box_conductance", wb.box_conductance,
         dict(length=0.3, width=0.3, height=0.3, wall_thickness=0.05, k=0.03),
         dict(length="pos", width="pos", height="pos", wall_thickness="pos", k="pos")),
    Case("box_conductance_breakdown", wb.box_conductance_breakdown,
         dict(length=0.3, width=0.3, height=0.3, wall_thickness=0.05, k=0.03),
         dict(length="pos", width="pos", height="pos", wall_thickness="pos", k="pos")),
    Case("layered_box_conductance", wb.layered_box_conductance,
         dict(length=0.3, width=0.3, height=0.3, thicknesses=[0.002, 0.05],
              conductivities=[0.2, 0.03], r_si=0.13, r_se=0.04),
         dict(length="pos", width="pos", height="pos", thicknesses="pos", conductivities="pos",
              r_si="nonneg", r_se="nonneg"),
         layers=("thicknesses", "conductivities")),
    Case("cylinder_resistance_per_length", geometry.cylinder_resistance_per_length,
         dict(inner_radius=0.05, thicknesses=[0.005, 0.02], conductivities=[50.0, 0.04],
              r_si=0.01, r_se=0.1),
         dict(inner_radius="pos", thicknesses="pos", conductivities="pos", r_si="nonneg",
              r_se="nonneg"),
         layers=("thicknesses", "conductivities")),
    Case("cylinder_conductance", wb.cylinder_conductance,
         dict(inner_radius=0.05, thicknesses=[0.005, 0.02], conductivities=[50.0, 0.04],
              length=1.0, r_si=0.01, r_se=0.1),
         dict(inner_radius="pos", thicknesses="pos", conductivities="pos", length="pos",
              r_si="nonneg", r_se="nonneg"),
         layers=("thicknesses", "conductivities")),
    Case("critical_insulation_radius", wb.critical_insulation_radius, dict(k=0.055, h=5.0),
         dict(k="pos", h="pos")),
    Case("vacuum_panel_effective_conductivity", wb.vacuum_panel_effective_conductivity,
         dict(centre_conductivity=0.004, thickness=0.02, length=0.5, width=0.5, psi_edge=0.008),
         dict(centre_conductivity="pos", thickness="pos", length="pos", width="pos",
              psi_edge="nonneg")),
    Case("VacuumPanel", wb.VacuumPanel,
         dict(thickness=0.02, centre_conductivity=0.004, length=0.5, width=0.5, psi_edge=0.008),
         dict(thickness="pos", centre_conductivity="pos", length="pos", width="pos",
              psi_edge="nonneg"),
         scalar=("thickness", "centre_conductivity", "length", "width", "psi_edge")),
    # touch
    Case("touch_limit", wb.touch_limit, dict(material_class="plastic", contact_duration=60.0),
         dict(contact_duration="pos"), scalar=("contact_duration",)),
    Case("touch_margin", wb.touch_margin, dict(t_surface=318.15, limit=321.15),
         dict(t_surface="temp", limit="temp")),
    Case("TouchLimit", touch.TouchLimit,
         dict(material_class="plastic", contact_duration=60.0, limit=333.15, source="test value"),
         dict(contact_duration="pos", limit="temp"), scalar=("contact_duration", "limit")),
    Case("TouchLimits.with_limit", _with_limit, dict(contact_duration=30.0, limit=330.0),
         dict(contact_duration="pos", limit="temp"), scalar=("contact_duration", "limit")),
    # housing
    Case("enclosure_faces", housing.enclosure_faces,
         dict(length=0.2, width=0.1, height=0.05, wall_thickness=0.002, mounting="on-table"),
         dict(length="pos", width="pos", height="pos", wall_thickness="pos")),
    Case("solve_housing", wb.solve_housing,
         dict(length=0.2, width=0.1, height=0.05, wall_thickness=0.002, k=167.0, emissivity=0.82,
              power=5.0, t_ambient=298.15, mounting="on-table", extra_resistance=0.001,
              h_inside=4.0, tolerance=1e-6, max_iterations=200),
         dict(length="pos", width="pos", height="pos", wall_thickness="pos", k="pos",
              emissivity="unit", power="nonneg", t_ambient="temp", extra_resistance="nonneg",
              h_inside="pos", tolerance="pos", max_iterations="int"),
         optional=("h_inside",), scalar=("tolerance", "max_iterations")),
    Case("housing_warm_up", wb.housing_warm_up,
         dict(length=0.2, width=0.1, height=0.05, wall_thickness=0.002, k=167.0, emissivity=0.82,
              power=5.0, t_ambient=298.15, heat_capacity=300.0, duration=1200.0,
              mounting="on-table", t_start=298.15, time_step=30.0),
         dict(length="pos", width="pos", height="pos", wall_thickness="pos", k="pos",
              emissivity="unit", power="nonneg", t_ambient="temp", heat_capacity="pos",
              duration="pos", t_start="temp", time_step="pos"),
         optional=("t_start", "time_step"), scalar=("duration", "time_step"),
         # a huge height or length fails in the convection correlation's characteristic length
         names=dict(height=("height", "length"), width=("width", "length"))),
    Case("housing_heat_capacity", wb.housing_heat_capacity,
         dict(length=0.2, width=0.1, height=0.05, wall_thickness=0.002, density=2700.0,
              specific_heat=900.0, content_capacity=100.0),
         dict(length="pos", width="pos", height="pos", wall_thickness="pos", density="pos",
              specific_heat="pos", content_capacity="nonneg")),
    Case("WarmUp.time_to_limit", lambda limit: _WARM.time_to_limit(limit), dict(limit=300.0),
         dict(limit="temp"), names=dict(limit=("limit",))),
    Case("solve_housing_inside_air", wb.solve_housing,
         dict(length=0.2, width=0.1, height=0.05, wall_thickness=0.002, k=0.2, emissivity=0.9,
              power=5.0, t_ambient=298.15, mounting="free-standing"),
         dict(length="pos", width="pos", height="pos", wall_thickness="pos", k="pos",
              emissivity="unit", power="nonneg", t_ambient="temp")),
    Case("hot_spot", wb.hot_spot, dict(solution=_HOUSING, source_area=4e-4, source_power=2.0),
         dict(source_area="pos", source_power="nonneg")),
    # spreading
    Case("equivalent_radius", spreading.equivalent_radius, dict(area=4e-4), dict(area="pos")),
    Case("spreading_length", wb.spreading_length, dict(k=0.2, thickness=0.002, h=10.0),
         dict(k="pos", thickness="pos", h="pos")),
    Case("wall_biot_number", wb.wall_biot_number, dict(h=10.0, thickness=0.002, k=0.2),
         dict(h="pos", thickness="pos", k="pos")),
    Case("plate_resistance", spreading.plate_resistance,
         dict(plate_radius=0.05, thickness=0.002, k=0.2, h=10.0),
         dict(plate_radius="pos", thickness="pos", k="pos", h="pos")),
    Case("spreading_resistance", wb.spreading_resistance,
         dict(source_radius=0.01, plate_radius=0.05, thickness=0.002, k=0.2, h=10.0),
         dict(source_radius="pos", plate_radius="pos", thickness="pos", k="pos", h="pos")),
    Case("spreading_resistance_closed_form", spreading.spreading_resistance_closed_form,
         dict(source_radius=0.01, plate_radius=0.05, thickness=0.002, k=0.2, h=10.0),
         dict(source_radius="pos", plate_radius="pos", thickness="pos", k="pos", h="pos")),
    # ranking
    Case("pareto_front", wb.pareto_front, dict(objectives=[[1.0, 4.0], [2.0, 2.0], [3.0, 3.0]]),
         dict(objectives="real")),
    Case("oriented", ranking.oriented, dict(values=_VALUES, directions=_DIRS), dict(values="real"),
         names=dict(values=("values", "directions"))),
    Case("check_limit", _check_limit, dict(values=[0.02, 0.08], limit=0.05),
         dict(values="real", limit="real"), names=dict(values=("thickness",), limit=("thickness",))),
    Case("check_service_range", ranking.check_service_range,
         dict(t_service_min=[233.15, 233.15], t_service_max=[353.15, 523.15], t_face_min=253.15,
              t_face_max=373.15),
         dict(t_service_min="temp", t_service_max="temp", t_face_min="temp", t_face_max="temp")),
    Case("screen_candidates", wb.screen_candidates,
         dict(t_service_min=[233.15, 233.15], t_service_max=[353.15, 523.15], t_hot=343.15,
              t_cold=253.15, thickness=[0.03, 0.06], max_thickness=0.05,
              mass_per_area=[2.0, 1.0], max_mass_per_area=1.5, cost_per_area=[10.0, 20.0],
              max_cost_per_area=15.0),
         dict(t_service_min="temp", t_service_max="temp", t_hot="temp", t_cold="temp",
              thickness="nonneg", max_thickness="nonneg", mass_per_area="nonneg",
              max_mass_per_area="nonneg", cost_per_area="nonneg", max_cost_per_area="nonneg"),
         scalar=("max_thickness", "max_mass_per_area", "max_cost_per_area"),
         optional=("t_service_min", "t_service_max", "t_hot", "t_cold", "thickness",
                   "max_thickness", "mass_per_area", "max_mass_per_area", "cost_per_area",
                   "max_cost_per_area")),
    Case("material_indices", wb.material_indices,
         dict(conductivity=[0.04, 0.2], density=[30.0, 1200.0], cost_per_kg=[4.0, 2.0]),
         dict(conductivity="pos", density="pos", cost_per_kg="nonneg"), optional=("cost_per_kg",)),
    Case("wall_for_resistance", ranking.wall_for_resistance,
         dict(resistance=2.0, conductivity=[0.04, 0.2], density=[30.0, 1200.0],
              cost_per_kg=[4.0, 2.0]),
         dict(resistance="pos", conductivity="pos", density="pos", cost_per_kg="nonneg"),
         optional=("cost_per_kg",)),
    Case("normalise_criteria", ranking.normalise_criteria, dict(values=_VALUES, directions=_DIRS),
         dict(values="real"), names=dict(values=("values", "directions"))),
    Case("weighted_scores", wb.weighted_scores,
         dict(values=_VALUES, directions=_DIRS, weights=[3.0, 1.0]),
         dict(values="real", weights="nonneg"), names=dict(values=("values", "directions"))),
    Case("simplex_weights", ranking.simplex_weights, dict(n_criteria=3, resolution=10),
         dict(n_criteria="int", resolution="int"), scalar=("n_criteria", "resolution")),
    Case("rank_stability", wb.rank_stability,
         dict(values=_VALUES, directions=_DIRS, resolution=4, n_samples=50, seed=0, tol=1e-12),
         dict(values="real", resolution="int", n_samples="int", seed="int", tol="nonneg"),
         scalar=("resolution", "n_samples", "seed", "tol"), optional=("n_samples",),
         names=dict(values=("values", "directions"))),
    Case("simplex_winner", ranking.simplex_winner,
         dict(values=_VALUES, directions=_DIRS, resolution=4, tol=1e-12),
         dict(values="real", resolution="int", tol="nonneg"), scalar=("resolution", "tol"),
         names=dict(values=("values", "directions"))),
    # uncertainty
    Case("monte_carlo", wb.monte_carlo,
         dict(model=_flux_model, nominal={"k": [0.04, 0.03], "L": [0.05, 0.05]},
              tolerance={"k": 0.1}, n_samples=200, rng=1, limit=15.0, limit_criterion=0,
              chunk_size=100, max_bytes=2**20),
         {"nominal.k": "pos", "nominal.L": "real", "tolerance.k": "nonneg", "n_samples": "int",
          "limit": "real", "limit_criterion": "int", "chunk_size": "int", "max_bytes": "int",
          "rng": "int"},
         optional=("limit",),
         scalar=("n_samples", "limit", "limit_criterion", "chunk_size", "max_bytes", "rng")),
    Case("sample_truncated_normal", uncertainty.sample_truncated_normal,
         dict(nominal=[1.0, 2.0], tolerance=[0.0, 0.1], size=4, rng=np.random.default_rng(1)),
         dict(nominal="real", tolerance="nonneg", size="int"), scalar=("size",)),
    # stacks
    Case("enumerate_stacks", wb.enumerate_stacks, dict(**_STACK, n_layers=2),
         dict(_STACK_KINDS, n_layers="int"), layers=tuple(_STACK), scalar=("n_layers",), valid=_STACK_VALID),
    Case("stack_front", wb.stack_front, dict(**_STACK, max_layers=2, max_total_thickness=0.05),
         dict(_STACK_KINDS, max_layers="int", max_total_thickness="pos"), layers=tuple(_STACK),
         scalar=("max_layers", "max_total_thickness"), optional=("max_total_thickness",),
         valid=_STACK_VALID),
    Case("stack_catalogue", wb.stack_catalogue,
         dict(**_STACK, max_layers=2, max_total_thickness=0.05),
         dict(_STACK_KINDS, max_layers="int", max_total_thickness="pos"), layers=tuple(_STACK),
         scalar=("max_layers", "max_total_thickness"), optional=("max_total_thickness",),
         valid=_STACK_VALID),
    Case("check_service_limits", wb.check_service_limits,
         dict(order=[1, 0], face_temperatures=[423.15, 343.15, 293.15], t_min=[223.15, 223.15],
              t_max=[353.15, 673.15]),
         dict(order="int", face_temperatures="temp", t_min="temp", t_max="temp"),
         layers=("order", "face_temperatures", "t_min", "t_max")),
    # freight
    Case("shell_volume", freight.shell_volume, dict(**_BOX, thickness=0.05),
         dict(_BOX_KINDS, thickness="nonneg")),
    Case("coolant_layer_thickness", freight.coolant_layer_thickness,
         dict(**_BOX, coolant_volume=0.018), dict(_BOX_KINDS, coolant_volume="nonneg")),
    Case("outer_dimensions", wb.outer_dimensions,
         dict(**_BOX, coolant_thickness=0.02, wall_thickness=0.05),
         dict(_BOX_KINDS, coolant_thickness="nonneg", wall_thickness="nonneg")),
    Case("wall_mass", freight.wall_mass,
         dict(**_BOX, thicknesses=[0.05, 0.003], densities=[30.0, 700.0]),
         dict(_BOX_KINDS, thicknesses="nonneg", densities="nonneg"),
         layers=("thicknesses", "densities")),
    Case("billable_mass", wb.billable_mass,
         dict(length=0.30, width=0.45, height=0.65, actual_mass=8.0, divisor=0.006),
         dict(_BOX_KINDS, actual_mass="nonneg", divisor="pos")),
    Case("round_up_mass", wb.round_up_mass, dict(mass=14.625, increment=0.5),
         dict(mass="nonneg", increment="pos")),
    Case("landed_cost", wb.landed_cost,
         dict(packaging_cost=6.0, coolant_cost=1.5, billable=15.0, rate_per_kg=1.2, fixed_fee=4.0),
         dict(packaging_cost="nonneg", coolant_cost="nonneg", billable="nonneg",
              rate_per_kg="nonneg", fixed_fee="nonneg")),
]

#: Public callables with no numeric argument, or result containers (no input to check).
NOT_IN_MATRIX = {
    # result containers (frozen dataclasses built by the functions above)
    "WallSolution", "AirProperties", "BoxConductance", "EnclosureFaces", "HousingSolution",
    "HotSpot", "SpreadingResistance", "MonteCarloResult", "StackSet", "StackCatalogue",
    "ServiceCheck", "ConstraintResult", "MaterialIndices", "RankStability", "SimplexWinner",
    "TouchLimits",
    # no numeric argument: choice of names or a file path only
    "conventional_surface_resistance", "load_touch_limits", "touch_class", "Criterion",
    "combine_constraints",
    # Limit holds the values unchecked; check_limit validates them (its own case)
    "Limit",
}


def _public_callables():
    names = set()
    for mod in MODULES:
        names |= {n for n in mod.__all__ if callable(getattr(mod, n))}
    for n in wb.__all__:
        mod = getattr(getattr(wb, n), "__module__", None) or ""
        if callable(getattr(wb, n)) and mod.split(".")[-1] in {m.__name__.split(".")[-1] for m in MODULES}:
            names.add(n)
    return names - {"ValidityWarning"}


def _covered(name):
    return any(c.id == name or c.id.startswith((name + "_", name + ".")) for c in CASES) or any(
        c.id.startswith(n) for c in CASES for n in ("check_limit",) if name == n
    )


def test_matrix_covers_every_public_callable():
    missing = sorted(n for n in _public_callables() - NOT_IN_MATRIX if not _covered(n))
    assert not missing, f"public callables without a bad-input case: {missing}"


def _get(kwargs, path):
    if "." in path:
        top, key = path.split(".", 1)
        return kwargs[top][key]
    return kwargs[path]


def _set(kwargs, path, value):
    out = dict(kwargs)
    if "." in path:
        top, key = path.split(".", 1)
        out[top] = dict(out[top])
        out[top][key] = value
    else:
        out[path] = value
    return out


def _like(base, value):
    """``value`` in the shape of ``base`` (numbers only)."""
    arr = np.asarray(base, dtype=float)
    return float(value) if arr.ndim == 0 else np.full(arr.shape, value).tolist()


def _substitute(case, path, label):
    base = _get(case.kwargs, path)
    value = BAD[label]
    if label == "wrong_shape":
        arr = np.asarray(base, dtype=float)
        bad = np.full(3, float(arr.flat[0])) if arr.ndim == 0 else np.resize(
            arr, arr.shape[:-1] + (arr.shape[-1] + 1,))
        kw = _set(case.kwargs, path, bad)
        for other, kind in case.kinds.items():
            if other == path or other in case.scalar or kind == "int" or other in case.no_partner:
                continue
            ob = _get(kw, other)
            if ob is not None and np.ndim(ob) == 0:
                kw = _set(kw, other, [ob, ob])
        return kw
    if label in ("negative", "zero", "huge", "tiny", "nan", "+inf", "-inf"):
        if case.kinds[path] == "int" and label in ("negative", "zero"):
            value = -1 if label == "negative" else 0
            return _set(case.kwargs, path, value if np.ndim(base) == 0 else [value] * len(base))
        if label == "negative":
            return _set(case.kwargs, path, (-np.abs(np.asarray(base, float))).tolist())
        return _set(case.kwargs, path, _like(base, value))
    return _set(case.kwargs, path, value)


def _must_raise(case, path, label):
    kind = case.kinds[path]
    if (path, label) in case.valid:
        return False
    if label in ALWAYS_RAISE or label in KINDS[kind]:
        return True
    if label == "none":
        return path not in case.optional
    if label == "empty":
        return path in case.layers or path in case.scalar or kind == "int"
    if label == "wrong_shape":
        return _shape_conflict(case, path)
    return False


def _shape_conflict(case, path):
    """Whether the wrong-shape substitution leaves arrays that cannot broadcast together."""
    if path in case.scalar or path in case.names:
        return True
    return any(
        other != path and kind != "int" and other not in case.no_partner
        and _get(case.kwargs, other) is not None
        for other, kind in case.kinds.items()
    )


def _floats(obj, seen=None):
    """Every float array inside a result (dataclasses, tuples, arrays, numbers)."""
    if obj is None or isinstance(obj, str | bool):
        return
    if dataclasses.is_dataclass(obj) and not isinstance(obj, type):
        for f in dataclasses.fields(obj):
            if f.name != "thickness_table":  # NaN-padded by design (StackSet docstring)
                yield from _floats(getattr(obj, f.name))
        return
    if isinstance(obj, tuple | list) and not (obj and isinstance(obj[0], int | float)):
        for x in obj:
            yield from _floats(x)
        return
    if callable(obj) or isinstance(obj, dict):
        return
    arr = np.asarray(obj)
    if arr.dtype.kind in "fc":
        yield arr


def _names(case, path):
    top = path.split(".")[0]
    return case.names.get(top, (top,))


PARAMS = [
    pytest.param(case, path, label, id=f"{case.id}-{path}-{label}")
    for case in CASES
    for path in case.kinds
    for label in BAD
]


@pytest.mark.parametrize("case, path, label", PARAMS)
def test_bad_input(case, path, label):
    kwargs = _substitute(case, path, label)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        warnings.simplefilter("error", RuntimeWarning)
        try:
            out = case.func(**kwargs)
        except (ValueError, TypeError) as exc:
            msg = str(exc)
            assert any(n in msg for n in _names(case, path)), (
                f"{case.id}({path}={label}): message does not name {_names(case, path)}: {msg}"
            )
            return
    assert not _must_raise(case, path, label), (
        f"{case.id}({path}={label}) returned a result for a value outside the domain "
        f"({case.kinds[path]})"
    )
    for arr in _floats(out):
        assert np.all(np.isfinite(arr)), f"{case.id}({path}={label}) returned a non-finite value"


def test_matrix_size():
    # the numbers quoted in the report; a change here means a case was added or dropped
    functions = {c.func for c in CASES}
    assert len(PARAMS) == sum(len(c.kinds) for c in CASES) * len(BAD)
    assert len(functions) >= 80


def test_base_calls_are_valid():
    for case in CASES:
        with warnings.catch_warnings():
            warnings.simplefilter("error")
            out = case.func(**case.kwargs)
        for arr in _floats(out):
            assert np.all(np.isfinite(arr)), case.id


# ---------------------------------------------------------------------------
# Property tests of the main formulas on their domains
# ---------------------------------------------------------------------------

POS = st.floats(min_value=1e-6, max_value=1e3)
K = st.floats(min_value=1e-3, max_value=2e3)
TEMP = st.floats(min_value=1.0, max_value=MAX_TEMPERATURE)
DT = st.floats(min_value=-1e3, max_value=1e3)
LAYERS = st.lists(st.tuples(POS, K), min_size=1, max_size=5)


@settings(max_examples=200, deadline=None)
@given(POS, K, DT)
def test_heat_flux_finite_on_domain(thickness, k, delta_t):
    q = wb.heat_flux(k, thickness, delta_t)
    assert np.isfinite(q)
    assert q * delta_t >= 0  # the flux runs from hot to cold


@settings(max_examples=200, deadline=None)
@given(st.floats(allow_nan=True, allow_infinity=True).filter(lambda x: not (x > 0 and x < np.inf)))
def test_heat_flux_refuses_non_positive_or_non_finite_thickness(thickness):
    with pytest.raises(ValueError, match="thickness"):
        wb.heat_flux(0.04, thickness, 20.0)


@settings(max_examples=200, deadline=None)
@given(LAYERS, st.floats(min_value=0.0, max_value=1.0), st.floats(min_value=0.0, max_value=1.0))
def test_series_resistance_and_u_value_finite(layers, r_si, r_se):
    thick, cond = map(list, zip(*layers, strict=True))
    r = wb.series_resistance(thick, cond, r_si, r_se)
    u = wb.u_value(thick, cond, r_si, r_se)
    assert np.isfinite(r) and r > 0
    assert np.isfinite(u) and u > 0
    assert u * r == pytest.approx(1.0)


@settings(max_examples=200, deadline=None)
@given(LAYERS, st.integers(min_value=0, max_value=4),
       st.one_of(st.floats(max_value=0.0), st.just(float("nan")), st.just(float("inf"))))
def test_layers_refuse_a_bad_layer(layers, where, bad):
    thick, cond = map(list, zip(*layers, strict=True))
    thick[where % len(thick)] = bad
    with pytest.raises(ValueError, match="thicknesses"):
        wb.series_resistance(thick, cond)
    with pytest.raises(ValueError, match="thicknesses"):
        wb.u_value(thick, cond)


@settings(max_examples=200, deadline=None)
@given(LAYERS, TEMP, TEMP, st.floats(min_value=0.0, max_value=1.0))
def test_wall_temperatures_finite_and_between(layers, t_in, t_out, r_si):
    thick, cond = map(list, zip(*layers, strict=True))
    t = wb.wall_temperatures(thick, cond, t_in, t_out, r_si, 0.04)
    assert t.shape == (len(thick) + 1,)
    assert np.all(np.isfinite(t))
    lo, hi = min(t_in, t_out), max(t_in, t_out)
    assert np.all(t >= lo - 1e-9 * hi) and np.all(t <= hi + 1e-9 * hi)


@settings(max_examples=200, deadline=None)
@given(st.one_of(st.floats(max_value=0.0), st.floats(min_value=MAX_TEMPERATURE * 1.0001),
                 st.just(float("nan"))))
def test_wall_temperatures_refuse_bad_absolute_temperature(t_bad):
    with pytest.raises(ValueError, match="t_outside"):
        wb.wall_temperatures([0.1], [0.04], 293.15, t_bad)
