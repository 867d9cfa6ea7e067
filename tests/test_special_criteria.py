"""Timber deck cargo (IS Code 2008 Part A 3.3), passenger ships (Part A 3.1) and icing (Part B
chapter 6), checked by hand on the box barge of tests/eval_box.py (closed-form hydrostatics;
the wall-sided formula GZ = sin θ·(GM + ½·BM·tan²θ), Rawson & Tupper, Basic Ship Theory, ch. 4,
valid while tan θ < min(D − T, T)/(B/2)), and against scipy's root finder.

Sources of the numbers: the limits and allowances of SPEC.md "Cargo and ship-type criteria";
the published words of the icing allowance (30 kg/m², 7.5 kg/m² each side, +5 % area, +10 %
static moment) and of the passenger mass and height (75 kg, 1.0 m above deck, resolution
A.749(18) 3.5.2.6-3.5.2.7); the 10 % water absorption of timber on arrival and the 2008
paragraph numbers are recalled from memory (reportgen.allowances says so).
"""

from __future__ import annotations

import math

import pytest
from eval_box import RHO, B, D, L, condition_dict, vessel_dict, wall_sided_gz, write_case
from scipy.optimize import brentq

from reportgen.criteria import passenger
from reportgen.errors import InputError
from reportgen.pipeline import evaluate_path

LIGHT_T, LIGHT_VCG = 1000.0, 4.0  # the box barge's lightship (tests/eval_box.py)
KNOT = 1852.0 / 3600.0  # m/s: 1 nautical mile = 1852 m (definition)


def _item(disp_t: float, kg_m: float, extra_t: float = 0.0, extra_vcg: float = 0.0,
          **keys) -> dict:
    """The one item that, with the lightship (and `extra_t` t added by the tool at
    `extra_vcg`), makes displacement `disp_t` with KG `kg_m` at midships."""
    mass = disp_t - LIGHT_T - extra_t
    vcg = (disp_t * kg_m - LIGHT_T * LIGHT_VCG - extra_t * extra_vcg) / mass
    return {"name": "Cargo", "mass": mass, "lcg": L / 2, "vcg": vcg, **keys}


def _flooding_at(angle_deg: float) -> dict:
    disp = [RHO * L * B * 2.0, RHO * L * B * 12.0]
    return {"displacement": disp, "angle": [angle_deg, angle_deg]}


def _run(tmp_path, items, vessel_extra=None, criteria=("is2008.general",), **cond):
    v = vessel_dict(criteria=tuple(criteria), **(vessel_extra or {}))
    return evaluate_path(write_case(tmp_path, condition_dict(items=items, **cond), v)).to_dict()


def _checks(d: dict) -> dict:
    return {c["id"]: c for c in d["criteria"]}


# --- timber deck cargo, Part A 3.3.2 ----------------------------------------------------------

T8 = 8.0  # draught (m): the wall-sided formula holds to atan(6/8) = 36.9°, beyond θf = 30°
BM8 = B * B / (12 * T8)
KM8 = T8 / 2 + BM8


def _wall_area(gm: float, theta_deg: float, bm: float) -> float:
    """∫0^θ sin φ (GM + ½BM tan²φ) dφ = GM(1 − cos θ) + ½BM(sec θ + cos θ − 2), by hand."""
    c = math.cos(math.radians(theta_deg))
    return gm * (1 - c) + 0.5 * bm * (1 / c + c - 2)


def _timber(tmp_path, gm: float) -> dict:
    disp = RHO * L * B * T8
    return _run(tmp_path, [_item(disp, KM8 - gm, timber=True)],
                {"flooding_angle": _flooding_at(30.0)}, criteria=("is2008.timber",))


# GM at which each criterion sits exactly at its limit, by hand with θf = 30° (so area to
# min(40°, θf) = 30° and the maximum of the credited, still rising curve is GZ(30°)):
GM_AREA = (0.08 - 0.5 * BM8 * (1 / math.cos(math.radians(30)) + math.cos(math.radians(30)) - 2)
           ) / (1 - math.cos(math.radians(30)))  # 3.3.2.1: 0.08 m·rad
