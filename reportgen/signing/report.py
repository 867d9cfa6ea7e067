"""The verification report as text: rich tables, every name and text escaped (SPEC
"Verification", point 7), and the one-line form used for several files.

Values are handed to rich as Text objects, never as markup, so that a certificate name such
as "[bold]" or an escape sequence prints as the characters it is.
"""

from __future__ import annotations

import io
from collections.abc import Sequence

from rich.console import Console
from rich.table import Table
from rich.text import Text

from reportgen.signing.identity import printable

WIDTH = 100


def _t(value: object, style: str | None = None) -> Text:
    return Text(printable("" if value is None else value), style=style or "")


def _yes(flag: object) -> Text:
    return Text("yes", style="green") if flag else Text("NO", style="bold red")


def verdict_words(certified: dict) -> str:
    """'passes every criterion' or 'FAILS: id (reference), ...'; a document without a verdict
    (a limits document) states what it is instead."""
    if certified.get("statement"):
        return str(certified["statement"])
    if certified.get("passed"):
        return "passes every criterion"
    failing = certified.get("failing_criteria") or []
    named = ", ".join(f"{c.get('id')} ({c.get('reference')})" for c in failing)
    return "FAILS: " + (named or "a criterion")


def _certified_table(certified: dict) -> Table:
    table = Table(title="What the document certifies", title_justify="left", show_header=False,
                  box=None, pad_edge=False)
    table.add_column(style="bold", no_wrap=True)
    table.add_column()
    table.add_row("Vessel", _t(f"{certified.get('vessel')} ({certified.get('identifier')})"))
    table.add_row("Vessel data fingerprint", _t(f"SHA-256 {certified.get('vessel_sha256')}"))
    if certified.get("kind") == "package":
        table.add_row("Package", _t(certified.get("condition")))
        for i, c in enumerate(certified.get("conditions") or [], 1):
            table.add_row(f"Condition {i}", _t(f"{c.get('condition')}, "
                                               f"{c.get('date') or 'no date'}: "
                                               f"{'passes' if c.get('passed') else 'FAILS'}"))
    else:
        table.add_row("Condition", _t(certified.get("condition")))
    table.add_row("Date of condition", _t(certified.get("date") or "not stated"))
    table.add_row("Verdict", _t(verdict_words(certified),
                                "green" if certified.get("passed") else "bold red"))
    return table


def _signature_table(report: dict) -> Table:
    table = Table(title="Signatures", title_justify="left")
    for name in ("Role", "Signer (certificate)", "Signed at (UTC)", "Intact", "Trusted",
                 "Named on the sheet", "Good"):
        table.add_column(name, no_wrap=name == "Signed at (UTC)")
    for s in report.get("signatures", []):
        named = s.get("named_on_sheet")
        name_cell = _t(named or "not named")
        if named and s.get("name_matches") is False:
            name_cell = _t(f"{named} (DIFFERS)", "bold red")
        table.add_row(_t(s.get("role")), _t(s.get("signer") or "unknown"),
                      _t((s.get("signing_time") or "not stated").replace("T", " ")
                         .removesuffix("Z")), _yes(s.get("intact")),
                      _yes(s.get("trusted")), name_cell, _yes(not s.get("problems")))
    for role in report.get("unsigned_roles", []):
        table.add_row(_t(role), _t("not signed"), _t(""), _t(""), _t(""), _t(""), _t("-"))
    return table


def _check_rows(report: dict) -> list[tuple[str, bool | None, str]]:
    pages = report.get("pages") or {}
    inputs = report.get("inputs") or {}
    rec = report.get("recomputation") or {}
    changes = report.get("changes") or {}
    rows: list[tuple[str, bool | None, str]] = [
        ("Changes after signing", changes.get("ok"),
         "only signatures, in role order" if changes.get("ok") else "see problems"),
        ("Printed pages", (None if pages.get("method") is None and not pages.get("problems")
                           else not pages.get("problems")),
         {"bytes": "byte for byte what this version renders from the embedded inputs"}.get(
             pages.get("method"), pages.get("method") or pages.get("note") or "not compared")),
        ("Embedded inputs", inputs.get("ok"),
         f"{inputs.get('condition_file')} and {inputs.get('vessel_file')}; SHA-256 matches "
         f"document number {inputs.get('document_number')}" if inputs.get("ok")
         else "see problems"),
        ("Recomputation", rec.get("ok"),
         "the embedded results are what this version computes" if rec.get("ok")
         else (rec.get("error") or "differs at " + ", ".join(rec.get("differences", [])[:5]))),
    ]
    vessel = report.get("vessel_data") or {}
    if vessel.get("file") is not None:
        rows.append(("Vessel data file", vessel["file"].get("equal"),
                     f"embedded file equals {vessel['file'].get('path')} byte for byte"
                     if vessel["file"].get("equal") else "differs from the approved file"))
    else:
        rows.append(("Vessel data file", None, "not checked (no --vessel)"))
    approval = vessel.get("approval")
    if approval is not None:
        good = bool(approval.get("trusted"))
        detail = (f"approved by {approval.get('signer')} on {approval.get('signing_time')}, "
                  f"trusted {approval.get('trusted_how')}" if good else
                  "not approved" if not approval.get("present") else "see problems")
        rows.append(("Vessel data approval", good, detail))
    else:
        rows.append(("Vessel data approval", None, "not checked (no --vessel-trust)"))
    return rows


def _checks_table(report: dict) -> Table:
    table = Table(title="Checks", title_justify="left")
    table.add_column("Check", no_wrap=True)
    table.add_column("Good")
    table.add_column("Detail")
    for name, good, detail in _check_rows(report):
        table.add_row(name, Text("-") if good is None else _yes(good), _t(detail))
    return table


def render_report(report: dict, width: int = WIDTH, color: bool = False) -> str:
    """The full text report of one document."""
    out = io.StringIO()
    console = Console(file=out, width=width, color_system="standard" if color else None,
                      force_terminal=color, highlight=False, emoji=False)
    console.print(_t(f"Document: {report.get('file')} ({report.get('kind')})", "bold"))
    console.print(_certified_table(report.get("certified") or {}))
    console.print(_signature_table(report))
    console.print(_checks_table(report))
    problems = report.get("problems") or []
    if problems:
        console.print(Text("Problems", style="bold"))
        for problem in problems:
            console.print(Text("  - ") + _t(problem))
    for note in report.get("notes") or []:
        console.print(Text("Note: ", style="bold") + _t(note))
    console.print(Text("Result: ") + (Text("VERIFIED", style="bold green") if report.get("ok")
                                      else Text("NOT VERIFIED", style="bold red")))
    return out.getvalue()


def one_line(report: dict) -> str:
    """One line per document, for several files."""
    certified = report.get("certified") or {}
    head = "VERIFIED    " if report.get("ok") else "NOT VERIFIED"
    what = (f"{certified.get('vessel')}, {certified.get('condition')}, "
            f"{certified.get('date') or 'no date'}: {verdict_words(certified)}")
    line = f"{head}  {report.get('file')}  {what}"
    if not report.get("ok") and report.get("problems"):
        line += f"  [{report['problems'][0]}]"
    elif report.get("notes"):
        line += f"  [{report['notes'][0]}]"
    return printable(line)


def summary_line(reports: Sequence[dict], unreadable: int) -> str:
    good = sum(1 for r in reports if r.get("ok"))
    return (f"{len(reports) + unreadable} file(s): {good} verified, "
            f"{len(reports) - good} not verified, {unreadable} unreadable")
