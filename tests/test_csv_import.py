"""`reportgen import`: a table exported from a spreadsheet back to the YAML block it came from.

Round trips: each table of the demo vessel file written as CSV (the layout SPEC.md gives:
a header row of key names; cross curves with the heels in the header and the displacements
in the first column; offsets one row per point), imported, equals the YAML it came from.
Python's csv module is the reference writer of the spreadsheet dialect (RFC 4180 quoting).
"""

from __future__ import annotations

import csv
import io
from pathlib import Path

import pytest
import yaml
from click.testing import CliRunner

from reportgen.cli import main
from reportgen.inputs.csvtables import as_csv

ROOT = Path(__file__).resolve().parent.parent


def _at_trim_zero(data: dict) -> dict:
    """The demo's hydrostatics and cross curves at trim 0 as one-trim tables (the demo vessel
    file carries them at several trims)."""
    h, c = dict(data["hydrostatics"]), dict(data["cross_curves"])
    if "trims" in h:
        k = h.pop("trims").index(0.0)
        h = {key: v if key in ("density", "draft") else v[k] for key, v in h.items()}
    if "trims" in c:
        c["kn"] = c["kn"][c.pop("trims").index(0.0)]
    return {**data, "hydrostatics": h, "cross_curves": c}


DEMO = _at_trim_zero(yaml.safe_load((ROOT / "conditions/vessels/linnet-demo.yaml").read_text()))


def run_import(tmp_path, kind: str, text: str, *extra: str):
    path = tmp_path / f"{kind}.csv"
    path.write_text(text, encoding="utf-8")
    return CliRunner().invoke(main, ["import", kind, str(path), *extra])


def imported(tmp_path, kind: str, text: str, *extra: str) -> dict:
    done = run_import(tmp_path, kind, text, *extra)
    assert done.exit_code == 0, done.output
    return yaml.safe_load(done.stdout)


def test_hydrostatics_round_trip(tmp_path):
    h = DEMO["hydrostatics"]
    keys = ["draft", "displacement", "lcb", "lcf", "kmt", "mct", "tpc", "lwl", "cb"]
    header = ["draft (m)", "displacement (t)", "lcb [m]", "lcf", "kmt", "mct (t·m/cm)",
              "tpc (t/cm)", "lwl", "cb"]
    text = as_csv(header, list(zip(*(h[k] for k in keys), strict=True)))
    got = imported(tmp_path, "hydrostatics", text, "--density", str(h["density"]))
    assert got == {"hydrostatics": h}


def test_cross_curves_round_trip(tmp_path):
    c = DEMO["cross_curves"]
    header = ["displacement (t)", *[f"{h:g}" for h in c["heel"]]]
    rows = [[d, *row] for d, row in zip(c["displacement"], c["kn"], strict=True)]
    got = imported(tmp_path, "cross-curves", as_csv(header, rows), "--trim", c["trim"])
    assert got == {"cross_curves": c}


def test_tank_round_trip(tmp_path):
    tank = DEMO["tanks"][0]["table"]
    keys = ["sounding", "volume", "lcg", "vcg", "tcg", "fsi"]
    text = as_csv(keys, list(zip(*(tank[k] for k in keys), strict=True)))
    assert imported(tmp_path, "tank", text) == {"table": tank}


def test_offsets_round_trip(tmp_path):
    hull = DEMO["hull"]
    rows = [[s["x"], y, z] for s in hull["stations"] for y, z in s["points"]]
    got = imported(tmp_path, "offsets", as_csv(["x", "y", "z"], rows))
    assert got == {"hull": hull}


def test_semicolons_and_decimal_commas(tmp_path):
    text = "sounding;volume;lcg;vcg;tcg;fsi\n0;0;5,5;1;0;2,25\n1,5;12,75;5,5;1,75;0;2,25\n"
    got = imported(tmp_path, "tank", text)["table"]
    assert got["volume"] == [0.0, 12.75] and got["lcg"] == [5.5, 5.5]


def test_written_to_a_file(tmp_path):
    path = tmp_path / "t.csv"
    path.write_text("sounding,volume,lcg,vcg,tcg,fsi\n0,0,1,1,0,1\n1,2,1,1.5,0,1\n")
    out = tmp_path / "t.yaml"
    done = CliRunner().invoke(main, ["import", "tank", str(path), "-o", str(out)])
    assert done.exit_code == 0 and yaml.safe_load(out.read_text())["table"]["volume"] == [0, 2]
    again = CliRunner().invoke(main, ["import", "tank", str(path), "-o", str(out)])
    assert again.exit_code == 2 and "--force" in again.output


# --- errors name the line and the column ----------------------------------------------------

TANK_HEADER = "sounding,volume,lcg,vcg,tcg,fsi\n"


