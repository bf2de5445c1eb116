"""Insulated shipper: the study object (:mod:`.study`), its scenario-file kind (:mod:`.kind`),
its figures and report charts (:mod:`.charts`; plotly imported lazily).

Everything the former ``workbench.studies.shipper`` module exported is importable from here.
"""

from workbench.studies.shipper.charts import cost_figure, hold_figure, trace_figure
from workbench.studies.shipper.study import (
    GENERAL_CAUTIONS,
    SHIPPER_ASSUMPTIONS,
    SINGLE_PROFILE,
    TRACE_CAUTION,
    ShipperCandidate,
    ShipperResults,
    ShipperStudy,
)

__all__ = [
    "ShipperCandidate",
    "ShipperStudy",
    "ShipperResults",
    "SHIPPER_ASSUMPTIONS",
    "GENERAL_CAUTIONS",
    "cost_figure",
    "hold_figure",
    "trace_figure",
    "SINGLE_PROFILE",
    "TRACE_CAUTION",
]
