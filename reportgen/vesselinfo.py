"""What a vessel file holds, in a chief officer's terms (`reportgen show`): tanks with their
capacities and largest free-surface moments, holds, openings, criteria sets and the range of
every table. Plain values (t, m, m³, t·m, deg) ready for JSON.
"""

from __future__ import annotations

from typing import Any

import numpy as np

SHOW_FORMAT = "reportgen/vessel-summary-1"


def _span(values: Any) -> list[float] | None:
    if values is None:
        return None
    arr = np.asarray(values, dtype=float)
    return [float(arr.min()), float(arr.max())] if arr.size else None


def tank_rows(vessel: Any) -> list[dict[str, Any]]:
    """Per tank: id, name, content, role, pair, density (t/m³), capacity (m³ and t at its
    density), largest FSM (t·m: the largest fsi of its table × density, IS Code 2008 Part B
    3.1.3.2), its sounding range (m); None where the tank has no table yet."""
    rows = []
    for t in vessel.tanks:
        table = t.table
        cap = float(table.volume[-1]) if table is not None else None
        rows.append({
            "id": t.id, "name": t.name, "content": t.content, "role": t.fs_role,
            "pair": t.pair, "density": t.density,
            "capacity_m3": cap,
            "capacity_t": cap * t.density if cap is not None else None,
            "fsm_max": float(max(table.fsi)) * t.density if table is not None else None,
            "sounding": _span(table.sounding) if table is not None else None,
            "from_geometry": t.geometry is not None,
        })
    return rows


def hold_rows(vessel: Any) -> list[dict[str, Any]]:
    """Grain compartments (when the vessel file has `grain`): id, name, filled volume m³ and
    the volumetric heeling moment filled and trimmed, m⁴ (International Grain Code A 2.2)."""
    grain = getattr(vessel, "grain", None)
    out = []
    for c in getattr(grain, "compartments", None) or []:
        filled = getattr(c, "filled", None)
        out.append({"id": getattr(c, "id", None), "name": getattr(c, "name", None),
                    "volume_m3": getattr(filled, "volume", None),
                    "vhm_m4": getattr(filled, "vhm", None)})
    return out


def table_ranges(vessel: Any) -> dict[str, Any]:
    """The range each table covers: hydrostatics (draught m, displacement t), cross curves
    (displacement t, heel deg, trim basis), angle tables, the limiting KG curve, the hull."""
    out: dict[str, Any] = {}
    h = vessel.hydrostatics
    if h is not None:
        out["hydrostatics"] = {"draft": _span(h.draft), "displacement": _span(h.displacement),
                               "trims": list(h.trims) if h.trims else None,
                               "density": h.density, "rows": len(h.draft)}
    c = vessel.cross_curves
    if c is not None:
        out["cross_curves"] = {"displacement": _span(c.displacement), "heel": _span(c.heel),
                               "trim": c.trim, "trims": list(c.trims) if c.trims else None}
    for name in ("deck_edge", "flooding_angle"):
        t = getattr(vessel, name, None)
        if t is not None:
            out[name] = {"displacement": _span(t.displacement), "angle": _span(t.angle),
                         "trims": list(t.trims) if t.trims else None}
    lim = getattr(vessel, "limiting_kg", None)
    if lim is not None:
        out["limiting_kg"] = {"displacement": _span(getattr(lim, "displacement", None)),
                              "source": getattr(lim, "source", None)}
    if vessel.hull is not None:
        xs = [s.x for s in vessel.hull.stations]
        out["hull"] = {"stations": len(xs), "x": _span(xs), "density": vessel.hull.density}
    return out


def summary(vessel: Any, sha256: str) -> dict[str, Any]:
    """Everything `reportgen show` prints, as one JSON-ready mapping."""
    p = vessel.particulars
    ls = vessel.lightship
    return {
        "format": SHOW_FORMAT,
        "vessel": {"name": vessel.vessel.name, "identifier": vessel.vessel.identifier,
                   "type": vessel.vessel.type, "sha256": sha256},
        "particulars": {"length_bp": p.length_bp, "breadth": p.breadth, "depth": p.depth,
                        "summer_draft": p.summer_draft},
        "lightship": {"mass": ls.mass, "lcg": ls.lcg, "vcg": ls.vcg, "tcg": ls.tcg},
        "tanks": tank_rows(vessel),
        "holds": hold_rows(vessel),
        "openings": [{"name": o.name, "x": o.x, "y": o.y, "z": o.z} for o in vessel.openings],
        "criteria": list(vessel.criteria),
        "permitted_criteria": list(vessel.permitted_criteria),
        "method": vessel.calculation.method,
        "tables": table_ranges(vessel),
    }
