"""Write the invented example hull "Tern Example" as a closed triangle mesh (OBJ), standing in
for a design office's CAD export in the README's walk-through of setting up a ship.

Run:  .venv/bin/python conditions/setup-example/make_tern_mesh.py

Everything is invented. Axes as in SPEC.md (x from the aft perpendicular forward, y to
starboard, z up from the moulded baseline), metres. The form: a flat bottom with a round bilge
(radius BILGE), vertical sides, a parallel middle body from PMB_AFT to PMB_FORE, a vertical
transom at TRANSOM_X and a vertical stem at STEM_X, waterlines falling off as power curves;
a flat deck at DEPTH. The mesh joins the whole section (starboard and port) at each of
N_RINGS stations and closes the transom by a fan; the stem ring has zero width.
The output is deterministic.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np

OUT = Path(__file__).resolve().parent / "tern-hull.obj"
HALF_B, DEPTH, BILGE = 4.8, 4.2, 1.0
TRANSOM_X, STEM_X = -1.0, 48.5
PMB_AFT, PMB_FORE = 15.0, 33.0
N_RINGS = 61


def fullness(x: float) -> float:
    """Waterline half-breadth as a fraction of HALF_B at x."""
    if x > PMB_FORE:
        return max(0.0, 1.0 - ((x - PMB_FORE) / (STEM_X - PMB_FORE)) ** 1.8)
    if x < PMB_AFT:
        return 1.0 - 0.45 * ((PMB_AFT - x) / (PMB_AFT - TRANSOM_X)) ** 2
    return 1.0


def half_section(x: float) -> np.ndarray:
    """Starboard half-section (y, z) from the keel to the deck edge."""
    phi = np.linspace(0.0, np.pi / 2, 9)
    bilge = np.column_stack([HALF_B - BILGE + BILGE * np.sin(phi), BILGE * (1 - np.cos(phi))])
    pts = np.vstack([[0.0, 0.0], bilge, [HALF_B, 2.0], [HALF_B, 3.0], [HALF_B, DEPTH]])
    return pts * np.array([fullness(x), 1.0])


def mesh() -> tuple[np.ndarray, np.ndarray]:
    xs = np.linspace(TRANSOM_X, STEM_X, N_RINGS)
    rings = []
    for x in xs:
        half = half_section(float(x))
        ring = np.vstack([half, (half[::-1] * [-1.0, 1.0])[:-1]])
        rings.append(np.column_stack([np.full(len(ring), x), ring]))
    m = len(rings[0])
    verts = np.vstack([*rings, rings[0].mean(axis=0)])
    centre = len(verts) - 1
    faces = []
    for i in range(len(xs) - 1):
        for j in range(m):
            k = (j + 1) % m
            a, b, c, d = i * m + j, i * m + k, (i + 1) * m + j, (i + 1) * m + k
            faces += [[a, b, d], [a, d, c]]
    faces += [[centre, (j + 1) % m, j] for j in range(m)]
    return verts, np.array(faces)


def obj_text() -> str:
    verts, faces = mesh()
    lines = ["# Invented example hull 'Tern Example' (not a real ship); metres, SPEC axes"]
    lines += [f"v {x:.4f} {y:.4f} {z:.4f}" for x, y, z in verts]
    lines += [f"f {a + 1} {b + 1} {c + 1}" for a, b, c in faces]
    return "\n".join(lines) + "\n"


if __name__ == "__main__":
    OUT.write_text(obj_text(), encoding="utf-8")
    print(OUT)
