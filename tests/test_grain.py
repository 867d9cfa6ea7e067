"""Grain in bulk (International Grain Code, MSC.23(59)): a box hold in a box barge, worked by
hand. The barge (tests/eval_box.py) is 100 × 16 × 14 m; its GZ up to 40° at T = 7 m is the
wall-sided formula (deck edge and bilge at atan(7/8) = 41.2°; Rawson & Tupper, Basic Ship
Theory, ch. 4). The hold is a box x 30..70, y −4..4, z 1..11 m (l = 40, b = 8, depth 10)."""

from __future__ import annotations

import math

import pytest
from eval_box import RHO, B, L, condition_dict, vessel_dict, wall_sided_gz, write_case
from scipy.integrate import quad
from scipy.optimize import brentq
from shapely.geometry import box

from reportgen import grainshift
from reportgen.errors import InputError
from reportgen.pipeline import evaluate_path

HOLD_L, HOLD_B, HOLD_D, HOLD_Z0 = 40.0, 8.0, 10.0, 1.0
SF = 1.25  # m³/t
B15 = 1.12  # B 1.5 (recalled from memory): partly filled, total = 1.12 × transverse moment
TAN25 = math.tan(math.radians(25.0))  # B 5.1 (recalled from memory): surface shifts to 25°
T, KG = 7.0, 6.0
DISP = RHO * L * B * T  # 11480 t


def _partly_table() -> dict:
    """The hold's partly-filled table at every metre of grain: volume l·b·s, centre (50,
    z0 + s/2), VHM by the B 5 surface shift (grainshift, checked against the closed form
    below) × 1.12 (B 1.5)."""
    section = box(-HOLD_B / 2, HOLD_Z0, HOLD_B / 2, HOLD_Z0 + HOLD_D)
    levels = [float(s) for s in range(11)]
    return {"volume": [HOLD_L * HOLD_B * s for s in levels],
            "lcg": [50.0] * 11, "vcg": [HOLD_Z0 + s / 2 for s in levels],
            "vhm": [B15 * HOLD_L * grainshift.partly_moment_m3(section, HOLD_Z0 + s)
                    for s in levels]}


def _vessel(scale_vhm: float = 1.0) -> dict:
    table = _partly_table()
    table["vhm"] = [v * scale_vhm for v in table["vhm"]]
    hold = {"id": "H1", "name": "No.1 hold", "partly": table,
            "filled": {"volume": HOLD_L * HOLD_B * HOLD_D, "lcg": 50.0,
                       "vcg": HOLD_Z0 + HOLD_D / 2, "vhm": 100.0}}
    return vessel_dict(criteria=("grain.2008",), grain={"compartments": [hold]})


def _run(tmp_path, level_m: float = 5.0, scale_vhm: float = 1.0, **grain_extra) -> dict:
    """The barge at T = 7 m and KG 6.0 m with the hold filled to `level_m` of grain."""
    volume = HOLD_L * HOLD_B * level_m
    mass_grain, vcg_grain = volume / SF, HOLD_Z0 + level_m / 2
    rest = DISP - 1000.0 - mass_grain
    item = {"name": "Ballast and stores", "mass": rest, "lcg": 50.0,
            "vcg": (DISP * KG - 1000.0 * 4.0 - mass_grain * vcg_grain) / rest}
    grain = {"stowage_factor": SF, "compartments": {"H1": {"volume": volume}}}
    grain.update(grain_extra)
    cond = condition_dict(items=[item], grain=grain)
    return evaluate_path(write_case(tmp_path, cond, _vessel(scale_vhm))).to_dict()


# --- B 5: the surface shift of a partly filled box hold -------------------------------------


def test_box_hold_vhm_closed_form():
    """B 5.1 (recalled from memory): the level surface turns to 25° about the centreline; the
    wedge ∫ y·(y·tan 25°) dy over −b/2..b/2 = b³·tan 25°/12 m³ per metre, valid while
    (b/2)·tan 25° = 1.865 m ≤ the grain depth and the headroom. × l = 40 m, × 1.12 (B 1.5,
    the vertical shift of the surface, recalled from memory)."""
    by_hand = 1.12 * 40.0 * 8.0 ** 3 * TAN25 / 12.0  # = 891.33 m⁴
    assert by_hand == pytest.approx(891.33, abs=0.01)
    section = box(-4.0, 1.0, 4.0, 11.0)
    for level in (3.0, 6.0, 9.0):  # grain 2, 5 and 8 m deep: the wedge clears both
        assert B15 * 40.0 * grainshift.partly_moment_m3(section, level) == pytest.approx(
            by_hand, rel=1e-9)
    # Shallow grain (0.5 m deep): the wedge is cut by the floor, so the moment is smaller.
    assert grainshift.partly_moment_m3(section, 1.5) < by_hand / (1.12 * 40.0)


