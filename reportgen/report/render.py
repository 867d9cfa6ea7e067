"""The calculation sheet: results -> HTML (jinja2, templates/) -> PDF/A-3b (WeasyPrint).

Python passes values; every word of the sheet is in templates/ (sheet.html.j2,
sheet.css, labels.j2). The PDF carries the condition and vessel files byte for byte
and the results document as PDF/A-3 associated files (ISO 19005-3:2012, 6.8), and
three empty signature fields (ISO 32000-1:2008, 12.7.4.5) placed over the boxes of
the signature block, for pyHanko to fill by name. The vessel data's approval
(VESSEL.yaml.p7s, reportgen.provenance), when the case carries one, is embedded too, and
the document information records the versions of the rendering stack (reportgen.report.stack),
so that ``verify`` can tell a different stack from a different page.

Lengths in this module: CSS px from WeasyPrint's layout, PDF points in the file
(1 px = 0.75 pt, CSS Values and Units Level 3, 5.2).
"""

from __future__ import annotations

import base64
import hashlib
import json
import math
import os
from collections.abc import Callable, Iterator
from contextlib import contextmanager
from datetime import UTC, date, datetime
from functools import lru_cache
from importlib.resources import files
from pathlib import Path
from typing import Any

import jinja2
import pydyf
import weasyprint

from reportgen import provenance
from reportgen.assemble import attachment_names
from reportgen.docinfo import RESULTS_NAME, ROLES, approval_name, document_number
from reportgen.errors import InputError
from reportgen.files import check_output, write_atomic
from reportgen.limits import printed_down, printed_up
from reportgen.report import fonts, stack
from reportgen.report.engine import collector_paused, lay_out
from reportgen.report.figure_heeling import heeling_figure_svg
from reportgen.report.figures import gz_figure_svg, weather_figure_svg
from reportgen.report.grainfigure import grain_figure_svg
from reportgen.results import Results
from reportgen.stability import curve_towards_side

PDF_VARIANT = "pdf/a-3b"  # ISO 19005-3, conformance level B
PX_TO_PT = 0.75  # CSS px to PDF pt (96 px = 72 pt = 1 in)
STACK_KEY = "RenderingStack"  # /Info entry: the versions that made the pages (JSON text)
FIXED_EPOCH = datetime(1970, 1, 1, tzinfo=UTC)  # document date when the condition states none
GZ_TABLE_STEP_DEG = 5
GZ_TABLE_MAX_COLUMNS = 13  # values per row of the GZ table that fit the A4 text width

# Decimals printed per quantity (a house choice, finer than the MSC.1/Circ.1229 tolerances).
DECIMALS = {
    "mass": 1,  # t
    "coord": 3,  # m, LCG/VCG/TCG/LCB/LCF/KG/KM
    "draft": 3,  # m
    "mm": 0,  # mm, load line allowances
    "lever": 3,  # m, GZ, GM, lw
    "lever4": 4,  # m, the small wind levers
    "fsm": 1,  # t·m
    "percent": 1,  # %
    "percent2": 2,  # %, the draught survey's difference and tolerance
    "mct2": 2,  # t·m/cm, the draught survey's MCT (the second trim correction by hand)
    "volume": 1,  # m³
    "density": 4,  # t/m³
    "angle": 1,  # deg
    "area": 4,  # m·rad
    "mct": 1,  # t·m/cm
    "tpc": 2,  # t/cm
    "factor": 3,  # dimensionless
    "period": 2,  # s
    "wind_area": 1,  # m²
    "pressure": 0,  # N/m²
    "length": 2,  # m
}
UNIT_QUANTITY = {"m·rad": "area", "m": "lever", "deg": "angle", "°": "angle", "t": "mass"}


def format_number(value: float | None, quantity: str) -> str:
    """Fixed decimals per quantity (``DECIMALS``); an en dash for a missing value."""
    if value is None:
        return "–"
    text = f"{float(value):.{DECIMALS[quantity]}f}"
    if text.startswith("-") and float(text) == 0.0:
        text = text[1:]
    return text.replace("-", "−")


def format_signed(value: float | None, quantity: str) -> str:
    """Like ``format_number`` with an explicit + sign on positive values."""
    text = format_number(value, quantity)
    return text if text.startswith(("−", "–")) or float(text) == 0.0 else "+" + text


