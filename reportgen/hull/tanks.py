"""Sounding tables of tanks given by geometry: a box clipped by the hull (SPEC.md, "Setting up
a ship"), at soundings fine enough for the compartment tolerances of MSC.1/Circ.1229.

The loading stage reads a tank table by linear interpolation between its rows (reportgen
.loading). So the rows are chosen such that linear interpolation between any two neighbours
stays within a tenth of the Circ.1229 tolerance of the exact value at their midpoint:
- volume and free-surface inertia: 0.2 % (Circ.1229: volume 2 %, FSM 2 %), or a small floor
  of the full-tank value where the value itself is near zero;
- LCG, VCG and TCG: 5 mm (Circ.1229: VCG 1 % / 5 cm, LCG 1 % / 50 cm), relaxed to 5 cm in
  the bottom 2 % of the capacity where the centre of a vanishing layer moves fast and carries
  almost no mass.
An interval that misses is halved, down to MIN_STEP_M. Lengths m, volumes m³, inertia m⁴.
"""

from __future__ import annotations

from collections.abc import Callable

import numpy as np

from reportgen.hull.compartments import TankBox, sounding_grid, tank_depth, tank_table
from reportgen.hull.sections import Hull

START_STEP_M = 0.1  # the regular sounding step, m (smaller for shallow tanks)
MIN_STEP_M = 0.002  # the finest step refinement goes to, m
REL_TOL = 0.002  # 0.2 %: a tenth of Circ.1229's 2 % for volume and FSM
FLOOR_TOL = 2e-6  # of the full-tank value, where the value itself is near zero
CENTRE_TOL_M = 0.005  # a tenth of Circ.1229's 5 cm for VCG
CENTRE_TOL_LOW_M = 0.05  # in the bottom LOW_FRACTION of the capacity
LOW_FRACTION = 0.02
COLUMNS = ("sounding", "volume", "lcg", "vcg", "tcg", "fsi")
DECIMALS = 4  # written to the file: 0.1 mm, 0.1 dm³, 0.0001 m⁴


def box_of(geometry) -> TankBox:
    """TankBox from a vessel file's tank `geometry` ({x, y, z}: [from, to], m)."""
    return TankBox(geometry.x[0], geometry.x[1], geometry.y[0], geometry.y[1],
                   geometry.z[0], geometry.z[1])


def _values_at(hull: Hull, box: TankBox, soundings_m: np.ndarray) -> dict[str, np.ndarray]:
    s = np.asarray(soundings_m, dtype=float)
    if s.size == 1:  # tank_table takes at least two rows
        out = tank_table(hull, box, np.array([s[0], s[0] + MIN_STEP_M / 4]))
        return {k: v[:1] for k, v in out.items()}
    return tank_table(hull, box, s)


def _misses(lo: dict[str, np.ndarray], hi: dict[str, np.ndarray], mid: dict[str, np.ndarray],
            full: dict[str, float]) -> np.ndarray:
    """For each interval (rows `lo` to `hi`), whether linear interpolation at its midpoint
    misses the exact values `mid` by more than the tolerances of this module; `full`: the
    largest volume (m³) and fsi (m⁴) of the tank, for the floors."""
    bad = np.zeros(len(mid["sounding"]), dtype=bool)
    for name in ("volume", "fsi"):
        lin = 0.5 * (lo[name] + hi[name])
        exact = mid[name]
        bad |= np.abs(lin - exact) > np.maximum(REL_TOL * np.abs(exact), FLOOR_TOL * full[name])
    low = mid["volume"] < LOW_FRACTION * full["volume"]
    tol = np.where(low, CENTRE_TOL_LOW_M, CENTRE_TOL_M)
    for name in ("lcg", "vcg", "tcg"):
        bad |= np.abs(0.5 * (lo[name] + hi[name]) - mid[name]) > tol
    return bad


def geometry_tank_table(hull: Hull, box: TankBox,
                        progress: Callable[[], None] | None = None) -> dict[str, np.ndarray]:
    """The sounding table (columns COLUMNS) of the tank `box` cuts out of `hull`, with rows
    refined until linear interpolation meets the tolerances above. ValueError when the box
    does not cut the hull."""
    z_low, z_high = tank_depth(hull, box)
    step = min(START_STEP_M, (z_high - z_low) / 10.0)
    table = tank_table(hull, box, sounding_grid(hull, box, step_m=step))
    full = {"volume": float(table["volume"][-1]), "fsi": float(np.max(table["fsi"]))}
    while True:
        s = table["sounding"]
        idx = np.flatnonzero(np.diff(s) > 2.0 * MIN_STEP_M)  # intervals that may be halved
        if not idx.size:
            break
        mid = _values_at(hull, box, 0.5 * (s[idx] + s[idx + 1]))
        lo = {k: v[idx] for k, v in table.items()}
        hi = {k: v[idx + 1] for k, v in table.items()}
        bad = _misses(lo, hi, mid, full)
        if progress is not None:
            progress()
        if not np.any(bad):
            break
        merged = {k: np.concatenate([table[k], mid[k][bad]]) for k in table}
        order = np.argsort(merged["sounding"], kind="stable")
        table = {k: v[order] for k, v in merged.items()}
    return _printable(table)


def _printable(table: dict[str, np.ndarray]) -> dict[str, np.ndarray]:
    """The table rounded to DECIMALS, keeping the rows whose sounding and volume still strictly
    increase once rounded (the full row always stays)."""
    t = {k: np.round(v, DECIMALS) + 0.0 for k, v in table.items()}
    keep = [0]
    for i in range(1, len(t["sounding"])):
        if t["volume"][i] > t["volume"][keep[-1]] and t["sounding"][i] > t["sounding"][keep[-1]]:
            keep.append(i)
    last = len(t["sounding"]) - 1
    if keep[-1] != last:
        keep[-1] = last
    return {k: v[np.array(keep)] for k, v in t.items()}
