"""The upright stage of an evaluation: everything of a condition that does not depend on KG
(loading, floating position, the KN curve, the angles of flooding and deck-edge immersion, the
wind, the load line, the draughts at the marks), by the tables or on the hull offsets.

These functions and reportgen.stages are the only ones of the flow that read the file models;
the modules they call take arrays and plain values.
"""

from __future__ import annotations

from dataclasses import dataclass, replace
from typing import TYPE_CHECKING

import numpy as np

from reportgen import angles as angle_rules
from reportgen import plausible
from reportgen.criteria import core, rolling
from reportgen.criteria import weather as weather23
from reportgen.errors import InputError
from reportgen.floating import Floating, floating_on_tables
from reportgen.inputs import Case
from reportgen.loading import Loading, condition_loading
from reportgen.loadline import SALT_WATER_T_M3, LoadLine, load_line, summer_row
from reportgen.stability import (
    KNCurve,
    has_list,
)
from reportgen.vesseldata import VesselData

if TYPE_CHECKING:  # imported where a condition needs them (grain, marks, allowances, booklet)
    from reportgen import draughts as marks_rules
    from reportgen.criteria import booklet
    from reportgen.extras import Extras
    from reportgen.grainload import GrainCargo

MIN_LENGTH_M = 24.0  # IS Code 2008 Part A 2.3 and SPEC.md: ships of 24 m in length and over
SINGLE_TRIM_TOLERANCE = angle_rules.SINGLE_TRIM_TOLERANCE


@dataclass(frozen=True)
class Upright:
    """Everything of a condition that does not depend on KG."""

    case: Case
    sets: list[str]
    loading: Loading
    floating: Floating
    kn: KNCurve  # KN(θ°) at the condition's displacement and trim, m
    heel_max_deg: float
    angles: angle_rules.Angles
    wind: weather23.Wind | None
    roll_hull: rolling.Hull | None
    cb_source: str
    load_line: LoadLine | None
    warnings: tuple[str, ...]
    grain: GrainCargo | None = None  # grain in bulk (Grain Code), None without
    extras: Extras | None = None  # timber, passengers, ice; None: the condition asks for none
    at_marks: dict[str, float] | None = None  # extreme draught at each mark, m
    survey: marks_rules.Survey | None = None  # the draughts read alongside, worked
    booklet: booklet.Curve | None = None  # the booklet's limiting curve, when a set needs it


def _floating(case: Case, vd: VesselData, loading: Loading) -> Floating:
    v, t = case.vessel, loading.totals
    rho = case.condition.condition.water_density
    return floating_on_tables(vd.hydro, t.displacement, rho, t.lcg, v.particulars.length_bp)


def _kn(case: Case, vd: VesselData, fl: Floating) -> tuple[KNCurve, float, list[str]]:
    lpp = case.vessel.particulars.length_bp
    cross = vd.cross
    warnings = []
    if cross.trims is None and abs(fl.trim) > SINGLE_TRIM_TOLERANCE * lpp:
        basis = ("made on an even keel" if case.vessel.cross_curves.trim == "even_keel" else
                 "made free to trim from even keel")
        warnings.append(f"The cross curves were {basis}, while the condition trims "
                        f"{fl.trim:+.2f} m (more than 0.5 % of Lpp): give cross curves at "
                        f"several trims, or choose calculation.method: hull.")
    kn = KNCurve(cross.kn_spline(fl.displacement_table_t, fl.trim), cross.heel_max_deg)
    return kn, cross.heel_max_deg, warnings


def _hull_angle(case: Case, vd: VesselData, loading: Loading, fl: Floating):
    """The immersion finder on the hull offsets at the condition's equilibrium (free trim,
    xB = LCG), or None without offsets. The upright waterplane is solved from the floating
    position the tables give (`fl`) as a first guess."""
    geom = vd.hull
    if geom is None:
        return None
    from reportgen.hull.equilibrium import equilibrium_plane
    from reportgen.hull.hydrostatics import Plane
    from reportgen.hull.tables import Scan, immersion_angle

    rho = case.condition.condition.water_density
    volume = loading.totals.displacement / rho
    lcg = loading.totals.lcg
    heels = [float(h) for h in vd.cross.heel_deg] if vd.cross is not None else \
        [float(h) for h in range(0, 91, 5)]
    try:
        upright = None
        if heels and heels[0] == 0.0:
            guess = Plane.from_draft(fl.draughts.mid, fl.trim, 0.0, geom.length_bp_m)
            upright = equilibrium_plane(geom, volume, 0.0, lcg, guess=guess)
    except ValueError as exc:
        raise _offsets_disagree(exc) from None
    scanned = Scan(geom, volume, lcg, heels, upright)  # solved as far as a search reads it

    def angle(points_xyz: np.ndarray) -> float:
        try:
            return immersion_angle(geom, points_xyz, volume, lcg, scanned)
        except ValueError as exc:
            raise _offsets_disagree(exc) from None

    return angle


