"""YAML text of plain values, written by hand so that generated files read well: numbers in
fixed decimals or in the shortest form that reads back exactly, texts plain where safe."""

from __future__ import annotations

import json
from collections.abc import Sequence


def text_value(value: str) -> str:
    """A YAML scalar for a text: plain where that reads back as the same text, else quoted."""
    import yaml

    plain = str(value)
    try:
        if (plain and plain == plain.strip() and "#" not in plain and ": " not in plain
                and plain[0] not in "[]{},&*!|>'\"%@`-?:" and yaml.safe_load(plain) == plain
                and "\n" not in plain):
            return plain
    except yaml.YAMLError:
        pass
    return json.dumps(plain, ensure_ascii=False)


def number(value: float, decimals: int | None = None) -> str:
    """A number as YAML: fixed decimals, or the shortest text that reads back exactly.

    YAML 1.1 (the version PyYAML reads) takes an exponent form for a number only with a
    decimal point in the mantissa and a sign in the exponent (yaml.org/type/float.html):
    Python's 1e-05 and 1e+16 would read back as text, so they are written 1.0e-05, 1.0e+16."""
    v = float(value)
    if decimals is not None:
        s = f"{v:.{decimals}f}"
        return s[1:] if s.startswith("-") and float(s) == 0.0 else s
    s = repr(v + 0.0)
    mantissa, e, exponent = s.partition("e")
    if e and "." not in mantissa:
        s = f"{mantissa}.0e{exponent}"
    return s


def flow(values: Sequence[float], decimals: int | None = None) -> str:
    return "[" + ", ".join(number(v, decimals) for v in values) + "]"


def pairs(points: Sequence[Sequence[float]], decimals: int | None = None) -> str:
    """A flow list of pairs, e.g. the points of a profile or a station: [[x, z], ...]."""
    return "[" + ", ".join(flow(p, decimals) for p in points) + "]"
