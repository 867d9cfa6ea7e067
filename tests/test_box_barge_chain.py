"""The whole chain (inputs -> loading -> floating -> GZ -> criteria -> results) on a box barge
whose answers are known in closed form (tests/eval_box.py states the formulas)."""

from __future__ import annotations

import math

import numpy as np
import pytest
from eval_box import RHO, B, D, L, condition_dict, wall_sided_gz, write_case

from reportgen.pipeline import evaluate_path


def _cargo_for(draft_m: float, kg_m: float, lcg_m: float = L / 2, rho: float = RHO) -> dict:
    """The one cargo item that, with the 1000 t lightship at (50, 4.0), gives draught T (m),
    KG (m) and LCG (m) for the box in water of density rho."""
    disp = rho * L * B * draft_m
    mass = disp - 1000.0
    return {"name": "Cargo", "mass": mass, "lcg": (disp * lcg_m - 1000.0 * 50.0) / mass,
            "vcg": (disp * kg_m - 1000.0 * 4.0) / mass}


def _run(tmp_path, draft, kg, lcg=L / 2, rho=RHO, **cond):
    c = condition_dict(items=[_cargo_for(draft, kg, lcg, rho)], **cond)
    c["condition"]["water_density"] = rho
    return evaluate_path(write_case(tmp_path, c)).to_dict()


def _wall_sided_area(draft: float, kg: float, theta_deg: float) -> float:
    """∫0^θ sin φ (GM + ½ BM tan²φ) dφ = GM (1 − cos θ) + ½ BM (sec θ + cos θ − 2), by hand
    (substitute u = cos φ: ∫ sin³φ/cos²φ dφ = 1/cos φ + cos φ)."""
    t = math.radians(theta_deg)
    bm = B * B / (12 * draft)
    gm = draft / 2 + bm - kg
    return gm * (1 - math.cos(t)) + 0.5 * bm * (1 / math.cos(t) + math.cos(t) - 2)