def _offsets_disagree(exc: ValueError) -> InputError:
    """The hull offsets cannot float the condition the tables float (the angles are sought
    on them): offsets and tables describe different hulls, or the loading is wrong."""
    return InputError(f"hull offsets: {exc}, for a condition the hydrostatic table floats; "
                      f"the angles of flooding and deck edge are found on the offsets, which "
                      f"must describe the hull of the tables (check hull.stations against "
                      f"the tables, and the masses and their lcg)")


def _on_hull(case: Case, vd: VesselData, loading: Loading):
    """The condition computed on the hull offsets (calculation.method: hull)."""
    from reportgen.hull.direct import on_hull
    from reportgen.hull.trimmed import check_stations

    try:
        check_stations(vd.hull, case.vessel.particulars.summer_draft)
        return on_hull(vd.hull, loading.totals.displacement,
                       case.condition.condition.water_density, loading.totals.lcg)
    except ValueError as exc:
        tail = ("; the LCG lies too far forward or aft of the hull's centre of buoyancy for "
                "this displacement: check the masses and their lcg"
                if str(exc).startswith("no free-trim equilibrium") else "")
        raise InputError(f"{exc}{tail}") from None


def _angles(case: Case, vd: VesselData, loading: Loading, fl: Floating,
            finder=None) -> angle_rules.Angles:
    """θf and the deck edge; with `finder` (the hull route's) both come from the hull."""
    v = case.vessel
    p = v.particulars
    needs_hull = not (angle_rules.is_multi_trim(vd.deck_edge)
                      and (angle_rules.is_multi_trim(vd.flooding) or not v.openings))
    on_hull = finder is not None
    if not on_hull:
        finder = _hull_angle(case, vd, loading, fl) if needs_hull else None
    s = angle_rules.Situation(fl.displacement_table_t, fl.trim, fl.draughts.mid, finder)
    deck_points = None
    if finder is not None and vd.hull is not None:  # the hull is made only when needed
        from reportgen.hull.tables import deck_edge_points

        deck_points = deck_edge_points(vd.hull)
    deck, w1 = angle_rules.deck_edge_angle(None if on_hull else vd.deck_edge, s, deck_points,
                                           p.depth, p.breadth, p.length_bp)
    openings = [angle_rules.Opening(o.name, o.x, o.y, o.z) for o in v.openings]
    flood, w2 = angle_rules.flooding_angle(None if on_hull else vd.flooding, s, openings,
                                           p.length_bp)
    return angle_rules.Angles(deck, flood, tuple(w1 + w2))


def _roll_hull(case: Case, fl: Floating, loading: Loading) -> tuple[rolling.Hull, str]:
    p = case.vessel.particulars
    lwl = fl.lwl if fl.lwl is not None else p.length_bp
    d = fl.draughts.mid
    if fl.cb is not None:
        cb, source = fl.cb, "hull" if fl.method == "hull" else "table"
    else:
        rho = case.condition.condition.water_density
        cb = rolling.block_coefficient(loading.totals.displacement, rho, lwl, p.breadth, d)
        source = "computed"
    return rolling.Hull(p.breadth, d, lwl, cb, p.bilge, p.bilge_keel_area, p.length_bp), source


