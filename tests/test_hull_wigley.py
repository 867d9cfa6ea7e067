"""Wigley hull against its closed-form integrals.

Wigley (W. C. S. Wigley, 1934, the parabolic hull of the Institution of Naval Architects
paper on ship wave resistance): y = ½B(1 - ξ²)(1 - ζ²), ξ = 2x/L - 1, ζ the depth below the
waterline over T. Derivations (elementary calculus, ours):
- ∫₋₁¹(1 - ξ²)dξ = 4/3 and ∫₀¹(1 - ζ²)dζ = 2/3, so V = 2·(B/2)·(L/2)·T·(4/3)(2/3)
  = (4/9)·L·B·T: CB = 4/9.
- Awp = 2·(B/2)·(L/2)·(4/3) = (2/3)·L·B: Cwp = 2/3.
- Depth of B below the waterline: ∫₀¹ζ(1 - ζ²)dζ / ∫₀¹(1 - ζ²)dζ = (1/4)/(2/3) = 3T/8,
  so KB = T - 3T/8 = 5T/8.
- It = ∫(2/3)·y_wl³ dx = (2/3)(B/2)³(L/2)∫₋₁¹(1 - ξ²)³dξ = (2/3)(B³/8)(L/2)(32/35)
  = 4B³L/105, so BMt = It/V = (4B³L/105)/((4/9)LBT) = 3B²/(35T).
- LCB = LCF = L/2 by fore-and-aft symmetry.
"""

from __future__ import annotations

import numpy as np
import pytest
from hull_helpers import wigley_stations

from reportgen.hull.hydrostatics import (
    Plane,
    clip_sections,
    clip_sections_by_intersection,
    hydrostatics_at,
    prepare_hull,
)
from reportgen.hull.sections import hull_from_stations

L, B, T, D, RHO = 100.0, 10.0, 6.25, 9.0, 1.025


@pytest.fixture(scope="module")
def wigley():
    return prepare_hull(hull_from_stations(wigley_stations(L, B, T, D, n_stations=41)), L)


@pytest.fixture(scope="module")
def hydro(wigley):
    return hydrostatics_at(wigley, Plane.from_draft(T, 0.0, 0.0, L), RHO)


def test_wigley_displacement_and_cb(hydro):
    assert hydro["displacement"] == pytest.approx(RHO * 4 / 9 * L * B * T, rel=5e-3)  # CB = 4/9
    assert hydro["cb"] == pytest.approx(4 / 9, rel=5e-3)
    assert hydro["lwl"] == pytest.approx(L)


def test_wigley_waterplane(hydro):
    assert hydro["awp"] == pytest.approx(2 / 3 * L * B, rel=5e-3)  # Cwp = 2/3
    assert hydro["lcf"] == pytest.approx(L / 2, abs=1e-6)
    assert hydro["lcb"] == pytest.approx(L / 2, abs=1e-6)


def test_wigley_kb_bm_km(hydro):
    assert hydro["vcb"] == pytest.approx(5 * T / 8, abs=0.01)  # KB = 5T/8
    assert hydro["bmt"] == pytest.approx(3 * B**2 / (35 * T), abs=0.01)  # BMt = 3B²/(35T)
    assert hydro["kmt"] == pytest.approx(5 * T / 8 + 3 * B**2 / (35 * T), abs=0.01)


@pytest.mark.parametrize("heel", [10.0, 35.0, 60.0, 89.0])
def test_wigley_fast_clip_matches_shapely_intersection(wigley, heel):
    # Reference library: shapely.intersection (GEOS overlay).
    p = Plane.from_draft(5.0, -0.4, heel, L)
    a, b = clip_sections(wigley, p), clip_sections_by_intersection(wigley, p)
    for f in ("area_m2", "my_m3", "mz_m3", "breadth_m", "s1_m2", "s2_m3"):
        np.testing.assert_allclose(getattr(a, f), getattr(b, f), rtol=1e-9, atol=1e-8)
