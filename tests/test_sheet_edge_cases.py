"""The sheet for conditions where quantities of the criteria do not exist (results null):
it must still render every section, never crash. Data: the analytic box barge of eval_box.

For the box, GM = KB + BMt − KG with KB = T/2 and BMt = B²/(12T) (standard naval
architecture texts); at T = 6 m, B = 16 m: KMt = 3 + 256/72 = 6.556 m, so KG = 7.5 m gives
a negative GM and an angle of loll.
"""

from __future__ import annotations

import io

import yaml
from eval_box import RHO, B, L, condition_dict, write_case
from pypdf import PdfReader

from reportgen.inputs import load_case
from reportgen.pipeline import evaluate
from reportgen.report.render import render_sheet


def test_sheet_of_a_lolling_box_renders_with_missing_weather_values(tmp_path):
    draft, kg = 6.0, 7.5
    disp = RHO * L * B * draft
    mass = disp - 1000.0  # the box's lightship: 1000 t at VCG 4 m
    item = {"name": "Cargo", "mass": mass, "lcg": L / 2, "vcg": (disp * kg - 4000.0) / mass}
    case = load_case(write_case(tmp_path, condition_dict(items=[item])))
    results = evaluate(case)
    doc = results.to_dict()
    assert doc["hydrostatics"]["gm_fluid"] < 0 and not doc["passed"]
    assert any("lolls" in w for w in doc["warnings"])
    assert doc["weather"]["theta1"] is None and doc["weather"]["theta_start"] is None
    reader = PdfReader(io.BytesIO(render_sheet(case, results)))
    text = " ".join(page.extract_text() for page in reader.pages)
    assert "Severe wind and rolling" in text and "Caution" in text


def test_sheet_of_a_capsizing_box_draws_its_figures(tmp_path):
    # KG = 12 m at T = 7 m: KMt = 3.5 + 256/84 = 6.55 m, GZ < 0 at every heel (the box
    # capsizes); the figures must still get a proper scale (no matplotlib warning).
    import warnings

    from reportgen.report.render import sheet_html

    draft, kg = 7.0, 12.0
    disp = RHO * L * B * draft
    mass = disp - 1000.0
    item = {"name": "Cargo", "mass": mass, "lcg": L / 2, "vcg": (disp * kg - 4000.0) / mass}
    case = load_case(write_case(tmp_path, condition_dict(items=[item])))
    results = evaluate(case)
    assert max(results.gz.gz[60:]) <= 0.0  # heels 0° and up
    with warnings.catch_warnings():
        warnings.simplefilter("error", UserWarning)
        assert "Severe wind and rolling" in sheet_html(case, results)


def test_text_the_typeface_cannot_draw_is_refused_with_nothing_written(tmp_path):
    # Source: the typeface's own character map (DejaVu Sans as matplotlib ships it, read with
    # fontTools). It has no glyph for the control character BEL (U+0007, written here as the
    # YAML escape "\a") nor for the CJK ideograph U+6E2F; WeasyPrint would draw each as an
    # empty box on a signed record. It has the Latin, Greek and mathematical signs a sheet
    # prints (checked here on a sample).
    from click.testing import CliRunner

    from reportgen.cli import main
    from reportgen.report.fonts import unprintable

    assert unprintable("Göteborg – Gdańsk, Şile; Δ θ φ ≥ ≤ − · ² ° ✓ ✗\n\t") == []
    assert unprintable("bell\a, port 港") == ["\a", "港"]
    item = {"name": "Cargo", "mass": 3000.0, "lcg": L / 2, "vcg": 4.0}
    for title, named in (("bell\a here", "U+0007"), ("Port 港", "U+6E2F")):
        case = write_case(tmp_path, condition_dict(items=[item]))
        text = case.read_text(encoding="utf-8").replace(
            "Box barge test condition", yaml.safe_dump(title, default_style='"').strip())
        case.write_text(text, encoding="utf-8")
        out = tmp_path / "sheet.pdf"
        result = CliRunner().invoke(main, ["sheet", str(case), "-o", str(out)])
        assert result.exit_code == 2, result.output
        assert named in result.output and "typeface" in result.output
        assert not out.exists()


def test_a_name_longer_than_its_column_stays_inside_its_cell(tmp_path):
    # A name with no space to break at is broken inside the word (CSS Text 3, overflow-wrap:
    # break-word) instead of running over the next column's figures.
    from weasyprint.formatting_structure import boxes

    from reportgen.report.render import layout_sheet

    name = "Hold1cargoloadedbythestarboardcranesinthreetiersWITHOUTANYSPACEATALL"
    item = {"name": name, "mass": 3000.0, "lcg": L / 2, "vcg": 4.0}
    case = load_case(write_case(tmp_path, condition_dict(items=[item])))
    document = layout_sheet(case, evaluate(case))
    cells = [b for page in document.pages for b in page._page_box.descendants()
             if isinstance(b, boxes.TableCellBox)]
    named = [c for c in cells
             if name[:8] in "".join(t.text for t in c.descendants()
                                    if isinstance(t, boxes.TextBox))]
    assert named
    for cell in named:
        left, right = cell.content_box_x(), cell.content_box_x() + cell.width
        texts = [t for t in cell.descendants() if isinstance(t, boxes.TextBox)]
        assert len(texts) > 1  # broken over lines
        for t in texts:
            assert left - 0.5 <= t.position_x and t.position_x + t.width <= right + 0.5, t.text
