"""The table interpolation of the flow (reportgen.interp) against numpy.interp, the reference
it replaces: bit for bit (repr), at and between entries, at and beyond the ends, with repeated
entries, steep and flat columns, and NaN."""

from __future__ import annotations

import numpy as np

from reportgen.interp import interp, interp_columns


def _same(x: float, xp: np.ndarray, columns: np.ndarray) -> None:
    got = interp_columns(x, xp.tolist(), columns.tolist())
    want = [float(np.interp(x, xp, fp)) for fp in columns]
    assert [repr(g) for g in got] == [repr(w) for w in want], (x, xp, columns)


def test_equals_numpy_interp_bit_for_bit():
    rng = np.random.default_rng(11)
    for n in (2, 3, 4, 5, 9, 41):  # numpy searches short tables linearly, long ones by halves
        for _ in range(60):
            xp = np.cumsum(rng.uniform(0.01, 5.0, n)) + rng.normal(0.0, 1e3)
            if n > 3 and rng.random() < 0.3:  # a repeated entry (non-decreasing table)
                i = int(rng.integers(1, n - 1))
                xp[i] = xp[i - 1]
            columns = rng.normal(0.0, rng.choice([1e-3, 1.0, 1e4]), (4, n))
            columns[1] = columns[1, 0]  # a flat column
            inside = rng.uniform(xp[0], xp[-1], 20)
            points = [*inside, *xp, *np.nextafter(xp, np.inf), *np.nextafter(xp, -np.inf),
                      xp[0] - 1.0, xp[-1] + 1.0, float(np.float32(inside[0]))]
            for x in points:
                _same(float(x), xp, columns)


def test_nan_and_one_column():
    xp = np.array([0.0, 1.0, 2.0])
    fp = np.array([0.0, 10.0, 5.0])
    assert np.isnan(interp(float("nan"), xp.tolist(), fp.tolist()))
    assert interp(1.5, xp.tolist(), fp.tolist()) == 7.5 == float(np.interp(1.5, xp, fp))
