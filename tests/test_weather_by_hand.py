"""The weather criterion (IMO 2008 IS Code, MSC.267(85), Part A 2.3) worked by hand for the
box barge of tests/eval_box.py: L = 100 m, B = 16 m, D = 14 m, T = 7 m, KG = 6 m, sharp bilge,
one opening giving θf = 35°. Every intermediate value is written out below; the GZ curve is the
wall-sided formula, exact for the box while tan θ < 7/8 (θ < 41.2°), which covers the whole of
areas a and b here (θ0 − θ1 = −10.3° to θ2 = 35°).
"""

from __future__ import annotations

import math

import pytest
from eval_box import (
    BOX_STATIONS,
    RHO,
    B,
    D,
    L,
    condition_dict,
    vessel_dict,
    wall_sided_gz,
    write_case,
)
from scipy.optimize import brentq

from reportgen.pipeline import evaluate_path

T, KG = 7.0, 6.0
DISP = RHO * L * B * T  # 11480.0 t
Z_OPENING = T + (B / 2) * math.tan(math.radians(35.0))  # 12.6017 m: tan θf = (z − T)/|y|


def _cond(**extra):
    mass = DISP - 1000.0
    item = {"name": "Cargo", "mass": mass, "lcg": 50.0, "vcg": (DISP * KG - 4000.0) / mass}
    return condition_dict(items=[item], **extra)


def _vessel(**extra):
    # θf from the box's offsets: exact for the wall-sided box before its deck edge immerses.
    return vessel_dict(openings=[{"name": "Vent (S)", "x": 50.0, "y": B / 2, "z": Z_OPENING}],
                       hull={"stations": BOX_STATIONS},
                       **extra)


def _integral_gz(theta_deg: float) -> float:
    """F(θ) = ∫0^θ GZ dφ for the wall-sided curve = GM(1 − cos θ) + ½BM(sec θ + cos θ − 2), an
    even function (GZ is odd), so ∫_α^β GZ = F(β) − F(α) for negative α too."""
    t = math.radians(theta_deg)
    return GM * (1 - math.cos(t)) + 0.5 * BM * (1 / math.cos(t) + math.cos(t) - 2)


BM = B * B / (12 * T)  # 3.047619 m
GM = T / 2 + BM - KG  # 0.547619 m


@pytest.fixture(scope="module")
def weather(tmp_path_factory):
    folder = tmp_path_factory.mktemp("weather")
    return evaluate_path(write_case(folder, _cond(), _vessel())).to_dict()


def test_weather_worked_by_hand(weather):
    w = weather["weather"]
    # 2.3.2.2: A = L·(D − T) = 700 m², centroid (D + T)/2 = 10.5 m, Z = 10.5 − T/2 = 7.0 m.
    assert w["wind_area"] == pytest.approx(700.0, rel=1e-9)
    assert w["wind_z"] == pytest.approx(10.5, abs=1e-6)
    assert w["lever"] == pytest.approx(7.0, abs=1e-6)
    # lw1 = 504·700·7.0/(1000·9.81·11480) = 0.0219288 m; lw2 = 1.5·lw1 = 0.0328933 m.
    lw1 = 504 * 700 * 7.0 / (1000 * 9.81 * DISP)
    assert lw1 == pytest.approx(0.0219288, abs=1e-7)
    assert w["lw1"] == pytest.approx(lw1, abs=1e-6)  # the document keeps 6 decimals
    assert w["lw2"] == pytest.approx(1.5 * lw1, abs=1e-6)
    # 2.3.4: B/d = 2.2857 -> X1 = 1.00; CB = 1 -> X2 = 1.00; sharp bilge -> k = 0.7.
    assert (w["x1"], w["x2"], w["k"]) == (1.0, 1.0, 0.7)
    assert w["b_over_d"] == pytest.approx(16 / 7, rel=1e-6)
    # OG = KG − d = −1.0 m; r = 0.73 + 0.6·(−1)/7 = 0.644286.
    assert w["og"] == pytest.approx(-1.0, abs=1e-6)
    assert w["r"] == pytest.approx(0.644286, abs=1e-6)
    # C = 0.373 + 0.023·(16/7) − 0.043·(100/100) = 0.382571;
    # T = 2·0.382571·16/√0.547619 = 16.5433 s; s = 0.044 − 0.006·(16.5433 − 16)/2 = 0.042370.
    assert w["c"] == pytest.approx(0.382571, abs=1e-6)
    assert w["roll_period"] == pytest.approx(16.5433, abs=1e-3)
    assert w["s"] == pytest.approx(0.042370, abs=1e-5)
    # θ1 = 109·0.7·1.0·1.0·√(0.644286·0.042370) = 12.606°.
    assert w["theta1"] == pytest.approx(12.606, abs=0.01)
    assert w["theta1_formula"] == pytest.approx(12.606, abs=0.01)
    # θ0: sin θ (GM + ½BM tan²θ) = lw1 -> 2.2848°; intercept of lw2 3.4099°.
    theta0 = brentq(lambda h: wall_sided_gz(T, KG, h) - lw1, 0, 30)
    theta_lw2 = brentq(lambda h: wall_sided_gz(T, KG, h) - 1.5 * lw1, 0, 30)
    assert theta0 == pytest.approx(2.2848, abs=1e-3)
    assert w["theta0"] == pytest.approx(theta0, abs=0.05)
    assert w["theta_lw2"] == pytest.approx(theta_lw2, abs=0.05)
    # θ0 − θ1 = 2.2848 − 12.6065 = −10.3216°.
    assert w["theta_start"] == pytest.approx(-10.3216, abs=0.05)
    # θ2 = min(θf = 35°, 50°, θc) = 35°.
    assert weather["angles"]["flooding"] == pytest.approx(35.0, abs=1e-6)
    assert weather["angles"]["flooding_opening"] == "Vent (S)"
    assert w["theta2"] == pytest.approx(35.0, abs=1e-6)
    assert w["thetac"] is None or w["thetac"] > 35.0
    # a = lw2·(θlw2 − θs) − [F(θlw2) − F(θs)] = 0.016176 m·rad;
    # b = F(θ2) − F(θlw2) − lw2·(θ2 − θlw2) = 0.140766 m·rad (radians).
    ts = theta0 - w["theta1"]
    a = 1.5 * lw1 * math.radians(theta_lw2 - ts) - (_integral_gz(theta_lw2) - _integral_gz(ts))
    b = _integral_gz(35.0) - _integral_gz(theta_lw2) - 1.5 * lw1 * math.radians(35 - theta_lw2)
    assert a == pytest.approx(0.016176, abs=2e-6)
    assert b == pytest.approx(0.140766, abs=2e-6)
    assert w["area_a"] == pytest.approx(a, rel=0.02)
    assert w["area_b"] == pytest.approx(b, rel=0.02)