def format_by_unit(value: float | None, unit: str) -> str:
    """Decimals chosen by the unit of a criterion (m·rad, m, deg)."""
    return format_number(value, UNIT_QUANTITY.get(unit, "factor"))


def document_date(stated: str | date | None) -> datetime:
    """The fixed date of the document: the condition's date at 00:00 UTC, else 1970-01-01."""
    if stated is None:
        return FIXED_EPOCH
    day = stated if isinstance(stated, date) else date.fromisoformat(str(stated)[:10])
    return datetime(day.year, day.month, day.day, tzinfo=UTC)


def gz_table(heel_deg: list[float], gz: list[float], kn: list[float], side: str,
             step_deg: int = GZ_TABLE_STEP_DEG) -> list[dict]:
    """Rows {heel, kn, gz} at every ``step_deg`` from 0° to the table's end, towards
    ``side`` (KN is odd in heel, so it turns with the side as GZ does)."""
    heel, lever = curve_towards_side(heel_deg, gz, side)
    _, kn = curve_towards_side(heel_deg, kn, side)
    rows = []
    for h, k, g in zip(heel, kn, lever, strict=True):
        if h >= 0.0 and abs(h - round(h)) < 1e-9 and round(h) % step_deg == 0:
            rows.append({"heel": float(h), "kn": float(k), "gz": float(g)})
    return rows


def table_columns(count: int, max_columns: int = GZ_TABLE_MAX_COLUMNS) -> int:
    """Values per row so that ``count`` values fill rows of nearly equal length."""
    rows = max(1, math.ceil(count / max_columns))
    return max(1, math.ceil(count / rows))


def _read_template(name: str) -> str:
    return (files("reportgen.report") / "templates" / name).read_text(encoding="utf-8")


@lru_cache(maxsize=1)
def template_environment() -> jinja2.Environment:
    """The jinja2 environment of templates/ with the number filters of the sheet."""
    env = jinja2.Environment(
        loader=jinja2.FunctionLoader(_read_template),
        autoescape=jinja2.select_autoescape(default=True, default_for_string=True),
        undefined=jinja2.StrictUndefined,
        trim_blocks=True,
        lstrip_blocks=True,
        keep_trailing_newline=True,
    )
    env.filters["num"] = format_number
    env.filters["signed"] = format_signed
    env.filters["by_unit"] = format_by_unit
    env.filters["down"] = lambda v, quantity: printed_down(v, DECIMALS[quantity])  # KG max,
    env.filters["up"] = lambda v, quantity: printed_up(v, DECIMALS[quantity])  # margin; GM min
    return env


@lru_cache(maxsize=1)
def _labels() -> tuple[dict[str, str], dict[str, str]]:
    module = template_environment().get_template("labels.j2").module
    return dict(module.figure_labels), dict(module.attachment_labels)


@lru_cache(maxsize=1)
def _stylesheet() -> weasyprint.CSS:
    return fonts.stylesheet(_read_template("sheet.css"))


def _svg_data_uri(svg: str) -> str:
    return "data:image/svg+xml;base64," + base64.b64encode(svg.encode("utf-8")).decode("ascii")


def approval_described(p7s: bytes | None, vessel_bytes: bytes, vessel_name: str) -> dict | None:
    """Who approved the vessel data and when (reportgen.provenance), or None without ``p7s``.

    An approval that does not sign exactly these vessel bytes is refused (InputError): a
    document must not print an approval that is not there.
    """
    if p7s is None:
        return None
    approval = provenance.read_approval(p7s, vessel_bytes)
    if not approval.intact:
        raise InputError(f"{approval_name(vessel_name)}: {approval.problem}; "
                         f"remove it or approve the vessel data again")
    return approval.describe()


def approval_of(case: Any) -> dict | None:
    """``approval_described`` of the case's vessel data (its VESSEL.yaml.p7s, if any)."""
    return approval_described(getattr(case, "vessel_approval", None), case.vessel_bytes,
                              case.vessel_name)


