"""The page a reader sees against the page reportgen makes (SPEC "Verification", point 4).

The first revision of a signed document (everything before the first signature) must be,
byte for byte, what the running version renders from the embedded inputs. Where the running
rendering stack differs from the one recorded in the document only in its libraries (the
same reportgen version), the bytes may differ while the pages do not: every page of both is
then rendered to pixels by PDFium (pypdfium2) at ``RESOLUTION_DPI``, annotations included,
and compared pixel for pixel.
"""

from __future__ import annotations

import json
from typing import Any

from pyhanko.pdf_utils.reader import PdfFileReader

from reportgen.report.render import STACK_KEY

RESOLUTION_DPI = 100


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
