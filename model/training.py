"""Train embeddings and name tables from a corpus, calibrate each language's threshold, measure quality.

The name tables are sums over files, so every file of the team can be scored as if the model
had never seen it (`counts.Holdout`). The detector, the re-ranker and the thresholds learn from
a seeded sample of the whole repository scored that way; the shipped tables use every file.
"""

from __future__ import annotations

import hashlib
import multiprocessing
import os
import random
import time
from collections import Counter
from dataclasses import asdict, dataclass, field

import numpy as np

from .corpus import Corpus, SourceFile
from .counts import FileCounts, build_tables, count_file, evidence_vectors, forget_file
from .flow import build_index
from .forked import can_fork, forked_map, ignore_interrupts, interrupts_deferred
from .overrides import inherited_from, repository_classes
from .reuse import ExampleStore, PreviousVectors
from .reranking import TABLE_FEATURES, Reranker, fit_reranker, shortlist_features
from .scopes import Variable
from .suppression import is_kept
from .scoring import (IGNORED_NAMES, Detector, NameTables, Weights, allowed_mask, detection_features, flaggable,
                      FEATURE_NAMES, fit_detector, name_fit, rank_in_batches)
from .vocabulary import Vocabulary, build_vocabulary, count_tokens

MAX_SENTENCE = 10_000  # gensim silently truncates longer sentences
# A language with less code gets suggestions only: thresholds calibrated on less measured far off on new code.
MIN_LANGUAGE_LINES = 2_000


@dataclass
class TrainSettings:
    """Training choices; every one is stored in the model's manifest."""

    vocabulary_size: int = 50_000
    min_count: int = 2
    vector_size: int = 64
    window: int = 5
    epochs: int = 5
    warm_epochs: int = 5  # epochs over the changed files when continuing from the current model's vectors
    negative: int = 5
    seed: int = 1
    workers: int = field(default_factory=lambda: os.cpu_count() or 1)
    names_per_language: int = 5_000
    flag_budget: float = 1.0  # flags per 1,000 non-blank lines of clean code
    examples_per_language: int = 6_000  # variables scored as if unseen, to learn from and calibrate on
    embedding_weight: float = 0.0  # measured: the embeddings leak into scores of files the model has seen
    lexical_weight: float = 3.0
    count_weight: float = 1.0
    positional_counts: bool = True  # count each neighbour at its offset; False pools them (a bag)
    use_detector: bool = True
    use_reranker: bool = True
    use_flow: bool = True  # name flow: where values come from and go (flow.py)
    flag_contradictions_only: bool = True  # flag only names the team's naming at a cue contradicts
    background_weight: float = 0.3  # how much a background corpus file counts against a team file

    @property
    def weights(self) -> Weights:
        return Weights(embedding=self.embedding_weight, lexical=self.lexical_weight, counts=self.count_weight)


def _draw(seed: int, path: str) -> int:
    """A path's seeded 64-bit hash: file order for sampling, folds and held-out splits."""
    return int.from_bytes(hashlib.sha256(f"{seed}:{path}".encode()).digest()[:8], "big")


def split_files(paths: list[str], share: float, seed: int) -> tuple[set[str], set[str]]:
    """Split paths by a seeded hash: (kept, held out); the held-out share is about `share`."""
    held = {path for path in paths if (_draw(seed, path) >> 32) / 2**32 < share}
    return set(paths) - held, held


