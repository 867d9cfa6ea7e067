"""The ship-type allowances of a condition, as stages of the flow (they read the file models,
like reportgen.stages): timber deck cargo's water absorption on arrival, passengers crowded on
their decks, and ice. Each adds loading lines of kind "allowance" (reportgen.allowances); ice
is found at the condition's waterline, so it is added after a first floating position.
"""

from __future__ import annotations

from dataclasses import dataclass

from shapely.geometry import Polygon

from reportgen import allowances
from reportgen.criteria import passenger
from reportgen.criteria.weather import split_profile
from reportgen.errors import InputError
from reportgen.inputs import Case
from reportgen.loading import Line, Loading, totals


@dataclass(frozen=True)
class TimberItem:
    name: str
    mass_t: float
    absorbed_t: float


@dataclass(frozen=True)
class Timber:
    """Timber deck cargo of the condition and, on arrival, the water it absorbed."""

    arrival: bool
    items: tuple[TimberItem, ...]

    @property
    def mass_t(self) -> float:
        return sum(i.mass_t for i in self.items)

    @property
    def absorbed_t(self) -> float:
        return sum(i.absorbed_t for i in self.items)


@dataclass(frozen=True)
class Passengers:
    """The condition's passengers crowded on the decks, and which decks had no lcg."""

    number: int
    mass_each_t: float
    vcg_above_deck_m: float
    crowd: passenger.Crowd
    lcg_defaulted: tuple[str, ...]


@dataclass(frozen=True)
class Icing:
    """The ice of the condition and the windage before and after it."""

    allowance: str  # full | half
    ice: allowances.Ice
    profile_area_m2: float  # the profile's area above the waterline without ice
    items_area_m2: float  # the items' wind_area
    wind_area_iced_m2: float  # profile above the iced waterline + items' wind_area
    draft_before_m: float
    draft_iced_m: float | None = None


@dataclass(frozen=True)
class Extras:
    timber: Timber | None = None
    passengers: Passengers | None = None
    icing: Icing | None = None


def with_lines(loading: Loading, lines: list[Line]) -> Loading:
    """The loading with `lines` added after its own."""
    if not lines:
        return loading
    every = list(loading.lines) + lines
    return Loading(tuple(every), totals(every), loading.counted, loading.rule)


def timber_lines(case: Case) -> tuple[Timber | None, list[Line]]:
    """The condition's timber items; on arrival one line of absorbed water per item, at the
    item's centre (IS Code 2008 Part B 3.4.2.8, reportgen.allowances)."""
    c = case.condition
    items = [it for it in c.items if it.timber]
    if not items:
        return None, []
    arrival = c.condition.arrival
    out, lines = [], []
    for it in items:
        water = allowances.absorbed_water_t(it.mass) if arrival else 0.0
        out.append(TimberItem(it.name, it.mass, water))
        if arrival:
            lines.append(allowances.allowance_line(
                f"{it.name}: water absorbed by arrival", "timber water absorption", water,
                it.lcg, it.vcg, it.tcg))
    return Timber(arrival, tuple(out)), lines


def passenger_lines(case: Case) -> tuple[Passengers | None, list[Line]]:
    """The condition's passengers crowded deck by deck from the top (Part A 3.1), as one line
    on the centreline at their centre (the crowding moment is the heeling moment of 3.1)."""
    cp, vp = case.condition.passengers, case.vessel.passengers
    if cp is None or vp is None:
        return None, []
    mid = 0.5 * case.vessel.particulars.length_bp
    decks = [(d.name, d.area, d.z, d.y_crowded, d.lcg if d.lcg is not None else mid)
             for d in vp.decks]
    crowd = passenger.crowd(cp.number, decks, vp.mass_each, vp.vcg_above_deck)
    used = {d.name for d in crowd.decks}
    defaulted = tuple(d.name for d in vp.decks if d.lcg is None and d.name in used)
    info = Passengers(cp.number, vp.mass_each, vp.vcg_above_deck, crowd, defaulted)
    if crowd.mass <= 0.0:
        return info, []
    line = allowances.allowance_line(f"Passengers, {cp.number} at {vp.mass_each * 1000:g} kg",
                                     "passengers", crowd.mass, crowd.lcg, crowd.vcg)
    return info, [line]


