"""The results document filled section by section from the stages' values (reportgen.stages)."""

from __future__ import annotations

from dataclasses import fields
from functools import cache

from reportgen import NAME, __version__
from reportgen.criteria.core import Check
from reportgen.criteria.sets import SETS
from reportgen.criteria.weather import WIND_PRESSURE_N_M2, Weather
from reportgen.inputs import Case
from reportgen.plainjson import Floats
from reportgen.results import Results
from reportgen.stability import gz_arrays, list_side
from reportgen.stages import AtKG, Upright, listed

VESSEL_PREFIX = "vessel-"  # the vessel attachment's prefix when both basenames are equal


def attachment_names(condition_name: str, vessel_name: str) -> tuple[str, str]:
    """Names of the two embedded input files; the vessel's gets "vessel-" when they clash."""
    if vessel_name == condition_name:
        return condition_name, VESSEL_PREFIX + vessel_name
    return condition_name, vessel_name


@cache
def _field_names(cls: type) -> tuple[str, ...]:
    return tuple(f.name for f in fields(cls))


def flat(obj: object) -> dict:
    """A dataclass (or NamedTuple) of plain values as a dict, field by field (dataclasses.asdict
    without its deep copy: the loading lines and grain loads hold only numbers, strings and
    None)."""
    if isinstance(obj, tuple):
        return obj._asdict()
    return {name: getattr(obj, name) for name in _field_names(type(obj))}


def condition_section(case: Case) -> dict:
    c = case.condition
    sig = c.signatories
    return {"title": c.condition.title, "voyage": c.condition.voyage, "date": c.condition.date,
            "water_density": c.condition.water_density, "free_surface": c.free_surface,
            "signatories": sig.model_dump() if sig else {}}


def vessel_section(case: Case) -> dict:
    v, p = case.vessel, case.vessel.particulars
    return {"name": v.vessel.name, "identifier": v.vessel.identifier, "type": v.vessel.type,
            "sha256": case.vessel_sha256, "source": v.source, "length_bp": p.length_bp,
            "breadth": p.breadth, "depth": p.depth, "summer_draft": p.summer_draft}


def loading_section(up: Upright) -> dict:
    t = up.loading.totals
    return {"lightship": t.lightship, "deadweight": t.deadweight.mass,
            "displacement": t.displacement, "lcg": t.lcg, "vcg": t.vcg, "tcg": t.tcg,
            "fsm": t.fsm, "deadweight_centre": flat(t.deadweight),
            "lines": [flat(ln) for ln in up.loading.lines]}


def hydrostatics_section(up: Upright, k: AtKG, fsc: float) -> dict:
    fl, p = up.floating, up.case.vessel.particulars
    dr, keel = fl.draughts, p.keel_thickness
    kg = up.loading.totals.vcg
    return {"draft_mean": dr.mid, "draft_fore": dr.fore, "draft_aft": dr.aft,
            "trim": fl.trim, "heel": k.heel_deg, "lcb": fl.lcb, "lcf": fl.lcf, "mct": fl.mct,
            "tpc": fl.tpc, "kmt": fl.kmt, "kg_solid": kg, "fsc": fsc, "kg_fluid": k.kg_fluid_m,
            "gm_solid": fl.kmt - kg, "gm_fluid": k.gm_fluid_m,
            "draft_aft_extreme": dr.aft + keel, "draft_mean_extreme": dr.mid + keel,
            "draft_fore_extreme": dr.fore + keel, "summer_draft": p.summer_draft}


def angles_section(up: Upright, k: AtKG) -> dict:
    a = up.angles
    return {"deck_edge": a.deck_edge.deg, "flooding": a.flooding.deg,
            "gz_max": k.state.gz_max_deg, "vanishing": k.vanishing_deg,
            "flooding_opening": a.flooding.opening,
            "flooding_opening_xyz": list(a.flooding.opening_xyz) if a.flooding.opening_xyz
            else None,
            "side": list_side(up.loading.totals.tcg),
            "deck_edge_source": a.deck_edge.source, "deck_edge_trim": a.deck_edge.trim_m,
            "flooding_source": a.flooding.source, "flooding_trim": a.flooding.trim_m,
            "credited_to": k.state.credited_to_deg}


def weather_section(wx: Weather | None) -> dict | None:
    if wx is None:
        return None
    w, r, a = wx.wind, wx.roll, wx.areas
    return {"wind_pressure": WIND_PRESSURE_N_M2, "wind_area": w.area_m2, "wind_z": w.z_m,
            "lw1": w.lw1, "lw2": w.lw2, "theta0": a.theta0, "theta1": r.theta1,
            "theta2": a.theta2, "thetac": a.thetac, "area_a": a.area_a, "area_b": a.area_b,
            "roll_period": r.roll_period, "c": r.c, "s": r.s, "r": r.r, "og": r.og, "x1": r.x1,
            "x2": r.x2, "k": r.k, "k_length": r.k_length, "lever": w.lever_m, "z_method": w.z_method,
            "theta1_formula": r.theta1_formula, "roll_angle_source": wx.roll_angle_source,
            "b_over_d": r.b_over_d, "cb": r.cb, "kg_over_d_minus_1": r.kg_over_d_minus_1,
            "theta_lw2": a.theta_lw2, "theta_start": a.theta_start,
            "areas_missing": list(a.missing)}


