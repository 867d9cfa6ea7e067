"""The angle of flooding θf and the angle of deck edge immersion at the condition's state.

Units: angles deg, lengths m, masses t. The order of preference (SPEC.md, "Angles at the
condition's trim"):

1. a table with `trims` that covers the condition's trim (linear in displacement and trim;
   a trim outside the table's trims is an error, never an extrapolation);
2. the hull offsets, at the condition's own equilibrium waterplane (free trim, xB = LCG) at
   each heel;
3. a single-trim table, with a warning when the condition's trim differs from the table's by
   more than 0.5 % of Lpp;
4. for the deck edge only, atan((D − T)/(B/2)) at midships, with a warning that it ignores trim
   and sheer. Without openings and without a flooding table, θf is 90° with a warning.

Openings are taken at |y| on the immersing side (conservative for an opening on the other
side, which is treated as if it had a twin; stated on the sheet).
"""

from __future__ import annotations

from bisect import bisect_left
from collections.abc import Callable, Sequence
from dataclasses import dataclass

import numpy as np

from reportgen.errors import InputError
from reportgen.floating import outside, range_error
from reportgen.interp import interp, interp_columns
from reportgen.vesseldata import AngleTable

NO_FLOODING_ANGLE_DEG = 90.0  # SPEC.md: with neither openings nor a table
SINGLE_TRIM_TOLERANCE = 0.005  # of Lpp: SPEC.md, a single-trim table's warning


@dataclass(frozen=True)
class Angle:
    """An angle (deg) and what it rests on.

    source: table_trims | hull | table | formula | none; trim_m: the trim it was taken at (the
    condition's for table_trims and hull, the table's own for table); opening: the governing
    opening's name and (x, y, z) in m, for θf from openings.
    """

    deg: float
    source: str
    trim_m: float | None
    opening: str | None = None
    opening_xyz: tuple[float, float, float] | None = None


@dataclass(frozen=True)
class Angles:
    deck_edge: Angle
    flooding: Angle
    warnings: tuple[str, ...]


def from_table(table: AngleTable, displacement_table_t: float, trim_m: float, what: str
               ) -> float:
    """An angle (deg) from a displacement (-> trim) table: linear, never extrapolated."""
    (disp, lo, hi), angle, trims = table.lists
    if outside(displacement_table_t, lo, hi):
        raise range_error(displacement_table_t, lo, hi, what)
    rows = interp_columns(displacement_table_t, disp, angle)
    if trims is None or len(trims[0]) == 1:
        return rows[0]
    trim_axis, trim_lo, trim_hi = trims
    if outside(trim_m, trim_lo, trim_hi):
        raise range_error(trim_m, trim_lo, trim_hi, f"{what}'s trims", unit="m")
    return interp(trim_m, trim_axis, rows)


def _bracket(axis: list[float], value: float) -> list[int]:
    """The indices of the table entries on either side of `value` (one when it is an entry)."""
    i = min(bisect_left(axis, value), len(axis) - 1)
    return sorted({i, max(i - 1, 0)} if axis[i] != value else {i})


def governing_opening(table: AngleTable, displacement_table_t: float, trim_m: float
                      ) -> str | None:
    """The opening the table names at the tabulated entry, among those around the condition
    (displacement, trim), with the least angle: the one that reaches the water first there.
    None when the table names no openings."""
    if table.opening is None:
        return None
    (disp, _, _), angle, trims = table.lists
    ks = [0] if trims is None or len(trims[0]) == 1 else _bracket(trims[0], trim_m)
    corners = [(angle[k][i], table.opening[k][i])
               for k in ks for i in _bracket(disp, displacement_table_t)]
    return str(min(corners, key=lambda c: c[0])[1])


def is_multi_trim(table: AngleTable | None) -> bool:
    return table is not None and table.trims is not None and len(table.trims) > 1


def table_trim(table: AngleTable) -> float:
    """The trim (m) a single-trim table was made at (0: even keel)."""
    return 0.0 if table.trims is None else float(table.trims[0])


def deck_edge_formula(depth_m: float, draft_mid_m: float, breadth_m: float) -> float:
    """Deck edge immersion angle atan((D − T)/(B/2)) (deg), wall-sided at midships with the
    mean draught (common practice; a last resort: it ignores trim and sheer)."""
    return float(np.degrees(np.arctan2(depth_m - draft_mid_m, 0.5 * breadth_m)))


