"""Timings of the evaluation (not a test): one condition after import, reading the two files,
1000 conditions in one process, and `reportgen check` as a whole process against the import
time of the libraries it needs. Targets (issue "house in order"): 0.5 ms per condition,
10 ms to read the files, 0.5 s for 1000 conditions, the process within 1.2 × the import time.

What is kept between evaluations (so that "1000 conditions" measures 1000 evaluations, not a
cache): only each vessel's arrays and prepared hull (VesselData, made once per vessel object,
reportgen.vesseldata: with its tables' columns as lists, their ranges, and each tank's free
surface when empty), the criteria modules' lookup, the heel grid of the GZ searches with its
sines and cosines (one per largest heel of the cross curves, reportgen.stability._grid), and
each case's SHA-256 of its input files (a property of the bytes read, computed once per case).
Everything of a condition (loading, floating, the heel scan on the hull, the angles, every KG
of the margin search, the results) is computed afresh at each call.

The whole process is timed against a process that only imports the libraries `check` needs,
and (the line after it) against the same process ending as reportgen's command line ends:
the command line freezes every object at exit (gc.freeze, reportgen.cli), which spares the
interpreter's final full garbage collections over the libraries' objects, some 0.1 s that
the plain yardstick still spends. The first ratio is a user's wait against the libraries'
import; the second counts reportgen's own work alone (reading, validating, evaluating,
printing, and importing and building its modules and models). The target is judged on the
second (the conservative reading: the time the freeze saves is not counted as reportgen's).

Usage: python benchmarks/bench_check.py [CONDITION.yaml]   (default: conditions/*.yaml)
"""

from __future__ import annotations

import subprocess
import sys
import time
from collections.abc import Callable
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent


def main(argv: list[str]) -> int:
    from reportgen.inputs import load_case
    from reportgen.pipeline import evaluate
    from reportgen.vesseldata import vessel_data

    paths = [Path(a) for a in argv] or sorted((ROOT / "conditions").glob("*.yaml"))
    if not paths:
        print("no condition files found", file=sys.stderr)
        return 2
    cases = [load_case(p) for p in paths]
    evaluate(cases[0])  # warm up (first calls into scipy and shapely)

    # One condition, parsed case given: evaluation only, best of 20.
    best = min(_timed(lambda: evaluate(cases[0])) for _ in range(20))
    print(f"one condition ({paths[0].name}): {best * 1e3:.2f} ms (evaluate, best of 20)")
    best_load = min(_timed(lambda: load_case(paths[0])) for _ in range(20))
    print(f"reading the files: {best_load * 1e3:.2f} ms (load_case, best of 20; nothing "
          f"cached between reads)")

    # 1000 conditions in one process, cycling through the cases.
    # (fewer when one takes over 20 ms, so that the benchmark ends; the figure is then
    # extrapolated to 1000 and says so)
    n = 1000 if best < 20e-3 else 20
    scale = 1000 / n
    t0 = time.perf_counter()
    for i in range(n):
        evaluate(cases[i % len(cases)])
    total = (time.perf_counter() - t0) * scale
    said = "" if n == 1000 else f" (extrapolated from {n})"
    print(f"1000 conditions: {total:.2f} s ({total:.2f} ms each){said}")

    # The same with the vessel's tables made once (pipeline.evaluate(case, tables)).
    tables = {id(c.vessel): vessel_data(c.vessel) for c in cases}
    t0 = time.perf_counter()
    for i in range(n):
        c = cases[i % len(cases)]
        evaluate(c, tables[id(c.vessel)])
    shared = (time.perf_counter() - t0) * scale
    print(f"1000 conditions, tables shared: {shared:.2f} s ({shared:.2f} ms each){said}")
    _per_condition(cases, tables)
    process, imports, frozen = _process_times(paths[0])
    print(f"reportgen check as a process: {process * 1e3:.0f} ms; importing its libraries: "
          f"{imports * 1e3:.0f} ms (ratio {process / imports:.2f}; best of 7 each; bytecode "
          f"compiled first)")
    print(f"  the same with the libraries' process ending as the command line does (gc.freeze "
          f"at exit): {frozen * 1e3:.0f} ms (ratio {process / frozen:.2f}: reportgen's own work "
          f"alone)")
    missed = [what for what, bad in (
        ("0.5 ms per condition", best > 0.5e-3), ("10 ms to read", best_load > 10e-3),
        ("0.5 s per 1000", shared > 0.5), ("1.2 × import time (like for like)", process > 1.2 * frozen))
        if bad]
    print("targets met" if not missed else "TARGETS MISSED: " + ", ".join(missed))
    return 0 if not missed else 1


