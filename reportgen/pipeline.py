"""One condition through the flow: loading -> floating -> stability -> criteria -> results.

Units as SPEC.md: t, m, t/m³, t·m, deg, m·rad. Nothing here reads files except
`evaluate_path`, which calls reportgen.inputs.load_case.
"""

from __future__ import annotations

import weakref
from dataclasses import dataclass
from pathlib import Path
from typing import TYPE_CHECKING

import numpy as np
from shapely.geometry import Polygon

from reportgen import NAME, __version__
from reportgen.criteria import State, run_criteria
from reportgen.criteria.weather import WIND_PRESSURE_N_M2, weather_values
from reportgen.errors import InputError
from reportgen.floating import (
    HydroTable,
    draughts,
    hydrostatics_at,
    summer_draught_warning,
    trim_m,
)
from reportgen.hull.hydrostatics import HullGeometry
from reportgen.hull.tables import (
    deck_edge_points,
    geometry_of,
    heel_scan,
    immersion_angle,
    opening_points,
)
from reportgen.loading import condition_lines, totals
from reportgen.results import RESULTS_FORMAT, Results
from reportgen.stability import (
    CrossCurves,
    OpeningAngle,
    angle_from_table,
    deck_edge_formula,
    equilibrium_heel,
    gz_curve,
    gz_grid,
    has_list,
    list_side,
    max_gz,
    opening_angles,
    vanishing_angle,
)

if TYPE_CHECKING:
    from reportgen.inputs import Case, Vessel

MIN_LENGTH_M = 24.0  # IS Code 2008 Part A 2.3 and SPEC.md: ships of 24 m in length and over
NO_FLOODING_ANGLE_DEG = 90.0  # SPEC.md: with neither openings nor a table


@dataclass(frozen=True)
class VesselTables:
    """The vessel's tables as arrays, made once per vessel (see `vessel_tables`)."""

    hydro: HydroTable
    cross: CrossCurves
    profile: Polygon
    hull: HullGeometry | None  # offsets, for angles the vessel file gives no table of


def vessel_tables(vessel: Vessel) -> VesselTables:
    """Arrays and polygons of a vessel's tables (InputError when a vessel has none)."""
    if vessel.hydrostatics is None or vessel.cross_curves is None:
        raise InputError("vessel: no hydrostatics and cross_curves; make them from the hull "
                         "offsets first with 'reportgen tables'")
    needs_hull = vessel.hull is not None and (
        vessel.deck_edge is None or (vessel.flooding_angle is None and bool(vessel.openings)))
    return VesselTables(HydroTable.from_model(vessel.hydrostatics),
                        CrossCurves.from_model(vessel.cross_curves),
                        Polygon(vessel.windage.profile),
                        geometry_of(vessel) if needs_hull else None)


_TABLES_BY_VESSEL: dict[int, VesselTables] = {}


def tables_for(vessel: Vessel) -> VesselTables:
    """`vessel_tables(vessel)`, made once per vessel object.

    The vessel models are frozen (immutable), so the tables made from one cannot go stale; the
    entry is keyed by the object's identity and removed when the object is collected.
    """
    key = id(vessel)
    hit = _TABLES_BY_VESSEL.get(key)
    if hit is None:
        hit = vessel_tables(vessel)
        _TABLES_BY_VESSEL[key] = hit
        weakref.finalize(vessel, _TABLES_BY_VESSEL.pop, key, None)
    return hit


def evaluate_path(condition_path: str | Path) -> Results:
    """Read a condition file and its vessel, and evaluate."""
    from reportgen.inputs import load_case

    return evaluate(load_case(condition_path))


def evaluate(case: Case, tables: VesselTables | None = None) -> Results:
    """Evaluate a case (reportgen.inputs.Case). `tables` may be passed when evaluating many
    conditions of one vessel; it must have been made from `case.vessel`.

    An InputError found while evaluating (a displacement beyond the tables, a windage profile
    that does not reach above the waterline, ...) names the condition file."""
    try:
        return _evaluate(case, tables)
    except InputError as exc:
        raise InputError(f"{case.condition_name} (vessel {case.vessel_name}): {exc}") from None


