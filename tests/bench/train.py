"""Benchmark: cold training on the standard library, then a warm re-run with 1% of files changed.

Prints files, lines, tokens, corpus seconds, training seconds and total seconds; writes
bench-results/train.json. Targets (2-core machine): cold <= 60 s, warm <= 20 s, corpus
stage <= 2x gensim's own training time.
"""

from __future__ import annotations

import random
import sys
import tempfile
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))

from common import copy_stdlib, save  # noqa: E402

from cognomen.model.pipeline import PromotionPolicy, train_repository  # noqa: E402
from cognomen.model.training import TrainSettings  # noqa: E402


def run(repo: Path, store: Path) -> dict:
    started = time.monotonic()
    result = train_repository(repo, store, TrainSettings(), PromotionPolicy(force=True))
    wall = time.monotonic() - started
    corpus = result.corpus
    return {"files": len(corpus.files), "lines": corpus.lines, "tokens": corpus.tokens,
            "lexed": corpus.lexed, "reused": corpus.cached, **{f"{k}_seconds": v for k, v in result.seconds.items()},
            "wall_seconds": round(wall, 2)}


def main() -> int:
    with tempfile.TemporaryDirectory(prefix="cognomen-bench-") as scratch:
        repo = copy_stdlib(Path(scratch) / "stdlib")
        store = Path(scratch) / "store"
        cold = run(repo, store)
        files = sorted(repo.rglob("*.py"))
        touched = random.Random(1).sample(files, max(1, len(files) // 100))
        for path in touched:
            path.write_text(path.read_text(encoding="utf-8") + "\n\ndef touched_by_bench(value):\n    return value\n",
                            encoding="utf-8")
        warm = run(repo, store)
    for label, figures in (("cold", cold), ("warm, 1% of files changed", warm)):
        print(f"{label}: {figures['files']} files, {figures['lines']:,} lines, {figures['tokens']:,} tokens; "
              f"lexed {figures['lexed']}, reused {figures['reused']}")
        print(f"  corpus {figures['corpus_seconds']} s, embeddings {figures['embeddings_seconds']} s, "
              f"names and calibration {figures['names_and_calibration_seconds']} s, "
              f"total {figures['total_seconds']} s (wall {figures['wall_seconds']} s)")
    ratio = cold["corpus_seconds"] / max(cold["embeddings_seconds"], 1e-9)
    print(f"corpus stage / gensim training: {ratio:.2f}x (target <= 2x)")
    print(f"targets: cold {cold['total_seconds']} s (<= 60), warm {warm['total_seconds']} s (<= 20)")
    save("train", {"cold": cold, "warm": warm, "corpus_to_gensim_ratio": round(ratio, 2)})
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
