"""Tables at several trims from the hull offsets (SPEC.md, `trims` in `hydrostatics`,
`cross_curves`, `deck_edge` and `flooding_angle`), and the checks that the offsets can be
integrated faithfully.

Units: lengths m, masses t, density t/m³, angles deg, MCT t·m/cm, TPC t/cm. Trim + by the
stern, over Lpp; the draught of a trimmed table is the draught at midships (x = Lpp/2).

Cross curves at a trim t are made free to trim (`trim: free`, SPEC.md): at each displacement
the ship is floated upright at trim t, its LCB there is the LCG that gives that trim upright,
and at every heel the waterplane is found with xB held at that LCG. A condition whose own
trim is t then reads KN made with its own LCG (to the accuracy of interpolating in trim).
"""

from __future__ import annotations

from collections.abc import Sequence

import numpy as np
from scipy.integrate import trapezoid

from reportgen.hull.equilibrium import Equilibrium, solve_draft, state_at
from reportgen.hull.hydrostatics import HullGeometry, Plane, clip_sections, hydrostatics_at

# A hull whose volume or LCB at the summer draught moves by more than these between Simpson's
# rule and the trapezoidal rule over the same stations is too coarsely described for its form:
# the two rules agree to the integration error, which is then no longer small beside the
# accuracy the tables are held to (MSC.1/Circ.1229: displacement 2 %, LCB 1 % / 50 cm; the
# project aims far inside those, so the refusal is at a tenth of them).
MAX_VOLUME_SPREAD = 0.002  # of the volume
MAX_LCB_SPREAD = 0.001  # of Lpp


def upright_at_trim(geom: HullGeometry, volume_m3: float, trim_m: float) -> Equilibrium:
    """The upright waterplane at trim `trim_m` (m, + by the stern) immersing `volume_m3`, and
    its centre of buoyancy (its LCB is the LCG that makes the ship float at that trim)."""
    return state_at(geom, solve_draft(geom, volume_m3, 0.0, trim_m / geom.length_bp_m))


def hydrostatic_rows(geom: HullGeometry, drafts_m: np.ndarray, trim_m: float, density: float
                     ) -> dict[str, list[float]]:
    """Upright hydrostatics at each midships draught (m) at trim `trim_m` (m): columns
    displacement, lcb, lcf, kmt, mct, tpc, lwl, cb (reportgen.hull.hydrostatics)."""
    lpp = geom.length_bp_m
    rows = [hydrostatics_at(geom, Plane.from_draft(float(t), trim_m, 0.0, lpp), density)
            for t in drafts_m]
    return {k: [float(r[k]) for r in rows] for k in
            ("displacement", "lcb", "lcf", "kmt", "mct", "tpc", "lwl", "cb")}


def check_block_coefficient(cb_rows: Sequence[Sequence[float]], drafts_m: Sequence[float],
                            trims_m: Sequence[float] | None) -> None:
    """ValueError naming the row where CB exceeds 1 (no hull fills more than its box): the
    offsets are then wrong or too coarse for Simpson's rule (SPEC.md, setting up a ship)."""
    for k, row in enumerate(cb_rows):
        for i, cb in enumerate(row):
            if np.isfinite(cb) and cb > 1.0 + 1e-9:  # beyond round-off
                at = "" if trims_m is None else f" at trim {trims_m[k]:g} m"
                raise ValueError(
                    f"hull: the block coefficient comes out as {cb:.4f} (above 1) at draught "
                    f"{drafts_m[i]:g} m{at}: the offsets cannot be integrated faithfully; "
                    f"check them, or give more stations")


def check_stations(geom: HullGeometry, draft_m: float) -> None:
    """ValueError when the stations are too few or too far apart for the form: Simpson's and
    the trapezoidal rule differing at the even-keel draught `draft_m` by more than
    MAX_VOLUME_SPREAD in volume or MAX_LCB_SPREAD·Lpp in LCB (a form the stations follow
    closely integrates alike by both; a box does with any number). The message names the
    station gap where the section areas turn most sharply."""
    x = geom.x_m
    area = clip_sections(geom, Plane(draft_m, 0.0, 0.0)).area_m2
    v_s = float(geom.weights @ area)
    if not v_s > 0.0:
        raise ValueError(f"hull: no immersed volume at the summer draught {draft_m:g} m")
    v_t = float(trapezoid(area, x))
    m_s, m_t = float(geom.weights @ (area * x)), float(trapezoid(area * x, x))
    dv = abs(v_s - v_t) / v_s
    dl = abs(m_s / v_s - m_t / v_t) / geom.length_bp_m
    if dv <= MAX_VOLUME_SPREAD and dl <= MAX_LCB_SPREAD:
        return
    # The gap where the section area turns most sharply (second difference per gap).
    gaps = np.diff(x)
    bend = np.zeros(len(gaps))
    if len(area) > 2:
        slope = np.diff(area) / gaps
        turn = np.abs(np.diff(slope))
        bend[:-1] += turn * gaps[:-1]
        bend[1:] += turn * gaps[1:]
    j = int(np.argmax(bend))
    raise ValueError(
        f"hull: the stations are too far apart for the form (at the summer draught Simpson's "
        f"and the trapezoidal rule differ by {100 * dv:.2f} % in volume and "
        f"{100 * dl:.3f} % of Lpp in LCB); the section areas change most sharply between the "
        f"stations at x = {x[j]:g} and {x[j + 1]:g} m ({gaps[j]:g} m apart): give more "
        f"stations there")


def parse_trims(text: str) -> list[float]:
    """The trims of `--trims`: comma-separated numbers (m, + by the stern), increasing, at
    least two; ValueError otherwise."""
    try:
        trims = [float(s) for s in text.replace(" ", "").split(",") if s != ""]
    except ValueError:
        raise ValueError(f"--trims: {text!r} is not a comma-separated list of numbers "
                         f"(m, + by the stern), e.g. -1,0,1,2,3,4") from None
    if len(trims) < 2:
        raise ValueError("--trims: give at least two trims (m), e.g. -1,0,1,2,3,4")
    if not all(np.isfinite(trims)) or np.any(np.diff(trims) <= 0):
        raise ValueError("--trims: the trims must be finite and strictly increasing")
    return trims