GM_GZMAX = 0.25 / math.sin(math.radians(30)) - 0.5 * BM8 * math.tan(math.radians(30)) ** 2


@pytest.mark.parametrize(("cid", "gm_at_limit", "required"), [
    ("timber_area_0_40", GM_AREA, 0.08),  # 3.3.2.1
    ("timber_gz_max", GM_GZMAX, 0.25),  # 3.3.2.2
    ("timber_gm0", 0.10, 0.10),  # 3.3.2.3
])
def test_timber_criterion_at_above_below_limit(tmp_path, cid, gm_at_limit, required):
    at = _checks(_timber(tmp_path, gm_at_limit))[cid]
    assert at["required"] == pytest.approx(required)
    assert at["attained"] == pytest.approx(required, abs=3e-4)
    assert _checks(_timber(tmp_path, gm_at_limit + 0.01))[cid]["passed"]
    assert not _checks(_timber(tmp_path, gm_at_limit - 0.01))[cid]["passed"]


def test_timber_hand_values(tmp_path):
    gm = 0.40
    c = _checks(_timber(tmp_path, gm))
    assert c["timber_area_0_40"]["attained"] == pytest.approx(_wall_area(gm, 30.0, BM8),
                                                              abs=3e-4)
    assert c["timber_gz_max"]["attained"] == pytest.approx(wall_sided_gz(T8, KM8 - gm, 30.0),
                                                           abs=1e-3)
    assert c["timber_gm0"]["attained"] == pytest.approx(gm, abs=1e-6)


def test_timber_arrival_adds_ten_percent_as_its_own_line(tmp_path):
    """Part B 3.4.2.8 (recalled from memory): +10 % of the timber deck cargo on arrival."""
    deck = {"name": "Deck timber", "mass": 500.0, "lcg": 40.0, "vcg": 13.5, "timber": True}
    base = [{"name": "Cargo", "mass": 9000.0, "lcg": 50.0, "vcg": 5.0}, deck]
    dep = _run(tmp_path, base, criteria=("is2008.timber",))
    arr = _run(tmp_path, base, criteria=("is2008.timber",),
               condition={"title": "Arrival", "water_density": RHO, "arrival": True})
    lines = [ln for ln in arr["loading"]["lines"] if ln["kind"] == "allowance"]
    assert len(lines) == 1
    assert (lines[0]["mass"], lines[0]["lcg"], lines[0]["vcg"]) == (50.0, 40.0, 13.5)
    assert arr["loading"]["displacement"] == pytest.approx(dep["loading"]["displacement"] + 50)
    assert arr["timber"]["absorbed"] == pytest.approx(50.0)
    assert dep["timber"]["absorbed"] == 0.0
    assert not [ln for ln in dep["loading"]["lines"] if ln["kind"] == "allowance"]


# --- passenger ships, Part A 3.1 --------------------------------------------------------------


def test_turning_moment_by_hand():
    """3.1.3: M_R = 0.200·v0²/Lwl·Δ·(KG − d/2): 0.2 × 7.2² / 58 × 1100 × (4.0 − 1.25)
    = 0.2 × 51.84 / 58 × 1100 × 2.75 = 540.745 kN·m (worked by hand)."""
    assert passenger.turning_moment_knm(7.2, 58.0, 1100.0, 4.0, 2.5) == pytest.approx(
        540.745, abs=1e-3)


def test_crowding_by_hand():
    """Four persons per m², the highest deck first: 20 m² hold 80, the other 70 go below.
    Mass 150 × 0.075 = 11.25 t; moment 80·0.075·3 + 70·0.075·4 = 18 + 21 = 39 t·m;
    VCG (6 × 11 + 5.25 × 8)/11.25 = 9.6 m (1.0 m above each deck)."""
    decks = [("Lower", 50.0, 7.0, 4.0, 50.0), ("Upper", 20.0, 10.0, 3.0, 50.0)]
    c = passenger.crowd(150, decks, 0.075, 1.0)
    assert [d.persons for d in c.decks] == [80, 70]
    assert c.mass == pytest.approx(11.25)
    assert c.moment_tm == pytest.approx(39.0)
    assert c.vcg == pytest.approx(9.6)
    with pytest.raises(InputError, match="room for 280"):
        passenger.crowd(281, decks, 0.075, 1.0)


