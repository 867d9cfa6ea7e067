"""The results sections of the ship-type allowances and criteria (SPEC.md keys `passengers`,
`icing`, and this project's `timber`); reportgen.assemble_extras fills them. Each is present
only when its subject applies. Units as each field's comment says.
"""

from pydantic import BaseModel, ConfigDict

F = float
OptF = float | None


class _Section(BaseModel):
    model_config = ConfigDict(extra="forbid", frozen=True, defer_build=True)  # see results.py


class TimberItem(_Section):
    name: str  # the item's name
    mass: F  # t, as loaded
    absorbed: F  # t of water absorbed by arrival (0 on departure)


class Timber(_Section):
    arrival: bool  # arrival condition: absorbed water added
    absorption: F  # fraction of the timber's mass absorbed by arrival
    mass: F  # t of timber deck cargo
    absorbed: F  # t
    items: list[TimberItem]  # each timber item


class PassengerDeck(_Section):
    name: str  # the deck's name
    persons: int  # persons placed on it
    mass: F  # t
    vcg: F  # m above base (deck + vcg_above_deck)
    y: F  # m, transverse centre of the crowded area
    lcg: F  # m from AP
    area_used: F  # m², of the deck's area on one side


class Passengers(_Section):
    number: int  # passengers on board
    mass_each: F  # t per person
    vcg_above_deck: F  # m, the passengers' centre above their deck
    persons_per_m2: F  # persons per m² crowded (Part A 3.1)
    mass: F  # t, all passengers
    lcg: F  # m from AP
    vcg: F  # m above base
    decks: list[PassengerDeck]  # each deck used, from the top
    crowding_moment: F  # t·m, Σ mass·y of the crowded passengers (Part A 3.1)
    crowding_arm: OptF  # m, crowding_moment / Δ
    crowding_heel: OptF  # deg (3.1.2); None: arm not reached, or no service_speed
    service_speed: OptF  # knots, the vessel's service_speed
    speed: OptF  # v0, m/s
    lwl: OptF  # m, waterline length
    draft: OptF  # d, m (midships)
    kg: OptF  # m, KG corrected for free surface
    turning_moment: OptF  # M_R, kN·m
    turning_arm: OptF  # m, M_R / (g·Δ)
    turning_heel: OptF  # deg (3.1.3); None: arm not reached, or no service_speed


class Icing(_Section):
    allowance: str  # full | half (Part B chapter 6)
    fraction: F  # share of the full allowance: 1 or 0.5
    deck_area: F  # m², exposed weather decks and gangways
    deck_mass: F  # t, ice on the decks
    deck_lcg: F  # m from AP
    deck_vcg: F  # m above base
    side_area: F  # m², projected lateral area of one side above the waterline without ice
    side_area_factor: F  # 1.05: rails, rigging, small objects
    side_moment_factor: F  # 1.10
    side_mass: F  # t, ice on both sides
    side_lcg: F  # m from AP
    side_vcg: F  # m above base
    mass: F  # t, all ice, one loading line
    lcg: F  # m from AP
    vcg: F  # m above base
    profile_area_before: F  # m², the profile above the waterline without ice
    items_area: F  # m², the items' wind areas
    wind_area_iced: F  # m², the lateral windage at the iced waterline
    draft_before: F  # m, midships, without ice
    draft_iced: OptF  # m, midships, with ice
