"""Where the model store is, and loading its current model for a command."""

from __future__ import annotations

import gc
from pathlib import Path

from cognomen.model.bundle import ModelError
from cognomen.model.corpus import repository_root
from cognomen.model.persistence import load_scorer

from .exits import UsageError


def default_store(start: Path) -> Path:
    """`.cognomen` at the top of the repository holding start (or start itself outside git)."""
    start = start if start.is_dir() else start.parent
    return (repository_root(start) or start.resolve()) / ".cognomen"


def store_for(args, start: Path | None = None) -> Path:
    """The store named by --model-dir, else the default one for start (or the working folder)."""
    if args.model_dir:
        return Path(args.model_dir)
    return default_store(start or Path.cwd())


def load_or_explain(store: Path):
    """The current model as (scorer, bundle); a usage error saying why when there is none."""
    try:
        loaded = load_scorer(store)
    except ModelError as error:
        raise UsageError(str(error)) from None
    gc.freeze()  # the model lives until the command ends: keep it out of garbage collections
    return loaded
