"""What every criterion shares: the Check it returns, the State it reads, and running sets.

A criterion is a small function of the evaluated state returning a `Check` (required, attained,
passed, source paragraph). The sets are listed, as data, in reportgen.criteria.sets.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import cache
from importlib import import_module
from typing import TYPE_CHECKING, Any, Literal

from reportgen.criteria.sets import SETS
from reportgen.errors import InputError

if TYPE_CHECKING:
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
    limit: Literal["at_least", "at_most"] = "at_least"  # attained ≥ / ≤ required

    @property
    def margin(self) -> float | None:
        """The spare on the safe side, in `unit`: attained − required for an "at least"
        criterion, required − attained for an "at most" one; positive when passed."""
        if self.required is None or self.attained is None:
            return None
        spare = self.attained - self.required
        return -spare if self.limit == "at_most" else spare


def at_least(cid: str, title: str, ref: str, required: float, attained: float | None,
             unit: str, set_id: str) -> Check:
    """A check passed when `attained` exists and is at least `required`."""
    passed = attained is not None and attained >= required
    return Check(cid, title, ref, required, attained, unit, passed, set_id)


@dataclass(frozen=True)
class State:
    """What the criteria read.

    curve: the GZ curve towards the side of the list (deg -> m); credited_to_deg: the end of
    the curve the criteria may credit (θf when GZ beyond flooding is excluded, else the end of
    the table); gz_max_deg: the angle of the greatest GZ on that credited range; gm_fluid_m:
    initial GM corrected for free surface; flooding_deg, deck_edge_deg: the angles at the
    condition's state; weather: the 2.3 quantities, None when no selected set needs them;
    grain: the Grain Code A 7 quantities, None without grain on board;
    kg_fluid_m: KG corrected; displacement_t: the condition's displacement; booklet: the
    booklet's limiting curve, when a selected set needs it; passengers: likewise the crowding
    and turning heels of Part A 3.1.
    """

    curve: GZCurve
    credited_to_deg: float
    gz_max_deg: float
    gm_fluid_m: float
    flooding_deg: float
    deck_edge_deg: float
    weather: Any = None  # reportgen.criteria.weather.Weather, when the set needs it
    grain: Any = None  # reportgen.grain.GrainStability, with grain on board
    kg_fluid_m: float | None = None  # m
    displacement_t: float | None = None  # t
    booklet: Any = None  # reportgen.criteria.booklet.Curve, when a set needs it
    passengers: Any = None  # criteria.passenger.PassengerHeel, when computed (Part A 3.1)


def needs(set_ids: list[str]) -> frozenset[str]:
    """The intermediate quantities the listed sets read (reportgen.criteria.sets)."""
    out: frozenset[str] = frozenset()
    for sid in set_ids:
        out |= SETS[sid].needs
    return out


def run(set_ids: list[str], state: State) -> list[Check]:
    """The checks of the listed sets, in the listed order."""
    out: list[Check] = []
    for sid in set_ids:
        info = SETS.get(sid)
        if info is None:
            raise InputError(f"criteria: unknown criteria set {sid!r}; known: {', '.join(SETS)}")
        out.extend(_module(info.module).checks(state))
    return out


@cache
def _module(name: str) -> Any:
    """The criteria module of a set, imported once (run is called at every KG of a search)."""
    return import_module(name)
