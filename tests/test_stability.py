"""GZ from cross curves: symmetry, interpolation, areas, intercepts, angles, the side of list.

Synthetic cross curves with closed-form answers: KN(θ) = KM·sin θ gives GZ = GM·sin θ −
TCG·cos θ (a wall-less "metacentric" ship), so the heel is atan(TCG/GM) and the area
∫0^θ GM sin φ dφ = GM (1 − cos θ), by hand.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.integrate import quad

from reportgen.angles import deck_edge_formula
from reportgen.errors import InputError
from reportgen.stability import (
    CrossCurves,
    KNCurve,
    area_mrad,
    crossings,
    equilibrium_heel,
    gz_arrays,
    gz_curve,
    max_gz,
    vanishing_angle,
)

HEEL = np.arange(0.0, 81.0, 5.0)


def gz_of(cc: CrossCurves, disp_t: float, kg_m: float, tcg_m: float):
    return gz_curve(KNCurve(cc.kn_spline(disp_t), cc.heel_max_deg), kg_m, tcg_m)


def _cross(kn_of_heel) -> CrossCurves:
    """Two displacement rows 1000 and 3000 t with KN differing by 0.2 m·sin θ."""
    row = np.array([kn_of_heel(h) for h in HEEL])
    extra = 0.2 * np.sin(np.radians(HEEL))
    return CrossCurves(HEEL, np.array([1000.0, 3000.0]), None,
                       np.vstack([row, row + extra])[None, :, :])


def test_kn_through_table_points_and_odd():
    cc = _cross(lambda h: 8.0 * math.sin(math.radians(h)))
    spline = cc.kn_spline(1000.0)
    assert np.allclose(spline(HEEL), cc.kn[0, 0], atol=1e-12)
    # SPEC.md: negative heels by symmetry KN(−θ) = −KN(θ).
    for h in (3.0, 17.5, 42.0, 80.0):
        assert float(spline(-h)) == pytest.approx(-float(spline(h)), abs=1e-12)
    # Linear in displacement: halfway between the rows.
    mid = cc.kn_spline(2000.0)
    assert float(mid(30.0)) == pytest.approx(8.0 * 0.5 + 0.1 * 0.5, abs=1e-9)


def test_kn_spline_is_smooth_and_accurate():
    # A cubic spline through 5° samples of sin θ is within 1e-4 of sin θ (error ~ h⁴ f''''/384).
    cc = _cross(lambda h: math.sin(math.radians(h)))
    s = cc.kn_spline(1000.0)
    fine = np.linspace(-80, 80, 641)
    assert np.max(np.abs(s(fine) - np.sin(np.radians(fine)))) < 1e-4


def test_displacement_outside_cross_curves_refused():
    cc = _cross(lambda h: 8.0 * math.sin(math.radians(h)))
    with pytest.raises(InputError, match="cross curves"):
        cc.kn_spline(3500.0)


def test_heel_from_list_and_mirrored_side():
    km, kg, tcg = 8.0, 7.0, 0.1  # GM = 1 m
    cc = _cross(lambda h: km * math.sin(math.radians(h)))
    curve = gz_of(cc, 1000.0, kg, tcg)
    assert equilibrium_heel(curve) == pytest.approx(math.degrees(math.atan(tcg / 1.0)),
                                                    abs=1e-4)
    port = gz_of(cc, 1000.0, kg, -tcg)
    assert equilibrium_heel(port) == pytest.approx(-math.degrees(math.atan(tcg)), abs=1e-4)
    # Towards the port list the curve is the mirror: GZ_port(φ) = −GZ(−φ).
    towards = port.towards("port")
    for phi in (0.0, 10.0, 35.0):
        assert float(towards(phi)) == pytest.approx(-float(port(-phi)), abs=1e-12)
    assert float(towards(20.0)) == pytest.approx(float(curve(20.0)), abs=1e-12)


def test_area_against_closed_form_and_quad():
    cc = _cross(lambda h: 8.0 * math.sin(math.radians(h)))
    curve = gz_of(cc, 1000.0, 7.0, 0.0)  # GZ = sin θ
    assert area_mrad(curve, 0, 30) == pytest.approx(1 - math.cos(math.radians(30)), rel=1e-6)
    ref, _ = quad(lambda t: float(curve(math.degrees(t))), 0, math.radians(40))
    assert area_mrad(curve, 0, 40) == pytest.approx(ref, rel=1e-9)
    assert area_mrad(curve, 0, 40, level_m=0.1) == pytest.approx(ref - 0.1 * math.radians(40),
                                                                 rel=1e-9)


def test_maximum_and_vanishing():
    # GZ = 0.5·sin(2.4θ): maximum at 37.5°, vanishing at 75° (closed form).
    kg = 7.0
    cc = _cross(lambda h: kg * math.sin(math.radians(h)) + 0.5 * math.sin(math.radians(2.4 * h)))
    curve = gz_of(cc, 1000.0, kg, 0.0)
    angle, gz = max_gz(curve, 0.0, 80.0)
    assert angle == pytest.approx(37.5, abs=0.1)
    assert gz == pytest.approx(0.5, abs=1e-3)
    assert vanishing_angle(curve, angle) == pytest.approx(75.0, abs=0.05)
    up = crossings(curve, 0.25, 0.0, 80.0, "up")
    down = crossings(curve, 0.25, 0.0, 80.0, "down")
    # 0.5 sin(2.4θ) = 0.25 -> 2.4θ = 30° or 150°: θ = 12.5° and 62.5°.
    assert up == [pytest.approx(12.5, abs=0.05)]
    assert down == [pytest.approx(62.5, abs=0.05)]
    # GZ staying positive to the end of the table: no vanishing angle (SPEC.md: null).
    rising = gz_of(_cross(lambda h: 8.0 * math.sin(math.radians(h))), 1000.0, 7.0, 0.0)
    assert vanishing_angle(rising, max_gz(rising, 0, 80)[0]) is None


def test_gz_arrays_cover_spec_range():
    curve = gz_of(_cross(lambda h: 8.0 * math.sin(math.radians(h))), 1000.0, 7.0, 0.0)
    heel, gz, kn = (a.tolist() for a in gz_arrays(curve))
    assert heel[0] == -60.0 and heel[-1] == 80.0 and len(heel) == 141
    assert gz[heel.index(30.0)] == pytest.approx(0.5, abs=1e-4)
    # KN = 8·sin θ as tabulated; GZ = KN − KG·sin θ with KG = 7 m.
    assert kn[heel.index(30.0)] == pytest.approx(4.0, abs=1e-4)


def test_deck_edge_formula():
    # atan((D − T)/(B/2)) = atan(4/8) = 26.565° (wall-sided at midships, common practice).
    assert deck_edge_formula(10.0, 6.0, 16.0) == pytest.approx(math.degrees(math.atan(0.5)))


def test_trimmed_cross_curves_are_read_at_the_trim():
    # Tables at trims 0 and 2 m whose KN differ by 0.1·sin θ: at trim 0.5 m a quarter of it
    # (linear in trim, SPEC.md); a trim outside the tables is refused, never extrapolated.
    row = np.array([8.0 * math.sin(math.radians(h)) for h in HEEL])
    kn = np.stack([np.vstack([row, row]), np.vstack([row, row]) + 0.1 * np.sin(np.radians(HEEL))])
    cc = CrossCurves(HEEL, np.array([1000.0, 3000.0]), np.array([0.0, 2.0]), kn)
    assert float(cc.kn_spline(2000.0, 0.5)(30.0)) == pytest.approx(4.0 + 0.025 * 0.5, abs=1e-9)
    with pytest.raises(InputError, match="trims"):
        cc.kn_spline(2000.0, 2.5)


def test_exact_area_of_the_spline_against_quad():
    # The exact integral of the curve (antiderivative of the KN spline) equals scipy's adaptive
    # quadrature of the same curve.
    cc = _cross(lambda h: 7.0 * math.sin(math.radians(h)) + 0.5 * math.sin(math.radians(2.4 * h)))
    curve = gz_of(cc, 1700.0, 7.0, 0.05)
    ref, _ = quad(lambda t: float(curve(math.degrees(t))), math.radians(-12.0),
                  math.radians(47.0), epsabs=1e-13)
    assert area_mrad(curve, -12.0, 47.0) == pytest.approx(ref, abs=1e-9)


def test_list_side_ignores_rounding_of_symmetric_loads():
    from reportgen.stability import has_list, list_side

    # Symmetric P/S tanks sum to a TCG of ~1e-16 m: no list, criteria towards starboard.
    assert list_side(-1e-15) == "starboard" and not has_list(-1e-15)
    assert list_side(-0.01) == "port" and has_list(-0.01)
    assert list_side(0.01) == "starboard"


def test_kn_pieces_in_floats_equal_scipys_spline_and_its_derivatives():
    """The scalar evaluation the root and maximum searches use (KNCurve.local, integral_at)
    against scipy's PPoly, its derivative(1, 2) and its antiderivative (the reference), at
    knots, between them and at both ends."""
    from reportgen.stability import odd_spline

    spline = odd_spline(HEEL, 4.0 * np.sin(np.radians(HEEL)) + 0.3 * np.sin(np.radians(2 * HEEL)))
    kn = KNCurve(spline, 80.0)
    d1, d2, anti = spline.derivative(), spline.derivative(2), spline.antiderivative()
    for h in [-80.0, -37.3, 0.0, 5.0, 12.0, 33.3, 79.99, 80.0]:
        value, slope, curvature = kn.local(h)
        assert value == pytest.approx(float(spline(h)), abs=1e-12)
        assert slope == pytest.approx(float(d1(h)), abs=1e-12)
        assert curvature == pytest.approx(float(d2(h)), abs=1e-12)
        assert kn.integral_at(h) == pytest.approx(float(anti(h)), abs=1e-10)


def test_on_grid_is_the_curve_at_its_ends_and_grid_points_between():
    # Reference: scipy's PPoly evaluation of the same curve (GZCurve.__call__) at the heels
    # on_grid returns, which must be the two ends and the 0.25° grid strictly between them.
    from reportgen.stability import GRID_STEP_DEG, on_grid

    cc = _cross(lambda h: 8.0 * math.sin(math.radians(h)) + 0.3 * math.sin(math.radians(2 * h)))
    curve = gz_of(cc, 2000.0, 7.2, 0.05)
    for start, end in ((0.0, 80.0), (3.1, 41.7), (30.0, 30.1), (12.0, 12.0), (-7.3, 2.5)):
        heel, gz = on_grid(curve, start, end)
        inner = heel[1:-1]
        assert heel[0] == start and heel[-1] == end
        assert np.all((inner > start) & (inner < end))
        assert np.allclose(np.diff(inner), GRID_STEP_DEG)
        assert len(inner) == sum(start < g < end for g in curve.grid[0])
        np.testing.assert_allclose(gz, curve(heel), rtol=0, atol=1e-12)