def load_line_section(up: Upright) -> dict | None:
    ll = up.load_line
    if ll is None:
        return None
    return {"summer_draft": ll.summer_draft, "fwa": ll.fwa, "dwa": ll.dwa,
            "permissible_draft": ll.permissible_draft,
            "deadweight_to_marks": ll.deadweight_to_marks}


def grain_section(up: Upright, k: AtKG) -> dict | None:
    """Grain Code A 7 quantities, with the allowable heeling moment at this Δ and KG."""
    cargo, g = up.grain, k.state.grain
    if cargo is None or g is None:
        return None
    from reportgen.grain import allowable_lambda0_m

    delta = up.loading.totals.displacement
    lam = allowable_lambda0_m(k.side_curve, up.angles.flooding.deg, up.angles.deck_edge.deg,
                              k.gm_fluid_m)
    allowable = None if lam is None else lam * delta
    return {"stowage_factor": cargo.stowage_factor, "vhm": cargo.vhm,
            "heeling_moment": cargo.heeling_moment, "lambda0": g.lambda0,
            "lambda40": g.lambda40, "heel": g.heel_deg, "residual_area": g.residual_area,
            "residual_to": g.residual_to_deg, "allowable_moment": allowable,
            "heel_limit": g.heel_limit_deg, "residual_to_reason": g.residual_to_reason,
            "moment_margin": None if allowable is None else allowable - cargo.heeling_moment,
            "compartments": [flat(x) for x in cargo.loads]}


def criterion(c: Check) -> dict:
    return {"id": c.id, "title": c.title, "reference": c.reference, "required": c.required,
            "attained": c.attained, "unit": c.unit, "passed": c.passed, "margin": c.margin,
            "limit": c.limit, "set": c.set}


def assumptions_section(up: Upright) -> dict:
    v, c = up.case.vessel, up.case.condition
    hydro, cross = v.hydrostatics, v.cross_curves
    method = up.floating.method
    return {
        "method": method,
        "hydrostatics_trims": hydro.trims if method == "tables" else None,
        "cross_curves_trim": cross.trim if method == "tables" else "hull",
        "cross_curves_trims": cross.trims if method == "tables" else None,
        "table_density": hydro.density if method == "tables" else None,
        "water_density": c.condition.water_density,
        "free_surface": c.free_surface,
        "full_percent": v.calculation.full_percent,
        "free_surface_tanks": [{"id": t.id, "fsm": t.fsm_tm, "reason": t.reason}
                               for t in up.loading.counted],
        "wind_pressure": WIND_PRESSURE_N_M2,
        "z_method": v.calculation.wind_lever,
        "roll_angle_source": c.weather.roll_angle_source if c.weather else None,
        "cb_source": up.cb_source,
        "list_side": list_side(up.loading.totals.tcg) if listed(up) else None,
        "gz_beyond_flooding": v.calculation.gz_beyond_flooding,
        "fsc_method": "rise_of_kg",
        "criteria_sets": [{"id": s, "title": SETS[s].title} for s in up.sets],
        "criteria_chosen": c.criteria is not None,
    }


def marks_sections(up: Upright) -> dict:
    """`draught_marks` and `observed` (reportgen.draughts, imported only for a vessel with
    draught marks)."""
    if up.at_marks is None and up.survey is None:
        return {"draught_marks": None, "observed": None}
    from reportgen import draughts as marks_rules

    return {"draught_marks": None if up.at_marks is None else marks_rules.marks_section(
                up.case.vessel.draught_marks.model_dump(), up.at_marks),
            "observed": None if up.survey is None else marks_rules.observed_section(up.survey)}


def extras_sections(up: Upright, k: AtKG) -> dict:
    """`timber`, `passengers` and `icing` (reportgen.assemble_extras, imported only for a
    condition that asks for an allowance)."""
    if up.extras is None:
        return {"timber": None, "passengers": None, "icing": None}
    from reportgen.assemble_extras import icing_section, passengers_section, timber_section

    return {"timber": timber_section(up.extras),
            "passengers": passengers_section(up.extras, k.state.passengers),
            "icing": icing_section(up.extras)}


def results(up: Upright, k: AtKG, fsc: float, limits: dict | None = None) -> Results:
    """The Results of a condition from its upright stage and its stage at its own KG (and
    its KG margin, reportgen.limits.condition_limits)."""
    case = up.case
    heel, gz, kn = gz_arrays(k.curve)
    cond_file, vessel_file = attachment_names(case.condition_name, case.vessel_name)
    return Results.model_validate({
        "software": {"name": NAME, "version": __version__},
        "inputs_sha256": case.inputs_sha256,
        "inputs": {"condition_file": cond_file, "vessel_file": vessel_file},
        "condition": condition_section(case),
        "vessel": vessel_section(case),
        "loading": loading_section(up),
        "hydrostatics": hydrostatics_section(up, k, fsc),
        "gz": {"heel": Floats(heel), "gz": Floats(gz), "kn": Floats(kn)},  # rounded at once
        "angles": angles_section(up, k),
        "weather": weather_section(k.weather),
        "load_line": load_line_section(up),
        **marks_sections(up),  # draught_marks, observed
        **extras_sections(up, k),  # timber, passengers, icing
        "grain": grain_section(up, k),
        "limits": limits,
        "criteria": [criterion(c) for c in k.checks],
        "passed": all(c.passed for c in k.checks),
        "warnings": list(up.warnings) + list(k.warnings),
        "assumptions": assumptions_section(up),
    })