def train_embeddings(files: list[SourceFile], vocabulary: Vocabulary, settings: TrainSettings,
                     progress=None, previous: PreviousVectors | None = None) -> tuple[np.ndarray, np.ndarray]:
    """CBOW with negative sampling; returns input and output vectors in the vocabulary's row order.

    With `previous` vectors (last week's model), tokens it knew start from them and training
    reads only the files it did not learn from (new or changed), for `settings.warm_epochs`
    epochs; the vocabulary's counts (the negative samples' distribution) are the whole corpus's.
    """
    from gensim.models import Word2Vec
    from gensim.models.callbacks import CallbackAny2Vec

    warm = previous is not None and previous.inputs.shape[1] == settings.vector_size
    index = vocabulary.index
    unknown = vocabulary.tokens[0]
    sentences = []
    for source in files:
        if warm and previous.learned(source):
            continue
        texts = [t.text if t.text in index else unknown for t in source.tokens]
        for start in range(0, len(texts), MAX_SENTENCE):
            sentences.append(texts[start:start + MAX_SENTENCE])
    total_words = sum(len(s) for s in sentences)

    epochs = settings.warm_epochs if warm else settings.epochs

    class Progress(CallbackAny2Vec):
        def __init__(self):
            self.epoch = 0
            self.started = time.monotonic()

        def on_epoch_end(self, model):
            self.epoch += 1
            if progress:
                elapsed = time.monotonic() - self.started
                progress(self.epoch, epochs, total_words * self.epoch / max(elapsed, 1e-9),
                         elapsed / self.epoch * (epochs - self.epoch))

    model = Word2Vec(vector_size=settings.vector_size, window=settings.window, min_count=1, sg=0,
                     negative=settings.negative, hs=0, sample=0, workers=settings.workers, seed=settings.seed,
                     epochs=epochs)
    if warm:
        model.build_vocab_from_freq({token: count for token, count in zip(vocabulary.tokens, vocabulary.counts)
                                     if count > 0})
        known = {token: row for row, token in enumerate(previous.tokens)}
        for token, gensim_row in model.wv.key_to_index.items():
            row = known.get(token)
            if row is not None:
                model.wv.vectors[gensim_row] = previous.inputs[row]
                model.syn1neg[gensim_row] = previous.outputs[row]
    else:
        model.build_vocab(sentences)
    if sentences:
        model.train(sentences, total_examples=len(sentences), epochs=epochs, callbacks=[Progress()])
    dimensions = settings.vector_size
    inputs = np.zeros((len(vocabulary), dimensions), dtype=np.float32)
    outputs = np.zeros((len(vocabulary), dimensions), dtype=np.float32)
    for row, token in enumerate(vocabulary.tokens):
        gensim_row = model.wv.key_to_index.get(token)
        if gensim_row is not None:
            inputs[row] = model.wv.vectors[gensim_row]
            outputs[row] = model.syn1neg[gensim_row]
    return inputs, outputs


class EmbeddingRun:
    """train_embeddings in a forked process, so that the name tables, the examples and the
    calibration (which do not read the vectors) are built meanwhile; inline where fork is missing.

    `wait()` gives the vectors and the seconds the embeddings took on their own. Progress
    reports reach `progress` from a relay thread as the epochs end."""

    def __init__(self, files: list[SourceFile], vocabulary: Vocabulary, settings: TrainSettings,
                 progress=None, previous: PreviousVectors | None = None, overlap: bool = True):
        self.started = time.monotonic()
        self.result: tuple[np.ndarray, np.ndarray, float] | None = None
        self.process = None
        if not overlap or not can_fork():
            inputs, outputs = train_embeddings(files, vocabulary, settings, progress, previous)
            self.result = (inputs, outputs, time.monotonic() - self.started)
            return
        import threading

        context = multiprocessing.get_context("fork")
        self.receiver, sender = context.Pipe(duplex=False)
        self.process = context.Process(target=_embeddings_child, args=(sender, files, vocabulary, settings, previous),
                                       name="cognomen-embeddings", daemon=True)
        try:
            with interrupts_deferred():
                self.process.start()
        except KeyboardInterrupt:
            self.stop()
            raise
        sender.close()
        self.progress = progress
        self.failure: str | None = None
        self.relay = threading.Thread(target=self._relay, name="cognomen-embeddings-progress", daemon=True)
        self.relay.start()

    def _relay(self) -> None:
        try:
            while True:
                message = self.receiver.recv()
                if message[0] == "epoch":
                    if self.progress:
                        self.progress(*message[1])
                elif message[0] == "done":
                    self.result = message[1:]
                    return
                else:
                    self.failure = message[1]
                    return
        except (EOFError, OSError):
            self.failure = "the embeddings' process ended without its vectors"

    def wait(self) -> tuple[np.ndarray, np.ndarray, float]:
        if self.process is not None:
            self.relay.join()
            self.process.join()
            self.receiver.close()
            self.process = None
            if self.result is None:
                raise RuntimeError(self.failure or "the embeddings' process ended without its vectors")
        return self.result

    def stop(self) -> None:
        """End the forked process early (training failed or was interrupted)."""
        if self.process is not None:
            self.process.terminate()
            self.process.join()
            self.process = None


