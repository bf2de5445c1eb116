"""Input checks shared by the numeric core.

Every public core function validates its arguments with these helpers so that a
bad value raises :class:`ValueError` naming the argument and the expected unit,
instead of propagating NaN through a sweep.
"""

from __future__ import annotations

import numpy as np

__all__ = [
    "Cancelled",
    "ValidityWarning",
    "as_array",
    "finite",
    "positive",
    "nonnegative",
    "in_range",
    "broadcast",
    "broadcast_shape",
    "scalar_or_array",
]


class Cancelled(Exception):
    """A long computation stopped because its ``cancel()`` check returned True."""


class ValidityWarning(UserWarning):
    """A correlation or table was used outside the range its source states."""


def as_array(name: str, value, unit: str = "") -> np.ndarray:
    """Convert ``value`` to a float ndarray, or raise ``ValueError`` naming ``name``."""
    try:
        arr = np.asarray(value, dtype=float)
    except (TypeError, ValueError):
        raise ValueError(
            f"{name}: expected a number{_unit(unit)}, got {value!r}"
        ) from None
    return arr


def _unit(unit: str) -> str:
    return f" in {unit}" if unit else ""


def finite(name: str, value, unit: str = "") -> np.ndarray:
    """Return ``value`` as a float array; NaN or infinity raises ``ValueError``."""
    arr = as_array(name, value, unit)
    if not np.all(np.isfinite(arr)):
        raise ValueError(f"{name}: must be finite{_unit(unit)} (got NaN or infinity)")
    return arr


def positive(name: str, value, unit: str = "") -> np.ndarray:
    """Return ``value`` as a finite float array; any value <= 0 raises ``ValueError``."""
    arr = finite(name, value, unit)
    if np.any(arr <= 0):
        raise ValueError(f"{name}: must be > 0{_unit(unit)} (got {_worst(arr, arr <= 0)})")
    return arr


def nonnegative(name: str, value, unit: str = "") -> np.ndarray:
    """Return ``value`` as a finite float array; any value < 0 raises ``ValueError``."""
    arr = finite(name, value, unit)
    if np.any(arr < 0):
        raise ValueError(f"{name}: must be >= 0{_unit(unit)} (got {_worst(arr, arr < 0)})")
    return arr


def in_range(name: str, value, low: float, high: float, unit: str = "") -> np.ndarray:
    """Return ``value`` as a finite float array; values outside [low, high] raise."""
    arr = finite(name, value, unit)
    bad = (arr < low) | (arr > high)
    if np.any(bad):
        raise ValueError(
            f"{name}: must lie in [{low:g}, {high:g}]{_unit(unit)} (got {_worst(arr, bad)})"
        )
    return arr


def _worst(arr: np.ndarray, bad: np.ndarray) -> str:
    return f"{float(np.asarray(arr)[bad].flat[0]):g}"


def broadcast_shape(**named) -> tuple[int, ...]:
    """Broadcast shape of the named arrays; a mismatch names the arguments and their shapes."""
    try:
        return np.broadcast_shapes(*(np.shape(v) for v in named.values()))
    except ValueError:
        shapes = ", ".join(f"{k} {np.shape(v)}" for k, v in named.items())
        raise ValueError(f"shapes do not broadcast: {shapes}") from None


def broadcast(**named: np.ndarray) -> tuple[np.ndarray, ...]:
    """Broadcast the named arrays together; a shape mismatch names the arguments."""
    shape = broadcast_shape(**named)
    return tuple(np.broadcast_to(v, shape) for v in named.values())


def scalar_or_array(x):
    """Return a Python float for 0-d results, the array otherwise."""
    x = np.asarray(x)
    return float(x) if x.ndim == 0 else x
