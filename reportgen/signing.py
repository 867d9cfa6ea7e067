"""Signed calculation sheets: demo identities, PAdES signatures and their verification.

A sheet (see reportgen.report.render) is a PDF/A-3 document that embeds its two input files and
its results document (results.json) and carries three empty signature fields named after the
roles ``prepared``, ``checked`` and ``reviewed``. This module

- makes a self-signed demo identity (``keygen``),
- signs one role's field (``sign_sheet``): PAdES baseline B-B, subfilter ETSI.CAdES.detached
  (ETSI EN 319 142-1, 5.3; ISO 32000-2, 12.8.3.4). The first signature certifies the sheet with
  DocMDP permission 2, form filling and signing (ISO 32000-2, 12.8.2.2); later ones are approval
  signatures in incremental updates (ISO 32000-2, 7.5.6),
- verifies every signature, the changes made after each, the embedded inputs against the
  recorded hash, and a recomputation of the results from those inputs (``verify_sheet``).

Times are UTC. Nothing here knows about stability: the recomputation goes through
reportgen.inputs.load_case_bytes and reportgen.pipeline.evaluate.
"""

from __future__ import annotations

import contextlib
import datetime as dt
import hashlib
import io
import json
import logging
import os
from collections.abc import Iterable, Iterator, Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from asn1crypto import keys as asn1_keys
from asn1crypto import x509 as asn1_x509
from cryptography import x509
from cryptography.hazmat.primitives import hashes, serialization
from cryptography.hazmat.primitives.asymmetric import ec
from cryptography.hazmat.primitives.serialization import pkcs12
from cryptography.x509.oid import NameOID
from pyhanko.pdf_utils import content as pdf_content
from pyhanko.pdf_utils import generic
from pyhanko.pdf_utils.incremental_writer import IncrementalPdfFileWriter
from pyhanko.pdf_utils.misc import PdfError
from pyhanko.pdf_utils.reader import PdfFileReader
from pyhanko.sign import fields, signers
from pyhanko.sign.diff_analysis import DiffResult, ModificationLevel
from pyhanko.sign.general import SigningError
from pyhanko.sign.validation import validate_pdf_signature
from pyhanko.sign.validation.status import SignatureCoverageLevel
from pyhanko.stamp import StaticStampStyle
from pyhanko_certvalidator import ValidationContext

from reportgen.errors import InputError
from reportgen.files import read_input, write_atomic

ROLES: tuple[str, ...] = ("prepared", "checked", "reviewed")
RESULTS_NAME = "results.json"
RESULTS_FORMAT = "reportgen/results-1"
TITLE_PREFIX = "Intact stability calculation "
DOCNO_LENGTH = 12  # hex digits of inputs_sha256 in the title (SPEC / internal contract)

DEMO_ORGANISATION = "reportgen demo identity - not for real use"
DEMO_VALIDITY = dt.timedelta(days=365)

# Words on the visible stamp, one per role.
_ROLE_WORDS = {"prepared": "Prepared by", "checked": "Checked by", "reviewed": "Reviewed by"}

# Modification levels pyHanko's difference analysis may report after a signature that a
# sheet allows: none at all, validation-data updates, and filling (signing) the form fields.
_ALLOWED_LEVELS = (
    ModificationLevel.NONE,
    ModificationLevel.LTA_UPDATES,
    ModificationLevel.FORM_FILLING,
)


# --------------------------------------------------------------------------------------------
# Small file helpers


def _utc_now() -> dt.datetime:
    return dt.datetime.now(dt.UTC).replace(microsecond=0)


# --------------------------------------------------------------------------------------------
# Demo identity


def _demo_certificate(name: str, key: ec.EllipticCurvePrivateKey, now: dt.datetime
                      ) -> x509.Certificate:
    """A self-signed certificate for ``name`` (RFC 5280), valid one year from ``now``."""
    subject = x509.Name([
        x509.NameAttribute(NameOID.COMMON_NAME, name),
        x509.NameAttribute(NameOID.ORGANIZATION_NAME, DEMO_ORGANISATION),
    ])
    public = key.public_key()
    return (
        x509.CertificateBuilder()
        .subject_name(subject)
        .issuer_name(subject)
        .public_key(public)
        .serial_number(x509.random_serial_number())
        .not_valid_before(now)
        .not_valid_after(now + DEMO_VALIDITY)
        .add_extension(x509.BasicConstraints(ca=False, path_length=None), critical=True)
        .add_extension(
            x509.KeyUsage(
                digital_signature=True, content_commitment=True, key_encipherment=False,
                data_encipherment=False, key_agreement=False, key_cert_sign=False,
                crl_sign=False, encipher_only=False, decipher_only=False,
            ),
            critical=True,
        )
        .add_extension(x509.SubjectKeyIdentifier.from_public_key(public), critical=False)
        .add_extension(
            x509.AuthorityKeyIdentifier.from_issuer_public_key(public), critical=False
        )
        .sign(key, hashes.SHA256())
    )