def _embeddings_child(sender, files, vocabulary, settings, previous) -> None:
    ignore_interrupts()
    started = time.monotonic()
    try:
        inputs, outputs = train_embeddings(files, vocabulary, settings,
                                           lambda *args: sender.send(("epoch", args)), previous)
        sender.send(("done", inputs, outputs, time.monotonic() - started))
    except BaseException as error:  # noqa: BLE001 - told to the parent, which raises it
        try:
            sender.send(("failed", f"training the embeddings failed: {error!r}"))
        except OSError:
            pass
    finally:
        sender.close()


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
    renamed = renamed_variable(variable, new_name)
    variables = [renamed if v is variable else v for v in source.variables]
    return SourceFile(source.path, source.language, source.digest, source.lines, tokens, variables), renamed


def renamed_variable(variable: Variable, new_name: str) -> Variable:
    """The variable under another name (its occurrences, masked in every context, stay where they are)."""
    return Variable(new_name, variable.kind, variable.occurrences, variable.scope_start, variable.scope_end,
                    variable.function, variable.public_parameter,
                    (variable.bound_names - {variable.name}) | {new_name}, variable.scope_kind,
                    variable.shorthand, variable.dictated, variable.owner, variable.cues)


def calibrate_by_files(oddness_clean: np.ndarray, files: np.ndarray, file_lines: np.ndarray, budget: float,
                       confidence: float = 0.95, resamples: int = 200, seed: int = 1,
                       floor: float | None = None) -> float:
    """The lowest threshold whose flags per 1,000 lines stay within budget in `confidence` of
    bootstrap resamples of whole files: odd-looking names cluster in a few files, so a
    threshold fitted to one sample of files flags more on the next.

    With a `floor` (below every oddness), flagging every name that can be flagged is a candidate
    too: where flaggable names are rare, the budget may hold with no threshold at all."""
    if len(oddness_clean) == 0:
        if floor is None:
            raise ValueError("no clean names to calibrate on")
        return floor
    # Fine steps over the top tenth, where a budget of about one flag per 1,000 lines usually falls;
    # coarser below, for when few names can be flagged at all.
    candidates = np.unique(np.quantile(oddness_clean, np.concatenate([np.linspace(0.0, 0.9, 181),
                                                                      np.linspace(0.9, 1.0, 201)])))
    if floor is not None:
        candidates = np.concatenate([[floor], candidates])
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


@dataclass
class Examples:
    """Detection features for real variables (label 0) and seeded misnames (label 1), and the
    re-ranker's shortlists, from files scored as if unseen."""

    features: list[np.ndarray] = field(default_factory=list)
    labels: list[int] = field(default_factory=list)
    flaggable: list[bool] = field(default_factory=list)
    contradicted: list[bool] = field(default_factory=list)  # see Flow.contradiction
    example_files: list[int] = field(default_factory=list)  # which sampled file each example came from
    recovered_at: list[int] = field(default_factory=list)  # rank of the true name, per seeded misname
    shortlists: list[tuple[np.ndarray, np.ndarray]] = field(default_factory=list)  # re-ranking rows and labels
    shortlist_files: list[int] = field(default_factory=list)
    paths: list[str] = field(default_factory=list)  # the sampled files
    file_lines: list[int] = field(default_factory=list)
    file_languages: list[str] = field(default_factory=list)
    team: list[bool] = field(default_factory=list)  # False for a background corpus's files


def sample_files(team: list[SourceFile], background: list[SourceFile], budget: int, seed: int) -> list[SourceFile]:
    """Files in a seeded order, per language until `budget` variables: the team's first, then a
    background corpus's to fill what the team's own code leaves."""
    order = sorted(team, key=lambda f: _draw(seed, f.path)) + sorted(background, key=lambda f: _draw(seed, f.path))
    taken: dict[str, int] = {}
    chosen = []
    for source in order:
        if taken.get(source.language, 0) >= budget:
            continue
        taken[source.language] = taken.get(source.language, 0) + len(source.variables)
        chosen.append(source)
    return chosen


