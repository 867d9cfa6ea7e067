"""Readings of the IS Code 2008 (MSC.267(85)) where its text leaves a choice: the program takes
the conservative one (house rule), and these tests pin it against the paragraph's own words.

- Part A 2.2.1 asks the area "up to θ = 30°" and the areas to 40° "or θf if this angle is
  less". With θf below 30° the ship takes water before 30°, so GZ beyond θf is not there to
  be credited: the area to 30° stops at θf too (the conservative reading; the area to 40° can
  then never be smaller than the area to 30°).
- Part A 2.3.4, table 2.3.4-3 gives k by Ak·100/(L·B), while the symbols listed under the
  formula define only Lwl, the waterline length. Whether L is Lwl or the ship's length
  (Introduction, Definitions, recalled from memory) is not settled by the text; k falls as
  Ak·100/(L·B) rises, so the greater length gives the greater θ1: L = max(Lpp, Lwl).
"""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np
import pytest

from reportgen.criteria import general, rolling
from reportgen.criteria.core import State
from reportgen.stability import CrossCurves, KNCurve, gz_curve

HEEL = np.arange(0.0, 81.0, 5.0)
DEMO = Path(__file__).resolve().parent.parent / "conditions"


def _sine_curve():
    """GZ = sin θ (m): KN = 8 sin θ with KG 7 m, one displacement row."""
    row = 8.0 * np.sin(np.radians(HEEL))
    cc = CrossCurves(HEEL, np.array([1000.0, 3000.0]), None, np.vstack([row, row])[None, :, :])
    return gz_curve(KNCurve(cc.kn_spline(1000.0), cc.heel_max_deg), 7.0, 0.0)


@pytest.mark.parametrize("flooding", [24.0, 30.0, 45.0])
def test_area_to_30_stops_at_flooding(flooding):
    # ∫0^min(30°, θf) sin θ dθ = 1 − cos(min(30°, θf)) m·rad (Part A 2.2.1, read as above).
    s = State(curve=_sine_curve(), credited_to_deg=flooding, gz_max_deg=80.0, gm_fluid_m=1.0,
              flooding_deg=flooding, deck_edge_deg=20.0)
    end = math.radians(min(30.0, flooding))
    a30, a40 = general.area_0_30(s), general.area_0_40(s)
    assert a30.attained == pytest.approx(1.0 - math.cos(end), rel=1e-6)
    assert a30.attained <= a40.attained


def test_k_takes_the_greater_of_lpp_and_lwl():
    # Table 2.3.4-3 at Ak·100/(L·B): Ak 18 m², B 15.6 m.
    short = rolling.Hull(15.6, 3.0, 90.0, 0.6, "round", 18.0, length_bp_m=97.0)
    long = rolling.Hull(15.6, 6.0, 99.0, 0.6, "round", 18.0, length_bp_m=97.0)
    assert short.k_length_m == 97.0 and long.k_length_m == 99.0
    assert short.factors[4] == pytest.approx(rolling.factor_k("round", 18.0, 97.0, 15.6))
    assert long.factors[4] == pytest.approx(rolling.factor_k("round", 18.0, 99.0, 15.6))
    # C of 2.3.4 keeps Lwl, as its formula names it.
    assert short.factors[1] == pytest.approx(rolling.coefficient_c(15.6, 3.0, 90.0))


def test_demo_lightship_k_and_its_statement():
    # The demo ship floats light with a waterline shorter than Lpp (97 m): k is read at Lpp.
    from reportgen.pipeline import evaluate_path

    d = evaluate_path(DEMO / "lightship.yaml").to_dict()
    w = d["weather"]
    assert w["k_length"] == pytest.approx(97.0)
    assert w["k"] == pytest.approx(rolling.factor_k("round", 18.0, 97.0, 15.6), abs=1e-6)
