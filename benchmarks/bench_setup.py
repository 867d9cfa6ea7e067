"""Time the set-up tools: `hull-from-mesh` on a closed mesh of about 250,000 triangles (a
Wigley form, as a CAD export might be) and the tank tables of the demo ship's tanks made from
their boxes (reportgen.hull.tanks, with the row refinement).

usage: python benchmarks/bench_setup.py
Targets: a 250k-triangle mesh read and sliced in under 20 s; every demo tank's table in
under 10 s, on two cores.
"""

from __future__ import annotations

import sys
import time
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parents[1]
MESH_TARGET_S, TANKS_TARGET_S = 20.0, 10.0


def wigley_obj(nx: int = 401, nz: int = 151) -> bytes:
    """A closed Wigley hull y = B/2(1 - ξ²)(1 - ζ²) (Wigley 1934), L 100, B 16, T 6, D 9 m."""
    import trimesh

    length, breadth, draft, depth = 100.0, 16.0, 6.0, 9.0
    z = np.concatenate([np.linspace(0.0, draft, nz), [depth]])
    rings = []
    for x in np.linspace(0.0, length, nx):
        xi = 2 * x / length - 1
        half = np.column_stack([breadth / 2 * (1 - xi**2)
                                * (1 - np.clip((draft - z) / draft, 0, 1) ** 2), z])
        ring = np.vstack([half, (half[::-1] * [-1, 1])[:-1]])
        rings.append(np.column_stack([np.full(len(ring), x), ring]))
    m = len(rings[0])
    verts = np.vstack([*rings, rings[0].mean(0), rings[-1].mean(0)])
    i, j = np.meshgrid(np.arange(nx - 1), np.arange(m), indexing="ij")
    a, b = i * m + j, i * m + (j + 1) % m
    c, d = a + m, b + m
    faces = np.vstack([np.stack([a, b, d], -1).reshape(-1, 3), np.stack([a, d, c], -1)
                       .reshape(-1, 3)])
    k = np.arange(m)
    caps = np.vstack([np.column_stack([np.full(m, len(verts) - 2), (k + 1) % m, k]),
                      np.column_stack([np.full(m, len(verts) - 1), (nx - 1) * m + k,
                                       (nx - 1) * m + (k + 1) % m])])
    mesh = trimesh.Trimesh(verts, np.vstack([faces, caps]), process=False)
    return mesh.export(file_type="stl")


def main() -> int:
    sys.path.insert(0, str(ROOT / "conditions"))
    import make_demo_ship as demo

    from reportgen.hull.mesh import load_mesh, mesh_stations
    from reportgen.hull.sections import hull_from_stations
    from reportgen.hull.tanks import geometry_tank_table

    raw = wigley_obj()
    t0 = time.perf_counter()
    mesh = load_mesh(raw, "stl")
    t1 = time.perf_counter()
    made = mesh_stations(mesh)
    t2 = time.perf_counter()
    print(f"hull-from-mesh: {len(mesh.faces):,} triangles read and checked in {t1 - t0:.2f} s, "
          f"{len(made.stations)} stations cut in {t2 - t1:.2f} s (target < {MESH_TARGET_S:g} s "
          f"together); offsets {made.offsets_volume_m3:.2f} m³, mesh {made.mesh_volume_m3:.2f} m³")
    hull = hull_from_stations([(x, np.array(p, dtype=float)) for x, p in demo.stations()])
    t3 = time.perf_counter()
    rows = [len(geometry_tank_table(hull, t.box)["sounding"]) for t in demo.tank_defs()]
    t4 = time.perf_counter()
    print(f"tank tables: {len(rows)} demo tanks from their boxes in {t4 - t3:.2f} s, "
          f"{min(rows)} to {max(rows)} rows each (target < {TANKS_TARGET_S:g} s)")
    missed = (t2 - t0 > MESH_TARGET_S) or (t4 - t3 > TANKS_TARGET_S)
    if missed:
        print("a target was missed")
    return 1 if missed else 0


if __name__ == "__main__":
    sys.exit(main())
