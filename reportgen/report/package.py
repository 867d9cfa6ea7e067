"""The calculation package (SPEC.md "Package"): several conditions of one vessel in one
PDF/A-3b document.

In order: a cover (title, vessel, document number, the contents with each condition's verdict
and first page, the caution, the signature block), a summary table (one row per condition),
the vessel's limiting KG curve at trim 0 with every condition drawn on it, then each
condition's complete sheet: the same part of the page the calculation sheet prints
(templates/sheet_condition.html.j2), with its own page count beside the package's. PDF
bookmarks: the cover, the summary, the curve, every condition and its sections.

Embedded (ISO 19005-3:2012, 6.8): each condition file byte for byte under a name unique in
the package, the vessel file once (with its approval, VESSEL.yaml.p7s, when given) and
``package.json`` (reportgen/package-1), whose ``conditions[i].results`` is the results
document ``check --json`` prints for that condition, and ``limits`` the vessel's limiting
KG curve as ``reportgen limits --json`` prints it.

Page numbers: the document is laid out once. The contents' page numbers are CSS
target-counter()s of the parts; each condition is a page group of its own (a named page) whose
counter starts again at 1 and whose footer reads the condition's page count from a marker at
its end (templates/package_pages.css.j2); WeasyPrint resolves them while it paginates.
"""

from __future__ import annotations

import dataclasses
import hashlib
import json
import os
from dataclasses import dataclass
from functools import lru_cache
from pathlib import Path
from typing import Any

import weasyprint
from markupsafe import Markup

from reportgen import __version__
from reportgen.assemble import VESSEL_PREFIX
from reportgen.docinfo import PACKAGE_FORMAT, PACKAGE_NAME, ROLES, approval_name, document_number
from reportgen.errors import InputError
from reportgen.files import check_output, write_atomic
from reportgen.limits import relative_margin
from reportgen.report import fonts
from reportgen.report import render as sheet
from reportgen.report.appendix import vessel_appendix
from reportgen.report.engine import lay_out
from reportgen.report.limitsfig import limits_figure_svg
from reportgen.results import Results

MAX_TITLE_CHARS = 200


@dataclass(frozen=True)
class Member:
    """One condition of a package."""

    file: str  # attachment name of the condition file, unique in the package
    case: Any  # reportgen.inputs.Case, with the package's vessel approval
    results: Results


@dataclass(frozen=True)
class Package:
    """The conditions of one vessel, evaluated, with the package's title."""

    title: str
    members: tuple[Member, ...]
    vessel_file: str  # attachment name of the vessel file
    vessel_bytes: bytes
    approval: bytes | None  # VESSEL.yaml.p7s, when given
    limits: dict | None = None  # the vessel's limiting KG curve at trim 0 (reportgen/limits-1)
    limits_problem: str | None = None  # why there is no curve, when there is none

    @property
    def inputs_sha256(self) -> str:
        """SHA-256 of the condition files' bytes in order, then the vessel file's (SPEC)."""
        digest = hashlib.sha256()
        for member in self.members:
            digest.update(member.case.condition_bytes)
        digest.update(self.vessel_bytes)
        return digest.hexdigest()

    @property
    def passed(self) -> bool:
        return all(m.results.passed for m in self.members)


@lru_cache(maxsize=1)
def _words() -> Any:
    return sheet.template_environment().get_template("package_labels.j2").module


def unique_names(names: list[str], taken: set[str]) -> list[str]:
    """Each name, or NAME-2.EXT, NAME-3.EXT ... where it is taken already (in ``taken`` or
    earlier in the list)."""
    taken = set(taken)
    out = []
    for name in names:
        stem, dot, ext = name.rpartition(".")
        stem, ext = (stem, dot + ext) if stem else (name, "")
        candidate, n = name, 1
        while candidate in taken:
            n += 1
            candidate = f"{stem}-{n}{ext}"
        taken.add(candidate)
        out.append(candidate)
    return out


def check_title(title: str) -> str:
    """The title, stripped; InputError when empty, too long or holding control characters."""
    text = title.strip()
    if not text or len(text) > MAX_TITLE_CHARS or any(ord(c) < 32 or ord(c) == 127
                                                       for c in text):
        raise InputError(f"--title: expected one line of 1 to {MAX_TITLE_CHARS} printable "
                         f"characters")
    return text


def common_signatories(results: list[Results]) -> dict[str, str | None]:
    """The person each role's box names: the name the conditions give for it. InputError when
    two conditions name different people for one role (a package has one signer per role)."""
    named: dict[str, str | None] = {}
    for role in ROLES:
        names = {n for r in results if (n := getattr(r.condition.signatories, f"{role}_by"))}
        if len(names) > 1:
            raise InputError(f"the conditions name different people for {role}_by "
                             f"({'; '.join(sorted(names))}); a package has one signer per "
                             f"role: make the conditions agree or leave the name out")
        named[f"{role}_by"] = names.pop() if names else None
    return named


