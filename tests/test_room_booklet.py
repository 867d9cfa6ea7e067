"""`room` and the criteria set booklet.limits on the box barge (tests/eval_box.py), whose
answers follow in closed form: Δ = ρ·L·B·T, so a mass m added at the centre of gravity sinks
the box by m/(ρ·L·B) with KG and LCG unchanged (Rawson & Tupper, Basic Ship Theory, ch. 2)."""

from __future__ import annotations

import json
import subprocess
import sys

import pytest
from eval_box import RHO, B, L, condition_dict, vessel_dict, write_case

from reportgen.inputs import load_case
from reportgen.pipeline import evaluate_path
from reportgen.room import room_at

SUMMER = 10.0  # the box's summer draught (eval_box.vessel_dict)


def _cargo_for(draft: float, kg: float) -> dict:
    disp = RHO * L * B * draft
    mass = disp - 1000.0
    return {"name": "Cargo", "mass": mass, "lcg": L / 2, "vcg": (disp * kg - 4000.0) / mass}


def test_room_at_the_centre_of_gravity_is_limited_by_the_load_line(tmp_path):
    """At G (x = LCG, y = 0, z = KG) added mass leaves KG and LCG as they are; in salt water
    the permissible draught is the summer draught (DWA 0, SPEC "load_line"), so the room is
    ρ·L·B·(T_summer − T). The draught is compared in whole mm (SPEC), so the answer may lie up
    to 0.5 mm of immersion (0.82 t) above, and the answer is rounded down to 0.1 t."""
    path = write_case(tmp_path, condition_dict([_cargo_for(7.0, 5.0)]))
    r = evaluate_path(path)
    answer = room_at(load_case(path), r.loading.lcg, 0.0, r.hydrostatics.kg_fluid)
    exact = RHO * L * B * (SUMMER - 7.0)
    assert answer["limited_by"] == "load_line"
    assert exact - 0.1 <= answer["mass"] <= exact + RHO * L * B * 0.0005


@pytest.mark.parametrize("draft", [7.0, 8.9])
def test_room_is_the_largest_mass_to_a_tenth_of_a_tonne(tmp_path, draft):
    """SPEC "Limits", `room`: the largest mass to 0.1 t, so 0.1 t more must fail or pass the
    permissible draught (the load line, SPEC "load_line": compared in whole mm). At these two
    draughts the answer was 0.1 t short: the search stopped at a 0.05 t bracket and rounded
    down."""
    path = write_case(tmp_path, condition_dict([_cargo_for(draft, 5.0)]))
    answer = room_at(load_case(path), L / 2, 0.0, 5.0)
    item = {"name": "Added", "mass": round(answer["mass"] + 0.1, 1), "lcg": L / 2, "vcg": 5.0}
    r = evaluate_path(write_case(tmp_path, condition_dict([_cargo_for(draft, 5.0), item])))
    over = round(r.hydrostatics.draft_mean * 1000) > round(r.load_line.permissible_draft * 1000)
    assert over or not r.passed
    item["mass"] = answer["mass"]
    r = evaluate_path(write_case(tmp_path, condition_dict([_cargo_for(draft, 5.0), item])))
    assert r.passed
    assert round(r.hydrostatics.draft_mean * 1000) <= round(r.load_line.permissible_draft * 1000)


def test_room_high_up_is_limited_by_a_criterion(tmp_path):
    """Mass high on the box raises KG: a criterion stops it before the load line; adding the
    answer passes, 1 t more fails (the property the search promises)."""
    path = write_case(tmp_path, condition_dict([_cargo_for(7.0, 5.0)]))
    answer = room_at(load_case(path), L / 2, 0.0, 13.5)
    assert answer["limited_by"] not in ("load_line", None)
    item = {"name": "Added", "mass": answer["mass"], "lcg": L / 2, "vcg": 13.5}
    ok = evaluate_path(write_case(tmp_path, condition_dict([_cargo_for(7.0, 5.0), item])))
    assert ok.passed
    item["mass"] += 1.0
    bad = evaluate_path(write_case(tmp_path, condition_dict([_cargo_for(7.0, 5.0), item])))
    assert not {c.id: c.passed for c in bad.criteria}[answer["limited_by"]]


def test_room_names_why_a_heavier_condition_is_refused(tmp_path):
    """Mass at the AP of the box at T = 3 m trims it by the stern until the draught at the FP
    reaches zero (SPEC.md "Conventions": a draught below zero is refused) at a displacement
    well inside the tables (7380 t of 2 m … 12 m = 3280 … 19680 t). The answer must say so; it
    said the displacement would leave the vessel's tables."""
    from reportgen.room import room_text

    path = write_case(tmp_path, condition_dict([_cargo_for(3.0, 5.0)]))
    answer = room_at(load_case(path), 0.0, 0.0, 3.0)
    assert answer["limited_by"] == "tables_end"
    text = room_text(answer)
    assert "leave the vessel's tables" not in text
    assert "forward perpendicular" in text and "below zero" in text


