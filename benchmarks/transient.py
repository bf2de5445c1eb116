"""Benchmark: the vectorised hold simulation against a per-variant Python loop.

Both run in this process on the same 1000 design variants (random box
conductances, coolant masses, payloads), a demo ambient step profile, 5-minute
steps over 120 h:

  1. one call of ``simulate_hold`` with arrays over the variants (numpy over
     variants, a loop over the 1440 time steps);
  2. a Python loop calling ``simulate_hold`` once per variant (scalars); it is
     timed on an evenly spaced subset of variants and scaled per variant to
     1000, since the full loop takes minutes. The loop's results must equal
     the vectorised ones on the subset.

Prints both times and the ratio. Target: the vectorised call at least 20x
faster than the loop; exits non-zero otherwise.
"""

from __future__ import annotations

import sys
import time

import numpy as np

from workbench.transient import simulate_hold

T0 = 273.15
N_VARIANTS = 1000
N_LOOP = 20
DURATION = 120 * 3600.0
STEP = 300.0
# demo summer-like profile (invented), repeated daily
PROFILE = (
    np.arange(0, 120, 6) * 3600.0,
    T0 + np.tile([22.0, 30.0, 35.0, 26.0], 5),
)


def variants(n: int) -> dict:
    rng = np.random.default_rng(7)
    return dict(
        conductance=rng.uniform(0.08, 1.5, n),
        coolant_mass=rng.uniform(0.5, 8.0, n),
        payload_heat_capacity=rng.uniform(2e3, 4e4, n),
        coupling_conductance=rng.uniform(0.5, 5.0, n),
        coolant_wall_fraction=rng.uniform(0.5, 1.0, n),
    )


COMMON = dict(
    t_ambient=PROFILE,
    latent_heat=190e3,
    t_phase_change=T0 + 5,
    duration=DURATION,
    time_step=STEP,
    specific_heat_solid=2000.0,
    specific_heat_liquid=2200.0,
    t_payload_start=T0 + 5,
    t_payload_min=T0 + 2,
    t_payload_max=T0 + 8,
    record_every=6,
)


def main() -> int:
    v = variants(N_VARIANTS)
    t0 = time.perf_counter()
    vec = simulate_hold(**v, **COMMON)
    t_vec = time.perf_counter() - t0

    idx = np.linspace(0, N_VARIANTS - 1, N_LOOP).astype(int)
    t0 = time.perf_counter()
    loop = [simulate_hold(**{k: float(a[i]) for k, a in v.items()}, **COMMON) for i in idx]
    t_loop_sub = time.perf_counter() - t0
    for i, one in zip(idx, loop, strict=True):
        np.testing.assert_allclose(one.payload_temperature, vec.payload_temperature[i], rtol=1e-12)
        assert one.reason == vec.reason[i]
    t_loop = t_loop_sub / N_LOOP * N_VARIANTS
    ratio = t_loop / t_vec
    n_steps = int(DURATION / STEP)
    print(f"variants {N_VARIANTS}, steps {n_steps} (5 min over 120 h), 2 nodes each")
    print(f"vectorised, one call:        {t_vec:8.2f} s")
    print(
        f"per-variant loop, {N_LOOP} timed:  {t_loop_sub:8.2f} s -> scaled to {N_VARIANTS}: {t_loop:8.1f} s"
    )
    print(f"ratio loop / vectorised:     {ratio:8.1f}x  (target >= 20x)")
    reasons, counts = np.unique(vec.reason, return_counts=True)
    print("end reasons:", dict(zip(reasons.tolist(), counts.tolist(), strict=True)))
    return 0 if ratio >= 20 else 1


if __name__ == "__main__":
    sys.exit(main())
