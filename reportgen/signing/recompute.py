"""The kinds of signed document and how each is made again from its embedded inputs.

Verification re-runs the calculation and re-renders the document; this module is the one
place that calls the calculation and the renderer (``reportgen.inputs.load_case_bytes``,
``reportgen.pipeline.evaluate``, ``reportgen.report.render.render_sheet``). A document's kind
is recognised by the data file it embeds (``results.json`` for a sheet); a package or a
limits document registers its own ``Kind`` here with its own rebuild function.
"""

from __future__ import annotations

import hashlib
from collections.abc import Callable, Mapping
from dataclasses import dataclass
from functools import lru_cache
from importlib import import_module
from typing import Any

from reportgen.docinfo import RESULTS_NAME, ROLES, TITLE_PREFIX
from reportgen.errors import InputError
from reportgen.provenance import approval_name, vessel_fingerprint
from reportgen.results import RESULTS_FORMAT


@dataclass(frozen=True)
class Inputs:
    """The embedded input files of a document, by attachment name."""

    condition_name: str
    condition: bytes
    vessel_name: str
    vessel: bytes
    approval: bytes | None
    # a package: every condition file (attachment name, bytes) in order; the first one is
    # also condition_name/condition
    conditions: tuple[tuple[str, bytes], ...] = ()
    # a package: the names each condition was read under (condition, vessel), as its
    # embedded results record them, and the package's title
    read_as: tuple[tuple[str, str], ...] = ()
    title: str | None = None

    def condition_files(self) -> tuple[tuple[str, bytes], ...]:
        """Every embedded condition file, (attachment name, bytes), in order."""
        return self.conditions or ((self.condition_name, self.condition),)

    def sha256(self) -> str:
        """SHA-256 of the condition files' bytes in order, then the vessel file's (SPEC)."""
        digest = hashlib.sha256()
        for _name, data in self.condition_files():
            digest.update(data)
        digest.update(self.vessel)
        return digest.hexdigest()


@dataclass(frozen=True)
class Rebuilt:
    """A document made again from its embedded inputs by the running version."""

    data_text: str  # the data document (e.g. results.json) as this version computes it
    pdf: bytes  # the document before any signature, as this version renders it


@dataclass(frozen=True)
class Kind:
    """One kind of signed document."""

    name: str  # "sheet"
    words: str  # "calculation sheet", for messages
    data_file: str  # the embedded data document that identifies the kind
    data_format: str  # its "format" value
    inputs: Callable[[Mapping[str, Any], Mapping[str, bytes]], Inputs]
    rebuild: Callable[[Inputs], Rebuilt]
    certified: Callable[[Mapping[str, Any], Inputs | None], dict]
    title_prefix: str = TITLE_PREFIX  # the PDF title, before the document number


def _sheet_inputs(data: Mapping[str, Any], files: Mapping[str, bytes]) -> Inputs:
    """The condition and vessel files (and approval) a sheet names in results.inputs."""
    named = data.get("inputs")
    if not isinstance(named, dict):
        raise InputError("the results do not name the input files (results.inputs)")
    cond_name, vessel_name = named.get("condition_file"), named.get("vessel_file")
    if not isinstance(cond_name, str) or not isinstance(vessel_name, str):
        raise InputError("the results do not name the input files (results.inputs)")
    for name in (cond_name, vessel_name):
        if name not in files:
            raise InputError(f"the input file {name} is not embedded")
    return Inputs(cond_name, files[cond_name], vessel_name, files[vessel_name],
                  files.get(approval_name(vessel_name)))


def load_case(inputs: Inputs) -> Any:
    """The Case of the embedded inputs (InputError when they do not read)."""
    from reportgen.inputs import load_case_bytes

    return load_case_bytes(inputs.condition, inputs.vessel, inputs.condition_name,
                           inputs.vessel_name, inputs.approval)


def _rebuild_sheet(inputs: Inputs) -> Rebuilt:
    """Evaluate the embedded condition once and render the sheet from it."""
    from reportgen.pipeline import evaluate
    from reportgen.report.render import render_sheet

    case = load_case(inputs)
    results = evaluate(case)
    return Rebuilt(results.to_json(), render_sheet(case, results))


def _sheet_certified(data: Mapping[str, Any], inputs: Inputs | None) -> dict:
    """What a sheet certifies, from its embedded results (and the vessel bytes)."""
    vessel = data.get("vessel") if isinstance(data.get("vessel"), dict) else {}
    condition = data.get("condition") if isinstance(data.get("condition"), dict) else {}
    criteria = data.get("criteria") if isinstance(data.get("criteria"), list) else []
    failing = [{"id": c.get("id"), "title": c.get("title"), "reference": c.get("reference")}
               for c in criteria if isinstance(c, dict) and not c.get("passed")]
    fingerprint = vessel.get("sha256")
    if fingerprint is None and inputs is not None:
        fingerprint = vessel_fingerprint(inputs.vessel)
    return {
        "kind": "sheet",
        "vessel": vessel.get("name"),
        "identifier": vessel.get("identifier"),
        "vessel_sha256": fingerprint,
        "condition": condition.get("title"),
        "date": condition.get("date"),
        "passed": data.get("passed") is True,
        "failing_criteria": failing,
        "signatories": _names(condition.get("signatories")),
    }


def _names(signatories: Any) -> dict[str, str]:
    """The names the results give for the roles (ROLE_by: text); anything else in a forged
    document is left out here and found by the recomputation."""
    if not isinstance(signatories, dict):
        return {}
    return {f"{role}_by": name if isinstance(name := signatories.get(f"{role}_by"), str)
            else None for role in ROLES}


SHEET = Kind("sheet", "calculation sheet", RESULTS_NAME, RESULTS_FORMAT,
             _sheet_inputs, _rebuild_sheet, _sheet_certified)

KINDS: dict[str, Kind] = {SHEET.name: SHEET}


@lru_cache(maxsize=4)
def rebuild(kind: Kind, inputs: Inputs) -> Rebuilt:
    """``kind.rebuild(inputs)``, remembered for a few inputs: rendering is deterministic (the
    same bytes for the same inputs), so a document verified or signed again in the same
    process, or several documents from the same inputs, are rendered once."""
    return kind.rebuild(inputs)


def register(kind: Kind) -> None:
    """Add a kind of document (a package, a limits document) to those verify knows."""
    KINDS[kind.name] = kind


KIND_MODULES = ("reportgen.signing.limitskind",  # each registers its Kind when imported
                "reportgen.signing.packagekind")


def kind_of(files: Mapping[str, bytes]) -> list[Kind]:
    """The kinds whose data document is embedded among ``files``."""
    for module in KIND_MODULES:
        import_module(module)
    return [k for k in KINDS.values() if k.data_file in files]


def check_vessel(vessel_bytes: bytes, name: str) -> None:
    """InputError when the bytes are not a valid vessel data file."""
    from reportgen.inputs import parse_vessel

    parse_vessel(vessel_bytes, name)


def vessel_reference(inputs: Inputs) -> str:
    """The path of the vessel file as the embedded condition names it (its ``vessel`` key)."""
    return str(load_case(inputs).condition.vessel)
