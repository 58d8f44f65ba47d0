"""Print the ablation table from bench-results/quality.json (written by quality.py --ablate) as Markdown."""

from __future__ import annotations

import json
import sys
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))

from common import RESULTS  # noqa: E402

from cognomen.model.measures import label  # noqa: E402

COLUMNS = ("recovery_at_1", "recovery_at_5", "detection_auc", "recall_at_1_per_kloc", "recall_at_threshold",
           "false_alarms_per_kloc")


def cell(value) -> str:
    return "–" if value is None or value != value else f"{value:.3f}"


def main() -> int:
    results = json.loads((RESULTS / "quality.json").read_text())
    print("| corpus | variant | " + " | ".join(label(c) for c in COLUMNS) +
          f" | {label('recovery_at_5')} ÷ context counts | {label('true_name_reachable')} |")
    print("|---|---|---|---|---|---|---|---|---|---|")
    for corpus, variants in results.items():
        if not isinstance(variants, dict) or "full model" not in variants:
            continue
        short = corpus.split(" (")[0]
        for variant, result in variants.items():
            model, counts = result["scorers"]["model"], result["scorers"]["context counts"]
            ratio = model["recovery_at_5"] / counts["recovery_at_5"] if counts["recovery_at_5"] else None
            print(f"| {short} | {variant} | {cell(model['recovery_at_1'])} | {cell(model['recovery_at_5'])} | "
                  f"{cell(model['detection_auc'])} | {cell(model['recall_at_1_per_kloc'])} | "
                  f"{cell(model.get('recall_at_threshold'))} | {cell(model.get('false_alarms_per_kloc'))} | "
                  f"{cell(ratio)} | {cell(model.get('true_name_reachable'))} |")
        full = variants["full model"]["scorers"]
        print(f"| {short} | *baseline: context counts* | {cell(full['context counts']['recovery_at_1'])} | "
              f"{cell(full['context counts']['recovery_at_5'])} | {cell(full['context counts']['detection_auc'])} | "
              f"{cell(full['context counts']['recall_at_1_per_kloc'])} | – | – | – | – |")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