def condition_context(case: Any, results: Results) -> dict[str, Any]:
    """The values of templates/sheet_condition.html.j2 (a condition's part of a sheet, also
    of a package) for one condition."""
    figure_labels, _ = _labels()
    rows = gz_table(results.gz.heel, results.gz.gz, results.gz.kn, results.angles.side)
    return {
        "r": results,
        "docno": document_number(results.inputs_sha256),
        "gz_rows": rows,
        "gz_columns": table_columns(len(rows)),
        "gz_figure": _svg_data_uri(gz_figure_svg(results, figure_labels)),
        "weather_figure": (_svg_data_uri(weather_figure_svg(results, figure_labels))
                           if results.weather is not None else None),
        "heeling_figure": (_svg_data_uri(heeling_figure_svg(results, figure_labels))
                           if results.passengers is not None
                           and results.passengers.crowding_arm is not None else None),
        "grain_figure": (_svg_data_uri(grain_figure_svg(results, figure_labels))
                         if results.grain is not None else None),
        "approval": approval_of(case),
    }


def sheet_html(case: Any, results: Results) -> str:
    """The sheet as HTML text (the input of WeasyPrint), from the results."""
    created = document_date(results.condition.date).strftime("%Y-%m-%dT%H:%M:%SZ")
    return template_environment().get_template("sheet.html.j2").render(
        created=created, roles=ROLES, **condition_context(case, results))


def _attachments(case: Any, results_json: str, when: datetime) -> list[weasyprint.Attachment]:
    _, words = _labels()
    condition_file, vessel_file = attachment_names(case.condition_name, case.vessel_name)
    made = {"created": when, "modified": when}
    return [
        weasyprint.Attachment(string=case.condition_bytes, name=condition_file,
                              description=words["condition"], relationship="Source", **made),
        weasyprint.Attachment(string=case.vessel_bytes, name=vessel_file,
                              description=words["vessel"], relationship="Source", **made),
        weasyprint.Attachment(string=results_json.encode("utf-8"), name=RESULTS_NAME,
                              description=words["results"], relationship="Data", **made),
    ] + ([weasyprint.Attachment(string=case.vessel_approval,
                                name=approval_name(vessel_file),
                                description=words["approval"], relationship="Source", **made)]
         if getattr(case, "vessel_approval", None) is not None else [])


def _find_box(page_box: Any, element_id: str) -> Any | None:
    for box in page_box.descendants(placeholders=True):
        element = getattr(box, "element", None)
        if element is not None and element.get("id") == element_id:
            return box
    return None


def element_rectangles(document: weasyprint.Document,
                       element_ids: tuple[str, ...]) -> dict[str, tuple[int, list[float]]]:
    """For each element id, (page index, [x0, y0, x1, y1] in PDF pt from the page's lower left).

    Taken from the laid-out border box of the first box of that element; ids not laid
    out are absent from the answer.
    """
    found: dict[str, tuple[int, list[float]]] = {}
    for index, page in enumerate(document.pages):
        for element_id in element_ids:
            if element_id in found:
                continue
            box = _find_box(page._page_box, element_id)
            if box is None:
                continue
            x, y = box.border_box_x(), box.border_box_y()
            w, h = box.border_width(), box.border_height()
            found[element_id] = (index, [round(x * PX_TO_PT, 2),
                                         round((page.height - y - h) * PX_TO_PT, 2),
                                         round((x + w) * PX_TO_PT, 2),
                                         round((page.height - y) * PX_TO_PT, 2)])
    return found


def signature_rectangles(document: weasyprint.Document) -> dict[str, tuple[int, list[float]]]:
    """For each role, the page index and PDF rectangle of the box with id ``sig-<role>``."""
    ids = tuple(f"sig-{role}" for role in ROLES)
    found = element_rectangles(document, ids)
    missing = [element_id for element_id in ids if element_id not in found]
    if missing:
        raise RuntimeError(f"sheet template lacks the signature areas {missing}")
    return {role: found[f"sig-{role}"] for role in ROLES}


