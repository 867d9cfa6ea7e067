"""The results sections of the ship-type allowances and criteria (SPEC.md keys `passengers`,
`icing`, and this project's `timber`); reportgen.assemble_extras fills them. Each is present
only when its subject applies. Units as each field's comment says.
"""

from __future__ import annotations

from pydantic import BaseModel, ConfigDict

F = float
OptF = float | None


class _Section(BaseModel):
    model_config = ConfigDict(extra="forbid", frozen=True)


class TimberItem(_Section):
    name: str
    mass: F  # t, as loaded
    absorbed: F  # t of water absorbed by arrival (0 on departure)


class Timber(_Section):
    arrival: bool
    absorption: F  # fraction of the timber's mass absorbed by arrival
    mass: F  # t of timber deck cargo
    absorbed: F  # t
    items: list[TimberItem]


class PassengerDeck(_Section):
    name: str
    persons: int
    mass: F  # t
    vcg: F  # m above base (deck + vcg_above_deck)
    y: F  # m, transverse centre of the crowded area
    lcg: F  # m from AP
    area_used: F  # m²


class Passengers(_Section):
    number: int
    mass_each: F  # t
    vcg_above_deck: F  # m
    persons_per_m2: F
    mass: F  # t
    lcg: F  # m
    vcg: F  # m
    decks: list[PassengerDeck]
    crowding_moment: F  # t·m
    crowding_arm: OptF  # m
    crowding_heel: OptF  # deg; None: GZ does not reach the arm
    service_speed: OptF  # knots
    speed: OptF  # v0, m/s
    lwl: OptF  # m
    draft: OptF  # d, m (midships)
    kg: OptF  # m, KG corrected for free surface
    turning_moment: OptF  # M_R, kN·m
    turning_arm: OptF  # m
    turning_heel: OptF  # deg


class Icing(_Section):
    allowance: str  # full | half
    fraction: F
    deck_area: F  # m²
    deck_mass: F  # t
    deck_lcg: F  # m
    deck_vcg: F  # m
    side_area: F  # m², projected lateral area of one side above the waterline without ice
    side_area_factor: F  # 1.05: rails, rigging, small objects
    side_moment_factor: F  # 1.10
    side_mass: F  # t, both sides
    side_lcg: F  # m
    side_vcg: F  # m
    mass: F  # t
    lcg: F  # m
    vcg: F  # m
    profile_area_before: F  # m², the profile above the waterline without ice
    items_area: F  # m², the items' wind areas
    wind_area_iced: F  # m², the lateral windage at the iced waterline
    draft_before: F  # m, midships, without ice
    draft_iced: OptF  # m, midships, with ice
