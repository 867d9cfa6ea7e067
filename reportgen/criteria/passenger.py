"""IMO 2008 IS Code (resolution MSC.267(85)), Part A, 3.1: passenger ships. The crowding of
passengers to one side and the heel in a turn, each ≤ 10° (SPEC.md, `is2008.passenger`).

Units: mass t, lengths m, speed m/s (knots where named), moments t·m (kN·m where named),
angles deg.

Sources. Crowding: the passengers are placed at four persons per m², deck by deck from the top,
at `mass_each` (75 kg) with their centre of gravity `vcg_above_deck` (1.0 m) above the deck, the
rule of resolution A.749(18) 3.5.2.6 to 3.5.2.9 (published text read: 75 kg, 1.0 m above deck
for standing passengers, "most unfavourable combination of passenger heeling moment and/or
initial metacentric height") carried into the 2008 Code as Part A 3.1.2.1 to 3.1.2.4 (the 2008
numbering, and its words "a value higher than four persons per square metre is not necessary",
recalled from memory). Turning: M_R = 0.200·(v0²/Lwl)·Δ·(KG − d/2) kN·m, SPEC.md and Part A
3.1.3 (the 2008 paragraph number recalled from memory; the formula as SPEC states it).

Reading (stated on the sheet): the Code gives the heeling moments only. The heel is found
where the GZ curve, towards the side of any list, first reaches the heeling arm M/Δ (crowding)
or M_R/(g·Δ) (turning), each held constant with heel: of the two common practices (constant
arm, or arm × cos θ) the constant arm gives the larger heel (common practice, not from the
Code). KG in M_R is KG corrected for free surface, the larger value; d is the midships draught.
"""

from __future__ import annotations

from dataclasses import dataclass

from reportgen.criteria.core import Check, State
from reportgen.errors import InputError
from reportgen.stability import GZCurve, crossings

SET = "is2008.passenger"
REF_CROWDING = "IS Code 2008, Part A, 3.1.2"
REF_TURNING = "IS Code 2008, Part A, 3.1.3"

HEEL_LIMIT_DEG = 10.0  # 3.1.2 and 3.1.3
PERSONS_PER_M2 = 4.0  # 3.1.2.4 (recalled), SPEC.md
TURNING_FACTOR = 0.200  # 3.1.3: M_R = 0.200·v0²/Lwl·Δ·(KG − d/2)
GRAVITY_M_S2 = 9.81  # kN per t
KNOT_M_S = 1852.0 / 3600.0  # one knot in m/s (1 nautical mile = 1852 m)


@dataclass(frozen=True)
class DeckCrowd:
    """Passengers placed on one deck: persons, mass t, VCG m, transverse centre m, LCG m."""

    name: str
    persons: int
    mass: float
    vcg: float
    y: float
    lcg: float
    area_used_m2: float


@dataclass(frozen=True)
class Crowd:
    """All passengers crowded to one side: the decks used, total mass t, centre m and the
    crowding heeling moment t·m (Σ mass·y)."""

    decks: tuple[DeckCrowd, ...]
    mass: float
    lcg: float
    vcg: float
    moment_tm: float


def crowd(number: int, decks: list[tuple[str, float, float, float, float]], mass_each_t: float,
          vcg_above_deck_m: float, persons_per_m2: float = PERSONS_PER_M2) -> Crowd:
    """Place `number` passengers at `persons_per_m2` on decks (name, area m² on one side, deck
    z m, y_crowded m, lcg m), the highest deck first, each filled before the next.
    InputError when the decks cannot hold them all."""
    left = number
    placed: list[DeckCrowd] = []
    for name, area, z, y, lcg in sorted(decks, key=lambda d: -d[2]):
        if left <= 0:
            break
        room = int(area * persons_per_m2 + 1e-9)
        n = min(left, room)
        if n > 0:
            placed.append(DeckCrowd(name, n, n * mass_each_t, z + vcg_above_deck_m, y, lcg,
                                    n / persons_per_m2))
        left -= n
    if left > 0:
        room = sum(int(d[1] * persons_per_m2 + 1e-9) for d in decks)
        raise InputError(f"passengers.number: {number} passengers do not fit on the passenger "
                         f"decks at {persons_per_m2:g} persons per m² (room for {room})")
    mass = sum(d.mass for d in placed)
    if mass <= 0.0:
        return Crowd((), 0.0, 0.0, 0.0, 0.0)
    return Crowd(tuple(placed), mass, sum(d.mass * d.lcg for d in placed) / mass,
                 sum(d.mass * d.vcg for d in placed) / mass,
                 sum(d.mass * d.y for d in placed))


