"""The page a reader sees against the page reportgen makes (SPEC "Verification", point 4).

The first revision of a signed document (everything before the first signature) must be,
byte for byte, what the running version renders from the embedded inputs. Where the running
rendering stack differs from the one recorded in the document only in its libraries (the
same reportgen version), the bytes may differ while the pages do not: every page of both is
then rendered to pixels by PDFium (pypdfium2) at ``RESOLUTION_DPI``, annotations included,
and compared pixel for pixel. Pixels do not show what a reader meets besides the page: the
two documents must then also agree in everything else (``structure_differences``): the
catalogue's entries (no /OpenAction, /AA, optional content or JavaScript that the rendering
lacks; ISO 32000-2 7.7.2, 8.11), the embedded files byte for byte (7.11.4), the document
information and XMP metadata but for the producer's name and version (14.3), the bookmarks
and named destinations (12.3), each page's entries and annotations with their flags (12.5.3:
a NoView annotation is printed, never shown), the form fields (12.7), and the text of each
page as PDFium extracts it (9.3.6: text in rendering mode 3 is invisible but found).
"""

from __future__ import annotations

import hashlib
import io
import json
from typing import Any

from pyhanko.pdf_utils.reader import PdfFileReader

from reportgen.report.render import STACK_KEY

RESOLUTION_DPI = 100
# /Info entries that name the rendering stack's parts, which differ where images are compared
_STACK_INFO_KEYS = ("/Producer", f"/{STACK_KEY}")


def first_revision(reader: PdfFileReader, data: bytes) -> bytes | None:
    """The bytes of the file's first revision (up to its first end-of-file marker)."""
    try:
        xref_end = reader.xrefs.get_xref_container_info(0).end_location
    except Exception:  # noqa: BLE001
        return None
    eof = data.find(b"%%EOF", xref_end)
    if eof < 0:
        return None
    end = eof + len(b"%%EOF")
    while end < len(data) and data[end:end + 1] in (b"\r", b"\n"):
        end += 1
    return data[:end]


def recorded_stack(reader: PdfFileReader) -> dict[str, Any] | None:
    """The rendering stack the document records in its document information."""
    try:
        info = reader.trailer_view["/Info"].get_object()
        value = json.loads(str(info[f"/{STACK_KEY}"]))
    except Exception:  # noqa: BLE001 - absent or damaged: nothing recorded
        return None
    return value if isinstance(value, dict) else None


def stack_differences(recorded: dict[str, Any] | None, running: dict[str, Any]) -> list[str]:
    """Names of the stack parts whose versions differ ("all" when nothing was recorded)."""
    if recorded is None:
        return ["all"]
    keys = sorted(set(recorded) | set(running))
    return [k for k in keys if str(recorded.get(k)) != str(running.get(k))]


def differing_pages(document: bytes, fresh: bytes) -> tuple[list[int], int]:
    """Pages (1-based) whose pixels differ at RESOLUTION_DPI, and the page count compared.

    A page present in one document only counts as differing.
    """
    import numpy as np
    import pypdfium2 as pdfium

    first, second = pdfium.PdfDocument(document), pdfium.PdfDocument(fresh)
    try:
        count = max(len(first), len(second))
        differ = []
        for index in range(count):
            if index >= len(first) or index >= len(second):
                differ.append(index + 1)
                continue
            images = []
            for pdf in (first, second):
                bitmap = pdf[index].render(scale=RESOLUTION_DPI / 72, draw_annots=True)
                images.append(np.array(bitmap.to_numpy(), copy=True))
            if images[0].shape != images[1].shape or not np.array_equal(*images):
                differ.append(index + 1)
        return differ, count
    finally:
        first.close()
        second.close()


def _outline(items: Any, reader: Any) -> list:
    out: list = []
    for item in items:
        if isinstance(item, list):
            out.append(_outline(item, reader))
        else:
            out.append((str(item.title), reader.get_destination_page_number(item)))
    return out


def _annotation(annot: Any) -> tuple:
    a = annot.get_object()
    action = a.get("/A")
    action = action.get_object() if action is not None else {}
    return (str(a.get("/Subtype")), int(a.get("/F", 0)), str(a.get("/FT")), str(a.get("/T")),
            [round(float(v), 1) for v in a.get("/Rect", [])], str(action.get("/S")),
            str(action.get("/URI")), str(a.get("/Dest")), sorted(a.keys()))


