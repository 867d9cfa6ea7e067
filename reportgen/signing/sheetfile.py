"""Reading a signed reportgen document (a sheet; later a package or a limits document).

The embedded files are read with pypdf's attachments reader; signatures, fields and
revisions with pyHanko's reader. Anything that does not parse is an InputError naming the
file (exit status 2), never a traceback: a PDF is hostile input.
"""

from __future__ import annotations

import io
import json
import logging
import warnings
from collections.abc import Iterator
from contextlib import contextmanager
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from pyhanko.pdf_utils.reader import PdfFileReader
from pyhanko.sign import fields

from reportgen.docinfo import ROLES, TITLE_PREFIX
from reportgen.errors import InputError
from reportgen.signing.recompute import Kind, kind_of

MAX_DATA_BYTES = 16 * 1024 * 1024  # the embedded data document (results.json)


@contextmanager
def quiet_pdf_libraries() -> Iterator[None]:
    """Keep the PDF libraries' own log records and warnings off the terminal: every outcome
    they describe ends in the report or in one message."""
    loggers = [logging.getLogger(n) for n in ("pyhanko", "pyhanko_certvalidator", "pypdf")]
    levels = [lg.level for lg in loggers]
    for lg in loggers:
        lg.setLevel(logging.CRITICAL)
    try:
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")
            yield
    finally:
        for lg, level in zip(loggers, levels, strict=True):
            lg.setLevel(level)


@dataclass(frozen=True)
class Document:
    """What a reportgen document carries, read from its newest revision."""

    path: Path
    data: bytes  # the whole file
    reader: PdfFileReader
    kind: Kind
    files: dict[str, bytes]  # embedded files by name
    content: dict  # the parsed data document (results.json for a sheet)
    fields: dict[str, bool]  # signature field name -> signed
    title: str | None

    @property
    def signed_roles(self) -> list[str]:
        return [r for r in ROLES if self.fields.get(r)]


def _open(data: bytes, path: Path) -> PdfFileReader:
    if data[:1024].find(b"%PDF-") < 0:
        raise InputError(f"{path}: not a PDF file")
    try:
        reader = PdfFileReader(io.BytesIO(data), strict=False)
        reader.root  # noqa: B018 - parse the catalogue now, so a broken file fails here
        _ = reader.xrefs.total_revisions
    except Exception as exc:  # noqa: BLE001 - a damaged PDF may raise anything from parsers
        raise InputError(f"{path}: cannot read the PDF: {_short(exc)}") from None
    if reader.encrypted:
        raise InputError(f"{path}: the PDF is encrypted; a reportgen document never is")
    return reader


def _short(exc: BaseException) -> str:
    text = " ".join(str(exc).split())[:200]
    return f"{type(exc).__name__}: {text}" if text else type(exc).__name__


def embedded_files(data: bytes, path: Path) -> dict[str, bytes]:
    """Embedded files by name (pypdf's attachments reader); a name given twice is refused."""
    from pypdf import PdfReader

    try:
        found = PdfReader(io.BytesIO(data), strict=False).attachments
        files: dict[str, bytes] = {}
        for name in list(found):
            contents = found[name]
            if len(contents) != 1:
                raise InputError(f"{path}: the embedded file {name!r} is there "
                                 f"{len(contents)} times")
            files[str(name)] = bytes(contents[0])
    except InputError:
        raise
    except Exception as exc:  # noqa: BLE001 - damaged streams raise zlib and parser errors
        raise InputError(f"{path}: cannot read the embedded files: {_short(exc)}") from None
    return files


def _title(reader: PdfFileReader) -> str | None:
    try:
        info = reader.trailer_view.get("/Info")
        title = None if info is None else info.get_object().get("/Title")
    except Exception:  # noqa: BLE001 - a damaged /Info has no title
        return None
    return None if title is None else str(title)


def signature_fields(reader: PdfFileReader) -> dict[str, bool]:
    """Signature field name -> whether it holds a signature value."""
    return {str(name): value is not None
            for name, value, _ref in fields.enumerate_sig_fields(reader)}


def read_document(data: bytes, path: Path) -> Document:
    """Parse a PDF and check that it is a reportgen document; InputError otherwise."""
    path = Path(path)
    with quiet_pdf_libraries():
        reader = _open(data, path)
        files = embedded_files(data, path)
        try:
            sig_fields = signature_fields(reader)
        except Exception as exc:  # noqa: BLE001
            raise InputError(f"{path}: cannot read the signature fields: {_short(exc)}") from None
    kinds = kind_of(files)
    if len(kinds) != 1:
        what = "no" if not kinds else "more than one"
        raise InputError(f"{path}: not a reportgen calculation sheet ({what} embedded data "
                         f"document of a known kind)")
    kind = kinds[0]
    raw = files[kind.data_file]
    if len(raw) > MAX_DATA_BYTES:
        raise InputError(f"{path}: the embedded {kind.data_file} is too large")
    try:
        content = json.loads(raw.decode("utf-8"))
    except (UnicodeDecodeError, ValueError, RecursionError) as exc:
        raise InputError(f"{path}: not a reportgen {kind.words} (embedded {kind.data_file} is "
                         f"not JSON: {_short(exc)})") from None
    if not isinstance(content, dict) or content.get("format") != kind.data_format:
        raise InputError(f"{path}: not a reportgen {kind.words} (embedded {kind.data_file} "
                         f"is not {kind.data_format})")
    return Document(path, data, reader, kind, files, content, sig_fields, _title(reader))


def title_number(title: str | None, prefix: str = TITLE_PREFIX) -> str | None:
    """The document number printed in the title, if the title has the form of its kind."""
    if title and title.startswith(prefix):
        return title[len(prefix):].strip()
    return None


def field_size(reader: PdfFileReader, role: str) -> tuple[float, float]:
    """Width and height (pt) of the widget of the named signature field."""
    for name, _value, ref in fields.enumerate_sig_fields(reader, with_name=role):
        field: Any = ref.get_object()
        widget = field if "/Rect" in field else field["/Kids"][0].get_object()
        x1, y1, x2, y2 = (float(v) for v in widget["/Rect"])
        if name == role:
            return abs(x2 - x1), abs(y2 - y1)
    raise InputError(f"no signature field {role}")