# The libraries `check` needs, as far as it uses them: pydantic and rich load their parts
# lazily, so a bare `import pydantic, rich` would leave out BaseModel, the field constraints
# and validators every file model is written with (they load annotated_types and
# pydantic.types), and the console/table machinery that any use of them loads.
IMPORTS = ("import numpy, scipy.interpolate, scipy.optimize, shapely, yaml, click; "
           "from pydantic import AfterValidator, BaseModel, BeforeValidator, ConfigDict, "
           "Field, model_serializer, model_validator; import rich.console, rich.table")


def _process_times(path: Path) -> tuple[float, float, float]:
    """Best of 7: `reportgen check PATH` as a new process, a new process that only imports
    the libraries the check needs, and the same ending as reportgen's command line does.

    The command line (reportgen.cli) freezes every object at exit (gc.freeze), which spares
    the interpreter's final full collections over the libraries' objects, ~0.1 s: the
    second yardstick does the same, so that its ratio counts reportgen's own work only.

    reportgen's modules are compiled to bytecode first, as an installed package has them
    (pip compiles a wheel's modules; the libraries of the yardstick are compiled so too):
    without it, a checkout run with PYTHONDONTWRITEBYTECODE set compiles every module of
    reportgen from source in every process, which no user's installation does."""
    import compileall

    compileall.compile_dir(ROOT / "reportgen", quiet=1)
    check = [sys.executable, "-m", "reportgen", "check", str(path)]
    imports = [sys.executable, "-c", IMPORTS]
    frozen = [sys.executable, "-c", IMPORTS + "; import atexit, gc; atexit.register(gc.freeze)"]
    runs = [(_timed(lambda: subprocess.run(check, capture_output=True, check=False)),
             _timed(lambda: subprocess.run(imports, capture_output=True, check=True)),
             _timed(lambda: subprocess.run(frozen, capture_output=True, check=True)))
            for _ in range(7)]  # taken in turn, so that a busy moment weighs on all
    return tuple(min(r[i] for r in runs) for i in range(3))


def _per_condition(cases: list, tables: dict) -> None:
    """Each demo condition's evaluation (best of 3) and its stages apart: the upright stage
    (loading, floating, angles; a condition whose flooding angle is found on the hull offsets,
    no booklet table at its trim, floats the hull at heels up to the angles), the stage at
    its KG, its KG margin search (with the number of KGs it evaluates beyond the condition's
    own: a count, which a busy machine does not blur) and the typed results. Nothing is kept
    between calls but the vessel's tables and prepared hull (VesselData, one per vessel)."""
    from reportgen import assemble, limits, stages

    for c in cases:
        vd = tables[id(c.vessel)]
        up = stages.upright(c, vd)
        fsc, kg = stages.kg_fluid_of(up)
        k = stages.at_kg(up, kg)
        lim = limits.condition_limits(up, k)
        whole = min(_timed(lambda c=c, vd=vd: evaluate_with(c, vd)) for _ in range(3))
        parts = [min(_timed(fn) for _ in range(3)) * 1e3 for fn in (
            lambda c=c, vd=vd: stages.upright(c, vd),
            lambda up=up, kg=kg: stages.at_kg(up, kg),
            lambda up=up, k=k: limits.condition_limits(up, k),
            lambda up=up, k=k, fsc=fsc, lim=lim: assemble.results(up, k, fsc, lim))]
        print(f"  {c.condition_name}: {whole * 1e3:.1f} ms, of which the KG margin "
              f"{parts[2]:.1f} ms at {_margin_kgs(up, k)} KGs (upright {parts[0]:.1f}, at KG "
              f"{parts[1]:.1f}, results {parts[3]:.1f})")


def _margin_kgs(up, k) -> int:
    """How many KGs the margin search evaluates besides the condition's own (the search of
    limits.limit_of, counted)."""
    from reportgen import limits, stages

    seen: list[float] = []

    def checks(kg: float):
        seen.append(kg)
        return stages.checked(up, kg).checks

    limits.largest_kg(checks, k.kg_fluid_m, limits.ceiling(up), {k.kg_fluid_m: k.checks})
    return len(seen)


def evaluate_with(case, vd) -> None:
    from reportgen.pipeline import evaluate

    evaluate(case, vd)


def _timed(fn: Callable[[], object]) -> float:
    t0 = time.perf_counter()
    fn()
    return time.perf_counter() - t0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
