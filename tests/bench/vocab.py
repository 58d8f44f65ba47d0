"""Benchmark: the vocabulary report on the standard library, beside a figure the field quotes.

Prints the coverage table and Heaps' law fits and writes bench-results/vocab.json. The
comparison figures are common practice with no source at hand: for a large JavaScript
corpus, a 1,000-name vocabulary covered about 63% of name occurrences and a 60,000-name one
about 91%.
"""

from __future__ import annotations

import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))

from common import STDLIB, save  # noqa: E402

from cognomen.model.corpus import Settings, discover  # noqa: E402
from cognomen.model.pipeline import STDLIB_EXCLUDES  # noqa: E402
from cognomen.model.vocab_report import VARIANT_LABELS, build_report  # noqa: E402

QUOTED = {1_000: 0.63, 60_000: 0.91}


def main() -> int:
    selection = discover(STDLIB, Settings(exclude=STDLIB_EXCLUDES))
    began = time.monotonic()
    report = build_report(selection.root, selection.files, model_sizes=(50_000,))
    seconds = time.monotonic() - began
    print(f"standard library: {report.files} files in {seconds:.1f} s")
    print(f"{'N':>7} {'unique':>8} {'occurrences':>12} {'held-out OOV':>13} {'quoted for JavaScript':>22}")
    for row in report.coverage:
        quoted = f"{QUOTED[row['n']]:.0%}" if row["n"] in QUOTED else "-"
        print(f"{row['n']:>7,} {row['unique_share']:>8.1%} {row['occurrence_share']:>12.1%} "
              f"{row['heldout_oov_rate']:>13.1%} {quoted:>22}")
    for variant, fit in report.heaps.items():
        print(f"Heaps' law, {VARIANT_LABELS[variant]}: K {fit.k:.2f}, beta {fit.beta:.3f}, r2 {fit.r2:.4f}")
    save("vocab", dict(report.to_json(), seconds=round(seconds, 1), quoted_javascript=QUOTED))
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
