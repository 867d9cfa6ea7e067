"""Properties of the evaluation (hypothesis), on the box barge of tests/eval_box.py.

1. Raising KG never turns a failing criterion into a pass. GZ(θ) falls by δ·sin θ ≥ 0 for
   0 ≤ θ ≤ 90°, so every area, GZ at ≥ 30° and GM0 fall, θ0 rises; the angle of maximum GZ
   cannot rise either: with θ the old and θ' the new maximum, f(θ') − δ sin θ' ≥ f(θ) − δ sin θ
   and f(θ) ≥ f(θ') give sin θ' ≤ sin θ (derived here). weather_area is left out: its θ1 falls
   as KG rises (s falls with the longer roll period of IS Code 2008 2.3.4), so the IS Code
   itself does not make it monotonic.
2. A weight added at the ship's centre of gravity leaves LCG, VCG, TCG, FSM and KG unchanged
   and, for the box (TPC = ρ·L·B/100 constant, LCB = L/2), sinks it bodily by w/(100·TPC) with
   the trim given by the exact box formula t = 12·T·(LCB − LCG)/L at the new draught. GZ is not
   claimed unchanged: KN depends on Δ.
3. A tank filled by percent and by the equivalent mass gives the same results.
"""

from __future__ import annotations

import pytest
import yaml
from eval_box import RHO, B, L, condition_dict, vessel_dict
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from reportgen.inputs import load_case_bytes
from reportgen.pipeline import evaluate

VESSEL_BYTES = yaml.safe_dump(vessel_dict(), sort_keys=False).encode()
SETTINGS = settings(max_examples=30, deadline=None,
                    suppress_health_check=[HealthCheck.too_slow])


def _evaluate(items, tanks=None):
    cond = condition_dict(items=items, **({"tanks": tanks} if tanks else {}))
    case = load_case_bytes(yaml.safe_dump(cond, sort_keys=False).encode(), VESSEL_BYTES,
                           "cond.yaml", "box.yaml")
    return evaluate(case).to_dict()


def _cargo(draft, kg, lcg=50.0):
    disp = RHO * L * B * draft
    mass = disp - 1000.0
    return {"name": "Cargo", "mass": mass, "lcg": (disp * lcg - 50000.0) / mass,
            "vcg": (disp * kg - 4000.0) / mass}


@SETTINGS
@given(draft=st.floats(3.0, 11.0), kg=st.floats(4.0, 9.0), rise=st.floats(0.01, 2.0))
def test_raising_kg_never_turns_a_fail_into_a_pass(draft, kg, rise):
    low = _evaluate([_cargo(draft, kg)])
    high = _evaluate([_cargo(draft, kg + rise)])
    before = {c["id"]: c["passed"] for c in low["criteria"]}
    after = {c["id"]: c["passed"] for c in high["criteria"]}
    for cid, passed in before.items():
        if cid == "weather_area":
            continue
        if not passed:
            assert not after[cid], cid


@SETTINGS
@given(draft=st.floats(3.0, 9.0), kg=st.floats(4.0, 8.0), lcg=st.floats(48.0, 52.0),
       w=st.floats(10.0, 2000.0))
def test_weight_at_the_centre_of_gravity(draft, kg, lcg, w):
    base = _evaluate([_cargo(draft, kg, lcg)])
    ld = base["loading"]
    extra = {"name": "Added at G", "mass": w, "lcg": ld["lcg"], "vcg": ld["vcg"],
             "tcg": ld["tcg"]}
    more = _evaluate([_cargo(draft, kg, lcg), extra])
    for key in ("lcg", "vcg", "tcg", "fsm"):
        assert more["loading"][key] == pytest.approx(ld[key], abs=1e-5), key
    assert more["loading"]["displacement"] == pytest.approx(ld["displacement"] + w, abs=1e-5)
    assert more["hydrostatics"]["kg_fluid"] == pytest.approx(base["hydrostatics"]["kg_fluid"],
                                                             abs=1e-5)
    tpc = RHO * L * B / 100
    new_t = draft + w / (100 * tpc)
    assert more["hydrostatics"]["draft_mean"] == pytest.approx(new_t, abs=1e-4)
    assert more["hydrostatics"]["trim"] == pytest.approx(12 * new_t * (50 - lcg) / L, abs=1e-4)


@SETTINGS
@given(percent=st.one_of(st.floats(0.0, 100.0), st.sampled_from([2.0, 98.0, 100.0])),
       draft=st.floats(3.0, 9.0))
def test_tank_by_percent_equals_by_mass(percent, draft):
    items = [_cargo(draft, 6.0)]
    by_pct = _evaluate(items, {"T1": {"percent": percent}})
    mass = percent / 100 * 500.0 * 1.025  # capacity 500 m³ of 1.025 t/m³
    by_mass = _evaluate(items, {"T1": {"mass": mass}})
    for block in ("loading", "hydrostatics", "angles"):
        for key, value in by_pct[block].items():
            if isinstance(value, float):
                assert by_mass[block][key] == pytest.approx(value, abs=1e-5), (block, key)
    pct_line, mass_line = (next(ln for ln in d["loading"]["lines"] if ln["kind"] == "tank")
                           for d in (by_pct, by_mass))
    assert pct_line["slack"] == mass_line["slack"]
    for a, b in zip(by_pct["criteria"], by_mass["criteria"], strict=True):
        assert a["passed"] == b["passed"]
        if a["attained"] is not None:
            assert b["attained"] == pytest.approx(a["attained"], abs=1e-5)
