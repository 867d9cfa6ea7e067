"""Room for more cargo: the largest mass (t) that can be added at a point (x, y, z in m) with
every criterion of the condition still passing and the midships draught within the permissible
draught of the load line (SPEC.md "Limits", `reportgen room`).

Each trial mass is a new condition (the condition's items plus one more) evaluated through
`stages.upright` and `stages.at_kg`; the added mass carries no windage. As for the KG limit
(reportgen.limits), the conservative reading where the Code is silent: the mass is raised from
0 in steps that double from ``STEP_FIRST_T`` up to ``STEP_MAX_SHARE`` of the displacement, the
first failure met limits it, and the last step is bisected to ``TOLERANCE_T``; the mass given
is the passing end (rounded down to 0.1 t).
"""

from __future__ import annotations

import dataclasses
import math
from collections.abc import Callable

from reportgen import stages
from reportgen.errors import InputError
from reportgen.inputs import Case
from reportgen.inputs.condition import Item
from reportgen.inputs.tables import outside_the_ship
from reportgen.vesseldata import VesselData, vessel_data

STEP_FIRST_T = 1.0  # t
STEP_MAX_SHARE = 0.02  # of the condition's displacement
TOLERANCE_T = 0.05  # t: SPEC asks for 0.1 t; the answer is rounded down to 0.1 t
LOAD_LINE = "load_line"
TABLES_END = "tables_end"  # the displacement leaves the vessel's tables


@dataclasses.dataclass(frozen=True)
class Trial:
    mass_t: float
    passed: bool
    limited_by: str | None  # criterion id, "load_line" or "tables_end"
    title: str | None
    displacement_t: float | None = None
    draft_mid_m: float | None = None
    permissible_m: float | None = None


def with_mass(case: Case, mass_t: float, x_m: float, y_m: float, z_m: float) -> Case:
    """The case with one more item of ``mass_t`` at (x, y, z), no windage."""
    item = Item.model_construct(name="added mass (room)", mass=mass_t, lcg=x_m, vcg=z_m,
                                tcg=y_m, wind_area=None, wind_z=None)
    cond = case.condition.model_copy(update={"items": [*case.condition.items, item]})
    return dataclasses.replace(case, condition=cond)


def check_point(case: Case, x_m: float, y_m: float, z_m: float) -> None:
    """InputError when the point is outside the ship (SPEC.md "Conventions")."""
    v = case.vessel
    p = v.particulars
    bad = outside_the_ship(p.length_bp, p.breadth, v.windage.top_m, x_m, y_m, z_m)
    if not all(math.isfinite(v) for v in (x_m, y_m, z_m)):
        bad.append("the point must be finite numbers")
    if bad:
        raise InputError("--at/--tcg: the point is outside the ship: " + "; ".join(bad))


def trial_of(case: Case, vd: VesselData, mass_t: float, x_m: float, y_m: float,
          z_m: float) -> Trial:
    """The condition with ``mass_t`` added: passes, or what stops it."""
    c = with_mass(case, mass_t, x_m, y_m, z_m) if mass_t > 0.0 else case
    try:
        up = stages.upright(c, vd)
    except InputError:
        return Trial(mass_t, False, TABLES_END, None)
    k = stages.at_kg(up, stages.kg_fluid_of(up)[1])
    failing = [ch for ch in k.checks if not ch.passed]
    ll = up.load_line
    mid = up.floating.draughts.mid
    over = ll is not None and round(mid * 1000.0) > round(ll.permissible_draft * 1000.0)
    disp = up.loading.totals.displacement
    perm = None if ll is None else ll.permissible_draft
    if failing:
        from reportgen.limits import governing

        gid = governing(failing)
        title = next(ch.title for ch in failing if ch.id == gid)
        return Trial(mass_t, False, gid, title, disp, mid, perm)
    if over:
        return Trial(mass_t, False, LOAD_LINE, None, disp, mid, perm)
    return Trial(mass_t, True, None, None, disp, mid, perm)


def room_at(case: Case, x_m: float, y_m: float, z_m: float,
            advance: Callable[[], None] | None = None) -> dict:
    """The largest mass (t) that can be added at (x, y, z) and what limits it (module
    docstring): {mass, limited_by, limited_by_title, at, displacement, draft_mean,
    permissible_draft, windage}."""
    check_point(case, x_m, y_m, z_m)
    vd = vessel_data(case.vessel)

    def trial(c: Case, data: VesselData, m: float, x: float, y: float, z: float) -> Trial:
        if advance is not None:
            advance()
        return trial_of(c, data, m, x, y, z)

    lo = trial(case, vd, 0.0, x_m, y_m, z_m)
    hi = None
    if lo.passed:
        step_max = max(STEP_FIRST_T, STEP_MAX_SHARE * (lo.displacement_t or 0.0))
        step = STEP_FIRST_T
        while hi is None:
            t = trial(case, vd, lo.mass_t + step, x_m, y_m, z_m)
            if t.passed:
                lo = t
            else:
                hi = t
            step = min(2.0 * step, step_max)
        while hi.mass_t - lo.mass_t > TOLERANCE_T:
            t = trial(case, vd, 0.5 * (lo.mass_t + hi.mass_t), x_m, y_m, z_m)
            if t.passed:
                lo = t
            else:
                hi = t
    stop = hi if hi is not None else lo
    return {"mass": math.floor(lo.mass_t * 10.0 + 1e-9) / 10.0,
            "limited_by": stop.limited_by, "limited_by_title": stop.title,
            "at": {"x": x_m, "y": y_m, "z": z_m},
            "displacement": lo.displacement_t, "draft_mean": lo.draft_mid_m,
            "permissible_draft": lo.permissible_m,
            "windage": "the added mass carries no windage"}


def room_text(answer: dict) -> str:
    """The answer in words."""
    at = answer["at"]
    where = f"x {at['x']:.3f} m, y {at['y']:.3f} m, z {at['z']:.3f} m"
    why = answer["limited_by"]
    if why == LOAD_LINE:
        reason = (f"the midships draught would pass the permissible draught "
                  f"{answer['permissible_draft']:.3f} m")
    elif why == TABLES_END:
        reason = "the displacement would leave the vessel's tables"
    else:
        reason = f"{answer['limited_by_title']} ({why}) would fail"
    if answer["mass"] <= 0.0:
        head = f"No mass can be added at {where}: {reason} already."
    else:
        head = f"Up to {answer['mass']:.1f} t can be added at {where} before {reason}."
    return (head + "\nThe added mass carries no windage (deck cargo adds wind area: give it as an "
            "item with wind_area and check the condition).")
