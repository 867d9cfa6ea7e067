"""Linear interpolation in a table at one point, several columns at once, value for value as
numpy.interp makes each (its arithmetic, in Python floats).

numpy.interp(x, xp, fp) finds the last entry j with xp[j] ≤ x and returns
fp[j] + ((fp[j+1] − fp[j])/(xp[j+1] − xp[j]))·(x − xp[j]), written slope·(x − xp[j]) + fp[j];
fp[j] itself when x is that entry; the end values outside the table (numpy's C source,
numpy/_core/src/multiarray/compiled_base.c, arr_interp). Python's floats are the same IEEE
binary64 numbers with each operation rounded once, so the same steps give the same bits
(tests/test_interp.py checks against numpy.interp). One call for many columns costs about what
one numpy.interp call costs: the flow reads every column of a table row at one displacement or
sounding, and numpy's per-call overhead was most of the time of the upright stage.
"""

from __future__ import annotations

from bisect import bisect_right
from collections.abc import Sequence
from math import isnan


def interp_columns(x: float, xp: Sequence[float], columns: Sequence[Sequence[float]]
                   ) -> list[float]:
    """[numpy.interp(x, xp, fp) for fp in columns], as Python floats: xp increasing (lists
    of floats are fastest: they are indexed one value at a time)."""
    if isnan(x):  # numpy gives NaN
        return [x] * len(columns)
    j = bisect_right(xp, x) - 1  # the last entry ≤ x
    if j < 0:
        return [fp[0] for fp in columns]
    if j >= len(xp) - 1:
        return [fp[-1] for fp in columns]
    x0 = xp[j]
    if x0 == x:
        return [fp[j] for fp in columns]
    step, dx = xp[j + 1] - x0, x - x0
    out = []
    for fp in columns:
        y0, y1 = fp[j], fp[j + 1]
        slope = (y1 - y0) / step
        r = slope * dx + y0
        if isnan(r):  # NaN one way (an infinite slope): numpy tries from the other end
            r = slope * (x - xp[j + 1]) + y1
            if isnan(r) and y0 == y1:
                r = y0
        out.append(r)
    return out


def interp(x: float, xp: Sequence[float], fp: Sequence[float]) -> float:
    """numpy.interp(x, xp, fp) of one column, as a Python float (see interp_columns)."""
    return interp_columns(x, xp, (fp,))[0]
