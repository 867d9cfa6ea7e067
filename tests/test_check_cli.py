"""`reportgen check` through click's CliRunner: exit status 0 / 1 / 2 (SPEC.md, "Command line")
and bad input named in one message without a traceback (SPEC.md, "Conventions")."""

from __future__ import annotations

import json

import pytest
import yaml
from click.testing import CliRunner
from eval_box import RHO, B, L, condition_dict, write_case

from reportgen.cli import main


def _cargo(draft, kg):
    disp = RHO * L * B * draft
    mass = disp - 1000.0
    return {"name": "Cargo", "mass": mass, "lcg": 50.0, "vcg": (disp * kg - 4000.0) / mass}


def _check(path, *args):
    result = CliRunner().invoke(main, ["check", str(path), *args])
    text = result.output + (result.stderr if result.stderr_bytes is not None else "")
    return result, text


def _bad(path, *expected):
    result, text = _check(path)
    assert result.exit_code == 2, text
    assert "Traceback" not in text
    assert result.exception is None or isinstance(result.exception, SystemExit)
    for word in expected:
        assert word in text, (word, text)


def test_passing_condition_exits_0_and_json_is_the_document(tmp_path):
    path = write_case(tmp_path, condition_dict(items=[_cargo(7.0, 6.0)]))
    result, text = _check(path)
    assert result.exit_code == 0, text
    assert "PASS" in text and "Initial GM" in text
    result, _ = _check(path, "--json")
    doc = json.loads(result.stdout)
    assert doc["format"] == "reportgen/results-1" and doc["passed"] is True


def test_failing_condition_exits_1(tmp_path):
    # KG 8 m at T = 7 m: GM = 3.5 + 3.048 − 8 < 0.15 m (IS Code 2008 2.2.4 fails).
    path = write_case(tmp_path, condition_dict(items=[_cargo(7.0, 8.0)]))
    result, text = _check(path)
    assert result.exit_code == 1, text
    assert "FAIL" in text


def test_overfilled_tank(tmp_path):
    cond = condition_dict(items=[_cargo(7.0, 6.0)], tanks={"T1": {"volume": 600.0}})
    _bad(write_case(tmp_path, cond), "T1", "volume")


def test_unknown_tank(tmp_path):
    cond = condition_dict(items=[_cargo(7.0, 6.0)], tanks={"WB9": {"percent": 50}})
    _bad(write_case(tmp_path, cond), "WB9")


def test_typo_in_a_key(tmp_path):
    item = _cargo(7.0, 6.0)
    item["vgc"] = item.pop("vcg")
    _bad(write_case(tmp_path, condition_dict(items=[item])), "vgc")


def test_negative_mass(tmp_path):
    item = dict(_cargo(7.0, 6.0), mass=-5.0)
    _bad(write_case(tmp_path, condition_dict(items=[item])), "mass")


@pytest.mark.parametrize("draft", [12.5, 1.5])
def test_loading_beyond_the_tables(tmp_path, draft):
    # The box tables run from T = 2 to 12 m: beyond them is refused, never extrapolated.
    item = dict(_cargo(draft, 6.0)) if draft > 2 else {"name": "Stores", "mass": 1.0,
                                                       "lcg": 50.0, "vcg": 1.0}
    _bad(write_case(tmp_path, condition_dict(items=[item])), "outside", "table")


def test_broken_yaml(tmp_path):
    path = write_case(tmp_path, condition_dict(items=[_cargo(7.0, 6.0)]))
    path.write_text(path.read_text() + "items: [unclosed\n", encoding="utf-8")
    _bad(path, "cond.yaml", "YAML")


def test_missing_vessel_file(tmp_path):
    path = tmp_path / "cond.yaml"
    cond = condition_dict(items=[_cargo(7.0, 6.0)])
    cond["vessel"] = "no-such-vessel.yaml"
    path.write_text(yaml.safe_dump(cond), encoding="utf-8")
    _bad(path, "no-such-vessel.yaml", "not found")
