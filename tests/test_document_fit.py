"""Figures that do not fit their table column: a large ship's sheet is laid out again with
tables sized by their content (CSS 2.1, 17.5.2.2, automatic table layout) rather than print
two numbers run together; a figure that fits no layout is refused.

The large ship is the analytic box barge of eval_box scaled by 3 in every dimension (geometric
similarity, e.g. Rawson & Tupper, Basic Ship Theory, ch. 2: displacement scales with the
cube, KN and centres with the scale, MCT with the fourth power, TPC with the square): about
376,000 t, whose masses and moments have six or seven digits.
"""

from __future__ import annotations

import pytest
import weasyprint
import yaml
from eval_box import condition_dict, vessel_dict

from reportgen.errors import InputError
from reportgen.inputs import load_case
from reportgen.pipeline import evaluate
from reportgen.report import engine, render

SCALE = 3.0


def large_box(folder):
    v = vessel_dict()
    s = SCALE
    for key in ("length_bp", "breadth", "depth", "summer_draft"):
        v["particulars"][key] *= s
    v["lightship"] = {"mass": 27000.0, "lcg": 150.0, "vcg": 12.0, "tcg": 0.0}
    h = v["hydrostatics"]
    for key, power in (("draft", 1), ("displacement", 3), ("lcb", 1), ("lcf", 1), ("kmt", 1),
                       ("mct", 3), ("tpc", 2)):  # MCT = Δ·GML/(100·L) ∝ s³
        h[key] = [x * s ** power for x in h[key]]
    c = v["cross_curves"]
    c["displacement"] = [x * s ** 3 for x in c["displacement"]]
    c["kn"] = [[k * s for k in row] for row in c["kn"]]
    v["windage"]["profile"] = [[x * s, z * s] for x, z in v["windage"]["profile"]]
    t = v["tanks"][0]["table"]
    for key, power in (("sounding", 1), ("lcg", 1), ("vcg", 1), ("tcg", 1), ("volume", 3),
                       ("fsi", 5)):
        t[key] = [x * s ** power for x in t[key]]
    (folder / "box.yaml").write_text(yaml.safe_dump(v, sort_keys=False), encoding="utf-8")
    items = [{"name": "Cargo", "mass": 330000.0, "lcg": 150.0, "vcg": 20.0},
             {"name": "Fuel", "mass": 12345.6, "lcg": 100.0, "vcg": 3.0, "tcg": 1.0}]
    path = folder / "cond.yaml"
    path.write_text(yaml.safe_dump(condition_dict(items=items, tanks={"T1": {"percent": 50.0}}),
                                   sort_keys=False), encoding="utf-8")
    return path


def test_a_large_ships_figures_are_never_run_together(tmp_path):
    case = load_case(large_box(tmp_path))
    results = evaluate(case)
    assert results.loading.displacement > 300000.0
    text = render.sheet_html(case, results)
    fixed = engine.document_html(text, "test").render(
        stylesheets=[render._stylesheet()], font_config=render.fonts.font_config())
    assert engine.overflowing_figures(fixed)  # the fixed widths alone would run them together
    assert engine.overflowing_figures(render.layout_sheet(case, results)) == []


def test_a_figure_that_fits_no_layout_is_refused():
    page = weasyprint.CSS(string="@page { size: 30mm 40mm; margin: 2mm; }"
                                 "table { table-layout: fixed; width: 100%; }")
    wide = "<table><tr><td>1234567890123456789012345.5</td><td>7</td></tr></table>"
    with pytest.raises(InputError, match="too wide"):
        engine.lay_out(wide, "test", [page])