def _structure(data: bytes) -> dict[str, Any]:
    """What a reader meets in a PDF besides the pixels of its pages (see the module
    docstring), in comparable form."""
    import pypdfium2 as pdfium
    from pypdf import PdfReader

    reader = PdfReader(io.BytesIO(data), strict=False)
    root = reader.trailer["/Root"].get_object()
    info = reader.trailer.get("/Info")
    info = info.get_object() if info is not None else {}
    producer = str(info.get("/Producer", "")) or "\0"
    metadata = root.get("/Metadata")
    xmp = metadata.get_object().get_data().decode("utf-8", "replace") if metadata else None
    names = root.get("/Names")
    names = names.get_object() if names is not None else {}
    dests = names.get("/Dests")
    form = root.get("/AcroForm")
    form = form.get_object() if form is not None else {}
    pdf = pdfium.PdfDocument(data)
    try:
        text = [pdf[i].get_textpage().get_text_bounded() for i in range(len(pdf))]
    finally:
        pdf.close()
    return {
        "catalogue entries": sorted(root.keys()),
        "name trees": sorted(names.keys()),
        "named destinations": [str(v) for v in (dests.get_object().get("/Names", [])[::2]
                                                if dests is not None else [])],
        "embedded files": {str(name): [hashlib.sha256(bytes(c)).hexdigest() for c in found]
                           for name, found in reader.attachments.items()},
        "document information": {str(k): str(v) for k, v in info.items()
                                 if k not in _STACK_INFO_KEYS},
        "XMP metadata": None if xmp is None else xmp.replace(producer, ""),
        "bookmarks": _outline(reader.outline, reader),
        "form": (sorted(k for k in form if k != "/Fields"),
                 [_annotation(f) for f in form.get("/Fields", [])]),
        "page entries": [sorted(page.keys()) for page in reader.pages],
        "annotations": [[_annotation(a) for a in page.get("/Annots", [])]
                        for page in reader.pages],
        "page text": text,
    }


def structure_differences(document: bytes, fresh: bytes) -> list[str]:
    """The parts (module docstring) in which ``document`` differs from ``fresh``; where pages
    are compared as images, every one of them must agree."""
    mine, theirs = _structure(document), _structure(fresh)
    return [name for name in mine if mine[name] != theirs[name]]


# What no reportgen version writes (ISO 32000-2): actions run on opening or on page events
# (7.7.2 /OpenAction and /AA, 12.6.2), document JavaScript (7.7.4 /Names /JavaScript),
# optional content (8.11), annotations other than links and signature widgets, hidden or
# print-only annotations (12.5.3 flags Hidden 2, NoView 32), actions other than going to a
# place or a URI.
_READER_ACTIONS = ("/GoTo", "/URI")


def foreign_parts(document: bytes, allowed_files: set[str]) -> list[str]:
    """The parts of ``document`` that no reportgen version writes (see above), and embedded
    files other than ``allowed_files``: checked where the pages are not compared."""
    from pypdf import PdfReader

    reader = PdfReader(io.BytesIO(document), strict=False)
    root = reader.trailer["/Root"].get_object()
    names = root.get("/Names")
    found = [f"the catalogue's {key}" for key in ("/OpenAction", "/AA", "/OCProperties")
             if key in root]
    if names is not None and "/JavaScript" in names.get_object():
        found.append("document JavaScript")
    extra = sorted(set(map(str, reader.attachments)) - allowed_files)
    if extra:
        found.append("further embedded files (" + ", ".join(extra) + ")")
    for number, page in enumerate(reader.pages, 1):
        if "/AA" in page:
            found.append(f"page {number}: actions")
        for ref in page.get("/Annots", []):
            annot = ref.get_object()
            action = annot.get("/A")
            kind = str(action.get_object().get("/S")) if action is not None else None
            if annot.get("/Subtype") not in ("/Widget", "/Link") or int(annot.get("/F", 0)) & 34 \
                    or "/AA" in annot or kind not in (None, *_READER_ACTIONS):
                found.append(f"page {number}: a {annot.get('/Subtype')} annotation (flags "
                             f"{int(annot.get('/F', 0))}, action {kind})")
    return found
