"""Input checks shared by the numeric core.

Every public core function validates its arguments with these helpers so that a
bad value raises :class:`ValueError` naming the argument and the expected unit,
instead of propagating NaN through a sweep.
"""

from __future__ import annotations

import math

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
    "MAX_TEMPERATURE",
    "absolute_temperature",
    "layers",
    "scalar",
    "integer",
    "finite_result",
    "finite_product",
]

#: Highest absolute temperature the numeric core accepts. [K]
#: No model here is meant for anything near it (the air fits stop at 1000 K, the
#: materials' service limits lie far below); a larger value is taken as an input
#: error, e.g. a unit slip, instead of being carried into T³ and T⁴ terms.
MAX_TEMPERATURE: float = 1.0e4


class Cancelled(Exception):
    """A long computation stopped because its ``cancel()`` check returned True."""


class ValidityWarning(UserWarning):
    """A correlation or table was used outside the range its source states."""


def as_array(name: str, value, unit: str = "") -> np.ndarray:
    """Convert ``value`` to a float ndarray, or raise ``ValueError`` naming ``name``.

    ``True``/``False`` (or a boolean array) is refused: a number is meant, and a tick
    box read as 1 or 0 would be a silent wrong answer.
    """
    if _has_bool(value):
        raise ValueError(f"{name}: expected a number{_unit(unit)}, got a boolean ({value!r:.60})")
    if value is None:
        raise ValueError(f"{name}: expected a number{_unit(unit)}, got None")
    if isinstance(value, str | bytes):
        raise ValueError(f"{name}: expected a number{_unit(unit)}, got the text {value!r}; "
                        "parse text with units through workbench.units.parse")
    try:
        arr = np.asarray(value, dtype=float)
    except (TypeError, ValueError):
        raise ValueError(
            f"{name}: expected a number{_unit(unit)}, got {value!r}"
        ) from None
    return arr


def _has_bool(value) -> bool:
    """True for a boolean, a boolean array, or a (nested) list or tuple holding a boolean."""
    if isinstance(value, bool | np.bool_):
        return True
    if isinstance(value, np.ndarray):
        return value.dtype.kind == "b" or (value.dtype == object and any(_has_bool(v) for v in value.flat))
    if isinstance(value, list | tuple):
        return any(_has_bool(v) for v in value)
    return False


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


def absolute_temperature(name: str, value, unit: str = "K") -> np.ndarray:
    """Return ``value`` as a finite float array of absolute temperatures [K].

    Values <= 0 K (e.g. a Celsius value given where kelvin is meant) and values
    above :data:`MAX_TEMPERATURE` raise ``ValueError`` naming ``name``.
    """
    arr = finite(name, value, unit)
    if np.any(arr <= 0):
        raise ValueError(
            f"{name}: an absolute temperature must be > 0{_unit(unit)} "
            f"(got {_worst(arr, arr <= 0)}; give kelvin, not °C)"
        )
    if np.any(arr > MAX_TEMPERATURE):
        raise ValueError(
            f"{name}: must be <= {MAX_TEMPERATURE:g}{_unit(unit)}, the highest absolute "
            f"temperature the core accepts (got {_worst(arr, arr > MAX_TEMPERATURE)})"
        )
    return arr


def layers(name: str, arr: np.ndarray, unit: str = "") -> np.ndarray:
    """Return ``arr`` (already checked) with at least one layer on its last axis.

    An empty layer list raises ``ValueError`` naming ``name``: a sum over no
    layers would give a resistance of 0 and a U-value of infinity.
    """
    arr = np.atleast_1d(arr)
    if arr.shape[-1] == 0 or arr.size == 0:
        raise ValueError(
            f"{name}: need at least one layer{_unit(unit)} on the last axis, got shape {arr.shape}"
        )
    return arr


def scalar(name: str, value, unit: str = "") -> float:
    """Return ``value`` as one finite Python float; an array or list raises ``ValueError``."""
    arr = finite(name, value, unit)
    if arr.ndim != 0:
        raise ValueError(f"{name}: expected a single number{_unit(unit)}, got shape {arr.shape}")
    return float(arr)