def keygen(name: str, out_dir: Path, passphrase: bytes | None = None,
           force: bool = False) -> list[Path]:
    """Make a demo signing identity: EC P-256 key and a self-signed certificate for one year.

    Writes out_dir/key.pem (PKCS#8, encrypted with ``passphrase`` when given), cert.pem and
    identity.p12 (key + certificate, same passphrase). The subject's organisation says the
    identity is not for real use. Existing files are kept unless ``force``.
    Returns the written paths.
    """
    name = (name or "").strip()
    if not name:
        raise InputError("keygen: --name must not be empty")
    if passphrase is not None and not passphrase:
        raise InputError("keygen: the passphrase must not be empty")
    out_dir = Path(out_dir)
    paths = [out_dir / "key.pem", out_dir / "cert.pem", out_dir / "identity.p12"]
    if not force:
        existing = [str(p) for p in paths if p.exists()]
        if existing:
            raise InputError(
                f"keygen: {', '.join(existing)} already exist; use --force to replace them"
            )
    try:
        out_dir.mkdir(parents=True, exist_ok=True)
    except OSError as exc:
        raise InputError(f"{out_dir}: cannot create the directory: {exc.strerror}") from exc

    key = ec.generate_private_key(ec.SECP256R1())
    cert = _demo_certificate(name, key, _utc_now())
    encryption: serialization.KeySerializationEncryption = (
        serialization.BestAvailableEncryption(passphrase)
        if passphrase else serialization.NoEncryption()
    )
    key_pem = key.private_bytes(
        serialization.Encoding.PEM, serialization.PrivateFormat.PKCS8, encryption
    )
    cert_pem = cert.public_bytes(serialization.Encoding.PEM)
    p12 = pkcs12.serialize_key_and_certificates(
        name.encode("utf-8"), key, cert, None, encryption
    )
    # force=True: the refusal to overwrite was decided above, for all three files at once.
    write_atomic(paths[0], key_pem, force=True, mode=0o600)
    write_atomic(paths[1], cert_pem, force=True)
    write_atomic(paths[2], p12, force=True, mode=0o600)
    return paths


def _load_identity(key_path: Path | None, cert_path: Path | None, p12_path: Path | None,
                   passphrase: bytes | None
                   ) -> tuple[ec.EllipticCurvePrivateKey | Any, x509.Certificate, list]:
    """Private key, certificate and extra certificates from PEM/DER files or a PKCS#12 file."""
    if p12_path is not None:
        if key_path is not None or cert_path is not None:
            raise InputError("sign: give either --p12 or --key with --cert, not both")
        data = read_input(p12_path, "PKCS#12 identity")
        try:
            key, cert, extra = pkcs12.load_key_and_certificates(data, passphrase)
        except (ValueError, TypeError) as exc:
            raise InputError(
                f"{p12_path}: cannot open the PKCS#12 identity (wrong passphrase or not a "
                f"PKCS#12 file): {exc}"
            ) from exc
        if key is None or cert is None:
            raise InputError(f"{p12_path}: the PKCS#12 file holds no key with its certificate")
        return key, cert, list(extra or [])
    if key_path is None or cert_path is None:
        raise InputError("sign: give --key and --cert, or --p12")
    key_data = read_input(key_path, "private key")
    cert_data = read_input(cert_path, "certificate")
    try:
        if b"-----BEGIN" in key_data:
            key = serialization.load_pem_private_key(key_data, passphrase)
        else:
            key = serialization.load_der_private_key(key_data, passphrase)
    except TypeError as exc:
        raise InputError(f"{key_path}: {exc} (passphrase missing or not needed)") from exc
    except ValueError as exc:
        raise InputError(
            f"{key_path}: cannot read the private key (wrong passphrase or not a key): {exc}"
        ) from exc
    try:
        if b"-----BEGIN" in cert_data:
            cert = x509.load_pem_x509_certificate(cert_data)
        else:
            cert = x509.load_der_x509_certificate(cert_data)
    except ValueError as exc:
        raise InputError(f"{cert_path}: not a certificate: {exc}") from exc
    return key, cert, []


