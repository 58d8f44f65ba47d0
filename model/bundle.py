"""The model store: plain files, checksums, atomic promotion through a `current` pointer."""

from __future__ import annotations

import hashlib
import json
import os
import shutil
import tempfile
import time
from dataclasses import dataclass
from pathlib import Path

import numpy as np

# 6: the re-ranker reads whether another variable of the file has the name; 5: per-language thresholds, name
# flow; 4: measures under their public names
FORMAT_VERSION = 6
MANIFEST = "manifest.json"
CURRENT = "current"
PROMOTABLE = "models"  # models that passed the promotion check (or were forced through it)
REFUSED = "refused"  # models the promotion check refused: kept apart, never counted by --keep
# The store holds trained models and caches, never anything to commit: it ignores itself.
STORE_GITIGNORE = "# written by cognomen: the model store is never committed\n*\n"


class ModelError(Exception):
    """A model that is missing, incomplete or fails verification; the message says which."""


@dataclass
class Bundle:
    """A verified model on disk: its manifest, JSON documents and memory-mapped arrays."""

    directory: Path
    manifest: dict
    documents: dict[str, object]
    arrays: dict[str, np.ndarray]

    @property
    def model_id(self) -> str:
        return self.directory.name


def _sha256(path: Path) -> str:
    digest = hashlib.sha256()
    with path.open("rb") as stream:
        for block in iter(lambda: stream.read(1 << 20), b""):
            digest.update(block)
    return digest.hexdigest()


def prepare_store(store: Path) -> None:
    """Create the store if needed, with a `.gitignore` that keeps all of it out of git."""
    store.mkdir(parents=True, exist_ok=True)
    ignore = store / ".gitignore"
    if not ignore.exists():
        ignore.write_text(STORE_GITIGNORE, encoding="utf-8")


def new_model_id() -> str:
    return time.strftime("%Y%m%d-%H%M%S", time.gmtime()) + "-" + os.urandom(3).hex()


def write_model(store: Path, manifest: dict, documents: dict[str, object],
                arrays: dict[str, np.ndarray], model_id: str | None = None, refused: bool = False) -> Path:
    """Write a complete model into store/models/<id> (or refused/<id>); nothing is visible there until it is whole."""
    prepare_store(store)
    models = store / (REFUSED if refused else PROMOTABLE)
    models.mkdir(parents=True, exist_ok=True)
    model_id = model_id or new_model_id()
    staging = Path(tempfile.mkdtemp(prefix=".incomplete-", dir=models))
    try:
        files: dict[str, str] = {}
        for name, document in documents.items():
            path = staging / f"{name}.json"
            path.write_text(json.dumps(document, separators=(",", ":")), encoding="utf-8")
            files[path.name] = _sha256(path)
        shapes = {}
        for name, array in arrays.items():
            path = staging / f"{name}.npy"
            np.save(path, np.ascontiguousarray(array), allow_pickle=False)
            files[path.name] = _sha256(path)
            shapes[path.name] = {"shape": list(array.shape), "dtype": str(array.dtype)}
        full_manifest = dict(manifest, format_version=FORMAT_VERSION, model_id=model_id, files=files,
                             arrays=shapes)
        (staging / MANIFEST).write_text(json.dumps(full_manifest, indent=2), encoding="utf-8")
        for path in staging.iterdir():
            with path.open("rb") as stream:
                os.fsync(stream.fileno())
        target = models / model_id
        os.rename(staging, target)
        _fsync_directory(models)
        return target
    except BaseException:
        shutil.rmtree(staging, ignore_errors=True)
        raise


def _fsync_directory(path: Path) -> None:
    try:
        descriptor = os.open(path, os.O_RDONLY)
    except OSError:
        return
    try:
        os.fsync(descriptor)
    except OSError:
        pass
    finally:
        os.close(descriptor)


def promote(store: Path, model_id: str) -> None:
    """Point `current` at a model, atomically: readers see the old id or the new one, never neither.

    A model the promotion check refused moves back among the promotable ones first: a person
    promoting it overrules the check.
    """
    set_aside = store / REFUSED / model_id
    load_model(set_aside if set_aside.is_dir() else store / PROMOTABLE / model_id)  # refuse what does not verify
    if set_aside.is_dir():
        (store / PROMOTABLE).mkdir(parents=True, exist_ok=True)
        os.rename(set_aside, store / PROMOTABLE / model_id)
    pointer = store / CURRENT
    temporary = store / f".{CURRENT}.{os.getpid()}.tmp"
    temporary.write_text(model_id + "\n", encoding="utf-8")
    with temporary.open("rb") as stream:
        os.fsync(stream.fileno())
    os.replace(temporary, pointer)
    _fsync_directory(store)