def integer(name: str, value, minimum: int | None = None, maximum: int | None = None) -> int:
    """Return ``value`` as a Python int; booleans, fractions, text and None raise.

    A float with an integral value (``2000.0``) is accepted.
    """
    if isinstance(value, bool | np.bool_) or value is None or isinstance(value, str | bytes):
        raise ValueError(f"{name}: expected an integer, got {value!r:.60}")
    if isinstance(value, int | np.integer):
        out = int(value)
    else:
        arr = finite(name, value)
        if arr.ndim != 0 or arr != np.floor(arr):
            raise ValueError(f"{name}: expected an integer, got {value!r:.60}")
        if abs(float(arr)) > 2**62:
            raise ValueError(f"{name}: expected an integer of a sensible size, got {float(arr):g}")
        out = int(arr)
    if minimum is not None and out < minimum:
        raise ValueError(f"{name}: must be >= {minimum}, got {out}")
    if maximum is not None and out > maximum:
        raise ValueError(f"{name}: must be <= {maximum}, got {out}")
    return out


def finite_result(what: str, result, *names: str):
    """Return ``result`` if every float in it is finite, else raise ``ValueError``.

    ``result`` is a float, an array, or a tuple of them. The message names the
    arguments ``names`` the result was computed from: a NaN or an overflow to
    infinity there means an input far outside any physical range (or a unit
    slip), and it must not leave the core silently.
    """
    parts = result if isinstance(result, tuple) else (result,)
    for part in parts:
        if part is None:
            continue
        arr = np.asarray(part)
        if arr.dtype.kind in "fc" and not np.all(np.isfinite(arr)):
            raise ValueError(
                f"{what}: the result is not finite (NaN or overflow); check the magnitudes "
                f"and units of {', '.join(names)}"
            )
    return result


#: Results up to this many elements are checked element by element; above it,
#: :func:`finite_product` bounds them from the (smaller) factors first.
_CHECK_EACH_UP_TO = 4096


def _max_abs(arr: np.ndarray) -> float:
    return float(np.max(np.abs(arr))) if arr.size else 0.0


def _product_bound(a: np.ndarray, b: np.ndarray, divide: bool) -> float:
    """Upper bound of ``|a * b|`` (``|a / b|``) over all elements; ``inf`` if it overflows.

    Rounding is monotone, so every rounded element is at most the rounded bound:
    a finite bound proves that no element overflowed. Python floats give ``inf``
    on overflow without a warning.
    """
    top = _max_abs(a)
    if not divide:
        return top * _max_abs(b)
    low = float(np.min(np.abs(b))) if b.size else 1.0
    return top / low if low > 0.0 else math.inf


def finite_product(what: str, a: np.ndarray, b: np.ndarray, *names: str, divide: bool = False):
    """``a * b`` (or ``a / b``) of finite arrays, broadcast and made once, checked for overflow.

    ``a`` and ``b`` must already be checked finite. Where the broadcast result is
    larger than ``a`` and ``b`` together (a sweep grid built from small axes) and
    ``max|a|·max|b|`` (``max|a| / min|b|``) is finite, no element can have
    overflowed and the result is not scanned again; otherwise every element is
    checked as in :func:`finite_result`. A result that is not finite raises
    ``ValueError`` naming ``names``, without a numpy ``RuntimeWarning``.

    Examples
    --------
    >>> finite_product("q", np.array([2.0, 3.0]), np.array([[1.0], [10.0]]), "a", "b")
    array([[ 2.,  3.],
           [20., 30.]])
    >>> finite_product("q", np.array(1e300), np.array(1e-300), "a", "b", divide=True)
    Traceback (most recent call last):
    ...
    ValueError: q: the result is not finite (NaN or overflow); check the magnitudes and units of a, b
    """
    op = np.true_divide if divide else np.multiply
    size = math.prod(np.broadcast_shapes(a.shape, b.shape))
    if size > _CHECK_EACH_UP_TO and size > a.size + b.size and math.isfinite(
        _product_bound(a, b, divide)
    ):
        return op(a, b)
    with np.errstate(over="ignore", divide="ignore", invalid="ignore"):
        out = op(a, b)
    return finite_result(what, out, *names)


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