def _public_der(obj: Any) -> bytes:
    return obj.public_bytes(
        serialization.Encoding.DER, serialization.PublicFormat.SubjectPublicKeyInfo
    )


def _make_signer(key: Any, cert: x509.Certificate, extra: Sequence[x509.Certificate],
                 origin: str) -> signers.SimpleSigner:
    if _public_der(key.public_key()) != _public_der(cert.public_key()):
        raise InputError(f"{origin}: the private key does not belong to the certificate")
    key_info = asn1_keys.PrivateKeyInfo.load(key.private_bytes(
        serialization.Encoding.DER, serialization.PrivateFormat.PKCS8,
        serialization.NoEncryption(),
    ))
    cert_asn1 = asn1_x509.Certificate.load(cert.public_bytes(serialization.Encoding.DER))
    from pyhanko_certvalidator.registry import SimpleCertificateStore

    registry = SimpleCertificateStore()
    registry.register_multiple(
        asn1_x509.Certificate.load(c.public_bytes(serialization.Encoding.DER)) for c in extra
    )
    return signers.SimpleSigner(
        signing_cert=cert_asn1, signing_key=key_info, cert_registry=registry
    )


def _common_name(cert: x509.Certificate) -> str:
    names = cert.subject.get_attributes_for_oid(NameOID.COMMON_NAME)
    return str(names[0].value) if names else cert.subject.rfc4514_string()


# --------------------------------------------------------------------------------------------
# Reading a sheet


@dataclass(frozen=True)
class _Sheet:
    """What a reportgen sheet carries, read from its newest revision."""

    reader: PdfFileReader
    title: str | None
    attachments: dict[str, bytes]
    results_text: str
    results: dict
    fields: dict[str, bool]  # signature field name -> filled


def _open_reader(data: bytes, path: Path) -> PdfFileReader:
    if not data.lstrip()[:5] == b"%PDF-":
        raise InputError(f"{path}: not a PDF file")
    try:
        reader = PdfFileReader(io.BytesIO(data), strict=False)
        reader.root  # noqa: B018 - parse the catalogue now, so a broken file fails here
    except (PdfError, ValueError, KeyError, TypeError, IndexError) as exc:
        raise InputError(f"{path}: cannot read the PDF: {exc}") from exc
    if reader.encrypted:
        raise InputError(f"{path}: the PDF is encrypted; a reportgen sheet never is")
    return reader


def _name_tree_items(node: generic.DictionaryObject) -> Iterator[tuple[str, Any]]:
    """Key/value pairs of a PDF name tree (ISO 32000-2, 7.9.6)."""
    names = node.get("/Names")
    if names is not None:
        names = names.get_object()
        for i in range(0, len(names) - 1, 2):
            yield str(names[i]), names[i + 1].get_object()
    for kid in node.get("/Kids", ()):
        yield from _name_tree_items(kid.get_object())


def _embedded_files(reader: PdfFileReader) -> dict[str, bytes]:
    """Embedded files by file name (/UF, else /F, else the name-tree key)."""
    try:
        tree = reader.root["/Names"]["/EmbeddedFiles"]
    except KeyError:
        return {}
    out: dict[str, bytes] = {}
    for key, spec in _name_tree_items(tree.get_object()):
        try:
            stream = spec["/EF"].get("/UF", spec["/EF"].get("/F")).get_object()
            data = stream.data
        except (KeyError, AttributeError, TypeError):
            continue
        name = str(spec.get("/UF", spec.get("/F", key)))
        out[name] = data
    return out


def _document_title(reader: PdfFileReader) -> str | None:
    info = reader.trailer_view.get("/Info")
    if info is None:
        return None
    title = info.get_object().get("/Title")
    return None if title is None else str(title)


def _signature_fields(reader: PdfFileReader) -> dict[str, bool]:
    found: dict[str, bool] = {}
    for name, value, _ref in fields.enumerate_sig_fields(reader):
        found[name] = value is not None
    return found


