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
    t = type(value)
    if t is float:
        if not math.isfinite(value):
            return None
        r = round(value, DECIMALS)
        return 0.0 if r == 0 else r
    if t is dict:
        return {str(k): clean(v) for k, v in value.items()}
    if t is list or t is tuple:
        return [clean(v) for v in value]
    if value is None or t is bool or t is str or t is int:
        return value
    if hasattr(value, "item"):  # numpy scalar
        return clean(value.item())
    if isinstance(value, float):
        return clean(float(value))
    raise TypeError(f"cannot put {type(value).__name__} into the results document")


@dataclass(frozen=True)
class Results:
    """One evaluated condition. Build with `Results.from_document(d)`; `to_dict()` gives a fresh
    copy of the document each call, `to_json()` the same text every run (indented, keys in
    document order, ensure_ascii off, a final newline)."""

    _compact: str  # the cleaned document as compact JSON: the immutable value
    passed: bool

    @classmethod
    def from_document(cls, document: dict) -> Results:
        doc = clean(document)
        if doc.get("format") != RESULTS_FORMAT:
            raise ValueError("not a results document")
        compact = json.dumps(doc, ensure_ascii=False, separators=(",", ":"), allow_nan=False)
        return cls(compact, bool(doc["passed"]))

    def to_dict(self) -> dict:
        return json.loads(self._compact)

    def to_json(self) -> str:
        return json.dumps(self.to_dict(), indent=2, ensure_ascii=False, sort_keys=False) + "\n"

    @property
    def criteria(self) -> list[dict]:
        return self.to_dict()["criteria"]
