"""The faster hull paths against their references.

- clip_sections (numpy, Green's theorem over the section edges) against shapely's general
  overlay (clip_sections_by_intersection, reference library: shapely/GEOS) on random
  waterplanes, for a section the waterline cuts in two (a twin-hull section) as well as a
  Wigley hull and a box; and the box's immersed area at heel against plane geometry.
- The lazy heel scan (hull.tables.Scan, solved only as far as a search reads it) against
  the whole scan it replaces (heel_scan), on random displacements and LCGs: the same
  angles exactly, since the same waterplanes are solved from the same first guesses.
- The immersion angle against scipy's brentq run independently on the clearance.
"""

from __future__ import annotations

import numpy as np
import pytest
from hull_helpers import box_stations, wigley_stations
from scipy.optimize import brentq

from reportgen.hull.equilibrium import equilibrium
from reportgen.hull.hydrostatics import (
    Plane,
    clip_sections,
    clip_sections_by_intersection,
    prepare_hull,
)
from reportgen.hull.sections import hull_from_stations
from reportgen.hull.tables import Scan, clearance_m, deck_edge_points, heel_scan, immersion_angle

FIELDS = ("area_m2", "my_m3", "mz_m3", "breadth_m", "s1_m2", "s2_m3")
HEELS = [float(h) for h in range(0, 91, 5)]


def _twin_hull():
    # Two demihulls joined by a bridging deck: the starboard half runs from the centreline
    # under the bridge (z = 2) out and down to a flat-bottomed demihull and up its outer side.
    half = np.array([[0.0, 2.0], [1.0, 2.0], [1.3, 0.0], [2.7, 0.0], [3.0, 4.0]])
    return prepare_hull(hull_from_stations([(float(x), half) for x in np.linspace(0, 30, 7)]),
                        30.0)


@pytest.mark.parametrize("make", [
    _twin_hull,
    lambda: prepare_hull(hull_from_stations(wigley_stations(100.0, 10.0, 6.25, 9.0, 21, 15)),
                         100.0),
    lambda: prepare_hull(hull_from_stations(box_stations(80.0, 14.0, 8.0)), 80.0),
], ids=["twin", "wigley", "box"])
def test_numpy_clip_matches_shapely_overlay_on_random_waterplanes(make):
    geom = make()
    rng = np.random.default_rng(7)
    top = float(np.max(geom.edges_yz[[1, 3]]))  # the highest z of any section
    for _ in range(60):
        p = Plane(rng.uniform(-0.5, top + 0.5), rng.uniform(-0.03, 0.03), rng.uniform(0, 90))
        a, b = clip_sections(geom, p), clip_sections_by_intersection(geom, p)
        for f in FIELDS:
            np.testing.assert_allclose(getattr(a, f), getattr(b, f), rtol=1e-8, atol=1e-7,
                                       err_msg=f"{f} at {p}")


def test_twin_hull_waterline_is_two_demihulls_upright():
    # Upright at z = 1 the waterline cuts each demihull: its breadth at z = 1 is the
    # demihull's (plane geometry: inner side from (1.3, 0) to (1.0, 2), outer from (2.7, 0)
    # to (3.0, 4)), twice over for port and starboard.
    s = clip_sections(_twin_hull(), Plane(1.0, 0.0, 0.0))
    inner, outer = 1.3 - 0.3 * 0.5, 2.7 + 0.3 * 0.25
    np.testing.assert_allclose(s.breadth_m, 2 * (outer - inner), rtol=1e-12)
    np.testing.assert_allclose(s.s1_m2, 0.0, atol=1e-12)  # symmetric about the centreline
    # area of one demihull below z = 1: trapezoid of widths 1.4 (bottom) and outer - inner
    np.testing.assert_allclose(s.area_m2, 2 * 0.5 * (1.4 + outer - inner), rtol=1e-12)


def test_box_heeled_area_is_the_trapezoid():
    # A box B×D heeled θ with the waterline through the centreline at height T (neither
    # deck edge nor bilge reached): the immersed section is a trapezoid of area B·T
    # (plane geometry; the wedges in and out are equal), its centroid off the centreline by
    # B²·tanθ/(12·T) (the wall-sided shift of B; Rawson & Tupper, Basic Ship Theory, ch. 4).
    B, D, T = 14.0, 8.0, 4.0
    geom = prepare_hull(hull_from_stations(box_stations(80.0, B, D)), 80.0)
    for heel in (5.0, 15.0, 25.0):
        s = clip_sections(geom, Plane.from_draft(T, 0.0, heel, 80.0))
        np.testing.assert_allclose(s.area_m2, B * T, rtol=1e-12)
        np.testing.assert_allclose(s.my_m3 / s.area_m2,
                                   B**2 * np.tan(np.radians(heel)) / (12 * T), rtol=1e-12)