def judged_variables(tables: NameTables, source: SourceFile) -> list[Variable]:
    """The variables whose names are the team's to choose (not dictated by a base, a protocol...)."""
    return [v for v in source.variables if v.name not in IGNORED_NAMES and not v.dictated and not (
        v.owner and v.kind == "parameter" and inherited_from(v.owner, v.function, source.facts, tables.classes))]


@dataclass
class FileExamples:
    """One file's examples: detection features and labels, and the seeded misnames' shortlists."""

    features: np.ndarray  # (n, len(FEATURE_NAMES))
    labels: np.ndarray  # (n,) 0 for a real name, 1 for a seeded misname
    flaggable: np.ndarray  # (n,) whether the name could be flagged at all (scoring.flaggable)
    shortlists: list[tuple[np.ndarray, np.ndarray]]  # re-ranking rows and which row is the true name
    recovered_at: list[int]  # rank of the true name by the combined score, per shortlist
    contradicted: np.ndarray | None = None  # (n,) whether the team's naming at a cue contradicts the name


def file_examples(tables: NameTables, source: SourceFile, share: FileCounts, seed: int,
                  weights: Weights | None = None) -> FileExamples:
    """A file's real variables and one seeded misname each, scored without the file's own share of the counts.
    The seeded names depend on the file alone (and the seed), so a file's examples can be kept for reuse."""
    rng = random.Random(f"{seed}:{source.path}")
    features, labels, shortlists, recovered, usable, contradicted = [], [], [], [], [], []
    judged = judged_variables(tables, source)
    if judged:
        holdout, ids = forget_file(tables, source, share.weight, share=share)
        local_names = file_local_names(source)
        for variable, ranking in zip(judged, rank_in_batches(tables, source, judged, ids, weights, holdout)):
            if ranking is None:
                continue
            fit = name_fit(tables, ranking, variable.name, weights)
            allowed = allowed_mask(tables, ranking, variable.bound_names, variable.name)
            if fit is not None:
                features.append(detection_features(tables, ranking, allowed, fit, variable.name, variable))
                labels.append(0)
                usable.append(flaggable(fit, variable.name))
                contradicted.append(_contradicted(ranking, variable.name))
            wrong = seed_misname(source, variable, rng, local_names)
            if wrong is None:
                continue
            # Own occurrences are masked in every context, so the ranking is the same after renaming.
            renamed = renamed_variable(variable, wrong)
            allowed = allowed_mask(tables, ranking, renamed.bound_names, wrong)
            listed, _, rows = shortlist_features(tables, ranking, allowed, renamed.bound_names, wrong,
                                                 weights or Weights())
            truth = np.array([name == variable.name for name in listed], dtype=float)
            shortlists.append((rows, truth))
            # Without the re-ranker, names are ranked by their combined score.
            recovered.append(_rank_of_truth(rows[:, 3], truth) if len(rows) else 0)
            fit = name_fit(tables, ranking, wrong, weights)
            if fit is not None:
                features.append(detection_features(tables, ranking, allowed, fit, wrong, renamed))
                labels.append(1)
                usable.append(flaggable(fit, wrong))
                contradicted.append(_contradicted(ranking, wrong))
    return FileExamples(np.array(features, dtype=np.float64).reshape(len(features), len(FEATURE_NAMES)),
                        np.array(labels, dtype=np.int64), np.array(usable, dtype=bool), shortlists, recovered,
                        np.array(contradicted, dtype=bool))


def _contradicted(ranking, name: str) -> bool:
    return ranking.flow is not None and ranking.flow.contradiction(name) is not None


