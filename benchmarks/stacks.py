"""Speed of the layer-stack search against brute force in the same run.

Candidates are SYNTHETIC (random but realistic ranges, not real materials):
conductivity 0.02-50 W/(m·K) and density 20-8000 kg/m³ log-uniform, price
1-100 per kg, 20 thickness options 5-100 mm shared by all materials.

Targets (60 materials x 20 thicknesses):

- full 2-layer enumeration (1.44e6 ordered stacks, all four criteria): <= 50 ms
- exact front of the stacks of up to 3 layers: <= 1 s
- with a thickness budget, a change of budget after a one-off pre-computation:
  <= 200 ms

Baselines: a plain-Python loop over the 2-layer stacks; brute-force
enumeration of every 3-layer combination sieved chunk by chunk (on 30
materials by default, all 60 with ``--full``, which takes minutes); the direct
exact search per budget. Fronts must be identical. Exit status 1 if a target is
missed or a result differs.

Run: ``.venv/bin/python benchmarks/stacks.py [--full]``
"""

from __future__ import annotations

import argparse
import sys
import time
from itertools import combinations, product

import numpy as np

from workbench.ranking import pareto_front
from workbench.stacks import enumerate_stacks, stack_catalogue, stack_front


def synthetic_candidates(n_materials: int, seed: int = 42):
    """SYNTHETIC candidate set (demo ranges, not real materials)."""
    rng = np.random.default_rng(seed)
    k = 10 ** rng.uniform(np.log10(0.02), np.log10(50.0), n_materials)
    rho = 10 ** rng.uniform(np.log10(20.0), np.log10(8000.0), n_materials)
    price = 10 ** rng.uniform(0.0, 2.0, n_materials)  # per kg
    thick = np.linspace(0.005, 0.1, 20)
    return k, rho, price * rho, thick


def best_of(fn, n: int):
    best, out = np.inf, None
    for _ in range(n):
        t0 = time.perf_counter()
        out = fn()
        best = min(best, time.perf_counter() - t0)
    return best, out


def python_loop_two_layers(k, rho, cv, thick) -> int:
    """Baseline: plain loops over every ordered pair of options."""
    opts = [(L / k[m], rho[m] * L, cv[m] * L, L) for m in range(len(k)) for L in thick]
    count = 0
    out = []
    for a, b in product(opts, opts):
        out.append((a[0] + b[0], a[1] + b[1], a[2] + b[2], a[3] + b[3]))
        count += 1
    return count


def brute_force_front(k, rho, cv, thick, max_layers: int = 3) -> set:
    """Every unordered stack of distinct materials, sieved chunk by chunk."""
    nt = len(thick)
    keep_obj, keep_id = [], []
    tgrid = {n: np.indices((nt,) * n).reshape(n, -1).T for n in (1, 2, 3)}
    for n in range(1, max_layers + 1):
        mats = np.array(list(combinations(range(len(k)), n)))
        for first in range(len(k)):  # one chunk per first material
            mm = mats[mats[:, 0] == first]
            if mm.size == 0:
                continue
            t = tgrid[n]
            L = thick[t][None, :, :]  # (1, nt**n, n)
            kk = k[mm][:, None, :]
            R = (L / kk).sum(-1).ravel()
            m = (rho[mm][:, None, :] * L).sum(-1).ravel()
            c = (cv[mm][:, None, :] * L).sum(-1).ravel()
            obj = np.column_stack([-R, m, c])
            f = pareto_front(obj)
            ids = np.flatnonzero(f)
            keep_obj.append(obj[f])
            keep_id += [
                tuple(zip(mm[i // len(t)].tolist(), t[i % len(t)].tolist(), strict=True))
                for i in ids
            ]
    obj = np.concatenate(keep_obj)
    f = pareto_front(obj)
    return {tuple(sorted(keep_id[i])) for i in np.flatnonzero(f)}


def as_set(s) -> set:
    return {
        tuple(sorted((a, b) for a, b in zip(m, o, strict=True) if a >= 0))
        for m, o in zip(s.material.tolist(), s.option.tolist(), strict=True)
    }


def objective_set(s) -> set:
    return set(map(tuple, np.round(s.objectives(), 12).tolist()))


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--full", action="store_true", help="brute force on all 60 materials")
    ap.add_argument("--repeats", type=int, default=5)
    args = ap.parse_args(argv)
    k, rho, cv, thick = synthetic_candidates(60)
    failed = False

    def report(name, t, target, baseline=None, ok_extra=True):
        nonlocal failed
        ok = t <= target and ok_extra
        failed |= not ok
        base = "" if baseline is None else f"  baseline {baseline:8.3f} s  ({baseline / t:6.0f}x)"
        print(
            f"{name:42s} {t * 1e3:9.1f} ms  target <= {target * 1e3:5.0f} ms{base}  "
            f"{'ok' if ok else 'MISSED/DIFFERS'}"
        )

    print("SYNTHETIC candidates: 60 materials x 20 thicknesses (5-100 mm)")
    enumerate_stacks(k, rho, cv, thick, 2)  # warm-up
    t, s2 = best_of(lambda: enumerate_stacks(k, rho, cv, thick, 2), args.repeats)
    tb, count = best_of(lambda: python_loop_two_layers(k, rho, cv, thick), 1)
    report(f"2-layer enumeration ({len(s2)} stacks)", t, 0.050, tb, count == len(s2))

    t3, f3 = best_of(lambda: stack_front(k, rho, cv, thick, 3), args.repeats)
    nb = 60 if args.full else 30
    sub = (k[:nb], rho[:nb], cv[:nb], thick)
    tb3, bf = best_of(lambda: brute_force_front(*sub), 1)
    tp3, fsub = best_of(lambda: stack_front(*sub, 3), 1)
    same = as_set(fsub) == bf
    report(f"3-layer exact front ({len(f3)} stacks)", t3, 1.0)
    report(f"  check: {nb} materials vs brute force", tp3, 1.0, tb3, same)

    tc, cat = best_of(lambda: stack_catalogue(k, rho, cv, thick, 3), 1)
    print(
        f"{'budget pre-computation (one-off)':42s} {tc * 1e3:9.1f} ms  "
        f"({len(cat.stacks)} candidate stacks)"
    )
    budgets = np.linspace(0.02, 0.3, 15)
    cat.front(0.1)
    times = []
    for b in budgets:
        tq, _ = best_of(lambda b=b: cat.front(b), 3)
        times.append(tq)
    check = []
    for b in (0.04, 0.1, 0.2):
        td, direct = best_of(
            lambda b=b: stack_front(k, rho, cv, thick, 3, max_total_thickness=b), 1
        )
        check.append((td, objective_set(direct) == objective_set(cat.front(b))))
    report(
        "change of thickness budget (worst of 15)",
        max(times),
        0.200,
        max(t for t, _ in check),
        all(ok for _, ok in check),
    )
    return 1 if failed else 0


if __name__ == "__main__":
    sys.exit(main())
