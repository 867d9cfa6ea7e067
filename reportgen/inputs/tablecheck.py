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
- LCB and LCF lie within that length; so do the centres of the grain compartments, which lie
  above the base.
Units: m, t, t/m³.
"""

from __future__ import annotations

import numpy as np

from reportgen.inputs.grain import VesselGrain
from reportgen.inputs.tables import CrossCurves, Hydrostatics, Particulars

OVERHANG_FRACTION = 0.15  # of Lpp beyond each perpendicular (reportgen.plausible)
KN_AT_ZERO_TOLERANCE_M = 0.01


def _first_bad(mask: np.ndarray) -> int | None:
    bad = np.argwhere(mask)
    return None if bad.size == 0 else int(bad[0][0])


def table_problems(p: Particulars, h: Hydrostatics | None, c: CrossCurves | None,
                   grain: VesselGrain | None) -> list[str]:
    """What in the hydrostatic table, cross curves and grain compartments cannot belong to a
    ship of these particulars."""
    problems: list[str] = []
    length_m = (1.0 + 2.0 * OVERHANG_FRACTION) * p.length_bp
    x_lo, x_hi = -OVERHANG_FRACTION * p.length_bp, (1.0 + OVERHANG_FRACTION) * p.length_bp
    if h is not None:
        k = 1 if h.trims is None else len(h.trims)
        draft = np.asarray(h.draft, dtype=float)
        disp = np.asarray(h.displacement, dtype=float).reshape(k, -1)
        lwl = None if h.lwl is None else np.asarray(h.lwl, dtype=float).reshape(k, -1)
        for row, values in enumerate(disp):
            # trimmed: the deepest draught (midships + half the trim) bounds the box
            deep = draft + (0.0 if h.trims is None else abs(h.trims[row]) / 2.0)
            box = h.density * (length_m if lwl is None else lwl[row]) * p.breadth * deep
            i = _first_bad(values > box + 1e-9)
            if i is not None:
                at = "" if h.trims is None else f" at trim {h.trims[row]:g} m"
                problems.append(f"hydrostatics.displacement{at} row {i + 1}: {values[i]:g} t "
                                f"at draught {draft[i]:g} m exceeds the water of the box "
                                f"around the hull, L × {p.breadth:g} × {deep[i]:g} m "
                                f"({box[i]:.0f} t; a block coefficient above 1)")
        for name in ("lcb", "lcf"):
            values = np.asarray(getattr(h, name), dtype=float).ravel()
            i = _first_bad((values < x_lo) | (values > x_hi))
            if i is not None:
                problems.append(f"hydrostatics.{name}: {values[i]:g} m is outside the ship "
                                f"({x_lo:g} to {x_hi:g} m from the AP)")
    if c is not None:
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
    for comp in grain.compartments if grain is not None else []:
        rows = [(comp.filled.lcg, comp.filled.vcg)]
        if comp.partly is not None:
            rows += list(zip(comp.partly.lcg, comp.partly.vcg, strict=True))
        for lcg, vcg in rows:
            if not x_lo <= lcg <= x_hi or vcg < 0.0:
                problems.append(f"grain compartment {comp.id}: centre (lcg {lcg:g}, vcg "
                                f"{vcg:g}) m lies outside the ship ({x_lo:g} to {x_hi:g} m "
                                f"from the AP, above the base)")
                break
    return problems