def _read_sheet(data: bytes, path: Path) -> _Sheet:
    """Parse a PDF and check that it is a reportgen sheet; InputError otherwise."""
    reader = _open_reader(data, path)
    attachments = _embedded_files(reader)
    not_sheet = f"{path}: not a reportgen calculation sheet"
    if RESULTS_NAME not in attachments:
        raise InputError(f"{not_sheet} (no embedded {RESULTS_NAME})")
    try:
        results_text = attachments[RESULTS_NAME].decode("utf-8")
        results = json.loads(results_text)
    except (UnicodeDecodeError, json.JSONDecodeError) as exc:
        raise InputError(f"{not_sheet} (embedded {RESULTS_NAME} is not JSON: {exc})") from exc
    if not isinstance(results, dict) or results.get("format") != RESULTS_FORMAT:
        raise InputError(f"{not_sheet} (embedded {RESULTS_NAME} is not {RESULTS_FORMAT})")
    sig_fields = _signature_fields(reader)
    missing = [role for role in ROLES if role not in sig_fields]
    if missing:
        raise InputError(f"{not_sheet} (no signature field {', '.join(missing)})")
    return _Sheet(reader, _document_title(reader), attachments, results_text, results,
                  sig_fields)


# --------------------------------------------------------------------------------------------
# Embedded inputs and recomputation


def _input_names(results: dict) -> tuple[str | None, str | None]:
    inputs = results.get("inputs")
    if not isinstance(inputs, dict):
        return None, None
    return inputs.get("condition_file"), inputs.get("vessel_file")


def _recompute_json(condition_bytes: bytes, vessel_bytes: bytes, condition_name: str,
                    vessel_name: str) -> str:
    """The results document this version computes from the given input files."""
    from reportgen.inputs import load_case_bytes
    from reportgen.pipeline import evaluate

    case = load_case_bytes(condition_bytes, vessel_bytes, condition_name, vessel_name)
    return evaluate(case).to_json()


def _differing_keys(a: Any, b: Any, prefix: str = "") -> list[str]:
    """Key paths where two JSON values differ (dicts by key, lists by position)."""
    if isinstance(a, dict) and isinstance(b, dict):
        out: list[str] = []
        for key in list(a) + [k for k in b if k not in a]:
            path = f"{prefix}.{key}" if prefix else str(key)
            if key not in a or key not in b:
                out.append(path)
            else:
                out.extend(_differing_keys(a[key], b[key], path))
        return out
    if isinstance(a, list) and isinstance(b, list) and len(a) == len(b):
        out = []
        for i, (x, y) in enumerate(zip(a, b, strict=True)):
            out.extend(_differing_keys(x, y, f"{prefix}[{i}]"))
        return out
    return [] if a == b else [prefix or "(document)"]


def _check_inputs(sheet: _Sheet) -> dict:
    """Embedded input files against the recorded inputs_sha256 and the document number."""
    cond_name, vessel_name = _input_names(sheet.results)
    recorded = sheet.results.get("inputs_sha256")
    problems: list[str] = []
    cond = sheet.attachments.get(cond_name) if cond_name else None
    vessel = sheet.attachments.get(vessel_name) if vessel_name else None
    if cond_name is None or vessel_name is None:
        problems.append("the results do not name the input files")
    if cond_name and cond is None:
        problems.append(f"the condition file {cond_name} is not embedded")
    if vessel_name and vessel is None:
        problems.append(f"the vessel file {vessel_name} is not embedded")
    computed = (hashlib.sha256(cond + vessel).hexdigest()
                if cond is not None and vessel is not None else None)
    hash_ok = computed is not None and computed == recorded
    if computed is not None and not hash_ok:
        problems.append("the SHA-256 of the embedded inputs differs from the recorded one")
    title = sheet.title or ""
    docno = title[len(TITLE_PREFIX):].strip() if title.startswith(TITLE_PREFIX) else None
    docno_ok = (docno is not None and isinstance(recorded, str)
                and docno == recorded[:DOCNO_LENGTH])
    if not docno_ok:
        problems.append("the document number in the title does not match the recorded hash")
    return {
        "condition_file": cond_name,
        "vessel_file": vessel_name,
        "recorded_sha256": recorded,
        "computed_sha256": computed,
        "hash_ok": hash_ok,
        "title": sheet.title,
        "document_number": docno,
        "document_number_ok": docno_ok,
        "ok": hash_ok and docno_ok and not problems,
        "problems": problems,
    }


