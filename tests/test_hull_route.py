"""Direct calculation on the hull (calculation.method: hull) against references outside it.

- A Wigley hull (W. C. S. Wigley, 1934: y = B/2·(1 − ξ²)(1 − ζ²)) heeled and trimmed: the
  hull route's displacement, centre of buoyancy and KN against an independent integration
  written here: the analytic sections at 401 stations (201 points each) clipped by shapely's
  general overlay and integrated by scipy's Simpson rule, at the waterplane the hull route
  found. KN within 1 mm.
- A box barge trimmed by a known LCG shift δ against closed forms: a box floats at the same
  midships draught T whatever its trim (its ends are vertical), and its immersed profile is a
  trapezoid with draughts T ± t/2, whose centroid lies L/2 − L·t/(12·T) from the AP; xB =
  LCG then gives t = 12·T·δ/L, the same as t = Δ·δ/(100·MCT) with MCT = Δ·BML/(100·L),
  BML = L²/(12·T) (Rawson & Tupper, Basic Ship Theory, ch. 4; hand derivation).
"""

from __future__ import annotations

import numpy as np
import pytest
import shapely
from eval_box import RHO, B, D, L, condition_dict, vessel_dict, write_case
from hull_helpers import wigley_stations
from scipy.integrate import simpson
from shapely.geometry import Polygon

from reportgen.hull.direct import on_hull
from reportgen.hull.hydrostatics import prepare_hull
from reportgen.hull.sections import hull_from_stations
from reportgen.pipeline import evaluate_path

WL, WB, WT, WD = 100.0, 10.0, 6.0, 9.0  # Wigley hull: L, B, T, D (m)


def _wigley_section(x: float, n_z: int = 201) -> Polygon:
    """The analytic Wigley section at x, wall-sided from the design waterline to the depth."""
    z = np.linspace(0.0, WT, n_z)
    y = 0.5 * WB * (1 - (2 * x / WL - 1) ** 2) * (1 - ((WT - z) / WT) ** 2)
    half = np.column_stack([np.append(y, y[-1]), np.append(z, WD)])
    ring = np.vstack([half, half[::-1] * [-1.0, 1.0]])
    return Polygon(ring) if np.max(ring[:, 0]) > 0 else Polygon()


def _reference(plane, n_x: int = 401) -> tuple[float, np.ndarray]:
    """(volume m³, centre of buoyancy (x, y, z) m) under `plane` by shapely overlay and Simpson
    in x. Immersed: −y·sinθ + z·cosθ ≤ d + slope·(L/2 − x) (SPEC axes; heel + starboard)."""
    t = np.radians(plane.heel_deg)
    u, n = np.array([np.cos(t), np.sin(t)]), np.array([-np.sin(t), np.cos(t)])
    xs = np.linspace(0.0, WL, n_x)
    area, my, mz = np.zeros(n_x), np.zeros(n_x), np.zeros(n_x)
    for i, x in enumerate(xs):
        sec = _wigley_section(float(x))
        if sec.is_empty:
            continue
        base = (plane.d_m + plane.slope * (0.5 * WL - x)) * n
        r = 100.0
        below = Polygon([base + r * u, base - r * u, base - r * u - 2 * r * n,
                         base + r * u - 2 * r * n])
        part = shapely.intersection(sec, below)
        if part.area > 0:
            area[i] = part.area
            my[i], mz[i] = part.area * part.centroid.x, part.area * part.centroid.y
    vol = simpson(area, x=xs)
    centre = np.array([simpson(area * xs, x=xs), simpson(my, x=xs), simpson(mz, x=xs)]) / vol
    return float(vol), centre


@pytest.fixture(scope="module")
def wigley_on_hull():
    geom = prepare_hull(hull_from_stations(wigley_stations(WL, WB, WT, WD)), WL)
    volume = 0.85 * 4 / 9 * WL * WB * WT  # CB of the Wigley form is 4/9; 85 % of design
    lcg = WL / 2 - 1.5  # G 1.5 m aft of midships: the ship trims by the stern
    return on_hull(geom, RHO * volume, RHO, lcg), volume, lcg


@pytest.mark.parametrize("heel", [0.0, 20.0, 45.0])
def test_wigley_heeled_and_trimmed_against_an_independent_integration(wigley_on_hull, heel):
    hull, volume, lcg = wigley_on_hull
    e = next(s for s in hull.scanned if s.plane.heel_deg == heel)
    assert e.plane.trim_m(WL) > 0.1  # trimmed by the stern
    ref_vol, ref_b = _reference(e.plane)
    assert ref_vol == pytest.approx(volume, rel=5e-4)
    np.testing.assert_allclose([e.lcb_m, e.tcb_m, e.vcb_m], ref_b, atol=2e-3)
    assert ref_b[0] == pytest.approx(lcg, abs=5e-3)  # free trim: B under G
    t = np.radians(heel)
    kn_ref = ref_b[1] * np.cos(t) + ref_b[2] * np.sin(t)
    assert e.kn_m == pytest.approx(kn_ref, abs=1e-3)


@pytest.mark.parametrize("shift", [1.0, -2.0])
def test_box_barge_trimmed_by_a_known_lcg_shift(tmp_path, shift):
    draft = 6.0
    stations = [{"x": float(x), "points": [[0.0, 0.0], [B / 2, 0.0], [B / 2, D]]}
                for x in range(0, 101, 10)]
    vessel = vessel_dict(hull={"stations": stations}, calculation={"method": "hull"})
    disp = RHO * L * B * draft
    # lightship 1000 t at L/2; the cargo placed so that LCG = L/2 − shift
    lcg_item = (disp * (L / 2 - shift) - 1000.0 * L / 2) / (disp - 1000.0)
    cond = condition_dict(items=[{"name": "Cargo", "mass": disp - 1000.0, "lcg": lcg_item,
                                  "vcg": 4.0}])
    doc = evaluate_path(write_case(tmp_path, cond, vessel)).to_dict()
    h = doc["hydrostatics"]
    trim = 12.0 * draft * shift / L
    assert doc["assumptions"]["method"] == "hull"
    assert h["trim"] == pytest.approx(trim, abs=1e-4)
    assert h["draft_mean"] == pytest.approx(draft, abs=1e-4)
    assert h["draft_aft"] == pytest.approx(draft + trim / 2, abs=1e-4)
    assert h["draft_fore"] == pytest.approx(draft - trim / 2, abs=1e-4)
    assert h["lcb"] == pytest.approx(L / 2 - shift, abs=1e-4)
    # MCT = ρ·B·L²/1200 (GM_L ≈ BM_L = L²/12T), TPC = ρ·L·B/100, LCF at midships
    assert h["mct"] == pytest.approx(RHO * B * L * L / 1200.0, rel=1e-3)
    assert h["tpc"] == pytest.approx(RHO * L * B / 100.0, rel=1e-6)
    assert h["lcf"] == pytest.approx(L / 2, abs=1e-4)