def lateral_above(profile: Polygon, items: list[tuple[float, float, float]], draft_mid_m: float,
                  trim_m: float, lpp_m: float) -> tuple[float, float, float, float]:
    """(profile area above the waterline m², items' area m², centroid x m, centroid z m) of the
    lateral area of one side above the waterline: the profile plus the items' wind areas
    (area m², centroid z m, lcg m)."""
    p = split_profile(profile, draft_mid_m, trim_m, lpp_m)
    a_items = sum(a for a, _, _ in items)
    area = p.area_above_m2 + a_items
    if area <= 0.0:
        raise InputError("windage.profile: no lateral area above the waterline for the ice")
    px = p.x_above_m if p.x_above_m is not None else 0.0
    x = (p.area_above_m2 * px + sum(a * xx for a, _, xx in items)) / area
    z = (p.area_above_m2 * p.z_above_m + sum(a * zz for a, zz, _ in items)) / area
    return p.area_above_m2, a_items, x, z


def icing_of(case: Case, profile: Polygon, draft_mid_m: float, trim_m: float) -> Icing | None:
    """The ice of Part B chapter 6 at the waterline (draft at midships m, trim m) of the
    condition without ice; None for `icing: none`."""
    c, v = case.condition, case.vessel
    if c.icing == "none" or v.icing is None:
        return None
    items = [(it.wind_area, it.wind_z, it.lcg) for it in c.items if it.wind_area]
    a_prof, a_items, x, z = lateral_above(profile, items, draft_mid_m, trim_m,
                                          v.particulars.length_bp)
    ice = allowances.ice(allowances.ICING_FRACTION[c.icing], v.icing.deck_area,
                         v.icing.deck_lcg, v.icing.deck_vcg, a_prof + a_items, x, z)
    return Icing(c.icing, ice, a_prof, a_items, 0.0, draft_mid_m)


def ice_lines(icing: Icing) -> list[Line]:
    ice = icing.ice
    out = []
    if ice.deck_mass_t > 0.0:
        out.append(allowances.allowance_line(f"Ice on exposed decks ({icing.allowance})", "ice",
                                             ice.deck_mass_t, ice.deck_lcg, ice.deck_vcg))
    if ice.side_mass_t > 0.0:
        out.append(allowances.allowance_line(f"Ice on the sides above the waterline "
                                             f"({icing.allowance})", "ice", ice.side_mass_t,
                                             ice.side_lcg, ice.side_vcg))
    return out


def iced_windage(case: Case, profile: Polygon, icing: Icing, draft_mid_m: float,
                 trim_m: float) -> Icing:
    """`icing` with the windage at the iced waterline (the ice's effect on the wind area)."""
    a_prof = split_profile(profile, draft_mid_m, trim_m,
                           case.vessel.particulars.length_bp).area_above_m2
    return Icing(icing.allowance, icing.ice, icing.profile_area_m2, icing.items_area_m2,
                 a_prof + icing.items_area_m2, icing.draft_before_m, draft_mid_m)


def extras_warnings(sets: list[str], ex: Extras) -> list[str]:
    """Warnings beside the verdict about the allowances."""
    out = []
    if "is2008.timber" in sets and ex.timber is None:
        out.append("The timber deck cargo criteria (IS Code 2008 Part A 3.3) are applied, but no "
                   "item is marked timber: true.")
    if ex.passengers is not None and ex.passengers.lcg_defaulted:
        out.append("Passenger decks without lcg ("
                   + ", ".join(ex.passengers.lcg_defaulted)
                   + "): their passengers are placed at midships lengthwise.")
    return out
