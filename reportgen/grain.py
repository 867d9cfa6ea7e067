"""Grain in bulk: the International Code for the Safe Carriage of Grain in Bulk (International
Grain Code, resolution MSC.23(59)), A 7: the grain heeling arm from the volumetric heeling
moments, the angle of heel, the residual area and the allowable heeling moment.

Units: volumes m³, volumetric heeling moments (VHM) m⁴, stowage factor SF m³/t, mass t,
heeling moments t·m, levers m, angles deg (radians inside the integrals), areas m·rad.

Sources. Found in published copies of the Code's text: A 2 (definitions; the consolidated text
of MSC.23(59) on puc.overheid.nl, "GRAIN International Code for the safe carriage of grain in
bulk"), A 7.1.1 to A 7.1.3 (reproduced word for word on thenauticalsite.in, "SOLAS - Carriage
of Grain"), B 1.1.1 to B 1.1.3, B 1.2 and the first sentence of B 1.3 (a copy of Part B, "IMO-
Vega", on scribd, and marinegyaan.com). The factors 1.06 and 1.12 and the shift angles 15° and
25° agree with secondary sources found (marinegyaan.com: "an addition of 12%" for partly filled
holds; a grain-loading presentation: "15° shift for filled compartment and 25° for partly
filled"), but the paragraphs holding them were not found: their numbers are recalled from
memory, as marked below.
- A 2.6: the stowage factor is the volume per unit weight of the cargo as attested by the
  loading facility.
- A 7.1.1: the angle of heel due to the shift of grain ≤ 12°, or (ships constructed on or after
  1 January 1994) the angle at which the deck edge is immersed, whichever is the lesser. The
  date of build is not in the vessel file: the deck-edge limit is applied to every ship (the
  conservative reading, SPEC.md).
- A 7.1.2: the residual area between the heeling arm curve and the righting arm curve up to the
  angle of the maximum difference between their ordinates, 40° or θf, whichever is least,
  ≥ 0.075 m·rad.
- A 7.1.3: the initial metacentric height, corrected for the free surface of liquids in tanks,
  ≥ 0.30 m.
- A 7, figure A 7 and its notes: λ0 = assumed volumetric heeling moment due to transverse
  grain shift / (stowage factor × displacement); λ40 = 0.8 × λ0; the heeling arm curve is the
  straight line between them; the displacement is the weight of ship, fuel, fresh water,
  stores etc. and cargo; the righting arm curve from cross curves that include 12° and 40°
  (these notes as reproduced in "Stability Notes: Bulk Grain Cargoes", found on scribd; the
  straight line between λ0 and λ40 is that of the figure, recalled from memory).
- B 1.3: in a "filled compartment, trimmed" the cargo's centre of gravity is normally at the
  volumetric centre of the whole space (found); where the Administration allows the voids to be
  accounted for in the VCG, total heeling moment = 1.06 × the transverse moment (recalled from
  memory).
- B 1.4 (recalled from memory): the cargo of a filled compartment weighs the volume of the whole
  space divided by the stowage factor.
- B 1.5 (recalled from memory): in partly filled compartments, total heeling moment = 1.12 ×
  the calculated transverse heeling moment (the vertical shift of the grain surface).
- B 2 (recalled from memory): filled compartments, the grain surface after shifting at 15° to
  the horizontal; B 5.1 (recalled from memory): partly filled, at 25°.
The booklet's VHM already carry the B 1.3 / B 1.5 allowance (SPEC.md): it is not applied again.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from scipy.optimize import brentq

from reportgen.stability import DEG, GZCurve, area_mrad, on_grid

LAMBDA40_FACTOR = 0.8  # λ40 = 0.8·λ0, A 7 figure
ARM_END_DEG = 40.0  # λ40 is given at 40°, A 7 figure
HEEL_LIMIT_DEG = 12.0  # A 7.1.1
RESIDUAL_AREA_MRAD = 0.075  # A 7.1.2
RESIDUAL_END_DEG = 40.0  # A 7.1.2
GM0_M = 0.30  # A 7.1.3
VERTICAL_SHIFT_PARTLY = 1.12  # B 1.5 (recalled from memory)
FILLED_SHIFT_DEG = 15.0  # B 2 (recalled from memory)
PARTLY_SHIFT_DEG = 25.0  # B 5.1 (recalled from memory)
ALLOWABLE_SCAN = 20  # steps of the scan for the first failing heeling arm
ALLOWABLE_BISECTIONS = 20  # then bisection of that step (to 2⁻²⁰ of a step, ~1e-7 of the range)


def grain_mass_t(volume_m3: float, stowage_factor_m3_t: float) -> float:
    """Grain mass = volume / stowage factor (t), A 2.6 and B 1.4."""
    return volume_m3 / stowage_factor_m3_t


def heeling_moment_tm(vhm_m4: float, stowage_factor_m3_t: float) -> float:
    """Grain heeling moment = VHM / SF (t·m), A 7 figure notes."""
    return vhm_m4 / stowage_factor_m3_t


def lambda0_m(heeling_moment_t_m: float, displacement_t: float) -> float:
    """λ0 = VHM / (SF·Δ) = heeling moment / Δ (m), A 7 figure notes."""
    return heeling_moment_t_m / displacement_t


def heeling_arm_m(lambda0: float, heel_deg: float | np.ndarray) -> np.ndarray:
    """The grain heeling arm (m) at heel (deg): the straight line through λ0 at 0° and
    0.8·λ0 at 40° (A 7 figure), continued as the same line beyond 40°. A float heel gives a
    float, in the same arithmetic (the root searches call this for one heel at a time)."""
    h = heel_deg if type(heel_deg) is float else np.asarray(heel_deg, float)
    return lambda0 * (1.0 - (1.0 - LAMBDA40_FACTOR) * h / ARM_END_DEG)


def arm_area_mrad(lambda0: float, start_deg: float, end_deg: float) -> float:
    """∫ λ dθ (m·rad) from start to end: exact for the straight line (trapezoid)."""
    mean = 0.5 * (heeling_arm_m(lambda0, start_deg) + heeling_arm_m(lambda0, end_deg))
    return float(mean) * (end_deg - start_deg) * DEG


def _difference(curve: GZCurve, lambda0: float):
    """GZ − λ at one heel (deg), in floats (the curve's own cubic piece, GZCurve.local)."""
    return lambda h: curve.local(h)[0] - float(heeling_arm_m(lambda0, h))


def heel_angle_deg(curve: GZCurve, lambda0: float) -> float | None:
    """The angle of heel from the grain shift (deg): 0° when GZ at 0° is not below the arm,
    else the first angle where GZ rises through the heeling arm (the grid of the curve brackets it, scipy's brentq finds it).
    None when GZ does not reach the arm within the cross curves."""
    gh, gv = curve.grid
    first = int(gh.searchsorted(0.0))  # the grid increases: the heels ≥ 0° from here on
    heel = gh[first:]
    f = gv[first:] - heeling_arm_m(lambda0, heel)
    if f[0] >= 0.0:  # no arm (or a rounding residue of GZ at 0°): upright
        return 0.0
    up = np.nonzero((f[:-1] <= 0.0) & (f[1:] > 0.0))[0]
    if not len(up):
        return None
    i = int(up[0])
    if f[i] == 0.0:
        return float(heel[i])
    return float(brentq(_difference(curve, lambda0), heel[i], heel[i + 1], xtol=1e-10))


def max_difference_deg(curve: GZCurve, lambda0: float, start_deg: float,
                       end_deg: float) -> float:
    """The angle (deg) of the greatest GZ − λ on [start, end]: the best grid point, refined
    where d(GZ − λ)/dθ = dGZ/dθ + 0.2·λ0/40° changes sign from + to − between its neighbours
    (scipy's brentq)."""
    heel, gz = on_grid(curve, start_deg, end_deg)
    f = gz - heeling_arm_m(lambda0, heel)
    i = int(np.argmax(f))
    if 0 < i < len(heel) - 1:
        fall = lambda0 * (1.0 - LAMBDA40_FACTOR) / ARM_END_DEG  # −dλ/dθ, m per degree

        def rate(h: float) -> float:
            return curve.local(h)[1] + fall

        a, b = float(heel[i - 1]), float(heel[i + 1])
        if rate(a) > 0.0 > rate(b):
            return float(brentq(rate, a, b, xtol=1e-10))
    return float(heel[i])


@dataclass(frozen=True)
class GrainStability:
    """A 7.1 at one heeling arm: λ0, λ40 (m); the angle of heel (deg, None: GZ never reaches
    the arm) and its limit min(12°, deck edge); the residual area (m·rad, None without a heel
    angle) from the heel angle to `residual_to` (deg), the least of 40°, θf and the angle of
    the greatest difference, named by `residual_to_reason`."""

    lambda0: float
    lambda40: float
    heel_deg: float | None
    heel_limit_deg: float
    residual_area: float | None
    residual_to_deg: float
    residual_to_reason: str  # forty | flooding | max_difference


def stability(curve: GZCurve, lambda0: float, flooding_deg: float,
              deck_edge_deg: float) -> GrainStability:
    """The quantities of A 7.1.1 and A 7.1.2 for the curve (towards the side of any list)."""
    heel = heel_angle_deg(curve, lambda0)
    limit = min(HEEL_LIMIT_DEG, deck_edge_deg)
    stop = min(RESIDUAL_END_DEG, flooding_deg, curve.heel_max_deg)
    reason = "flooding" if flooding_deg < RESIDUAL_END_DEG else "forty"
    if heel is None or heel >= stop:
        area = None if heel is None else 0.0
        return GrainStability(lambda0, LAMBDA40_FACTOR * lambda0, heel, limit, area, stop,
                              reason)
    peak = max_difference_deg(curve, lambda0, heel, stop)
    if peak < stop:
        stop, reason = peak, "max_difference"
    area = area_mrad(curve, heel, stop) - arm_area_mrad(lambda0, heel, stop)
    return GrainStability(lambda0, LAMBDA40_FACTOR * lambda0, heel, limit, area, stop, reason)


def passes(g: GrainStability) -> bool:
    """A 7.1.1 and A 7.1.2 both met (A 7.1.3 does not depend on the heeling arm)."""
    return (g.heel_deg is not None and g.heel_deg <= g.heel_limit_deg
            and g.residual_area is not None and g.residual_area >= RESIDUAL_AREA_MRAD)


def allowable_lambda0_m(curve: GZCurve, flooding_deg: float, deck_edge_deg: float,
                        gm_fluid_m: float) -> float | None:
    """The largest λ0 (m) up to which A 7.1.1 to A 7.1.3 all pass at this curve (this
    displacement and KG); None when no grain heeling arm passes (GM below 0.30 m, or the
    residual area short even without grain shift).

    Every λ0 below the answer passes (the conservative reading where the area is not monotonic
    in λ0): λ0 is scanned from 0 to the value at which GZ can no longer reach the arm before
    the heel limit, and the first failing step is bisected."""
    if gm_fluid_m < GM0_M:
        return None

    def ok(lam: float) -> bool:
        return passes(stability(curve, lam, flooding_deg, deck_edge_deg))

    if not ok(0.0):
        return None
    limit = min(HEEL_LIMIT_DEG, deck_edge_deg)
    gh, gv = curve.grid
    near = (gh > 0.0) & (gh <= limit)
    # beyond the largest GZ/arm ratio up to the heel limit, GZ cannot reach the arm in time;
    # 10 % above the grid's ratio covers the curve between grid points
    top = 1.1 * float(np.max(gv[near] / heeling_arm_m(1.0, gh[near]))) if near.any() else 0.0
    if top <= 0.0:
        return 0.0
    lo = 0.0
    for lam in np.linspace(0.0, top, ALLOWABLE_SCAN + 1)[1:]:
        if not ok(float(lam)):
            hi = float(lam)
            break
        lo = float(lam)
    else:
        return lo
    for _ in range(ALLOWABLE_BISECTIONS):
        mid = 0.5 * (lo + hi)
        lo, hi = (mid, hi) if ok(mid) else (lo, mid)
    return lo


def cargo_warnings(grain_set_chosen: bool, table_heels_deg: list[float] | None,
                   listed: bool) -> list[str]:
    """Warnings for a condition with grain in bulk: the grain criteria not selected; cross
    curves without the 12° and 40° rows the notes to figure A 7 ask for; a list at departure
    (A 7.3, recalled from memory: the ship shall be upright before proceeding to sea)."""
    out = []
    if not grain_set_chosen:
        out.append("Grain in bulk is loaded but the criteria set grain.2008 (International Grain "
                   "Code, A 7) is not selected: the grain shift is not checked.")
    if table_heels_deg is not None:
        missing = [h for h in (HEEL_LIMIT_DEG, ARM_END_DEG) if h not in table_heels_deg]
        if missing:
            listed_heels = " and ".join(f"{h:g}°" for h in missing)
            out.append(f"The cross curves have no row at {listed_heels}; the Grain Code (notes "
                       f"to figure A 7) asks for cross curves at 12° and 40°: GZ there is "
                       f"interpolated.")
    if listed:
        out.append("The ship lists: the Grain Code (A 7.3) requires her upright before she "
                   "proceeds to sea; the grain shift is taken towards the side of the list.")
    return out
