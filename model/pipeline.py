"""The whole training run: discover, lex (cached), train, write, check, promote, prune."""

from __future__ import annotations

import gc
import hashlib
import json
import math
import shutil
import subprocess
import sysconfig
import time
from collections import Counter
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from . import bundle, persistence
from .corpus import Corpus, Settings, TokenCache, discover, load_corpus, read_settings
from .measures import label, public
from .reranking import FEATURES
from .reuse import ExampleStore, PreviousVectors, examples_key
from .scoring import FEATURE_NAMES
from .training import TrainSettings, language_lines, settings_dict, train
from .vocab_report import model_coverage


class NothingToLearn(Exception):
    """No source files under the given path."""


@dataclass
class PromotionPolicy:
    """When a freshly trained model may replace the current one."""

    tolerance: float = 0.02  # largest allowed drop in 'found in top 5' and in 'misnames flagged'
    force: bool = False


@dataclass
class TrainResult:
    model_id: str | None
    promoted: bool
    reason: str
    corpus: Corpus | None = None
    manifest: dict = field(default_factory=dict)
    seconds: dict = field(default_factory=dict)
    pruned: list[str] = field(default_factory=list)
    unchanged: bool = False


STDLIB = "stdlib"
STDLIB_EXCLUDES = ["test/*", "*/test/*", "*/tests/*", "*/idle_test/*", "tests/*"]

# Below this many lines of Python, the standard library as background lifted "found in top 5" on
# the pinned small packages of tests/bench/quality.py (DEVELOPERS.md, Quality): it is the default there.
SMALL_REPOSITORY_LINES = 30_000


def chosen_background(corpus: Corpus, asked: list[str] | None) -> list[str]:
    """The background to learn from: what was asked for (maybe nothing), or when nothing was said,
    the standard library for a repository with some Python but under SMALL_REPOSITORY_LINES of it."""
    if asked is not None:
        return list(asked)
    return [STDLIB] if 0 < language_lines(corpus).get("python", 0) < SMALL_REPOSITORY_LINES else []


def load_background(names: list[str], cache: TokenCache) -> Corpus | None:
    """Other code to learn general naming from, at a lower weight: folders, or `stdlib`."""
    files, skipped = [], {}
    for name in names:
        if name == STDLIB:
            root, settings = Path(sysconfig.get_paths()["stdlib"]), Settings(exclude=list(STDLIB_EXCLUDES))
        else:
            root, settings = Path(name), Settings()
        if not root.is_dir():
            raise NothingToLearn(f"background {name} is not a directory")
        corpus = load_corpus(discover(root, settings), cache)
        for source in corpus.files:
            source.path = f"<{name}>/{source.path}"
        files.extend(corpus.files)
        for reason, count in corpus.skipped.items():
            skipped[reason] = skipped.get(reason, 0) + count
    return Corpus(files, skipped) if files else None


def source_commit(root: Path) -> str | None:
    try:
        result = subprocess.run(["git", "rev-parse", "HEAD"], cwd=root, capture_output=True, text=True, timeout=30)
    except (OSError, subprocess.TimeoutExpired):
        return None
    return result.stdout.strip() if result.returncode == 0 else None


def fingerprint(corpus: Corpus) -> str:
    """One hash over every learned file's path and content."""
    digest = hashlib.sha256()
    for source in corpus.files:
        digest.update(f"{source.path}\0{source.digest}\n".encode())
    return digest.hexdigest()


def promotion_check(new_quality: dict, current_quality: dict, policy: PromotionPolicy) -> tuple[bool, str]:
    """Promote only if 'found in top 5' and 'misnames flagged' drop by no more than the tolerance.

    On small held-out sets a figure moves by chance; a drop within two standard errors of the
    measurement is not held against the new model.
    """
    if policy.force:
        return True, "promoted (forced)"
    reasons = []
    samples = max(int(new_quality.get("seeded_misnames", 0) or 0), 1)
    for key in ("found_in_top_5", "misnames_flagged"):
        old, new = current_quality.get(key), new_quality.get(key)
        if old is None:
            continue
        noise = 2.0 * math.sqrt(max(old * (1.0 - old), 0.0) / samples)
        allowed = max(policy.tolerance, noise)
        if new is None:
            reasons.append(f"{label(key)} could not be measured (was {old:.3f})")
        elif new < old - allowed:
            reasons.append(f"{label(key)} fell from {old:.3f} to {new:.3f} ({allowed_drop(policy.tolerance, noise, samples)})")
    if reasons:
        return False, "kept the current model: " + "; ".join(reasons)
    return True, "promoted"


