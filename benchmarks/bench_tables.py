"""Time `build_tables` (hydrostatics at 41 draughts; cross curves at 19 heels × 20
displacements, free trim; deck-edge and flooding angles) for a hull.

usage: python benchmarks/bench_tables.py [VESSEL.yaml]
Default: the demo ship's conditions/vessels/*-hull.yaml, else a Wigley hull (41 stations).
Target (issue "Foundation"): under 10 s on two cores.
"""

from __future__ import annotations

import sys
import time
from pathlib import Path
from types import SimpleNamespace

import numpy as np

from reportgen.hull.tables import build_tables

ROOT = Path(__file__).resolve().parents[1]
TARGET_S = 10.0


def wigley_vessel() -> SimpleNamespace:
    """Wigley hull y = B/2(1 - ξ²)(1 - ζ²) (Wigley 1934), L 100 m, B 16 m, T 6 m, D 9 m."""
    length, breadth, draft, depth = 100.0, 16.0, 6.0, 9.0
    z = np.linspace(0.0, draft, 41)
    stations = []
    for x in np.linspace(0.0, length, 41):
        y = 0.5 * breadth * (1 - (2 * x / length - 1) ** 2) * (1 - ((draft - z) / draft) ** 2)
        pts = np.column_stack([y, z]).tolist() + [[float(y[-1]), depth]]
        stations.append(SimpleNamespace(x=float(x), points=pts))
    return SimpleNamespace(
        hull=SimpleNamespace(density=1.025, stations=stations),
        particulars=SimpleNamespace(length_bp=length, breadth=breadth, depth=depth,
                                    summer_draft=draft),
        lightship=SimpleNamespace(mass=1500.0),
        openings=[SimpleNamespace(name="vent", x=20.0, y=5.0, z=11.0)],
    )


def main(argv: list[str]) -> int:
    if argv:
        path = Path(argv[0])
    else:
        found = sorted((ROOT / "conditions" / "vessels").glob("*-hull.yaml"))
        path = found[0] if found else None
    if path is not None:
        from reportgen.inputs import load_vessel

        vessel = load_vessel(path)
        label = str(path)
    else:
        vessel = wigley_vessel()
        label = "Wigley hull (no demo hull file found)"
    n_st = len(vessel.hull.stations)
    n_pts = sum(len(s.points) for s in vessel.hull.stations)
    t0 = time.perf_counter()
    tables = build_tables(vessel)
    elapsed = time.perf_counter() - t0
    c = tables["cross_curves"]
    print(f"hull: {label} ({n_st} stations, {n_pts} offset points)")
    print(f"build_tables: {elapsed:.2f} s for {len(tables['hydrostatics']['draft'])} draughts, "
          f"{len(c['heel'])} heels x {len(c['displacement'])} displacements, "
          f"trim {c['trim']} (target < {TARGET_S:g} s)")
    if elapsed >= TARGET_S:
        print(f"over the target by {elapsed - TARGET_S:.2f} s")
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