def _check_recomputation(sheet: _Sheet) -> dict:
    """Re-run the evaluation from the embedded inputs and compare with the embedded results.

    The documents are compared as parsed JSON, except the "software" entry (which version
    made the sheet is reported, not compared).
    """
    cond_name, vessel_name = _input_names(sheet.results)
    embedded_version = (sheet.results.get("software") or {}).get("version")
    base = {"embedded_version": embedded_version, "version": None, "differences": []}
    cond = sheet.attachments.get(cond_name) if cond_name else None
    vessel = sheet.attachments.get(vessel_name) if vessel_name else None
    if cond is None or vessel is None:
        return {**base, "ok": False, "error": "the input files are not embedded"}
    try:
        text = _recompute_json(cond, vessel, cond_name, vessel_name)
    except InputError as exc:
        return {**base, "ok": False, "error": f"the embedded inputs do not evaluate: {exc}"}
    fresh = json.loads(text)
    version = (fresh.get("software") or {}).get("version")
    a = {k: v for k, v in sheet.results.items() if k != "software"}
    b = {k: v for k, v in fresh.items() if k != "software"}
    diffs = _differing_keys(a, b)
    return {**base, "version": version, "ok": not diffs, "differences": diffs, "error": None}


# --------------------------------------------------------------------------------------------
# The visible stamp


class _PdfPageContent(pdf_content.PdfContent):
    """The first page of an in-memory PDF, imported as a form XObject."""

    def __init__(self, pdf_bytes: bytes) -> None:
        self.pdf_bytes = pdf_bytes
        super().__init__()

    def render(self) -> bytes:
        import binascii
        import uuid

        writer = self._ensure_writer
        reader = PdfFileReader(io.BytesIO(self.pdf_bytes))
        xobj = writer.import_page_as_xobject(reader, page_ix=0)
        name = "/Stamp" + binascii.hexlify(uuid.uuid4().bytes).decode("ascii")
        self.resources.xobject[name] = xobj
        x1, y1, x2, y2 = xobj.get_object()["/BBox"]
        self.box = pdf_content.BoxConstraints(width=abs(x1 - x2), height=abs(y1 - y2))
        return name.encode("ascii") + b" Do"


def _stamp_pdf(role: str, signer: str, when: dt.datetime, width_pt: float,
               height_pt: float) -> bytes:
    """A one-page PDF, the size of the field, with role, signer and date (words from
    templates/stamp.html.j2); the sheet's font, embedded."""
    from weasyprint import HTML

    from reportgen.report import fonts
    from reportgen.report.render import template_environment

    fs = max(5.0, min(9.0, height_pt / 6.0))  # four lines fit the field
    page = template_environment().get_template("stamp.html.j2").render(
        w=width_pt, h=height_pt, fs=fs, role=role, signer=signer, when=when)
    return HTML(string=page).write_pdf(font_config=fonts.font_config(),
                                       stylesheets=[fonts.stylesheet("")])


def _field_rect(reader: PdfFileReader, role: str) -> tuple[float, float]:
    """Width and height (pt) of the widget of the named signature field."""
    for name, _value, ref in fields.enumerate_sig_fields(reader, with_name=role):
        field = ref.get_object()
        widget = field if "/Rect" in field else field["/Kids"][0].get_object()
        x1, y1, x2, y2 = (float(v) for v in widget["/Rect"])
        if name == role:
            return abs(x2 - x1), abs(y2 - y1)
    raise InputError(f"no signature field {role}")


# --------------------------------------------------------------------------------------------
# Signing


def _check_out_path(in_path: Path, out_path: Path, force: bool) -> None:
    if out_path.exists() or out_path.is_symlink():
        with contextlib.suppress(OSError):
            if in_path.exists() and os.path.samefile(in_path, out_path):
                raise InputError(
                    f"{out_path}: the output must not be the input sheet; a signed sheet is "
                    "written to a new file"
                )
        if not force:
            raise InputError(f"{out_path}: already exists; use --force to replace it")
    if not out_path.parent.is_dir():
        raise InputError(f"{out_path.parent}: the output directory does not exist")


