"""Wall comparison: the study object (:mod:`.study`), its scenario-file kind (:mod:`.kind`)
and its report charts (:mod:`.charts`).

Everything the former ``workbench.studies.wall`` module exported is importable from here.
"""

from workbench.studies.wall.study import (
    WALL_ASSUMPTIONS,
    WALL_CRITERIA,
    Candidate,
    HeatBudget,
    Layer,
    WallStudy,
    candidates_from,  # noqa: F401  (public before the move, not in __all__)
)

__all__ = ["Layer", "Candidate", "HeatBudget", "WallStudy", "WALL_ASSUMPTIONS", "WALL_CRITERIA"]