def test_weather_criteria_verdicts(weather):
    crit = {c["id"]: c for c in weather["criteria"]}
    # 2.3.1.2: required = min(16°, 0.8·atan(7/8) = 32.95°) = 16°; attained θ0 = 2.28°: pass.
    heel = crit["weather_heel"]
    assert heel["required"] == pytest.approx(16.0)
    assert heel["attained"] == pytest.approx(2.2848, abs=0.05)
    assert heel["passed"] is True
    assert heel["reference"] == "IS Code 2008, Part A, 2.3.1.2"
    # 2.3.1.4: b = 0.1408 ≥ a = 0.0162: pass; required = a, attained = b.
    area = crit["weather_area"]
    assert area["required"] == pytest.approx(0.016176, rel=0.02)
    assert area["attained"] == pytest.approx(0.140766, rel=0.02)
    assert area["passed"] is True
    assert area["unit"] == "m·rad"
    assert area["margin"] == pytest.approx(area["attained"] - area["required"], abs=2e-6)


def test_weather_heel_limited_by_deck_edge(tmp_path):
    # T = 12 m: deck edge atan(2/8) = 14.04°, required = 0.8·14.04 = 11.23° < 16° (2.3.1.2).
    mass = RHO * L * B * 12.0 - 1000.0
    cond = condition_dict(items=[{"name": "Cargo", "mass": mass, "lcg": 50.0, "vcg": 6.0}])
    d = evaluate_path(write_case(tmp_path, cond)).to_dict()
    heel = {c["id"]: c for c in d["criteria"]}["weather_heel"]
    assert heel["required"] == pytest.approx(0.8 * math.degrees(math.atan(2 / 8)), abs=1e-6)


def test_roll_angle_given_replaces_the_formula(tmp_path):
    cond = _cond(weather={"roll_angle": 20.0, "roll_angle_source": "Model test report MT-1"})
    d = evaluate_path(write_case(tmp_path, cond, _vessel())).to_dict()
    w = d["weather"]
    assert w["theta1"] == 20.0
    assert w["theta1_formula"] == pytest.approx(12.606, abs=0.01)
    assert w["roll_angle_source"] == "Model test report MT-1"
    assert d["assumptions"]["roll_angle_source"] == "Model test report MT-1"
    assert w["theta_start"] == pytest.approx(w["theta0"] - 20.0, abs=1e-9)


def test_range_warning_suggests_model_tests(tmp_path):
    # T = 4 m: B/d = 4.0 ≥ 3.5, outside the range of the tables (SPEC.md, MSC.1/Circ.1200).
    mass = RHO * L * B * 4.0 - 1000.0
    cond = condition_dict(items=[{"name": "Cargo", "mass": mass, "lcg": 50.0, "vcg": 4.5}])
    d = evaluate_path(write_case(tmp_path, cond)).to_dict()
    assert any("MSC.1/Circ.1200" in w and "B/d" in w for w in d["warnings"])
    assert not any("MSC.1/Circ.1200" in w for w in
                   evaluate_path(write_case(tmp_path, _cond(), _vessel())).to_dict()["warnings"])


def test_underwater_centre_lever(tmp_path):
    # A profile with a 2 m deep, 20 m long skeg below the base aft (x 0..20, z −2..0): the
    # underwater lateral area is 100·7 + 20·2 = 740 m², centroid z = (700·3.5 − 40·1)/740.
    prof = [[0.0, -2.0], [20.0, -2.0], [20.0, 0.0], [L, 0.0], [L, D], [0.0, D]]
    ves = _vessel(windage={"profile": prof},
                  calculation={"wind_lever": "underwater_centre"})
    d = evaluate_path(write_case(tmp_path, _cond(), ves)).to_dict()
    z_under = (700 * 3.5 - 40 * 1.0) / 740
    assert d["weather"]["z_method"] == "underwater_centre"
    assert d["weather"]["lever"] == pytest.approx(10.5 - z_under, abs=1e-6)
