"""Timings of the direct calculation on the hull (calculation.method: hull), not a test: each
demo condition evaluated on the hull offsets (equilibrium free to trim, particulars, KN at 19
heels free to trim, deck edge and θf on the hull). Target (issue 9): one condition in under
1 s; the first also prepares the hull's sections.

Usage: python benchmarks/bench_hull.py [CONDITION.yaml ...]   (default: conditions/*.yaml)
"""

from __future__ import annotations

import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
TARGET_S = 1.0


def main(argv: list[str]) -> int:
    from reportgen.inputs import load_case
    from reportgen.pipeline import evaluate

    paths = [Path(a) for a in argv] or sorted((ROOT / "conditions").glob("*.yaml"))
    if not paths:
        print("no condition files found", file=sys.stderr)
        return 2
    worst = 0.0
    for i, path in enumerate(paths):
        case = load_case(path)  # a fresh case: the hull is prepared again for each
        t0 = time.perf_counter()
        r = evaluate(case, method="hull")
        elapsed = time.perf_counter() - t0
        worst = max(worst, elapsed)
        a = r.angles
        print(f"{path.name:45s} {elapsed:6.3f} s  trim {r.hydrostatics.trim:+.3f} m  "
              f"θf {a.flooding:6.2f}°  deck edge {a.deck_edge:6.2f}°"
              + ("   (first: includes imports of scipy/shapely paths)" if i == 0 else ""))
    ok = worst < TARGET_S
    print(f"slowest condition on the hull: {worst:.3f} s (target < {TARGET_S:g} s): "
          + ("target met" if ok else "TARGET MISSED"))
    return 0 if ok else 1


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
