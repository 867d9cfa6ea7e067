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
"""

from __future__ import annotations

import re
from functools import lru_cache

import weasyprint
from weasyprint import html as weasyprint_html

from reportgen.errors import InputError
from reportgen.inputs.yamlread import cyclic_gc_paused as collector_paused
from reportgen.report import fonts

__all__ = ["collector_paused", "document_html", "trimmed_user_agent_css"]

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
