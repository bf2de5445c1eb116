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

Also, measured in the same run:

  3. ``hold_time`` (closed form, cumulative-energy scan) for 1000 variants
     over a 1440-step profile against a plain ``np.cumsum`` over the same
     1000 × 1440 energy increments. Target: <= 5x. The same with
     ``t_payload_max`` (the payload's warming after the coolant is spent,
     solved per segment) is printed for information.
  4. ``hold_time`` for one variant over the 1440-step profile. Target: <= 5 ms.
  5. ``simulate_hold`` for the 1000 variants against a minimal numpy loop of
     the same two-node update (coolant held at its phase change, payload node
     exact per step: the least any step of this model must do). Ratio printed
     (information: the full step also handles the sensible coolant states,
     events, energy bookkeeping and storage).
"""

from __future__ import annotations

import sys
import time

import numpy as np

from workbench.transient import hold_time, simulate_hold

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


def best_of(fn, repeat: int = 7) -> float:
    """Shortest of ``repeat`` timed runs. [s]"""
    out = []
    for _ in range(repeat):
        t0 = time.perf_counter()
        fn()
        out.append(time.perf_counter() - t0)
    return min(out)


def scan_benchmark() -> bool:
    """hold_time scan against np.cumsum on the same 1000 x 1440 data; one variant in ms."""
    v = variants(N_VARIANTS)
    times = np.arange(1440) * 300.0  # 5-min steps over 120 h
    temps = T0 + 27 + 8 * np.sin(times / 86400 * 2 * np.pi) + np.where((times // 3600) % 24 == 15, 5, 0)
    tpc = T0 + 5
    increments = v["conductance"][:, None] * ((temps - tpc) * 300.0)[None, :]  # J per step
    t_cumsum = best_of(lambda: np.cumsum(increments, axis=1))
    args = (v["conductance"], (times, temps), v["coolant_mass"], 190e3, tpc, v["payload_heat_capacity"])
    t_scan = best_of(lambda: hold_time(*args))
    t_max = best_of(lambda: hold_time(*args, t_payload_max=T0 + 8), repeat=3)
    t_one = best_of(lambda: hold_time(0.4, (times, temps), 3.0, 190e3, tpc, 1e4))
    t_one_max = best_of(lambda: hold_time(0.4, (times, temps), 3.0, 190e3, tpc, 1e4, t_payload_max=T0 + 8))
    print(f"hold_time 1000 x 1440 scan:   {t_scan * 1e3:8.2f} ms; np.cumsum same data {t_cumsum * 1e3:6.2f} ms; "
          f"ratio {t_scan / t_cumsum:5.2f}x (target <= 5x)")
    print(f"  with t_payload_max:         {t_max * 1e3:8.2f} ms; ratio {t_max / t_cumsum:5.2f}x (information)")
    print(f"hold_time one variant, 1440:  {t_one * 1e3:8.3f} ms (target <= 5 ms); with t_payload_max "
          f"{t_one_max * 1e3:.3f} ms")
    return t_scan / t_cumsum <= 5 and t_one <= 5e-3


def minimal_two_node_loop(v: dict, ta_steps: np.ndarray, step: float) -> np.ndarray:
    """The least a step of the two-node model does: payload node exact, coolant at its phase change."""
    ua, g, phi, cp = v["conductance"], v["coupling_conductance"], v["coolant_wall_fraction"], v["payload_heat_capacity"]
    wp, wc = (1 - phi) * ua, phi * ua
    a = wp + g
    decay = np.exp(-a * step / cp)
    tp = np.full(ua.shape, COMMON["t_payload_start"])
    h = np.zeros(ua.shape)
    tpc = COMMON["t_phase_change"]
    for ta in ta_steps:
        teq = (wp * ta + g * tpc) / a
        tpbar = teq + (tp - teq) * (1 - decay) * cp / (a * step)
        tp = teq + (tp - teq) * decay
        h = h + (wc * (ta - tpc) + g * (tpbar - tpc)) * step / v["coolant_mass"]
    return tp


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
    edges = np.arange(n_steps + 1) * STEP
    ta_steps = np.interp(edges[:-1], PROFILE[0], PROFILE[1])  # any ambient per step: same work
    t_min = best_of(lambda: minimal_two_node_loop(v, ta_steps, STEP), repeat=3)
    t_sim = best_of(lambda: simulate_hold(**v, **COMMON), repeat=3)
    print(f"simulate_hold 1000 x {n_steps}:   {t_sim:8.3f} s; minimal numpy loop of the two-node update "
          f"{t_min:6.3f} s; ratio {t_sim / t_min:5.1f}x")
    scan_ok = scan_benchmark()
    return 0 if ratio >= 20 and scan_ok else 1


if __name__ == "__main__":
    sys.exit(main())
