"""Train embeddings and name tables from a corpus, calibrate the flag threshold, measure quality."""

from __future__ import annotations

import hashlib
import math
import os
import random
import time
from collections import Counter
from dataclasses import asdict, dataclass, field

import numpy as np

from .corpus import Corpus, SourceFile
from .languages import get_language
from .scopes import Variable
from .scoring import (IGNORED_NAMES, WINDOW, Detector, NameTables, Scorer, Weights, allowed_mask,
                      detection_features, dominant_style, fit_detector, name_fit, occurrence_contexts,
                      rank_candidates, token_ids, context_vectors, occurrence_table)
from .reranking import Reranker, fit_reranker, shortlist_features
from .usage import USAGES, usage_flags
from .vocabulary import Vocabulary, build_vocabulary, count_tokens

MAX_SENTENCE = 10_000  # gensim silently truncates longer sentences
MIN_CALIBRATION_LINES = 3_000  # below this, calibrated thresholds measured far off on new code
EVIDENCE_PER_NAME = 6

@dataclass
class TrainSettings:
    """Training choices; every one is stored in the model's manifest."""

    vocabulary_size: int = 50_000
    min_count: int = 2
    vector_size: int = 64
    window: int = 5
    epochs: int = 5
    negative: int = 5
    seed: int = 1
    workers: int = field(default_factory=lambda: os.cpu_count() or 1)
    names_per_language: int = 5_000
    flag_budget: float = 1.0  # flags per 1,000 non-blank lines of clean code
    calibration_share: float = 0.15
    calibration_files: int = 200
    embedding_weight: float = 1.0
    lexical_weight: float = 3.0
    count_weight: float = 1.0
    usage_weight: float = 1.0
    # Each name's usage profile (iterated, called, compared with None, ...): measured, and off,
    # since the position-specific counts already see these patterns (DEVELOPERS.md, "Quality").
    use_usage: bool = False
    positional_counts: bool = True  # count each neighbour at its offset; False pools them (a bag)
    use_detector: bool = True
    use_reranker: bool = True
    background_weight: float = 0.3  # how much a background corpus file counts against a team file

    @property
    def weights(self) -> Weights:
        return Weights(embedding=self.embedding_weight, lexical=self.lexical_weight, counts=self.count_weight,
                       usage=self.usage_weight)


def split_files(paths: list[str], share: float, seed: int) -> tuple[set[str], set[str]]:
    """Split paths by a seeded hash: (kept, held out); the held-out share is about `share`."""
    held = set()
    for path in paths:
        digest = hashlib.sha256(f"{seed}:{path}".encode()).digest()
        if int.from_bytes(digest[:4], "big") / 2**32 < share:
            held.add(path)
    return set(paths) - held, held


def train_embeddings(files: list[SourceFile], vocabulary: Vocabulary, settings: TrainSettings,
                     progress=None) -> tuple[np.ndarray, np.ndarray]:
    """CBOW with negative sampling; returns input and output vectors in the vocabulary's row order."""
    from gensim.models import Word2Vec
    from gensim.models.callbacks import CallbackAny2Vec

    index = vocabulary.index
    unknown = vocabulary.tokens[0]
    sentences = []
    for source in files:
        texts = [t.text if t.text in index else unknown for t in source.tokens]
        for start in range(0, len(texts), MAX_SENTENCE):
            sentences.append(texts[start:start + MAX_SENTENCE])
    total_words = sum(len(s) for s in sentences)

    class Progress(CallbackAny2Vec):
        def __init__(self):
            self.epoch = 0
            self.started = time.monotonic()

        def on_epoch_end(self, model):
            self.epoch += 1
            if progress:
                elapsed = time.monotonic() - self.started
                progress(self.epoch, settings.epochs, total_words * self.epoch / max(elapsed, 1e-9),
                         elapsed / self.epoch * (settings.epochs - self.epoch))

    model = Word2Vec(vector_size=settings.vector_size, window=settings.window, min_count=1, sg=0,
                     negative=settings.negative, hs=0, sample=0, workers=settings.workers, seed=settings.seed,
                     epochs=settings.epochs)
    model.build_vocab(sentences)
    model.train(sentences, total_examples=len(sentences), epochs=settings.epochs, callbacks=[Progress()])
    dimensions = settings.vector_size
    inputs = np.zeros((len(vocabulary), dimensions), dtype=np.float32)
    outputs = np.zeros((len(vocabulary), dimensions), dtype=np.float32)
    for row, token in enumerate(vocabulary.tokens):
        gensim_row = model.wv.key_to_index.get(token)
        if gensim_row is not None:
            inputs[row] = model.wv.vectors[gensim_row]
            outputs[row] = model.syn1neg[gensim_row]
    return inputs, outputs


