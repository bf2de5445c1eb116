"""Pieces the built-in study kinds share when they read scenario candidates.

Checks of a layer list (materials, an air layer, a vacuum panel), problem
collection, duplicate names, and the re-exported readers of quantities and
sums of money written as text (:func:`workbench._scenario_inputs._quantity`,
:func:`workbench._scenario_inputs._money`).
"""

from __future__ import annotations

from collections.abc import Callable, Mapping, Sequence
from typing import Any

from workbench import units
from workbench._scenario_inputs import _money, _quantity, _si_text  # noqa: F401  (re-exported)
from workbench._scenario_problems import _describe, _unknown_key_why  # noqa: F401  (re-exported)

_AIR_KEYS = ("air_layer", "direction", "emissivity_1", "emissivity_2", "method", "height", "name")
_VIP_KEYS = ("vacuum_panel", "centre_conductivity", "length", "width", "psi_edge", "name")


def _check_layer_list(i: int, c: Mapping, known: set, problems: list, allow_special: bool) -> list:
    layers = c.get("layers")
    if not isinstance(layers, list) or not layers:
        problems.append(
            (
                i,
                "layers",
                "expected a list of layers such as "
                '{ material = "eps_20" } (the sized layer) and '
                '{ material = "carbon_steel", thickness = "0.6 mm" }',
            )
        )
        return []
    sized = 0
    ids = []
    for j, lay in enumerate(layers):
        key = f"layers[{j}]"
        if not isinstance(lay, dict):
            problems.append((i, key, f"expected a table, got {_describe(lay)}"))
            continue
        if allow_special and "air_layer" in lay:
            spec = {"air_layer": "thickness", "height": "length"}
            for k, v in lay.items():
                if k not in _AIR_KEYS:
                    problems.append((i, f"{key}.{k}", _unknown_key_why(k, _AIR_KEYS)))
                elif k in spec:
                    _collect(
                        problems, i, f"{key}.{k}", lambda v=v, k=k, q=spec[k]: _quantity(v, q, k)
                    )
                elif k in ("emissivity_1", "emissivity_2"):
                    _collect(
                        problems,
                        i,
                        f"{key}.{k}",
                        lambda v=v, k=k: _quantity(v, "dimensionless", k, units.EMISSIVITY),
                    )
            if "direction" not in lay:
                problems.append((i, f"{key}.direction", 'missing: "up", "horizontal" or "down"'))
            continue
        if allow_special and "vacuum_panel" in lay:
            spec = {
                "vacuum_panel": "thickness",
                "centre_conductivity": "conductivity",
                "length": "length",
                "width": "length",
                "psi_edge": "conductivity",
            }
            for k, v in lay.items():
                if k not in _VIP_KEYS:
                    problems.append((i, f"{key}.{k}", _unknown_key_why(k, _VIP_KEYS)))
                elif k in spec:
                    _collect(
                        problems, i, f"{key}.{k}", lambda v=v, k=k, q=spec[k]: _quantity(v, q, k)
                    )
            for k in _VIP_KEYS[1:5]:
                if k not in lay:
                    problems.append(
                        (
                            i,
                            f"{key}.{k}",
                            "missing (a vacuum panel needs "
                            "centre_conductivity, length, width and psi_edge)",
                        )
                    )
            continue
        for k in lay:
            if k not in ("material", "thickness"):
                why = _unknown_key_why(k, ("material", "thickness"))
                if allow_special:
                    why += " (or an air_layer or vacuum_panel table)"
                problems.append((i, f"{key}.{k}", why))
        if not isinstance(lay.get("material"), str):
            problems.append(
                (
                    i,
                    key,
                    'expected { material = "id", thickness = "25 mm" } '
                    "(thickness omitted for the sized layer)",
                )
            )
            continue
        ids.append((f"{key}.material", lay["material"]))
        if "thickness" not in lay:
            sized += 1
        else:
            _collect(
                problems,
                i,
                f"{key}.thickness",
                lambda lay=lay: _quantity(lay["thickness"], "thickness", "thickness"),
            )
    if sized != 1:
        problems.append(
            (
                i,
                "layers",
                "needs exactly one material layer without a thickness "
                f"(the layer to size), found {sized}",
            )
        )
    for key, mid in ids:
        if mid not in known:
            problems.append((i, key, f"unknown material id {mid!r}; see 'heatpath materials list'"))
    return ids


def _collect(problems: list, i: int, key: str, fn: Callable[[], Any]) -> None:
    try:
        fn()
    except ValueError as exc:
        problems.append((i, key, str(exc)))


def _duplicates(names: list[str], problems: list) -> None:
    dup = sorted({n for n in names if names.count(n) > 1})
    if dup:
        problems.append((0, "", f"duplicate candidate names {dup}"))


def _layers_name(layers: Sequence[Any]) -> str:
    parts = []
    for x in layers:
        if isinstance(x, Mapping):
            parts.append(
                str(x.get("material") or x.get("name") or ("air" if "air_layer" in x else "vip"))
            )
    return "/".join(parts)
