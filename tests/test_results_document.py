"""`reportgen check --json` against the results document of SPEC.md ("Results"), key by key,
on every demo condition; and the table-based flow against the hull it was made from.

The key lists below are transcribed from SPEC.md; the tolerances of the second part are those
of MSC.1/Circ.1229 (guidelines for the approval of stability instruments) quoted in SPEC.md.
"""

from __future__ import annotations

import json
from pathlib import Path

import numpy as np
import pytest
from click.testing import CliRunner

from reportgen.cli import main
from reportgen.hull.equilibrium import equilibrium
from reportgen.hull.hydrostatics import prepare_hull
from reportgen.hull.sections import hull_from_stations
from reportgen.inputs import load_case

ROOT = Path(__file__).resolve().parents[1]
CONDITIONS = sorted((ROOT / "conditions").glob("*.yaml"))

SPEC_KEYS = {
    "loading": ["lightship", "deadweight", "displacement", "lcg", "vcg", "tcg", "fsm"],
    "hydrostatics": ["draft_mean", "draft_fore", "draft_aft", "trim", "heel", "lcb", "lcf",
                     "mct", "tpc", "kmt", "kg_solid", "fsc", "kg_fluid", "gm_solid",
                     "gm_fluid"],
    "angles": ["deck_edge", "flooding", "gz_max", "vanishing"],
    "weather": ["wind_pressure", "wind_area", "wind_z", "lw1", "lw2", "theta0", "theta1",
                "theta2", "thetac", "area_a", "area_b", "roll_period", "c", "s", "r", "og",
                "x1", "x2", "k"],
}
SPEC_CRITERIA = {  # SPEC.md "Criteria": id -> (required, unit)
    "area_0_30": (0.055, "m·rad"), "area_0_40": (0.090, "m·rad"),
    "area_30_40": (0.030, "m·rad"), "gz_30": (0.20, "m"), "gz_max_angle": (25.0, "deg"),
    "gm0": (0.15, "m"), "weather_heel": (None, "deg"), "weather_area": (None, "m·rad"),
    # SPEC.md "Cargo and ship-type criteria" (IS Code 2008 Part A 3.3 and 3.1)
    "timber_area_0_40": (0.08, "m·rad"), "timber_gz_max": (0.25, "m"),
    "timber_gm0": (0.10, "m"), "passenger_crowding_heel": (10.0, "deg"),
    "passenger_turning_heel": (10.0, "deg"),
}
SPEC_SETS = {  # SPEC.md: the ids of each criteria set
    "is2008.general": ["area_0_30", "area_0_40", "area_30_40", "gz_30", "gz_max_angle", "gm0"],
    "is2008.weather": ["weather_heel", "weather_area"],
    "is2008.timber": ["timber_area_0_40", "timber_gz_max", "timber_gm0"],
    "is2008.passenger": ["passenger_crowding_heel", "passenger_turning_heel"],
    "grain.2008": ["grain_heel", "grain_residual_area", "grain_gm0"],
    "booklet.limits": ["kg_limit"],  # SPEC.md "Limits": the booklet's curve
}
SPEC_GRAIN_CRITERIA = {  # SPEC.md "Cargo and ship-type criteria", grain.2008 (Grain Code A 7)
    "grain_heel": (None, "deg"), "grain_residual_area": (0.075, "m·rad"),
    "grain_gm0": (0.30, "m"),
}
SPEC_GRAIN_KEYS = ["stowage_factor", "vhm", "heeling_moment", "lambda0", "lambda40", "heel",
                   "residual_area", "residual_to", "allowable_moment"]


def _json(path: Path) -> tuple[int, dict]:
    result = CliRunner().invoke(main, ["check", str(path), "--json"])
    return result.exit_code, json.loads(result.stdout)


@pytest.fixture(scope="module")
def documents():
    return {p.stem: _json(p) for p in CONDITIONS}


def test_there_are_demo_conditions():
    assert len(CONDITIONS) >= 7