def collect_examples(tables: NameTables, files: list[SourceFile], shares: dict[str, FileCounts], seed: int,
                     weights: Weights | None = None, background: frozenset[str] = frozenset(),
                     reuse=None, workers: int = 1) -> Examples:
    """Every sampled file's examples; `reuse(source)` may hand back a file's examples from an
    earlier training, and is told of the ones computed afresh. With several workers, files are
    scored in forked processes that share the tables (each file's examples depend on it alone)."""
    found_by_path = {}
    pending = []
    for source in files:
        found = reuse.get(source) if reuse is not None else None
        if found is None:
            pending.append(source)
        else:
            found_by_path[source.path] = found
    for source, found in zip(pending, _score_files(tables, pending, shares, seed, weights, workers)):
        found_by_path[source.path] = found
        if reuse is not None:
            reuse.put(source, found)
    examples = Examples()
    for source in files:
        file_number = len(examples.paths)
        examples.paths.append(source.path)
        examples.file_lines.append(source.lines)
        examples.file_languages.append(source.language)
        examples.team.append(source.path not in background)
        found = found_by_path[source.path]
        examples.features.extend(found.features)
        examples.labels.extend(found.labels.tolist())
        examples.flaggable.extend(found.flaggable.tolist())
        examples.contradicted.extend(found.contradicted.tolist() if found.contradicted is not None
                                     else [False] * len(found.labels))
        examples.example_files.extend([file_number] * len(found.labels))
        examples.shortlists.extend(found.shortlists)
        examples.recovered_at.extend(found.recovered_at)
        examples.shortlist_files.extend([file_number] * len(found.shortlists))
    return examples


def _score_files(tables: NameTables, files: list[SourceFile], shares: dict[str, FileCounts], seed: int,
                 weights: Weights | None, workers: int) -> list[FileExamples]:
    def score(source: SourceFile) -> FileExamples:
        return file_examples(tables, source, shares[source.path], seed, weights)

    if len(files) < 8:
        return [score(source) for source in files]
    # Larger files first, so that the processes finish together.
    order = sorted(range(len(files)), key=lambda k: -len(files[k].variables))
    return forked_map(score, files, workers, order)


KEPT_WEIGHT = 5  # a name the team kept on purpose counts as this many fitting names for the detector


def kept_examples(tables: NameTables, files: list[SourceFile], shares: dict[str, FileCounts],
                  accepted: dict[str, list[str]] | None, weights: Weights | None = None) -> list[np.ndarray]:
    """Detection features of every name the team kept on purpose, each scored as if its file were unseen."""
    found = []
    for source in files:
        kept = [v for v in judged_variables(tables, source) if is_kept(source, v, accepted)]
        if not kept:
            continue
        holdout, ids = forget_file(tables, source, share=shares[source.path])
        for variable, ranking in zip(kept, rank_in_batches(tables, source, kept, ids, weights, holdout)):
            fit = name_fit(tables, ranking, variable.name, weights) if ranking is not None else None
            if fit is not None:
                allowed = allowed_mask(tables, ranking, variable.bound_names, variable.name)
                found.append(detection_features(tables, ranking, allowed, fit, variable.name, variable))
    return found


@dataclass
class TrainedModel:
    """Everything a model bundle holds, before it is written."""

    vocabulary: Vocabulary
    tables: NameTables
    detector: Detector | None
    thresholds: dict[str, float]  # per language; absent: suggestions only
    quality: dict
    counts: dict
    seconds: dict
    reranker: Reranker | None = None
    languages: dict = field(default_factory=dict)  # per language: lines, threshold, why there is none
    reuse: dict = field(default_factory=dict)  # what was taken over from the last training


