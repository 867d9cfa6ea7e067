"""How reportgen drives WeasyPrint: the same pages, less work per document.

- ``document_html``: WeasyPrint's HTML document whose user-agent stylesheet lacks the rules
  for the pseudo-elements our documents never make (footnote and note calls and markers;
  list markers outside ``li``). WeasyPrint's own stylesheet sets them on every element
  (``::footnote-call``, ``::marker`` ...), so every element of a sheet got six computed
  pseudo-element styles that were never used: about 8 % of a package's layout time. A
  WeasyPrint version whose stylesheet reads otherwise keeps its stylesheet unchanged.
  The text goes in without the white space between the tags of a table's structure, which
  is never rendered: about 1 % fewer calls in a package's layout, the PDF byte-identical.
- ``collector_paused``: the cyclic garbage collector paused while a document is made (the
  reader's own pause, reportgen.inputs.yamlread.cyclic_gc_paused). Laying out and painting a
  document creates a few million objects that live until the document is written; the
  collector's passes over them took 5 to 15 % of the package process's CPU time (best of
  two, on a shared machine) and freed almost nothing (peak memory within 6 % either way).

``document_html`` also refuses (InputError) a text with characters the documents' typeface
cannot draw (reportgen.report.fonts.unprintable): WeasyPrint would print each as an empty box
on a record that is signed and filed, and leave the PDF's text unreadable to extraction. A
control character written as a YAML escape ("\a") is one of them.

``lay_out`` lays a document out. The data tables have fixed column widths (cheap to lay out,
sized for the demo ships' figures); where a figure is wider than its column (a ship of a few
hundred thousand tonnes) it would run into its neighbour and read as another number. The
document is then laid out again with every table sized by its content (CSS 2.1, 17.5.2.2,
automatic table layout), and refused (InputError) if a figure still does not fit.
"""

from __future__ import annotations

import re
from functools import lru_cache
from typing import Any

import weasyprint
from weasyprint import html as weasyprint_html
from weasyprint.formatting_structure import boxes

from reportgen.errors import InputError
from reportgen.inputs.yamlread import cyclic_gc_paused as collector_paused
from reportgen.report import fonts

__all__ = ["collector_paused", "document_html", "lay_out", "overflowing_figures",
           "trimmed_user_agent_css"]

# Rules of WeasyPrint's html5_ua.css (one line each) for the notes of CSS GCPM 3 (footnotes)
# and its note areas: reportgen's documents have neither.
_NOTE_RULES = re.compile(r"^::(?:footnote|note)-[a-z-]+ \{[^\n}]*\}\n", re.MULTILINE)
_ANY_MARKER = "\n::marker {"  # a list marker on every element; only li is a list item here


def trimmed_user_agent_css(text: str) -> str:
    """WeasyPrint's user-agent stylesheet without the note rules, its marker rule on li."""
    return _NOTE_RULES.sub("", text).replace(_ANY_MARKER, "\nli::marker {")


@lru_cache(maxsize=1)
def _user_agent_sheet() -> weasyprint.CSS:
    return weasyprint.CSS(string=trimmed_user_agent_css(weasyprint_html.UA),
                          counter_style=weasyprint_html.UA_COUNTER_STYLE)


class _DocumentHTML(weasyprint.HTML):
    """weasyprint.HTML with the trimmed user-agent stylesheet (no form elements here)."""

    def _ua_stylesheets(self, forms: bool = False) -> list[weasyprint.CSS]:
        return [_user_agent_sheet()]


# White space between two tags of a table's structure (rows, cells, row groups, columns): the
# HTML parser keeps it as text nodes and WeasyPrint makes boxes of them only to drop them again
# (CSS 2.1, 17.2.1: white space between table-internal boxes is not rendered).
_TABLE_TAG = r"</?(?:table|thead|tbody|tfoot|tr|td|th|colgroup|col)\b[^>]*>"
_BETWEEN_TABLE_TAGS = re.compile(rf"({_TABLE_TAG})\s+(?={_TABLE_TAG})")


def without_table_white_space(text: str) -> str:
    """The HTML text without the white space between two tags of a table's structure."""
    return _BETWEEN_TABLE_TAGS.sub(r"\1", text)


def document_html(text: str, where: str) -> weasyprint.HTML:
    """The HTML text as a WeasyPrint document to lay out; `where` names the input files the
    text comes from, for the message when it holds characters the typeface cannot draw."""
    missing = fonts.unprintable(text)
    if missing:
        shown = ", ".join(f"U+{ord(c):04X}" + (f" {c!r}" if c.isprintable() else "")
                          for c in missing[:8])
        raise InputError(f"{where}: {len(missing)} character(s) cannot be printed in the "
                         f"documents' typeface ({fonts.TYPEFACE}) and would show as empty "
                         f"boxes: {shown}{' ...' if len(missing) > 8 else ''}; write the "
                         f"text with other characters")
    return _DocumentHTML(string=without_table_white_space(text))


_FIGURE = re.compile(r"[−+-]?\d[\d.,]*")  # a number as the documents print it
OVERFLOW_TOLERANCE_PT = 0.5  # a figure may touch its cell's edge by this much (CSS px = pt·4/3)
CONTENT_SIZED_TABLES = "table { table-layout: auto !important; }"


def overflowing_figures(document: weasyprint.Document) -> list[str]:
    """The figures (numbers) of the document's table cells that reach beyond their cell's
    padding box (into a neighbouring cell) or beyond the page's content area (into the margin
    or off the page), in page order."""
    slack = OVERFLOW_TOLERANCE_PT * 4.0 / 3.0  # WeasyPrint's unit is the CSS px
    found = []
    for page in document.pages:
        area = page._page_box
        area_left, area_right = area.content_box_x(), area.content_box_x() + area.width
        for cell in area.descendants():
            if not isinstance(cell, boxes.TableCellBox):
                continue
            left = max(cell.content_box_x() - cell.padding_left, area_left) - slack
            right = min(cell.content_box_x() + cell.width + cell.padding_right,
                        area_right) + slack
            found += [t.text for t in cell.descendants()
                      if isinstance(t, boxes.TextBox) and _FIGURE.fullmatch(t.text.strip())
                      and (t.position_x < left or t.position_x + t.width > right)]
    return found


def lay_out(text: str, where: str, stylesheets: list[weasyprint.CSS],
            **options: Any) -> weasyprint.Document:
    """The laid-out pages of the HTML text (module docstring): with the stylesheets' fixed
    column widths, or with tables sized by their content where a figure does not fit."""
    html = document_html(text, where)
    document = html.render(stylesheets=stylesheets, **options)
    if not overflowing_figures(document):
        return document
    sized = weasyprint.CSS(string=CONTENT_SIZED_TABLES)
    document = html.render(stylesheets=[*stylesheets, sized], **options)
    wide = overflowing_figures(document)
    if wide:
        raise InputError(f"{where}: {len(wide)} figure(s) are too wide for the document's "
                         f"tables even with columns sized by their content, and would run "
                         f"into the next column or off the page: {', '.join(wide[:5])}")
    return document