def build_tables(files: list[SourceFile], vocabulary: Vocabulary, inputs: np.ndarray, outputs: np.ndarray,
                 settings: TrainSettings, background: frozenset[str] = frozenset()) -> NameTables:
    """Candidate names, position-specific context counts and evidence places from the given files.

    Files whose paths are in `background` count at `settings.background_weight` and never
    serve as evidence: suggestions point at the team's own code.
    """
    per_language: dict[str, Counter] = {}
    variables_per_language: Counter = Counter()
    for source in files:
        counter = per_language.setdefault(source.language, Counter())
        variables_per_language[source.language] += len(source.variables)
        weight = settings.background_weight if source.path in background else 1.0
        for variable in source.variables:
            if variable.name not in IGNORED_NAMES and variable.name in vocabulary.index:
                counter[variable.name] += weight * min(len(variable.occurrences), 24)
    # With a background corpus, candidates are names the team itself writes somewhere: the
    # background lends its contexts, never its own vocabulary of names.
    team_words: dict[str, set[str]] | None = None
    if background:
        team_words = {}
        for source in files:
            if source.path not in background:
                tokens = source.tokens
                # Method names (`.get(`, `.items(`, `def get(`) are verbs of other objects, not names
                # for a variable.
                defining = get_language(source.language).defining_words | {"."}
                team_words.setdefault(source.language, set()).update(
                    t.text for i, t in enumerate(tokens) if t.kind == "name" and not (
                        0 < i < len(tokens) - 1 and tokens[i + 1].text == "(" and tokens[i - 1].text in defining))
    names, languages, counts = [], [], []
    styles = {}
    for language in sorted(per_language):
        counter = per_language[language]
        styles[language] = dominant_style(counter)
        written = team_words.get(language, set()) if team_words is not None else None
        ranked = sorted(((name, count) for name, count in counter.items()
                         if written is None or name in written), key=lambda item: (-item[1], item[0]))
        for name, count in ranked[:settings.names_per_language]:
            names.append(name)
            languages.append(language)
            counts.append(count)
    row_by_name = {(lang, name): row for row, (lang, name) in enumerate(zip(languages, names))}
    suggestable = np.ones(len(names), dtype=bool)
    vocabulary_size = len(vocabulary)
    self_id, pad_id = vocabulary.id("<self>"), vocabulary.id("<pad>")
    key_parts, row_parts, weight_parts = [], [], []
    usage_counts = np.zeros((len(names), len(USAGES)), dtype=np.float64)
    usage_variables = np.zeros(len(names), dtype=np.float64)
    evidence: dict[int, list[tuple[str, int, np.ndarray]]] = {}
    order = list(range(len(files)))
    random.Random(settings.seed).shuffle(order)
    for file_index in order:
        source = files[file_index]
        ids = None
        for variable in source.variables:
            row = row_by_name.get((source.language, variable.name))
            if row is None:
                continue
            if ids is None:
                ids = token_ids(source, vocabulary)
            contexts = occurrence_contexts(ids, variable.occurrences, WINDOW, self_id, pad_id)
            slots = np.arange(contexts.shape[1], dtype=np.int64) if settings.positional_counts else \
                np.zeros(contexts.shape[1], dtype=np.int64)
            keys = (slots[None, :] * vocabulary_size + contexts).ravel()
            key_parts.append(keys)
            row_parts.append(np.full(keys.size, row, dtype=np.int64))
            is_background = source.path in background
            file_weight = settings.background_weight if is_background else 1.0
            weight_parts.append(np.full(keys.size, file_weight))
            if settings.use_usage:
                usage_counts[row] += file_weight * usage_flags(source.tokens, variable.occurrences)
                usage_variables[row] += file_weight
            places = evidence.setdefault(row, [])
            if not is_background and len(places) < EVIDENCE_PER_NAME and all(p[0] != source.path for p in places):
                line = source.tokens[variable.occurrences[0]].line
                positions, owners, _ = occurrence_table([variable])
                vector = context_vectors(inputs, self_id, pad_id, ids, positions, owners, 1)[0]
                places.append((source.path, line, vector))
    if key_parts:
        keys = np.concatenate(key_parts)
        rows = np.concatenate(row_parts)
        combined = keys * max(len(names), 1) + rows
        unique, inverse = np.unique(combined, return_inverse=True)
        pair_counts = np.bincount(inverse.ravel(), weights=np.concatenate(weight_parts))
        pair_keys = unique // max(len(names), 1)
        pair_rows = (unique % max(len(names), 1)).astype(np.int32)
        feature_keys, starts = np.unique(pair_keys, return_index=True)
        indptr = np.append(starts, len(pair_keys)).astype(np.int64)
        feature_totals = np.add.reduceat(pair_counts, starts).astype(np.float32) if len(starts) else np.zeros(0, np.float32)
        total = float(pair_counts.sum()) / (2 * WINDOW)
    else:
        pair_rows = np.zeros(0, np.int32)
        pair_counts = np.zeros(0)
        feature_keys = np.zeros(0, np.int64)
        indptr = np.zeros(1, np.int64)
        feature_totals = np.zeros(0, np.float32)
        total = 1.0
    evidence_rows, path_ids, lines, vectors = [], [], [], []
    paths: dict[str, int] = {}
    for row in sorted(evidence):
        for path, line, vector in evidence[row]:
            evidence_rows.append(row)
            path_ids.append(paths.setdefault(path, len(paths)))
            lines.append(line)
            vectors.append(vector)
    return NameTables(
        vocabulary=vocabulary, input_vectors=inputs, output_vectors=outputs, names=names,
        name_languages=languages, name_counts=np.array(counts, dtype=np.float32),
        name_vocab_rows=np.array([vocabulary.id(n) for n in names], dtype=np.int32), styles=styles,
        name_suggestable=suggestable,
        feature_keys=feature_keys.astype(np.int64), feature_totals=feature_totals, context_indptr=indptr,
        context_columns=pair_rows.astype(np.int32), context_counts=pair_counts.astype(np.float32),
        evidence_rows=np.array(evidence_rows, dtype=np.int32), evidence_paths=list(paths),
        evidence_path_ids=np.array(path_ids, dtype=np.int32), evidence_lines=np.array(lines, dtype=np.int32),
        evidence_vectors=np.array(vectors, dtype=np.float32).reshape(len(vectors), inputs.shape[1]),
        total_occurrences=max(total, 1.0),
        variables_per_language=dict(variables_per_language),
        usage_counts=usage_counts.astype(np.float32), usage_variables=usage_variables.astype(np.float32),
        positional=settings.positional_counts,
    )


