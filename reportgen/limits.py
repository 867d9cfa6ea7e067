"""Limits in the officer's terms: the largest KG at which every criterion still passes.

Units: KG, GM, draughts and trims in m, displacement and mass in t, density in t/m³.

A limit is a search on KG corrected for free surface over `stages.checked`, re-using the condition's
`stages.upright` (everything that does not depend on KG is made once). The IS Code 2008 does not
say how a limiting KG is to be found, nor what to do where a criterion passes again above a KG
at which it failed; this module takes the conservative reading (stated on every document):

- the search starts at the condition's own KG (KG 0 for the vessel's curve) and walks upwards in
  steps of at most ``SCAN_STEP_MAX_M``; the limit is the first failure met, so a criterion that
  passes again higher up never lifts the limit;
- the step between the last passing and the first failing KG is then narrowed (scipy's brentq
  on the smallest relative criterion margin, then bisection) until it is at most
  ``TOLERANCE_M``; ``kg_max`` is the passing end, so every criterion passes at ``kg_max``;
- the governing criterion is the one that fails at the failing end (the one with the smallest
  relative margin where several fail there).

`reportgen.limitcurve` makes the vessel's limiting KG curve from these; `reportgen.room` the mass
that can still be added at a point.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass

import numpy as np
from scipy.optimize import brentq

from reportgen import stages
from reportgen.criteria.core import Check

SCAN_STEP_FIRST_M = 0.05  # first step of the walk on KG, m
SCAN_STEP_MAX_M = 0.25  # largest step of the walk on KG (a failure narrower than this and
# followed by passing KGs could be stepped over: stated on the documents)
TOLERANCE_M = 0.001  # SPEC.md "Limits": found to within 1 mm
CEILING_MARGIN_M = 0.5  # the walk stops this far above the KG at which GZ ≤ 0 at every heel

REPORTED_DECIMALS = 6  # the results documents round to 6 decimals (reportgen.results)
SAFE_SIDE_M = 2e-6  # kg_max as reported is this much below the passing end, then rounded down,
# so that a KG re-made from the printed numbers (KG + margin) still passes

PRINTED_DECIMALS = 3  # texts and documents print KG, GM and the margin to 1 mm
PRINT_SLACK = 1e-6  # of the last printed digit: a stored 5.524000 is not printed as 5.523


def printed_down(value_m: float | None, decimals: int = PRINTED_DECIMALS) -> float | None:
    """A KG max or KG margin (m) as printed: rounded down, so that the KG it names passes (the
    conservative reading; to the nearest, 5.790822 m read 5.791 m, where a criterion fails)."""
    if value_m is None:
        return None
    scale = 10.0 ** decimals
    return math.floor(value_m * scale + PRINT_SLACK) / scale


def printed_up(value_m: float | None, decimals: int = PRINTED_DECIMALS) -> float | None:
    """A minimum GM (m) as printed: rounded up (``printed_down``'s reason)."""
    if value_m is None:
        return None
    scale = 10.0 ** decimals
    return math.ceil(value_m * scale - PRINT_SLACK) / scale


Evaluate = Callable[[float], Sequence[Check]]


@dataclass(frozen=True)
class KGLimit:
    """The largest KG corrected (m) at which every criterion passes, and the criterion that
    fails just above it. ``kg_max_m`` is None where no KG ≥ 0 passes (``governing`` then names a
    criterion that fails at KG 0); ``governing`` is None where nothing fails below the ceiling.
    ``checked_above_m`` is the failing end of the final step (kg_max < it ≤ kg_max + 1 mm)."""

    kg_max_m: float | None
    governing: str | None
    checked_above_m: float | None = None


def reported(kg_m: float | None) -> float | None:
    """A passing KG (m) as documents print it: moved SAFE_SIDE_M down, rounded down to
    REPORTED_DECIMALS, so that it stays on the passing side after rounding."""
    if kg_m is None:
        return None
    scale = 10.0 ** REPORTED_DECIMALS
    return math.floor((kg_m - SAFE_SIDE_M) * scale) / scale


def passes(checks: Sequence[Check]) -> bool:
    return all(c.passed for c in checks)


def relative_margin(c: Check) -> float:
    """The criterion's margin as a fraction of its required value (dimensionless), negative
    exactly when it fails; −1 when the quantity does not exist (the criterion fails)."""
    if c.margin is None:
        return 0.0 if c.passed else -1.0
    scale = abs(c.required) if c.required else 1.0
    value = c.margin / scale
    if c.passed:
        return max(value, 0.0)
    return min(value, -1e-12)


def score(checks: Sequence[Check]) -> float:
    """The smallest relative margin: ≥ 0 exactly when every criterion passes."""
    return min((relative_margin(c) for c in checks), default=0.0)


def governing(checks: Sequence[Check]) -> str | None:
    """The failing criterion with the smallest relative margin (None when all pass)."""
    failing = [c for c in checks if not c.passed]
    if not failing:
        return None
    return min(failing, key=relative_margin).id


def largest_kg(evaluate: Evaluate, start_m: float, ceiling_m: float,
               known: dict[float, Sequence[Check]] | None = None) -> KGLimit:
    """The largest KG (m) at which every criterion passes, found from ``start_m`` as the module
    docstring says; ``evaluate(kg)`` gives the checks at KG corrected ``kg`` (m); ``known``:
    checks already evaluated, by KG."""
    seen: dict[float, Sequence[Check]] = dict(known or {})

    def at(kg: float) -> Sequence[Check]:
        if kg not in seen:
            seen[kg] = evaluate(kg)
        return seen[kg]

    start_m = max(0.0, start_m)
    step = SCAN_STEP_FIRST_M
    if passes(at(start_m)):
        lo, hi = start_m, None
        while hi is None:
            if lo >= ceiling_m:
                return KGLimit(lo, None)
            nxt = min(lo + step, ceiling_m)
            if passes(at(nxt)):
                lo = nxt
            else:
                hi = nxt
            step = min(2.0 * step, SCAN_STEP_MAX_M)
    else:
        hi, lo = start_m, None
        while lo is None:
            if hi <= 0.0:
                return KGLimit(None, governing(at(0.0)))
            nxt = max(hi - step, 0.0)
            if passes(at(nxt)):
                lo = nxt
            else:
                hi = nxt
            step = min(2.0 * step, SCAN_STEP_MAX_M)
    bracket = [lo, hi]

    def f(kg: float) -> float:
        checks = at(kg)
        if bracket[0] < kg < bracket[1]:
            bracket[0 if passes(checks) else 1] = kg
        return score(checks)

    if hi - lo > TOLERANCE_M:
        brentq(f, lo, hi, xtol=TOLERANCE_M / 4.0, maxiter=60)
    while bracket[1] - bracket[0] > TOLERANCE_M:
        f(0.5 * (bracket[0] + bracket[1]))
    return KGLimit(bracket[0], governing(at(bracket[1])), bracket[1])


def capsize_kg(up: stages.Upright) -> float:
    """The KG (m) above which GZ ≤ 0 at every heel of the tables: max(KMt, max KN(θ)/sin θ)."""
    heel = np.arange(1.0, up.heel_max_deg + 0.5, 1.0)
    heel = heel[heel <= up.heel_max_deg]
    kn = up.kn(heel)
    ratio = float(np.max(kn / np.sin(np.radians(heel)))) if heel.size else 0.0
    return max(up.floating.kmt, ratio)


def ceiling(up: stages.Upright) -> float:
    """Where the upward walk gives up (m): above it nothing can pass."""
    return capsize_kg(up) + CEILING_MARGIN_M


def limit_of(up: stages.Upright, start_m: float,
             known: dict[float, Sequence[Check]] | None = None) -> KGLimit:
    """The KG limit of an upright stage, walking from ``start_m`` (m)."""
    return largest_kg(lambda kg: stages.checked(up, kg).checks, start_m, ceiling(up), known)


def condition_limits(up: stages.Upright, k: stages.AtKG) -> dict:
    """The ``limits`` section of a condition's results (SPEC.md "Limits") from its upright stage
    and its stage at its own KG: kg_max, kg_margin = kg_max − KG corrected, gm_min = KMt −
    kg_max (m), the governing criterion with its title and reference."""
    kg = k.kg_fluid_m
    lim = limit_of(up, kg, {kg: k.checks})
    kg_max = reported(lim.kg_max_m)
    named = {c.id: c for c in k.checks}.get(lim.governing)
    return {"kg_max": kg_max,
            "kg_margin": None if kg_max is None else reported(kg_max - kg + SAFE_SIDE_M),
            "gm_min": None if kg_max is None else up.floating.kmt - kg_max,
            "governing": lim.governing,
            "governing_title": named.title if named else None,
            "governing_reference": named.reference if named else None,
            "tolerance": TOLERANCE_M}