@pytest.fixture(scope="module")
def wigley():
    return prepare_hull(hull_from_stations(wigley_stations(60.0, 10.0, 3.0, 5.0, 21, 15)),
                        60.0)


def test_lazy_scan_gives_the_whole_scans_angles(wigley):
    rng = np.random.default_rng(3)
    deck = deck_edge_points(wigley)
    full_volume = 4 / 9 * 60.0 * 10.0 * 3.0  # Wigley CB = 4/9 at the design draught
    for _ in range(4):
        vol = full_volume * rng.uniform(0.5, 1.3)
        lcg = 30.0 + rng.uniform(-1.5, 1.5)
        vent = np.array([[rng.uniform(5, 55), rng.uniform(0, 5), rng.uniform(4.0, 7.0)]])
        planes = [e.plane for e in heel_scan(wigley, vol, lcg, HEELS)]
        lazy = Scan(wigley, vol, lcg, HEELS)
        for pts in (deck, vent):
            assert immersion_angle(wigley, pts, vol, lcg, lazy) == \
                immersion_angle(wigley, pts, vol, lcg, planes)
        read = len(lazy._planes)
        assert lazy[:read] == planes[:read]  # the same waterplanes, from the same guesses


def test_immersion_angle_against_scipy_brentq(wigley):
    # Independent root: brentq on the clearance of the deck edge at the free-trim
    # equilibrium (scipy.optimize.brentq), bracketed on its own over 0..90°.
    vol, lcg = 4 / 9 * 60.0 * 10.0 * 3.0, 30.4
    deck = deck_edge_points(wigley)
    got = immersion_angle(wigley, deck, vol, lcg, Scan(wigley, vol, lcg, HEELS))

    def gap(h: float) -> float:
        return clearance_m(wigley, equilibrium(wigley, vol, h, lcg).plane, deck)

    ref = brentq(gap, 1.0, 89.0, xtol=1e-8)
    assert got == pytest.approx(ref, abs=2e-4)  # immersion_angle's own xtol is 1e-4°


def test_free_trim_newton_agrees_with_scipy_hybr(wigley):
    # Reference: scipy.optimize.root (MINPACK hybrj) on the same residual and exact
    # Jacobian, from the same start, on random heels, displacements and LCGs (a Wigley hull
    # is fore-and-aft symmetric, so LCG off L/2 makes it trim).
    from scipy.optimize import root

    from reportgen.hull.equilibrium import _free_trim_residual, solve_draft, solve_free_trim

    rng = np.random.default_rng(11)
    for _ in range(8):
        heel = rng.uniform(0.0, 70.0)
        vol = 4 / 9 * 60.0 * 10.0 * 3.0 * rng.uniform(0.6, 1.2)
        lcg = 30.0 + rng.uniform(-2.0, 2.0)
        start = solve_draft(wigley, vol, heel, 0.0)
        got = solve_free_trim(wigley, vol, heel, lcg, guess=start)
        ref = root(_free_trim_residual(wigley, vol, heel, lcg), [start.d_m, start.slope * 60.0],
                   jac=True, method="hybr", options={"xtol": 1e-12})
        assert got.d_m == pytest.approx(ref.x[0], abs=1e-9)
        assert got.slope * 60.0 == pytest.approx(ref.x[1], abs=1e-9)
        e = equilibrium(wigley, vol, heel, lcg, guess=start)
        assert e.volume_m3 == pytest.approx(vol, rel=1e-9)  # Archimedes
        assert e.lcb_m == pytest.approx(lcg, abs=1e-6)  # xB on the vertical through G


def test_a_port_and_starboard_pair_of_openings_shares_one_search():
    # SPEC.md: openings are taken at |y| on the immersing side, so a pair at (x, ±y, z) is one
    # point to the hull search; each still gets its angle, and the first listed governs.
    from reportgen.angles import Opening, Situation, flooding_angle

    searched = []

    def finder(points: np.ndarray) -> float:
        searched.append(points.tolist())
        return 40.0 + points[0, 2]  # any function of the point: higher, later

    pair = [Opening("vent (S)", 12.0, 4.0, 8.2), Opening("vent (P)", 12.0, -4.0, 8.2),
            Opening("door", 30.0, 3.0, 6.0)]
    angle, warnings = flooding_angle(None, Situation(1000.0, 0.1, 3.0, finder), pair, 60.0)
    assert searched == [[[12.0, 4.0, 8.2]], [[30.0, 3.0, 6.0]]]
    assert angle.deg == 46.0 and angle.opening == "door" and warnings == []
    angle, _ = flooding_angle(None, Situation(1000.0, 0.1, 3.0, finder), pair[:2], 60.0)
    assert angle.deg == 48.2 and angle.opening == "vent (S)"
