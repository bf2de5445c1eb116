"""Interactive workbench for Jupyter (ipywidgets + plotly, drawn with Plotly.react).

Only this package imports ipywidgets and plotly's widget classes; nothing
imports it. Show :class:`Workbench` in one cell::

    from workbench.widgets import Workbench
    Workbench()

The shipper and housing studies have their own panels, :class:`ShipperPanel`
and :class:`HousingPanel`, shown the same way. :class:`JobChooser` is the web
app's first page (``make app``): it offers the three jobs and opens scenario files.
"""

from workbench.widgets.app import DEMO_CANDIDATES, DEMO_TITLE, Workbench, demo_study
from workbench.widgets.housing_panel import HousingPanel
from workbench.widgets.jobs import JobChooser
from workbench.widgets.runner import Cancelled, TaskRunner, fine_sweep
from workbench.widgets.shipper_panel import ShipperPanel

__all__ = [
    "Workbench",
    "ShipperPanel",
    "HousingPanel",
    "JobChooser",
    "demo_study",
    "DEMO_CANDIDATES",
    "DEMO_TITLE",
    "TaskRunner",
    "fine_sweep",
    "Cancelled",
]