def current_model_id(store: Path) -> str | None:
    try:
        model_id = (store / CURRENT).read_text(encoding="utf-8").strip()
    except (OSError, UnicodeDecodeError):
        return None
    return model_id or None


def load_current(store: Path) -> Bundle:
    """The model `current` names, verified; ModelError when there is none or it is damaged."""
    model_id = current_model_id(store)
    if model_id is None or "/" in model_id or model_id.startswith("."):
        raise ModelError(f"no model found in {store}; run cognomen train")
    return load_model(store / "models" / model_id)


def load_model(directory: Path) -> Bundle:
    """Load and verify one model directory: checksums, array shapes and types, no pickle."""
    try:
        manifest = json.loads((directory / MANIFEST).read_text(encoding="utf-8"))
    except FileNotFoundError:
        raise ModelError(f"no model found in {directory}; run cognomen train") from None
    except (OSError, ValueError, UnicodeDecodeError) as error:
        raise ModelError(f"model {directory.name} has an unreadable manifest ({error})") from None
    if not isinstance(manifest, dict) or manifest.get("format_version") != FORMAT_VERSION:
        raise ModelError(f"model {directory.name} has format {manifest.get('format_version')!r}; "
                         f"this cognomen reads format {FORMAT_VERSION}: retrain with cognomen train")
    files = manifest.get("files")
    if not isinstance(files, dict):
        raise ModelError(f"model {directory.name}: manifest lists no files")
    documents: dict[str, object] = {}
    arrays: dict[str, np.ndarray] = {}
    for name, expected in files.items():
        path = directory / name
        if "/" in name or not path.is_file():
            raise ModelError(f"model {directory.name} is missing {name}")
        if _sha256(path) != expected:
            raise ModelError(f"model {directory.name}: {name} does not match its checksum; refusing to load it")
        if name.endswith(".json"):
            documents[name[:-5]] = json.loads(path.read_text(encoding="utf-8"))
        elif name.endswith(".npy"):
            try:
                array = np.load(path, mmap_mode="r", allow_pickle=False)
            except (ValueError, OSError) as error:
                raise ModelError(f"model {directory.name}: {name} is not a plain array ({error})") from None
            declared = manifest.get("arrays", {}).get(name, {})
            if list(array.shape) != declared.get("shape") or str(array.dtype) != declared.get("dtype"):
                raise ModelError(f"model {directory.name}: {name} has shape {array.shape} {array.dtype}, "
                                 f"the manifest says {declared}")
            arrays[name[:-4]] = array
    return Bundle(directory, manifest, documents, arrays)


def problem_with(directory: Path) -> str | None:
    """Why a model directory would be refused on loading (missing, damaged, old format), or None."""
    try:
        load_model(directory)
    except ModelError as error:
        return str(error)
    return None


def list_models(store: Path, folder: str = PROMOTABLE) -> list[dict]:
    """Manifests of every complete model in a folder of the store (promotable ones by default), newest first."""
    models = store / folder
    found = []
    if not models.is_dir():
        return found
    for directory in models.iterdir():
        if directory.name.startswith(".") or not (directory / MANIFEST).is_file():
            continue
        try:
            found.append(json.loads((directory / MANIFEST).read_text(encoding="utf-8")))
        except (OSError, ValueError):
            continue
    found.sort(key=lambda m: (m.get("created", ""), m.get("model_id", "")), reverse=True)
    return found


def prune(store: Path, keep: int) -> list[str]:
    """Delete all but the newest `keep` models, never the current one; returns the deleted ids.

    Refused models are counted apart, so refused retrains never push a good model out.
    """
    current = current_model_id(store)
    deleted = []
    for folder in (PROMOTABLE, REFUSED):
        for index, manifest in enumerate(list_models(store, folder)):
            model_id = manifest.get("model_id", "")
            if index >= keep and model_id != current and model_id:
                shutil.rmtree(store / folder / model_id, ignore_errors=True)
                deleted.append(model_id)
        for leftover in (store / folder).glob(".incomplete-*") if (store / folder).is_dir() else []:
            if time.time() - leftover.stat().st_mtime > 3600:
                shutil.rmtree(leftover, ignore_errors=True)
    return deleted