def sign_sheet(in_path: Path, out_path: Path, role: str, *, key_path: Path | None = None,
               cert_path: Path | None = None, p12_path: Path | None = None,
               passphrase: bytes | None = None, reason: str | None = None,
               location: str | None = None, force: bool = False) -> None:
    """Sign one role's field of a reportgen sheet and write the result to ``out_path``.

    Refuses (InputError) a file that is not a reportgen sheet, a role already signed, and a
    sheet whose embedded results are not what this version computes from its embedded inputs.
    The first signature of a sheet certifies it (DocMDP: form filling and signing); later
    ones are approval signatures appended as incremental updates. The input file is never
    changed; the output is written atomically.
    """
    in_path, out_path = Path(in_path), Path(out_path)
    if role not in ROLES:
        raise InputError(f"sign: --role must be one of {', '.join(ROLES)}, not {role!r}")
    _check_out_path(in_path, out_path, force)
    data = read_input(in_path, "sheet")
    sheet = _read_sheet(data, in_path)
    if sheet.fields.get(role):
        raise InputError(f"{in_path}: the {role} field is already signed")

    inputs = _check_inputs(sheet)
    if not inputs["ok"]:
        raise InputError(f"{in_path}: refusing to sign: {'; '.join(inputs['problems'])}")
    recomputation = _check_recomputation(sheet)
    if not recomputation["ok"]:
        detail = recomputation["error"] or (
            "the embedded results differ from a recomputation at "
            + ", ".join(recomputation["differences"][:8])
        )
        raise InputError(f"{in_path}: refusing to sign: {detail}")

    origin = str(p12_path or key_path)
    key, cert, extra = _load_identity(key_path, cert_path, p12_path, passphrase)
    signer = _make_signer(key, cert, extra, origin)
    signer_name = _common_name(cert)
    now = _utc_now()
    cert_start = cert.not_valid_before_utc
    cert_end = cert.not_valid_after_utc
    if not cert_start <= now <= cert_end:
        raise InputError(
            f"{origin}: the certificate is valid from {cert_start:%Y-%m-%d} to "
            f"{cert_end:%Y-%m-%d}, not now"
        )

    first = not any(sheet.fields.values())
    width, height = _field_rect(sheet.reader, role)
    stamp = StaticStampStyle(
        background=_PdfPageContent(_stamp_pdf(role, signer_name, now, width, height)),
        background_opacity=1.0,
        border_width=0,
    )
    meta = signers.PdfSignatureMetadata(
        field_name=role,
        subfilter=fields.SigSeedSubFilter.PADES,
        md_algorithm="sha256",
        certify=first,
        docmdp_permissions=fields.MDPPerm.FILL_FORMS,
        reason=reason or f"{role} ({_ROLE_WORDS[role].split()[0].lower()} the calculation)",
        location=location,
        name=signer_name,
    )
    pdf_signer = signers.PdfSigner(meta, signer=signer, stamp_style=stamp)
    writer = IncrementalPdfFileWriter(io.BytesIO(data), strict=False)
    try:
        output = pdf_signer.sign_pdf(writer, existing_fields_only=True, output=io.BytesIO())
    except (SigningError, PdfError, ValueError) as exc:
        raise InputError(f"{in_path}: cannot sign the {role} field: {exc}") from exc
    write_atomic(out_path, output.getvalue(), force=True)  # existing output refused above


# --------------------------------------------------------------------------------------------
# Verification


def _load_trust_roots(paths: Iterable[Path]) -> list[asn1_x509.Certificate]:
    roots: list[asn1_x509.Certificate] = []
    for p in paths:
        data = read_input(Path(p), "trusted certificate")
        try:
            certs = (x509.load_pem_x509_certificates(data) if b"-----BEGIN" in data
                     else [x509.load_der_x509_certificate(data)])
        except ValueError as exc:
            raise InputError(f"{p}: not a certificate: {exc}") from exc
        roots.extend(
            asn1_x509.Certificate.load(c.public_bytes(serialization.Encoding.DER))
            for c in certs
        )
    return roots


def _iso(value: dt.datetime | None) -> str | None:
    if value is None:
        return None
    if value.tzinfo is None:
        value = value.replace(tzinfo=dt.UTC)
    return value.astimezone(dt.UTC).isoformat().replace("+00:00", "Z")


def _changes_after(status: Any) -> tuple[str | None, list[str], str | None]:
    """Modification level, changed form fields and a note from pyHanko's difference analysis."""
    diff = status.diff_result
    if diff is None:
        return None, [], None
    if isinstance(diff, DiffResult):
        return diff.modification_level.name.lower(), sorted(diff.changed_form_fields), None
    return ModificationLevel.OTHER.name.lower(), [], str(diff)


@contextlib.contextmanager
def _quiet_pyhanko() -> Iterator[None]:
    """Keep pyHanko's own log records (with tracebacks) off the terminal while validating;
    every outcome they describe is in the report."""
    loggers = [logging.getLogger(n) for n in ("pyhanko", "pyhanko_certvalidator")]
    levels = [lg.level for lg in loggers]
    for lg in loggers:
        lg.setLevel(logging.CRITICAL)
    try:
        yield
    finally:
        for lg, level in zip(loggers, levels, strict=True):
            lg.setLevel(level)


