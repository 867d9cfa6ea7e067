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

from reportgen.errors import InputError
from reportgen.stability import (
    CrossCurves,
    area_mrad,
    crossings,
    deck_edge_formula,
    equilibrium_heel,
    gz_curve,
    gz_grid,
    max_gz,
    opening_angles,
    vanishing_angle,
)

HEEL = np.arange(0.0, 81.0, 5.0)


def _cross(kn_of_heel) -> CrossCurves:
    """Two displacement rows 1000 and 3000 t with KN differing by 0.2 m·sin θ."""
    row = np.array([kn_of_heel(h) for h in HEEL])
    extra = 0.2 * np.sin(np.radians(HEEL))
    return CrossCurves(HEEL, np.array([1000.0, 3000.0]), np.vstack([row, row + extra]))


def test_kn_through_table_points_and_odd():
    cc = _cross(lambda h: 8.0 * math.sin(math.radians(h)))
    spline = cc.kn_spline(1000.0)
    assert np.allclose(spline(HEEL), cc.kn[0], atol=1e-12)
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
    curve = gz_curve(cc, 1000.0, kg, tcg)
    assert equilibrium_heel(curve) == pytest.approx(math.degrees(math.atan(tcg / 1.0)),
                                                    abs=1e-4)
    port = gz_curve(cc, 1000.0, kg, -tcg)
    assert equilibrium_heel(port) == pytest.approx(-math.degrees(math.atan(tcg)), abs=1e-4)
    # Towards the port list the curve is the mirror: GZ_port(φ) = −GZ(−φ).
    towards = port.towards("port")
    for phi in (0.0, 10.0, 35.0):
        assert float(towards(phi)) == pytest.approx(-float(port(-phi)), abs=1e-12)
    assert float(towards(20.0)) == pytest.approx(float(curve(20.0)), abs=1e-12)


def test_area_against_closed_form_and_quad():
    cc = _cross(lambda h: 8.0 * math.sin(math.radians(h)))
    curve = gz_curve(cc, 1000.0, 7.0, 0.0)  # GZ = sin θ
    assert area_mrad(curve, 0, 30) == pytest.approx(1 - math.cos(math.radians(30)), rel=1e-6)
    ref, _ = quad(lambda t: float(curve(math.degrees(t))), 0, math.radians(40))
    assert area_mrad(curve, 0, 40) == pytest.approx(ref, rel=1e-9)
    assert area_mrad(curve, 0, 40, level_m=0.1) == pytest.approx(ref - 0.1 * math.radians(40),
                                                                 rel=1e-9)


def test_maximum_and_vanishing():
    # GZ = 0.5·sin(2.4θ): maximum at 37.5°, vanishing at 75° (closed form).
    kg = 7.0
    cc = _cross(lambda h: kg * math.sin(math.radians(h)) + 0.5 * math.sin(math.radians(2.4 * h)))
    curve = gz_curve(cc, 1000.0, kg, 0.0)
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
    rising = gz_curve(_cross(lambda h: 8.0 * math.sin(math.radians(h))), 1000.0, 7.0, 0.0)
    assert vanishing_angle(rising, max_gz(rising, 0, 80)[0]) is None


def test_gz_grid_covers_spec_range():
    curve = gz_curve(_cross(lambda h: 8.0 * math.sin(math.radians(h))), 1000.0, 7.0, 0.0)
    heel, gz, kn = gz_grid(curve)
    assert heel[0] == -60.0 and heel[-1] == 80.0 and len(heel) == 141
    assert gz[heel.index(30.0)] == pytest.approx(0.5, abs=1e-4)
    # KN = 8·sin θ as tabulated; GZ = KN − KG·sin θ with KG = 7 m.
    assert kn[heel.index(30.0)] == pytest.approx(4.0, abs=1e-4)


def test_deck_edge_and_opening_angles():
    # atan((D − T)/(B/2)) = atan(4/8) = 26.565°.
    assert deck_edge_formula(10.0, 6.0, 16.0) == pytest.approx(math.degrees(math.atan(0.5)))

    class Op:
        def __init__(self, name, x, y, z):
            self.name, self.x, self.y, self.z = name, x, y, z

    # Trim 1 m by the stern, T_mid 5 m, Lpp 100: waterline at x = 20 is 5 + 0.3 = 5.3 m;
    # tan θ = (9.3 − 5.3)/4 = 1 -> 45°. On the centreline: 90°. Below water: 0°.
    ops = [Op("A", 20.0, -4.0, 9.3), Op("B", 50.0, 0.0, 12.0), Op("C", 50.0, 3.0, 4.0)]
    angles = opening_angles(ops, 5.0, 1.0, 100.0)
    assert angles[0].angle_deg == pytest.approx(45.0)
    assert angles[1].angle_deg == pytest.approx(90.0)
    assert angles[2].angle_deg == 0.0 and angles[2].submerged


def test_list_side_ignores_rounding_of_symmetric_loads():
    from reportgen.stability import has_list, list_side

    # Symmetric P/S tanks sum to a TCG of ~1e-16 m: no list, criteria towards starboard.
    assert list_side(-1e-15) == "starboard" and not has_list(-1e-15)
    assert list_side(-0.01) == "port" and has_list(-0.01)
    assert list_side(0.01) == "starboard"
