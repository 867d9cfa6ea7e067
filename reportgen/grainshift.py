"""The transverse shift of grain in one cross-section of a compartment, by the assumptions of
the International Grain Code (MSC.23(59)), Part B: the grain keeps its area (volume per metre)
while its surface turns to an angle to the horizontal (B 2: 15° in filled compartments; B 5.1:
25° in partly filled ones, both recalled from memory), and the heeling moment per metre is the
area times the transverse travel of its centroid. B 2.1 (recalled from memory): the moment of a
transverse section is multiplied by the length of the portion it stands for.

Geometry with shapely: sections are polygons in (y, z), m, y to starboard; the shifted surface
z = c + y·tan α rises to starboard, so the grain moves to starboard and the moment is positive.
Units: areas m², moments per metre of length m³, angles deg.

A booklet's volumetric heeling moment (m⁴) is the sum over the compartment's length of these
moments with the vertical-shift allowance of B 1.3 (1.06, filled, where the Administration lets
the voids count in the VCG) or B 1.5 (1.12, partly filled), both recalled from memory.
"""

from __future__ import annotations

import math

import shapely
from scipy.optimize import brentq
from shapely.geometry import Polygon

_FAR_M = 1.0e3  # half-planes are drawn as polygons this far beyond the section


def below(section: Polygon, level_z: float, slope: float = 0.0, pivot_y: float = 0.0) -> Polygon:
    """The part of `section` below the line z = level + slope·(y − pivot) (m)."""
    y0, z0, y1, _ = section.bounds
    ya, yb = y0 - _FAR_M, y1 + _FAR_M
    cut = Polygon([(ya, z0 - _FAR_M), (yb, z0 - _FAR_M),
                   (yb, level_z + slope * (yb - pivot_y)),
                   (ya, level_z + slope * (ya - pivot_y))])
    return shapely.intersection(section, cut)


def shifted(section: Polygon, grain: Polygon, angle_deg: float) -> Polygon:
    """The grain of `grain` (a part of `section`) after its surface turns to `angle_deg` to
    starboard, keeping its area: the part of the section below z = c + y·tan α with c found by
    scipy's brentq."""
    area = grain.area
    slope = math.tan(math.radians(angle_deg))
    y0, z0, y1, z1 = section.bounds
    lo = z0 - slope * max(abs(y0), abs(y1)) - 1.0
    hi = z1 + slope * max(abs(y0), abs(y1)) + 1.0
    c = brentq(lambda c: below(section, c, slope).area - area, lo, hi, xtol=1e-10)
    return below(section, c, slope)


def shift_moment_m3(section: Polygon, grain: Polygon, angle_deg: float) -> float:
    """Transverse heeling moment per metre (m³) of the grain's shift: A·(ȳ after − ȳ before)."""
    if grain.area <= 0.0:
        return 0.0
    after = shifted(section, grain, angle_deg)
    return grain.area * (after.centroid.x - grain.centroid.x)


def partly_moment_m3(section: Polygon, level_z: float, angle_deg: float = 25.0) -> float:
    """B 5.1: the grain below a level surface at level_z (m) shifts to `angle_deg`."""
    return shift_moment_m3(section, below(section, level_z), angle_deg)


HATCH_VOID_M = 0.150  # B 1.1.2: the void within a filled hatchway, 150 mm (published text)


def trimmed_grain(section: Polygon, void_depth_m: float,
                  hatch_half_breadth_m: float | None = None) -> Polygon:
    """B 1.1.1: a filled, trimmed section with a void of average depth Vd (m) under a flat
    deckhead (the section's top); with a hatchway (|y| ≤ its half-breadth, m) the void there is
    150 mm instead (B 1.1.2, the coaming not modelled: the hatchway's top taken at the
    deckhead)."""
    top = section.bounds[3]
    grain = below(section, top - void_depth_m)
    if hatch_half_breadth_m is None:
        return grain
    hatch = shapely.intersection(below(section, top - HATCH_VOID_M),
                                 shapely.box(-hatch_half_breadth_m, section.bounds[1],
                                             hatch_half_breadth_m, top))
    return shapely.union(grain, hatch)


def untrimmed_grain(section: Polygon, hatch_half_breadth_m: float,
                    slope_deg: float = 30.0) -> Polygon:
    """B 1.1.3: filled, untrimmed: outside the hatchway (|y| > the hatch half-breadth) the
    grain surface slopes down into the void under the deck at 30° from the hatch edge; within
    the hatchway a void of 150 mm (B 1.1.2)."""
    top = section.bounds[3] - HATCH_VOID_M
    s = math.tan(math.radians(slope_deg))
    stbd = below(section, top, -s, hatch_half_breadth_m)
    return shapely.intersection(stbd, below(section, top, s, -hatch_half_breadth_m))