def _add_signature_fields(document: weasyprint.Document, pdf: pydyf.PDF) -> None:
    """Empty /FT /Sig fields with print-flagged widgets and an empty /AP /N (PDF/A-3, 6.3.3)."""
    page_numbers = list(pdf.pages["Kids"])[0::3]  # pydyf stores Kids as number, 0, "R"
    fields = pydyf.Array()
    for role, (index, rect) in signature_rectangles(document).items():
        appearance = pydyf.Stream([], {
            "Type": "/XObject", "Subtype": "/Form",
            "BBox": pydyf.Array([0, 0, round(rect[2] - rect[0], 2), round(rect[3] - rect[1], 2)]),
            "Resources": pydyf.Dictionary({}),
        })
        pdf.add_object(appearance)
        widget = pydyf.Dictionary({
            "Type": "/Annot", "Subtype": "/Widget", "FT": "/Sig",
            "T": pydyf.String(role), "F": 4,
            "Rect": pydyf.Array(rect),
            "P": f"{page_numbers[index]} 0 R",
            "AP": pydyf.Dictionary({"N": appearance.reference}),
        })
        pdf.add_object(widget)
        page = pdf.objects[page_numbers[index]]
        if "Annots" not in page:
            page["Annots"] = pydyf.Array()
        page["Annots"].append(widget.reference)
        fields.append(widget.reference)
    pdf.catalog["AcroForm"] = pydyf.Dictionary({"Fields": fields})


def _deduplicate_associated_files(pdf: pydyf.PDF) -> None:
    """The catalog's /AF lists each embedded file once (ISO 19005-3, 6.8)."""
    if "AF" in pdf.catalog:
        unique: list = []
        for reference in pdf.catalog["AF"]:
            if reference not in unique:
                unique.append(reference)
        pdf.catalog["AF"] = pydyf.Array(unique)


def _finisher(document: weasyprint.Document, pdf: pydyf.PDF) -> None:
    _deduplicate_associated_files(pdf)
    _add_signature_fields(document, pdf)
    pdf.info[STACK_KEY] = pydyf.String(json.dumps(stack.rendering_stack(),
                                                   sort_keys=True))


def layout_sheet(case: Any, results: Results) -> weasyprint.Document:
    """The laid-out pages of the sheet (WeasyPrint document) for a results document."""
    return lay_out(sheet_html(case, results), f"{case.condition_name} (vessel {case.vessel_name})",
                   [_stylesheet()], pdf_variant=PDF_VARIANT, font_config=fonts.font_config())


def render_sheet(case: Any, results: Results) -> bytes:
    """The calculation sheet as PDF/A-3b bytes; equal inputs give equal bytes."""
    results_json = results.to_json()
    when = document_date(results.condition.date)
    return pdf_bytes(lambda: layout_sheet(case, results), when, results.inputs_sha256,
                     results_json, _attachments(case, results_json, when))


def pdf_bytes(layout: Callable[[], weasyprint.Document], when: datetime, inputs_sha256: str,
              data_json: str, attachments: list[weasyprint.Attachment]) -> bytes:
    """A document (sheet, package, limits) as PDF/A-3b bytes, equal for equal inputs: laid out
    by ``layout`` and written with the garbage collector paused and the fonts' clock at
    ``when``; its file identifier is the SHA-256 of the inputs' hash and the embedded data."""
    identifier = hashlib.sha256((inputs_sha256 + data_json).encode("utf-8")).hexdigest()
    with collector_paused(), _source_date_epoch(when):
        return layout().write_pdf(finisher=_finisher, pdf_variant=PDF_VARIANT,
                                  attachments=attachments,
                                  pdf_identifier=identifier[:32].encode("ascii"))


@contextmanager
def _source_date_epoch(when: datetime) -> Iterator[None]:
    """Fix the clock that fontTools writes into each subset font's 'head' table.

    fontTools (misc.timeTools.timestampNow) reads SOURCE_DATE_EPOCH, the
    reproducible-builds convention; without it the font bytes carry the time of rendering.
    The variable is restored afterwards.
    """
    before = os.environ.get("SOURCE_DATE_EPOCH")
    os.environ["SOURCE_DATE_EPOCH"] = str(int(when.timestamp()))
    try:
        yield
    finally:
        if before is None:
            os.environ.pop("SOURCE_DATE_EPOCH", None)
        else:
            os.environ["SOURCE_DATE_EPOCH"] = before


def write_sheet(case: Any, results: Results, out_path: str | os.PathLike,
                force: bool = False) -> None:
    """Write the sheet to ``out_path`` atomically (temporary file, then rename).

    Raises InputError when ``out_path`` exists and ``force`` is false, or when its
    directory does not exist; nothing is written then.
    """
    target = Path(out_path)
    check_output(target, force)  # before the work of rendering
    write_atomic(target, render_sheet(case, results), force=force)