def test_trimmed_void_shift_by_hand():
    """B 1.1.1 and B 2 (recalled from memory): a void Vd = 0.43 m deep under a flat deckhead
    10 m wide becomes a triangle against the deckhead with its surface at 15°, same area:
    ½·x²·tan 15° = 10·0.43 gives x; the void's centroid travels from y = 0 to 5 − x/3, so the
    grain's moment per metre is 4.3·(5 − x/3) m³."""
    x = math.sqrt(2 * 10 * 0.43 / math.tan(math.radians(15.0)))
    section = box(-5.0, 0.0, 5.0, 10.0)
    got = grainshift.shift_moment_m3(section, grainshift.trimmed_grain(section, 0.43), 15.0)
    assert got == pytest.approx(4.3 * (5.0 - x / 3.0), rel=1e-9)


# --- A 7 on the box barge ------------------------------------------------------------------


def _arm(lambda0: float, heel_deg: float) -> float:
    """A 7 figure: λ straight from λ0 at 0° to 0.8·λ0 at 40°."""
    return lambda0 * (1.0 - 0.2 * heel_deg / 40.0)


def test_heeling_arm_heel_and_residual_area_by_hand(tmp_path):
    d = _run(tmp_path)
    g = d["grain"]
    vhm = 1.12 * 40.0 * 8.0 ** 3 * TAN25 / 12.0
    # Mass of grain = volume / SF (B 1.4 / A 2.6): 1600 m³ / 1.25 = 1280 t.
    line = next(ln for ln in d["loading"]["lines"] if ln["kind"] == "grain")
    assert line["mass"] == pytest.approx(1280.0, rel=1e-12)
    assert line["fsm"] == 0.0  # grain has no free surface of its own
    assert d["loading"]["displacement"] == pytest.approx(DISP, rel=1e-12)
    # λ0 = VHM/(SF·Δ), λ40 = 0.8·λ0 (A 7 figure notes)
    lam0 = vhm / (SF * DISP)
    assert g["vhm"] == pytest.approx(vhm, rel=1e-6)
    assert g["heeling_moment"] == pytest.approx(vhm / SF, rel=1e-6)
    assert g["lambda0"] == pytest.approx(lam0, abs=1e-6)  # the document rounds to 1e-6
    assert g["lambda40"] == pytest.approx(0.8 * lam0, abs=1e-6)
    # Angle of heel: wall-sided GZ = the straight arm, solved by scipy's brentq.
    heel = brentq(lambda h: wall_sided_gz(T, KG, h) - _arm(lam0, h), 0.0, 30.0)
    assert g["heel"] == pytest.approx(heel, abs=0.02)
    # Residual area (A 7.1.2): GZ − λ grows to 40° (GZ rises, λ falls), θf = 90° here, so it
    # runs from the heel to 40°; the integral of the wall-sided GZ in closed form (see
    # test_box_barge_chain) less the trapezoid under the straight arm, in radians.
    bm, gm = B * B / (12 * T), T / 2 + B * B / (12 * T) - KG

    def ws_area(a_deg: float) -> float:
        t = math.radians(a_deg)
        return gm * (1 - math.cos(t)) + 0.5 * bm * (1 / math.cos(t) + math.cos(t) - 2)

    trapezoid = 0.5 * (_arm(lam0, heel) + _arm(lam0, 40.0)) * math.radians(40.0 - heel)
    residual = ws_area(40.0) - ws_area(heel) - trapezoid
    assert g["residual_to"] == pytest.approx(40.0)
    assert g["residual_to_reason"] == "forty"
    assert g["residual_area"] == pytest.approx(residual, abs=5e-4)
    # the same integral by scipy's quad, to check the closed form itself
    assert residual == pytest.approx(
        quad(lambda h: wall_sided_gz(T, KG, h) - _arm(lam0, h), heel, 40.0)[0]
        * math.pi / 180.0, rel=1e-9)
    crit = {c["id"]: c for c in d["criteria"]}
    assert [c["id"] for c in d["criteria"]] == ["grain_heel", "grain_residual_area",
                                                 "grain_gm0"]
    assert crit["grain_heel"]["required"] == 12.0  # deck edge at 41.2° is not the lesser
    assert crit["grain_heel"]["reference"].endswith("A 7.1.1")
    assert crit["grain_gm0"]["attained"] == pytest.approx(gm, abs=0.01)
    assert crit["grain_gm0"]["required"] == 0.30  # A 7.1.3
    assert crit["grain_residual_area"]["required"] == 0.075  # A 7.1.2
    assert d["passed"] is True