def make_package(cases: list[Any], title: str | None = None,
                 evaluate: Any = None) -> Package:
    """Evaluate the cases (reportgen.pipeline.evaluate) and gather them as one package.

    Refused (InputError): no case; cases whose vessel files differ in a byte; the same
    condition file twice; a bad title; conditions naming different signatories for a role.
    """
    if evaluate is None:
        from reportgen.pipeline import evaluate
    if not cases:
        raise InputError("a package needs at least one condition")
    first = cases[0]
    for case in cases[1:]:
        if case.vessel_bytes != first.vessel_bytes:
            raise InputError(f"{case.condition_name} names the vessel file {case.vessel_name} "
                             f"(SHA-256 {case.vessel_sha256[:12]}), {first.condition_name} "
                             f"names {first.vessel_name} (SHA-256 {first.vessel_sha256[:12]}): "
                             f"every condition of a package must rest on the same vessel "
                             f"data, byte for byte")
    seen: dict[bytes, str] = {}
    for case in cases:
        if case.condition_bytes in seen:
            raise InputError(f"{case.condition_name}: the same condition as "
                             f"{seen[case.condition_bytes]}; give each condition once")
        seen[case.condition_bytes] = case.condition_name
    approval = next((c.vessel_approval for c in cases if c.vessel_approval is not None), None)
    vessel_file = first.vessel_name  # its own name, unless the data document has it
    if vessel_file == PACKAGE_NAME:
        vessel_file = VESSEL_PREFIX + vessel_file
    taken = {PACKAGE_NAME, vessel_file, approval_name(vessel_file)}
    files = unique_names([c.condition_name for c in cases], taken)
    members = []
    for case, name in zip(cases, files, strict=True):
        case = dataclasses.replace(case, vessel_approval=approval)
        members.append(Member(name, case, evaluate(case)))
    results = [m.results for m in members]
    common_signatories(results)
    text = check_title(title) if title is not None else \
        str(_words().default_title).format(vessel=first.vessel.vessel.name)
    curve, problem = vessel_limits(first.vessel, first.vessel_bytes, vessel_file)
    return Package(text, tuple(members), vessel_file, first.vessel_bytes, approval, curve,
                   problem)


def vessel_limits(vessel: Any, vessel_bytes: bytes, vessel_name: str
                  ) -> tuple[dict | None, str | None]:
    """The vessel's limiting KG curve at trim 0 for its criteria, as `reportgen limits
    VESSEL --json` gives it (SPEC "Package", "Limits"), computed once per package; or None
    and the reason where the vessel data give no curve (no tables, no Code criteria)."""
    from reportgen.limitcurve import limiting_curve

    try:
        return limiting_curve(vessel, vessel_bytes, vessel_name, 0.0), None
    except InputError as exc:
        return None, str(exc)


def package_document(pkg: Package) -> dict:
    """package.json (SPEC "Package"); ``vessel.file`` names the vessel attachment."""
    r0 = pkg.members[0].results
    return {
        "format": PACKAGE_FORMAT,
        "software": {"name": r0.software.name, "version": __version__},
        "inputs_sha256": pkg.inputs_sha256,
        "title": pkg.title,
        "vessel": {"name": r0.vessel.name, "identifier": r0.vessel.identifier,
                   "sha256": r0.vessel.sha256, "file": pkg.vessel_file},
        "conditions": [{"file": m.file, "results": m.results.to_dict()}
                       for m in pkg.members],
        "limits": pkg.limits,
    }


def package_json(pkg: Package) -> str:
    """package.json as text: indented, keys in document order, a final newline."""
    return json.dumps(package_document(pkg), indent=2, ensure_ascii=False) + "\n"


def tightest_criterion(results: Results) -> Any | None:
    """The criterion with the smallest margin relative to its requirement, as the KG search
    ranks them (reportgen.limits.relative_margin)."""
    return min(results.criteria, key=relative_margin, default=None)


def summary_row(member: Member) -> dict:
    """The numbers of one summary row; KG max and its margin from ``results.limits`` where
    the results carry it (SPEC "Limits"), else None."""
    r = member.results
    limits = getattr(r, "limits", None)
    return {"r": r, "h": r.hydrostatics, "tightest": tightest_criterion(r),
            "kg_max": getattr(limits, "kg_max", None),
            "kg_margin": getattr(limits, "kg_margin", None)}


def package_date(pkg: Package) -> str:
    """The document's fixed date: the latest date of its conditions (else 1970-01-01)."""
    dates = [m.results.condition.date for m in pkg.members if m.results.condition.date]
    return sheet.document_date(max(dates) if dates else None).strftime("%Y-%m-%dT%H:%M:%SZ")