PAX_DECK = {"name": "Top deck", "area": 400.0, "z": D, "y_crowded": 4.0}
PAX_VESSEL = {"passengers": {"mass_each": 0.075, "vcg_above_deck": 1.0, "decks": [PAX_DECK]}}


def _pax(tmp_path, number: int, gm: float, speed_kn: float, draft: float = 7.0) -> dict:
    disp = RHO * L * B * draft
    mass = number * 0.075
    kg = draft / 2 + B * B / (12 * draft) - gm
    v = dict(PAX_VESSEL)
    v["particulars"] = {"length_bp": L, "breadth": B, "depth": D, "summer_draft": 10.0,
                        "keel_thickness": 0.02, "bilge": "sharp", "bilge_keel_area": 0.0,
                        "service_speed": speed_kn}
    return _run(tmp_path, [_item(disp, kg, mass, D + 1.0)], v,
                criteria=("is2008.general", "is2008.passenger"),
                passengers={"number": number})


def _wall_sided_heel(draft: float, kg: float, arm: float) -> float:
    """The heel (deg) where the wall-sided GZ equals a constant arm, by scipy's brentq."""
    return brentq(lambda h: wall_sided_gz(draft, kg, h) - arm, 0.0, 40.0, xtol=1e-10)


def test_crowding_heel_against_wall_sided_root(tmp_path):
    d = _pax(tmp_path, 1200, gm=0.8, speed_kn=12.0)
    p = d["passengers"]
    disp = RHO * L * B * 7.0
    assert p["mass"] == pytest.approx(90.0)  # 1200 × 75 kg
    assert p["vcg"] == pytest.approx(D + 1.0)  # Part B: 1.0 m above the deck
    assert p["crowding_moment"] == pytest.approx(90.0 * 4.0)
    assert p["crowding_arm"] == pytest.approx(360.0 / disp, abs=1e-6)  # 6 decimals
    kg = d["hydrostatics"]["kg_fluid"]
    expected = _wall_sided_heel(7.0, kg, 360.0 / disp)
    assert p["crowding_heel"] == pytest.approx(expected, abs=0.02)
    # the turning moment of 3.1.3 at the service speed, and its heel
    v0 = 12.0 * KNOT
    mr = 0.2 * v0 ** 2 / L * disp * (kg - 7.0 / 2)
    assert p["turning_moment"] == pytest.approx(mr, rel=1e-7)  # KG read at 6 decimals
    assert p["turning_arm"] == pytest.approx(mr / (9.81 * disp), abs=1e-6)
    assert p["turning_heel"] == pytest.approx(_wall_sided_heel(7.0, kg, p["turning_arm"]),
                                              abs=0.02)
    c = _checks(d)
    assert c["passenger_crowding_heel"]["passed"] and c["passenger_turning_heel"]["passed"]


def test_passenger_criteria_fail_beyond_ten_degrees(tmp_path):
    """Small GM: the crowding heel passes 10°; a very fast turn does too."""
    d = _pax(tmp_path, 1600, gm=0.05, speed_kn=60.0)
    c = _checks(d)
    assert d["passengers"]["crowding_heel"] > 10.0
    assert not c["passenger_crowding_heel"]["passed"]
    assert d["passengers"]["turning_heel"] > 10.0
    assert not c["passenger_turning_heel"]["passed"]
    assert c["passenger_crowding_heel"]["limit"] == "at_most"


def test_passenger_set_needs_its_inputs(tmp_path):
    v = vessel_dict(criteria=("is2008.general", "is2008.passenger"), **PAX_VESSEL)
    path = write_case(tmp_path, condition_dict(items=[]), v)
    with pytest.raises(InputError, match="number of passengers"):
        evaluate_path(path)


# --- icing, Part B chapter 6 ------------------------------------------------------------------

