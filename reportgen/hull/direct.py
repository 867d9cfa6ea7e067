"""Direct calculation of one condition on the hull offsets (SPEC.md `calculation.method: hull`).

Units: masses t, lengths m (x from AP forward, z up from the moulded base), density t/m³,
angles deg, MCT t·m/cm, TPC t/cm; trim + by the stern.

1. Upright equilibrium at the condition's displacement Δ and LCG: the waterplane immersing
   ∇ = Δ/ρ with its centre of buoyancy on the vertical through G (xB = LCG), draught and trim
   free (reportgen.hull.equilibrium.equilibrium at heel 0).
2. The particulars at that waterplane: draughts, LCB, LCF, KMt, MCT, TPC, Lwl, CB
   (reportgen.hull.hydrostatics.hydrostatics_at, in the condition's water).
3. KN at every heel of the scan with the ship free to trim and xB held at the LCG, the same
   definition as cross curves made free to trim (Rawson & Tupper, Basic Ship Theory, ch. 4);
   GZ = KN − KG·sinθ − TCG·cosθ then places the heel of equilibrium (the list, heel free)
   where GZ = 0, as with tables.
4. The deck edge and the angle of flooding on the same scanned waterplanes
   (reportgen.hull.tables.immersion_angle).

KN between the scanned heels is a cubic spline, odd in heel (reportgen.stability.odd_spline),
as for a table's rows.
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from dataclasses import dataclass

import numpy as np
from scipy.interpolate import PPoly

from reportgen.floating import Floating, draughts_about_midships
from reportgen.hull.equilibrium import Equilibrium, equilibrium
from reportgen.hull.hydrostatics import HullGeometry, Plane, hydrostatics_at
from reportgen.hull.tables import heel_scan, immersion_angle
from reportgen.stability import odd_spline

# The scan: the cross curves' heels every 5°, and 12° (the Grain Code's notes to figure A 7
# ask for GZ at 12° and 40°).
HEELS_DEG = tuple(sorted({float(h) for h in range(0, 91, 5)} | {12.0}))


@dataclass(frozen=True)
class OnHull:
    """A condition computed on the hull: its floating position (method "hull"), the KN spline
    (m, heel deg), the last heel of the scan (deg), and the immersion finder: points (n, 3)
    (x, y, z) m -> least heel (deg) at which one of them reaches the waterplane."""

    floating: Floating
    kn: PPoly
    heel_max_deg: float
    scanned: tuple[Equilibrium, ...]
    immersion: Callable[[np.ndarray], float]


def on_hull(geom: HullGeometry, displacement_t: float, water_density: float, lcg_m: float,
            heels_deg: Sequence[float] = HEELS_DEG) -> OnHull:
    """The condition of displacement Δ (t) in water of ρ (t/m³) with its centre of gravity at
    LCG (m from AP), computed on the hull (module docstring). Raises ValueError when the hull
    cannot carry Δ (a volume above the closed hull's)."""
    volume = displacement_t / water_density
    upright = equilibrium(geom, volume, 0.0, lcg_m)
    p = hydrostatics_at(geom, upright.plane, water_density)
    fl = Floating("hull", displacement_t, p["trim"], draughts_about_midships(p["draft"],
                                                                              p["trim"]),
                  p["lcb"], p["lcf"], p["kmt"], p["mct"], p["tpc"], p["lwl"], p["cb"])
    heels = [float(h) for h in heels_deg]
    states = tuple(heel_scan(geom, volume, lcg_m, heels, upright=upright))
    kn = odd_spline(np.asarray(heels), np.array([e.kn_m for e in states]))

    def immersion(points_xyz: np.ndarray) -> float:
        return immersion_angle(geom, points_xyz, volume, lcg_m, [e.plane for e in states])

    return OnHull(fl, kn, heels[-1], states, immersion)


def summer_on_hull(geom: HullGeometry, summer_draft_m: float, density: float
                   ) -> tuple[float, float]:
    """(displacement t, TPC t/cm) of the hull upright on an even keel at the summer draught in
    water of `density` (the load line's reference row)."""
    p = hydrostatics_at(geom, Plane(summer_draft_m, 0.0, 0.0), density)
    return p["displacement"], p["tpc"]
