"""The angle of roll θ1 of the severe wind and rolling criterion, IMO 2008 IS Code (resolution
MSC.267(85)), Part A, 2.3.4, with its factors and their tables.

Units: lengths m, areas m², period s, angles deg. L, B, d, CB as 2.3.4 names them: the
waterline length, the moulded breadth, the mean moulded draught, and the block coefficient,
taken here as CB = ∇/(L·B·d) with those same L, B and d (the notation of 2.3.4; recalled from
memory of the paragraph, stated on the sheet) unless the vessel's hydrostatic table gives a
`cb` column, which is then used as the booklet gives it.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import cached_property

import numpy as np

# 2.3.4, tables 2.3.4-1 to 2.3.4-4: (argument, factor); linear between entries, constant
# beyond the ends (SPEC.md).
X1_TABLE = ((2.4, 1.00), (2.5, 0.98), (2.6, 0.96), (2.7, 0.95), (2.8, 0.93), (2.9, 0.91),
            (3.0, 0.90), (3.1, 0.88), (3.2, 0.86), (3.4, 0.82), (3.5, 0.80))  # by B/d
X2_TABLE = ((0.45, 0.75), (0.50, 0.82), (0.55, 0.89), (0.60, 0.95), (0.65, 0.97),
            (0.70, 1.00))  # by CB
K_TABLE = ((0.0, 1.00), (1.0, 0.98), (1.5, 0.95), (2.0, 0.88), (2.5, 0.79), (3.0, 0.74),
           (3.5, 0.72), (4.0, 0.70))  # by Ak·100/(L·B)
S_TABLE = ((6.0, 0.100), (7.0, 0.098), (8.0, 0.093), (12.0, 0.065), (14.0, 0.053),
           (16.0, 0.044), (18.0, 0.038), (20.0, 0.035))  # by T, s
K_SHARP_BILGE = 0.7  # 2.3.4: ship having sharp bilge
K_NO_KEELS = 1.0  # 2.3.4: round-bilged ship having no bilge or bar keels

# Range of the tables (SPEC.md; IS Code 2008 Part A 2.3 and MSC.1/Circ.1200).
B_OVER_D_LIMIT = 3.5
KG_D_RANGE = (-0.3, 0.5)
ROLL_PERIOD_LIMIT_S = 20.0


def _columns(table: tuple[tuple[float, float], ...]) -> tuple[np.ndarray, np.ndarray]:
    """(arguments, factors) of a table as arrays (made once, at import)."""
    arg, val = zip(*table, strict=True)
    return np.array(arg, dtype=float), np.array(val, dtype=float)


_X1, _X2, _K, _S = (_columns(t) for t in (X1_TABLE, X2_TABLE, K_TABLE, S_TABLE))


def _table(columns: tuple[np.ndarray, np.ndarray], x: float) -> float:
    return float(np.interp(x, *columns))


def factor_x1(b_over_d: float) -> float:
    """X1 by B/d, IS Code 2008 2.3.4 table 2.3.4-1."""
    return _table(_X1, b_over_d)


def factor_x2(cb: float) -> float:
    """X2 by the block coefficient CB, IS Code 2008 2.3.4 table 2.3.4-2."""
    return _table(_X2, cb)


def factor_k(bilge: str, bilge_keel_area_m2: float, length_m: float, breadth_m: float) -> float:
    """k, IS Code 2008 2.3.4: 1.0 round bilge without bilge or bar keels, 0.7 sharp bilge,
    otherwise table 2.3.4-3 by Ak·100/(L·B), L in m (which length: Hull.k_length_m)."""
    if bilge == "sharp":
        return K_SHARP_BILGE
    if bilge_keel_area_m2 <= 0.0:
        return K_NO_KEELS
    return _table(_K, bilge_keel_area_m2 * 100.0 / (length_m * breadth_m))


def factor_s(roll_period_s: float) -> float:
    """s by the rolling period T (s), IS Code 2008 2.3.4 table 2.3.4-4."""
    return _table(_S, roll_period_s)


def factor_r(og_m: float, draft_m: float) -> float:
    """r = 0.73 + 0.6·OG/d, IS Code 2008 2.3.4; OG = KG − d."""
    return 0.73 + 0.6 * og_m / draft_m


def coefficient_c(breadth_m: float, draft_m: float, lwl_m: float) -> float:
    """C = 0.373 + 0.023·(B/d) − 0.043·(Lwl/100), IS Code 2008 2.3.4."""
    return 0.373 + 0.023 * (breadth_m / draft_m) - 0.043 * (lwl_m / 100.0)


def roll_period_s(c: float, breadth_m: float, gm_m: float) -> float:
    """T = 2·C·B/√GM (s), IS Code 2008 2.3.4; GM corrected for free surface."""
    return 2.0 * c * breadth_m / math.sqrt(gm_m)


def roll_angle_deg(k: float, x1: float, x2: float, r: float, s: float) -> float:
    """θ1 = 109·k·X1·X2·√(r·s) (deg), IS Code 2008 2.3.4."""
    return 109.0 * k * x1 * x2 * math.sqrt(r * s)


def block_coefficient(displacement_t: float, density_t_m3: float, lwl_m: float,
                      breadth_m: float, draft_m: float) -> float:
    """CB = ∇/(L·B·d), ∇ = Δ/ρ (m³); L, B, d as in 2.3.4 (see the module docstring)."""
    return displacement_t / (density_t_m3 * lwl_m * breadth_m * draft_m)


@dataclass(frozen=True)
class Hull:
    """What θ1 reads of the ship, KG-independent: moulded breadth B, mean moulded draught d,
    waterline length Lwl (m), block coefficient CB, bilge kind and bilge keel area Ak (m²),
    and the length between perpendiculars (m)."""

    breadth_m: float
    draft_m: float
    lwl_m: float
    cb: float
    bilge: str
    bilge_keel_area_m2: float
    length_bp_m: float

    @property
    def k_length_m(self) -> float:
        """L of table 2.3.4-3 (m): the greater of Lpp and Lwl. The symbols listed under 2.3.4
        define only Lwl, the table writes L (the ship's length, as the Code's definitions
        give it: recalled from memory); k falls as Ak·100/(L·B) rises, so the greater length
        gives the greater θ1, the conservative reading (stated on the sheet)."""
        return max(self.length_bp_m, self.lwl_m)

    @cached_property
    def factors(self) -> tuple[float, float, float, float, float]:
        """(B/d, C, X1, X2, k) of 2.3.4, which do not depend on KG: taken once per condition
        (a limits search evaluates θ1 at many KGs of the same hull)."""
        b_over_d = self.breadth_m / self.draft_m
        return (b_over_d, coefficient_c(self.breadth_m, self.draft_m, self.lwl_m),
                factor_x1(b_over_d), factor_x2(self.cb),
                factor_k(self.bilge, self.bilge_keel_area_m2, self.k_length_m, self.breadth_m))


@dataclass(frozen=True)
class Roll:
    """θ1 and its factors (deg, s, m); theta1 is the formula's value unless a roll angle was
    given (model tests, MSC.1/Circ.1200). None where it does not exist (GM not positive)."""

    theta1: float | None
    theta1_formula: float | None
    roll_period: float | None
    s: float | None
    c: float
    r: float
    og: float
    x1: float
    x2: float
    k: float
    b_over_d: float
    cb: float
    kg_over_d_minus_1: float
    outside: tuple[str, ...]  # where the tables' range is left
    k_length: float = 0.0  # m, L of table 2.3.4-3 (Hull.k_length_m)


def roll(h: Hull, kg_fluid_m: float, gm_fluid_m: float, given_deg: float | None) -> Roll:
    """θ1 of 2.3.4 for KG and GM corrected for free surface (m), or the given angle (deg)."""
    d = h.draft_m
    b_over_d, c, x1, x2, k = h.factors
    og = kg_fluid_m - d
    r = factor_r(og, d)
    period = s = formula = None
    if gm_fluid_m > 0.0:
        period = roll_period_s(c, h.breadth_m, gm_fluid_m)
        s = factor_s(period)
        formula = roll_angle_deg(k, x1, x2, r, s) if r * s >= 0 else None
    kg_d = kg_fluid_m / d - 1.0
    outside = []
    if b_over_d >= B_OVER_D_LIMIT:
        outside.append(f"B/d = {b_over_d:.2f} is not below {B_OVER_D_LIMIT:g}")
    if not KG_D_RANGE[0] <= kg_d <= KG_D_RANGE[1]:
        outside.append(f"KG/d − 1 = {kg_d:.3f} is outside {KG_D_RANGE[0]:g} to "
                       f"{KG_D_RANGE[1]:g}")
    if period is not None and period >= ROLL_PERIOD_LIMIT_S:
        outside.append(f"the roll period T = {period:.1f} s is not below "
                       f"{ROLL_PERIOD_LIMIT_S:g} s")
    theta1 = given_deg if given_deg is not None else formula
    return Roll(theta1, formula, period, s, c, r, og, x1, x2, k, b_over_d, h.cb, kg_d,
                tuple(outside), h.k_length_m)
