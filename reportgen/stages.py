"""The stages of one evaluation, each taking the values the stages before it made.

`upright(case)` makes everything that does not depend on KG (loading, floating position, the
KN curve, the angles, the wind); `checked(up, kg_fluid)` what the criteria need at a KG (the GZ
curve, GM, θ1, the weather areas, the checks); `at_kg(up, kg_fluid)` adds what the sheet shows
besides (equilibrium heel, angle of vanishing stability, warnings). The limits search on
`checked` and re-use `upright`.
These are the only functions of the flow that read the file models; the modules they call take
arrays and plain values.
"""

from __future__ import annotations

from dataclasses import dataclass, replace

import numpy as np

from reportgen import angles as angle_rules
from reportgen import draughts as marks_rules
from reportgen import extras as allowance_stage
from reportgen import grain as grain_rules
from reportgen import plausible
from reportgen.criteria import booklet, core, passenger, rolling
from reportgen.criteria import weather as weather23
from reportgen.criteria.core import Check, State
from reportgen.errors import InputError
from reportgen.floating import Floating, floating_on_tables
from reportgen.grainload import GrainCargo, grain_cargo
from reportgen.inputs import Case
from reportgen.loading import Loading, condition_loading
from reportgen.loadline import SALT_WATER_T_M3, LoadLine, load_line, summer_row
from reportgen.stability import (
    GZCurve,
    KNCurve,
    equilibrium_heel,
    free_surface_correction,
    gz_curve,
    has_list,
    kg_corrected,
    kn_curve,
    list_side,
    max_gz,
    metacentric_height,
    vanishing_angle,
)
from reportgen.vesseldata import VesselData

MIN_LENGTH_M = 24.0  # IS Code 2008 Part A 2.3 and SPEC.md: ships of 24 m in length and over
SINGLE_TRIM_TOLERANCE = angle_rules.SINGLE_TRIM_TOLERANCE
NO_EXTRAS = allowance_stage.Extras()


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
    extras: allowance_stage.Extras = NO_EXTRAS  # timber, passengers, ice
    at_marks: dict[str, float] | None = None  # extreme draught at each mark, m
    survey: marks_rules.Survey | None = None  # the draughts read alongside, worked


@dataclass(frozen=True)
class Checked:
    """The criteria of the condition at one KG corrected for free surface."""

    kg_fluid_m: float
    gm_fluid_m: float
    curve: GZCurve  # heel + to starboard
    side_curve: GZCurve  # towards the side of the list
    state: State
    weather: weather23.Weather | None
    checks: list[Check]


@dataclass(frozen=True)
class AtKG:
    """The condition at one KG corrected for free surface."""

    kg_fluid_m: float
    gm_fluid_m: float
    curve: GZCurve  # heel + to starboard
    side_curve: GZCurve  # towards the side of the list
    heel_deg: float | None
    state: State
    vanishing_deg: float | None
    weather: weather23.Weather | None
    checks: list[Check]
    warnings: tuple[str, ...]


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
    kn = kn_curve(cross.kn_spline(fl.displacement_table_t, fl.trim), cross.heel_max_deg)
    return kn, cross.heel_max_deg, warnings


