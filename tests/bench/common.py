"""Helpers shared by the benchmark scripts (not collected by pytest)."""

from __future__ import annotations

import json
import platform
import shutil
import sysconfig
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
RESULTS = ROOT / "bench-results"
STDLIB = Path(sysconfig.get_paths()["stdlib"])
TEST_FOLDERS = {"test", "tests", "idle_test", "site-packages", "__pycache__"}


def copy_stdlib(target: Path) -> Path:
    """The running Python's standard library without its test folders, as plain files to train on."""
    for source in STDLIB.rglob("*.py"):
        relative = source.relative_to(STDLIB)
        if any(part in TEST_FOLDERS for part in relative.parts[:-1]):
            continue
        destination = target / relative
        destination.parent.mkdir(parents=True, exist_ok=True)
        shutil.copyfile(source, destination)
    return target


def save(name: str, figures: dict) -> Path:
    RESULTS.mkdir(exist_ok=True)
    figures = dict(figures, machine=platform.machine(), python=platform.python_version(),
                   measured_at=time.strftime("%Y-%m-%dT%H:%M:%SZ", time.gmtime()))
    path = RESULTS / f"{name}.json"
    path.write_text(json.dumps(figures, indent=2))
    print(f"figures written to {path}")
    return path
