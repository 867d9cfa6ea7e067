"""Input blocks of the ship-type allowances (SPEC.md "Cargo and ship-type criteria"): the
vessel's passenger decks and icing areas, the condition's passengers, and the checks that need
both files (a condition may only ask for what the vessel's data give).

Units: t, m, m², knots.
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Annotated

from pydantic import Field

from reportgen.inputs.fields import Model, NonNegative, Num, Positive, Text

if TYPE_CHECKING:
    from reportgen.inputs.condition import Condition
    from reportgen.inputs.vessel import Vessel

PASSENGER_SET = "is2008.passenger"
TIMBER_SET = "is2008.timber"


class PassengerDeck(Model):
    """A deck the passengers may crowd on: the area available on one side (m²), the deck's
    height above base (m), the transverse centre of that area (m from the centreline) and,
    optionally, its longitudinal centre (m from AP; default midships, stated on the sheet)."""

    name: Text
    area: Positive  # m², on one side
    z: Num  # m above base, the deck
    y_crowded: Annotated[float, Field(gt=0)]  # m, transverse centre of the area on one side
    lcg: Num | None = None  # m from AP (an optional key beyond SPEC)


class VesselPassengers(Model):
    mass_each: Annotated[float, Field(gt=0, le=0.5)] = 0.075  # t per person (Part A 3.1)
    vcg_above_deck: Annotated[float, Field(ge=0, le=3)] = 1.0  # m, standing passengers
    decks: Annotated[list[PassengerDeck], Field(min_length=1)]


class ConditionPassengers(Model):
    number: Annotated[int, Field(ge=0, le=100000)]


class VesselIcing(Model):
    """The exposed decks on which ice accretes: their area (m²) and centre (m)."""

    deck_area: NonNegative  # m²
    deck_lcg: Num  # m from AP
    deck_vcg: Num  # m above base


def check_special(cond: Condition, vessel: Vessel, sets: list[str]) -> list[tuple[tuple, str]]:
    """(key path in the condition file, message) for each allowance or set the condition asks
    for that the vessel's data cannot give; empty when all is well."""
    out: list[tuple[tuple, str]] = []
    if cond.icing != "none" and vessel.icing is None:
        text = (f"icing {cond.icing} needs the vessel's icing block (deck_area, deck_lcg, "
                "deck_vcg), and the vessel file has none")
        out.append((("icing",), text))
    if cond.passengers is not None and vessel.passengers is None:
        text = "the vessel file has no passengers block (decks the passengers may crowd on)"
        out.append((("passengers",), text))
    if PASSENGER_SET in sets:
        needs = f"the criteria set {PASSENGER_SET} needs"
        if cond.passengers is None:
            out.append((("criteria",), (f"{needs} the number of passengers: passengers: "
                                       "{number: N}")))
        if vessel.passengers is None:
            out.append((("criteria",), (f"{needs} the vessel's passengers block (decks, "
                                       "mass_each, vcg_above_deck)")))
        if vessel.particulars.service_speed is None:
            out.append((("criteria",), (f"{needs} the vessel's particulars.service_speed "
                                       "(knots) for the turning moment of Part A 3.1")))
    return out


def vessel_problems(vessel: Vessel) -> list[str]:
    """Passenger decks and icing areas that lie outside the ship (SPEC.md: physically impossible
    positions are refused): x outside −0.05·Lpp … 1.05·Lpp, |y| > B/2, z below the base or above
    the top of the windage profile."""
    p = vessel.particulars
    top = max(z for _, z in vessel.windage.profile)
    lo_x, hi_x = -0.05 * p.length_bp, 1.05 * p.length_bp
    out = []
    if vessel.passengers is not None:
        for i, d in enumerate(vessel.passengers.decks):
            key = f"passengers.decks[{i}] ({d.name})"
            if not 0.0 <= d.z <= top:
                out.append(f"{key}: z {d.z:g} m is outside the ship (0 to the top of the "
                           f"windage profile, {top:g} m)")
            if d.y_crowded > 0.5 * p.breadth:
                out.append(f"{key}: y_crowded {d.y_crowded:g} m is beyond the side "
                           f"(B/2 = {0.5 * p.breadth:g} m)")
            if d.lcg is not None and not lo_x <= d.lcg <= hi_x:
                out.append(f"{key}: lcg {d.lcg:g} m is outside the ship")
    if vessel.icing is not None:
        ice = vessel.icing
        if not 0.0 <= ice.deck_vcg <= top:
            out.append(f"icing.deck_vcg: {ice.deck_vcg:g} m is outside the ship (0 to "
                       f"{top:g} m)")
        if not lo_x <= ice.deck_lcg <= hi_x:
            out.append(f"icing.deck_lcg: {ice.deck_lcg:g} m is outside the ship")
    return out
