"""Candidate picker: search and filter the materials tables, choose candidates.

Two lists: the filtered *available* materials (search by name, filter by
family) and the *chosen* candidates, so a filter never drops a choice. A detail
line shows the conductivity, density and sources of the material last clicked.
An optional user materials file merges over the curated tables.
"""

from __future__ import annotations

import html
from collections.abc import Callable

import ipywidgets as widgets
import pandas as pd

from workbench import units
from workbench.widgets.fields import LOG, show_message

__all__ = ["CandidatePicker", "short_label"]


def short_label(name: str, limit: int = 26) -> str:
    """A short chart label from a material's table name.

    Drops parenthesised asides; if still long, keeps the start of the first part
    and the last part (usually the density), e.g. ``"PIR board with…, 32 kg/m³"``.
    """
    out, depth = [], 0
    for ch in str(name):
        if ch == "(":
            depth += 1
        elif ch == ")":
            depth = max(depth - 1, 0)
        elif depth == 0:
            out.append(ch)
    text = " ".join("".join(out).replace(" ,", ",").split())
    if len(text) <= limit:
        return text
    parts = [p.strip() for p in text.split(",")]
    tail = next((p for p in reversed(parts[1:]) if "kg/m" in p), "")
    if not tail:
        return text[: limit - 1].rstrip(" ,") + "…"
    room = max(limit - len(tail) - 2, 8)
    head = parts[0] if len(parts[0]) <= room else parts[0][: room - 1].rstrip() + "…"
    return f"{head}, {tail}"


