"""Grain data of a cargo hold from the hull geometry, by the assumptions of the International
Grain Code (MSC.23(59)), Part B: what a grain loading booklet tabulates for each compartment
(SPEC.md, vessel `grain:`), for the demo ship and for anyone setting up a ship.

A hold is the part of the hull inside a box (reportgen.hull.compartments.TankBox); its deckhead
is the top of that part (the hatchway itself is not modelled). At each station of the hold the
transverse section is shifted by reportgen.grainshift and the moments are integrated along x
with Simpson's rule (scipy), as the tank tables are. Units: m, m³, m⁴.

- Filled, trimmed: a void of average depth Vd under the deckhead outside the hatchway (B 1.1.1;
  Vd = Vd1 + 0.75·(d − 600) mm, Vd1 from table B 1-1 by the boundary distance, not less than
  100 mm) and of 150 mm within it (B 1.1.2), the grain surface shifting to 15° (B 2, recalled
  from memory). The cargo's centre is at the
  volumetric centre of the whole space (B 1.3), so no vertical-shift factor is applied.
- Filled, untrimmed: outside the hatchway (|y| > the hatch half-breadth) the grain slopes into
  the void under the deck at 30° from the hatch edge (B 1.1.3), 150 mm within the hatchway
  (B 1.1.2), then shifts to 15° (B 3, the untrimmed compartment, as B 2; recalled from
  memory).
- Partly filled: a level surface shifting to 25° (B 5.1, recalled from memory; B 1.2, found in
  the published text, places the partly filled pattern in B 5), the moment × 1.12 for the
  vertical shift of the surface (B 1.5, recalled from memory).
"""

from __future__ import annotations

from collections.abc import Callable

import numpy as np
import shapely
from scipy.integrate import simpson
from shapely.geometry import Polygon

from reportgen.grain import FILLED_SHIFT_DEG, PARTLY_SHIFT_DEG, VERTICAL_SHIFT_PARTLY
from reportgen.grainshift import (
    partly_moment_m3,
    shift_moment_m3,
    trimmed_grain,
    untrimmed_grain,
)
from reportgen.hull.compartments import TankBox, _x_grid, section_at, tank_table
from reportgen.hull.sections import Hull

MIN_VOID_MM = 100.0  # B 1.1.1: Vd is never taken below 100 mm


def void_depth_m(vd1_mm: float, girder_depth_mm: float) -> float:
    """B 1.1.1: Vd = Vd1 + 0.75·(d − 600) mm, at least 100 mm; returned in m."""
    return max(vd1_mm + 0.75 * (girder_depth_mm - 600.0), MIN_VOID_MM) / 1000.0


def hold_sections(hull: Hull, box: TankBox) -> tuple[np.ndarray, list[Polygon]]:
    """The hold's stations (m) and its section (hull ∩ box) at each."""
    x = _x_grid(hull, box)
    cut = shapely.box(box.y_min, box.z_min, box.y_max, box.z_max)
    return x, [shapely.intersection(section_at(hull, float(xi)), cut) for xi in x]


def _along(x: np.ndarray, sections: list[Polygon], per_metre: Callable[[Polygon], float]
           ) -> float:
    return float(simpson([per_metre(s) if s.area > 0 else 0.0 for s in sections], x=x))


def hold_grain(hull: Hull, box: TankBox, soundings_m: np.ndarray, void_depth: float,
               hatch_half_breadth_m: float) -> dict:
    """The hold's grain data: `filled` {volume, lcg, vcg, vhm (trimmed)}, `untrimmed_vhm`, and
    `partly` {volume, lcg, vcg, vhm} at the soundings (m above the hold's lowest point)."""
    x, sections = hold_sections(hull, box)
    tab = tank_table(hull, box, soundings_m)
    z_low = min(s.bounds[1] for s in sections if s.area > 0)
    partly_vhm = [VERTICAL_SHIFT_PARTLY * _along(
        x, sections, lambda s, z=z_low + h: partly_moment_m3(s, z, PARTLY_SHIFT_DEG))
        for h in tab["sounding"]]
    trimmed = _along(x, sections, lambda s: shift_moment_m3(
        s, trimmed_grain(s, void_depth, hatch_half_breadth_m), FILLED_SHIFT_DEG))
    untrimmed = _along(x, sections, lambda s: shift_moment_m3(
        s, untrimmed_grain(s, hatch_half_breadth_m), FILLED_SHIFT_DEG))
    return {"filled": {"volume": float(tab["volume"][-1]), "lcg": float(tab["lcg"][-1]),
                       "vcg": float(tab["vcg"][-1]), "vhm": trimmed},
            "untrimmed_vhm": untrimmed,
            "partly": {"volume": tab["volume"], "lcg": tab["lcg"], "vcg": tab["vcg"],
                       "vhm": np.asarray(partly_vhm)}}
