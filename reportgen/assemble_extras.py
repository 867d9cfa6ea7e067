"""The results sections of the ship-type allowances (reportgen.results_special) filled from
the stages' values (reportgen.extras, the passenger heels of Part A 3.1)."""

from __future__ import annotations

from reportgen import allowances
from reportgen.criteria import passenger
from reportgen.criteria.passenger import PassengerHeel
from reportgen.extras import Extras


def timber_section(ex: Extras) -> dict | None:
    t = ex.timber
    if t is None:
        return None
    return {"arrival": t.arrival, "absorption": allowances.TIMBER_ABSORPTION, "mass": t.mass_t,
            "absorbed": t.absorbed_t,
            "items": [{"name": i.name, "mass": i.mass_t, "absorbed": i.absorbed_t}
                      for i in t.items]}


def passengers_section(ex: Extras, heel: PassengerHeel | None) -> dict | None:
    p = ex.passengers
    if p is None:
        return None
    c = p.crowd
    out = {"number": p.number, "mass_each": p.mass_each_t, "vcg_above_deck": p.vcg_above_deck_m,
           "persons_per_m2": passenger.PERSONS_PER_M2, "mass": c.mass, "lcg": c.lcg,
           "vcg": c.vcg,
           "decks": [{"name": d.name, "persons": d.persons, "mass": d.mass, "vcg": d.vcg,
                      "y": d.y, "lcg": d.lcg, "area_used": d.area_used_m2} for d in c.decks],
           "crowding_moment": c.moment_tm}
    h = heel
    out.update({"crowding_arm": h and h.crowding_arm_m, "crowding_heel": h and h.crowding_heel_deg,
                "service_speed": h and h.speed_knots, "speed": h and h.speed_m_s,
                "lwl": h and h.lwl_m, "draft": h and h.draft_m, "kg": h and h.kg_m,
                "turning_moment": h and h.turning_moment_knm,
                "turning_arm": h and h.turning_arm_m, "turning_heel": h and h.turning_heel_deg})
    return out


def icing_section(ex: Extras) -> dict | None:
    i = ex.icing
    if i is None:
        return None
    ice = i.ice
    return {"allowance": i.allowance, "fraction": ice.fraction, "deck_area": ice.deck_area_m2,
            "deck_mass": ice.deck_mass_t, "deck_lcg": ice.deck_lcg, "deck_vcg": ice.deck_vcg,
            "side_area": ice.side_area_m2, "side_area_factor": allowances.RIGGING_AREA_FACTOR,
            "side_moment_factor": allowances.RIGGING_MOMENT_FACTOR,
            "side_mass": ice.side_mass_t, "side_lcg": ice.side_lcg, "side_vcg": ice.side_vcg,
            "mass": ice.mass_t, "lcg": ice.lcg, "vcg": ice.vcg,
            "profile_area_before": i.profile_area_m2, "items_area": i.items_area_m2,
            "wind_area_iced": i.wind_area_iced_m2, "draft_before": i.draft_before_m,
            "draft_iced": i.draft_iced_m}