class CandidatePicker:
    """Choose candidate materials from the tables (and a user file)."""

    def __init__(self, materials: pd.DataFrame, chosen: list[str], on_change: Callable[[list[str]], None],
                 on_file: Callable[[str], None] | None = None, system: str = "SI"):
        self.materials = materials
        self.system = system
        self._on_change = on_change
        self._on_file = on_file
        self.chosen_ids = list(chosen)
        w = widgets.Layout
        self.search = widgets.Text(placeholder="search by name, e.g. foam, PIR, steel", description="Search",
                                   continuous_update=True, style={"description_width": "56px"},
                                   layout=w(width="330px"))
        self.family = widgets.Dropdown(description="Family", style={"description_width": "56px"},
                                       layout=w(width="330px"))
        self.available = widgets.SelectMultiple(rows=6, layout=w(width="330px"))
        self.add = widgets.Button(description="Add", icon="plus", tooltip="Add the selected materials",
                                  layout=w(width="80px"))
        self.remove = widgets.Button(description="Remove", icon="minus", tooltip="Remove the selected candidates",
                                     layout=w(width="90px"))
        self.chosen = widgets.SelectMultiple(rows=5, layout=w(width="330px"))
        self.detail = widgets.HTML("", layout=w(width="330px"))
        self.message = widgets.HTML("")
        self.path = widgets.Text(placeholder="optional: path to your materials CSV", layout=w(width="240px"))
        self.load = widgets.Button(description="Load", icon="folder-open", layout=w(width="86px"))
        for wid, css in ((self.search, "hw-search"), (self.family, "hw-family"), (self.available, "hw-available"),
                         (self.chosen, "hw-chosen-list"), (self.add, "hw-add"), (self.remove, "hw-remove"),
                         (self.detail, "hw-detail-line"), (self.path, "hw-user-file"), (self.load, "hw-load"),
                         (self.message, "hw-picker-msg")):
            wid.add_class(css)
        self.box = widgets.VBox([
            self.search, self.family, self.available,
            widgets.HBox([self.add, self.remove, widgets.HTML('<span class="hw-hint">chosen candidates:</span>')]),
            self.chosen, self.detail, widgets.HBox([self.path, self.load]), self.message,
        ])
        self._fill_families()
        self._filter()
        self._fill_chosen()
        self.search.observe(lambda _: self._safe(self._filter), "value")
        self.family.observe(lambda _: self._safe(self._filter), "value")
        self.available.observe(lambda c: self._safe(self._show_detail, c["new"]), "value")
        self.chosen.observe(lambda c: self._safe(self._show_detail, c["new"]), "value")
        self.add.on_click(lambda _: self._safe(self._add))
        self.remove.on_click(lambda _: self._safe(self._remove))
        self.load.on_click(lambda _: self._safe(self._load))

    # -- helpers -------------------------------------------------------------
    def _safe(self, fn, *args) -> None:
        try:
            fn(*args)
        except ValueError as exc:
            show_message(self.message, str(exc))
        except Exception as exc:  # never a traceback in the app
            LOG.exception("candidate picker")
            show_message(self.message, f"Could not apply that: {type(exc).__name__}: {exc}")

    def _option(self, mid: str) -> tuple[str, str]:
        row = self.materials.loc[mid]
        k = units.format_quantity(float(row["conductivity"]), "conductivity", self.system)
        return f"{row['name']} — k {k}", mid

    def _fill_families(self) -> None:
        fams = self.materials.drop_duplicates("family")[["family", "family_label"]]
        self.family.options = [("All families", "")] + [(lab, fam) for fam, lab in fams.itertuples(index=False)]
        self.family.value = ""

    def _filter(self) -> None:
        m = self.materials
        mask = pd.Series(True, index=m.index)
        if self.family.value:
            mask &= m["family"] == self.family.value
        q = self.search.value.strip().lower()
        if q:
            mask &= m["name"].str.lower().str.contains(q, regex=False) | m.index.str.lower().str.contains(q, regex=False)
        self.available.options = [self._option(mid) for mid in m.index[mask]]

    def _fill_chosen(self) -> None:
        self.chosen.options = [self._option(mid) for mid in self.chosen_ids if mid in self.materials.index]

    def _show_detail(self, ids) -> None:
        if not ids:
            return
        mid = ids[-1]
        row = self.materials.loc[mid]
        k = units.format_quantity(float(row["conductivity"]), "conductivity", self.system)
        rho = units.format_quantity(float(row["density"]), "density", self.system)
        self.detail.value = (
            f'<div class="hw-detail"><b>{html.escape(str(row["name"]))}</b><br>'
            f"k = {html.escape(k)} — source: {html.escape(str(row['conductivity_source']))}<br>"
            f"ρ = {html.escape(rho)} — source: {html.escape(str(row['density_source']))}</div>"
        )

    # -- actions ---------------------------------------------------------------
    def set_chosen(self, ids: list[str], notify: bool = True) -> None:
        """Replace the chosen candidates (and apply them unless ``notify`` is False)."""
        ids = list(dict.fromkeys(ids))
        if notify:
            self._on_change(ids)  # may raise ValueError: keep the old choice
        self.chosen_ids = ids
        self._fill_chosen()
        show_message(self.message, "")

    def _add(self) -> None:
        new = [i for i in self.available.value if i not in self.chosen_ids]
        if not new:
            show_message(self.message, "Select one or more materials in the list above, then press Add.")
            return
        self.set_chosen(self.chosen_ids + new)

    def _remove(self) -> None:
        drop = set(self.chosen.value)
        if not drop:
            show_message(self.message, "Select candidates in the chosen list, then press Remove.")
            return
        rest = [i for i in self.chosen_ids if i not in drop]
        if not rest:
            show_message(self.message, "candidates: keep at least one candidate")
            return
        self.set_chosen(rest)

    def _load(self) -> None:
        path = self.path.value.strip()
        if not path:
            show_message(self.message, "materials file: type the path of a CSV file first")
            return
        if self._on_file is not None:
            self._on_file(path)
        show_message(self.message, f"Loaded {path}; its rows merge over the curated tables.", ok=True)

    def set_materials(self, materials: pd.DataFrame) -> None:
        self.materials = materials
        self._fill_families()
        self._filter()
        self._fill_chosen()

    def set_system(self, system: str) -> None:
        self.system = system
        self._filter()
        self._fill_chosen()