def _load_line(case: Case, vd: VesselData, fl: Floating) -> tuple[LoadLine | None, list[str]]:
    """The load line from the hydrostatic table's even-keel row (trim 0) in salt water, or
    from the hull on an even keel with the hull route."""
    h = vd.hydro
    p = case.vessel.particulars
    if fl.method == "hull":
        from reportgen.hull.direct import summer_on_hull

        disp_s, tpc_s = summer_on_hull(vd.hull, p.summer_draft, SALT_WATER_T_M3)
    elif h is None:
        return None, []
    else:
        k = 0
        if h.trims is not None:
            k = int(np.argmin(np.abs(h.trims)))
        disp_t, tpc_t = summer_row(h.draft[k], h.displacement[k], h.tpc[k], p.summer_draft)
        scale = SALT_WATER_T_M3 / h.density
        disp_s, tpc_s = disp_t * scale, tpc_t * scale
    rho = case.condition.condition.water_density
    ll = load_line(p.summer_draft, disp_s, tpc_s, rho, fl.draughts.mid, fl.tpc)
    if not ll.overloaded:
        return ll, []
    over_mm = round(fl.draughts.mid * 1000.0) - round(ll.permissible_draft * 1000.0)
    text = (f"The midships draught {fl.draughts.mid:.3f} m is above the permissible draught "
            f"{ll.permissible_draft:.3f} m in water of {rho:.3f} t/m³ (summer draught "
            f"{p.summer_draft:.3f} m + dock water allowance {ll.dwa * 1000:.0f} mm): the ship "
            f"is overloaded by {over_mm} mm.")
    return ll, [text]


def _marks(case: Case, vd: VesselData, loading: Loading, fl: Floating):
    """(extreme draughts at the marks, the survey of the draughts read) or Nones."""
    v, obs = case.vessel, case.condition.observed
    if v.draught_marks is None:
        return None, None
    from reportgen import draughts as marks_rules

    p = v.particulars
    x = v.draught_marks.model_dump()
    at = marks_rules.draughts_at_marks(x, fl.draughts.mid, fl.trim, p.length_bp,
                                       p.keel_thickness)
    if obs is None:
        return at, None
    if vd.hydro is None:
        raise InputError("observed: the displacement at the draughts read comes from the "
                         "hydrostatic table, and the vessel file has none (make it with "
                         "reportgen tables)")
    readings = {k: (getattr(obs, k).port, getattr(obs, k).starboard) for k in x}
    stated = obs.density is not None
    rho = obs.density if stated else case.condition.condition.water_density
    s = marks_rules.survey(readings, x, at, vd.hydro, p.length_bp, p.breadth, p.depth,
                           p.keel_thickness, rho, loading.totals.displacement, obs.tolerance)
    return at, s if stated else replace(s, density_stated=False)


def _scan_heels(method: str, v) -> list[float] | None:
    """The heels KN is known at: the hull route's scan, or the cross curves' heels."""
    if method == "hull":
        from reportgen.hull.direct import HEELS_DEG

        return list(HEELS_DEG)
    return v.cross_curves.heel if v.cross_curves else None


def _float(method: str, case: Case, vd: VesselData, loading: Loading):
    """(floating position, KN curve, largest heel of the KN curve, the immersion finder on the
    hull or None, warnings) of a loading, by the tables or on the hull."""
    if method == "hull":
        hull = _on_hull(case, vd, loading)
        kn = KNCurve(hull.kn, hull.heel_max_deg)
        return hull.floating, kn, hull.heel_max_deg, hull.immersion, []
    fl = _floating(case, vd, loading)
    kn, heel_max, kn_warnings = _kn(case, vd, fl)
    return fl, kn, heel_max, None, kn_warnings


def _allowance_stage(case: Case, sets: list[str]):
    """The module of the ship-type allowances (reportgen.extras) when the condition asks for
    any (timber items, passengers, ice, or the timber criteria), else None: it is imported
    only then. Its functions decide, from the vessel's data too, what each allowance adds."""
    c = case.condition
    if (c.passengers is None and c.icing == "none" and "is2008.timber" not in sets
            and not any(it.timber for it in c.items)):
        return None
    from reportgen import extras

    return extras


