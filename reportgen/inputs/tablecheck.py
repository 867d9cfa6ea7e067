"""Plausibility of a vessel file's tables against its own particulars (SPEC.md "Conventions":
implausible tables are refused with the table and row named).

The bounds are physical, not statistical, so that no real ship is refused:
- KN at any heel is the horizontal distance of the centre of buoyancy from the keel point K;
  B lies inside the hull, so |KN| cannot exceed the distance of the farthest hull point from K,
  which we bound by hypot(B, D + B) (our generous bound, covering sheer and superstructures
  counted as buoyant); KN at heel 0 is zero.
- Δ at a draught T (the deepest, midships + |trim|/2, in a trimmed row) is at most ρ·L·B·T for a hull inside the box L × B × T (a block coefficient
  not above 1), L the table's waterline length where it gives one, else the length including
  overhangs of OVERHANG_FRACTION·Lpp beyond each perpendicular (our bound).
- KMt = KB + BMt with KB at most the draught T and BMt = I_T/∇, where the waterplane lies
  inside the rectangle L × B, so I_T ≤ L·B³/12 (second moment of area of a rectangle about its
  centre line; a part of the rectangle has less): KMt ≤ T + ρ·L·B³/(12·Δ).
- TPC = ρ·Awp/100 with Awp ≤ L·B: TPC ≤ ρ·L·B/100 (t/cm).
- LCB and LCF lie within that length; so do the centres of the grain compartments, which lie
  above the base and at most a breadth above the deck (the bound of reportgen.plausible for
  masses). A compartment holds at most the box L × B × (D + B); grain moved sideways moves at
  most B, so the transverse volumetric heeling moment is at most V·B, and with the Grain Code's
  vertical-shift factors (1.06, 1.12: reportgen.grain) below VHM_BOUND_FACTOR·V·B (our bound).
- Hull offsets: the moulded breadth B is the greatest moulded breadth, so no half-breadth
  exceeds B/2 (a full breadth typed for a half-breadth doubles the ship's stability); stations
  lie within the length with overhangs, and points run up to at most a breadth above the deck.
- Unprotected openings lie within that length, within B/2 of the centreline, and between the
  base and a breadth above the deck or the top of the windage profile, whichever is higher
  (an opening typed in mm instead of m would never flood, and credit the whole GZ curve).
Units: m, t, t/m³, m⁴.
"""

from __future__ import annotations

from collections.abc import Sequence
from typing import TYPE_CHECKING

import numpy as np

from reportgen.inputs.grain import VesselGrain
from reportgen.inputs.tables import CrossCurves, Hydrostatics, Particulars

if TYPE_CHECKING:
    from reportgen.inputs.vessel import HullOffsets, Opening

OVERHANG_FRACTION = 0.15  # of Lpp beyond each perpendicular (reportgen.plausible)
KN_AT_ZERO_TOLERANCE_M = 0.01
VHM_BOUND_FACTOR = 1.5  # our bound on VHM / (V·B): above the Grain Code's factors 1.06 and 1.12
HALF_BREADTH_TOLERANCE = 1.005  # of B/2: offsets rounded to the last digit stay accepted


def _first_bad(mask: np.ndarray) -> int | None:
    bad = np.argwhere(mask)
    return None if bad.size == 0 else int(bad[0][0])


def table_problems(p: Particulars, h: Hydrostatics | None, c: CrossCurves | None,
                   grain: VesselGrain | None) -> list[str]:
    """What in the hydrostatic table, cross curves and grain compartments cannot belong to a
    ship of these particulars."""
    return (hydrostatic_problems(p, h) + cross_curve_problems(p, c)
            + grain_problems(p, grain))


def _length_bounds(p: Particulars) -> tuple[float, float]:
    """x from the AP (m) within which the ship lies: Lpp with the overhangs."""
    return -OVERHANG_FRACTION * p.length_bp, (1.0 + OVERHANG_FRACTION) * p.length_bp


