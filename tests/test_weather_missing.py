"""The weather criterion when it has no answer (IS Code 2008, Part A, 2.3.2 and figure 2.3.1):
area a runs from θ0 − θ1 to the first intercept of lw2 with GZ, area b from there to θ2 =
min(θf, 50°, θc). Where GZ never reaches lw2, or θ1 does not exist (GM not positive: the
roll period T = 2·C·B/√GM of 2.3.4 has no value), the areas do not exist; θ2, which ends
area b, is then not printed, and the sheet says why and which criterion fails for it.

Data: an analytic GZ curve (GZ = 0.02·sin 2θ m) for the intercepts, and the box barge of
eval_box (closed-form hydrostatics) for the sheets.
"""

from __future__ import annotations

import numpy as np
from eval_box import RHO, B, L, condition_dict, write_case

from reportgen.criteria.weather import Wind, areas
from reportgen.inputs import load_case
from reportgen.pipeline import evaluate
from reportgen.report.render import sheet_html
from reportgen.stability import KNCurve, gz_curve, odd_spline


def _curve(amplitude_m: float = 0.02):
    """GZ = a·sin 2θ with KG = 0 and TCG = 0 (so KN = GZ), on 0..90° every 5°."""
    heels = np.arange(0.0, 91.0, 5.0)
    kn = amplitude_m * np.sin(np.radians(2 * heels))
    return gz_curve(KNCurve(odd_spline(heels, kn), 90.0), 0.0, 0.0)


def test_no_intercept_of_lw2_leaves_no_areas_and_no_theta2():
    # lw1 = 0.015 m is reached (sin 2θ = 0.75 at θ ≈ 24.3°); lw2 = 0.0225 m > 0.02 never is.
    a = areas(_curve(), Wind(100.0, 5.0, 3.0, "half_draft", 0.015, 0.0225), 10.0, 40.0)
    assert abs(a.theta0 - np.degrees(np.arcsin(0.75)) / 2) < 0.3  # spline through 5° steps
    assert a.theta_lw2 is None and a.area_a is None and a.area_b is None
    assert a.theta2 is None and a.missing == ("no_lw2",)


def test_areas_exist_when_lw2_is_reached():
    a = areas(_curve(), Wind(100.0, 5.0, 3.0, "half_draft", 0.008, 0.012), 10.0, 40.0)
    assert a.area_a is not None and a.area_b is not None and a.missing == ()
    assert a.theta2 == 40.0  # min(θf, 50°, θc) with θc ≈ 71.6° (sin 2θ = 0.6)


def _box_case(tmp_path, draft, kg):
    disp = RHO * L * B * draft
    mass = disp - 1000.0  # the box's lightship: 1000 t at VCG 4 m
    item = {"name": "Cargo", "mass": mass, "lcg": L / 2, "vcg": (disp * kg - 4000.0) / mass}
    return load_case(write_case(tmp_path, condition_dict(items=[item])))


def test_sheet_explains_areas_missing_for_a_lolling_box(tmp_path):
    # Box at T = 6 m: KMt = T/2 + B²/(12T) = 6.556 m (closed form); KG 7.5 m: GM < 0.
    case = _box_case(tmp_path, 6.0, 7.5)
    r = evaluate(case)
    wx = r.weather
    assert r.hydrostatics.gm_fluid < 0 and wx.theta1 is None
    assert "no_roll" in wx.areas_missing and wx.theta2 is None
    area = next(c for c in r.criteria if c.id == "weather_area")
    assert not area.passed
    html = sheet_html(case, r)
    assert "Areas a and b do not exist" in html
    assert "roll period T = 2·C·B/√GM" in html
    assert "2.3.1.4) therefore fails" in html


def test_sheet_explains_areas_missing_for_a_capsizing_box(tmp_path):
    # KG 12 m at T = 7 m: KMt = 3.5 + 256/84 = 6.55 m and GZ < 0 at every heel.
    case = _box_case(tmp_path, 7.0, 12.0)
    r = evaluate(case)
    assert r.weather.areas_missing[:2] == ["no_theta0", "no_lw2"]
    html = sheet_html(case, r)
    assert "never reaches the steady wind lever lw1" in html
    assert "Steady heel under wind (2.3.1.2) therefore fail" in html