@pytest.mark.parametrize("path", CONDITIONS, ids=lambda p: p.stem)
def test_document_has_every_key_of_spec(documents, path):
    code, doc = documents[path.stem]
    assert doc["format"] == "reportgen/results-1"
    assert doc["software"]["name"] == "reportgen" and doc["software"]["version"]
    # SPEC.md: inputs_sha256 = SHA-256 of the condition bytes followed by the vessel bytes.
    assert doc["inputs_sha256"] == load_case(path).inputs_sha256
    assert set(doc["condition"]) >= {"title", "voyage", "date"}
    assert set(doc["vessel"]) >= {"name", "identifier"}
    for group, keys in SPEC_KEYS.items():
        for key in keys:
            assert key in doc[group], f"{group}.{key}"
            value = doc[group][key]
            assert value is None or isinstance(value, (int, float)), f"{group}.{key}"
    # SPEC.md: gz arrays from at most -30 deg to at least 60 deg, every multiple of 5 included.
    heel, gz = doc["gz"]["heel"], doc["gz"]["gz"]
    assert len(heel) == len(gz) and heel[0] <= -30 and heel[-1] >= 60
    assert all(np.any(np.isclose(heel, a)) for a in range(-30, 61, 5))
    assert np.all(np.diff(heel) > 0)
    # SPEC.md: criteria ids, required values and units of the sets applied (IS Code 2008 Part A
    # 2.2 and 2.3, and 3.1 and 3.3 where a condition chooses them).
    by_id = {c["id"]: c for c in doc["criteria"]}
    sets = [s["id"] for s in doc["assumptions"]["criteria_sets"]]
    grain = "grain.2008" in sets
    # booklet.limits: required is the vessel's own curve at Δ, in m (SPEC.md "Limits")
    expected = {cid: SPEC_CRITERIA.get(cid) or SPEC_GRAIN_CRITERIA.get(cid) or (None, "m")
                for sid in sets for cid in SPEC_SETS[sid]}
    assert set(by_id) == set(expected)
    for cid, (required, unit) in expected.items():
        c = by_id[cid]
        assert c["unit"] == unit and isinstance(c["passed"], bool) and c["title"]
        if cid in SPEC_CRITERIA or cid in SPEC_GRAIN_CRITERIA:
            assert c["reference"].startswith("IS Code 2008" if cid in SPEC_CRITERIA
                                             else "International Grain Code (MSC.23(59)), A 7.1")
        if required is not None:
            assert c["required"] == pytest.approx(required)
    # weather_heel: required = min(16 deg, 0.8 x deck edge angle) (IS Code 2008 2.3.1.2).
    assert by_id["weather_heel"]["required"] == pytest.approx(
        min(16.0, 0.8 * doc["angles"]["deck_edge"]), abs=1e-5)
    # weather_area: required = a, attained = b (SPEC.md).
    assert by_id["weather_area"]["required"] == doc["weather"]["area_a"]
    assert by_id["weather_area"]["attained"] == doc["weather"]["area_b"]
    assert doc["weather"]["wind_pressure"] == 504
    if grain:  # SPEC.md: the results' grain keys
        assert all(key in doc["grain"] for key in SPEC_GRAIN_KEYS)
    # passed is the conjunction of the criteria; the exit status follows it (SPEC.md).
    assert doc["passed"] == all(c["passed"] for c in doc["criteria"])
    assert code == (0 if doc["passed"] else 1)
    assert isinstance(doc["warnings"], list)


def test_only_the_failing_demo_condition_fails(documents):
    verdicts = {name: doc["passed"] for name, (_, doc) in documents.items()}
    assert {n for n, ok in verdicts.items() if not ok} == {
        n for n in verdicts if n.startswith("fails-")}