def limits_page(pkg: Package) -> dict:
    """The page of the limiting KG curve (SPEC "Package"): the curve with every condition
    drawn at its displacement (t) and KG fluid (m), labelled by its number; for each
    condition the curve's KG max at its displacement (linear in displacement, as the
    booklet criterion reads a curve; None outside it) beside its own KG max."""
    from reportgen.criteria.booklet import Curve
    from reportgen.criteria.sets import SETS
    from reportgen.report.limitsdoc import figure_labels

    doc = pkg.limits
    found = [r for r in doc["rows"] if r["kg_max"] is not None] if doc else []
    curve = Curve("", "kg", tuple(r["displacement"] for r in found),
                  tuple(r["kg_max"] for r in found)) if found else None
    rows = [{"number": i, "r": m.results,
             "curve_kg_max": curve.at(m.results.loading.displacement) if curve else None,
             "own": m.results.limits} for i, m in enumerate(pkg.members, 1)]
    if doc is None:
        return {"d": None, "problem": pkg.limits_problem, "rows": rows}
    points = [(str(row["number"]), row["r"].loading.displacement,
               row["r"].hydrostatics.kg_fluid) for row in rows]
    labels = dict(figure_labels(), points=str(_words().points_label))
    return {"d": doc, "rows": rows, "problem": None,
            "figure": sheet._svg_data_uri(limits_figure_svg(doc, labels, points)),
            "sets": [{"id": s, "title": SETS[s].title} for s in doc["criteria"] if s in SETS],
            "titles": {c["id"]: c["title"] for c in doc["criteria_list"]}}


def package_html(pkg: Package, contexts: list[dict], curve: dict) -> str:
    """The package as HTML text (the input of WeasyPrint)."""
    env = sheet.template_environment()
    part = env.get_template("sheet_condition.html.j2")
    parts = [Markup(part.render(**ctx)) for ctx in contexts]  # autoescaped by the template
    return env.get_template("package.html.j2").render(
        p=pkg, docno=document_number(pkg.inputs_sha256), created=package_date(pkg),
        members=[dict(ctx, file=m.file, row=summary_row(m), number=i, part=part)
                 for i, (m, ctx, part) in enumerate(zip(pkg.members, contexts, parts,
                                                        strict=True), 1)],
        roles=ROLES, signatories=common_signatories([m.results for m in pkg.members]),
        approval=contexts[0]["approval"], ax=vessel_appendix(pkg.members[0].case.vessel),
        curve=curve)


def _page_css(count: int) -> weasyprint.CSS:
    text = sheet.template_environment().get_template("package_pages.css.j2").render(
        count=count)
    return fonts.stylesheet(sheet._read_template("sheet.css")
                            + sheet._read_template("package.css") + text)


def layout_package(pkg: Package) -> weasyprint.Document:
    """The laid-out pages, in one layout: the page numbers of the contents and of each
    condition's own pages come from CSS (target-counter, page groups), which WeasyPrint
    resolves while it paginates."""
    contexts = [sheet.condition_context(m.case, m.results) for m in pkg.members]
    return lay_out(package_html(pkg, contexts, limits_page(pkg)),
                   "the package's title, condition files or vessel file",
                   [_page_css(len(pkg.members))], pdf_variant=sheet.PDF_VARIANT,
                   font_config=fonts.font_config())


def _attachments(pkg: Package, data_json: str) -> list[weasyprint.Attachment]:
    words = _words().attachment_labels
    when = sheet.document_date(package_date(pkg)[:10])
    made = {"created": when, "modified": when}
    out = [weasyprint.Attachment(string=m.case.condition_bytes, name=m.file,
                                 description=words["condition"].format(title=m.results.
                                                                       condition.title),
                                 relationship="Source", **made) for m in pkg.members]
    out.append(weasyprint.Attachment(string=pkg.vessel_bytes, name=pkg.vessel_file,
                                     description=words["vessel"], relationship="Source",
                                     **made))
    if pkg.approval is not None:
        out.append(weasyprint.Attachment(string=pkg.approval,
                                         name=approval_name(pkg.vessel_file),
                                         description=words["approval"],
                                         relationship="Source", **made))
    out.append(weasyprint.Attachment(string=data_json.encode("utf-8"), name=PACKAGE_NAME,
                                     description=words["package"], relationship="Data",
                                     **made))
    return out


def render_package(pkg: Package) -> bytes:
    """The package as PDF/A-3b bytes; equal inputs give equal bytes."""
    data_json = package_json(pkg)
    when = sheet.document_date(package_date(pkg)[:10])
    return sheet.pdf_bytes(lambda: layout_package(pkg), when, pkg.inputs_sha256, data_json,
                           _attachments(pkg, data_json))


def write_package(pkg: Package, out_path: str | os.PathLike, force: bool = False) -> None:
    """Write the package to ``out_path`` atomically; nothing is written on any refusal."""
    target = Path(out_path)
    check_output(target, force)
    write_atomic(target, render_package(pkg), force=force)
