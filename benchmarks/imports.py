"""Benchmark: the time of ``import workbench`` against ``import numpy``.

Each import is timed in a fresh interpreter (``sys.executable -c ...``), the two
kinds interleaved, median of the repeats; the interpreter's own start-up is
outside the timed span. Also lists which heavy packages the import loaded.
Target: ``import workbench`` within 3x ``import numpy`` (numpy is the one heavy
package the numeric core needs at import). Exits non-zero if missed.
"""

from __future__ import annotations

import json
import statistics
import subprocess
import sys

HEAVY = ("pint", "pandas", "scipy", "plotly", "ipywidgets")
TARGET = 3.0

_CODE = """
import json, sys, time
t0 = time.perf_counter()
import {module}
elapsed = time.perf_counter() - t0
heavy = sorted({{m.split(".")[0] for m in sys.modules}} & set({heavy!r}))
print(json.dumps({{"seconds": elapsed, "heavy": heavy}}))
"""


def time_import(module: str) -> tuple[float, list[str]]:
    """Seconds to import ``module`` in a fresh interpreter, and the heavy packages loaded."""
    done = subprocess.run(
        [sys.executable, "-c", _CODE.format(module=module, heavy=HEAVY)],
        capture_output=True,
        text=True,
        check=True,
    )
    out = json.loads(done.stdout)
    return out["seconds"], out["heavy"]


def main(repeat: int = 9) -> int:
    times: dict[str, list[float]] = {"numpy": [], "workbench": []}
    heavy: dict[str, list[str]] = {}
    for _ in range(repeat):
        for module in times:
            seconds, heavy[module] = time_import(module)
            times[module].append(seconds)
    med = {m: statistics.median(t) for m, t in times.items()}
    ratio = med["workbench"] / med["numpy"]
    print(
        f"{'import':>10} {'median [ms]':>12} {'min [ms]':>9} {'max [ms]':>9}  heavy packages loaded"
    )
    for module, t in times.items():
        print(
            f"{module:>10} {med[module] * 1e3:>12.1f} {min(t) * 1e3:>9.1f} {max(t) * 1e3:>9.1f}  "
            f"{', '.join(heavy[module]) or '-'}"
        )
    ok = ratio <= TARGET and not heavy["workbench"]
    print(
        f"workbench/numpy = {ratio:.2f} (median of {repeat}); target <= {TARGET:g} and no heavy "
        f"package -> {'met' if ok else 'MISSED'}"
    )
    return 0 if ok else 1


if __name__ == "__main__":
    sys.exit(main())