def seed_misname(source: SourceFile, variable: Variable, rng: random.Random,
                 local_names: list[str] | None = None) -> str | None:
    """A name used for a local variable elsewhere in the same file and not in this variable's scope."""
    if local_names is None:
        local_names = file_local_names(source)
    options = [name for name in local_names if name != variable.name and name not in variable.bound_names]
    return rng.choice(options) if options else None


def file_local_names(source: SourceFile) -> list[str]:
    return sorted({v.name for v in source.variables if v.kind == "local" and v.name not in IGNORED_NAMES})


def rename(source: SourceFile, variable: Variable, new_name: str) -> tuple[SourceFile, Variable]:
    """The file as it would lex with every occurrence of the variable renamed."""
    tokens = list(source.tokens)
    for index in variable.occurrences:
        tokens[index] = type(tokens[index])(new_name, tokens[index].kind, tokens[index].line, tokens[index].column)
    renamed = Variable(new_name, variable.kind, variable.occurrences, variable.scope_start, variable.scope_end,
                       variable.function, variable.public_parameter,
                       (variable.bound_names - {variable.name}) | {new_name}, variable.scope_kind,
                       variable.shorthand, variable.dictated)
    variables = [renamed if v is variable else v for v in source.variables]
    return SourceFile(source.path, source.language, source.digest, source.lines, tokens, variables), renamed


@dataclass
class Examples:
    """Detection features for real variables (label 0) and seeded misnames (label 1)."""

    features: list[np.ndarray] = field(default_factory=list)
    labels: list[int] = field(default_factory=list)
    recovered_at: list[int] = field(default_factory=list)  # rank of the true name, per seeded misname
    lines: int = 0
    shortlists: list[tuple[np.ndarray, np.ndarray]] = field(default_factory=list)  # re-ranking rows and labels
    example_files: list[int] = field(default_factory=list)  # which file each example came from
    file_lines: list[int] = field(default_factory=list)