def test_allowable_moment_is_the_limit(tmp_path):
    """The allowable heeling moment reproduces the limit it reports: with the VHM scaled so
    that the moment is just under it every grain criterion passes; just over it one fails."""
    base = _run(tmp_path)["grain"]
    allowable, actual = base["allowable_moment"], base["heeling_moment"]
    assert base["moment_margin"] == pytest.approx(allowable - actual, abs=1e-5)
    assert allowable > actual
    under = _run(tmp_path, scale_vhm=allowable / actual * (1 - 1e-5))
    over = _run(tmp_path, scale_vhm=allowable / actual * (1 + 1e-4))
    assert under["passed"] is True
    assert over["passed"] is False
    assert over["grain"]["heeling_moment"] > allowable
    # Here the heel limit governs: at the allowable moment the angle of heel is 12°.
    failed = [c["id"] for c in over["criteria"] if not c["passed"]]
    assert failed == ["grain_heel"]
    assert under["grain"]["heel"] == pytest.approx(12.0, abs=1e-3)


def test_mass_given_and_filled_states(tmp_path):
    """A partly filled compartment given by mass: volume = mass·SF (A 2.6)."""
    d = _run(tmp_path, level_m=5.0, compartments={"H1": {"mass": 1280.0}})
    line = next(ln for ln in d["loading"]["lines"] if ln["kind"] == "grain")
    assert line["volume"] == pytest.approx(1600.0)
    c = d["grain"]["compartments"][0]
    assert (c["state"], c["vhm"]) == ("partly", pytest.approx(891.33, abs=0.01))


@pytest.mark.parametrize("grain, message", [
    ({"stowage_factor": SF, "compartments": {"H9": {"volume": 10.0}}}, "unknown grain"),
    ({"stowage_factor": SF, "compartments": {"H1": {"volume": 99999.0}}}, "outside"),
    ({"stowage_factor": SF, "compartments": {"H1": {"filled": "untrimmed"}}},
     "filled_untrimmed_vhm"),
    ({"stowage_factor": SF, "compartments": {"H1": {"volume": 5.0, "mass": 4.0}}},
     "exactly one"),
])
def test_bad_grain_input_is_refused(tmp_path, grain, message):
    cond = condition_dict(items=[], grain=grain)
    with pytest.raises(InputError, match=message):
        evaluate_path(write_case(tmp_path, cond, _vessel()))


def test_grain_set_without_grain_is_refused(tmp_path):
    with pytest.raises(InputError, match="needs the condition's grain"):
        evaluate_path(write_case(tmp_path, condition_dict(items=[]), _vessel()))


# --- A 7.1.2: the end of the residual area -------------------------------------------------


def _hump_curve(amp_m: float = 0.6):
    """An analytic GZ = A·sin 3θ (KG 0, TCG 0): its peak at 30° lies inside 40°; KN sampled
    every degree and splined as the cross curves are (reportgen.stability.odd_spline)."""
    import numpy as np

    from reportgen.stability import KNCurve, gz_curve, odd_spline

    heel = np.arange(0.0, 91.0)
    kn = amp_m * np.sin(np.radians(3 * heel))
    return gz_curve(KNCurve(odd_spline(heel, kn), 90.0), 0.0, 0.0)