def _hull_angle(case: Case, vd: VesselData, loading: Loading):
    """The immersion finder on the hull offsets at the condition's equilibrium (free trim,
    xB = LCG), or None without offsets."""
    geom = vd.hull
    if geom is None:
        return None
    from reportgen.hull.tables import heel_scan, immersion_angle

    rho = case.condition.condition.water_density
    volume = loading.totals.displacement / rho
    lcg = loading.totals.lcg
    heels = [float(h) for h in vd.cross.heel_deg] if vd.cross is not None else \
        [float(h) for h in range(0, 91, 5)]
    scanned = heel_scan(geom, volume, lcg, heels)

    def angle(points_xyz: np.ndarray) -> float:
        return immersion_angle(geom, points_xyz, volume, lcg, scanned)

    return angle


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
        finder = _hull_angle(case, vd, loading) if needs_hull else None
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
    return rolling.Hull(p.breadth, d, lwl, cb, p.bilge, p.bilge_keel_area), source


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
        kn = kn_curve(hull.kn, hull.heel_max_deg)
        return hull.floating, kn, hull.heel_max_deg, hull.immersion, []
    fl = _floating(case, vd, loading)
    kn, heel_max, kn_warnings = _kn(case, vd, fl)
    return fl, kn, heel_max, None, kn_warnings


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
    timber, timber_lines = allowance_stage.timber_lines(case)
    pax, pax_lines = allowance_stage.passenger_lines(case)
    loading = allowance_stage.with_lines(loading, timber_lines + pax_lines)
    p = v.particulars
    plausible.check_positions(loading.lines, p.length_bp, p.breadth, p.depth)
    fl, kn, heel_max, finder, kn_warnings = _float(method, case, vd, loading)
    plausible.check_draughts(fl.draughts, p.depth)
    icing = allowance_stage.icing_of(case, vd.profile, fl.draughts.mid, fl.trim)
    if icing is not None:  # ice at the waterline without it, then float again (Part B 6)
        loading = allowance_stage.with_lines(loading, allowance_stage.ice_lines(icing))
        fl, kn, heel_max, finder, kn_warnings = _float(method, case, vd, loading)
        plausible.check_draughts(fl.draughts, p.depth)
        icing = allowance_stage.iced_windage(case, vd.profile, icing, fl.draughts.mid, fl.trim)
    warnings += kn_warnings
    extras = allowance_stage.Extras(timber, pax, icing)
    warnings += allowance_stage.extras_warnings(sets, extras)
    ll, ll_warnings = _load_line(case, vd, fl)
    warnings += ll_warnings
    ang = _angles(case, vd, loading, fl, finder)
    warnings += ang.warnings
    wind = roll_hull = None
    cb_source = "computed"
    if "weather" in core.needs(sets):
        items = [(it.wind_area, it.wind_z) for it in c.items if it.wind_area]
        wind = weather23.wind(vd.profile, items, fl.draughts.mid, fl.trim, v.particulars.length_bp,
                              loading.totals.displacement, v.calculation.wind_lever)
        roll_hull, cb_source = _roll_hull(case, fl, loading)
        bare = plausible.unwinded_deck_items(loading.lines, vd.profile, p.depth,
                                             {it.name for it in c.items if it.wind_area})
        warnings += [f"Item {name!r} lies above the deck and outside the lateral windage "
                     f"profile, but gives no wind_area: its windage is not in the weather "
                     f"criterion (IS Code 2008 Part A 2.3); give wind_area and wind_z."
                     for name in bare]
    cargo = grain_cargo(v, c)
    if cargo is not None:
        warnings += grain_rules.cargo_warnings(
            "grain.2008" in sets, _scan_heels(method, v),
            has_list(loading.totals.tcg))
    at_marks, survey = _marks(case, vd, loading, fl)
    if survey is not None:
        warnings += marks_rules.survey_warnings(survey, c.condition.water_density)
    return Upright(case, sets, loading, fl, kn, heel_max, ang, wind, roll_hull, cb_source, ll,
                   tuple(warnings), cargo, extras, at_marks=at_marks, survey=survey)


