"""Timings of the calculation package (prints seconds; no assertions).

- imports: a fresh interpreter importing reportgen's command line with weasyprint,
  matplotlib, numpy and scipy (median of 3 runs), the yardstick of the target;
- the whole process: `reportgen package` of every demo condition of the demo cargo ship, in a
  fresh interpreter (reading, evaluating, the limiting KG curve, one layout, writing the
  PDF/A-3 file);
- where the time goes: the same package made again in this process, step by step (after a
  warm-up render of one condition, so that fonts and lazy imports are loaded; nothing else is
  cached between steps): reading and evaluating, the limiting KG curve, the figures, the HTML
  text, WeasyPrint's layout (with the check that every figure fits its column), and its
  painting and writing of the PDF.

Target (the package issue): the whole process within the import time + 0.5 s per condition.

Run: .venv/bin/python benchmarks/bench_package.py
"""

from __future__ import annotations

import resource
import subprocess
import sys
import tempfile
import time
from pathlib import Path

from timing import import_seconds

ROOT = Path(__file__).resolve().parents[1]
SHIP = "vessels/linnet-demo.yaml"  # the demo cargo ship; a package holds one vessel's conditions
CONDITIONS = sorted(p for p in (ROOT / "conditions").glob("*.yaml")
                    if f"\nvessel: {SHIP}\n" in p.read_text(encoding="utf-8"))
IMPORTS = "reportgen.cli, weasyprint, matplotlib, numpy, scipy"
PER_CONDITION_S = 0.5


def package_seconds(conditions: list[Path], out: Path) -> tuple[float, float]:
    """Wall time and CPU time (user + system) of the whole `reportgen package` process, s.
    The CPU time says how much of the wall time was the process's own on a shared machine."""
    before = resource.getrusage(resource.RUSAGE_CHILDREN)
    start = time.perf_counter()
    done = subprocess.run([sys.executable, "-m", "reportgen", "package",
                           *map(str, conditions), "-o", str(out), "--force"],
                          capture_output=True, text=True, check=False)
    seconds = time.perf_counter() - start
    after = resource.getrusage(resource.RUSAGE_CHILDREN)
    if done.returncode not in (0, 1):
        raise SystemExit(f"reportgen package failed: {done.stderr}")
    return seconds, (after.ru_utime - before.ru_utime) + (after.ru_stime - before.ru_stime)


def phases(conditions: list[Path]) -> list[tuple[str, float]]:
    """Wall time of each step of making the package in this process, s."""
    from reportgen.inputs import load_case
    from reportgen.pipeline import evaluate
    from reportgen.report import package, render
    from reportgen.report.engine import collector_paused, lay_out
    from reportgen.report.fonts import font_config

    warm = load_case(conditions[0])
    render.render_sheet(warm, evaluate(warm))
    steps: list[tuple[str, float]] = []
    clock = time.perf_counter()

    def lap(name: str) -> None:
        nonlocal clock
        now = time.perf_counter()
        steps.append((name, now - clock))
        clock = now

    with collector_paused():
        pkg = package.make_package([load_case(c) for c in conditions])
        lap("read, evaluate, limiting KG curve")
        contexts = [render.condition_context(m.case, m.results) for m in pkg.members]
        lap(f"figures ({sum(1 for c in contexts for k in c if k.endswith('_figure') and c[k])}"
            f" SVG, matplotlib)")
        text = package.package_html(pkg, contexts, package.limits_page(pkg))
        lap("limits page figure and HTML text")
        document = lay_out(text, "the demo conditions", [package._page_css(len(pkg.members))],
                           pdf_variant=render.PDF_VARIANT, font_config=font_config())
        lap(f"WeasyPrint layout and the check that every figure fits its column "
            f"({len(document.pages)} pages)")
        document.write_pdf(pdf_variant=render.PDF_VARIANT)
        lap("WeasyPrint painting and PDF writing")
    return steps


def main() -> int:
    if not CONDITIONS:
        print("no demo conditions in conditions/*.yaml")
        return 1
    imports = import_seconds(IMPORTS)
    print(f"import reportgen.cli, weasyprint, matplotlib, numpy, scipy: {imports:.2f} s "
          f"(median of 3)")
    with tempfile.TemporaryDirectory() as folder:
        total, cpu = package_seconds(CONDITIONS, Path(folder) / "package.pdf")
    n = len(CONDITIONS)
    target = imports + PER_CONDITION_S * n
    print(f"package of the {n} demo conditions, whole process: {total:.2f} s, CPU {cpu:.2f} s "
          f"({(total - imports) / n:.2f} s per condition beyond the imports)")
    verdict = "meets" if total <= target else "misses"
    print(f"target: import time + {PER_CONDITION_S} s per condition = {target:.2f} s "
          f"({verdict} it)")
    print("where the time goes (the same package in this process, step by step):")
    for name, seconds in phases(CONDITIONS):
        print(f"  {name}: {seconds:.2f} s")
    return 0


if __name__ == "__main__":
    sys.exit(main())
