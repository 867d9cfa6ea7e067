"""Limits in the officer's terms: the largest KG at which every criterion still passes.

Units: KG, GM, draughts and trims in m, displacement and mass in t, density in t/m³.

A limit is a search on KG corrected for free surface over `stages.at_kg`, re-using the condition's
`stages.upright` (everything that does not depend on KG is made once, the KN spline's
derivatives and antiderivative too: ``ReusedKN``). The IS Code 2008 does not
say how a limiting KG is to be found, nor what to do where a criterion passes again above a KG
at which it failed; this module takes the conservative reading (stated on every document):

- the search starts at the condition's own KG and walks in steps of at most
  ``SCAN_STEP_MAX_M``, upwards while every criterion passes (downwards while one fails); the
  limit is the first failure met, so a criterion that passes again higher up never lifts the
  limit. The vessel's curve stands on the steps of the walk from KG 0 (``largest_kg_near``): the
  whole walk at its first displacement, and at each next one from the step where the limits
  already found point (reportgen.limitcurve.hint);
- the step between the last passing and the first failing KG is then narrowed (scipy's brentq
  on the smallest relative criterion margin, then bisection) until it is at most
  ``TOLERANCE_M``; ``kg_max`` is the passing end, so every criterion passes at ``kg_max``;
- the governing criterion is the one that fails at the failing end (the one with the smallest
  relative margin where several fail there).

`reportgen.limitcurve` makes the vessel's limiting KG curve from these; `reportgen.room` the mass
that can still be added at a point.
"""

from __future__ import annotations

import bisect
import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass, replace

import numpy as np
from scipy.interpolate import PPoly
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
    return narrowed(at, lo, hi)


def narrowed(at: Evaluate, lo: float, hi: float) -> KGLimit:
    """The step [lo, hi] (m; every criterion passes at lo, one fails at hi) narrowed to at most
    TOLERANCE_M: brentq on the smallest relative margin, then bisection; the passing end."""
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


def steps_from_zero(ceiling_m: float) -> list[float]:
    """The KGs (m) the walk from KG 0 stands on: 0, then steps doubling from SCAN_STEP_FIRST_M
    to SCAN_STEP_MAX_M, the last one at the ceiling (the same sums as ``largest_kg``'s walk,
    so the same floating-point values)."""
    kgs, step = [0.0], SCAN_STEP_FIRST_M
    while kgs[-1] < ceiling_m:
        kgs.append(min(kgs[-1] + step, ceiling_m))
        step = min(2.0 * step, SCAN_STEP_MAX_M)
    return kgs


def largest_kg_near(evaluate: Evaluate, hint_m: float, ceiling_m: float) -> KGLimit:
    """The largest passing KG (m) on the steps of the walk from KG 0 (``steps_from_zero``),
    searched from the step at or below ``hint_m`` (a neighbouring displacement's limit): up
    while the steps pass, down while they fail, to a passing step with a failing one above it,
    then ``narrowed``. Where the steps from 0 change from passing to failing only once, this is
    ``largest_kg(evaluate, 0, ceiling_m)`` exactly, with fewer evaluations; the steps below the
    start are not evaluated (stated on the limits document)."""
    seen: dict[float, Sequence[Check]] = {}

    def at(kg: float) -> Sequence[Check]:
        if kg not in seen:
            seen[kg] = evaluate(kg)
        return seen[kg]

    kgs = steps_from_zero(ceiling_m)
    k = min(max(bisect.bisect_right(kgs, hint_m) - 1, 0), len(kgs) - 1)
    if passes(at(kgs[k])):
        while k + 1 < len(kgs) and passes(at(kgs[k + 1])):
            k += 1
        if k + 1 == len(kgs):
            return KGLimit(kgs[k], None)
        return narrowed(at, kgs[k], kgs[k + 1])
    while k > 0 and not passes(at(kgs[k - 1])):
        k -= 1
    if k == 0:
        return KGLimit(None, governing(at(0.0)))
    return narrowed(at, kgs[k - 1], kgs[k])


class ReusedKN(PPoly):
    """KN(θ°) whose derivatives and antiderivative are made once: they do not depend on KG, and
    a search evaluates GZ = KN − KG·sin θ (reportgen.stability.GZCurve) at many KGs."""

    def derivative(self, nu: int = 1) -> PPoly:
        return self._made("derivative", nu)

    def antiderivative(self, nu: int = 1) -> PPoly:
        return self._made("antiderivative", nu)

    def _made(self, how: str, nu: int) -> PPoly:
        made = self.__dict__.setdefault("_reused", {})
        if (how, nu) not in made:
            made[how, nu] = getattr(super(), how)(nu)
        return made[how, nu]


def reusing(up: stages.Upright) -> stages.Upright:
    """The upright stage with its KN spline as a ``ReusedKN`` (the same numbers)."""
    kn = up.kn
    return replace(up, kn=ReusedKN.construct_fast(kn.c, kn.x, kn.extrapolate, kn.axis))


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
    up = reusing(up)
    return largest_kg(lambda kg: stages.at_kg(up, kg).checks, start_m, ceiling(up), known)


def limit_near(up: stages.Upright, hint_m: float) -> KGLimit:
    """The KG limit of an upright stage on the steps from KG 0, searched from ``hint_m`` (m)
    (``largest_kg_near``): the vessel's curve, from one displacement to the next."""
    up = reusing(up)
    return largest_kg_near(lambda kg: stages.at_kg(up, kg).checks, hint_m, ceiling(up))


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
