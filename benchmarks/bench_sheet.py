"""Timings of the calculation sheet (prints seconds; no assertions).

- imports: a fresh interpreter importing weasyprint, matplotlib, numpy and scipy
  (median of 3 runs), the yardstick of the target;
- one sheet: evaluate + render of one demo condition, first (cold: fonts, lazy imports)
  and second (warm) in the same process;
- all demo sheets: every conditions/*.yaml, evaluated and rendered in one process.

Target (the sheet issue): one warm sheet < 2.5 × the import time.

Run: .venv/bin/python benchmarks/bench_sheet.py
"""

from __future__ import annotations

import sys
import time
from pathlib import Path

from timing import import_seconds

ROOT = Path(__file__).resolve().parents[1]
CONDITIONS = sorted((ROOT / "conditions").glob("*.yaml"))
IMPORTS = "weasyprint, matplotlib, numpy, scipy"
TARGET_FACTOR = 2.5


def sheet_seconds(condition: Path) -> float:
    """Wall time to evaluate one condition and render its sheet, s."""
    from reportgen.inputs import load_case
    from reportgen.pipeline import evaluate
    from reportgen.report.render import render_sheet

    start = time.perf_counter()
    case = load_case(condition)
    render_sheet(case, evaluate(case))
    return time.perf_counter() - start


def main() -> int:
    if not CONDITIONS:
        print("no demo conditions in conditions/*.yaml")
        return 1
    imports = import_seconds(IMPORTS)
    print(f"import weasyprint, matplotlib, numpy, scipy: {imports:.2f} s (median of 3)")
    first = CONDITIONS[0]
    cold = sheet_seconds(first)
    warm = sheet_seconds(first)
    print(f"one sheet ({first.name}): cold {cold:.2f} s, warm {warm:.2f} s")
    start = time.perf_counter()
    for condition in CONDITIONS:
        sheet_seconds(condition)
    total = time.perf_counter() - start
    print(f"all {len(CONDITIONS)} demo sheets: {total:.2f} s "
          f"({total / len(CONDITIONS):.2f} s per sheet)")
    ratio = warm / imports
    verdict = "meets" if ratio < TARGET_FACTOR else "misses"
    print(f"one warm sheet / import time = {ratio:.2f} ({verdict} the target < {TARGET_FACTOR})")
    return 0


if __name__ == "__main__":
    sys.exit(main())