def test_residual_area_ends_at_greatest_difference_or_flooding():
    from reportgen import grain

    amp, lam0 = 0.6, 0.2
    curve = _hump_curve(amp)
    heel = brentq(lambda h: amp * math.sin(math.radians(3 * h)) - _arm(lam0, h), 0.0, 30.0)
    # d/dθ (A sin 3θ − λ0(1 − θ/200)) = 0 with θ in degrees:
    # 3A·cos 3θ·π/180 + λ0/200 = 0  ->  θ = acos(−λ0/200·180/(3Aπ))/3, just past the 30° peak.
    peak = math.degrees(math.acos(-lam0 / 200 * 180 / (3 * amp * math.pi))) / 3
    assert 30.0 < peak < 31.0

    def residual(end: float) -> float:
        # ∫ A sin 3θ dθ = A/3·(cos 3a − cos 3b), θ in radians; less the trapezoid under λ
        a, b = math.radians(heel), math.radians(end)
        gz = amp / 3 * (math.cos(3 * a) - math.cos(3 * b))
        return gz - 0.5 * (_arm(lam0, heel) + _arm(lam0, end)) * (b - a)

    g = grain.stability(curve, lam0, flooding_deg=90.0, deck_edge_deg=45.0)
    assert g.heel_deg == pytest.approx(heel, abs=1e-3)
    assert (g.residual_to_reason, g.residual_to_deg) == ("max_difference",
                                                         pytest.approx(peak, abs=0.01))
    assert g.residual_area == pytest.approx(residual(peak), abs=1e-4)
    g = grain.stability(curve, lam0, flooding_deg=25.0, deck_edge_deg=45.0)
    assert (g.residual_to_reason, g.residual_to_deg) == ("flooding", 25.0)
    assert g.residual_area == pytest.approx(residual(25.0), abs=1e-4)
    # No heeling arm: upright (GZ(0°) = 0 is not below the arm), the area to the GZ peak.
    assert grain.heel_angle_deg(curve, 0.0) == 0.0
    assert grain.stability(curve, 0.0, 90.0, 45.0).residual_area == pytest.approx(
        amp / 3 * (1 - math.cos(math.radians(90.0))), abs=1e-4)  # ∫0..30° A sin 3θ = A/3
    # A 7.1.1: the deck-edge angle caps the heel limit when it is below 12°.
    assert grain.stability(curve, lam0, 90.0, deck_edge_deg=9.0).heel_limit_deg == 9.0
    # GZ never reaching the arm: no angle of heel, no residual area.
    g = grain.stability(curve, 0.8, 90.0, 45.0)  # above max GZ/(1 − θ/200)
    assert (g.heel_deg, g.residual_area) == (None, None)
    assert not grain.passes(g)


def test_sheet_has_the_grain_section(tmp_path):
    """The sheet's grain section names each paragraph of A 7.1 it applies and prints the
    figure with the residual area's value in its legend (the same value as the results)."""
    from reportgen.inputs import load_case
    from reportgen.pipeline import evaluate
    from reportgen.report.render import sheet_html

    _run(tmp_path)  # writes box.yaml and cond.yaml
    case = load_case(tmp_path / "cond.yaml")
    results = evaluate(case)
    html = sheet_html(case, results)
    assert "5. Grain in bulk (International Grain Code)" in html
    assert "6. Assumptions" in html
    for ref in ("A 7.1.1", "A 7.1.2", "A 7.1.3", "B 1.5"):
        assert ref in html
    import base64
    import re

    svg = base64.b64decode(re.search(r'id="figure-grain">\s*<img src="data:image/svg\+xml;'
                                     r'base64,([^"]+)"', html).group(1)).decode()
    assert f"Residual area = {results.grain.residual_area:.4f} m·rad" in svg


@pytest.mark.parametrize("change, message", [
    (lambda h: h["partly"].update(vhm=h["partly"]["vhm"][:-1]), "same number of rows"),
    (lambda h: h["filled"].update(volume=100.0), "exceeds the filled volume"),
    (lambda h: h["filled"].update(vcg=-1.0), "outside the ship"),
    (lambda h: h["partly"].update(lcg=[500.0] * 11), "outside the ship"),
])
def test_bad_grain_data_in_the_vessel_file_is_refused(tmp_path, change, message):
    vessel = _vessel()
    change(vessel["grain"]["compartments"][0])
    grain = {"stowage_factor": SF, "compartments": {"H1": {"volume": 1600.0}}}
    with pytest.raises(InputError, match=message):
        evaluate_path(write_case(tmp_path, condition_dict(items=[], grain=grain), vessel))