def test_room_of_a_condition_that_cannot_be_evaluated_is_bad_input(tmp_path):
    """SPEC.md "Conventions": a physically impossible condition is refused, exit status 2 (as
    `check` refuses it). The box at T = 3 m with 30000 t more lies beyond its tables (19680 t
    at 12 m); `room` answered "no mass can be added" with exit status 1."""
    item = {"name": "Far too much", "mass": 30000.0, "lcg": L / 2, "vcg": 5.0}
    path = write_case(tmp_path, condition_dict([_cargo_for(3.0, 5.0), item]))
    for command in (["check", str(path)], ["room", str(path), "--at", "50,5"]):
        run = subprocess.run([sys.executable, "-m", "reportgen", *command], check=False,
                             capture_output=True, text=True)
        assert run.returncode == 2, (command, run.stdout, run.stderr)
        assert "cond.yaml (vessel box.yaml)" in run.stderr and "Traceback" not in run.stderr


@pytest.mark.parametrize("at", ["4_8,5", "٤٨,5", "48,5 ,", "48;5", "0x30,5"])
def test_room_refuses_a_point_that_is_not_two_plain_numbers(tmp_path, at):
    """`--at X,Z` in metres (SPEC.md "Command line"): Python's float() also reads "4_8" as
    48 and Arabic-Indic digits as numbers, so a typing slip put the mass elsewhere."""
    path = write_case(tmp_path, condition_dict([_cargo_for(7.0, 5.0)]))
    run = subprocess.run([sys.executable, "-m", "reportgen", "room", str(path), "--at", at],
                         check=False, capture_output=True, text=True)
    assert run.returncode == 2 and "--at" in run.stderr and "Traceback" not in run.stderr


def test_room_refuses_a_point_outside_the_ship(tmp_path):
    path = write_case(tmp_path, condition_dict([_cargo_for(7.0, 5.0)]))
    run = subprocess.run([sys.executable, "-m", "reportgen", "room", str(path), "--at",
                          "50,99"], check=False, capture_output=True, text=True)
    assert run.returncode == 2 and "outside the ship" in run.stderr
    assert "Traceback" not in run.stderr


CURVE = {"source": "Invented test booklet, page 1", "displacement": [10000.0, 13000.0],
         "kg": [6.0, 6.6]}


def _booklet_run(tmp_path, draft: float, kg: float, curve: dict | None = None,
                 key: str = "limiting_kg"):
    v = vessel_dict(criteria=("is2008.general", "booklet.limits"), **{key: curve or CURVE})
    return evaluate_path(write_case(tmp_path, condition_dict([_cargo_for(draft, kg)]), v))


def _value_at(draft: float) -> float:
    """SPEC "Limits": linear interpolation of the curve at the displacement ρ·L·B·T."""
    d = RHO * L * B * draft
    return 6.0 + 0.6 * (d - 10000.0) / 3000.0


@pytest.mark.parametrize(("offset", "passed"), [(-0.0005, True), (0.0, True), (0.0005, False)])
def test_booklet_kg_limit_at_under_and_over_the_curve(tmp_path, offset, passed):
    """kg_limit: KG corrected ≤ the curve's KG at the displacement (limit at_most)."""
    limit = _value_at(7.0)
    r = _booklet_run(tmp_path, 7.0, limit + offset - (1e-9 if offset == 0.0 else 0.0))
    c = {c.id: c for c in r.criteria}["kg_limit"]
    assert c.required == pytest.approx(limit, abs=1e-6)
    assert c.passed is passed
    assert c.limit == "at_most" and c.reference.startswith(CURVE["source"])


def test_booklet_outside_the_curve_fails_with_a_warning(tmp_path):
    r = _booklet_run(tmp_path, 5.0, 5.0)  # Δ = 8200 t, below the curve's 10000 t
    c = {c.id: c for c in r.criteria}["kg_limit"]
    assert not c.passed and c.required is None
    assert any("outside the booklet's limiting curve" in w for w in r.warnings)


def test_booklet_minimum_gm_curve(tmp_path):
    """gm_limit: GM corrected ≥ the curve's GM (limiting_gm); box KMt = T/2 + B²/(12·T)."""
    curve = {"source": "Invented test booklet, page 2", "displacement": [10000.0, 13000.0],
             "gm": [0.5, 0.5]}
    kmt = 3.5 + B * B / 84.0
    good = _booklet_run(tmp_path, 7.0, kmt - 0.5005, curve, "limiting_gm")
    bad = _booklet_run(tmp_path, 7.0, kmt - 0.4995, curve, "limiting_gm")
    assert {c.id: c.passed for c in good.criteria}["gm_limit"]
    assert not {c.id: c.passed for c in bad.criteria}["gm_limit"]


def test_booklet_set_without_a_curve_is_refused(tmp_path):
    v = vessel_dict(criteria=("is2008.general", "booklet.limits"))
    path = write_case(tmp_path, condition_dict([_cargo_for(7.0, 5.0)]), v)
    run = subprocess.run([sys.executable, "-m", "reportgen", "check", str(path)],
                         check=False, capture_output=True, text=True)
    assert run.returncode == 2 and "limiting_kg" in run.stderr


def test_booklet_margin_governs_when_tighter(tmp_path):
    """The condition's KG margin counts the booklet criterion like any other."""
    r = _booklet_run(tmp_path, 7.0, 5.0)
    assert r.limits.governing == "kg_limit"
    assert r.limits.kg_max == pytest.approx(_value_at(7.0), abs=0.001)
    assert json.loads(r.to_json())["limits"]["governing"] == "kg_limit"