def train(corpus: Corpus, settings: TrainSettings, progress=None, background: Corpus | None = None,
          accepted: dict[str, list[str]] | None = None, previous: PreviousVectors | None = None,
          examples_store: ExampleStore | None = None) -> TrainedModel:
    """Vocabulary, embeddings, name tables, detector, re-ranker and thresholds from a lexed corpus.

    Names the team kept on purpose (keep-name comments, `accepted` names) teach the detector
    what fits. A weekly retrain passes the current model's vectors (`previous`) and a store of
    each file's examples (see reuse.py)."""
    started = time.monotonic()
    background_files = background.files if background else []
    background_paths = frozenset(f.path for f in background_files)
    everything = corpus.files + background_files
    counts, kinds = count_tokens(f.tokens for f in everything)
    vocabulary = build_vocabulary(counts, kinds, settings.vocabulary_size, settings.min_count)
    counted = time.monotonic()
    # The tables, examples and calibration do not read the vectors (unless the embeddings are given
    # a weight in the scores): they are built while the embeddings train in a process of their own.
    embeddings = EmbeddingRun(everything, vocabulary, settings, progress, previous,
                              overlap=not settings.weights.embedding)
    try:
        names_started = time.monotonic()
        if embeddings.result is not None:
            inputs, outputs, _ = embeddings.result
        else:
            inputs = outputs = np.zeros((len(vocabulary), settings.vector_size), dtype=np.float32)
        shares = {f.path: count_file(f, vocabulary,
                                     settings.background_weight if f.path in background_paths else 1.0,
                                     settings.positional_counts) for f in everything}
        sources = {f.path: f for f in everything}
        tables = build_tables(list(shares.values()), sources, vocabulary, inputs, outputs,
                              settings.names_per_language, settings.positional_counts, settings.seed, background_paths)
        tables.min_count = settings.min_count
        tables.flags_need_contradiction = settings.flag_contradictions_only and settings.use_flow
        tables.trained_files = {f.path: f.digest for f in corpus.files}
        tables.classes = repository_classes(corpus.files)
        if settings.use_flow:
            tables.flow = build_index(everything, background_paths,
                                      team_subtokens(corpus.files, None if background_files else kinds),
                                      settings.background_weight)
        sample = sample_files(corpus.files, background_files, settings.examples_per_language, settings.seed)
        examples = collect_examples(tables, sample, shares, settings.seed, settings.weights, background_paths,
                                    examples_store, settings.workers)
        kept = kept_examples(tables, corpus.files, shares, accepted, settings.weights)
        calibrated = calibrate_model(examples, corpus, settings, kept)
        names_seconds = time.monotonic() - names_started
        waited = time.monotonic()
        inputs, outputs, embedding_seconds = embeddings.wait()
        waited = time.monotonic() - waited
    except BaseException:
        embeddings.stop()
        raise
    placed = time.monotonic()
    if not tables.input_vectors.any():
        tables.set_vectors(inputs, outputs, evidence_vectors(tables.evidence_places, list(shares.values()), sources,
                                                             vocabulary, inputs))
    names_seconds += time.monotonic() - placed
    return TrainedModel(
        vocabulary, tables, calibrated.detector, calibrated.thresholds, calibrated.quality,
        counts={"files": len(corpus.files), "background_files": len(background_files),
                "lines": corpus.lines, "tokens": corpus.tokens, "vocabulary": len(vocabulary),
                "names": len(tables.names), "calibration_files": len(sample)},
        # The embeddings and the names stage run side by side: each one's own seconds, and how long
        # the names stage then waited for the embeddings.
        seconds={"vocabulary": round(counted - started, 2), "embeddings": round(embedding_seconds, 2),
                 "names_and_calibration": round(names_seconds, 2), "waiting_for_embeddings": round(waited, 2)},
        reuse={"embeddings": "continued" if previous is not None else "from scratch",
               "examples_reused": examples_store.reused if examples_store else 0,
               "examples_computed": examples_store.computed if examples_store else len(sample)},
        reranker=calibrated.reranker, languages=calibrated.languages,
    )


@dataclass
class Calibration:
    detector: Detector | None
    reranker: Reranker | None
    thresholds: dict[str, float]
    quality: dict
    languages: dict


