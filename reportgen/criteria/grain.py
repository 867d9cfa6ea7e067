"""International Grain Code (resolution MSC.23(59)), A 7.1: the intact stability of a ship
carrying grain in bulk, with the grain assumed to shift (reportgen.grain). Angles in degrees,
areas in m·rad, levers in m."""

from __future__ import annotations

from reportgen.criteria.core import Check, State, at_least
from reportgen.errors import InputError
from reportgen.grain import GM0_M, RESIDUAL_AREA_MRAD

SET = "grain.2008"
REF_A_7_1_1 = "International Grain Code (MSC.23(59)), A 7.1.1"
REF_A_7_1_2 = "International Grain Code (MSC.23(59)), A 7.1.2"
REF_A_7_1_3 = "International Grain Code (MSC.23(59)), A 7.1.3"


def grain_heel(s: State) -> Check:
    """A 7.1.1: the angle of heel due to the shift of grain ≤ 12° and ≤ the deck-edge angle."""
    g = s.grain
    passed = g.heel_deg is not None and g.heel_deg <= g.heel_limit_deg
    return Check("grain_heel", "Angle of heel from the grain shift", REF_A_7_1_1,
                 g.heel_limit_deg, g.heel_deg, "deg", passed, SET, limit="at_most")


def grain_residual_area(s: State) -> Check:
    """A 7.1.2: residual area between GZ and the grain heeling arm ≥ 0.075 m·rad."""
    return at_least("grain_residual_area", "Residual area above the grain heeling arm",
                    REF_A_7_1_2, RESIDUAL_AREA_MRAD, s.grain.residual_area, "m·rad", SET)


def grain_gm0(s: State) -> Check:
    """A 7.1.3: initial GM corrected for the free surface of liquids ≥ 0.30 m."""
    return at_least("grain_gm0", "Initial GM with grain, corrected for free surface",
                    REF_A_7_1_3, GM0_M, s.gm_fluid_m, "m", SET)


def checks(s: State) -> list[Check]:
    if s.grain is None:
        raise InputError(f"criteria: the set {SET} needs grain on board (the condition's grain "
                         f"block with its stowage factor and compartments)")
    return [grain_heel(s), grain_residual_area(s), grain_gm0(s)]