def turning_moment_knm(speed_m_s: float, lwl_m: float, displacement_t: float, kg_m: float,
                       draft_m: float) -> float:
    """M_R = 0.200·(v0²/Lwl)·Δ·(KG − d/2), kN·m (IS Code 2008 Part A 3.1.3; SPEC.md)."""
    return TURNING_FACTOR * speed_m_s ** 2 / lwl_m * displacement_t * (kg_m - 0.5 * draft_m)


def heeling_arm_m(moment_tm: float, displacement_t: float) -> float:
    """Heeling arm = heeling moment / Δ (t·m / t = m)."""
    return moment_tm / displacement_t


def heel_at_arm(curve: GZCurve, arm_m: float) -> float | None:
    """The first angle (deg) from upright, towards the curve's side, where GZ reaches the
    constant heeling arm `arm_m`; 0 for an arm ≤ GZ upright; None when GZ never reaches it
    within the table."""
    if float(curve(0.0)) >= arm_m:
        return 0.0
    up = crossings(curve, arm_m, 0.0, curve.heel_max_deg, "up")
    return up[0] if up else None


@dataclass(frozen=True)
class PassengerHeel:
    """The two heeling cases of 3.1 at one KG: moments, arms (m) and heels (deg, None when GZ
    does not reach the arm)."""

    crowding_moment_tm: float
    crowding_arm_m: float
    crowding_heel_deg: float | None
    speed_knots: float
    speed_m_s: float
    lwl_m: float
    draft_m: float
    kg_m: float
    turning_moment_knm: float
    turning_arm_m: float
    turning_heel_deg: float | None


def passenger_heel(curve: GZCurve, crowd_moment_tm: float, displacement_t: float,
                   speed_knots: float, lwl_m: float, draft_m: float,
                   kg_fluid_m: float) -> PassengerHeel:
    """Both heeling cases on `curve` (towards the side of any list)."""
    v0 = speed_knots * KNOT_M_S
    arm_p = heeling_arm_m(crowd_moment_tm, displacement_t)
    mr = turning_moment_knm(v0, lwl_m, displacement_t, kg_fluid_m, draft_m)
    arm_r = heeling_arm_m(mr / GRAVITY_M_S2, displacement_t)
    return PassengerHeel(crowd_moment_tm, arm_p, heel_at_arm(curve, arm_p), speed_knots, v0,
                         lwl_m, draft_m, kg_fluid_m, mr, arm_r, heel_at_arm(curve, arm_r))


def _at_most(cid: str, title: str, ref: str, attained: float | None) -> Check:
    passed = attained is not None and attained <= HEEL_LIMIT_DEG
    return Check(cid, title, ref, HEEL_LIMIT_DEG, attained, "deg", passed, SET,
                 limit="at_most")


def passenger_crowding_heel(s: State) -> Check:
    """3.1.2: heel from the crowding of passengers to one side ≤ 10°."""
    return _at_most("passenger_crowding_heel", "Heel from passengers crowding to one side",
                    REF_CROWDING, s.passengers.crowding_heel_deg)


def passenger_turning_heel(s: State) -> Check:
    """3.1.3: heel in a turn at the service speed ≤ 10°."""
    return _at_most("passenger_turning_heel", "Heel in a turn at the service speed",
                    REF_TURNING, s.passengers.turning_heel_deg)


def checks(s: State) -> list[Check]:
    return [passenger_crowding_heel(s), passenger_turning_heel(s)]
