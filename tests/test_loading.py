"""Loading: tank fillings through sounding tables, free-surface moments, totals.

Reference values are worked by hand from the definitions: mass = volume·density, centre of
gravity = Σ m·g / Σ m, FSM = i·ρ (IS Code 2008 Part B 3.1).
"""

from __future__ import annotations

import pytest

from reportgen.errors import InputError
from reportgen.freesurface import is_slack
from reportgen.loading import (
    TankTable,
    item_line,
    lightship_line,
    tank_state,
    totals,
)

# A 10 m × 8 m rectangular tank, bottom at z = 1 m, 5 m deep, at x = 30 m, y = −3 m: by hand
# volume = 80·h, vcg = 1 + h/2, fsi = l·b³/12 = 10·512/12 m⁴ (constant for vertical walls).
# The last row has a smaller fsi (a tapering top) to tell "maximum" from "actual".
TABLE = TankTable.from_columns(
    [0.0, 1.0, 2.0, 3.0, 4.0, 5.0],
    [0.0, 80.0, 160.0, 240.0, 320.0, 400.0],
    [30.0] * 6,
    [1.0, 1.5, 2.0, 2.5, 3.0, 3.5],
    [-3.0] * 6,
    [426.6667] * 5 + [200.0],
)
RHO = 1.025


def test_percent_volume_sounding_mass_agree():
    by_pct = tank_state(TABLE, RHO, "percent", 50.0)
    by_vol = tank_state(TABLE, RHO, "volume", 200.0)
    by_snd = tank_state(TABLE, RHO, "sounding", 2.5)
    by_mass = tank_state(TABLE, RHO, "mass", 200.0 * RHO)
    for s in (by_pct, by_vol, by_snd, by_mass):
        assert s.volume == pytest.approx(200.0)
        assert s.sounding == pytest.approx(2.5)
        assert s.percent == pytest.approx(50.0)
        assert s.mass == pytest.approx(205.0)  # 200 m³ · 1.025 t/m³
        assert s.vcg == pytest.approx(2.25)  # 1 + 2.5/2
        assert s.tcg == -3.0 and s.lcg == 30.0


def test_mass_gives_volume_then_sounding():
    s = tank_state(TABLE, 0.85, "mass", 102.0)  # 102 t of 0.85 t/m³ fuel -> 120 m³ -> 1.5 m
    assert s.volume == pytest.approx(120.0)
    assert s.sounding == pytest.approx(1.5)


def test_free_surface_inertia_at_the_filling_and_largest():
    s = tank_state(TABLE, RHO, "sounding", 4.5)  # between rows: fsi (426.6667 + 200)/2
    assert s.fsi_m4 == pytest.approx((426.6667 + 200) / 2)
    assert TABLE.fsi_max_m4 == pytest.approx(426.6667)


def test_slack_limits():
    # IS Code 2008 Part B 3.1.2 and SPEC.md: full at 98 % or more, empty at 0; no lower limit.
    assert is_slack(1.9, 98.0)
    assert is_slack(0.001, 98.0)
    assert is_slack(50.0, 98.0)
    assert is_slack(97.99, 98.0)
    assert not is_slack(98.0, 98.0)  # exactly 98 % is full
    assert not is_slack(0.0, 98.0)
    assert not is_slack(100.0, 98.0)


def test_ullage_equals_sounding():
    # Ullage measured down from a reference 5.5 m above the sounding zero: ullage 3.0 m is the
    # sounding 2.5 m (common practice of tank gauging).
    by_ullage = tank_state(TABLE, RHO, "ullage", 3.0, ullage_reference_m=5.5)
    by_sounding = tank_state(TABLE, RHO, "sounding", 2.5)
    assert by_ullage == by_sounding
    with pytest.raises(InputError, match="ullage"):
        tank_state(TABLE, RHO, "ullage", 0.2, ullage_reference_m=5.5)  # sounding 5.3 > 5 m


def test_overfilled_and_out_of_table_fillings_refused():
    with pytest.raises(InputError, match="WB1"):
        tank_state(TABLE, RHO, "volume", 401.0, label="tanks.WB1")
    with pytest.raises(InputError, match="outside"):
        tank_state(TABLE, RHO, "mass", 500.0)
    with pytest.raises(InputError, match="sounding"):
        tank_state(TABLE, RHO, "sounding", 5.2)


def test_totals_by_hand():
    lines = [lightship_line(1000.0, 40.0, 6.0, 0.0), item_line("Cargo", 500.0, 70.0, 3.0, 1.2)]
    t = totals(lines)
    # Δ = 1500 t; LCG = (40 000 + 35 000)/1500 = 50; VCG = (6000 + 1500)/1500 = 5;
    # TCG = 600/1500 = 0.4; deadweight = Δ − lightship = 500.
    assert (t.displacement, t.lightship, t.deadweight.mass) == (1500.0, 1000.0, 500.0)
    assert (t.deadweight.lcg, t.deadweight.vcg, t.deadweight.tcg) == (70.0, 3.0, 1.2)
    assert t.lcg == pytest.approx(50.0)
    assert t.vcg == pytest.approx(5.0)
    assert t.tcg == pytest.approx(0.4)
    assert t.fsm == 0.0