def allowed_drop(tolerance: float, noise: float, samples: int) -> str:
    """How the allowed drop was decided: the tolerance, or the measurement's noise when larger."""
    if noise > tolerance:
        return (f"allowed drop {noise:.3f}: two standard errors of the held-out measurement on {samples:,} "
                f"seeded misnames, larger than the tolerance {tolerance:.3f}")
    return f"allowed drop {tolerance:.3f}: the tolerance"


def train_repository(path: Path, store: Path, settings: TrainSettings, policy: PromotionPolicy | None = None,
                     keep: int = 4, if_changed: bool = False, report=None,
                     background: list[str] | None = None, from_scratch: bool = False) -> TrainResult:
    """Train on the code under path and promote the model if it passes the promotion check.

    `background`: more code to learn general naming from (folders, or `stdlib`); None: the
    default of `chosen_background`.

    Unless `from_scratch`, the embeddings continue from the current model's vectors and each
    unchanged file's examples are reused while the code has changed little (see reuse.py).
    """
    policy = policy or PromotionPolicy()
    report = report or (lambda *args: None)
    started = time.monotonic()
    repository_settings = read_settings(path)
    selection = discover(path, repository_settings)
    if not selection.files:
        raise NothingToLearn(f"nothing to learn from: 0 source files under {path}")
    report("files", len(selection.files))
    bundle.prepare_store(store)
    corpus = load_corpus(selection, TokenCache(store / "cache"),
                         progress=lambda done, total: report("lexing", done, total))
    if not corpus.files:
        raise NothingToLearn(f"nothing to learn from: 0 source files under {path}")
    corpus_seconds = time.monotonic() - started
    current_id = bundle.current_model_id(store)
    current_manifest = {}
    previous = None
    if current_id:
        try:
            current = bundle.load_model(store / "models" / current_id)
            current_manifest = current.manifest
            if not from_scratch:
                previous = PreviousVectors(current.documents["vocabulary"]["tokens"],
                                           np.asarray(current.arrays["input_vectors"]),
                                           np.asarray(current.arrays["output_vectors"]),
                                           dict(current.documents["names"].get("trained_files", {})))
        except (bundle.ModelError, KeyError):
            current_manifest = {}
    corpus_hash = fingerprint(corpus)
    if if_changed and current_manifest.get("corpus_fingerprint") == corpus_hash:
        return TrainResult(current_id, False, "the repository has not changed since the current model",
                           corpus, current_manifest, {"corpus": round(corpus_seconds, 2)}, unchanged=True)
    automatic = background is None
    background = chosen_background(corpus, background)
    extra = load_background(background, TokenCache(store / "cache"))
    report("training", corpus)
    # The corpus's million tokens live until the run ends and hold no reference cycles: keep
    # them out of the garbage collector's walks while the model is trained.
    gc.freeze()
    try:
        examples_directory = store / "cache" / "examples"
        if from_scratch:
            shutil.rmtree(examples_directory, ignore_errors=True)
        examples_store = ExampleStore(examples_directory, examples_key(settings_dict(settings), FEATURE_NAMES + FEATURES,
                                                                       background),
                                      [f.digest for f in corpus.files])
        trained = train(corpus, settings, progress=lambda *args: report("epoch", *args), background=extra,
                        accepted=repository_settings.accepted_names, previous=previous,
                        examples_store=examples_store)
    finally:
        gc.unfreeze()
    identifiers = Counter(t.text for f in corpus.files for t in f.tokens if t.kind == "name")
    manifest = {
        "coverage": dict(model_coverage(identifiers, set(trained.vocabulary.tokens)),
                         n=len(trained.vocabulary)),
        "source_commit": source_commit(path),
        "source_path": str(path),
        "corpus_fingerprint": corpus_hash,
        "settings": settings_dict(settings),
        "background": background,
        "background_chosen": "by default" if automatic else "as asked",
        "skipped": corpus.skipped,
        "reuse": trained.reuse,
        # Every stage, and the whole run up to writing the model (the manifest is written before it ends).
        "stage_seconds": {"corpus": round(corpus_seconds, 2), **trained.seconds,
                          "until_written": round(time.monotonic() - started, 2)},
    }
    promoted, reason = promotion_check(public(trained.quality), current_manifest.get("quality", {}) if current_manifest else {}, policy)
    manifest["promotion_check"] = reason
    directory = persistence.save(store, trained, manifest, refused=not promoted)
    model_id = directory.name
    written = json.loads((directory / bundle.MANIFEST).read_text(encoding="utf-8"))
    if promoted:
        bundle.promote(store, model_id)
    pruned = bundle.prune(store, keep)
    seconds = {"corpus": round(corpus_seconds, 2), **trained.seconds, "total": round(time.monotonic() - started, 2)}
    return TrainResult(model_id, promoted, reason, corpus, written, seconds, pruned)
