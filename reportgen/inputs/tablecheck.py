"""Plausibility of a vessel file's tables, offsets, openings, tanks and holds against its own
particulars, and of the particulars against the rest of the file (SPEC.md "Conventions":
implausible tables are refused with the table and row named).

The bounds are physical, not statistical, so that no real ship is refused; the few marked
"our bound" are set far beyond any real ship:
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
- TPC = ρ·Awp/100 with Awp ≤ L·B: TPC ≤ ρ·L·B/100 (t/cm). MCT = Δ·GML/(100·Lpp) with
  GML = KB + BML − KG ≤ T + I_L/∇ (KG ≥ 0) and I_L ≤ B·L³/12 (the rectangle again):
  MCT ≤ (Δ·T + ρ·B·L³/12)/(100·Lpp) (t·m/cm). Lwl is at most L.
- KN = yB·cos φ + zB·sin φ: for a hull symmetric about its centre line heeled by 0 < φ ≤ 90°
  the centre of buoyancy lies on the immersed side (yB ≥ 0) and above the keel (zB > 0), so
  KN > 0 there.
- Tables are made at trims the ship can float at: with both draughts between 0 and D (any
  other condition is refused), |trim| ≤ D. Displacements of every table are not negative.
- The booklet's limiting KG lies within the ship (at most the top of the windage profile);
  its minimum GM is above 0 (a curve allowing no initial stability is no limit).
- LCB and LCF lie within that length; so do the centres of the grain compartments, which lie
  above the base and at most a breadth above the deck (our bound). A compartment holds at most the box L × B × (D + B); grain moved sideways moves at
  most B, so the transverse volumetric heeling moment is at most V·B, and with the Grain Code's
  vertical-shift factors (1.06, 1.12: reportgen.grain) below VHM_BOUND_FACTOR·V·B (our bound).
- Hull offsets: the moulded breadth B is the greatest moulded breadth, so no half-breadth
  exceeds B/2 (a full breadth typed for a half-breadth doubles the ship's stability); stations
  lie within the length with overhangs, and points run up to at most a breadth above the deck.
- The particulars against the rest of the file: the hull side reaches the deck at side, so the
  moulded depth D is not above the top of the windage profile (the lateral projection of hull
  and superstructure); B is the greatest moulded breadth and D the depth to the deck at side,
  so the hull offsets reach at least HULL_REACH_FRACTION of B/2 and of D (our tolerance for
  stations that miss the widest section); and at the summer draught Δ/(ρ·Lwl·B·T) is at
  least MIN_BLOCK_COEFFICIENT (our bound, below any displacement hull: a breadth typed in mm
  or ten times too large shows here, and would have flattered the weather criterion). The
  bilge keels' and bar keel's area Ak is at most Lpp·D, the side of the hull's box (our
  bound; a larger Ak would take the factor k of Part A 2.3.4 to its most favourable 0.70).
  The hull stands at both perpendiculars (they are where the stem and the rudder stock meet
  the load waterline), so the offsets and the windage profile (the hull's lateral projection)
  reach from at most LPP_REACH_FRACTION·Lpp to at least (1 − LPP_REACH_FRACTION)·Lpp: a
  length typed in mm shows here. No point of the offsets lies more than D below the base.
- A tank's table rows: centres within the ship as SPEC.md bounds a centre of mass (x −0.05·Lpp
  … 1.05·Lpp, |y| ≤ B/2, z from the base to the profile's top), the volume within the box L ×
  B × the profile's top, and the free surface's transverse moment of inertia at most that of
  the ship's widest waterplane, L·B³/12 (a tank's surface lies inside it).
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
from reportgen.inputs.tables import (
    CrossCurves,
    Hydrostatics,
    Particulars,
    outside_the_ship,
    ship_x_range,
)

if TYPE_CHECKING:
    from reportgen.inputs.booklet import LimitingCurve
    from reportgen.inputs.hullform import AngleTable, HullOffsets, Opening
    from reportgen.inputs.tanks import Tank

OVERHANG_FRACTION = 0.15  # of Lpp beyond each perpendicular (reportgen.plausible)
KN_AT_ZERO_TOLERANCE_M = 0.01
VHM_BOUND_FACTOR = 1.5  # our bound on VHM / (V·B): above the Grain Code's factors 1.06 and 1.12
HALF_BREADTH_TOLERANCE = 1.005  # of B/2: offsets rounded to the last digit stay accepted
HULL_REACH_FRACTION = 0.95  # of B/2 and of D that the offsets reach at least (our tolerance)
MIN_BLOCK_COEFFICIENT = 0.15  # at the summer draught (our bound, below any displacement hull)
LPP_REACH_FRACTION = 0.05  # of Lpp: how far inside the perpendiculars the hull may begin/end


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
            for name in ("displacement", "kmt", "tpc", "mct")}
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
        mct_bound = (disp * deep + h.density * p.breadth * (x_hi - x_lo) ** 3 / 12.0) / (
            100.0 * p.length_bp)
        i = _first_bad(rows["mct"][row] > mct_bound + 1e-9)
        if i is not None:
            problems.append(f"hydrostatics.mct{at} row {i + 1}: {rows['mct'][row][i]:g} t·m/cm "
                            f"exceeds what a waterplane filling L × {p.breadth:g} m can give "
                            f"({mct_bound[i]:.1f} t·m/cm)")
        if lwl is not None:
            i = _first_bad(lwl[row] > x_hi - x_lo + 1e-9)
            if i is not None:
                problems.append(f"hydrostatics.lwl{at} row {i + 1}: {lwl[row][i]:g} m is longer "
                                f"than the ship ({x_hi - x_lo:g} m with overhangs)")
    problems += _trim_problems("hydrostatics", h.trims, p.depth)
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
    heeled = np.asarray(c.heel, dtype=float) > 0.0
    not_positive = np.argwhere((kn <= 0.0) & heeled)
    if not_positive.size:
        t, i, j = (int(n) for n in not_positive[0])
        problems.append(f"cross_curves.kn row {i + 1} (displacement {c.displacement[i]:g} t), "
                        f"heel {c.heel[j]:g}°: {kn[t, i, j]:g} m; KN is positive at every heel "
                        f"above 0° (the centre of buoyancy moves to the immersed side)")
    return (problems + _trim_problems("cross_curves", c.trims, p.depth)
            + _displacement_problems("cross_curves", c.displacement))


def _trim_problems(name: str, trims: Sequence[float] | None, depth_m: float) -> list[str]:
    bad = [t for t in trims or [] if abs(t) > depth_m]
    if not bad:
        return []
    return [(f"{name}.trims: {bad[0]:g} m is beyond any trim the ship floats at (|trim| ≤ the "
            f"depth {depth_m:g} m, both draughts between 0 and D)")]


def _displacement_problems(name: str, displacement: Sequence[float]) -> list[str]:
    return [f"{name}.displacement: {displacement[0]:g} t is below zero"] if (
        displacement[0] < 0.0) else []


def curve_problems(p: Particulars, tables: dict[str, AngleTable | None],
                   limiting: LimitingCurve | None, top_m: float) -> list[str]:
    """The angle tables (by key: deck_edge, flooding_angle) and the booklet's limiting curve
    against the ship (module docstring); ``top_m`` the top of the windage profile (m)."""
    out = []
    for name, table in tables.items():
        if table is not None:
            out += (_trim_problems(name, table.trims, p.depth)
                    + _displacement_problems(name, table.displacement))
    if limiting is not None:
        name = "limiting_kg" if limiting.kg is not None else "limiting_gm"
        out += _displacement_problems(name, limiting.displacement)
        if limiting.kg is not None and max(limiting.kg) > top_m:
            out.append(f"limiting_kg.kg: {max(limiting.kg):g} m is above the ship (the top of "
                       f"the windage profile, {top_m:g} m)")
        if limiting.gm is not None and min(limiting.gm) <= 0.0:
            out.append(f"limiting_gm.gm: {min(limiting.gm):g} m; a minimum GM at or below 0 "
                       f"allows a ship without initial stability")
    return out


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
    """Hull offsets that do not fit the particulars (module docstring): a station outside the
    length with overhangs, a half-breadth beyond B/2, a point more than a breadth above the
    deck or more than the depth below the base; offsets that do not reach both
    perpendiculars, B/2 or the deck at side."""
    if hull is None:
        return []
    x_lo, x_hi = _length_bounds(p)
    half = 0.5 * p.breadth
    z_hi = p.depth + p.breadth
    xs = np.array([st.x for st in hull.stations])
    counts = [len(st.points) for st in hull.stations]
    yz = np.array([pt for st in hull.stations for pt in st.points], dtype=float)
    starts = np.concatenate(([0], np.cumsum(counts)[:-1]))
    y_max = np.maximum.reduceat(yz[:, 0], starts)
    z_max = np.maximum.reduceat(yz[:, 1], starts)
    bad = _first_bad((xs < x_lo) | (xs > x_hi) | (y_max > HALF_BREADTH_TOLERANCE * half)
                     | (z_max > z_hi))
    if bad is not None:
        where = f"hull.stations[{bad + 1}] (x {xs[bad]:g} m)"
        if not x_lo <= xs[bad] <= x_hi:
            problem = (f"outside the ship ({x_lo:g} to {x_hi:g} m from the AP, Lpp "
                       f"{p.length_bp:g} m with overhangs of {OVERHANG_FRACTION:.0%} of Lpp)")
        elif y_max[bad] > HALF_BREADTH_TOLERANCE * half:
            problem = (f"half-breadth {y_max[bad]:g} m exceeds half the moulded breadth "
                       f"({half:g} m); offsets are half-breadths (starboard half-section)")
        else:
            problem = f"z {z_max[bad]:g} m is more than a breadth above the deck ({z_hi:g} m)"
        return [f"{where}: {problem}"]
    out = _span_problems(p, "hull.stations", xs.tolist())
    if y_max.max() < HULL_REACH_FRACTION * half:
        out.append(f"particulars.breadth {p.breadth:g} m: the hull offsets' greatest "
                   f"half-breadth is {y_max.max():g} m, not B/2 (B is the greatest moulded "
                   f"breadth)")
    if yz[:, 1].min() < -p.depth:
        out.append("hull.stations: a point lies more than the depth below the base line")
    if z_max.max() < HULL_REACH_FRACTION * p.depth:
        out.append(f"particulars.depth {p.depth:g} m: the hull offsets reach {z_max.max():g} m "
                   f"above the base, not the deck at side")
    return out


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


def _span_problems(p: Particulars, name: str, xs: Sequence[float]) -> list[str]:
    """``name`` (its x, m from the AP) not reaching both perpendiculars (module docstring)."""
    reach = LPP_REACH_FRACTION * p.length_bp
    if min(xs) <= reach and max(xs) >= p.length_bp - reach:
        return []
    return [(f"particulars.length_bp {p.length_bp:g} m: {name} runs from x {min(xs):g} to "
            f"{max(xs):g} m, not from the aft to the forward perpendicular (0 to "
            f"{p.length_bp:g} m)")]


def particulars_problems(p: Particulars, h: Hydrostatics | None,
                         profile: Sequence[Sequence[float]]) -> list[str]:
    """Length, depth and breadth that the windage profile and the hydrostatic table
    contradict, and a bilge keel area beyond the hull's side (module docstring); ``profile``
    the windage profile's [x, z] points (m). The offsets' own: hull_problems."""
    top_m = max(z for _, z in profile)
    out = _span_problems(p, "windage.profile", [x for x, _ in profile])
    if p.bilge_keel_area > p.length_bp * p.depth:
        out.append(f"particulars.bilge_keel_area {p.bilge_keel_area:g} m² exceeds the side of "
                   f"the hull's box, Lpp × D = {p.length_bp * p.depth:g} m²")
    if p.depth > top_m:
        out.append(f"particulars.depth {p.depth:g} m is above the top of the windage profile "
                   f"({top_m:g} m), which shows the hull's side up to the deck")
    if h is not None and h.draft[0] <= p.summer_draft <= h.draft[-1]:
        k = 1 if h.trims is None else len(h.trims)
        row = 0 if h.trims is None else int(np.argmin(np.abs(np.asarray(h.trims))))
        disp = float(np.interp(p.summer_draft, h.draft,
                               np.asarray(h.displacement, dtype=float).reshape(k, -1)[row]))
        lwl = p.length_bp if h.lwl is None else float(np.interp(
            p.summer_draft, h.draft, np.asarray(h.lwl, dtype=float).reshape(k, -1)[row]))
        cb = disp / (h.density * lwl * p.breadth * p.summer_draft)
        if cb < MIN_BLOCK_COEFFICIENT:
            out.append(f"particulars.breadth {p.breadth:g} m: at the summer draught the "
                       f"hydrostatic table's displacement {disp:.0f} t gives a block "
                       f"coefficient of {cb:.3f}, below {MIN_BLOCK_COEFFICIENT:g} (check the "
                       f"breadth, length and draught against the table)")
    return out


def tank_problems(p: Particulars, tanks: Sequence[Tank], top_m: float) -> list[str]:
    """Tank table rows that no tank of this ship can have (module docstring)."""
    x_lo, x_hi = ship_x_range(p.length_bp)
    box_m3 = (x_hi - x_lo) * p.breadth * top_m
    fsi_max_m4 = (x_hi - x_lo) * p.breadth ** 3 / 12.0
    out = []
    for t in tanks:
        tb = t.table
        if tb is None:
            continue
        for i, row in enumerate(zip(tb.volume, tb.lcg, tb.vcg, tb.tcg, tb.fsi, strict=True)):
            volume, lcg, vcg, tcg, fsi = row
            found = outside_the_ship(p.length_bp, p.breadth, top_m, lcg, tcg, vcg,
                                     ("lcg", "tcg", "vcg"))
            if volume > box_m3:
                found.append(f"volume {volume:g} m³ exceeds the box around the ship "
                             f"({box_m3:.0f} m³)")
            if fsi > fsi_max_m4:
                found.append(f"fsi {fsi:g} m⁴ exceeds the widest waterplane's L·B³/12 "
                             f"({fsi_max_m4:.0f} m⁴)")
            if found:
                out.append(f"tanks ({t.id}) table row {i + 1}: " + "; ".join(found))
                break
    return out