def test_hold_data_from_a_box_hull_by_hand():
    """reportgen.hull.grainholds (the demo ship's grain data) on a box hull 100 × 16 × 14 m and
    the box hold of this file: volume l·b·s and centre (50, z0 + s/2) by hand; the partly-filled
    VHM at 5 m of grain is the closed form of B 5.1 × 1.12 (B 1.5) above; a filled, trimmed hold
    with a 0.43 m void over the whole deckhead (no hatchway) is the void shift worked by hand in
    test_trimmed_void_shift_by_hand, × the length."""
    import numpy as np
    from hull_helpers import box_stations

    from reportgen.hull.compartments import TankBox
    from reportgen.hull.grainholds import hold_grain, void_depth_m
    from reportgen.hull.sections import hull_from_stations

    hull = hull_from_stations(box_stations(100.0, 16.0, 14.0))
    hold = TankBox(30.0, 70.0, -4.0, 4.0, 1.0, 11.0)
    g = hold_grain(hull, hold, np.array([0.0, 5.0, 10.0]), void_depth_m(430.0, 600.0),
                   hatch_half_breadth_m=4.0)  # hatchway as wide as the hold: 150 mm void
    p = g["partly"]
    assert p["volume"] == pytest.approx([0.0, 1600.0, 3200.0], abs=1e-6)
    assert p["lcg"][1:] == pytest.approx([50.0, 50.0], abs=1e-9)
    assert p["vcg"][1:] == pytest.approx([3.5, 6.0], abs=1e-9)
    assert p["vhm"][1] == pytest.approx(1.12 * 40.0 * 8.0 ** 3 * TAN25 / 12.0, rel=1e-6)
    assert p["vhm"][2] == pytest.approx(0.0, abs=1e-6)  # full to the deckhead: nothing shifts
    # B 1.1.2: a 150 mm void across the 8 m hatchway; shifted to 15° it becomes a triangle
    # ½·x²·tan 15° = 8·0.15 against the deckhead (the void-shift of the test above).
    x = math.sqrt(2 * 8 * 0.15 / math.tan(math.radians(15.0)))
    assert g["filled"]["vhm"] == pytest.approx(40.0 * 1.2 * (4.0 - x / 3.0), rel=1e-6)
    assert g["filled"]["volume"] == pytest.approx(3200.0)
    # B 1.1.1: Vd = Vd1 + 0.75·(d − 600) mm, never below 100 mm
    assert void_depth_m(430.0, 800.0) == pytest.approx(0.58)
    assert void_depth_m(50.0, 500.0) == pytest.approx(0.10)


def test_heeling_arm_is_the_straight_line_of_figure_a7():
    """Figure A 7 and its notes: λ0 at 0°, λ40 = 0.8·λ0 at 40°, a straight line between (here
    against numpy's linear interpolation between the two points); its area by the trapezoid
    equals scipy's quad."""
    import numpy as np

    from reportgen import grain

    heel = np.array([0.0, 7.5, 12.0, 25.0, 40.0])
    for lam0 in (0.05, 0.31):
        line = np.interp(heel, [0.0, 40.0], [lam0, 0.8 * lam0])
        assert grain.heeling_arm_m(lam0, heel) == pytest.approx(line, rel=1e-12)
        assert grain.arm_area_mrad(lam0, 6.0, 33.0) == pytest.approx(
            quad(lambda h, lam=lam0: float(np.interp(h, [0.0, 40.0], [lam, 0.8 * lam])),
                 6.0, 33.0)[0] * math.pi / 180.0, rel=1e-12)


def test_grain_loaded_without_the_grain_criteria_is_said(tmp_path):
    """Grain on board with only IS Code sets chosen: the grain is loading, its quantities are
    reported, and a warning says the shift is not checked (no grain criterion is run)."""
    vessel = _vessel()
    vessel["criteria"] = ["is2008.general"]
    volume = HOLD_L * HOLD_B * 5.0
    grain = {"stowage_factor": SF, "compartments": {"H1": {"volume": volume}}}
    ballast = {"name": "Ballast", "mass": 4000.0, "lcg": 50.0, "vcg": 2.0}
    d = evaluate_path(write_case(tmp_path, condition_dict(items=[ballast], grain=grain),
                                 vessel)).to_dict()
    assert {c["set"] for c in d["criteria"]} == {"is2008.general"}
    assert any("grain.2008" in w and "not checked" in w for w in d["warnings"])
    assert d["grain"]["vhm"] == pytest.approx(891.33, abs=0.01)
    assert d["loading"]["displacement"] == pytest.approx(5000.0 + volume / SF)


def test_tables_of_a_grain_ship_carry_the_12_and_40_degree_rows():
    """International Grain Code, notes to figure A 7: cross curves at 12° and 40°. A vessel
    with grain compartments gets those rows by default; one without keeps the 5° steps."""
    from types import SimpleNamespace

    from conftest import ROOT

    from reportgen.hull.tables import default_heels
    from reportgen.inputs import load_vessel

    grain = SimpleNamespace(grain=SimpleNamespace(compartments=["hold"]))
    assert {12.0, 40.0} <= set(default_heels(grain))
    assert 12.0 not in default_heels(SimpleNamespace(grain=None))
    assert {12.0, 40.0} <= set(load_vessel(
        ROOT / "conditions" / "vessels" / "linnet-demo.yaml").cross_curves.heel)
