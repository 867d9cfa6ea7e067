"""Timings of the limits (not a test): the demo ship's limiting KG curve (every displacement,
its criteria) after import, and one condition's KG margin. Targets: < 1 s for the curve,
< 20 ms for a margin.

Usage: python benchmarks/bench_limits.py [VESSEL.yaml [CONDITION.yaml]]
"""

from __future__ import annotations

import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent


def main(argv: list[str]) -> int:
    from reportgen import limits, stages
    from reportgen.inputs import load_case, load_vessel
    from reportgen.limitcurve import limiting_curve
    from reportgen.vesseldata import vessel_data

    vessel_path = Path(argv[0]) if argv else ROOT / "conditions/vessels/linnet-demo.yaml"
    cond_path = Path(argv[1]) if len(argv) > 1 else ROOT / "conditions/full-load-departure.yaml"
    raw = vessel_path.read_bytes()
    vessel = load_vessel(vessel_path)
    t0 = time.perf_counter()
    doc = limiting_curve(vessel, raw, vessel_path.name)
    curve = time.perf_counter() - t0
    print(f"limits of {vessel_path.name}: {curve:.2f} s for {len(doc['rows'])} displacements "
          f"({', '.join(doc['criteria'])})")

    case = load_case(cond_path)
    up = stages.upright(case, vessel_data(case.vessel))
    k = stages.at_kg(up, stages.kg_fluid_of(up)[1])
    limits.condition_limits(up, k)  # warm up
    best = min(_timed(lambda: limits.condition_limits(up, k)) for _ in range(10))
    print(f"KG margin of {cond_path.name}: {best * 1e3:.1f} ms (best of 10, upright stage given)")
    ok = curve < 1.0 and best < 0.020
    print("targets met" if ok else "TARGETS MISSED (1 s for the curve, 20 ms for a margin)")
    return 0 if ok else 1


def _timed(fn) -> float:
    t0 = time.perf_counter()
    fn()
    return time.perf_counter() - t0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
