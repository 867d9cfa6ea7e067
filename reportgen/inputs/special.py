"""Input blocks of the ship-type allowances (SPEC.md "Cargo and ship-type criteria"): the
vessel's passenger decks and icing areas, the condition's passengers, and the checks that need
both files (a condition may only ask for what the vessel's data give).

Units: t, m, m², knots.
"""

from typing import Annotated

from pydantic import Field

from reportgen.inputs.fields import Model, NonNegative, Num, Positive, Text
from reportgen.inputs.tables import Particulars, ship_x_range

PASSENGER_SET = "is2008.passenger"
TIMBER_SET = "is2008.timber"


class PassengerDeck(Model):
    """A deck the passengers may crowd on: the area available on one side (m²), the deck's
    height above base (m), the transverse centre of that area (m from the centreline) and,
    optionally, its longitudinal centre (m from AP; default midships, stated on the sheet)."""

    name: Text  # the deck's name, printed on the sheet
    area: Positive  # m², on one side
    z: Num  # m above base, the deck
    y_crowded: Annotated[float, Field(gt=0)]  # m, transverse centre of the area on one side
    lcg: Num | None = None  # m from AP (an optional key beyond SPEC)


class VesselPassengers(Model):
    mass_each: Annotated[float, Field(gt=0, le=0.5)] = 0.075  # t per person (Part A 3.1)
    vcg_above_deck: Annotated[float, Field(ge=0, le=3)] = 1.0  # m, standing passengers
    decks: Annotated[list[PassengerDeck], Field(min_length=1)]  # crowded from the top (Part A 3.1)


class ConditionPassengers(Model):
    number: Annotated[int, Field(ge=0, le=100000)]  # passengers on board, crowded at 4 per m²


class VesselIcing(Model):
    """The exposed decks on which ice accretes: their area (m²) and centre (m)."""

    deck_area: NonNegative  # m², exposed weather decks and gangways
    deck_lcg: Num  # m from AP
    deck_vcg: Num  # m above base


def vessel_problems(p: Particulars, passengers: VesselPassengers | None,
                    icing: VesselIcing | None, top_m: float) -> list[str]:
    """Passenger decks and icing areas that lie outside the ship (SPEC.md: physically impossible
    positions are refused): x outside −0.05·Lpp … 1.05·Lpp, |y| > B/2, z below the base or above
    the top of the windage profile (`top_m`); and exposed decks that ice up with their centre
    at or below the summer draught (under water in the deepest condition)."""
    top = top_m
    lo_x, hi_x = ship_x_range(p.length_bp)
    out = []
    if passengers is not None:
        for i, d in enumerate(passengers.decks):
            key = f"passengers.decks[{i}] ({d.name})"
            if not 0.0 <= d.z <= top:
                out.append(f"{key}: z {d.z:g} m is outside the ship (0 to the top of the "
                           f"windage profile, {top:g} m)")
            if d.y_crowded > 0.5 * p.breadth:
                out.append(f"{key}: y_crowded {d.y_crowded:g} m is beyond the side "
                           f"(B/2 = {0.5 * p.breadth:g} m)")
            if d.lcg is not None and not lo_x <= d.lcg <= hi_x:
                out.append(f"{key}: lcg {d.lcg:g} m is outside the ship")
    if icing is not None:
        ice = icing
        if not 0.0 <= ice.deck_vcg <= top:
            out.append(f"icing.deck_vcg: {ice.deck_vcg:g} m is outside the ship (0 to "
                       f"{top:g} m)")
        elif ice.deck_vcg <= p.summer_draft:
            # Ice placed this low would lower KG: the allowance would flatter the condition.
            out.append(f"icing.deck_vcg: {ice.deck_vcg:g} m is not above the summer draught "
                       f"({p.summer_draft:g} m): the exposed decks that ice up lie above the "
                       f"waterline (IS Code 2008 Part B 6.1)")
        if not lo_x <= ice.deck_lcg <= hi_x:
            out.append(f"icing.deck_lcg: {ice.deck_lcg:g} m is outside the ship")
    return out