def _verify_signature(emb: Any, roots: list[asn1_x509.Certificate],
                      named: dict[str, Any]) -> dict:
    field = emb.field_name
    entry: dict[str, Any] = {"field": field, "role": field if field in ROLES else None,
                             "named_on_sheet": named.get(f"{field}_by")}
    vc = ValidationContext(trust_roots=roots, allow_fetching=False)
    try:
        status = validate_pdf_signature(emb, signer_validation_context=vc)
    except Exception as exc:  # noqa: BLE001 - any failure to validate is a bad signature
        entry.update(signer=None, signing_time=None, intact=False, valid=False,
                     trusted=False, coverage=None, modification_level=None,
                     changed_fields=[], docmdp_ok=False, certifies=None,
                     error=f"{type(exc).__name__}: {exc}", ok=False)
        return entry
    cert = status.signing_cert
    signer = cert.subject.native.get("common_name") if cert is not None else None
    organisation = cert.subject.native.get("organization_name") if cert is not None else None
    level, changed, note = _changes_after(status)
    coverage = status.coverage.name.lower() if status.coverage is not None else None
    coverage_ok = status.coverage in (SignatureCoverageLevel.ENTIRE_FILE,
                                      SignatureCoverageLevel.ENTIRE_REVISION)
    level_ok = status.diff_result is None or (
        isinstance(status.diff_result, DiffResult)
        and status.diff_result.modification_level in _ALLOWED_LEVELS
    )
    docmdp_ok = bool(status.docmdp_ok) and coverage_ok and level_ok
    intact = bool(status.intact and status.valid)
    trusted = bool(status.trusted)
    entry.update(
        signer=signer,
        organisation=organisation,
        signing_time=_iso(status.signer_reported_dt),
        intact=intact,
        valid=bool(status.valid),
        trusted=trusted,
        trust_problem=(status.trust_problem_indic.name.lower()
                       if status.trust_problem_indic is not None else None),
        coverage=coverage,
        modification_level=level,
        changed_fields=changed,
        docmdp_ok=docmdp_ok,
        certifies=emb.docmdp_level is not None and emb.sig_object.get("/Reference") is not None,
        error=note,
        ok=intact and trusted and docmdp_ok,
    )
    return entry


def _page_texts(pdf: bytes) -> list[str]:
    """The printed text of each page (page content only, not annotations such as signature
    stamps), with runs of white space folded."""
    from pypdf import PdfReader

    return [" ".join((page.extract_text() or "").split())
            for page in PdfReader(io.BytesIO(pdf)).pages]


def _check_pages(data: bytes, sheet: _Sheet) -> dict:
    """Render the sheet afresh from its embedded inputs and compare the printed text of every
    page with the sheet's: catches pages edited before signing, which the embedded results
    alone would not show."""
    from reportgen.inputs import load_case_bytes
    from reportgen.pipeline import evaluate
    from reportgen.report.render import render_sheet

    cond_name, vessel_name = _input_names(sheet.results)
    cond = sheet.attachments.get(cond_name) if cond_name else None
    vessel = sheet.attachments.get(vessel_name) if vessel_name else None
    if cond is None or vessel is None:
        return {"ok": False, "differing_pages": [], "error": "the input files are not embedded"}
    try:
        case = load_case_bytes(cond, vessel, cond_name, vessel_name)
        fresh = render_sheet(case, evaluate(case))
    except InputError as exc:
        return {"ok": False, "differing_pages": [],
                "error": f"the embedded inputs do not evaluate: {exc}"}
    printed, expected = _page_texts(data), _page_texts(fresh)
    differing = [i + 1 for i in range(max(len(printed), len(expected)))
                 if i >= len(printed) or i >= len(expected) or printed[i] != expected[i]]
    return {"ok": not differing, "pages": len(printed), "differing_pages": differing,
            "error": None}


