"""Long computations with a progress bar and a cancel button.

:class:`TaskRunner` calls a function with two callbacks, ``progress(fraction)``
and ``cancelled() -> bool``, in a background thread (or inline), shows the
progress, and stops the work at the next chunk boundary when *Cancel* is
pressed. :func:`fine_sweep` is a real chunked computation for it: the study's
vectorised sweep evaluated chunk by chunk over the temperature differences.
"""

from __future__ import annotations

import threading
import time
import weakref
from collections.abc import Callable

import ipywidgets as widgets
import numpy as np

from workbench._checks import Cancelled
from workbench.widgets.fields import LOG, show_message

__all__ = ["Cancelled", "TaskRunner", "fine_sweep", "stop_all_tasks"]


def fine_sweep(study, thicknesses, delta_ts, progress: Callable[[float], None] | None = None,
               cancelled: Callable[[], bool] | None = None, chunk: int = 32) -> np.ndarray:
    """Heat flux over candidates × thicknesses × temperature differences, in chunks.

    Parameters
    ----------
    study : WallStudy
        The study whose :meth:`~WallStudy.sweep` is evaluated.
    thicknesses : array_like
        Sized-layer thicknesses [m].
    delta_ts : array_like
        Temperature differences [K], split into chunks of ``chunk``.
    progress : callable, optional
        Called with the fraction done (0..1] after each chunk.
    cancelled : callable, optional
        Checked before each chunk; when it returns True, :class:`Cancelled` is raised.
    chunk : int
        Temperature differences per chunk.

    Returns
    -------
    numpy.ndarray
        Shape ``(n_candidates, n_thicknesses, n_delta_ts)`` [W/m²], identical to
        ``study.sweep(thicknesses, delta_ts)``.
    """
    lt = np.asarray(thicknesses, float).ravel()
    dts = np.asarray(delta_ts, float).ravel()
    if chunk < 1:
        raise ValueError(f"chunk: must be >= 1, got {chunk}")
    out = np.empty((len(study.candidates), lt.size, dts.size))
    for start in range(0, dts.size, chunk):
        if cancelled is not None and cancelled():
            raise Cancelled(f"cancelled after {start} of {dts.size} temperature differences")
        stop = min(start + chunk, dts.size)
        out[:, :, start:stop] = study.sweep(lt, dts[start:stop])
        if progress is not None:
            progress(stop / dts.size)
    return out


# Every runner with a task started, so a kernel shutdown or a test can stop them all.
_STARTED: weakref.WeakSet[TaskRunner] = weakref.WeakSet()


def stop_all_tasks(timeout: float = 30.0) -> int:
    """Cancel every running background task and wait for each to stop; returns how many ran.

    Raises
    ------
    TimeoutError
        A task did not stop within ``timeout`` seconds.
    """
    running = [r for r in list(_STARTED) if r.busy]
    for r in running:
        r.cancel()
    for r in running:
        if not r.wait(timeout):
            raise TimeoutError(f"a background task did not stop within {timeout:g} s")
    return len(running)


class TaskRunner:
    """A progress bar, a cancel button and a status line for one task at a time."""

    def __init__(self, label: str = "Working", width: str = "230px"):
        self.bar = widgets.FloatProgress(value=0.0, min=0.0, max=1.0, description=label,
                                         style={"description_width": "90px"},
                                         layout=widgets.Layout(width=f"calc({width} + 90px)"))
        self.cancel_button = widgets.Button(description="Cancel", icon="stop", disabled=True,
                                            layout=widgets.Layout(width="90px"))
        self.status = widgets.HTML("")
        self.bar.add_class("hw-progress")
        self.cancel_button.add_class("hw-cancel")
        self.status.add_class("hw-task-status")
        self.box = widgets.VBox([widgets.HBox([self.bar, self.cancel_button]), self.status])
        self.cancel_button.on_click(lambda _: self.cancel())
        self._cancel = threading.Event()
        self._thread: threading.Thread | None = None
        self._last = 0.0
        self.result = None
        self.error: str = ""
        self.state = "idle"  # idle, running, done, cancelled, failed

    @property
    def busy(self) -> bool:
        return self._thread is not None and self._thread.is_alive()

    def cancel(self) -> None:
        """Ask the running task to stop at its next chunk boundary."""
        self._cancel.set()

    def _progress(self, fraction: float) -> None:
        now = time.monotonic()
        if fraction >= 1.0 or now - self._last > 0.1:  # throttle widget messages
            self._last = now
            self.bar.value = float(min(max(fraction, 0.0), 1.0))

    def run(self, func: Callable, *args, on_done: Callable | None = None, on_stop: Callable | None = None,
            background: bool = True, **kwargs):
        """Run ``func(*args, progress=..., cancelled=..., **kwargs)``.

        In the background (a thread) by default; ``background=False`` runs inline
        and returns the result. ``on_done(result)`` is called after success,
        ``on_stop(state)`` after a cancelled or failed run (``state`` is
        ``"cancelled"`` or ``"failed"``). Either shows a message; no exception escapes.
        """
        if self.busy:
            show_message(self.status, "A computation is already running; cancel it first.")
            return None
        self._cancel.clear()
        self.result, self.error, self.state = None, "", "running"
        self.bar.value = 0.0
        self.bar.bar_style = ""
        self.cancel_button.disabled = False
        show_message(self.status, "")

        def work():
            t0 = time.perf_counter()
            try:
                result = func(*args, progress=self._progress, cancelled=self._cancel.is_set, **kwargs)
            except Cancelled as exc:
                self.state = "cancelled"
                self.bar.bar_style = "warning"
                show_message(self.status, f"Cancelled: {exc}.")
            except Exception as exc:  # shown, logged, never raised into the UI
                LOG.exception("task failed")
                self.state, self.error = "failed", f"{type(exc).__name__}: {exc}"
                self.bar.bar_style = "danger"
                show_message(self.status, f"The computation failed: {self.error}")
            else:
                self.result, self.state = result, "done"
                self.bar.value, self.bar.bar_style = 1.0, "success"
                show_message(self.status, f"Done in {time.perf_counter() - t0:.2f} s.", ok=True)
                if on_done is not None:
                    try:
                        on_done(result)
                    except Exception as exc:
                        LOG.exception("task result handler failed")
                        self.state, self.error = "failed", f"{type(exc).__name__}: {exc}"
                        show_message(self.status, f"Showing the result failed: {self.error}")
            finally:
                self.cancel_button.disabled = True
            if self.state in ("cancelled", "failed") and on_stop is not None:
                try:
                    on_stop(self.state)
                except Exception:
                    LOG.exception("task stop handler failed")

        if background:
            self._thread = threading.Thread(target=work, name="workbench-task", daemon=True)
            _STARTED.add(self)
            self._thread.start()
            return None
        work()
        return self.result

    def wait(self, timeout: float | None = None) -> bool:
        """Wait for a background task; True when it has finished."""
        if self._thread is not None:
            self._thread.join(timeout)
        return not self.busy