def collect_examples(tables: NameTables, files: list[SourceFile], seed: int, weights: Weights | None = None,
                     limit: int = 8000) -> Examples:
    """Real variables and one seeded misname each, scored against tables that never saw these files."""
    rng = random.Random(seed)
    examples = Examples()
    scorer = Scorer(tables, None, 0.0, weights)
    for source in files:
        if len(examples.labels) >= limit:
            break  # whole files only, so that flags per line stay honest
        examples.lines += source.lines
        examples.file_lines.append(source.lines)
        file_number = len(examples.file_lines) - 1
        ids = token_ids(source, tables.vocabulary)
        local_names = file_local_names(source)
        for variable in source.variables:
            if variable.name in IGNORED_NAMES:
                continue
            ranking = rank_candidates(tables, source, variable, ids, weights)
            if ranking is None:
                continue
            fit = name_fit(tables, ranking, variable.name, weights)
            allowed = allowed_mask(tables, ranking, variable.bound_names, variable.name)
            if fit is not None:
                examples.features.append(detection_features(tables, ranking, allowed, fit, variable.name, variable))
                examples.labels.append(0)
                examples.example_files.append(file_number)
            wrong = seed_misname(source, variable, rng, local_names)
            if wrong is None:
                continue
            # Own occurrences are masked in every context, so the ranking is the same after renaming.
            _, renamed = rename(source, variable, wrong)
            allowed = allowed_mask(tables, ranking, renamed.bound_names, wrong)
            suggestions = scorer.suggestions(ranking, allowed, 10)
            names = [s.name for s in suggestions]
            examples.recovered_at.append(names.index(variable.name) + 1 if variable.name in names else 0)
            listed, _, rows = shortlist_features(tables, ranking, allowed, renamed.bound_names, wrong,
                                                 weights or Weights())
            examples.shortlists.append((rows, np.array([name == variable.name for name in listed], dtype=float)))
            fit = name_fit(tables, ranking, wrong, weights)
            if fit is not None:
                examples.features.append(detection_features(tables, ranking, allowed, fit, wrong, renamed))
                examples.labels.append(1)
                examples.example_files.append(file_number)
    return examples


def calibrate_by_files(oddness_clean: np.ndarray, files: np.ndarray, file_lines: np.ndarray, budget: float,
                       confidence: float = 0.95, resamples: int = 200, seed: int = 1) -> float:
    """The lowest threshold whose flags per 1,000 lines stay within budget in `confidence` of
    bootstrap resamples of whole files: odd-looking names cluster in a few files, so a
    threshold fitted to one sample of files flags more on the next."""
    if len(oddness_clean) == 0:
        return 0.0
    candidates = np.unique(np.quantile(oddness_clean, np.linspace(0.9, 1.0, 201)))
    flags = np.zeros((len(file_lines), len(candidates)))
    for file_number in np.unique(files):
        values = oddness_clean[files == file_number]
        flags[file_number] = (values[:, None] > candidates[None, :]).sum(axis=0)
    rng = np.random.default_rng(seed)
    picks = rng.integers(0, len(file_lines), size=(resamples, len(file_lines)))
    rates = flags[picks].sum(axis=1) * 1000.0 / np.maximum(file_lines[picks].sum(axis=1), 1)[:, None]
    bound = np.quantile(rates, confidence, axis=0)
    within = np.flatnonzero(bound <= budget)
    return float(candidates[within[0]]) if len(within) else float(candidates[-1])


def calibrate(oddness_clean: np.ndarray, lines: int, budget: float) -> float:
    """The lowest threshold that keeps flags on clean code within `budget` per 1,000 lines."""
    allowed_flags = int(budget * lines / 1000)
    ordered = np.sort(oddness_clean)[::-1]
    if len(ordered) == 0:
        return 0.0
    if allowed_flags >= len(ordered):
        return float(ordered[-1]) - 1e-6
    return float(ordered[allowed_flags])


@dataclass
class TrainedModel:
    """Everything a model bundle holds, before it is written."""

    vocabulary: Vocabulary
    tables: NameTables
    detector: Detector | None
    threshold: float
    quality: dict
    counts: dict
    seconds: dict
    reranker: Reranker | None = None


