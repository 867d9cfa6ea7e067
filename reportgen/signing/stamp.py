"""The visible stamp of a signature: role, signer and time, drawn inside the role's box.

The words come from reportgen/report/templates/stamp.html.j2; the page is rendered by
WeasyPrint in the sheet's font and imported into the signature's appearance stream.
"""

from __future__ import annotations

import binascii
import datetime as dt
import hashlib
import io

from pyhanko.pdf_utils import content as pdf_content
from pyhanko.pdf_utils.reader import PdfFileReader
from pyhanko.stamp import StaticStampStyle


class _PdfPageContent(pdf_content.PdfContent):
    """The first page of an in-memory PDF, imported as a form XObject."""

    def __init__(self, pdf_bytes: bytes) -> None:
        self.pdf_bytes = pdf_bytes
        super().__init__()

    def render(self) -> bytes:
        writer = self._ensure_writer
        reader = PdfFileReader(io.BytesIO(self.pdf_bytes))
        xobj = writer.import_page_as_xobject(reader, page_ix=0)
        digest = hashlib.sha256(self.pdf_bytes).digest()[:16]
        name = "/Stamp" + binascii.hexlify(digest).decode("ascii")
        self.resources.xobject[name] = xobj
        x1, y1, x2, y2 = xobj.get_object()["/BBox"]
        self.box = pdf_content.BoxConstraints(width=abs(x1 - x2), height=abs(y1 - y2))
        return name.encode("ascii") + b" Do"


def stamp_pdf(role: str, signer: str, when: dt.datetime, width_pt: float,
              height_pt: float) -> bytes:
    """A one-page PDF the size of the field, with role, signer and date (UTC)."""
    from weasyprint import HTML

    from reportgen.report import fonts
    from reportgen.report.render import template_environment

    fs = max(5.0, min(9.0, height_pt / 6.0))  # four lines fit the field
    page = template_environment().get_template("stamp.html.j2").render(
        w=width_pt, h=height_pt, fs=fs, role=role, signer=signer, when=when)
    return HTML(string=page).write_pdf(font_config=fonts.font_config(),
                                       stylesheets=[fonts.stylesheet("")])


def stamp_style(role: str, signer: str, when: dt.datetime, width_pt: float,
                height_pt: float) -> StaticStampStyle:
    """pyHanko's stamp style that draws ``stamp_pdf`` as the whole appearance."""
    return StaticStampStyle(
        background=_PdfPageContent(stamp_pdf(role, signer, when, width_pt, height_pt)),
        background_opacity=1.0,
        border_width=0,
    )
