"""What the benchmarks share: the time a fresh interpreter takes to import libraries (the
yardstick of the whole-process targets)."""

from __future__ import annotations

import statistics
import subprocess
import sys


def import_seconds(modules: str, runs: int = 3) -> float:
    """Median wall time (s) of `import <modules>` in a fresh interpreter, timed inside it."""
    code = f"import time; t = time.perf_counter(); import {modules}; print(time.perf_counter() - t)"
    times = []
    for _ in range(runs):
        out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                             check=True)
        times.append(float(out.stdout.strip().splitlines()[-1]))
    return statistics.median(times)
