"""The invented demo passenger ship (Plover Demo) and its two conditions: the committed hull
file is what conditions/make_demo_ferry.py writes; a small passenger ship of 50 to 70 m (the
brief); both conditions apply IS Code 2008 Part A 3.1 and meet every criterion within the
summer draught. (The tables are checked against `reportgen tables` by scripts/demo.sh.)"""

from __future__ import annotations

import importlib.util
from pathlib import Path

import pytest

from reportgen.inputs import load_case, load_vessel
from reportgen.pipeline import evaluate

CONDITIONS = Path(__file__).resolve().parent.parent / "conditions"
FERRY = CONDITIONS / "vessels" / "plover-ferry.yaml"
FERRY_CONDITIONS = sorted(p for p in CONDITIONS.glob("*.yaml")
                          if f"vessels/{FERRY.name}" in p.read_text(encoding="utf-8"))


def test_generator_writes_the_committed_hull_file():
    spec = importlib.util.spec_from_file_location("make_demo_ferry",
                                                  CONDITIONS / "make_demo_ferry.py")
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    assert module.vessel_text() == module.OUT_PATH.read_text(encoding="utf-8")


def test_a_small_passenger_ship():
    v = load_vessel(FERRY)
    assert 50.0 <= v.particulars.length_bp <= 70.0
    assert "is2008.passenger" in v.criteria and v.passengers and v.particulars.service_speed


@pytest.mark.parametrize("path", FERRY_CONDITIONS, ids=lambda p: p.name)
def test_ferry_conditions_pass_with_the_passenger_criteria(path):
    case = load_case(path)
    doc = evaluate(case).to_dict()
    ids = {c["id"] for c in doc["criteria"]}
    assert {"passenger_crowding_heel", "passenger_turning_heel"} <= ids
    assert doc["passed"], [c["id"] for c in doc["criteria"] if not c["passed"]]
    assert doc["hydrostatics"]["draft_mean"] <= case.vessel.particulars.summer_draft
    assert doc["passengers"]["number"] == case.condition.passengers.number


def test_there_are_two_ferry_conditions():
    assert len(FERRY_CONDITIONS) == 2