def verify_sheet(path: Path, trust: Sequence[Path] = (), pages: bool = False) -> dict:
    """Check the signatures, embedded inputs and results of a sheet.

    ``trust``: certificate files (PEM or DER) of the trusted roots; with none, no signer is
    trusted. Returns {"ok", "file", "signatures": [...], "inputs": {...},
    "recomputation": {...}}; "ok" needs at least one signature, every signature intact,
    trusted and followed only by permitted changes, the inputs matching their hash, and the
    recomputation agreeing. With ``pages``, the sheet is also rendered afresh from its
    embedded inputs and the printed text of every page compared ("pages" in the report;
    it must agree too). An unreadable file or a PDF that is not a sheet: InputError.
    """
    path = Path(path)
    data = read_input(path, "sheet")
    sheet = _read_sheet(data, path)
    roots = _load_trust_roots(trust)
    signatories = (sheet.results.get("condition") or {}).get("signatories") or {}
    with _quiet_pyhanko():
        signatures = [_verify_signature(emb, roots, signatories)
                      for emb in sheet.reader.embedded_signatures]
    inputs = _check_inputs(sheet)
    recomputation = _check_recomputation(sheet)
    printed = _check_pages(data, sheet) if pages else None
    ok = (bool(signatures) and all(s["ok"] for s in signatures)
          and inputs["ok"] and recomputation["ok"] and (printed is None or printed["ok"]))
    return {
        "ok": ok,
        "file": str(path),
        "trusted_roots": len(roots),
        "signatures": signatures,
        "unsigned_fields": sorted(n for n, filled in sheet.fields.items() if not filled),
        "inputs": inputs,
        "recomputation": recomputation,
        "pages": printed,
    }


def _yes_no(flag: Any) -> str:
    return "yes" if flag else "NO"


def render_verify_report(report: dict) -> str:
    """Plain text of a verify_sheet report: every check spelled out in words."""
    lines = [f"Sheet: {report.get('file', '')}"]
    sigs = report.get("signatures", [])
    if not sigs:
        lines.append("Signatures: none - the sheet is not signed")
    for s in sigs:
        lines.append(f"Signature in field '{s['field']}': {'GOOD' if s['ok'] else 'NOT GOOD'}")
        lines.append(f"  signer:            {s.get('signer') or 'unknown'}")
        if s.get("named_on_sheet"):
            lines.append(f"  named on sheet:    {s['named_on_sheet']}")
        lines.append(f"  signed at:         {s.get('signing_time') or 'not stated'}")
        lines.append(f"  intact:            {_yes_no(s.get('intact'))}")
        trusted = _yes_no(s.get("trusted"))
        if not s.get("trusted"):
            trusted += (" (signer not among the trusted certificates)"
                        if report.get("trusted_roots") else " (no --trust certificate given)")
        lines.append(f"  trusted:           {trusted}")
        lines.append(f"  covers:            {(s.get('coverage') or 'unknown').replace('_', ' ')}")
        level = (s.get("modification_level") or "none").replace("_", " ")
        lines.append(f"  changed after it:  {level}"
                     + (f" ({', '.join(s['changed_fields'])})" if s.get("changed_fields") else ""))
        lines.append(f"  changes permitted: {_yes_no(s.get('docmdp_ok'))}")
        if s.get("error"):
            note = str(s["error"]).replace("\n", "\n" + " " * 21)
            lines.append(f"  note:              {note}")
    if report.get("unsigned_fields"):
        lines.append(f"Unsigned fields: {', '.join(report['unsigned_fields'])}")
    inp = report.get("inputs", {})
    lines.append(f"Embedded inputs: {'GOOD' if inp.get('ok') else 'NOT GOOD'}")
    lines.append(f"  condition file:    {inp.get('condition_file')}")
    lines.append(f"  vessel file:       {inp.get('vessel_file')}")
    lines.append(f"  hash matches:      {_yes_no(inp.get('hash_ok'))}")
    lines.append(f"  document number:   {inp.get('document_number')} "
                 f"(matches: {_yes_no(inp.get('document_number_ok'))})")
    for problem in inp.get("problems", []):
        lines.append(f"  problem:           {problem}")
    rec = report.get("recomputation", {})
    lines.append(f"Recomputation: {'AGREES' if rec.get('ok') else 'DOES NOT AGREE'}")
    lines.append(f"  sheet made by version {rec.get('embedded_version')}, "
                 f"recomputed by version {rec.get('version')}")
    if rec.get("error"):
        lines.append(f"  problem:           {rec['error']}")
    diffs = rec.get("differences") or []
    if diffs:
        shown = ", ".join(diffs[:10]) + (f" and {len(diffs) - 10} more" if len(diffs) > 10 else "")
        lines.append(f"  differs at:        {shown}")
    printed = report.get("pages")
    if printed is not None:
        lines.append(f"Printed pages: {'AGREE' if printed['ok'] else 'DO NOT AGREE'} "
                     "with a fresh rendering from the embedded inputs")
        if printed.get("error"):
            lines.append(f"  problem:           {printed['error']}")
        if printed.get("differing_pages"):
            lines.append("  differing pages:   "
                         + ", ".join(str(n) for n in printed["differing_pages"]))
    lines.append("Result: " + ("VERIFIED" if report.get("ok") else "NOT VERIFIED"))
    return "\n".join(lines)