@pytest.mark.parametrize("name", ["full-load-departure", "ballast-departure"])
def test_table_flow_agrees_with_the_hull(documents, name):
    """The chain from the committed tables against a direct equilibrium of the hull offsets
    the tables were made from (upright at the condition's Δ and LCG; then heeled at the
    condition's LCG). Tolerances: MSC.1/Circ.1229 (SPEC.md) for displacement-dependent
    results and cross curves (5 cm); the draughts within 3 cm (the table flow rotates the
    waterplane about the LCF; the hull solution is exact for the offsets)."""
    _, doc = documents[name]
    case = load_case(ROOT / "conditions" / f"{name}.yaml")
    vessel = case.vessel
    hull = hull_from_stations([(s.x, np.asarray(s.points)) for s in vessel.hull.stations])
    lpp = vessel.particulars.length_bp
    geom = prepare_hull(hull, lpp)
    rho = case.condition.condition.water_density
    load, hyd = doc["loading"], doc["hydrostatics"]
    volume = load["displacement"] / rho
    upright = equilibrium(geom, volume, 0.0, lcg_m=load["lcg"])
    assert upright.plane.draft_m() == pytest.approx(hyd["draft_mean"], abs=0.03)
    assert upright.plane.trim_m(lpp) == pytest.approx(hyd["trim"], abs=0.03)
    gz = dict(zip(doc["gz"]["heel"], doc["gz"]["gz"], strict=True))
    kg = hyd["kg_fluid"]
    for heel in (10.0, 20.0, 30.0, 40.0, 50.0):
        eq = equilibrium(geom, volume, heel, lcg_m=load["lcg"])
        direct = eq.kn_m - kg * np.sin(np.radians(heel))
        assert gz[heel] == pytest.approx(direct, abs=0.05), heel


def test_arrays_rounded_at_once_equal_python_round():
    """The GZ arrays are rounded with numpy (results.rounded) and must give what Python's
    round(x, 6) gives value by value (the reference: Python's documentation, built-in
    round(), correctly rounded, ties to even), including values at a tie of the 7th decimal
    and just beside it, −0.0, and non-finite values (null)."""
    from reportgen.results import clean, rounded

    rng = np.random.default_rng(7)
    k = rng.integers(-10**9, 10**9, 20000)
    ties = (k + 0.5) / 1e6
    values = np.concatenate([
        rng.normal(0.0, 1.0, 20000), rng.normal(0.0, 1e4, 20000), ties,
        np.nextafter(ties, np.inf), np.nextafter(ties, -np.inf),
        [0.0, -0.0, -1e-9, 5e-7, -5e-7, 2.675, 0.0078125, 1e16 + 2.0, np.inf, -np.inf, np.nan]])
    got = rounded(values)
    want = [clean(float(x)) for x in values]
    assert [repr(g) for g in got] == [repr(w) for w in want]


def _clean_by_round(value):
    """The document's rule value by value with Python's round (the reference of
    reportgen.plainjson.clean): floats round(x, 6), −0.0 as 0.0, non-finite as None; tuples
    as lists; numpy scalars as Python numbers."""
    if isinstance(value, dict):
        return {str(k): _clean_by_round(v) for k, v in value.items()}
    if isinstance(value, list | tuple):
        return [_clean_by_round(v) for v in value]
    if isinstance(value, bool | str | int) or value is None:
        return value
    if hasattr(value, "item"):
        return _clean_by_round(value.item())
    x = float(value)
    if not np.isfinite(x):
        return None
    r = round(x, 6)
    return 0.0 if r == 0 else r


def test_clean_rounds_a_whole_document_as_round_does():
    """clean walks the document once and rounds every float (and each Floats list) in one
    numpy call: the result must be what Python's round gives value by value, in place, with
    the document's shape and key order."""
    from reportgen.plainjson import Floats, clean

    rng = np.random.default_rng(3)
    ties = ((rng.integers(-10**9, 10**9, 50) + 0.5) / 1e6).tolist()
    odd = [0.0, -0.0, -1e-9, 5e-7, -5e-7, 2.675, 1e16 + 2.0, float("inf"), float("nan")]
    doc = {
        "a": ties[:10] + odd, "b": tuple(rng.normal(0, 1e3, 10).tolist()),
        "c": {"x": np.float64(1.0000005), "y": np.int64(3), "z": np.bool_(True), 7: 0.1234565},
        "d": [{"k": t, "n": None, "s": "text", "i": 2, "t": True} for t in ties[10:30]],
        "gz": Floats(ties[30:] + odd), "arr": Floats(np.array(ties[:5])),
        "e": [[1.0000005, [2.0000005, (3.0000005,)]]],
        "f": 1.5e-7,
    }
    want = _clean_by_round({**doc, "gz": doc["gz"].values, "arr": ties[:5]})
    got = clean(doc)
    assert json.dumps(got) == json.dumps(want)
    assert [repr(v) for v in got["gz"]] == [repr(v) for v in want["gz"]]
    assert clean(-0.0) == 0.0 and clean(float("nan")) is None and clean([]) == []