def checked(up: Upright, kg_fluid_m: float) -> Checked:
    """The GZ curve, GM, weather quantities and checks at KG corrected (m): all the criteria
    need, and all a search on KG evaluates (reportgen.limits)."""
    tcg = up.loading.totals.tcg
    gm = metacentric_height(up.floating.kmt, kg_fluid_m)
    curve = gz_curve(up.kn, kg_fluid_m, tcg)
    side_curve = curve.towards(list_side(tcg))
    flooding = up.angles.flooding.deg
    include = up.case.vessel.calculation.gz_beyond_flooding == "include"
    credited = up.heel_max_deg if include else min(flooding, up.heel_max_deg)
    gz_max_deg, _ = max_gz(side_curve, 0.0, credited)
    wx = None
    if up.wind is not None:
        w = up.case.condition.weather
        given = w.roll_angle if w is not None else None
        source = w.roll_angle_source if w is not None else None
        r = rolling.roll(up.roll_hull, kg_fluid_m, gm, given)
        wx = weather23.Weather(up.wind, r, weather23.areas(side_curve, up.wind, r.theta1,
                                                           flooding), source)
    grain = None
    if up.grain is not None:
        grain = grain_rules.stability(
            side_curve, grain_rules.lambda0_m(up.grain.heeling_moment,
                                              up.loading.totals.displacement),
            flooding, up.angles.deck_edge.deg)
    curve_b = booklet.curve_of(up.case.vessel) if "booklet" in core.needs(up.sets) else None
    pax = None
    if up.extras.passengers is not None and up.case.vessel.particulars.service_speed:
        pax = _passenger_heel(up, kg_fluid_m, side_curve)
    state = State(side_curve, credited, gz_max_deg, gm, flooding, up.angles.deck_edge.deg, wx,
                  grain, kg_fluid_m, up.loading.totals.displacement, curve_b, pax)
    return Checked(kg_fluid_m, gm, curve, side_curve, state, wx, core.run(up.sets, state))


def at_kg(up: Upright, kg_fluid_m: float) -> AtKG:
    """The condition at KG corrected (m): the checks, the position of equilibrium, the angle
    of vanishing stability and the warnings."""
    c = checked(up, kg_fluid_m)
    heel = equilibrium_heel(c.curve)
    flooding = up.angles.flooding.deg
    include = up.case.vessel.calculation.gz_beyond_flooding == "include"
    warnings: list[str] = []
    if heel is None:
        warnings.append("The GZ curve has no position of equilibrium within the cross curves: "
                        "the ship capsizes in this condition.")
    elif c.gm_fluid_m <= 0.0:
        warnings.append(f"The initial GM corrected for free surface is {c.gm_fluid_m:.3f} m: "
                        f"the ship is unstable upright and lolls to {abs(heel):.1f}°.")
    if flooding < 30.0:
        warnings.append(f"The angle of flooding θf = {flooding:.1f}° is below 30°: the areas to "
                        f"40° stop at θf, and GZ beyond θf is "
                        f"{'credited' if include else 'not credited'}.")
    wx = c.weather
    if wx is not None:
        warnings += weather23.weather_warnings(wx)
        a = wx.areas
        if a.theta0 is not None and flooding < a.theta0:
            warnings.append(f"The angle of flooding θf = {flooding:.1f}° is below the steady "
                            f"heel under wind θ0 = {a.theta0:.1f}°.")
        if a.theta_lw2 is not None and flooding < a.theta_lw2:
            warnings.append(f"The angle of flooding θf = {flooding:.1f}° is below the first "
                            f"intercept of lw2 with GZ ({a.theta_lw2:.1f}°): area b is zero.")
    warnings += booklet.warnings(c.state)
    return AtKG(kg_fluid_m, c.gm_fluid_m, c.curve, c.side_curve, heel, c.state,
                vanishing_angle(c.side_curve, c.state.gz_max_deg), wx, c.checks,
                tuple(warnings))


def _passenger_heel(up: Upright, kg_fluid_m: float,
                    side_curve: GZCurve) -> passenger.PassengerHeel:
    """The crowding and turning heels of Part A 3.1 on the curve towards the list's side."""
    p, fl = up.case.vessel.particulars, up.floating
    pax = up.extras.passengers
    lwl = fl.lwl if fl.lwl is not None else p.length_bp
    return passenger.passenger_heel(side_curve, pax.crowd.moment_tm,
                                    up.loading.totals.displacement, p.service_speed, lwl,
                                    fl.draughts.mid, kg_fluid_m)


def kg_fluid_of(up: Upright) -> tuple[float, float]:
    """(FSC, KG corrected) of the condition's own loading, m."""
    t = up.loading.totals
    fsc = free_surface_correction(t.fsm, t.displacement)
    return fsc, kg_corrected(t.vcg, fsc)


def listed(up: Upright) -> bool:
    return has_list(up.loading.totals.tcg)
