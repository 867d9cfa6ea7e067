"""The approved booklet's own limiting curve as a criterion (SPEC.md "Limits", criteria set
`booklet.limits`): `kg_limit`, KG corrected ≤ the booklet's limiting KG at the condition's
displacement (`limiting_kg: {kg}`), or `gm_limit`, GM corrected ≥ its minimum GM
(`limiting_kg: {gm}` or `limiting_gm`). Linear interpolation in displacement (t); a
displacement outside the curve fails the criterion (never extrapolated) with a warning.
KG and GM in m.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from reportgen.criteria.core import Check, State

SET = "booklet.limits"


@dataclass(frozen=True)
class Curve:
    """A booklet curve: displacement t (increasing) against KG max or GM min, m."""

    source: str
    kind: str  # "kg" | "gm"
    displacement_t: tuple[float, ...]
    value_m: tuple[float, ...]

    def covers(self, displacement_t: float) -> bool:
        return self.displacement_t[0] <= displacement_t <= self.displacement_t[-1]

    def at(self, displacement_t: float) -> float | None:
        """The curve's value (m) at a displacement (t), None outside it."""
        if not self.covers(displacement_t):
            return None
        return float(np.interp(displacement_t, self.displacement_t, self.value_m))


def curve_of(vessel) -> Curve | None:
    """The curve of a vessel model's `limiting_kg` or `limiting_gm` block (None without)."""
    block = getattr(vessel, "limiting_kg", None) or getattr(vessel, "limiting_gm", None)
    if block is None:
        return None
    kind = "kg" if block.kg is not None else "gm"
    values = block.kg if kind == "kg" else block.gm
    return Curve(block.source, kind, tuple(block.displacement), tuple(values))


def checks(s: State) -> list[Check]:
    c = s.booklet
    disp = s.displacement_t
    if c is None or disp is None:  # the vessel model requires a curve with this set
        return [Check("kg_limit", "KG within the booklet's limiting KG", "no curve given",
                      None, None, "m", False, SET, "at_most")]
    required = c.at(disp)
    ref = f"{c.source} (linear in displacement)"
    if c.kind == "kg":
        attained = s.kg_fluid_m
        passed = required is not None and attained is not None and attained <= required
        return [Check("kg_limit", "KG corrected within the booklet's limiting KG", ref,
                      required, attained, "m", passed, SET, "at_most")]
    attained = s.gm_fluid_m
    passed = required is not None and attained >= required
    return [Check("gm_limit", "GM corrected above the booklet's minimum GM", ref, required,
                  attained, "m", passed, SET)]


def warnings(s: State) -> list[str]:
    """A warning when the condition's displacement lies outside the booklet's curve."""
    c, disp = s.booklet, s.displacement_t
    if c is None or disp is None or c.covers(disp):
        return []
    text = (f"The displacement {disp:.1f} t lies outside the booklet's limiting curve "
            f"({c.displacement_t[0]:g} to {c.displacement_t[-1]:g} t, {c.source}): the "
            f"booklet criterion fails, as the curve is not extrapolated.")
    return [text]