def upright(case: Case, vd: VesselData, method: str | None = None) -> Upright:
    """Loading, floating position, KN, angles and wind of a condition (no KG needed), by the
    vessel's calculation.method or by `method` (tables | hull) when given."""
    v, c = case.vessel, case.condition
    method = method or v.calculation.method
    sets = case.criteria_sets
    warnings: list[str] = []
    if v.particulars.length_bp < MIN_LENGTH_M:
        warnings.append(f"The IS Code 2008 criteria apply to ships of {MIN_LENGTH_M:g} m in "
                        f"length and over; this ship is {v.particulars.length_bp:g} m.")
    loading = condition_loading(v, c, vd.tanks)
    stage = _allowance_stage(case, sets)
    timber = pax = icing = None
    if stage is not None:
        timber, timber_lines = stage.timber_lines(case)
        pax, pax_lines = stage.passenger_lines(case)
        loading = stage.with_lines(loading, timber_lines + pax_lines)
    p = v.particulars
    plausible.check_positions(loading.lines, p.length_bp, p.breadth, v.windage.top_m)
    fl, kn, heel_max, finder, kn_warnings = _float(method, case, vd, loading)
    plausible.check_draughts(fl.draughts, p.depth)
    if stage is not None:
        icing = stage.icing_of(case, vd.profile, fl.draughts.mid, fl.trim)
    if icing is not None:  # ice at the waterline without it, then float again (Part B 6)
        loading = stage.with_lines(loading, stage.ice_lines(icing))
        fl, kn, heel_max, finder, kn_warnings = _float(method, case, vd, loading)
        plausible.check_draughts(fl.draughts, p.depth)
        icing = stage.iced_windage(case, vd.profile, icing, fl.draughts.mid, fl.trim)
    warnings += kn_warnings
    extras = None
    if stage is not None:
        extras = stage.Extras(timber, pax, icing)
        warnings += stage.extras_warnings(sets, extras)
    ll, ll_warnings = _load_line(case, vd, fl)
    warnings += ll_warnings
    ang = _angles(case, vd, loading, fl, finder)
    warnings += ang.warnings
    wind = roll_hull = None
    cb_source = "computed"
    if "weather" in core.needs(sets):
        windy = [it for it in c.items if it.wind_area]
        bad = plausible.item_windage_problems(
            [(it.name, it.wind_area, it.wind_z) for it in windy], fl.draughts.mid,
            p.length_bp, v.windage.top_m)
        if bad:
            raise InputError("; ".join(bad))
        items = [(it.wind_area, it.wind_z) for it in windy]
        wind = weather23.wind(vd.profile, items, fl.draughts.mid, fl.trim, v.particulars.length_bp,
                              loading.totals.displacement, v.calculation.wind_lever)
        roll_hull, cb_source = _roll_hull(case, fl, loading)
    # SPEC.md "Condition file": every item above the depth without wind_area is named,
    # whatever the criteria (the windage would count as soon as the weather set is chosen)
    bare, covered = plausible.unwinded_deck_items(
        loading.lines, vd.profile, p.depth,
        {it.name for it in c.items if it.wind_area is not None})
    warnings += [f"Item {name!r} lies above the deck and outside the lateral windage "
                 f"profile, but gives no wind_area: its windage is not in the weather "
                 f"criterion (IS Code 2008 Part A 2.3); give wind_area and wind_z."
                 for name in bare]
    warnings += [f"Item {name!r} lies above the deck and gives no wind_area: its windage "
                 f"is taken as inside the lateral windage profile, which covers its "
                 f"centre (IS Code 2008 Part A 2.3); give wind_area and wind_z if it "
                 f"stands out of the profile, or wind_area: 0 to state that it adds none."
                 for name in covered]
    cargo = None
    if c.grain is not None:
        from reportgen import grain as grain_rules
        from reportgen.grainload import grain_cargo

        cargo = grain_cargo(v, c)
        warnings += grain_rules.cargo_warnings(
            "grain.2008" in sets, _scan_heels(method, v),
            has_list(loading.totals.tcg))
    at_marks, survey = _marks(case, vd, loading, fl)
    if survey is not None:
        from reportgen.draughts import survey_warnings

        warnings += survey_warnings(survey, c.condition.water_density)
    curve_b = None
    if "booklet" in core.needs(sets):
        from reportgen.criteria.booklet import curve_of

        curve_b = curve_of(v)
    return Upright(case, sets, loading, fl, kn, heel_max, ang, wind, roll_hull, cb_source, ll,
                   tuple(warnings), cargo, extras, at_marks=at_marks, survey=survey,
                   booklet=curve_b)
