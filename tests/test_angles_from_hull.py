"""Deck edge and flooding angles from the hull offsets when the vessel file has no table of
them (SPEC.md, vessel file: "deck_edge: optional table; else from hull, else atan(...)").

Reference: a box barge is wall-sided, so until the deck edge immerses its waterline turns
about the centreline point at the draught (the volume of the emerged and immersed wedges is
equal; standard naval architecture texts, e.g. Rawson & Tupper, Basic Ship Theory, ch. 4).
A point (y, z) then reaches the water at tan θ = (z − T)/y, and the deck edge at
tan θ = (D − T)/(B/2), provided the bilge has not emerged first (T ≥ D/2 here).
"""

from __future__ import annotations

import math

import pytest
from eval_box import RHO, B, D, L, condition_dict, vessel_dict, write_case

from reportgen.pipeline import evaluate_path

STATIONS = [{"x": float(x), "points": [[0.0, 0.0], [B / 2, 0.0], [B / 2, D]]}
            for x in range(0, 101, 10)]


@pytest.mark.parametrize("draft", [7.0, 8.0, 9.0])
def test_angles_from_the_hull_of_a_box(tmp_path, draft):
    opening = {"name": "Vent", "x": 50.0, "y": 6.0, "z": draft + 3.0}
    vessel = vessel_dict(hull={"stations": STATIONS}, openings=[opening])
    mass = RHO * L * B * draft - 1000.0  # lightship 1000 t at LCG L/2
    cond = condition_dict(items=[{"name": "Cargo", "mass": mass, "lcg": L / 2, "vcg": 4.0}])
    doc = evaluate_path(write_case(tmp_path, cond, vessel)).to_dict()
    assert doc["angles"]["deck_edge_source"] == "hull"
    assert doc["angles"]["flooding_source"] == "hull"
    deck = math.degrees(math.atan((D - draft) / (B / 2)))
    vent = math.degrees(math.atan(3.0 / 6.0))
    assert doc["angles"]["deck_edge"] == pytest.approx(deck, abs=0.01)
    assert vent < deck  # the wall-sided answer holds only before the deck edge immerses
    assert doc["angles"]["flooding"] == pytest.approx(vent, abs=0.01)
    assert doc["angles"]["flooding_opening"] == "Vent"
    assert doc["angles"]["flooding_opening_xyz"] == [50.0, 6.0, draft + 3.0]


def test_openings_without_hull_or_table_are_refused(tmp_path):
    # SPEC.md: openings without hull and without a flooding_angle table are refused; no
    # approximation of θf is safe enough to print.
    from reportgen.errors import InputError

    opening = {"name": "Vent", "x": 50.0, "y": -6.0, "z": 9.0}
    cond = condition_dict(items=[])
    with pytest.raises(InputError, match="openings: .*hull offsets.*flooding_angle"):
        evaluate_path(write_case(tmp_path, cond, vessel_dict(openings=[opening])))


def test_without_hull_the_deck_edge_formula_is_the_last_resort(tmp_path):
    draft = 6.0
    mass = RHO * L * B * draft - 1000.0
    cond = condition_dict(items=[{"name": "Cargo", "mass": mass, "lcg": L / 2, "vcg": 4.0}])
    doc = evaluate_path(write_case(tmp_path, cond, vessel_dict())).to_dict()
    assert doc["angles"]["deck_edge_source"] == "formula"
    assert doc["angles"]["deck_edge"] == pytest.approx(math.degrees(math.atan(8.0 / 8.0)))
    assert any("ignores trim and sheer" in w for w in doc["warnings"])
    assert doc["angles"]["flooding_source"] == "none" and doc["angles"]["flooding"] == 90.0
