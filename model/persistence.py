"""Write a trained model as a bundle and turn a loaded bundle back into a scorer."""

from __future__ import annotations

import math
import time
from pathlib import Path


from . import bundle as store_files
from .flow import FlowIndex
from .measures import public
from .reranking import Reranker
from .scoring import Detector, NameTables, Scorer, Weights
from .training import TrainedModel
from .vocabulary import Vocabulary

_TABLE_ARRAYS = ("input_vectors", "output_vectors", "name_counts", "name_vocab_rows", "name_suggestable", "feature_keys",
                 "feature_totals", "context_indptr", "context_columns", "context_counts", "evidence_rows",
                 "evidence_path_ids", "evidence_lines", "evidence_vectors")


def save(store: Path, trained: TrainedModel, manifest: dict, refused: bool = False) -> Path:
    """Write a complete model into the store (not yet promoted; set apart if refused); returns its directory."""
    tables = trained.tables
    documents = {
        "vocabulary": trained.vocabulary.to_json(),
        "names": {"names": tables.names, "languages": tables.name_languages, "styles": tables.styles,
                  "evidence_paths": tables.evidence_paths, "total_occurrences": tables.total_occurrences,
                  "variables_per_language": tables.variables_per_language, "positional": tables.positional,
                  "trained_files": dict(sorted(tables.trained_files.items())), "min_count": tables.min_count,
                  "flags_need_contradiction": tables.flags_need_contradiction,
                  "classes": tables.classes},
    }
    documents["flow"], flow_arrays = tables.flow.stored()
    if trained.detector is not None:
        documents["detector"] = trained.detector.to_json()
    if trained.reranker is not None:
        documents["reranker"] = trained.reranker.to_json()
    arrays = {name: getattr(tables, name) for name in _TABLE_ARRAYS}
    arrays.update(flow_arrays)
    full = dict(manifest, created=time.strftime("%Y-%m-%dT%H:%M:%SZ", time.gmtime()),
                thresholds={language: value for language, value in trained.thresholds.items() if math.isfinite(value)},
                languages=trained.languages, quality=public(trained.quality), counts=trained.counts,
                seconds=trained.seconds)
    return store_files.write_model(store, full, documents, arrays, refused=refused)


def scorer_from_bundle(loaded: store_files.Bundle) -> Scorer:
    """A scorer over a verified bundle; ModelError when its contents disagree with each other."""
    try:
        vocabulary = Vocabulary.from_json(loaded.documents["vocabulary"])
        names = loaded.documents["names"]
        arrays = loaded.arrays
        tables = NameTables(
            vocabulary=vocabulary,
            names=list(names["names"]),
            name_languages=list(names["languages"]),
            styles=dict(names["styles"]),
            evidence_paths=list(names["evidence_paths"]),
            total_occurrences=float(names["total_occurrences"]),
            variables_per_language={k: int(v) for k, v in names.get("variables_per_language", {}).items()},
            positional=bool(names.get("positional", True)),
            flow=FlowIndex.from_stored(loaded.documents["flow"], arrays),
            trained_files={str(path): str(digest) for path, digest in names["trained_files"].items()},
            min_count=int(names["min_count"]),
            flags_need_contradiction=bool(names.get("flags_need_contradiction", False)),
            classes=dict(names["classes"]),
            **{name: arrays[name] for name in _TABLE_ARRAYS},
        )
        _check_shapes(tables)
        detector = Detector.from_json(loaded.documents["detector"]) if "detector" in loaded.documents else None
        reranker = Reranker.from_json(loaded.documents["reranker"]) if "reranker" in loaded.documents else None
        thresholds = {str(language): float(value) for language, value in loaded.manifest["thresholds"].items()}
        chosen = loaded.manifest.get("settings", {})
        weights = Weights(embedding=float(chosen.get("embedding_weight", 0.0)),
                          lexical=float(chosen.get("lexical_weight", 3.0)),
                          counts=float(chosen.get("count_weight", 1.0)))
    except (KeyError, TypeError, ValueError) as error:
        raise store_files.ModelError(f"model {loaded.model_id} is inconsistent ({error}); retrain it") from None
    return Scorer(tables, detector, thresholds, weights, reranker)


def _check_shapes(tables: NameTables) -> None:
    rows, dimensions = len(tables.vocabulary), tables.input_vectors.shape[1]
    names = len(tables.names)
    expectations = {
        "input_vectors": (tables.input_vectors.shape, (rows, dimensions)),
        "output_vectors": (tables.output_vectors.shape, (rows, dimensions)),
        "name_counts": (tables.name_counts.shape, (names,)),
        "name_vocab_rows": (tables.name_vocab_rows.shape, (names,)),
        "name_suggestable": (tables.name_suggestable.shape, (names,)),
        "context_indptr": (tables.context_indptr.shape, (len(tables.feature_keys) + 1,)),
        "context_counts": (tables.context_counts.shape, tables.context_columns.shape),
        "evidence_vectors": (tables.evidence_vectors.shape, (len(tables.evidence_rows), dimensions)),
    }
    for name, (actual, expected) in expectations.items():
        if tuple(actual) != tuple(expected):
            raise ValueError(f"{name} has shape {tuple(actual)}, expected {tuple(expected)}")
    if names != len(tables.name_languages):
        raise ValueError("names and their languages disagree in length")
    if len(tables.name_vocab_rows) and (tables.name_vocab_rows.max() >= rows or tables.name_vocab_rows.min() < 0):
        raise ValueError("a name points outside the vocabulary")
    if len(tables.context_columns) and tables.context_columns.max() >= names:
        raise ValueError("context counts point outside the names")


def load_scorer(store: Path) -> tuple[Scorer, store_files.Bundle]:
    """The current model of a store as a scorer; ModelError when there is none or it is refused."""
    loaded = store_files.load_current(store)
    return scorer_from_bundle(loaded), loaded
