"""The two file formats of SPEC.md: what is accepted, and every refusal names file, key and line.

The vessel here is a box barge 100 m x 20 m x 10 m whose even-keel hydrostatics follow from
the box formulas (displacement = rho*L*B*T, KB = T/2, BMt = B^2/(12 T): standard naval
architecture texts); only the formats are under test in this file.
"""

from __future__ import annotations

from pathlib import Path

import pytest
import yaml

from reportgen.errors import InputError
from reportgen.inputs import load_case, load_case_bytes, load_vessel

L, B, D, RHO = 100.0, 20.0, 10.0, 1.025
DRAFTS = [1.0, 2.0, 4.0, 6.0, 8.0]


def box_vessel() -> dict:
    disp = [RHO * L * B * t for t in DRAFTS]
    kmt = [t / 2 + B**2 / (12 * t) for t in DRAFTS]
    return {
        "format": "reportgen/vessel-1",
        "vessel": {"name": "Test box", "identifier": "TEST-BOX"},
        "particulars": {"length_bp": L, "breadth": B, "depth": D, "summer_draft": 6.0},
        "lightship": {"mass": 1500.0, "lcg": 50.0, "vcg": 5.0},
        "hydrostatics": {
            "draft": DRAFTS, "displacement": disp, "lcb": [50.0] * 5, "lcf": [50.0] * 5,
            "kmt": kmt, "mct": [100.0] * 5, "tpc": [RHO * L * B / 100] * 5,
        },
        "cross_curves": {"trim": "free", "heel": [0, 30, 60], "displacement": disp,
                         "kn": [[0.0, 1.0, 2.0]] * 5},
        "windage": {"profile": [[0, 0], [100, 0], [100, 12], [0, 12]]},
        "tanks": [{
            "id": "T1", "name": "Test tank", "content": "ballast", "density": 1.025,
            "table": {"sounding": [0.0, 1.0], "volume": [0.0, 100.0], "lcg": [10.0, 10.0],
                      "vcg": [0.0, 0.5], "tcg": [0.0, 0.0], "fsi": [833.3, 833.3]},
        }],
        "criteria": ["is2008.general", "is2008.weather"],
    }


def box_condition() -> dict:
    return {
        "format": "reportgen/condition-1",
        "vessel": "vessel.yaml",
        "condition": {"title": "Test", "date": "2026-12-01"},
        "tanks": {"T1": {"percent": 50}},
        "items": [{"name": "Cargo", "mass": 500.0, "lcg": 50.0, "vcg": 4.0}],
    }


def write_case(tmp_path: Path, vessel: dict | str, condition: dict | str) -> Path:
    for name, doc in (("vessel.yaml", vessel), ("cond.yaml", condition)):
        text = doc if isinstance(doc, str) else yaml.safe_dump(doc, sort_keys=False)
        (tmp_path / name).write_text(text)
    return tmp_path / "cond.yaml"


def refusal(tmp_path: Path, vessel=None, condition=None) -> str:
    path = write_case(tmp_path, vessel or box_vessel(), condition or box_condition())
    with pytest.raises(InputError) as err:
        load_case(path)
    return str(err.value)


def test_good_case_loads_and_hashes_condition_then_vessel(tmp_path):
    import hashlib

    path = write_case(tmp_path, box_vessel(), box_condition())
    case = load_case(path)
    assert case.condition.condition.date == "2026-12-01"
    assert case.condition.condition.water_density == 1.025  # SPEC default
    assert case.condition.free_surface == "code"  # SPEC default
    assert case.condition.items[0].tcg == 0.0  # SPEC default
    # SPEC.md: inputs_sha256 is the SHA-256 of the condition bytes followed by the vessel bytes.
    expected = hashlib.sha256(path.read_bytes() + (tmp_path / "vessel.yaml").read_bytes())
    assert case.inputs_sha256 == expected.hexdigest()
    again = load_case_bytes(case.condition_bytes, case.vessel_bytes, "c.yaml", "v.yaml")
    assert again.condition == case.condition and again.vessel == case.vessel


def test_unknown_key_is_refused_with_line(tmp_path):
    cond = box_condition()
    cond["items"][0]["mas"] = cond["items"][0].pop("mass")
    msg = refusal(tmp_path, condition=cond)
    assert "cond.yaml" in msg and "items[0].mas" in msg and "unknown key" in msg
    assert "line" in msg


def test_notes_take_anything(tmp_path):
    cond = box_condition()
    cond["notes"] = {"anything": ["goes", 1]}
    load_case(write_case(tmp_path, box_vessel(), cond))


