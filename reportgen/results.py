"""The results of one evaluation: an immutable value whose serialisation is the SPEC.md
results document (format reportgen/results-1) plus the contract's extension keys."""

from __future__ import annotations

import json
import math
from dataclasses import dataclass
from typing import Any

RESULTS_FORMAT = "reportgen/results-1"
DECIMALS = 6  # every float in the document is rounded to this many decimals


def clean(value: Any) -> Any:
    """Plain JSON data: floats rounded to DECIMALS (−0.0 as 0.0), tuples as lists, numpy
    scalars as Python numbers, non-finite floats as null; key order kept."""
    if isinstance(value, dict):
        return {str(k): clean(v) for k, v in value.items()}
    if isinstance(value, list | tuple):
        return [clean(v) for v in value]
    if isinstance(value, bool) or value is None or isinstance(value, str):
        return value
    if isinstance(value, int) and not hasattr(value, "dtype"):
        return value
    if hasattr(value, "item"):  # numpy scalar
        return clean(value.item())
    if isinstance(value, float):
        if not math.isfinite(value):
            return None
        r = round(value, DECIMALS)
        return 0.0 if r == 0 else r
    raise TypeError(f"cannot put {type(value).__name__} into the results document")


@dataclass(frozen=True)
class Results:
    """One evaluated condition. Build with `Results.from_document(d)`; `to_dict()` gives a fresh
    copy of the document each call, `to_json()` the same bytes every run."""

    _json: str
    passed: bool

    @classmethod
    def from_document(cls, document: dict) -> Results:
        doc = clean(document)
        if doc.get("format") != RESULTS_FORMAT:
            raise ValueError("not a results document")
        text = json.dumps(doc, indent=2, ensure_ascii=False, sort_keys=False) + "\n"
        return cls(text, bool(doc["passed"]))

    def to_dict(self) -> dict:
        return json.loads(self._json)

    def to_json(self) -> str:
        return self._json

    @property
    def criteria(self) -> list[dict]:
        return self.to_dict()["criteria"]
