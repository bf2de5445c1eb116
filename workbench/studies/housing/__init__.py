"""Device housing: the study object (:mod:`.study`), its scenario-file kind (:mod:`.kind`),
its figures and report charts (:mod:`.charts`; plotly imported lazily).

Everything the former ``workbench.studies.housing`` module exported is importable from here.
"""

from workbench.studies.housing.charts import warm_up_figure, warm_up_traces
from workbench.studies.housing.study import (
    HOUSING_CAUTIONS,
    TOUCH_RESULT_CAUTION,
    Component,
    HousingCandidate,
    HousingStudy,
    finish_text_is_coating,
    load_finishes,
)

__all__ = [
    "HousingCandidate",
    "Component",
    "HousingStudy",
    "HOUSING_CAUTIONS",
    "TOUCH_RESULT_CAUTION",
    "finish_text_is_coating",
    "load_finishes",
    "warm_up_figure",
    "warm_up_traces",
]
