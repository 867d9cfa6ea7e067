"""`reportgen show` and `reportgen new` on the demo vessel (SPEC.md, "Command line" and
"Setting up a ship").

References: the vessel file itself read with PyYAML (an independent reader): every tank, its
capacity (the last volume of its table) and largest FSM (the largest fsi × density, IS Code
2008 Part B 3.1.3.2), every table's first and last row; and `reportgen check`, which must
accept the condition `new` writes.
"""

from __future__ import annotations

import json
from pathlib import Path

import jsonschema
import pytest
import yaml
from click.testing import CliRunner

from reportgen.cli import main

ROOT = Path(__file__).resolve().parent.parent
VESSEL = ROOT / "conditions/vessels/linnet-demo.yaml"
DATA = yaml.safe_load(VESSEL.read_text())


def run(*args: str):
    return CliRunner().invoke(main, [str(a) for a in args])


def test_show_json_lists_tanks_criteria_and_ranges():
    done = run("show", VESSEL, "--json")
    assert done.exit_code == 0, done.output
    s = json.loads(done.stdout)
    assert [t["id"] for t in s["tanks"]] == [t["id"] for t in DATA["tanks"]]
    for got, tank in zip(s["tanks"], DATA["tanks"], strict=True):
        assert got["capacity_m3"] == tank["table"]["volume"][-1]
        assert got["capacity_t"] == pytest.approx(tank["table"]["volume"][-1] * tank["density"])
        assert got["fsm_max"] == pytest.approx(max(tank["table"]["fsi"]) * tank["density"])
    assert s["criteria"] == DATA["criteria"]
    h, c = s["tables"]["hydrostatics"], s["tables"]["cross_curves"]
    assert h["draft"] == [DATA["hydrostatics"]["draft"][0], DATA["hydrostatics"]["draft"][-1]]
    assert c["heel"] == [0.0, DATA["cross_curves"]["heel"][-1]]
    assert c["displacement"][1] == DATA["cross_curves"]["displacement"][-1]
    assert len(s["openings"]) == len(DATA["openings"])
    assert s["tables"]["hull"]["stations"] == len(DATA["hull"]["stations"])
    holds = DATA.get("grain", {}).get("compartments", [])
    assert [(h["id"], h["volume_m3"]) for h in s["holds"]] == [
        (c["id"], c["filled"]["volume"]) for c in holds]


def test_show_text_is_a_readable_table():
    done = run("show", VESSEL)
    assert done.exit_code == 0
    out = done.stdout
    for word in ("Tanks (16)", "Capacity m³", "Largest FSM t·m", "Openings (4)",
                 "is2008.general", "hydrostatics", "cross curves", "trim free"):
        assert word in out
    for tank in DATA["tanks"]:
        assert tank["name"] in out


def test_show_escapes_control_characters(tmp_path):
    text = VESSEL.read_text().replace("name: Aft peak", 'name: "Aft\\e[2Jpeak\\nX"', 1)
    path = tmp_path / "v.yaml"
    path.write_text(text)
    done = run("show", path)
    assert done.exit_code == 0 and "\x1b" not in done.stdout and "Aft\\x1b[2Jpeak" in done.stdout


def test_show_bad_input_exits_2(tmp_path):
    bad = tmp_path / "bad.yaml"
    bad.write_text("format: reportgen/vessel-1\nvessel: [\n")
    for path in (bad, tmp_path / "missing.yaml", Path("/dev/zero")):
        done = run("show", path)
        assert done.exit_code == 2 and "Traceback" not in done.output


def test_new_writes_a_condition_check_accepts(tmp_path):
    out = tmp_path / "sub" / "departure.yaml"
    out.parent.mkdir()
    done = run("new", VESSEL, "-o", out)
    assert done.exit_code == 0, done.output
    text = out.read_text()
    data = yaml.safe_load(text)
    first = text.splitlines()[0]
    hint = first.removeprefix("# yaml-language-server: $schema=")
    assert hint != first and (out.parent / hint).resolve() == ROOT / "docs/schema/condition.schema.json"
    # The editor's schema (jsonschema, an independent validator) accepts the template.
    schema = json.loads((ROOT / "docs/schema/condition.schema.json").read_text())
    jsonschema.Draft202012Validator(schema).validate(data)
    assert (out.parent / data["vessel"]).resolve() == VESSEL.resolve()
    assert data["tanks"] == {t["id"]: {"percent": 0} for t in DATA["tanks"]}
    assert data["items"] == []
    assert "# Lightship" in text and "2400.0 t" in text
    assert "#  - {name: " in text  # the commented example item
    apt = next(ln for ln in text.splitlines() if ln.startswith("  APT:"))
    assert f"capacity {DATA['tanks'][0]['table']['volume'][-1]:.1f} m³" in apt
    checked = run("check", out, "--json")
    assert checked.exit_code in (0, 1), checked.output
    assert json.loads(checked.stdout)["loading"]["deadweight"] == 0.0


def test_new_never_replaces(tmp_path):
    out = tmp_path / "c.yaml"
    out.write_text("mine")
    done = run("new", VESSEL, "-o", out)
    assert done.exit_code == 2 and out.read_text() == "mine"
    assert run("new", VESSEL, "-o", out, "--force").exit_code == 0
    copy = tmp_path / "v.yaml"
    copy.write_bytes(VESSEL.read_bytes())
    done = run("new", copy, "-o", copy, "--force")
    assert done.exit_code == 2 and copy.read_bytes() == VESSEL.read_bytes()


def test_new_lists_the_holds_for_grain(tmp_path):
    """With grain compartments in the vessel file the template carries a commented grain
    block; uncommented as it stands it is a condition `check` evaluates."""
    holds = DATA.get("grain", {}).get("compartments", [])
    if not holds:
        pytest.skip("the demo vessel has no grain compartments")
    out = tmp_path / "grain.yaml"
    assert run("new", VESSEL, "-o", out).exit_code == 0
    lines = out.read_text().splitlines()
    start = lines.index("# grain:")
    block = [ln[2:] for ln in lines[start:start + 3 + len(holds)]]
    text = "\n".join(lines[:start] + block + lines[start + 3 + len(holds):]) + "\n"
    for c in holds:
        assert f"{c['id']}: {{filled: trimmed}}" in text
    out.write_text(text)
    checked = run("check", out, "--json")
    assert checked.exit_code in (0, 1), checked.output
    assert json.loads(checked.stdout)["grain"] is not None
