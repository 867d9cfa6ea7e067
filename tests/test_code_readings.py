"""Readings of the IS Code 2008 (MSC.267(85)) where its text leaves a choice: the program takes
the conservative one (house rule), and these tests pin it against the paragraph's own words.

- Part A 2.2.1 asks the area "up to θ = 30°" and the areas to 40° "or θf if this angle is
  less"; SPEC.md's table of criteria words it the same way. The area to 30° is therefore
  taken to 30° whatever θf; with θf below 30° the area from 30° to θf is nil and fails, so
  the ship cannot pass 2.2.1 however the area to 30° is read (the verdict is the safe one).
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
def test_area_to_30_as_written_and_the_area_from_30_fails_below_it(flooding):
    # ∫0^30° sin θ dθ = 1 − cos 30° m·rad whatever θf (Part A 2.2.1; SPEC.md "Criteria");
    # the areas to 40° end at min(40°, θf): 1 − cos(min(40°, θf)).
    s = State(curve=_sine_curve(), credited_to_deg=flooding, gz_max_deg=80.0, gm_fluid_m=1.0,
              flooding_deg=flooding, deck_edge_deg=20.0)
    a30, a40, a3040 = general.area_0_30(s), general.area_0_40(s), general.area_30_40(s)
    assert a30.attained == pytest.approx(1.0 - math.cos(math.radians(30.0)), rel=1e-6)
    assert a40.attained == pytest.approx(1.0 - math.cos(math.radians(min(40.0, flooding))),
                                         rel=1e-6)
    assert a3040.passed == (flooding > 30.0)


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
