"""Benchmark: `cognomen review` of a change touching 50 files, model load included.

Also times the weekly retrain of the standard library with 1% of files changed, promotion check
included. Writes bench-results/review.json. Targets: review <= 5 s; retrain <= 60 s.
"""

from __future__ import annotations

import random
import subprocess
import sys
import tempfile
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))

from common import copy_stdlib, save  # noqa: E402

CHANGE = '''

def summarise_entries(entries, limit=10):
    counts = {}
    for entry in entries:
        counts[entry] = counts.get(entry, 0) + 1
    ordered = sorted(counts.items(), key=lambda item: -item[1])
    return ordered[:limit]
'''


def git(repo: Path, *args: str) -> None:
    subprocess.run(["git", "-c", "user.name=bench", "-c", "user.email=bench@example.invalid", *args], cwd=repo,
                   check=True, capture_output=True)


def cognomen(repo: Path, *args: str) -> tuple[subprocess.CompletedProcess, float]:
    began = time.monotonic()
    result = subprocess.run([sys.executable, "-m", "cognomen", *args], cwd=repo, capture_output=True, text=True)
    return result, time.monotonic() - began


def main() -> int:
    with tempfile.TemporaryDirectory(prefix="cognomen-bench-") as scratch:
        repo = copy_stdlib(Path(scratch) / "stdlib")
        git(repo, "init", "-q", "-b", "main")
        (repo / ".gitignore").write_text(".cognomen/\n")
        git(repo, "add", "-A")
        git(repo, "commit", "-q", "-m", "start")
        trained, train_seconds = cognomen(repo, "train", "--quiet")
        assert trained.returncode == 0, trained.stderr
        files = sorted(repo.rglob("*.py"))
        rng = random.Random(3)
        for path in rng.sample(files, 50):
            path.write_text(path.read_text(encoding="utf-8") + CHANGE, encoding="utf-8")
        review, review_seconds = cognomen(repo, "review", "--format", "json")
        assert review.returncode in (0, 1), review.stderr
        git(repo, "commit", "-q", "-am", "touch 50 files")
        for path in rng.sample(files, max(1, len(files) // 100)):
            path.write_text(path.read_text(encoding="utf-8") + "\n# retouched\nRETOUCHED = 1\n", encoding="utf-8")
        git(repo, "commit", "-q", "-am", "touch 1%")
        retrain, retrain_seconds = cognomen(repo, "train", "--quiet", "--if-changed")
    print(f"first training (not a target): {train_seconds:.1f} s")
    print(f"review of a 50-file change, model load included: {review_seconds:.2f} s (target <= 5 s)")
    print(f"weekly retrain with 1% of files changed, promotion check included: {retrain_seconds:.1f} s (target <= 60 s); "
          f"exit {retrain.returncode}: {retrain.stdout.splitlines()[0] if retrain.stdout else retrain.stderr}")
    save("review", {"review_seconds": round(review_seconds, 2), "retrain_seconds": round(retrain_seconds, 1),
                    "retrain_exit": retrain.returncode, "first_train_seconds": round(train_seconds, 1)})
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
