"""Interactive workbench for Jupyter (ipywidgets + plotly, drawn with Plotly.react).

Only this package imports ipywidgets and plotly's widget classes; nothing
imports it. Show :class:`Workbench` in one cell::

    from workbench.widgets import Workbench
    Workbench()

The shipper and housing studies have their own panels, :class:`ShipperPanel`
and :class:`HousingPanel`, shown the same way.
"""

from workbench.widgets.app import DEMO_CANDIDATES, DEMO_TITLE, Workbench, demo_study
from workbench.widgets.housing_panel import HousingPanel
from workbench.widgets.runner import Cancelled, TaskRunner, fine_sweep
from workbench.widgets.shipper_panel import ShipperPanel

__all__ = [
    "Workbench",
    "ShipperPanel",
    "HousingPanel",
    "demo_study",
    "DEMO_CANDIDATES",
    "DEMO_TITLE",
    "TaskRunner",
    "fine_sweep",
    "Cancelled",
]
