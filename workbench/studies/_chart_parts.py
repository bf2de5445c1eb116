"""Small helpers the study kinds' report charts share (no plotly import here)."""

from __future__ import annotations

import html
import re
from typing import Any

from workbench import units


def _e(x: Any) -> str:
    """Text escaped for HTML (hover templates, titles)."""
    return html.escape(str(x), quote=True)


def _currency(results) -> str | None:
    """The currency code of the cost columns (None when unknown or mixed)."""
    found = set()
    for col, unit in results.attrs.get("units", {}).items():
        if col.startswith("cost") and isinstance(unit, str):
            found |= {c for c in units.CURRENCIES if re.search(rf"(?<![A-Z]){c}(?![A-Z])", unit)}
    if "currency" in results.columns:
        found |= {c for c in results["currency"].dropna() if c in units.CURRENCIES}
    return found.pop() if len(found) == 1 else None


def _focus(ev) -> str | None:
    """The candidate to draw in single-candidate charts: the chosen, else the best ranked."""
    if ev.chosen:
        return ev.chosen
    best = ev.ranking["rank"]
    best = best[best == 1]
    return str(best.index[0]) if len(best) else None
