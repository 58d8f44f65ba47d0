"""Benchmark: `cognomen train` as people run it (a fresh process, the console script) on the
standard library: cold, then warm with 1% of the files changed, then the same code trained from
scratch to compare the warm model's quality with.

Prints the CPU, the core count and the load average before each run, each stage's seconds
(from the model's manifest), and the quality figures of the warm and the from-scratch model;
writes bench-results/train.json. Targets (2-core machine, quiet): warm <= 10 s end to end,
cold <= 30 s, names and calibration <= the embeddings' time (cold), and the warm model within
0.01 of the from-scratch one in recovery@5 and detection AUC.
"""

from __future__ import annotations

import json
import os
import platform
import random
import shutil
import subprocess
import sys
import tempfile
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))

from common import copy_stdlib, save  # noqa: E402

COGNOMEN = shutil.which("cognomen", path=str(Path(sys.executable).parent)) or "cognomen"


def cpu_model() -> str:
    try:
        for line in Path("/proc/cpuinfo").read_text().splitlines():
            if line.startswith("model name"):
                return line.split(":", 1)[1].strip()
    except OSError:
        pass
    return platform.processor() or platform.machine()


def run(repo: Path, store: Path, *extra: str) -> dict:
    load = os.getloadavg()[0]
    started = time.monotonic()
    result = subprocess.run([COGNOMEN, "--model-dir", str(store), "train", "--quiet", "--force", *extra, str(repo)],
                            capture_output=True, text=True)
    wall = time.monotonic() - started
    if result.returncode != 0:
        raise SystemExit(f"cognomen train failed ({result.returncode}):\n{result.stderr}")
    newest = max((store / "models").iterdir(), key=lambda d: (d / "manifest.json").stat().st_mtime)
    manifest = json.loads((newest / "manifest.json").read_text())
    return {"load_average_before": round(load, 2), "wall_seconds": round(wall, 2),
            "seconds": manifest.get("stage_seconds", manifest["seconds"]),
            "quality": manifest["quality"], "reuse": manifest.get("reuse", {}), "counts": manifest["counts"]}


def show(label: str, figures: dict) -> None:
    seconds = figures["seconds"]
    stages = ", ".join(f"{k} {v} s" for k, v in seconds.items())
    print(f"{label} (load average before: {figures['load_average_before']}): {stages}; "
          f"wall {figures['wall_seconds']} s")
    print(f"  reuse: {figures['reuse']}")


def main() -> int:
    print(f"CPU: {cpu_model()}, {os.cpu_count()} cores; Python {platform.python_version()}")
    with tempfile.TemporaryDirectory(prefix="cognomen-bench-") as scratch:
        repo = copy_stdlib(Path(scratch) / "stdlib")
        store = Path(scratch) / "store"
        cold = run(repo, store)
        show("cold", cold)
        files = sorted(repo.rglob("*.py"))
        touched = random.Random(1).sample(files, max(1, len(files) // 100))
        for path in touched:
            path.write_text(path.read_text(encoding="utf-8") + "\n\ndef touched_by_bench(value):\n    return value\n",
                            encoding="utf-8")
        warm = run(repo, store)
        show(f"warm, {len(touched)} of {len(files)} files changed", warm)
        scratch_store = Path(scratch) / "from-scratch"
        fresh = run(repo, scratch_store)
        show("the same code from scratch", fresh)
    keys = ("found_in_top_5", "recovery_at_5"), ("detection_auc", "detection_auc")
    for names in keys:
        key = next((k for k in names if k in warm["quality"]), None)
        if key:
            difference = warm["quality"][key] - fresh["quality"][key]
            print(f"{key}: warm {warm['quality'][key]:.4f}, from scratch {fresh['quality'][key]:.4f} "
                  f"(difference {difference:+.4f}; target within 0.01)")
    names = cold["seconds"].get("names_and_calibration", 0)
    embeddings = cold["seconds"].get("embeddings", 0)
    print(f"targets (end to end, the command's wall time): cold {cold['wall_seconds']} s (<= 30), "
          f"warm {warm['wall_seconds']} s (<= 10); names and calibration {names} s against embeddings "
          f"{embeddings} s (<=, cold)")
    save("train", {"cpu": cpu_model(), "cores": os.cpu_count(), "cold": cold, "warm": warm, "from_scratch": fresh})
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
