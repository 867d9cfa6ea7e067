"""IS Code 2008 (MSC.267(85)) Part A 2.3.4 factor tables and the 2.2 limits, at and between the
entries; the tables are those reproduced in SPEC.md ("Criteria")."""

from __future__ import annotations

import pytest

from reportgen.criteria import general, rolling, weather
from reportgen.criteria.sets import SETS

# 2.3.4 table 2.3.4-1, X1 by B/d.
X1 = [(2.4, 1.00), (2.5, 0.98), (2.6, 0.96), (2.7, 0.95), (2.8, 0.93), (2.9, 0.91), (3.0, 0.90),
      (3.1, 0.88), (3.2, 0.86), (3.4, 0.82), (3.5, 0.80)]
# 2.3.4 table 2.3.4-2, X2 by CB.
X2 = [(0.45, 0.75), (0.50, 0.82), (0.55, 0.89), (0.60, 0.95), (0.65, 0.97), (0.70, 1.00)]
# 2.3.4 table 2.3.4-3, k by Ak·100/(L·B).
K = [(0.0, 1.00), (1.0, 0.98), (1.5, 0.95), (2.0, 0.88), (2.5, 0.79), (3.0, 0.74), (3.5, 0.72),
     (4.0, 0.70)]
# 2.3.4 table 2.3.4-4, s by T (s).
S = [(6, 0.100), (7, 0.098), (8, 0.093), (12, 0.065), (14, 0.053), (16, 0.044), (18, 0.038),
     (20, 0.035)]


@pytest.mark.parametrize(("arg", "value"), X1)
def test_x1_at_entries(arg, value):
    assert rolling.factor_x1(arg) == pytest.approx(value, abs=1e-12)


@pytest.mark.parametrize(("arg", "value"), X2)
def test_x2_at_entries(arg, value):
    assert rolling.factor_x2(arg) == pytest.approx(value, abs=1e-12)


@pytest.mark.parametrize(("arg", "value"), S)
def test_s_at_entries(arg, value):
    assert rolling.factor_s(arg) == pytest.approx(value, abs=1e-12)


@pytest.mark.parametrize(("ratio", "value"), K)
def test_k_at_entries(ratio, value):
    # Ak·100/(L·B) = ratio with L = 100 m, B = 10 m: Ak = 10·ratio m² (ratio 0 -> no keels).
    assert rolling.factor_k("round", 10.0 * ratio, 100.0, 10.0) == pytest.approx(value)


def test_between_entries_linear():
    # SPEC.md: linear interpolation between entries; midpoints by hand.
    assert rolling.factor_x1(3.3) == pytest.approx((0.86 + 0.82) / 2)
    assert rolling.factor_x1(2.45) == pytest.approx(0.99)
    assert rolling.factor_x2(0.625) == pytest.approx((0.95 + 0.97) / 2)
    assert rolling.factor_s(10.0) == pytest.approx((0.093 + 0.065) / 2)
    assert rolling.factor_s(6.5) == pytest.approx(0.099)
    assert rolling.factor_k("round", 17.5, 100.0, 10.0) == pytest.approx((0.88 + 0.95) / 2)


def test_constant_beyond_the_ends():
    # SPEC.md: ≤2.4 -> 1.00, ≥3.5 -> 0.80; ≤0.45 -> 0.75, ≥0.70 -> 1.00; ≤6 s -> 0.100,
    # ≥20 s -> 0.035; ≥4.0 -> 0.70.
    assert rolling.factor_x1(1.5) == 1.00
    assert rolling.factor_x1(6.0) == 0.80
    assert rolling.factor_x2(0.30) == 0.75
    assert rolling.factor_x2(0.95) == 1.00
    assert rolling.factor_s(3.0) == 0.100
    assert rolling.factor_s(35.0) == 0.035
    assert rolling.factor_k("round", 100.0, 100.0, 10.0) == 0.70


def test_k_for_bilge_types():
    # 2.3.4: k = 1.0 round bilge without bilge or bar keels; k = 0.7 sharp bilge.
    assert rolling.factor_k("round", 0.0, 100.0, 16.0) == 1.0
    assert rolling.factor_k("sharp", 0.0, 100.0, 16.0) == 0.7
    assert rolling.factor_k("sharp", 40.0, 100.0, 16.0) == 0.7


def test_formulas_of_2_3():
    # 2.3.2.2: lw1 = P·A·Z/(1000·g·Δ) with P = 504 N/m², g = 9.81 m/s².
    assert weather.WIND_PRESSURE_N_M2 == 504.0 and weather.GRAVITY_M_S2 == 9.81
    assert weather.wind_lever_m(504.0, 1000.0, 5.0, 5000.0) == pytest.approx(
        504 * 1000 * 5 / (1000 * 9.81 * 5000))
    # 2.3.4: θ1 = 109·k·X1·X2·√(r·s); r = 0.73 + 0.6·OG/d; T = 2·C·B/√GM;
    # C = 0.373 + 0.023·(B/d) − 0.043·(Lwl/100).
    assert rolling.roll_angle_deg(1.0, 1.0, 1.0, 1.0, 0.04) == pytest.approx(109 * 0.2)
    assert rolling.factor_r(1.0, 5.0) == pytest.approx(0.85)
    assert rolling.coefficient_c(16.0, 6.0, 100.0) == pytest.approx(0.373 + 0.023 * 16 / 6
                                                                    - 0.043)
    assert rolling.roll_period_s(0.4, 16.0, 1.0) == pytest.approx(12.8)


def test_general_limits_of_2_2():
    # IS Code 2008 Part A 2.2.1–2.2.4.
    assert general.AREA_0_30_MRAD == 0.055
    assert general.AREA_0_40_MRAD == 0.090
    assert general.AREA_30_40_MRAD == 0.030
    assert general.GZ_30_M == 0.20
    assert general.GZ_MAX_ANGLE_DEG == 25.0
    assert general.GM0_M == 0.15
    assert weather.THETA0_LIMIT_DEG == 16.0 and weather.DECK_EDGE_FRACTION == 0.8
    assert weather.THETA2_LIMIT_DEG == 50.0 and weather.LW2_FACTOR == 1.5


def test_sets_and_their_ids():
    # SPEC.md, "Criteria": the two sets and their ids in order.
    # The vessel and condition files name sets by these ids (reportgen.criteria.sets is the one
    # list of them, as data).
    assert list(SETS)[:2] == ["is2008.general", "is2008.weather"]
    assert SETS["is2008.weather"].needs == {"weather"}