def _evaluate(case: Case, tables: VesselTables | None) -> Results:
    vessel, cond = case.vessel, case.condition
    tab = tables if tables is not None else tables_for(vessel)
    part = vessel.particulars
    calc = vessel.calculation
    rho_w = cond.condition.water_density
    warnings: list[str] = []
    if part.length_bp < MIN_LENGTH_M:
        warnings.append(f"The IS Code 2008 criteria apply to ships of {MIN_LENGTH_M:g} m in "
                        f"length and over; this ship is {part.length_bp:g} m.")

    # Loading.
    lines = condition_lines(vessel, cond)
    tot = totals(lines)
    disp = tot.displacement

    # Floating position.
    hp = hydrostatics_at(tab.hydro, disp, rho_w)
    trim = trim_m(disp, hp.lcb, tot.lcg, hp.mct)
    dr = draughts(hp.draft, trim, hp.lcf, part.length_bp)
    fsc = tot.fsm / disp
    kg_fluid = tot.vcg + fsc
    gm_solid, gm_fluid = hp.kmt - tot.vcg, hp.kmt - kg_fluid
    note = summer_draught_warning(dr.mid, part.summer_draft)
    if note:
        warnings.append(note)

    # GZ curve; the criteria are taken towards the side of the list.
    curve = gz_curve(tab.cross, hp.displacement_table, kg_fluid, tot.tcg)
    heel = equilibrium_heel(curve)
    if heel is None:
        warnings.append("The GZ curve has no position of equilibrium within the cross curves: "
                        "the ship capsizes in this condition.")
    elif gm_fluid <= 0.0:
        warnings.append(f"The initial GM corrected for free surface is {gm_fluid:.3f} m: the "
                        f"ship is unstable upright and lolls to {abs(heel):.1f}°.")
    side = list_side(tot.tcg)
    side_curve = curve.towards(side)

    # Angles: a table of the vessel file, else the hull offsets, else an approximation.
    scan = (_HullScan(tab.hull, disp / rho_w, tot.lcg, tab.cross.heel_deg)
            if tab.hull is not None else None)
    if vessel.deck_edge is not None:
        deck_edge = angle_from_table(hp.displacement_table, vessel.deck_edge.displacement,
                                     vessel.deck_edge.angle, "deck edge table")
        deck_source = "table"
    elif scan is not None:
        deck_edge, deck_source = scan.angle(deck_edge_points(tab.hull)), "hull"
    else:
        deck_edge = deck_edge_formula(part.depth, dr.mid, part.breadth)
        deck_source = "formula"
    flooding_opening = None
    if vessel.flooding_angle is not None:
        flooding = angle_from_table(hp.displacement_table, vessel.flooding_angle.displacement,
                                    vessel.flooding_angle.angle, "flooding angle table")
        flooding_source = "table"
    elif vessel.openings:
        ops = opening_angles(vessel.openings, dr.mid, trim, part.length_bp)
        for op in ops:
            if op.submerged:
                warnings.append(f"The opening {op.name} is at or below the waterline.")
        if scan is not None:
            ops = [OpeningAngle(o.name, scan.angle(opening_points([o])), s.submerged)
                   for o, s in zip(vessel.openings, ops, strict=True)]
            flooding_source = "hull"
        else:
            flooding_source = "openings"
        gov = min(ops, key=lambda o: o.angle_deg)
        flooding, flooding_opening = gov.angle_deg, gov.name
    else:
        flooding, flooding_source = NO_FLOODING_ANGLE_DEG, "none"
        warnings.append("No downflooding point is known (no openings and no flooding angle "
                        "table): the angle of flooding is taken as 90°.")
    gz_max_deg, _ = max_gz(side_curve, 0.0, side_curve.heel_max_deg)
    vanishing = vanishing_angle(side_curve, gz_max_deg)

    # Weather criterion quantities (IS Code 2008 Part A 2.3).
    lwl = hp.lwl if hp.lwl is not None else part.length_bp
    cb = hp.cb if hp.cb is not None else disp / (rho_w * lwl * part.breadth * dr.mid)
    roll_angle = cond.weather.roll_angle if cond.weather is not None else None
    roll_source = cond.weather.roll_angle_source if cond.weather is not None else None
    item_wind = [(it.wind_area, it.wind_z) for it in cond.items if it.wind_area]
    wv, wwarn = weather_values(
        side_curve, profile=tab.profile, item_wind=item_wind, draft_mid_m=dr.mid, trim=trim,
        lpp_m=part.length_bp, breadth_m=part.breadth, lwl_m=lwl, cb=cb, displacement_t=disp,
        kg_fluid_m=kg_fluid, gm_fluid_m=gm_fluid, bilge=part.bilge,
        bilge_keel_area_m2=part.bilge_keel_area, flooding_deg=flooding,
        z_method=calc.wind_lever, roll_angle=roll_angle, roll_angle_source=roll_source)
    warnings.extend(wwarn)

    state = State(curve=side_curve, gm_fluid_m=gm_fluid, flooding_deg=flooding,
                  deck_edge_deg=deck_edge, gz_max_deg=gz_max_deg, weather=wv)
    checks = run_criteria(list(vessel.criteria), state)
    passed = all(c.passed for c in checks)

    heel_grid, gz_values, kn_values = gz_grid(curve)
    k = part.keel_thickness
    sig = cond.signatories
    doc = {
        "format": RESULTS_FORMAT,
        "software": {"name": NAME, "version": __version__},
        "inputs_sha256": case.inputs_sha256,
        "inputs": {"condition_file": case.condition_name,
                   "vessel_file": _vessel_attachment_name(case)},
        "condition": {
            "title": cond.condition.title, "voyage": cond.condition.voyage,
            "date": cond.condition.date, "water_density": rho_w,
            "free_surface": cond.free_surface,
            "signatories": {"prepared_by": sig.prepared_by if sig else None,
                            "checked_by": sig.checked_by if sig else None,
                            "reviewed_by": sig.reviewed_by if sig else None},
        },
        "vessel": {"name": vessel.vessel.name, "identifier": vessel.vessel.identifier,
                   "type": vessel.vessel.type, "length_bp": part.length_bp,
                   "breadth": part.breadth, "depth": part.depth,
                   "summer_draft": part.summer_draft},
        "loading": {"lightship": tot.lightship, "deadweight": tot.deadweight,
                    "displacement": disp, "lcg": tot.lcg, "vcg": tot.vcg, "tcg": tot.tcg,
                    "fsm": tot.fsm, "lines": [ln.as_dict() for ln in lines]},
        "hydrostatics": {
            "draft_mean": dr.mid, "draft_fore": dr.fore, "draft_aft": dr.aft, "trim": trim,
            "heel": heel, "lcb": hp.lcb, "lcf": hp.lcf, "mct": hp.mct, "tpc": hp.tpc,
            "kmt": hp.kmt, "kg_solid": tot.vcg, "fsc": fsc, "kg_fluid": kg_fluid,
            "gm_solid": gm_solid, "gm_fluid": gm_fluid,
            "draft_aft_extreme": dr.aft + k, "draft_mean_extreme": dr.mid + k,
            "draft_fore_extreme": dr.fore + k, "summer_draft": part.summer_draft,
        },
        "gz": {"heel": heel_grid, "gz": gz_values, "kn": kn_values},
        "angles": {"deck_edge": deck_edge, "flooding": flooding, "gz_max": gz_max_deg,
                   "vanishing": vanishing, "flooding_opening": flooding_opening,
                   "side": side},
        "weather": wv.as_dict(),
        "criteria": [c.as_dict() for c in checks],
        "passed": passed,
        "warnings": warnings,
        "assumptions": {
            "cross_curves_trim": vessel.cross_curves.trim,
            "table_density": tab.hydro.density, "water_density": rho_w,
            "free_surface": cond.free_surface,
            "slack_below_percent": calc.slack_below_percent,
            "slack_above_percent": calc.slack_above_percent,
            "wind_pressure": WIND_PRESSURE_N_M2, "z_method": calc.wind_lever,
            "roll_angle_source": roll_source,
            "list_side": side if has_list(tot.tcg) else None,
            "flooding_source": flooding_source, "deck_edge_source": deck_source,
            "fsc_method": "rise_of_kg",
        },
    }
    return Results.from_document(doc)


class _HullScan:
    """Immersion angles on the hull offsets for one condition: the equilibrium waterplane,
    free to trim with xB at the condition's LCG, at each cross-curve heel (scanned once),
    refined between heels by a root finder (reportgen.hull.tables.immersion_angle)."""

    def __init__(self, geom: HullGeometry, volume_m3: float, lcg_m: float,
                 heels_deg: np.ndarray) -> None:
        self.geom, self.volume, self.lcg = geom, volume_m3, lcg_m
        self.states = heel_scan(geom, volume_m3, lcg_m, [float(h) for h in heels_deg])

    def angle(self, points_xyz: np.ndarray) -> float:
        """Least heel (deg) at which any of the points (x, y, z; m) reaches the water."""
        return immersion_angle(self.geom, points_xyz, self.volume, self.lcg, self.states)


def _vessel_attachment_name(case: Case) -> str:
    """The vessel file's attachment name (contract: prefixed "vessel-" when both basenames
    are equal)."""
    if case.vessel_name == case.condition_name:
        return f"vessel-{case.vessel_name}"
    return case.vessel_name
