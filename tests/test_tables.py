"""build_tables and vessel_text_with_tables on a box barge.

Sources: box formulas and the wall-sided formula as in test_hull_box.py (Rawson & Tupper,
Basic Ship Theory, ch. 4). For a wall-sided box heeled within the wall-sided range the
waterline turns about the centreline at the upright waterline (equal wedges, same source), so
a point at (y, z) reaches it at tanθ = (z - T)/y: the deck edge at atan((D - T)/(B/2)) when
D - T <= T (the bilge still wet), an opening at atan((z - T)/|y|).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
import yaml
from hull_helpers import box_stations, vessel_ns

from reportgen.hull.tables import GENERATED_COMMENT, build_tables, vessel_text_with_tables
from reportgen.inputs import parse_vessel

L, B, D, TS, LIGHT, RHO = 40.0, 10.0, 6.0, 3.5, 400.0, 1.025
VENT = ("Vent (P)", 10.0, -5.0, 5.5)  # port side shell, taken at |y| on the immersing side


@pytest.fixture(scope="module")
def tables():
    v = vessel_ns(box_stations(L, B, D, n=5), L, B, D, TS, LIGHT, RHO, openings=[VENT])
    calls = []
    out = build_tables(v, progress=lambda done, total: calls.append((done, total)))
    out["_calls"] = calls
    return out


def test_ranges(tables):
    h = tables["hydrostatics"]
    assert len(h["draft"]) >= 40
    t_light = LIGHT / (RHO * L * B)
    assert h["draft"][0] < t_light and TS < h["draft"][-1] < D
    c = tables["cross_curves"]
    assert c["trim"] == "free"
    assert c["heel"] == [float(x) for x in range(0, 91, 5)]
    assert len(c["displacement"]) == 20
    assert c["displacement"][0] < LIGHT < RHO * L * B * TS < c["displacement"][-1]
    calls = tables["_calls"]
    assert calls[-1][0] == calls[-1][1] and [d for d, _ in calls] == sorted(d for d, _ in calls)


def test_hydrostatics_match_box_formulas(tables):
    h = tables["hydrostatics"]
    t = np.asarray(h["draft"])
    # Box formulas (Rawson & Tupper, ch. 4); tolerances are the file's rounding.
    np.testing.assert_allclose(h["displacement"], RHO * L * B * t, atol=6e-4)
    np.testing.assert_allclose(h["kmt"], t / 2 + B**2 / (12 * t), atol=6e-5)
    np.testing.assert_allclose(h["lcb"], L / 2, atol=6e-5)
    np.testing.assert_allclose(h["lcf"], L / 2, atol=6e-5)
    np.testing.assert_allclose(h["tpc"], RHO * L * B / 100, atol=6e-4)
    np.testing.assert_allclose(h["mct"], RHO * B * L**2 / 1200, atol=6e-4)  # GM_L ≈ BM_L
    np.testing.assert_allclose(h["lwl"], L, atol=6e-5)
    np.testing.assert_allclose(h["cb"], 1.0, atol=6e-5)


def test_cross_curves_match_wall_sided_formula(tables):
    c = tables["cross_curves"]
    checked = 0
    for disp, row in zip(c["displacement"], c["kn"], strict=True):
        t = disp / (RHO * L * B)
        kb, bm = t / 2, B**2 / (12 * t)
        for heel, kn in zip(c["heel"], row, strict=True):
            th = math.radians(heel)
            if math.tan(th) * B / 2 < min(D - t, t):
                # Wall-sided formula with the pole at K.
                assert kn == pytest.approx(math.sin(th) * (kb + bm + 0.5 * bm * math.tan(th)**2),
                                           abs=1e-3)
                checked += 1
    assert checked > 40


def test_deck_edge_and_flooding_angles(tables):
    de, fl = tables["deck_edge"], tables["flooding_angle"]
    checked = 0
    for disp, a_deck, a_vent in zip(de["displacement"], de["angle"], fl["angle"], strict=True):
        t = disp / (RHO * L * B)
        if D - t <= t:
            assert a_deck == pytest.approx(math.degrees(math.atan((D - t) / (B / 2))), abs=2e-3)
            checked += 1
        if VENT[3] - t <= t:
            assert a_vent == pytest.approx(
                math.degrees(math.atan((VENT[3] - t) / abs(VENT[2]))), abs=2e-3)
            checked += 1
    assert checked >= 10


VESSEL_TEXT = """format: reportgen/vessel-1
# Invented test barge.
vessel: {name: Test barge, identifier: TEST-0001, type: barge}
particulars:
  length_bp: 40.0      # Lpp
  breadth: 10.0
  depth: 6.0
  summer_draft: 3.5