@pytest.mark.parametrize("draft", [7.0, 7.1, 5.6])  # 7.1: between cross-curve rows
def test_gz_within_1cm_of_wall_sided(tmp_path, draft):
    d = _run(tmp_path, draft, kg=6.0)
    heel = np.array(d["gz"]["heel"])
    gz = np.array(d["gz"]["gz"])
    # Wall-sided formula valid while neither deck edge nor bilge is immersed/emerged:
    # tan θ < min(D − T, T)/(B/2) (box geometry).
    limit = math.degrees(math.atan(min(D - draft, draft) / (B / 2)))
    checked = 0
    for h, g in zip(heel, gz, strict=True):
        if h % 5 == 0 and abs(h) < limit:
            assert g == pytest.approx(wall_sided_gz(draft, 6.0, h), abs=0.01), h
            checked += 1
    assert checked >= 2 * int(limit // 5) + 1 - (2 if limit % 5 == 0 else 0)
    # SPEC.md: the arrays run from at most −30° to at least 60°, every multiple of 5°.
    assert heel[0] <= -30 and heel[-1] >= 60
    assert set(range(-30, 61, 5)) <= {int(h) for h in heel if h == int(h)}


def test_areas_against_hand_integration(tmp_path):
    d = _run(tmp_path, 7.0, kg=6.0)
    crit = {c["id"]: c for c in d["criteria"]}
    # Deck edge and bilge at atan(7/8) = 41.2° > 40°: the closed form holds on 0..40°.
    a30 = _wall_sided_area(7.0, 6.0, 30.0)
    a40 = _wall_sided_area(7.0, 6.0, 40.0)
    assert crit["area_0_30"]["attained"] == pytest.approx(a30, rel=0.02)
    assert crit["area_0_40"]["attained"] == pytest.approx(a40, rel=0.02)
    assert crit["area_30_40"]["attained"] == pytest.approx(a40 - a30, rel=0.02)
    # Tighter than the 2 % asked: the spline through exact KN is far better.
    assert crit["area_0_30"]["attained"] == pytest.approx(a30, rel=0.002)


def test_draughts_trim_and_density(tmp_path):
    # LCG 1.5 m forward of LCB: exact box trim t = 12·T·(LCB − LCG)/L (BML = L²/(12 T),
    # Rawson & Tupper ch. 4), draughts T ± t/2 about LCF = L/2; water of 1.000 t/m³ against a
    # table at 1.025: T = Δ/(ρ_w·L·B).
    d = _run(tmp_path, 6.0, kg=6.0, lcg=51.5, rho=1.0)
    hy = d["hydrostatics"]
    t = 12 * 6.0 * (50.0 - 51.5) / L
    assert hy["trim"] == pytest.approx(t, abs=0.005)
    assert hy["draft_mean"] == pytest.approx(6.0, abs=0.005)
    assert hy["draft_aft"] == pytest.approx(6.0 + t / 2, abs=0.005)
    assert hy["draft_fore"] == pytest.approx(6.0 - t / 2, abs=0.005)
    assert hy["draft_aft_extreme"] == pytest.approx(6.0 + t / 2 + 0.02, abs=0.005)
    # MCT and TPC scale with the water density (same volume): ρ_w·B·L²/1200, ρ_w·L·B/100.
    assert hy["mct"] == pytest.approx(1.0 * B * L * L / 1200, rel=1e-6)
    assert hy["tpc"] == pytest.approx(1.0 * L * B / 100, rel=1e-6)
    # KMt = T/2 + B²/(12 T) (box), interpolated between table rows 5.75 and 6.25 m.
    assert hy["kmt"] == pytest.approx(3.0 + B * B / 72.0, abs=0.01)
    assert hy["gm_fluid"] == pytest.approx(hy["kmt"] - 6.0, abs=1e-5)


def test_weather_theta0_theta1_by_hand(tmp_path):
    from scipy.optimize import brentq

    d = _run(tmp_path, 7.0, kg=6.0)
    w = d["weather"]
    disp = RHO * L * B * 7.0
    # lw1 = P·A·Z/(1000 g Δ), IS Code 2008 2.3.2.2; A = L·(D − T), Z = (D + T)/2 − T/2.
    lw1 = 504 * L * (D - 7.0) * (D / 2) / (1000 * 9.81 * disp)
    theta0 = brentq(lambda h: wall_sided_gz(7.0, 6.0, h) - lw1, 0.0, 30.0)
    # θ1 (2.3.4): d = 7, B/d = 2.2857 -> X1 = 1.00 (≤ 2.4); CB = 1 -> X2 = 1.00 (≥ 0.70);
    # sharp bilge -> k = 0.7; OG = 6 − 7 = −1, r = 0.73 − 0.6/7; GM = 3.5 + 256/84 − 6;
    # C = 0.373 + 0.023·16/7 − 0.043·1; T = 2·C·B/√GM; s between T = 16 (0.044) and 18 (0.038).
    gm = 3.5 + 256 / 84 - 6.0
    c = 0.373 + 0.023 * 16 / 7 - 0.043
    period = 2 * c * 16 / math.sqrt(gm)
    s = 0.044 + (period - 16) / 2 * (0.038 - 0.044)
    r = 0.73 + 0.6 * (-1.0) / 7.0
    theta1 = 109 * 0.7 * 1.0 * 1.0 * math.sqrt(r * s)
    assert 16 < period < 18
    assert w["theta0"] == pytest.approx(theta0, abs=0.3)
    assert w["theta1"] == pytest.approx(theta1, abs=0.3)
    assert w["roll_period"] == pytest.approx(period, rel=1e-3)


def test_pass_and_fail_are_exact(tmp_path):
    """GM0 and area 0–30° either side of their limits by 1 cm of KG: the exact answer."""
    kmt = 3.5 + 256 / 84  # box KMt at T = 7
    hi = _run(tmp_path, 7.0, kg=kmt - 0.15 + 0.01)
    lo = _run(tmp_path, 7.0, kg=kmt - 0.15 - 0.01)
    gm_fail = {c["id"]: c["passed"] for c in hi["criteria"]}["gm0"]
    gm_pass = {c["id"]: c["passed"] for c in lo["criteria"]}["gm0"]
    assert (gm_pass, gm_fail) == (True, False)
    # KG at which the closed-form area 0..30° is exactly 0.055 m·rad (IS Code 2008 2.2.1):
    # area = (KMt − KG)(1 − cos 30°) + ½ BM (sec 30° + cos 30° − 2).
    bm = 256 / 84
    c30 = math.cos(math.radians(30))
    kg_limit = kmt - (0.055 - 0.5 * bm * (1 / c30 + c30 - 2)) / (1 - c30)
    above = {c["id"]: c["passed"] for c in _run(tmp_path, 7.0, kg=kg_limit + 0.01)["criteria"]}
    below = {c["id"]: c["passed"] for c in _run(tmp_path, 7.0, kg=kg_limit - 0.01)["criteria"]}
    assert (below["area_0_30"], above["area_0_30"]) == (True, False)


def test_deck_edge_formula_and_no_flooding_point(tmp_path):
    d = _run(tmp_path, 7.0, kg=6.0)
    # atan((D − T)/(B/2)) (SPEC.md) at T = 7: atan(7/8).
    assert d["angles"]["deck_edge"] == pytest.approx(math.degrees(math.atan(7 / 8)), abs=1e-6)
    assert d["angles"]["deck_edge_source"] == "formula"
    # SPEC.md: with neither openings nor a flooding table θf = 90° and a warning says so.
    assert d["angles"]["flooding"] == 90.0
    assert d["angles"]["flooding_source"] == "none"
    assert any("downflooding" in w for w in d["warnings"])
    assert d["loading"]["displacement"] == pytest.approx(RHO * L * B * 7.0)


def test_criteria_ids_in_spec_order(tmp_path):
    # SPEC.md "Criteria": ids of is2008.general then is2008.weather, with their references.
    d = _run(tmp_path, 7.0, kg=6.0)
    ids = [c["id"] for c in d["criteria"]]
    assert ids == ["area_0_30", "area_0_40", "area_30_40", "gz_30", "gz_max_angle", "gm0",
                   "weather_heel", "weather_area"]
    refs = [c["reference"] for c in d["criteria"]]
    assert refs == ["IS Code 2008, Part A, 2.2.1"] * 3 + [
        "IS Code 2008, Part A, 2.2.2", "IS Code 2008, Part A, 2.2.3",
        "IS Code 2008, Part A, 2.2.4", "IS Code 2008, Part A, 2.3.1.2",
        "IS Code 2008, Part A, 2.3.1.4"]
    assert d["passed"] is all(c["passed"] for c in d["criteria"])


@pytest.mark.parametrize("tcg", [0.2, -0.2])
def test_list_heel_and_side(tmp_path, tcg):
    from scipy.optimize import brentq

    item = _cargo_for(7.0, 6.0)
    item["tcg"] = tcg * RHO * L * B * 7.0 / item["mass"]  # ship's TCG = tcg
    c = condition_dict(items=[item])
    d = evaluate_path(write_case(tmp_path, c)).to_dict()
    # Wall-sided with a list: tan θ (GM + ½ BM tan²θ) = TCG (GZ = 0 with the TCG·cos θ term).
    bm, gm = 256 / 84, 3.5 + 256 / 84 - 6.0
    heel = math.degrees(brentq(lambda t: math.tan(t) * (gm + 0.5 * bm * math.tan(t) ** 2)
                               - abs(tcg), 0, 0.7))
    assert d["hydrostatics"]["heel"] == pytest.approx(math.copysign(heel, tcg), abs=0.01)
    side = "starboard" if tcg > 0 else "port"
    assert d["angles"]["side"] == side and d["assumptions"]["list_side"] == side
    # Areas from upright on the curve with the TCG term: ∫0^30 (GZ_upright − |TCG| cos θ).
    area = _wall_sided_area(7.0, 6.0, 30.0) - abs(tcg) * math.sin(math.radians(30))
    crit = {x["id"]: x for x in d["criteria"]}
    assert crit["area_0_30"]["attained"] == pytest.approx(area, rel=0.002)
    # The gz arrays keep heel positive to starboard: GZ(heel) = 0 at the signed heel.
    g = dict(zip(d["gz"]["heel"], d["gz"]["gz"], strict=True))
    assert g[0.0] == pytest.approx(-tcg, abs=1e-6)


@pytest.mark.parametrize("method", ["actual", "maximum"])
def test_slack_tank_free_surface(tmp_path, method):
    # T1: a 10 m × 10 m box tank, i = 10·10³/12 m⁴ at every sounding, ρ = 1.025:
    # FSM = 854.17 t·m; FSC = FSM/Δ; KG_fluid = KG + FSC (SPEC.md, rise of KG).
    item = _cargo_for(7.0, 6.0)
    tank_mass = 250.0 * 1.025  # 50 %: 250 m³, vcg 1.25 m
    disp = RHO * L * B * 7.0
    item["mass"] -= tank_mass
    item["vcg"] = (disp * 6.0 - 4000.0 - tank_mass * 1.25) / item["mass"]
    c = condition_dict(items=[item], tanks={"T1": {"percent": 50}}, free_surface=method)
    d = evaluate_path(write_case(tmp_path, c)).to_dict()
    fsm = 1e4 / 12 * 1.025
    assert d["loading"]["fsm"] == pytest.approx(fsm, abs=1e-5)
    assert d["hydrostatics"]["kg_solid"] == pytest.approx(6.0, abs=1e-6)
    assert d["hydrostatics"]["fsc"] == pytest.approx(fsm / disp, abs=1e-6)
    assert d["hydrostatics"]["kg_fluid"] == pytest.approx(6.0 + fsm / disp, abs=1e-6)
    line = next(ln for ln in d["loading"]["lines"] if ln["kind"] == "tank")
    assert line["slack"] is True and line["percent"] == pytest.approx(50.0)
    assert line["sounding"] == pytest.approx(2.5) and line["volume"] == pytest.approx(250.0)
