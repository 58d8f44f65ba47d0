"""What a weekly retrain takes over from the last one: its embeddings, and each unchanged file's examples.

Embeddings continue from the current model's vectors and learn from the files that changed
since (tokens new to the vocabulary start afresh). A file's examples (its variables scored as if unseen, seeded
misnames and shortlists) change only through the other files' counts; while the code has
changed little since they were computed (at most `REUSE_SHARE` of the files, counted from
when the examples were last all computed afresh), an unchanged file's examples are reused.
`tests/bench/train.py` measures what that costs in quality against training from scratch.
"""

from __future__ import annotations

import hashlib
import json
import os
import shutil
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

REUSE_SHARE = 0.05
_FORMAT = 3


@dataclass
class PreviousVectors:
    """The current model's vectors by token, to start the new embeddings from."""

    tokens: list[str]
    inputs: np.ndarray
    outputs: np.ndarray
    trained_files: dict[str, str] = field(default_factory=dict)  # path -> content hash it learned from

    def learned(self, source) -> bool:
        """Whether the current model learned from this very file."""
        return self.trained_files.get(source.path) == source.digest


class ExampleStore:
    """Per-file examples on disk, by the file's content hash, within a generation of examples
    that all began from one state of the repository."""

    def __init__(self, directory: Path, key: str, digests: list[str]):
        self.directory = directory
        self.reused = 0
        self.computed = 0
        generation = self._read_generation()
        current = set(digests)
        if generation is not None and generation.get("key") == key:
            start = set(generation.get("digests", []))
            changed = len(current ^ start) / max(len(current), 1)
        else:
            start, changed = set(), 1.0
        if changed <= REUSE_SHARE:
            self.reusable = start & current
        else:
            # Too much has changed (or nothing is known): begin a new generation from scratch.
            shutil.rmtree(directory, ignore_errors=True)
            self.reusable = set()
            self._write_generation({"format": _FORMAT, "key": key, "digests": sorted(current)})
        self.fresh_generation = not self.reusable

    def get(self, source):
        """A file's examples from this generation, or None."""
        if source.digest not in self.reusable:
            return None
        from .training import FileExamples

        try:
            with np.load(self._path(source.digest), allow_pickle=False) as stored:
                sizes = stored["shortlist_sizes"]
                rows, truths = stored["shortlist_rows"], stored["shortlist_truth"]
                bounds = np.concatenate([[0], np.cumsum(sizes)]).astype(np.int64)
                shortlists = [(rows[a:b], truths[a:b]) for a, b in zip(bounds[:-1], bounds[1:])]
                found = FileExamples(stored["features"], stored["labels"], stored["flaggable"], shortlists,
                                     stored["recovered_at"].tolist(), stored["contradicted"])
        except (OSError, KeyError, ValueError):
            return None
        self.reused += 1
        return found

    def put(self, source, examples) -> None:
        """Keep a file's freshly computed examples; a cache that cannot be written only costs time."""
        self.computed += 1
        if not source.digest:
            return
        width = examples.shortlists[0][0].shape[1] if examples.shortlists else 0
        try:
            self.directory.mkdir(parents=True, exist_ok=True)
            temporary = self.directory / f".{source.digest}.{os.getpid()}.npz"
            np.savez(temporary, features=examples.features, labels=examples.labels, flaggable=examples.flaggable,
                     contradicted=examples.contradicted,
                     shortlist_sizes=np.array([len(rows) for rows, _ in examples.shortlists], dtype=np.int64),
                     shortlist_rows=np.vstack([rows for rows, _ in examples.shortlists]) if examples.shortlists
                     else np.zeros((0, width)),
                     shortlist_truth=np.concatenate([truth for _, truth in examples.shortlists])
                     if examples.shortlists else np.zeros(0),
                     recovered_at=np.array(examples.recovered_at, dtype=np.int64))
            os.replace(temporary, self._path(source.digest))
        except OSError:
            pass

    def _path(self, digest: str) -> Path:
        return self.directory / f"{digest}.npz"

    def _read_generation(self) -> dict | None:
        try:
            return json.loads((self.directory / "generation.json").read_text(encoding="utf-8"))
        except (OSError, ValueError):
            return None

    def _write_generation(self, data: dict) -> None:
        try:
            self.directory.mkdir(parents=True, exist_ok=True)
            (self.directory / "generation.json").write_text(json.dumps(data), encoding="utf-8")
        except OSError:
            pass


def examples_key(settings_data: dict, features: tuple[str, ...], background: list[str]) -> str:
    """What a file's examples depend on besides the files themselves."""
    # The flag budget, which names may be flagged and the embeddings' epochs leave examples as they are.
    relevant = {key: value for key, value in settings_data.items()
                if key not in ("flag_budget", "flag_contradictions_only", "epochs", "warm_epochs")}
    text = json.dumps({"settings": relevant, "features": list(features), "background": background,
                       "format": _FORMAT}, sort_keys=True)
    return hashlib.sha256(text.encode()).hexdigest()[:16]