@pytest.mark.parametrize("filling, words", [
    ({"percent": 101}, "tanks.T1.percent"),
    ({"volume": 120.0}, "outside the tank's range"),
    ({"mass": 200.0}, "outside the tank's range"),
    ({"sounding": 1.5}, "outside the tank's range"),
    ({"percent": 50, "mass": 10}, "exactly one"),
    ({}, "exactly one"),
])
def test_bad_tank_filling(tmp_path, filling, words):
    cond = box_condition()
    cond["tanks"]["T1"] = filling
    assert words in refusal(tmp_path, condition=cond)


def test_unknown_tank(tmp_path):
    cond = box_condition()
    cond["tanks"] = {"T9": {"percent": 10}}
    msg = refusal(tmp_path, condition=cond)
    assert "unknown tank 'T9'" in msg and "T1" in msg


def test_filling_given_twice_is_refused(tmp_path):
    text = yaml.safe_dump(box_condition(), sort_keys=False)
    text = text.replace("  T1:\n    percent: 50\n", "  T1:\n    percent: 50\n  T1:\n    percent: 60\n")
    msg = refusal(tmp_path, condition=text)
    assert "given twice" in msg and "line" in msg


@pytest.mark.parametrize("mass", [-5.0, 0.0])
def test_non_positive_mass(tmp_path, mass):
    cond = box_condition()
    cond["items"][0]["mass"] = mass
    assert "items[0].mass" in refusal(tmp_path, condition=cond)


def test_text_for_a_number_is_refused(tmp_path):
    cond = box_condition()
    cond["items"][0]["mass"] = "500"
    assert "items[0].mass" in refusal(tmp_path, condition=cond)


def test_broken_yaml_names_line(tmp_path):
    msg = refusal(tmp_path, condition="format: reportgen/condition-1\nitems: [\n")
    assert "not valid YAML" in msg and "line" in msg


def test_missing_vessel_file(tmp_path):
    cond = box_condition()
    cond["vessel"] = "nowhere.yaml"
    msg = refusal(tmp_path, condition=cond)
    assert "nowhere.yaml" in msg and "not found" in msg


def test_wrong_format_key(tmp_path):
    cond = box_condition()
    cond["format"] = "reportgen/condition-9"
    assert "expected 'format: reportgen/condition-1'" in refusal(tmp_path, condition=cond)


def test_roll_angle_needs_its_source(tmp_path):
    cond = box_condition()
    cond["weather"] = {"roll_angle": 20.0}
    assert "roll_angle_source" in refusal(tmp_path, condition=cond)


def test_wind_area_needs_its_height(tmp_path):
    cond = box_condition()
    cond["items"][0]["wind_area"] = 50.0
    assert "wind_z" in refusal(tmp_path, condition=cond)


@pytest.mark.parametrize("change, words", [
    (lambda v: v["hydrostatics"].update(kmt=[1.0, 2.0]), "kmt has 2 rows, draft has 5"),
    (lambda v: v["hydrostatics"].update(draft=[1.0, 2.0, 2.0, 6.0, 8.0]), "strictly increasing"),
    (lambda v: v["cross_curves"].update(kn=[[0.0, 1.0]] * 5), "kn row 1"),
    (lambda v: v["cross_curves"].update(kn=[[0.0, 1.0, 2.0]] * 4), "one row per displacement"),
    (lambda v: v["cross_curves"].update(heel=[0, 20, 40]), "at least 60"),
    (lambda v: v["lightship"].update(mass=-1.0), "lightship.mass"),
    (lambda v: v["tanks"][0].update(density=0.0), "tanks[0].density"),
    (lambda v: v.update(criteria=["is2008.genral"]), "unknown criteria set"),
    (lambda v: v.pop("cross_curves"), "go together"),
    (lambda v: v["particulars"].update(summer_draft=12.0), "less than depth"),
    (lambda v: v["windage"].update(profile=[[0, 0], [10, 10], [10, 0], [0, 10]]), "simple"),
])
def test_bad_vessel_tables(tmp_path, change, words):
    vessel = box_vessel()
    change(vessel)
    msg = refusal(tmp_path, vessel=vessel)
    assert "vessel.yaml" in msg and words in msg


def test_hull_only_vessel_loads_but_cannot_be_evaluated(tmp_path):
    vessel = box_vessel()
    del vessel["hydrostatics"], vessel["cross_curves"]
    vessel["hull"] = {"stations": [{"x": x, "points": [[0, 0], [10, 0], [10, 10]]}
                                   for x in (0.0, 50.0, 100.0)]}
    (tmp_path / "hull.yaml").write_text(yaml.safe_dump(vessel))
    assert load_vessel(tmp_path / "hull.yaml").hull.density == 1.025
    msg = refusal(tmp_path, vessel=vessel)
    assert "reportgen tables" in msg
