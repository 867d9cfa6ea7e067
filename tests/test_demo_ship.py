"""The invented demo ship (Linnet Demo) and its demo conditions.

The demo data is invented; what is checked here against outside facts:
- reproducibility: the committed files are what the generator and `reportgen tables` make;
- tank tables: volumes strictly increasing, centroids inside the tank boxes, port tanks the
  mirror of starboard tanks (geometry of the box cut);
- plausibility of the form against common practice for small general cargo ships (ranges
  from memory, marked as such);
- every demo condition loads; all but the one meant to fail meet IS Code 2008 Part A 2.2
  and 2.3 within the summer draught; the failing one fails.
"""

from __future__ import annotations

import importlib.util
import sys
from pathlib import Path
from types import ModuleType

import numpy as np
import pytest

from reportgen.inputs import load_case, load_vessel

ROOT = Path(__file__).resolve().parent.parent
CONDITIONS = ROOT / "conditions"
HULL_FILE = CONDITIONS / "vessels" / "linnet-demo-hull.yaml"
SHIP_FILE = CONDITIONS / "vessels" / "linnet-demo.yaml"
DEMO_CONDITIONS = sorted(p for p in CONDITIONS.glob("*.yaml")
                         if f"vessels/{SHIP_FILE.name}" in p.read_text(encoding="utf-8"))
FAILING = "fails-on-purpose-high-deck-cargo.yaml"
DEMO_TRIMS = [-3.0, -2.0, -1.0, 0.0, 1.0, 2.0, 3.0, 4.0]  # as `--trims` in scripts/demo.sh


def _generator() -> ModuleType:
    spec = importlib.util.spec_from_file_location("make_demo_ship",
                                                  CONDITIONS / "make_demo_ship.py")
    assert spec is not None and spec.loader is not None
    module = importlib.util.module_from_spec(spec)
    sys.modules["make_demo_ship"] = module  # dataclasses look their module up there
    spec.loader.exec_module(module)
    return module


@pytest.fixture(scope="module")
def generator() -> ModuleType:
    return _generator()


@pytest.fixture(scope="module")
def ship():
    return load_vessel(SHIP_FILE)


def test_generator_reproduces_the_committed_hull_file(generator: ModuleType,
                                                      tmp_path: Path) -> None:
    out = generator.write(tmp_path / "linnet-demo-hull.yaml")
    assert out.read_bytes() == HULL_FILE.read_bytes()


def test_tables_reproduce_the_committed_vessel_file() -> None:
    from reportgen.hull.tables import build_tables, vessel_text_with_tables

    made = build_tables(load_vessel(HULL_FILE), trims=DEMO_TRIMS)
    text = vessel_text_with_tables(HULL_FILE.read_text(encoding="utf-8"), made)
    assert text.encode("utf-8") == SHIP_FILE.read_bytes()


def test_tank_tables_are_consistent(generator: ModuleType, ship) -> None:
    boxes = {t.id: t.box for t in generator.tank_defs()}
    assert {t.id for t in ship.tanks} == set(boxes)
    assert 10 <= len(ship.tanks) <= 16
    for tank in ship.tanks:
        tab = {k: np.asarray(getattr(tank.table, k)) for k in
               ("sounding", "volume", "lcg", "vcg", "tcg", "fsi")}
        box = boxes[tank.id]
        assert tab["sounding"][0] == 0.0 and tab["volume"][0] == 0.0, tank.id
        assert np.all(np.diff(tab["sounding"]) > 0) and np.all(np.diff(tab["volume"]) > 0)
        # The liquid's centroid lies inside the box that cuts the tank out of the hull,
        # and rises with the sounding.
        assert np.all((tab["lcg"] >= box.x_aft) & (tab["lcg"] <= box.x_fore)), tank.id
        assert np.all((tab["tcg"] >= box.y_min) & (tab["tcg"] <= box.y_max)), tank.id
        assert np.all((tab["vcg"] >= box.z_min) & (tab["vcg"] <= box.z_max)), tank.id
        assert np.all(np.diff(tab["vcg"]) > 0), tank.id
        assert np.all(tab["fsi"] >= 0), tank.id
    # Port and starboard tanks of a pair are mirror images (the hull is symmetric).
    by_id = {t.id: t.table for t in ship.tanks}
    for tid, p in by_id.items():
        if tid.endswith("P") and tid[:-1] + "S" in by_id:
            s = by_id[tid[:-1] + "S"]
            assert p.volume == s.volume and p.fsi == s.fsi and p.vcg == s.vcg
            np.testing.assert_allclose(p.tcg, -np.asarray(s.tcg), atol=1.5e-3)


def test_ship_is_plausible(ship) -> None:
    h, p = ship.hydrostatics, ship.particulars
    draft = np.asarray(h.draft)
    disp = np.asarray(h.displacement[h.trims.index(0.0)])  # the even-keel row
    summer_disp = float(np.interp(p.summer_draft, draft, disp))
    cb = summer_disp / (h.density * p.length_bp * p.breadth * p.summer_draft)
    # Block coefficient of a small general cargo ship about 0.65-0.75 (common practice,
    # values from memory).
    assert 0.66 <= cb <= 0.74
    # Lightship mean draught roughly 2.3-3 m for this size (from memory).
    light_draft = float(np.interp(ship.lightship.mass, disp, draft))
    assert 2.3 <= light_draft <= 3.0
    # Deadweight roughly 60-70 % of the summer displacement (common practice, from memory).
    assert 0.6 <= 1.0 - ship.lightship.mass / summer_disp <= 0.7


@pytest.mark.parametrize("path", DEMO_CONDITIONS, ids=lambda p: p.name)
def test_demo_condition_loads(path: Path) -> None:
    case = load_case(path)
    assert case.vessel.vessel.identifier == "RG-DEMO-01"
    assert case.vessel_name == SHIP_FILE.name


def test_there_are_the_demo_conditions_the_brief_asks_for() -> None:
    names = {p.name for p in DEMO_CONDITIONS}
    assert {"lightship.yaml", "ballast-departure.yaml", "ballast-arrival.yaml",
            "full-load-departure.yaml", "full-load-arrival.yaml",
            "deck-cargo-departure.yaml", FAILING} <= names


@pytest.mark.parametrize("path", DEMO_CONDITIONS, ids=lambda p: p.name)
def test_demo_condition_verdict(path: Path) -> None:
    from reportgen.pipeline import evaluate

    case = load_case(path)
    doc = evaluate(case).to_dict()
    summer = case.vessel.particulars.summer_draft
    if path.name == FAILING:
        assert doc["passed"] is False
        assert any(not c["passed"] for c in doc["criteria"])
        return
    failed = [c["id"] for c in doc["criteria"] if not c["passed"]]
    assert doc["passed"] is True, failed
    # Within the summer load line (mean moulded draught at midships).
    assert doc["hydrostatics"]["draft_mean"] <= summer
    # Sensible margins: initial GM at least twice the IS Code 2.2.4 minimum of 0.15 m.
    assert doc["hydrostatics"]["gm_fluid"] >= 0.30
