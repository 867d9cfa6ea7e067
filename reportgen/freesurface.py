"""Free-surface moments by the rules of the IMO 2008 IS Code, Part B, 3.1 (SPEC.md).

Units: FSM in t·m, fillings in percent of a tank's capacity.

- A tank filled to `full_percent` (98 %, Part B 3.1.2) or more has no free surface, nor has an
  empty one; every other filling is slack. There is no lower slack limit.
- FSM of a tank = i·ρ, i the transverse moment of inertia of the free surface (m⁴) and ρ the
  liquid's density (t/m³), i at the tank's filling or the largest i of its sounding table.
- Rule `code` (the default): tanks of a fixed filling (ballast, cargo) at their actual filling
  (3.1.3.1); slack consumable tanks at the largest FSM between empty and full (3.1.3.2); and
  for each consumable content the transverse pair, or the single tank without a pair, of the
  greatest effect counted at its largest FSM even when full or empty (3.1.4).
- Rule `actual`: every slack tank at its actual filling.
- Rule `maximum`: every tank of the vessel at the largest FSM of its table, slack or not.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Literal, NamedTuple

FULL_TOLERANCE_PERCENT = 1e-9  # a filling given as mass or volume equal to 98 % counts as 98 %

Reason = Literal["slack", "largest_of_table", "worst_pair", "worst_single", "maximum_rule"]


class TankSurface(NamedTuple):  # an immutable record, one per tank of each condition
    """What the rules read of one tank of the vessel (listed in the condition or not).

    percent: filling, % of capacity (0 for a tank the condition leaves empty);
    fsm_actual_tm: i at the filling × ρ; fsm_max_tm: largest i of the table × ρ (t·m).
    """

    id: str
    content: str
    role: Literal["fixed", "consumable"]
    pair: str | None
    percent: float
    fsm_actual_tm: float
    fsm_max_tm: float


@dataclass(frozen=True)
class Counted:
    """A tank whose free surface is counted: its FSM (t·m) and why."""

    id: str
    fsm_tm: float
    reason: Reason


def is_slack(percent: float, full_percent: float) -> bool:
    """Slack: neither empty nor filled to `full_percent` or more (Part B 3.1.2)."""
    return 0.0 < percent < full_percent - FULL_TOLERANCE_PERCENT


def _code(tanks: list[TankSurface], full_percent: float) -> dict[str, Counted]:
    counted: dict[str, Counted] = {}
    for t in tanks:
        if not is_slack(t.percent, full_percent):
            continue
        if t.role == "fixed":  # 3.1.3.1
            counted[t.id] = Counted(t.id, t.fsm_actual_tm, "slack")
        else:  # 3.1.3.2
            counted[t.id] = Counted(t.id, t.fsm_max_tm, "largest_of_table")
    by_id = {t.id: t for t in tanks}
    for content in sorted({t.content for t in tanks if t.role == "consumable"}):
        units: list[tuple[TankSurface, ...]] = []
        for t in tanks:
            if t.role != "consumable" or t.content != content:
                continue
            if t.pair is None:
                units.append((t,))
            elif t.id < t.pair:
                units.append((t, by_id[t.pair]))
        # 3.1.4: the unit of the greatest effect (largest FSM; the first listed on a tie).
        worst = max(units, key=lambda u: sum(t.fsm_max_tm for t in u))
        reason: Reason = "worst_pair" if len(worst) == 2 else "worst_single"
        for t in worst:
            if t.id not in counted:
                counted[t.id] = Counted(t.id, t.fsm_max_tm, reason)
    return counted


def counted_tanks(tanks: list[TankSurface], rule: Literal["code", "actual", "maximum"],
                  full_percent: float) -> list[Counted]:
    """The tanks whose free surface counts under `rule`, in the order of `tanks`."""
    if rule == "code":
        chosen = _code(tanks, full_percent)
    elif rule == "actual":
        chosen = {t.id: Counted(t.id, t.fsm_actual_tm, "slack")
                  for t in tanks if is_slack(t.percent, full_percent)}
    else:
        chosen = {t.id: Counted(t.id, t.fsm_max_tm, "maximum_rule") for t in tanks}
    return [chosen[t.id] for t in tanks if t.id in chosen and chosen[t.id].fsm_tm > 0.0]