ICE_VESSEL = {"icing": {"deck_area": L * B, "deck_lcg": L / 2, "deck_vcg": D}}


@pytest.mark.parametrize(("allowance", "f"), [("full", 1.0), ("half", 0.5)])
def test_ice_on_the_box_by_hand(tmp_path, allowance, f):
    """Box at T = 5 m before ice: decks 100 × 16 = 1600 m² → f·30·1600 = f·48 t at z = 14 m;
    each side 100 × (14 − 5) = 900 m² above the waterline, centroid 9.5 m → two sides:
    f·2·7.5·1.05·900 = f·14.175 t at 1.10/1.05·9.5 = 9.952381 m."""
    disp = RHO * L * B * 5.0
    d = _run(tmp_path, [_item(disp, 6.0)], ICE_VESSEL, icing=allowance)
    i = d["icing"]
    assert i["deck_mass"] == pytest.approx(f * 48.0)
    assert i["side_area"] == pytest.approx(900.0)
    assert i["side_mass"] == pytest.approx(f * 14.175)
    assert i["side_vcg"] == pytest.approx(1.10 / 1.05 * 9.5)
    assert i["side_lcg"] == pytest.approx(L / 2)
    ice_t = f * (48.0 + 14.175)
    assert d["loading"]["displacement"] == pytest.approx(disp + ice_t)
    iced_draft = (disp + ice_t) / (RHO * L * B)
    assert i["draft_iced"] == pytest.approx(iced_draft, abs=1e-6)
    assert i["wind_area_iced"] == pytest.approx(L * (D - iced_draft), abs=1e-6)
    kg = (disp * 6.0 + f * 48.0 * D + f * 14.175 * 1.10 / 1.05 * 9.5) / (disp + ice_t)
    assert d["hydrostatics"]["kg_solid"] == pytest.approx(kg, abs=1e-6)


def test_iced_decks_below_the_waterline_are_refused(tmp_path):
    # IS Code 2008 Part B 6.1: the ice allowance is for exposed weather decks and gangways,
    # above the waterline; an ice centre at or below the summer draught would lower KG.
    low = {"icing": {**ICE_VESSEL["icing"], "deck_vcg": 3.0}}  # summer draught 10 m
    path = write_case(tmp_path, condition_dict(items=[], icing="full"), vessel_dict(**low))
    with pytest.raises(InputError, match="not above the summer draught"):
        evaluate_path(path)


def test_icing_needs_the_vessels_areas(tmp_path):
    path = write_case(tmp_path, condition_dict(items=[], icing="full"),
                      vessel_dict())
    with pytest.raises(InputError, match="icing"):
        evaluate_path(path)


def test_a_set_the_vessel_does_not_permit_is_refused(tmp_path):
    path = write_case(tmp_path, condition_dict(items=[], criteria=["is2008.timber"]),
                      vessel_dict())
    with pytest.raises(InputError, match="does not permit"):
        evaluate_path(path)


@pytest.mark.parametrize(("arm", "tcg"), [(0.05, 0.0), (0.12, 0.0), (0.05, -0.02)])
def test_heel_at_arm_is_the_root_scipy_finds(arm, tcg):
    """heel_at_arm on a GZ curve (KN of a wall-sided box, T = 7 m, KG = 6 m, with or without a
    list) against scipy's brentq on the same curve minus the arm."""
    import numpy as np

    from reportgen.stability import KNCurve, gz_curve, odd_spline

    heels = np.arange(0.0, 91.0, 5.0)
    bm = B * B / (12 * 7.0)
    t = np.radians(heels)
    kn = np.sin(t) * (7.0 / 2 + bm + 0.5 * bm * np.tan(np.minimum(t, 1.2)) ** 2)
    curve = gz_curve(KNCurve(odd_spline(heels, kn), 90.0), 6.0, tcg)
    got = passenger.heel_at_arm(curve, arm)
    want = brentq(lambda h: float(curve(h)) - arm, 0.0, 40.0, xtol=1e-12)
    assert got == pytest.approx(want, abs=1e-6)
