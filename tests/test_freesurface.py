"""Free surface by the rules of the IMO 2008 IS Code, Part B, 3.1 (SPEC.md "Free surface").

Rectangular tanks: the free-surface moment of a slack rectangular tank is ρ·l·b³/12 (t·m),
the second moment of its rectangular free surface about its own centreline times the density
(Rawson & Tupper, Basic Ship Theory, ch. 4, "free surface effect"), whatever the filling.
"""

from __future__ import annotations

import pytest

from reportgen.freesurface import TankSurface, counted_tanks

RHO_FO, RHO_FW, RHO_WB = 0.94, 1.000, 1.025


def fsm(l_m: float, b_m: float, rho: float) -> float:
    """ρ·l·b³/12 (t·m)."""
    return rho * l_m * b_m**3 / 12.0


def tank(tid, content, role, percent, l_m, b_m, rho, pair=None, top_fraction=1.0):
    """A rectangular tank; top_fraction < 1 narrows the free surface at the filling (a hopper
    top), so that the actual moment differs from the largest of the table."""
    full = fsm(l_m, b_m, rho)
    actual = full * top_fraction if 0.0 < percent < 100.0 else 0.0
    return TankSurface(tid, content, role, pair, percent, actual, full)


def by_id(counted):
    return {c.id: (c.fsm_tm, c.reason) for c in counted}


def test_fixed_tanks_at_their_actual_filling():
    # Part B 3.1.3.1: ballast at its actual filling; full (98 %) and empty tanks have none.
    tanks = [tank("WB1", "ballast", "fixed", 50.0, 10, 8, RHO_WB, top_fraction=0.6),
             tank("WB2", "ballast", "fixed", 98.0, 10, 8, RHO_WB),
             tank("WB3", "ballast", "fixed", 0.0, 10, 8, RHO_WB)]
    got = by_id(counted_tanks(tanks, "code", 98.0))
    assert got == {"WB1": (pytest.approx(0.6 * fsm(10, 8, RHO_WB)), "slack")}


def test_slack_consumable_at_largest_of_its_table():
    # Part B 3.1.3.2: a slack consumable tank counts at the largest value between empty and
    # full, not at its actual filling.
    tanks = [tank("FO1", "fuel oil", "consumable", 40.0, 8, 6, RHO_FO, top_fraction=0.5)]
    got = by_id(counted_tanks(tanks, "code", 98.0))
    assert got["FO1"] == (pytest.approx(fsm(8, 6, RHO_FO)), "largest_of_table")


def test_worst_pair_of_each_liquid_even_when_full():
    # Part B 3.1.4: for each consumable liquid, the transverse pair (or single tank) with the
    # greatest free-surface effect is counted even when full or empty.
    tanks = [tank("FO1P", "fuel oil", "consumable", 100.0, 8, 5, RHO_FO, pair="FO1S"),
             tank("FO1S", "fuel oil", "consumable", 100.0, 8, 5, RHO_FO, pair="FO1P"),
             tank("FO2", "fuel oil", "consumable", 0.0, 6, 6, RHO_FO),  # 6·6³ < 2·8·5³
             tank("FW1", "fresh water", "consumable", 0.0, 5, 4, RHO_FW)]
    got = by_id(counted_tanks(tanks, "code", 98.0))
    assert got["FO1P"] == (pytest.approx(fsm(8, 5, RHO_FO)), "worst_pair")
    assert got["FO1S"] == (pytest.approx(fsm(8, 5, RHO_FO)), "worst_pair")
    assert "FO2" not in got
    assert got["FW1"] == (pytest.approx(fsm(5, 4, RHO_FW)), "worst_single")


def test_worst_single_tank_beats_a_smaller_pair():
    tanks = [tank("FO1P", "fuel oil", "consumable", 0.0, 4, 3, RHO_FO, pair="FO1S"),
             tank("FO1S", "fuel oil", "consumable", 0.0, 4, 3, RHO_FO, pair="FO1P"),
             tank("FO2", "fuel oil", "consumable", 100.0, 6, 7, RHO_FO)]
    got = by_id(counted_tanks(tanks, "code", 98.0))
    assert set(got) == {"FO2"} and got["FO2"][1] == "worst_single"


def test_worst_unit_already_slack_is_not_counted_twice():
    tanks = [tank("FO1P", "fuel oil", "consumable", 50.0, 8, 5, RHO_FO, pair="FO1S"),
             tank("FO1S", "fuel oil", "consumable", 50.0, 8, 5, RHO_FO, pair="FO1P")]
    got = by_id(counted_tanks(tanks, "code", 98.0))
    assert got == {"FO1P": (pytest.approx(fsm(8, 5, RHO_FO)), "largest_of_table"),
                   "FO1S": (pytest.approx(fsm(8, 5, RHO_FO)), "largest_of_table")}


def test_actual_and_maximum_rules():
    tanks = [tank("WB1", "ballast", "fixed", 50.0, 10, 8, RHO_WB, top_fraction=0.6),
             tank("FO1", "fuel oil", "consumable", 99.0, 8, 6, RHO_FO),
             tank("FW1", "fresh water", "consumable", 1.0, 5, 4, RHO_FW, top_fraction=0.5)]
    actual = by_id(counted_tanks(tanks, "actual", 98.0))
    assert actual == {"WB1": (pytest.approx(0.6 * fsm(10, 8, RHO_WB)), "slack"),
                      "FW1": (pytest.approx(0.5 * fsm(5, 4, RHO_FW)), "slack")}
    maximum = by_id(counted_tanks(tanks, "maximum", 98.0))
    assert maximum == {"WB1": (pytest.approx(fsm(10, 8, RHO_WB)), "maximum_rule"),
                       "FO1": (pytest.approx(fsm(8, 6, RHO_FO)), "maximum_rule"),
                       "FW1": (pytest.approx(fsm(5, 4, RHO_FW)), "maximum_rule")}
