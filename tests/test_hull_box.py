"""Box barge against closed-form results.

Sources: for a rectangular barge L×B×D at draught T, V = L·B·T, KB = T/2, BMt = B²/(12T),
BML = L²/(12T), Awp = L·B, LCF = L/2, TPC = ρ·L·B/100, MCT = Δ·BML/(100·L) (Rawson & Tupper,
Basic Ship Theory, ch. 4; these are exact for a box). Wall-sided formula
GZ = sinθ·(GM + ½·BM·tan²θ), exact for a wall-sided body while neither the deck edge
immerses nor the bilge emerges (Rawson & Tupper, Basic Ship Theory, ch. 4); with the pole
at K (KG = 0), KN = sinθ·(KB + BM + ½·BM·tan²θ).
"""

from __future__ import annotations

import numpy as np
import pytest
from hull_helpers import box_stations

from reportgen.hull.equilibrium import equilibrium
from reportgen.hull.hydrostatics import (
    Plane,
    clip_sections,
    clip_sections_by_intersection,
    hydrostatics_at,
    prepare_hull,
)
from reportgen.hull.sections import hull_from_stations

L, B, D, RHO = 80.0, 14.0, 8.0, 1.025


@pytest.fixture(scope="module")
def box():
    return prepare_hull(hull_from_stations(box_stations(L, B, D)), L)


@pytest.mark.parametrize("draft", [1.0, 3.0, 5.5, 7.0])
def test_box_upright_hydrostatics(box, draft):
    h = hydrostatics_at(box, Plane.from_draft(draft, 0.0, 0.0, L), RHO)
    # Rawson & Tupper, Basic Ship Theory, ch. 4 (box formulas, exact).
    assert h["displacement"] == pytest.approx(RHO * L * B * draft, rel=1e-12)
    assert h["vcb"] == pytest.approx(draft / 2, abs=1e-9)
    assert h["bmt"] == pytest.approx(B**2 / (12 * draft), rel=1e-12)
    assert h["kmt"] == pytest.approx(draft / 2 + B**2 / (12 * draft), abs=1e-9)
    assert h["bml"] == pytest.approx(L**2 / (12 * draft), rel=1e-12)
    assert h["lcb"] == pytest.approx(L / 2, abs=1e-9)
    assert h["lcf"] == pytest.approx(L / 2, abs=1e-9)
    assert h["tcb"] == pytest.approx(0.0, abs=1e-9)
    assert h["awp"] == pytest.approx(L * B, rel=1e-12)
    assert h["tpc"] == pytest.approx(RHO * L * B / 100, rel=1e-12)
    # MCT = Δ·BML/(100 L) = ρ·B·L²/1200 for a box (GM_L ≈ BM_L, common practice).
    assert h["mct"] == pytest.approx(RHO * B * L**2 / 1200, rel=1e-12)
    assert h["cb"] == pytest.approx(1.0, rel=1e-12)
    assert h["lwl"] == pytest.approx(L)


def test_box_trimmed_waterplane(box):
    # A box trimmed t by the stern at midship draught T keeps V = L·B·T (the waterplane turns
    # about midships) and LCB = L/2 - L·t/(12·T) (centroid of a trapezoid, elementary
    # geometry: the prism of section area B·(T + t(L/2 - x)/L)).
    T, t = 4.0, 1.0
    h = hydrostatics_at(box, Plane.from_draft(T, t, 0.0, L), RHO)
    assert h["volume"] == pytest.approx(L * B * T, rel=1e-12)
    assert h["lcb"] == pytest.approx(L / 2 - L * t / (12 * T), abs=1e-9)
    assert h["trim"] == pytest.approx(t)
    assert h["draft"] == pytest.approx(T)


@pytest.mark.parametrize("draft", [3.0, 4.0, 5.0])
@pytest.mark.parametrize("heel", [2.0, 5.0, 10.0, 15.0])
def test_box_kn_wall_sided(box, draft, heel):
    t = np.radians(heel)
    # Wall-sided range: the deck edge stays dry and the bilge stays wet.
    assert np.tan(t) * B / 2 < min(D - draft, draft)
    e = equilibrium(box, L * B * draft, heel, lcg_m=L / 2)
    kb, bm = draft / 2, B**2 / (12 * draft)
    kn = np.sin(t) * (kb + bm + 0.5 * bm * np.tan(t) ** 2)  # wall-sided formula (see top)
    assert e.kn_m == pytest.approx(kn, abs=1e-3)
    assert e.volume_m3 == pytest.approx(L * B * draft, rel=1e-9)
    assert e.plane.trim_m(L) == pytest.approx(0.0, abs=1e-6)  # symmetric fore and aft


def test_box_kn_at_90_degrees(box):
    # At 90° the box floats on its side: immersed the strip y >= B/2 - w with w·D = B·T,
    # zB = D/2 so KN = D/2 (elementary geometry).
    draft = 3.0
    e = equilibrium(box, L * B * draft, 90.0, lcg_m=L / 2)
    assert e.kn_m == pytest.approx(D / 2, abs=1e-6)
    assert e.tcb_m == pytest.approx(B / 2 - 0.5 * B * draft / D, abs=1e-6)


@pytest.mark.parametrize("heel", [0.0, 20.0, 47.0, 75.0])
def test_fast_clip_matches_shapely_intersection(box, heel):
    # Reference library: shapely.intersection (GEOS overlay) against the numpy edge cut.
    p = Plane.from_draft(4.0, 0.7, heel, L) if heel < 90 else Plane(2.0, 0.01, heel)
    a, b = clip_sections(box, p), clip_sections_by_intersection(box, p)
    for f in ("area_m2", "my_m3", "mz_m3", "breadth_m", "s1_m2", "s2_m3"):
        np.testing.assert_allclose(getattr(a, f), getattr(b, f), rtol=1e-9, atol=1e-8)


def test_waterline_length_reaches_a_raked_keel_line():
    # A box whose keel rises linearly forward of x = 80 m, 0.5 m per m: at draught 4 m the
    # waterline meets the keel line at x = 80 + 4/0.5 = 88 m (plane geometry), so
    # Lwl = 88 m and, with the breadth constant, Awp = 88·B.
    stations = []
    for x in np.arange(0.0, 101.0, 10.0):
        keel = max(0.0, (x - 80.0) * 0.5)
        stations.append((float(x), np.array([[0.0, keel], [B / 2, keel], [B / 2, D + 6.0]])))
    geom = prepare_hull(hull_from_stations(stations), 100.0)
    h = hydrostatics_at(geom, Plane.from_draft(4.0, 0.0, 0.0, 100.0), RHO)
    assert h["lwl"] == pytest.approx(88.0, abs=1e-9)