def hydrostatic_problems(p: Particulars, h: Hydrostatics | None) -> list[str]:
    """Displacement, KMt and TPC above their bounds, LCB and LCF outside the ship (module
    docstring)."""
    if h is None:
        return []
    problems: list[str] = []
    x_lo, x_hi = _length_bounds(p)
    k = 1 if h.trims is None else len(h.trims)
    draft = np.asarray(h.draft, dtype=float)
    rows = {name: np.asarray(getattr(h, name), dtype=float).reshape(k, -1)
            for name in ("displacement", "kmt", "tpc")}
    lwl = None if h.lwl is None else np.asarray(h.lwl, dtype=float).reshape(k, -1)
    for row in range(k):
        at = "" if h.trims is None else f" at trim {h.trims[row]:g} m"
        # trimmed: the deepest draught (midships + half the trim) bounds the box
        deep = draft + (0.0 if h.trims is None else abs(h.trims[row]) / 2.0)
        length = x_hi - x_lo if lwl is None else lwl[row]
        disp = rows["displacement"][row]
        box = h.density * length * p.breadth * deep
        i = _first_bad(disp > box + 1e-9)
        if i is not None:
            problems.append(f"hydrostatics.displacement{at} row {i + 1}: {disp[i]:g} t "
                            f"at draught {draft[i]:g} m exceeds the water of the box "
                            f"around the hull, L × {p.breadth:g} × {deep[i]:g} m "
                            f"({box[i]:.0f} t; a block coefficient above 1)")
        with np.errstate(divide="ignore"):
            km_bound = deep + h.density * length * p.breadth ** 3 / (12.0 * disp)
        i = _first_bad(rows["kmt"][row] > km_bound + 1e-9)
        if i is not None:
            problems.append(f"hydrostatics.kmt{at} row {i + 1}: {rows['kmt'][row][i]:g} m "
                            f"exceeds draught + BMt of a waterplane filling L × "
                            f"{p.breadth:g} m ({km_bound[i]:.2f} m)")
        tpc_bound = h.density * length * p.breadth / 100.0
        i = _first_bad(rows["tpc"][row] > tpc_bound + 1e-9)
        if i is not None:
            bound = tpc_bound if np.ndim(tpc_bound) == 0 else tpc_bound[i]
            problems.append(f"hydrostatics.tpc{at} row {i + 1}: {rows['tpc'][row][i]:g} t/cm "
                            f"exceeds a waterplane filling L × {p.breadth:g} m "
                            f"({bound:.2f} t/cm)")
    for name in ("lcb", "lcf"):
        values = np.asarray(getattr(h, name), dtype=float).ravel()
        i = _first_bad((values < x_lo) | (values > x_hi))
        if i is not None:
            problems.append(f"hydrostatics.{name}: {values[i]:g} m is outside the ship "
                            f"({x_lo:g} to {x_hi:g} m from the AP)")
    return problems


def cross_curve_problems(p: Particulars, c: CrossCurves | None) -> list[str]:
    """KN beyond any point of the hull, or not zero upright (module docstring)."""
    if c is None:
        return []
    problems: list[str] = []
    kn = np.asarray(c.kn, dtype=float).reshape(-1, len(c.displacement), len(c.heel))
    bound = float(np.hypot(p.breadth, p.depth + p.breadth))
    too_big = np.argwhere(np.abs(kn) > bound)
    if too_big.size:
        t, i, j = (int(n) for n in too_big[0])
        problems.append(f"cross_curves.kn row {i + 1} (displacement "
                        f"{c.displacement[i]:g} t), heel {c.heel[j]:g}°: {kn[t, i, j]:g} m "
                        f"is beyond any point of a hull {p.breadth:g} m broad and "
                        f"{p.depth:g} m deep (bound {bound:.1f} m)")
    i = _first_bad(np.abs(kn[:, :, 0]).max(axis=0) > KN_AT_ZERO_TOLERANCE_M)
    if i is not None:
        problems.append(f"cross_curves.kn row {i + 1}: KN at heel 0° must be 0")
    return problems


