"""Facts about a reportgen document that the report and the signing code share."""

from __future__ import annotations

ROLES: tuple[str, ...] = ("prepared", "checked", "reviewed")  # signature fields, in order
RESULTS_NAME = "results.json"  # the embedded results document
APPROVAL_SUFFIX = ".p7s"  # SPEC.md: VESSEL.yaml.p7s, the approval beside the vessel file
TITLE_PREFIX = "Intact stability calculation "  # the PDF title, before the document number
DOCNO_LENGTH = 12  # hex digits of inputs_sha256 that make the document number


def document_number(inputs_sha256: str) -> str:
    """The document number: the first DOCNO_LENGTH hex digits of the inputs' SHA-256."""
    return inputs_sha256[:DOCNO_LENGTH]
LIMITS_NAME = "limits.json"  # the embedded limits document (reportgen/limits-1)
LIMITS_FORMAT = "reportgen/limits-1"
LIMITS_REQUEST_NAME = "limits-request.json"  # the request (trim) hashed with the vessel bytes

PACKAGE_NAME = "package.json"  # the embedded data document of a calculation package
PACKAGE_FORMAT = "reportgen/package-1"
PACKAGE_TITLE_PREFIX = "Stability calculation package "  # the package's PDF title


def approval_name(vessel_attachment: str) -> str:
    """Name of the embedded approval: the vessel attachment's name plus ``.p7s`` (SPEC)."""
    return vessel_attachment + APPROVAL_SUFFIX
