"""Look of the workbench: colours, CSS and the cautions text (no physics here).

The palette is our own: muted slate/teal/indigo tones for candidates and one
warm accent that marks the chosen candidate in every chart and in the table.
"""

from __future__ import annotations

#: Colour of the chosen (highlighted) candidate everywhere.
ACCENT = "#d9480f"
#: Dark outline used with the accent.
ACCENT_EDGE = "#3b1a08"
#: Muted colours for the other candidates (no oranges, so the accent stands out).
PALETTE = (
    "#1c7ed6",
    "#0ca678",
    "#7048e8",
    "#495057",
    "#1098ad",
    "#74b816",
    "#ae3ec9",
    "#364fc7",
    "#2b8a3e",
    "#868e96",
    "#5c940d",
    "#0b7285",
)
#: Line/marker colour for the many-candidate view (one combined trace).
CROWD = "#5c7cfa"
BUDGET = "#c92a2a"
GRID = "#e9ecef"

#: Always shown under the title; the wording is ours.
CAUTIONS = (
    "First-order estimates from steady one-dimensional conduction and typical table values. "
    "They are not a substitute for testing, local codes or licensed engineering practice. "
    "Check touch temperatures of hot or cold surfaces, the cold chain of medicines against "
    "a qualified shipping test, ventilation where dry ice is used (CO₂ build-up, pressure), "
    "and the fire behaviour of foam insulation with the applicable rules."
)

CSS = """
<style>
.hw-root { font-family: system-ui, -apple-system, 'Segoe UI', Roboto, sans-serif; color:#212529; }
.hw-root .widget-label { font-size: 12px; }
.hw-title { font-size: 19px; font-weight: 650; margin: 0; line-height: 1.3; }
.hw-badge { display:inline-block; background:#fff3bf; color:#5c3c00; border:1px solid #fcc419;
  border-radius:4px; padding:0 6px; font-size:12px; font-weight:600; margin-left:8px; vertical-align:middle; }
.hw-subtitle { font-size: 12.5px; color:#495057; }
.hw-cautions { background:#fff8e6; border-left:4px solid #f08c00; padding:4px 10px; font-size:12px;
  line-height:1.35; color:#5c3c00; }
.hw-section { font-size: 13px; font-weight: 650; color:#343a40; margin: 6px 0 2px 0;
  border-bottom: 1px solid #dee2e6; }
.hw-msg { color:#c92a2a; font-size: 11.5px; line-height: 1.25; }
.hw-ok { color:#2b8a3e; font-size: 11.5px; }
.hw-hint { color:#868e96; font-size: 11.5px; line-height: 1.3; }
.hw-detail { color:#343a40; font-size: 11.5px; line-height: 1.3; }
.hw-table, .hw-grid { overflow-x: auto; max-width: 100%; }
.hw-table table, .hw-grid table { border-collapse: collapse; font-size: 12px; width: 100%; }
.hw-table th, .hw-grid th { background:#f1f3f5; text-align:right; padding:3px 6px; border-bottom:2px solid #adb5bd;
  font-weight:600; white-space: normal; vertical-align: bottom; min-width: 64px; line-height: 1.25; }
.hw-table th.hw-l, .hw-table td.hw-l, .hw-grid th.hw-l, .hw-grid td.hw-l { text-align:left; }
.hw-table td, .hw-grid td { text-align:right; padding:2px 6px; border-bottom:1px solid #e9ecef; white-space: nowrap; }
.hw-table tr.hw-chosen td, .hw-grid tr.hw-chosen td { background:#fff4e6; font-weight:600; }
.hw-table tr.hw-chosen td:first-child, .hw-grid tr.hw-chosen td:first-child { box-shadow: inset 4px 0 0 #d9480f; }
.hw-table td.hw-bad, .hw-grid td.hw-bad { color:#c92a2a; }
.hw-table td.hw-src, .hw-grid td.hw-src { color:#868e96; font-size:11px; max-width: 260px; overflow:hidden; text-overflow: ellipsis; }
.hw-grid td.hw-l { white-space: normal; min-width: 240px; }
.hw-panel { background:#f8f9fa; border:1px solid #e9ecef; border-radius:6px; padding:4px 8px; }
</style>
"""


def candidate_colour(i: int) -> str:
    """Colour of the i-th candidate (cycles through :data:`PALETTE`)."""
    return PALETTE[i % len(PALETTE)]


def short_source(text: str, limit: int = 72) -> str:
    """A citation cut to ``limit`` characters for hover labels (full text in the table)."""
    text = " ".join(str(text).split())
    return text if len(text) <= limit else text[: limit - 1] + "…"