lightship: {mass: 400.0, lcg: 20.0, vcg: 3.0}
# an old table, to be replaced
hydrostatics:
  density: 1.025
  # a comment inside the old block
  draft: [1.0, 2.0]
  displacement: [410.0, 820.0]
  lcb: [20.0, 20.0]
  lcf: [20.0, 20.0]
  kmt: [8.8, 5.2]
  mct: [13.7, 13.7]
  tpc: [4.1, 4.1]
cross_curves: {trim: free, heel: [0, 30, 60], displacement: [410.0, 820.0],
               kn: [[0, 1, 2], [0, 1, 2]]}
windage:
  profile: [[0, 6], [40, 6], [40, 9], [0, 9]]   # keep me
criteria: [is2008.general]
openings:
  - {name: "Vent (P)", x: 10.0, y: -5.0, z: 5.5}
hull:
  stations:
""" + "".join(
    f"    - x: {x:.1f}\n      points: [[0.0, 0.0], [5.0, 0.0], [5.0, 6.0]]\n"
    for x in (0.0, 10.0, 20.0, 30.0, 40.0)
) + "# the end\n"


def test_vessel_text_keeps_comments_and_is_idempotent():
    vessel = parse_vessel(VESSEL_TEXT.encode(), "barge.yaml")
    made = build_tables(vessel)
    once = vessel_text_with_tables(VESSEL_TEXT, made)
    twice = vessel_text_with_tables(once, made)
    assert twice == once
    for line in VESSEL_TEXT.splitlines():
        if "#" in line and "old block" not in line:
            assert line in once.splitlines()
    assert "# a comment inside the old block" not in once
    assert once.count(GENERATED_COMMENT) == 4
    # Hydrostatics and cross curves replaced where they stood; the others appended in order.
    assert once.index("hydrostatics:") < once.index("cross_curves:") < once.index("windage:")
    assert once.index("# the end") < once.index("deck_edge:") < once.index("flooding_angle:")
    assert "kn: [[0, 1, 2]" not in once
    data = yaml.safe_load(once)
    assert data["hydrostatics"]["draft"] == made["hydrostatics"]["draft"]
    assert data["cross_curves"]["kn"] == made["cross_curves"]["kn"]
    assert data["flooding_angle"]["angle"] == made["flooding_angle"]["angle"]
    # The result is a valid vessel file for the project's own loader.
    again = parse_vessel(once.encode(), "barge.yaml")
    assert again.has_tables
    assert list(again.cross_curves.displacement) == made["cross_curves"]["displacement"]


def test_even_keel_option():
    v = vessel_ns(box_stations(L, B, D, n=5), L, B, D, TS, LIGHT, RHO)
    out = build_tables(v, even_keel=True, heels_deg=[0, 10, 20, 60])
    assert out["cross_curves"]["trim"] == "even_keel"
    assert "flooding_angle" not in out
    row = out["cross_curves"]["kn"][-1]
    t = out["cross_curves"]["displacement"][-1] / (RHO * L * B)
    kb, bm, th = t / 2, B**2 / (12 * t), math.radians(10.0)
    assert row[1] == pytest.approx(math.sin(th) * (kb + bm + 0.5 * bm * math.tan(th)**2),
                                   abs=1e-3)
