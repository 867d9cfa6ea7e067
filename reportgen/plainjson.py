"""Plain JSON data for the documents (results, limits): floats rounded to DECIMALS decimals
as Python's round makes them, −0.0 as 0.0, non-finite floats as null, tuples as lists, numpy
scalars as Python numbers, models as their dump.

Speed (benchmarks/bench_check.py): Python's round(x, 6) costs about half a microsecond a float
and a document has several hundred besides its GZ arrays; `clean` walks the document once,
notes where each float goes, and rounds them all in one numpy call (`rounded`, value for value
as round: tests/test_results_document.py).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from typing import Any

import numpy as np
from pydantic import BaseModel

DECIMALS = 6  # every float in the document is rounded to this many decimals


class Floats:
    """Plain floats (a list, or a 1-D float array) for `clean` to round with the document's
    other floats in one go, rather than one by one: the GZ arrays. It becomes a list."""

    __slots__ = ("values",)

    def __init__(self, values: Sequence[float] | np.ndarray) -> None:
        self.values = values


def rounded(values: Sequence[float]) -> list[float | None]:
    """The floats of `values` as `round_float` makes each (round(x, DECIMALS), −0.0 as 0.0,
    non-finite as None), rounded as one numpy array: rint(x·10⁶)/10⁶, which equals Python's
    correctly rounded round(x, 6) (the division of an integer below 2⁵³ by 10⁶ is correctly
    rounded too) except where x·10⁶ lies within its own rounding error of a half, or is too
    large for an exact integer; those few, and non-finite values, go through `round_float`."""
    a = np.asarray(values, dtype=float)
    scale = 10.0 ** DECIMALS
    y = a * scale
    out = (np.rint(y) / scale + 0.0).tolist()  # + 0.0: −0.0 becomes 0.0
    with np.errstate(invalid="ignore"):
        exact = (np.abs(y - np.floor(y) - 0.5) > np.spacing(np.abs(y))) & (np.abs(y) < 2.0**52)
    for i in np.flatnonzero(~exact):  # NaN compares False: non-finite values land here
        out[i] = round_float(float(a[i]))
    return out


def round_float(value: float) -> float | None:
    """One float as the document has it: round(x, DECIMALS) (Python's, correctly rounded,
    ties to even), −0.0 as 0.0, non-finite as None. The reference of `rounded`."""
    if not math.isfinite(value):
        return None
    r = round(value, DECIMALS)
    return 0.0 if r == 0 else r


_PLAIN = frozenset((str, int, bool, type(None)))  # kept as they are


def clean(value: Any) -> Any:
    """Plain JSON data: floats rounded as `round_float` (−0.0 as 0.0, non-finite as null),
    tuples as lists, numpy scalars as Python numbers, models as their dump; key order kept.

    One walk copies the containers and notes where each float goes (and each `Floats` list);
    all the floats are then rounded together (`rounded`, value for value as `round_float`)
    and put in place."""
    if type(value) is float:
        return round_float(value)
    where: list = []  # (container, key or index) of each float, in walk order
    floats: list[float] = []
    lists: list = []  # (container, key or index, Floats) of each Floats list
    out = _walk(value, where, floats, lists)
    i = len(floats)  # the lists' floats follow the single ones
    every = floats if not lists else np.concatenate(
        [np.asarray(floats, dtype=float), *(np.asarray(f.values, dtype=float) for *_, f in lists)])
    if len(every):
        r = rounded(every)
        for (container, key), v in zip(where, r[:i], strict=True):
            container[key] = v
        for container, key, f in lists:
            n = len(f.values)
            container[key], i = r[i:i + n], i + n
    return out


def _walk(value: Any, where: list, floats: list, lists: list) -> Any:
    """`value` with its containers copied as plain dicts and lists; each float is left in
    place and noted in `where` and `floats`, each `Floats` list in `lists` (for `clean`)."""
    t = type(value)
    if t is dict:
        out: Any = {}
        for k, v in value.items():
            if type(k) is not str:
                k = str(k)
            tv = type(v)
            if tv is float:
                out[k] = v
                where.append((out, k))
                floats.append(v)
            elif tv in _PLAIN:
                out[k] = v
            elif tv is Floats:
                out[k] = v
                lists.append((out, k, v))
            else:
                out[k] = _walk(v, where, floats, lists)
        return out
    if t is list or t is tuple:
        out = []
        for v in value:
            tv = type(v)
            if tv is float:
                where.append((out, len(out)))
                floats.append(v)
                out.append(v)
            elif tv in _PLAIN:
                out.append(v)
            else:
                out.append(_walk(v, where, floats, lists))
        return out
    if t in _PLAIN:
        return value
    if t is float or t is Floats:  # bare: there is no container to note
        return round_float(value) if t is float else rounded(value.values)
    if isinstance(value, BaseModel):
        return _walk(value.model_dump(), where, floats, lists)
    if hasattr(value, "item"):  # numpy scalar
        return _scalar(value.item(), where, floats, lists)
    if isinstance(value, float):
        return _scalar(float(value), where, floats, lists)
    raise TypeError(f"cannot put {type(value).__name__} into the results document")


def _scalar(value: Any, where: list, floats: list, lists: list) -> Any:
    """A converted scalar: a float is rounded at once (it has no container here), anything
    else walked."""
    return round_float(value) if type(value) is float else _walk(value, where, floats, lists)