def train(corpus: Corpus, settings: TrainSettings, progress=None, background: Corpus | None = None) -> TrainedModel:
    """Vocabulary, embeddings, name tables, detector and threshold from a lexed corpus.

    About `calibration_share` of the files are kept out of every learned part and used to fit
    the detector and calibrate the threshold, so both see names as they will in new code.
    """
    started = time.monotonic()
    background_files = background.files if background else []
    background_paths = frozenset(f.path for f in background_files)
    everything = corpus.files + background_files
    kept, held = split_files([f.path for f in everything], settings.calibration_share, settings.seed)
    if not kept or not held:
        kept, held = {f.path for f in everything}, set()
    files = [f for f in everything if f.path in kept]
    # Team files first, so that a small team still calibrates on its own code.
    held_files = sorted((f for f in everything if f.path in held),
                        key=lambda f: f.path in background_paths)[: settings.calibration_files]
    counts, kinds = count_tokens(f.tokens for f in files)
    vocabulary = build_vocabulary(counts, kinds, settings.vocabulary_size, settings.min_count)
    counted = time.monotonic()
    inputs, outputs = train_embeddings(files, vocabulary, settings, progress)
    embedded = time.monotonic()
    tables = build_tables(files, vocabulary, inputs, outputs, settings, background_paths)
    detector, threshold, quality = None, 0.0, {}
    reranker = None
    if held_files:
        examples = collect_examples(tables, held_files, settings.seed, settings.weights)
        if settings.use_reranker:
            reranker = train_reranker(examples)
        quality = summarise(examples)
        labels = np.array(examples.labels)
        if labels.size and 0 < labels.sum() < labels.size:
            features = np.array(examples.features)
            if settings.use_detector and labels.size >= 20:
                detector = fit_detector(features, labels)
                oddness = detector.oddness(features)
            else:
                oddness = features[:, 0]
            clean = labels == 0
            threshold = calibrate_by_files(oddness[clean], np.array(examples.example_files)[clean],
                                           np.array(examples.file_lines), settings.flag_budget)
            quality.update(detection_quality(oddness, labels, threshold, examples.lines))
            quality["calibration_lines"] = examples.lines
            if examples.lines < MIN_CALIBRATION_LINES:
                # Too little unseen code to set a threshold that holds: suggest names, flag none.
                threshold = math.inf
                quality["recall_at_threshold"] = 0.0
                quality["false_alarms_per_kloc"] = 0.0
    finished = time.monotonic()
    return TrainedModel(
        vocabulary, tables, detector, threshold, quality,
        counts={"files": len(corpus.files), "background_files": len(background_files),
                "training_files": len(files), "lines": corpus.lines,
                "tokens": corpus.tokens, "vocabulary": len(vocabulary), "names": len(tables.names),
                "calibration_files": len(held_files)},
        seconds={"vocabulary": round(counted - started, 2), "embeddings": round(embedded - counted, 2),
                 "names_and_calibration": round(finished - embedded, 2)},
        reranker=reranker,
    )


def train_reranker(examples: Examples) -> Reranker | None:
    """Fit the re-ranker on the seeded misnames' shortlists; recovery is then measured with it."""
    usable = [(rows, labels) for rows, labels in examples.shortlists if len(rows) and labels.sum() > 0]
    if len(usable) < 20:
        return None
    reranker = fit_reranker(np.vstack([rows for rows, _ in usable]), np.concatenate([labels for _, labels in usable]))
    ranks = []
    for rows, labels in examples.shortlists:
        if not len(rows) or labels.sum() == 0:
            ranks.append(0)
            continue
        scores = reranker.score(rows)
        truth = int(np.argmax(labels))
        rank = int((scores > scores[truth]).sum()) + 1
        ranks.append(rank if rank <= 10 else 0)
    examples.recovered_at = ranks
    return reranker


def summarise(examples: Examples) -> dict:
    ranks = np.array(examples.recovered_at)
    if ranks.size == 0:
        return {}
    return {"seeded": int(ranks.size),
            "recovery_at_1": round(float(((ranks >= 1) & (ranks <= 1)).mean()), 4),
            "recovery_at_5": round(float(((ranks >= 1) & (ranks <= 5)).mean()), 4)}


def detection_quality(oddness: np.ndarray, labels: np.ndarray, threshold: float, lines: int) -> dict:
    clean = oddness[labels == 0]
    seeded = oddness[labels == 1]
    return {"detection_auc": round(auc(seeded, clean), 4),
            "recall_at_threshold": round(float((seeded > threshold).mean()) if seeded.size else 0.0, 4),
            "false_alarms_per_kloc": round(float((clean > threshold).sum()) * 1000 / max(lines, 1), 3)}


def auc(positives: np.ndarray, negatives: np.ndarray) -> float:
    """Area under the ROC curve: the chance a positive outscores a negative (ties count half)."""
    if len(positives) == 0 or len(negatives) == 0:
        return float("nan")
    values = np.concatenate([positives, negatives])
    order = values.argsort(kind="mergesort")
    ranks = np.empty(len(values))
    sorted_values = values[order]
    # average ranks for ties
    unique, first, counts_ = np.unique(sorted_values, return_index=True, return_counts=True)
    average = first + (counts_ - 1) / 2.0 + 1
    ranks[order] = np.repeat(average, counts_)
    positive_ranks = ranks[: len(positives)].sum()
    return float((positive_ranks - len(positives) * (len(positives) + 1) / 2) / (len(positives) * len(negatives)))


def settings_dict(settings: TrainSettings) -> dict:
    data = asdict(settings)
    data.pop("workers", None)
    return data
