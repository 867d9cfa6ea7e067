"""Box barge data for the evaluation tests, made analytically (not by the code under test).

A prismatic box L × B × D (m). Its hydrostatics are closed-form (any textbook of ship
hydrostatics, e.g. Rawson & Tupper, Basic Ship Theory, ch. 2 and 4):
  Δ = ρ·L·B·T, LCB = LCF = L/2, KB = T/2, BM = B²/(12·T), KMt = KB + BM,
  BML = L²/(12·T), MCT ≈ Δ·BML/(100·L) = ρ·B·L²/1200, TPC = ρ·L·B/100, CB = 1.
Its cross curves are computed here by exact 2D clipping of the section with shapely: the box is
prismatic, so the immersed section area is B·T at every heel, and KN is the horizontal distance
from the keel K to the centroid of the immersed section in the heeled frame.
"""

from __future__ import annotations

import functools
import math
from pathlib import Path

import numpy as np
import yaml
from scipy.optimize import brentq
from shapely import affinity
from shapely.geometry import Polygon, box

L, B, D = 100.0, 16.0, 14.0
RHO = 1.025
HEELS = [float(h) for h in range(0, 91, 5)]
DRAFTS = [round(2.0 + 0.25 * i, 4) for i in range(41)]  # 2.0 .. 12.0 m
# The box as hull offsets: starboard half-sections from the keel to the deck edge.
BOX_STATIONS = [{"x": float(x), "points": [[0.0, 0.0], [B / 2, 0.0], [B / 2, D]]}
                for x in range(0, 101, 10)]


def kn_exact(draft_m: float, heel_deg: float) -> float:
    """KN (m) of the box section at the volume of draught T, by shapely clipping."""
    section = box(-B / 2, 0.0, B / 2, D)
    if heel_deg == 0.0:
        return 0.0
    rotated = affinity.rotate(section, -heel_deg, origin=(0.0, 0.0))
    area = B * draft_m
    x0, y0, x1, y1 = rotated.bounds

    def below(h: float) -> Polygon:
        return rotated.intersection(box(x0 - 1, y0 - 1, x1 + 1, h))

    h = brentq(lambda h: below(h).area - area, y0, y1, xtol=1e-12)
    return float(below(h).centroid.x)


def wall_sided_gz(draft_m: float, kg_m: float, heel_deg: float) -> float:
    """GZ = sin θ·(GM + ½·BM·tan²θ), the wall-sided formula (Rawson & Tupper, ch. 4), valid
    while the deck edge is out of the water and the bilge is not emerged."""
    t = math.radians(heel_deg)
    bm = B * B / (12.0 * draft_m)
    gm = draft_m / 2.0 + bm - kg_m
    return math.sin(t) * (gm + 0.5 * bm * math.tan(t) ** 2)


@functools.lru_cache(maxsize=1)
def kn_table() -> tuple[tuple[float, ...], ...]:
    """KN (m) at every DRAFTS row and HEELS column, by kn_exact (computed once)."""
    return tuple(tuple(kn_exact(t, h) for h in HEELS) for t in DRAFTS)


def vessel_dict(criteria: tuple[str, ...] = ("is2008.general", "is2008.weather"),
                **extra: object) -> dict:
    drafts = np.array(DRAFTS)
    kn = [list(row) for row in kn_table()]
    d = {
        "format": "reportgen/vessel-1",
        "vessel": {"name": "Test box barge", "identifier": "TEST-BOX-0001", "type": "barge"},
        "particulars": {"length_bp": L, "breadth": B, "depth": D, "summer_draft": 10.0,
                        "keel_thickness": 0.02, "bilge": "sharp", "bilge_keel_area": 0.0},
        "lightship": {"mass": 1000.0, "lcg": L / 2, "vcg": 4.0, "tcg": 0.0},
        "hydrostatics": {
            "density": RHO,
            "draft": drafts.tolist(),
            "displacement": (RHO * L * B * drafts).tolist(),
            "lcb": [L / 2] * len(drafts),
            "lcf": [L / 2] * len(drafts),
            "kmt": (drafts / 2 + B * B / (12 * drafts)).tolist(),
            "mct": [RHO * B * L * L / 1200.0] * len(drafts),
            "tpc": [RHO * L * B / 100.0] * len(drafts),
        },
        "cross_curves": {"trim": "free", "heel": HEELS,
                         "displacement": (RHO * L * B * drafts).tolist(), "kn": kn},
        "windage": {"profile": [[0.0, 0.0], [L, 0.0], [L, D], [0.0, D]]},
        "tanks": [{
            "id": "T1", "name": "Centre tank", "content": "ballast", "density": 1.025,
            # A 10 m x 10 m x 5 m box tank on the centreline, x 45..55, bottom at z = 0.
            "table": {
                "sounding": [0.0, 1.0, 2.0, 3.0, 4.0, 5.0],
                "volume": [0.0, 100.0, 200.0, 300.0, 400.0, 500.0],
                "lcg": [50.0] * 6,
                "vcg": [0.0, 0.5, 1.0, 1.5, 2.0, 2.5],
                "tcg": [0.0] * 6,
                "fsi": [10.0 ** 4 / 12.0] * 6,  # i = l·b³/12 = 10·10³/12 m⁴
            }}],
        "criteria": list(criteria),
    }
    d.update(extra)
    return d


def condition_dict(items: list[dict] | None = None, **extra: object) -> dict:
    d = {"format": "reportgen/condition-1", "vessel": "box.yaml",
         "condition": {"title": "Box barge test condition", "water_density": RHO},
         "items": items if items is not None else []}
    d.update(extra)
    return d


_KN_CACHE: dict = {}


def write_case(folder: Path, condition: dict, vessel: dict | None = None) -> Path:
    """Write box.yaml and cond.yaml into folder; returns the condition path."""
    if vessel is None:
        if "v" not in _KN_CACHE:
            _KN_CACHE["v"] = vessel_dict()
        vessel = _KN_CACHE["v"]
    (folder / "box.yaml").write_text(yaml.safe_dump(vessel, sort_keys=False), encoding="utf-8")
    path = folder / "cond.yaml"
    path.write_text(yaml.safe_dump(condition, sort_keys=False), encoding="utf-8")
    return path
