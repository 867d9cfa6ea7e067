"""The limits document: limits-1 -> HTML (templates/limits.html.j2) -> PDF/A-3b (WeasyPrint).

Made like the calculation sheet (reportgen.report.render): the vessel file byte for byte,
its approval (VESSEL.yaml.p7s, SPEC "Verification") when given, and ``limits.json`` embedded as
PDF/A-3 associated files, who approved the vessel data and when printed (or "vessel data not
approved"), three empty signature fields over the
signature block, the rendering stack in the document information, a fixed date (1970-01-01:
the vessel file states none), so that equal inputs give equal bytes and ``verify`` can render
it again and compare (reportgen.signing.recompute, kind "limits").
"""

from __future__ import annotations

import os
from functools import lru_cache
from pathlib import Path

import weasyprint

from reportgen.criteria.sets import SETS
from reportgen.docinfo import ROLES, approval_name, document_number
from reportgen.files import check_output, write_atomic
from reportgen.limitcurve import LIMITS_NAME, NOT_ON_CURVE, REQUEST_NAME, to_json
from reportgen.report import fonts
from reportgen.report.engine import lay_out
from reportgen.report.limitsfig import limits_figure_svg
from reportgen.report.render import (
    FIXED_EPOCH,
    PDF_VARIANT,
    _stylesheet,
    _svg_data_uri,
    approval_described,
    pdf_bytes,
    template_environment,
)


@lru_cache(maxsize=1)
def _labels() -> tuple[dict[str, str], dict[str, str]]:
    module = template_environment().get_template("limits_words.j2").module
    return dict(module.figure_labels), dict(module.attachment_labels)


def figure_labels() -> dict[str, str]:
    """The words of the limits figure (templates/limits_words.j2)."""
    return dict(_labels()[0])


def limits_html(doc: dict, vessel_sets: list[str] | None = None,
                approval: dict | None = None) -> str:
    """The limits document as HTML text (the input of WeasyPrint); ``approval``: who approved
    the vessel data (reportgen.report.render.approval_described), None when nobody did."""
    figure_labels, _ = _labels()
    titles = {c["id"]: c["title"] for c in doc.get("criteria_list", [])}
    return template_environment().get_template("limits.html.j2").render(
        d=doc,
        docno=document_number(doc["inputs_sha256"]),
        created=FIXED_EPOCH.strftime("%Y-%m-%dT%H:%M:%SZ"),
        sets=[{"id": s, "title": SETS[s].title} for s in doc["criteria"] if s in SETS],
        titles=titles,
        excluded=any(s in NOT_ON_CURVE for s in (vessel_sets or [])),
        request=REQUEST_NAME,
        figure=_svg_data_uri(limits_figure_svg(doc, figure_labels)),
        roles=ROLES,
        approval=approval,
    )


def render_limits(vessel_name: str, vessel_bytes: bytes, doc: dict,
                  vessel_sets: list[str] | None = None, approval: bytes | None = None) -> bytes:
    """The limits document as PDF/A-3b bytes; equal inputs give equal bytes. ``approval``: the
    vessel file's VESSEL.yaml.p7s, embedded and printed (refused when it does not sign
    ``vessel_bytes``)."""
    _, words = _labels()
    approved = approval_described(approval, vessel_bytes, vessel_name)
    data = to_json(doc)
    when = FIXED_EPOCH
    made = {"created": when, "modified": when}
    attachments = [
        weasyprint.Attachment(string=vessel_bytes, name=vessel_name,
                              description=words["vessel"], relationship="Source", **made),
        weasyprint.Attachment(string=data.encode("utf-8"), name=LIMITS_NAME,
                              description=words["limits"], relationship="Data", **made),
    ] + ([weasyprint.Attachment(string=approval, name=approval_name(vessel_name),
                                description=words["approval"], relationship="Source", **made)]
         if approval is not None else [])

    def layout() -> weasyprint.Document:
        return lay_out(limits_html(doc, vessel_sets, approved), vessel_name, [_stylesheet()],
                       pdf_variant=PDF_VARIANT, font_config=fonts.font_config())

    return pdf_bytes(layout, when, doc["inputs_sha256"], data, attachments)


def write_limits(vessel_bytes: bytes, doc: dict, out_path: str | os.PathLike,
                 force: bool = False, vessel_sets: list[str] | None = None,
                 approval: bytes | None = None) -> None:
    """Write the limits document atomically; never replaces a file without ``force``."""
    target = Path(out_path)
    check_output(target, force)
    write_atomic(target, render_limits(doc["inputs"]["vessel_file"], vessel_bytes, doc,
                                       vessel_sets, approval), force=force)