@dataclass(frozen=True)
class Opening:
    name: str
    x: float  # m from AP
    y: float  # m, + starboard
    z: float  # m above base


@dataclass(frozen=True)
class Situation:
    """What the angles depend on: the displacement at the tables' density (t), the trim (m),
    the midships draught (m), and the hull immersion finder (points (n, 3) m -> least heel
    deg), None without hull offsets."""

    displacement_table_t: float
    trim_m: float
    draft_mid_m: float
    hull_angle: Callable[[np.ndarray], float] | None


def _single_trim_warning(what: str, table: AngleTable, trim_m: float, lpp_m: float
                         ) -> list[str]:
    base = table_trim(table)
    if abs(trim_m - base) > SINGLE_TRIM_TOLERANCE * lpp_m:
        return [(f"The {what} is taken from a table made at a trim of {base:g} m while the "
                f"condition trims {trim_m:+.2f} m (more than 0.5 % of Lpp): the angle may be on "
                f"the unsafe side; give the table at several trims, or hull offsets.")]
    return []


def deck_edge_angle(table: AngleTable | None, s: Situation, deck_points: np.ndarray | None,
                    depth_m: float, breadth_m: float, lpp_m: float) -> tuple[Angle, list[str]]:
    """The deck edge immersion angle by the order of preference (module docstring)."""
    what = "deck edge table"
    if is_multi_trim(table):
        return Angle(from_table(table, s.displacement_table_t, s.trim_m, what), "table_trims",
                     s.trim_m), []
    if s.hull_angle is not None and deck_points is not None:
        return Angle(s.hull_angle(deck_points), "hull", s.trim_m), []
    if table is not None:
        return (Angle(from_table(table, s.displacement_table_t, s.trim_m, what), "table",
                      table_trim(table)),
                _single_trim_warning("deck edge immersion angle", table, s.trim_m, lpp_m))
    return (Angle(deck_edge_formula(depth_m, s.draft_mid_m, breadth_m), "formula", None),
            [("The deck edge immersion angle is estimated as atan((D − T)/(B/2)) at midships, "
             "which ignores trim and sheer: give a deck edge table or hull offsets.")])


def opening_points(openings: Sequence[Opening]) -> np.ndarray:
    """(n, 3) points (x, |y|, z), m: each opening on the immersing side."""
    return np.array([[o.x, abs(o.y), o.z] for o in openings], dtype=float).reshape(-1, 3)


def flooding_angle(table: AngleTable | None, s: Situation, openings: Sequence[Opening],
                   lpp_m: float) -> tuple[Angle, list[str]]:
    """The angle of flooding θf by the order of preference (module docstring)."""
    what = "flooding angle table"
    if is_multi_trim(table):
        name = governing_opening(table, s.displacement_table_t, s.trim_m)
        gov = next((o for o in openings if o.name == name), None)
        return Angle(from_table(table, s.displacement_table_t, s.trim_m, what), "table_trims",
                     s.trim_m, name, None if gov is None else (gov.x, gov.y, gov.z)), []
    if openings and s.hull_angle is not None:
        # Openings at the same (x, |y|, z), a pair port and starboard, share one search.
        found: dict[tuple[float, float, float], float] = {}
        per = []
        for o in openings:
            key = (o.x, abs(o.y), o.z)
            if key not in found:
                found[key] = s.hull_angle(opening_points([o]))
            per.append(found[key])
        i = int(np.argmin(per))
        gov = openings[i]
        warnings = [f"The opening {o.name} is at or below the waterline upright: θf is 0°."
                    for o, a in zip(openings, per, strict=True) if a <= 0.0]
        return Angle(per[i], "hull", s.trim_m, gov.name, (gov.x, gov.y, gov.z)), warnings
    if table is not None:
        return (Angle(from_table(table, s.displacement_table_t, s.trim_m, what), "table",
                      table_trim(table)),
                _single_trim_warning("angle of flooding", table, s.trim_m, lpp_m))
    if openings:  # the vessel model refuses this; kept as a guard for other callers
        raise InputError("openings: θf needs hull offsets or a flooding_angle table")
    return (Angle(NO_FLOODING_ANGLE_DEG, "none", None),
            [("No downflooding point is known (no openings and no flooding angle table): the "
             "angle of flooding is taken as 90°.")])
