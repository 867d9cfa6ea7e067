"""The package's data document, package.json (SPEC.md "Package", ``reportgen/package-1``):
its model, from which `reportgen schema package` makes the JSON Schema.

reportgen.report.package writes the document; each ``conditions[i].results`` is the results
document of that condition exactly as `check --json` prints it, and ``limits`` is the
vessel's limiting KG curve exactly as `reportgen limits VESSEL --json` prints it (trim 0).
"""

from __future__ import annotations

from typing import Literal

from reportgen.limitsmodel import LimitsDocument
from reportgen.results import Results, Section, Software


class PackageVessel(Section):
    name: str  # the ship's name
    identifier: str  # the ship's identifier
    sha256: str  # SHA-256 of the vessel file's bytes alone: the vessel data fingerprint
    file: str  # attachment name of the vessel file, embedded once


class PackageCondition(Section):
    file: str  # attachment name of the condition file, unique in the package
    results: Results  # the results document `check --json` prints for this condition


class PackageDocument(Section):
    format: Literal["reportgen/package-1"]  # format id: reportgen/package-1
    software: Software  # the program that made it: name and version
    inputs_sha256: str  # SHA-256 of the condition files' bytes in order, then the vessel file's
    title: str  # the package's title, printed on its cover
    vessel: PackageVessel  # the one ship of every condition
    conditions: list[PackageCondition]  # in the order given, as the package prints them
    limits: LimitsDocument | None  # limiting KG curve, trim 0, as `limits --json`; null: no curve