def grain_problems(p: Particulars, grain: VesselGrain | None) -> list[str]:
    """Grain compartments outside the ship, larger than its box, or with a volumetric heeling
    moment no shift of their grain can make (module docstring)."""
    problems: list[str] = []
    x_lo, x_hi = _length_bounds(p)
    z_hi = p.depth + p.breadth
    box_m3 = (x_hi - x_lo) * p.breadth * z_hi
    for comp in grain.compartments if grain is not None else []:
        f = comp.filled
        rows = [(f.volume, f.lcg, f.vcg, f.vhm)]
        if comp.filled_untrimmed_vhm is not None:
            rows.append((f.volume, f.lcg, f.vcg, comp.filled_untrimmed_vhm))
        if comp.partly is not None:
            q = comp.partly
            rows += list(zip(q.volume, q.lcg, q.vcg, q.vhm, strict=True))
        for volume, lcg, vcg, vhm in rows:
            if not x_lo <= lcg <= x_hi or not 0.0 <= vcg <= z_hi:
                problems.append(f"grain compartment {comp.id}: centre (lcg {lcg:g}, vcg "
                                f"{vcg:g}) m lies outside the ship ({x_lo:g} to {x_hi:g} m "
                                f"from the AP, 0 to {z_hi:g} m above the base)")
                break
            if volume > box_m3:
                problems.append(f"grain compartment {comp.id}: volume {volume:g} m³ exceeds "
                                f"the box around the ship ({box_m3:.0f} m³)")
                break
            if vhm > VHM_BOUND_FACTOR * volume * p.breadth:
                problems.append(f"grain compartment {comp.id}: volumetric heeling moment "
                                f"{vhm:g} m⁴ at volume {volume:g} m³ exceeds what moving "
                                f"that volume across the breadth {p.breadth:g} m can make "
                                f"({VHM_BOUND_FACTOR:g} × V × B, allowing for the vertical "
                                f"shift)")
                break
    return problems


def hull_problems(p: Particulars, hull: HullOffsets | None) -> list[str]:
    """Hull offsets that do not fit the particulars: a station outside the length with
    overhangs, a half-breadth beyond B/2, a point more than a breadth above the deck."""
    if hull is None:
        return []
    x_lo, x_hi = _length_bounds(p)
    half = 0.5 * p.breadth
    z_hi = p.depth + p.breadth
    for n, st in enumerate(hull.stations, start=1):
        where = f"hull.stations[{n}] (x {st.x:g} m)"
        y_max = max(y for y, _ in st.points)
        z_max = max(z for _, z in st.points)
        if not x_lo <= st.x <= x_hi:
            problem = (f"outside the ship ({x_lo:g} to {x_hi:g} m from the AP, Lpp "
                       f"{p.length_bp:g} m with overhangs of {OVERHANG_FRACTION:.0%} of Lpp)")
        elif y_max > HALF_BREADTH_TOLERANCE * half:
            problem = (f"half-breadth {y_max:g} m exceeds half the moulded breadth ({half:g} "
                       f"m); offsets are half-breadths (starboard half-section)")
        elif z_max > z_hi:
            problem = f"z {z_max:g} m is more than a breadth above the deck ({z_hi:g} m)"
        else:
            continue
        return [f"{where}: {problem}"]
    return []


def opening_problems(p: Particulars, openings: Sequence[Opening], top_m: float) -> list[str]:
    """Openings outside the ship (module docstring); ``top_m`` the top of the windage profile
    (m above the base)."""
    x_lo, x_hi = _length_bounds(p)
    z_hi = max(p.depth + p.breadth, top_m)
    out = []
    for o in openings:
        where = f"openings ({o.name})"
        if not x_lo <= o.x <= x_hi:
            out.append(f"{where}: x {o.x:g} m is outside the ship ({x_lo:g} to {x_hi:g} m "
                       f"from the AP)")
        if abs(o.y) > 0.5 * p.breadth:
            out.append(f"{where}: y {o.y:g} m is beyond the side (B/2 = {0.5 * p.breadth:g} m)")
        if not 0.0 <= o.z <= z_hi:
            out.append(f"{where}: z {o.z:g} m is outside the ship (0 to {z_hi:g} m above the "
                       f"base: a breadth above the deck or the top of the windage profile)")
    return out