def calibrate_model(examples: Examples, corpus: Corpus, settings: TrainSettings,
                    kept: list[np.ndarray] | None = None) -> Calibration:
    """Fit the detector and re-ranker, set each language's threshold, and measure quality.

    Quality and thresholds use cross-fitted scores: each file's examples are scored by a
    detector and re-ranker fitted on the other half of the files.
    """
    folds = np.array([_draw(settings.seed + 1, path) % 2 for path in examples.paths], dtype=np.int64)
    reranker, ranks = None, np.array(examples.recovered_at)
    if settings.use_reranker:
        reranker, ranks = train_reranker(examples, folds)
    # The held-out figures describe the team's own code. A background corpus teaches the fits, but
    # measured with it, a small repository's figures were mostly the background's, and a model
    # trained with a background could not be compared with one trained without.
    team = np.array(examples.team, dtype=bool)
    example_files = np.array(examples.example_files, dtype=np.int64)
    in_team = team[np.array(examples.shortlist_files, dtype=np.int64)] if examples.shortlists else np.zeros(0, bool)
    quality = summarise(ranks[in_team])
    labels = np.array(examples.labels)
    features = np.array(examples.features, dtype=np.float64).reshape(len(labels), len(FEATURE_NAMES))
    detector, oddness = None, features[:, 0] if len(labels) else np.zeros(0)
    if settings.use_detector and labels.size >= 20 and 0 < labels.sum() < labels.size:
        fit_on, fit_labels = features, labels
        if kept:
            fit_on = np.vstack([features] + [np.array(kept)] * KEPT_WEIGHT)
            fit_labels = np.concatenate([labels, np.zeros(len(kept) * KEPT_WEIGHT)])
        detector = fit_detector(fit_on, fit_labels)
        oddness = _cross_fitted(features, labels, folds[np.array(examples.example_files, dtype=np.int64)],
                                detector)
    languages = language_lines(corpus)
    thresholds: dict[str, float] = {}
    report: dict[str, dict] = {}
    usable = np.array(examples.flaggable, dtype=bool)
    every_flaggable = usable
    gated = settings.flag_contradictions_only and settings.use_flow
    if gated:
        usable = usable & np.array(examples.contradicted, dtype=bool)
    file_lines = np.array(examples.file_lines, dtype=np.int64)
    file_languages = np.array(examples.file_languages, dtype=object)
    flagged_clean, clean_lines, recalled, seeded = 0, 0, 0, 0
    for language, lines in sorted(languages.items()):
        entry = report[language] = {"lines": lines}
        if lines < MIN_LANGUAGE_LINES:
            entry["suggestions_only"] = (f"{lines:,} lines of {language}, under {MIN_LANGUAGE_LINES:,}: too little "
                                         f"code to set a threshold that holds on new code")
            continue
        in_language = (file_languages[example_files] == language) & team[example_files] if len(labels) else \
            np.zeros(0, bool)
        clean = in_language & (labels == 0) & usable  # a name that can never be flagged is no false alarm
        if not (in_language & (labels == 0) & every_flaggable).any() or not (in_language & (labels == 1)).any():
            entry["suggestions_only"] = f"no {language} variables could be scored to calibrate on"
            continue
        sampled_files = np.flatnonzero((file_languages == language) & team)
        numbering = {number: position for position, number in enumerate(sampled_files)}
        # Only contradicted names can be flagged, and they are rare in clean code: where flagging every
        # one keeps within the budget, there is no higher threshold to set.
        floor = float(oddness[in_language].min()) - 1.0 if gated else None
        threshold = calibrate_by_files(oddness[clean], np.array([numbering[f] for f in example_files[clean]]),
                                       file_lines[sampled_files], settings.flag_budget, floor=floor)
        if gated:
            entry["contradicted_clean_names"] = int(clean.sum())
            entry["every_contradicted_name"] = floor is not None and threshold == floor
        thresholds[language] = threshold
        entry["threshold"] = round(threshold, 4)
        entry["calibration_lines"] = int(file_lines[sampled_files].sum())
        flagged_clean += int((oddness[clean] > threshold).sum())
        clean_lines += int(file_lines[sampled_files].sum())
        positives = in_language & (labels == 1)
        recalled += int((oddness[positives & usable] > threshold).sum())
        seeded += int(positives.sum())
    team_examples = team[example_files] if len(labels) else np.zeros(0, bool)
    if (team_examples & (labels == 1)).any() and (team_examples & (labels == 0)).any():
        quality["detection_auc"] = round(auc(oddness[team_examples & (labels == 1)],
                                             oddness[team_examples & (labels == 0)]), 4)
    if seeded:
        quality["recall_at_threshold"] = round(recalled / seeded, 4)
        quality["false_alarms_per_kloc"] = round(flagged_clean * 1000 / max(clean_lines, 1), 3)
    quality["calibration_lines"] = int(file_lines[team].sum()) if len(file_lines) else 0
    if kept:
        quality["kept_names"] = len(kept)
    return Calibration(detector, reranker, thresholds, quality, report)


