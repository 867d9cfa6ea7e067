"""The stages of one evaluation, each taking the values the stages before it made.

`upright(case)` (reportgen.upright) makes everything that does not depend on KG (loading,
floating position, the KN curve, the angles, the wind); `checked(up, kg_fluid)` what the criteria need at a KG (the GZ
curve, GM, θ1, the weather areas, the checks); `at_kg(up, kg_fluid)` adds what the sheet shows
besides (equilibrium heel, angle of vanishing stability, warnings). The limits search on
`checked` and re-use `upright`.
These are the only functions of the flow that read the file models; the modules they call take
arrays and plain values.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING

from reportgen.criteria import core, rolling
from reportgen.criteria import weather as weather23
from reportgen.criteria.core import Check, State
from reportgen.stability import (
    GZCurve,
    equilibrium_heel,
    free_surface_correction,
    gz_curve,
    has_list,
    kg_corrected,
    list_side,
    max_gz,
    metacentric_height,
    vanishing_angle,
)
from reportgen.upright import Upright, upright  # noqa: F401 (the first stage, re-exported)

if TYPE_CHECKING:  # imported where a condition needs them (passengers)
    from reportgen.criteria import passenger


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
        from reportgen import grain as grain_rules

        grain = grain_rules.stability(
            side_curve, grain_rules.lambda0_m(up.grain.heeling_moment,
                                              up.loading.totals.displacement),
            flooding, up.angles.deck_edge.deg)
    pax = None
    if (up.extras is not None and up.extras.passengers is not None
            and up.case.vessel.particulars.service_speed):
        pax = _passenger_heel(up, kg_fluid_m, side_curve)
    state = State(side_curve, credited, gz_max_deg, gm, flooding, up.angles.deck_edge.deg, wx,
                  grain, kg_fluid_m, up.loading.totals.displacement, up.booklet, pax)
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
                        f"40° stop at θf (the area from 30° is then nil and fails), the area to "
                        f"30° is taken to 30° as 2.2.1 writes it, and GZ beyond θf is "
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
    if c.state.booklet is not None:
        from reportgen.criteria.booklet import warnings as booklet_warnings

        warnings += booklet_warnings(c.state)
    return AtKG(kg_fluid_m, c.gm_fluid_m, c.curve, c.side_curve, heel, c.state,
                vanishing_angle(c.side_curve, c.state.gz_max_deg), wx, c.checks,
                tuple(warnings))


def _passenger_heel(up: Upright, kg_fluid_m: float,
                    side_curve: GZCurve) -> passenger.PassengerHeel:
    """The crowding and turning heels of Part A 3.1 on the curve towards the list's side."""
    from reportgen.criteria import passenger

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
