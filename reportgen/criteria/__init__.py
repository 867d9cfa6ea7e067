"""Criteria sets: the one place that lists them.

A criterion is a small function of the evaluated state returning a `Check` (required, attained,
passed, source). Sets (SPEC.md, "Criteria"):

- ``is2008.general``: IMO 2008 IS Code (MSC.267(85)), Part A, 2.2 — reportgen.criteria.general
- ``is2008.weather``: IMO 2008 IS Code (MSC.267(85)), Part A, 2.3 — reportgen.criteria.weather
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass
from typing import TYPE_CHECKING

if TYPE_CHECKING:
    from reportgen.criteria.weather import WeatherValues
    from reportgen.stability import GZCurve


@dataclass(frozen=True)
class Check:
    """The outcome of one criterion; `required` and `attained` in `unit`, None when the
    quantity does not exist for this condition (the criterion then fails)."""

    id: str
    title: str
    reference: str
    required: float | None
    attained: float | None
    unit: str
    passed: bool
    set: str
    limit: str = "at_least"  # "at_least": attained ≥ required; "at_most": attained ≤ required

    @property
    def margin(self) -> float | None:
        """The spare on the safe side, in `unit`: attained − required for an "at least"
        criterion, required − attained for an "at most" one; positive when passed."""
        if self.required is None or self.attained is None:
            return None
        spare = self.attained - self.required
        return -spare if self.limit == "at_most" else spare

    def as_dict(self) -> dict:
        return {"id": self.id, "title": self.title, "reference": self.reference,
                "required": self.required, "attained": self.attained, "unit": self.unit,
                "passed": self.passed, "margin": self.margin, "limit": self.limit,
                "set": self.set}


@dataclass(frozen=True)
class State:
    """What the criteria read: the GZ curve towards the side of the list and the angles (deg).

    gm_fluid_m: initial GM corrected for free surface, m. weather: the 2.3 quantities.
    """

    curve: GZCurve
    gm_fluid_m: float
    flooding_deg: float
    deck_edge_deg: float
    gz_max_deg: float
    weather: WeatherValues


def criteria_sets() -> dict[str, Callable[[State], list[Check]]]:
    """Set id -> function giving that set's checks, in SPEC order."""
    from reportgen.criteria import general, weather

    return {general.SET: general.checks, weather.SET: weather.checks}


def run_criteria(set_ids: list[str], state: State) -> list[Check]:
    """The checks of the listed sets, in the listed order."""
    from reportgen.errors import InputError

    known = criteria_sets()
    out: list[Check] = []
    for sid in set_ids:
        if sid not in known:
            raise InputError(f"criteria: unknown criteria set {sid!r}; known: "
                             f"{', '.join(known)}")
        out.extend(known[sid](state))
    return out