def team_subtokens(files: list[SourceFile], kinds: dict[str, Counter] | None = None) -> frozenset[str]:
    """Every sub-token of the team's identifiers: what a string key must be made of to count.
    `kinds` (count_tokens' second answer over exactly these files) saves reading them again."""
    from .tokens import split_identifier

    if kinds is not None:
        identifiers = {text for text, found in kinds.items() if found.get("name")}
    else:
        identifiers = {t.text for source in files for t in source.tokens if t.kind == "name"}
    return frozenset(part for identifier in identifiers for part in split_identifier(identifier))


def language_lines(corpus: Corpus) -> dict[str, int]:
    """Non-blank lines of the team's code per language."""
    lines: dict[str, int] = {}
    for source in corpus.files:
        lines[source.language] = lines.get(source.language, 0) + source.lines
    return lines


def _cross_fitted(features: np.ndarray, labels: np.ndarray, folds: np.ndarray, whole: Detector) -> np.ndarray:
    """Each example's oddness from a detector fitted on the other fold (the whole fit where a fold is too small)."""
    oddness = whole.oddness(features)
    for fold in (0, 1):
        train_on, score = folds != fold, folds == fold
        if score.any() and labels[train_on].size >= 20 and 0 < labels[train_on].sum() < labels[train_on].size:
            oddness[score] = fit_detector(features[train_on], labels[train_on]).oddness(features[score])
    return oddness


def train_reranker(examples: Examples, folds: np.ndarray) -> tuple[Reranker | None, np.ndarray]:
    """Fit the re-ranker on the seeded misnames' shortlists; each shortlist is ranked by a re-ranker
    fitted on the other fold, for the quality figures."""
    files = folds[np.array(examples.shortlist_files, dtype=np.int64)] if examples.shortlists else np.zeros(0, int)
    usable = [k for k, (rows, labels) in enumerate(examples.shortlists) if len(rows) and labels.sum() > 0]
    if len(usable) < 20:
        return None, np.array(examples.recovered_at)

    # The true name and the dozen names that compete with it most: the rest teach the fit little.
    nearest = {k: _nearest(*examples.shortlists[k]) for k in usable}

    def fit(indices):
        kept = [nearest[k] for k in indices]
        return fit_reranker(np.vstack([rows for rows, _ in kept]), np.concatenate([labels for _, labels in kept]))

    whole = fit(usable)
    per_fold = {}
    for fold in (0, 1):
        others = [k for k in usable if files[k] != fold]
        per_fold[fold] = fit(others) if len(others) >= 20 else whole
    ranks = [_rank_of_truth(per_fold[int(files[k])].score(rows), labels) if len(rows) else 0
             for k, (rows, labels) in enumerate(examples.shortlists)]
    return whole, np.array(ranks)


def _nearest(rows: np.ndarray, labels: np.ndarray, others: int = 12) -> tuple[np.ndarray, np.ndarray]:
    """A shortlist cut to its true name, the `others` best-combined names and every name the cues back."""
    if len(rows) <= others + 1:
        return rows, labels
    order = np.argsort(-rows[:, 3], kind="stable")  # column 3: the combined score
    backed = np.flatnonzero(rows[:, len(TABLE_FEATURES):len(TABLE_FEATURES) + 5].any(axis=1))
    keep = np.union1d(np.union1d(order[:others], np.flatnonzero(labels)), backed)
    return rows[keep], labels[keep]


def _rank_of_truth(scores: np.ndarray, truth: np.ndarray) -> int:
    """1-based rank of the true name among the scored names; 0 when it is absent or below tenth."""
    if not truth.any():
        return 0
    rank = int((scores > scores[int(np.argmax(truth))]).sum()) + 1
    return rank if rank <= 10 else 0


def summarise(ranks: np.ndarray) -> dict:
    if ranks.size == 0:
        return {}
    return {"seeded": int(ranks.size),
            "recovery_at_1": round(float(((ranks >= 1) & (ranks <= 1)).mean()), 4),
            "recovery_at_5": round(float(((ranks >= 1) & (ranks <= 5)).mean()), 4)}


def settings_dict(settings: TrainSettings) -> dict:
    data = asdict(settings)
    data.pop("workers", None)
    return data