@pytest.mark.parametrize("text,expected", [
    (TANK_HEADER + "0,0,1,1,0,1\n1,2,1,1,0,1\n0.5,3,1,1,0,1\n",
     "line 4, column 1 (sounding): 0.5 does not increase on 1 (line 3)"),
    (TANK_HEADER + "0,0,1,1,0,1\n1,abc,1,1,0,1\n", "line 3, column 2 (volume): 'abc' is not"),
    (TANK_HEADER + "0,0,1,1,0,1\n1,nan,1,1,0,1\n", "line 3, column 2 (volume)"),
    (TANK_HEADER + "0,0,1,1,0,1\n1,2,1,1,0\n", "line 3: 5 cells, the header has 6"),
    (TANK_HEADER + "0,0,1,1,0,-1\n1,2,1,1,0,1\n", "line 2, column 6 (fsi): -1 must be not neg"),
    ("sounding (m),volume (litres),lcg,vcg,tcg,fsi\n0,0,1,1,0,1\n",
     "header, column 2 (volume): unit 'litres', expected m³"),
    ("sounding,volume,lcg,vcg,tcg\n0,0,1,1,0\n", "missing column(s) fsi"),
    ("sounding,volume,lcg,vcg,tcg,fsi,colour\n", "no rows under the header"),
    ("sounding,volume,lcg,vcg,tcg,fsi,colour\n0,0,1,1,0,1,2\n", "column 7: unknown key 'colour'"),
    ("", "the file is empty"),
])
def test_tank_errors(tmp_path, text, expected):
    done = run_import(tmp_path, "tank", text)
    assert done.exit_code == 2 and expected in done.output, done.output
    assert "Traceback" not in done.output


def test_hydrostatics_errors(tmp_path):
    head = "draft,displacement,lcb,lcf,kmt,mct,tpc,cb\n"
    done = run_import(tmp_path, "hydrostatics", head + "1,100,5,5,9,1,1,0.8\n2,210,5,5,8,1,1,1.2\n")
    assert done.exit_code == 2 and "line 3, column 8 (cb): 1.2 must be at most 1" in done.output
    done = run_import(tmp_path, "hydrostatics", head + "1,100,5,5,9,1,1,0.8\n2,90,5,5,8,1,1,.8\n")
    assert done.exit_code == 2 and "line 3, column 2 (displacement)" in done.output


def test_cross_curve_errors(tmp_path):
    good = "displacement,0,30,60\n100,0,1,2\n200,0,1.1,2.1\n"
    done = run_import(tmp_path, "cross-curves", good)  # without --trim: free, said so
    assert done.exit_code == 0 and "trim: free    # assumed" in done.stdout
    assert "made free to trim" in done.stderr
    assert yaml.safe_load(done.stdout)["cross_curves"]["trim"] == "free"
    done = run_import(tmp_path, "cross-curves", good.replace("30,60", "30,45"), "--trim", "free")
    assert done.exit_code == 2 and "at least 60" in done.output
    done = run_import(tmp_path, "cross-curves", good.replace("1.1", "x"), "--trim", "free")
    assert done.exit_code == 2 and "line 3, column 3 (KN at 30°)" in done.output


def test_offsets_errors(tmp_path):
    done = run_import(tmp_path, "offsets", "x,y,z\n0,0,0\n0,1,2\n0,1,1\n")
    assert done.exit_code == 2 and "line 4, column z" in done.output
    done = run_import(tmp_path, "offsets", "x,y,z\n5,0,0\n5,1,1\n0,0,0\n0,1,1\n")
    assert done.exit_code == 2 and "line 4, column x" in done.output


def test_csv_reference_reader_agrees():
    """as_csv writes what Python's csv module reads back (quoting of a unit with a comma)."""
    text = as_csv(["a, b", "c"], [[1.5, 2.0]])
    assert list(csv.reader(io.StringIO(text))) == [["a, b", "c"], ["1.5", "2.0"]]


def test_not_utf8_or_binary(tmp_path):
    path = tmp_path / "bin.csv"
    path.write_bytes(b"\xff\xfe\x00garbage")
    done = CliRunner().invoke(main, ["import", "tank", str(path)])
    assert done.exit_code == 2 and "UTF-8" in done.output


def test_trimmed_tables_round_trip(tmp_path):
    """Tables at several trims (SPEC `trims`): a trim column, the rows of each trim together.
    The per-trim values are the demo's scaled a little (invented for the round trip)."""
    h = DEMO["hydrostatics"]
    trims = [-1.0, 0.0, 1.5]
    keys = ["displacement", "lcb", "lcf", "kmt", "mct", "tpc"]
    block = {"density": 1.025, "trims": trims, "draft": h["draft"],
             **{k: [[round(v * (1 + 0.01 * t), 4) for v in h[k]] for t in trims] for k in keys}}
    rows = [[t, d, *(block[k][i][r] for k in keys)] for i, t in enumerate(trims)
            for r, d in enumerate(h["draft"])]
    got = imported(tmp_path, "hydrostatics", as_csv(["trim (m)", "draft", *keys], rows))
    assert got == {"hydrostatics": block}

    c = DEMO["cross_curves"]
    kn = [[[round(v + 0.01 * t, 4) for v in row] for row in c["kn"]] for t in trims]
    rows = [[t, d, *kn[i][r]] for i, t in enumerate(trims)
            for r, d in enumerate(c["displacement"])]
    header = ["trim", "displacement", *[f"{x:g}°" for x in c["heel"]]]
    got = imported(tmp_path, "cross-curves", as_csv(header, rows), "--trim", "fixed")
    assert got == {"cross_curves": {"trim": "fixed", "trims": trims, "heel": c["heel"],
                                    "displacement": c["displacement"], "kn": kn}}
    # a trim whose draughts differ from the first trim's: the line is named
    bad = rows[: len(c["displacement"]) + 1]
    bad[-1] = [trims[1], bad[-1][1] + 5.0, *bad[-1][2:]]
    done = run_import(tmp_path, "cross-curves", as_csv(header, bad), "--trim", "free")
    assert done.exit_code == 2 and "line " in done.output and "differ" in done.output
