"""The invented demo ship's hull form: main dimensions and offsets (used by make_demo_ship.py).

The hull is a smooth general-cargo form built waterline by waterline (lengths in m):
a midship section with a small rise of floor, a round bilge and a vertical side; each
waterline runs from the stern profile to the stem, full (parallel middle body) between
PMB_AFT and PMB_FORE and falling off as a power curve towards the ends, fuller at the
higher waterlines (hence flare forward). The stem is raked with a rounded forefoot, the
stern a transom whose lower edge is above the summer waterline. Everything is invented.
"""

from __future__ import annotations

import numpy as np
from scipy.optimize import brentq

# --- main dimensions (m) -------------------------------------------------------------------
LPP = 97.0
BREADTH = 15.6
DEPTH = 8.4
SUMMER_DRAFT = 6.2
KEEL_THICKNESS = 0.016
BILGE_KEEL_AREA = 18.0  # two bilge keels of about 0.35 m x 26 m (m²)
HALF_B = BREADTH / 2.0
RISE_OF_FLOOR = 0.15
BILGE_RADIUS = 1.8

PMB_AFT = 38.0  # parallel middle body, x from AP
PMB_FORE = 60.0
TRANSOM_X = -2.0  # transom plane, x from AP
TRANSOM_EDGE_Z = 6.6  # lower edge of the transom above base
STERNPOST_X = 3.5  # where the keel meets the stern profile
STEM_RAKE = 0.45  # dx/dz of the straight part of the stem
FOREFOOT_Z = 3.0
STEM_END_X = 98.0  # the stem's top is vertical forward of this x


# --- hull form ------------------------------------------------------------------------------


def midship_half_breadth(z: float) -> float:
    """Half-breadth of the midship section at height z above base, m."""
    flat = HALF_B - BILGE_RADIUS
    if z <= RISE_OF_FLOOR:
        return flat * z / RISE_OF_FLOOR
    if z <= RISE_OF_FLOOR + BILGE_RADIUS:
        dz = RISE_OF_FLOOR + BILGE_RADIUS - z
        return flat + float(np.sqrt(BILGE_RADIUS**2 - dz**2))
    return HALF_B


def raked_stem_x(z: float) -> float:
    """x of the raked stem line at height z (straight above the rounded forefoot)."""
    x = LPP + STEM_RAKE * (z - SUMMER_DRAFT)
    if z < FOREFOOT_Z:
        x -= 1.5 * (1.0 - z / FOREFOOT_Z) ** 2
    return x


def stem_x(z: float) -> float:
    """x of the stem at height z: the raked line, vertical above STEM_END_X."""
    return min(raked_stem_x(z), STEM_END_X)


def stern_x(z: float) -> float:
    """x of the stern profile at height z: from the sternpost up to the transom edge."""
    if z >= TRANSOM_EDGE_Z:
        return TRANSOM_X
    return TRANSOM_X + (STERNPOST_X - TRANSOM_X) * (1.0 - z / TRANSOM_EDGE_Z) ** 1.5


def deck_z(x: float) -> float:
    """Deck at side: moulded depth amidships with sheer forward and aft."""
    fore = 1.2 * max(0.0, (x - 60.0) / 38.0) ** 2
    aft = 0.4 * max(0.0, (15.0 - x) / 17.0) ** 2
    return DEPTH + fore + aft


def transom_fraction(z: float) -> float:
    """Half-breadth of the transom as a fraction of the midship half-breadth."""
    return 0.0 if z <= TRANSOM_EDGE_Z else 0.62 * min(1.0, (z - TRANSOM_EDGE_Z) / 1.8) ** 1.5


def half_breadth(x: float, z: float) -> float:
    """Hull half-breadth at (x, z), m; 0 outside the profile."""
    xa, xf = stern_x(z), stem_x(z)
    if x < xa - 1e-9 or x > xf + 1e-9:
        return 0.0
    ym = midship_half_breadth(z)
    zr = min(z / 9.0, 1.0)
    if x > PMB_FORE:
        p_fore = 1.45 + 1.25 * zr  # fuller higher up: flare forward
        w = 1.0 - ((x - PMB_FORE) / (xf - PMB_FORE)) ** p_fore
    elif x < PMB_AFT:
        p_aft = 1.5 + 1.4 * zr
        w0 = transom_fraction(z)
        w = 1.0 - (1.0 - w0) * ((PMB_AFT - x) / (PMB_AFT - xa)) ** p_aft
    else:
        w = 1.0
    return ym * max(w, 0.0)


def keel_z(x: float) -> float:
    """Lowest z of the hull at station x (the keel or the stern/stem profile)."""
    if STERNPOST_X <= x <= stem_x(0.0):
        return 0.0
    if x < STERNPOST_X:
        if x <= TRANSOM_X + 1e-9:
            return TRANSOM_EDGE_Z
        return float(brentq(lambda z: stern_x(z) - x, 0.0, TRANSOM_EDGE_Z, xtol=1e-10))
    return float(brentq(lambda z: raked_stem_x(z) - x, 0.0, deck_z(x), xtol=1e-10))


def _z_levels() -> np.ndarray:
    phi = np.radians(np.arange(5.0, 90.1, 5.0))
    bilge = RISE_OF_FLOOR + BILGE_RADIUS * (1.0 - np.cos(phi))
    side = np.arange(2.0, 9.6, 0.4)
    return np.unique(np.round(np.concatenate([[0.0, 0.05, RISE_OF_FLOOR], bilge, side]), 3))


def station_xs() -> np.ndarray:
    """Transom, 41 stations at Lpp/40 (AP to FP) and a few in the overhangs, m from AP."""
    regular = np.round(np.arange(41) * LPP / 40.0, 4)
    extra = np.array([TRANSOM_X, -1.0, 97.5, STEM_END_X])
    return np.unique(np.concatenate([regular, extra]))


def station_points(x: float) -> list[tuple[float, float]]:
    """Starboard half-section at x: keel (on the centreline) to deck edge, z not decreasing."""
    zk, zd = keel_z(x), deck_z(x)
    levels = [z for z in _z_levels() if zk + 1e-3 < z < zd - 1e-3]
    zs = [zk, *levels, zd]
    pts: list[tuple[float, float]] = []
    for i, z in enumerate(zs):
        y = 0.0 if i == 0 else half_breadth(x, z)
        p = (round(y, 3), round(z, 3))
        if not pts or p != pts[-1]:
            pts.append(p)
    if len(pts) == 1:
        pts.append((0.0, round(zd, 3)))
    return pts


def stations() -> list[tuple[float, list[tuple[float, float]]]]:
    return [(float(x), station_points(float(x))) for x in station_xs()]
