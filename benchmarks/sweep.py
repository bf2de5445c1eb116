"""Benchmark: heat-flux sweeps over (materials x thicknesses x ΔT) grids.

Three ways to compute the same grid, all in this run:
  1. the public API ``workbench.heat_flux`` with broadcasting (what the tool uses);
  2. the bare numpy broadcast expression ``k * (dt / L)`` (the floor: no checks,
     the full grid made once);
  3. a per-point Python loop with unit-carrying pint quantities (what a naive
     tool would do); timed on a sample of points and scaled per point, since the
     full grid would take hours.
API and floor are interleaved and the ratio is of their medians over the repeats.
Prints the ratios. Targets: API within 1.1x of bare numpy on the 400 x 400 x 100
grid (k (400,1,1), L (1,400,1), ΔT (1,1,100)) and within 1.5x on the others; over
100x faster than the per-point loop. Exits non-zero if a target is missed.
"""

from __future__ import annotations

import statistics
import sys
import time

import numpy as np

import workbench as wb
from workbench.units import ureg


def seconds(fn) -> float:
    t0 = time.perf_counter()
    fn()
    return time.perf_counter() - t0


def medians(fns: dict, repeat: int) -> dict:
    """Median seconds of each callable, the callables interleaved to share machine noise."""
    times: dict = {name: [] for name in fns}
    for _ in range(repeat):
        for name, fn in fns.items():
            times[name].append(seconds(fn))
    return {name: statistics.median(t) for name, t in times.items()}


def grid(n_mat: int, n_thk: int, n_dt: int):
    rng = np.random.default_rng(1)
    k = rng.uniform(0.02, 200.0, n_mat)[:, None, None]
    length = np.linspace(0.001, 0.2, n_thk)[None, :, None]
    dt = np.linspace(1.0, 80.0, n_dt)[None, None, :]
    return k, length, dt


def pint_loop(k, length, dt, n_points: int) -> float:
    """Seconds per point for a per-point loop on pint quantities."""
    kf, lf, tf = (np.broadcast_to(a, np.broadcast_shapes(k.shape, length.shape, dt.shape)).ravel() for a in (k, length, dt))
    idx = np.linspace(0, kf.size - 1, n_points).astype(int)
    out = []
    t0 = time.perf_counter()
    for i in idx:
        kq = ureg.Quantity(kf[i], "W/(m*K)")
        lq = ureg.Quantity(lf[i], "m")
        tq = ureg.Quantity(tf[i], "delta_degC")
        out.append((kq * tq / lq).to("W/m**2").magnitude)
    elapsed = time.perf_counter() - t0
    # the loop must agree with the API on the sampled points
    np.testing.assert_allclose(out, wb.heat_flux(kf[idx], lf[idx], tf[idx]), rtol=1e-12)
    return elapsed / n_points


def main() -> int:
    ok = True
    print(f"{'grid':>16} {'points':>11} {'api [ms]':>10} {'numpy [ms]':>11} {'api/numpy':>10} "
          f"{'target':>7} {'loop [µs/pt]':>13} {'loop/api':>10}")
    for shape, repeat, target in (((200, 200, 50), 15, 1.5), ((400, 400, 100), 15, 1.1),
                                  ((500, 500, 100), 7, 1.5)):
        k, length, dt = grid(*shape)
        # Fourier's law evaluated directly; the API may pair the factors differently (rounding only)
        np.testing.assert_allclose(wb.heat_flux(k, length, dt), k * dt / length, rtol=1e-15)
        med = medians(
            {
                "numpy": lambda k=k, dt=dt, length=length: k * (dt / length),
                "api": lambda k=k, dt=dt, length=length: wb.heat_flux(k, length, dt),
            },
            repeat,
        )
        t_api, t_np = med["api"], med["numpy"]
        n = int(np.prod(shape))
        per_pt_loop = pint_loop(k, length, dt, 2000)
        ratio_np = t_api / t_np
        ratio_loop = per_pt_loop / (t_api / n)
        print(f"{'x'.join(map(str, shape)):>16} {n:>11,} {t_api*1e3:>10.1f} {t_np*1e3:>11.1f} "
              f"{ratio_np:>10.2f} {target:>7.2f} {per_pt_loop*1e6:>13.1f} {ratio_loop:>10.0f}")
        ok &= ratio_np <= target and ratio_loop >= 100
    print("targets: api/numpy <= target (median of repeats), loop/api >= 100 ->",
          "met" if ok else "MISSED")
    return 0 if ok else 1


if __name__ == "__main__":
    sys.exit(main())
