"""Plausibility of a condition: what cannot be a ship afloat is refused before it is assessed,
and what the criteria would silently miss is named (SPEC.md "Conventions").

Refused (InputError, exit status 2), each naming the line, key or value:
- a mass whose centre lies outside the ship as SPEC.md "Conventions" bounds it: LCG outside
  −0.05·Lpp … 1.05·Lpp, |TCG| more than B/2 off the centreline, VCG below the base line or
  above the top of the windage profile (reportgen.inputs.tables.outside_the_ship);
- a draught at a perpendicular below zero (the keel out of the water) or above the moulded
  depth (the deck edge under water upright: not an intact condition the Code assesses).

Warned (beside the verdict): an item whose centre is above the deck and outside the vessel's
lateral windage profile, with no windage of its own given, while the weather criterion is
selected: its wind area is missing from IS Code 2008 Part A 2.3.

Units: m throughout (x from the AP, y + to starboard, z above base).
"""

from __future__ import annotations

from collections.abc import Sequence

import shapely
from shapely.geometry import Polygon

from reportgen.errors import InputError
from reportgen.floating import Draughts
from reportgen.inputs.tables import outside_the_ship, ship_x_range
from reportgen.loading import Line


def position_problems(lines: Sequence[Line], length_bp_m: float, breadth_m: float,
                      top_m: float) -> list[str]:
    """Lines whose centre of mass lies outside the ship (SPEC.md "Conventions"; ``top_m`` the
    top of the windage profile, m above the base). Massless lines are not looked at, nor the
    allowances the tool places itself from checked data (passengers 1 m above a deck that
    lies within the ship, which may stand above the profile's top on an open deck; timber's
    absorbed water at its stack's centre)."""
    problems = []
    for ln in lines:
        if ln.mass <= 0.0 or ln.kind == "allowance":
            continue
        found = outside_the_ship(length_bp_m, breadth_m, top_m, ln.lcg, ln.tcg, ln.vcg,
                                 ("lcg", "tcg", "vcg"))
        if found:  # the label made only for a line named in the message
            label = f"{ln.kind} {ln.id or ln.name!r}"
            problems += [f"{label}: {text}" for text in found]
    return problems


def check_positions(lines: Sequence[Line], length_bp_m: float, breadth_m: float,
                    top_m: float) -> None:
    """InputError naming every mass placed outside the ship."""
    problems = position_problems(lines, length_bp_m, breadth_m, top_m)
    if problems:
        raise InputError("a mass lies outside the ship: " + "; ".join(problems))


def check_draughts(d: Draughts, depth_m: float) -> None:
    """InputError when a draught at a perpendicular is below zero or above the moulded depth:
    no intact ship floats so (the condition's masses or positions are wrong)."""
    for where, value in (("aft perpendicular", d.aft), ("forward perpendicular", d.fore)):
        if value < 0.0:
            raise InputError(f"the draught at the {where} would be {value:.2f} m, below zero "
                             f"(the keel out of the water): this condition cannot float so; "
                             f"check the masses and their lcg")
        if value > depth_m:
            raise InputError(f"the draught at the {where} would be {value:.2f} m, above the "
                             f"moulded depth {depth_m:g} m (the deck under water upright): "
                             f"not an intact condition; check the masses and their lcg")


def item_windage_problems(items: Sequence[tuple[str, float, float]], draft_mid_m: float,
                          length_bp_m: float, top_m: float) -> list[str]:
    """Items' windage (name, wind_area m², wind_z m above base) that cannot be: a centroid at
    or below the waterline (``draft_mid_m``, midships; A of IS Code 2008 Part A 2.3.2.2 is the
    lateral area above the waterline, and a centroid below it would lower the wind lever) or
    above the top of the windage profile ``top_m`` (SPEC.md "Conventions" bounds a centre at
    that top); an area larger than the whole silhouette's box, the ship's length (−0.05·Lpp
    … 1.05·Lpp) × the profile's top."""
    x_lo, x_hi = ship_x_range(length_bp_m)
    box_m2 = (x_hi - x_lo) * top_m
    out = []
    for name, area, z in items:
        if not draft_mid_m < z <= top_m:
            out.append(f"item {name!r}: wind_z {z:g} m is outside the windage above the "
                       f"waterline (above the midships draught {draft_mid_m:.3f} m, up to the "
                       f"top of the windage profile {top_m:g} m)")
        if area > box_m2:
            out.append(f"item {name!r}: wind_area {area:g} m² exceeds the ship's whole "
                       f"silhouette box ({x_hi - x_lo:g} m × {top_m:g} m = {box_m2:.0f} m²)")
    return out


def unwinded_deck_items(lines: Sequence[Line], windage_profile: Polygon, depth_m: float,
                        items_with_wind: set[str]) -> tuple[list[str], list[str]]:
    """Names of items whose centre is above the deck (VCG > moulded depth) and that give no
    wind area (SPEC.md "Condition file": each gets a warning; `items_with_wind`: names of
    items that give one, wind_area 0 included, which states that the item adds none), as two
    lists: those outside the lateral windage profile (their windage is missing from the
    weather criterion) and those inside it (taken as already in the profile).

    "Outside" is "not covered" (inside or on the outline is covered): for a point that is
    shapely's intersects, asked for every item at once (intersects_xy; tests/test_plausible.py
    compares it with covers)."""
    above = [ln for ln in lines if ln.kind == "item" and ln.mass > 0.0 and ln.vcg > depth_m
             and ln.name not in items_with_wind]
    if not above:
        return [], []
    covered = shapely.intersects_xy(windage_profile, [ln.lcg for ln in above],
                                    [ln.vcg for ln in above]).tolist()
    return ([ln.name for ln, inside in zip(above, covered, strict=True) if not inside],
            [ln.name for ln, inside in zip(above, covered, strict=True) if inside])
