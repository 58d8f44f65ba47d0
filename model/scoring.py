"""Context vectors, candidate names, scores, oddness and evidence for each variable."""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from itertools import repeat
from operator import attrgetter
from typing import ClassVar

import numpy as np

from .corpus import SourceFile
from .flow import Flow, FlowIndex, FlowView, file_flow, variable_flow
from .languages import get_language
from .scopes import RECEIVER_NAMES, Variable
from .tokens import NAME, case_style, fits_style, split_identifier
from .vocabulary import PAD_TOKEN, SELF_TOKEN, Vocabulary

WINDOW = 3  # neighbours each side for the position-specific counts
EMBEDDING_WINDOW = 5  # neighbours each side for the CBOW context vector
LEXICAL_WINDOW = 10  # neighbours each side whose sub-tokens count as lexical context
MAX_OCCURRENCES = 24  # occurrences beyond this add little and cost time
SMOOTHING = 8.0  # Dirichlet prior strength for the position-specific counts
STOP_SUBTOKENS = frozenset({"self", "cls", "this"})
IGNORED_NAMES = RECEIVER_NAMES | {"_", "__"}

def reserved_words(language: str) -> frozenset[str]:
    """Keywords and builtins of a language: never suggested as a name."""
    return get_language(language).reserved


@dataclass
class NameTables:
    """What scoring needs from a trained model, as plain arrays and lists."""

    vocabulary: Vocabulary
    input_vectors: np.ndarray  # (V, d) float32
    output_vectors: np.ndarray  # (V, d) float32
    names: list[str]  # candidate rows: local names the team uses
    name_languages: list[str]
    name_counts: np.ndarray  # (C,) float32
    name_vocab_rows: np.ndarray  # (C,) int32
    styles: dict[str, str]  # dominant case style of local names per language
    feature_keys: np.ndarray  # (F,) int64, sorted: offset slot * V + token id
    feature_totals: np.ndarray  # (F,) float32
    context_indptr: np.ndarray  # (F + 1,) int64
    context_columns: np.ndarray  # (nnz,) int32 candidate rows
    context_counts: np.ndarray  # (nnz,) float32
    evidence_rows: np.ndarray  # (E,) int32 candidate row, sorted
    evidence_paths: list[str]
    evidence_path_ids: np.ndarray  # (E,) int32
    evidence_lines: np.ndarray  # (E,) int32
    evidence_vectors: np.ndarray  # (E, d) float32
    total_occurrences: float = 1.0
    name_suggestable: np.ndarray | None = None  # (C,) bool: may be offered as a new name
    variables_per_language: dict[str, int] = field(default_factory=dict)
    positional: bool = True  # context counts keep each neighbour's offset (False: a bag of neighbours)
    flow: FlowIndex = field(default_factory=FlowIndex)  # names the team gives at each cue (flow.py)
    trained_files: dict[str, str] = field(default_factory=dict)  # the team's files the counts include: their hashes
    classes: dict = field(default_factory=dict)  # the team's classes: bases and methods (overrides.py)
    min_count: int = 2  # the vocabulary's minimum count
    flags_need_contradiction: bool = False  # flag only names the team's naming at a cue contradicts

    def raw_counts(self, language: str):
        """Context counts (features x this language's candidates) as a sparse matrix, built on first use."""
        found = self._raw_counts.get(language)
        if found is None:
            from scipy.sparse import csr_matrix

            matrix = csr_matrix((np.asarray(self.context_counts, dtype=np.float32), np.asarray(self.context_columns),
                                 np.asarray(self.context_indptr)), shape=(len(self.feature_keys), len(self.names)))
            found = self._raw_counts[language] = matrix[:, self.rows_by_language[language]].tocsr()
        return found

    def set_vectors(self, inputs: np.ndarray, outputs: np.ndarray, evidence_vectors: np.ndarray) -> None:
        """The embeddings and the evidence places' context vectors, once trained (see counts.evidence_vectors)."""
        self.input_vectors, self.output_vectors, self.evidence_vectors = inputs, outputs, evidence_vectors
        self._output_by_language = {lang: np.asarray(self.output_vectors[self.name_vocab_rows[rows]], dtype=np.float32)
                                    for lang, rows in self.rows_by_language.items()}

    def __post_init__(self) -> None:
        self.row_by_name = {(lang, name): row for row, (lang, name) in enumerate(zip(self.name_languages, self.names))}
        self.rows_by_language: dict[str, np.ndarray] = {}
        languages = np.array(self.name_languages, dtype=object)
        for language in set(self.name_languages):
            self.rows_by_language[language] = np.flatnonzero(languages == language).astype(np.int64)
        self.name_subtokens = [frozenset(split_identifier(n)) - STOP_SUBTOKENS for n in self.names]
        self.subtoken_sizes = np.array([max(len(s), 1) for s in self.name_subtokens], dtype=np.float64)
        self.name_parts = np.array([len(split_identifier(n)) for n in self.names], dtype=np.float64)
        postings: dict[str, list[int]] = {}
        for row, subtokens in enumerate(self.name_subtokens):
            for subtoken in subtokens:
                postings.setdefault(subtoken, []).append(row)
        self.rows_with_subtoken = {k: np.array(v, dtype=np.int64) for k, v in postings.items()}
        self.static_allowed = np.zeros(len(self.names), dtype=bool)
        for language, rows in self.rows_by_language.items():
            reserved = reserved_words(language)
            style = self.styles.get(language, "snake")
            for row in rows:
                name = self.names[row]
                self.static_allowed[row] = (name not in reserved and name not in IGNORED_NAMES
                                            and not name.startswith("_") and fits_style(name, style))
        if self.name_suggestable is not None and len(self.name_suggestable) == len(self.names):
            self.static_allowed &= np.asarray(self.name_suggestable, dtype=bool)
        # Small arrays are read element by element: keep them in memory rather than memory-mapped.
        for name in ("name_counts", "name_vocab_rows", "evidence_rows", "evidence_path_ids", "evidence_lines",
                     "feature_keys", "feature_totals"):
            setattr(self, name, np.array(getattr(self, name)))
        self.bound_masks: dict[tuple[str, frozenset[str]], np.ndarray] = {}  # see allowed_mask
        self.evidence_start = np.searchsorted(self.evidence_rows, np.arange(len(self.names) + 1))
        self.path_id = {path: number for number, path in enumerate(self.evidence_paths)}
        self.log_counts = np.log(self.name_counts.astype(np.float64) + 1.0)
        self.log_count_smoothed = np.log(self.name_counts.astype(np.float64) + SMOOTHING)
        self.self_id = self.vocabulary.id(SELF_TOKEN)
        self.pad_id = self.vocabulary.id(PAD_TOKEN)
        self._output_by_language = {lang: np.asarray(self.output_vectors[self.name_vocab_rows[rows]], dtype=np.float32)
                                    for lang, rows in self.rows_by_language.items()}
        # Each context feature's evidence for each name, log1p(count / prior), as one sparse matrix per language.
        from scipy.sparse import csr_matrix

        features = len(self.feature_keys)
        entries = np.repeat(np.arange(features), np.diff(np.asarray(self.context_indptr)))
        prior = SMOOTHING * np.asarray(self.feature_totals, dtype=np.float64) / self.total_occurrences
        values = np.log1p(np.asarray(self.context_counts, dtype=np.float64) / prior[entries]).astype(np.float32)
        evidence = csr_matrix((values, np.asarray(self.context_columns), np.asarray(self.context_indptr)),
                              shape=(features, len(self.names)))
        self.context_evidence = {lang: evidence[:, rows].tocsr() for lang, rows in self.rows_by_language.items()}
        self._raw_counts: dict = {}
        self.subtoken_columns: dict[str, dict[str, np.ndarray]] = {}
        for language, rows in self.rows_by_language.items():
            local = {int(row): column for column, row in enumerate(rows)}
            self.subtoken_columns[language] = {
                subtoken: np.array([local[r] for r in found if int(r) in local], dtype=np.int64)
                for subtoken, found in self.rows_with_subtoken.items()}


@dataclass
class Suggestion:
    name: str
    score: float
    evidence: list[tuple[str, int]] = field(default_factory=list)
    reason: str = ""  # what in the variable's flow backs the name, in words
    in_file: bool = False  # its evidence is where another variable of the same file is so called


class FileNames:
    """The names a file gives its variables: how many variables take each, and where the first is."""

    __slots__ = ("path", "counts", "lines", "_ordered", "_positions")

    def __init__(self, source: SourceFile):
        self.path = source.path
        self.counts: dict[str, int] = {}
        self.lines: dict[str, int] = {}
        for variable in source.variables:
            self.counts[variable.name] = self.counts.get(variable.name, 0) + 1
            if variable.name not in self.lines:
                self.lines[variable.name] = source.tokens[variable.occurrences[0]].line
        self._ordered: list[str] | None = None
        self._positions: dict[str, np.ndarray] = {}

    def table_positions(self, tables: "NameTables", language: str, rows: np.ndarray) -> np.ndarray:
        """For each of `most_given()`, its position among a language's candidate rows, or -1."""
        found = self._positions.get(language)
        if found is None:
            table_rows = [tables.row_by_name.get((language, name), -1) for name in self.most_given()]
            found = np.array([int(np.searchsorted(rows, row)) if row >= 0 else -1 for row in table_rows],
                             dtype=np.int64)
            self._positions[language] = found
        return found

    def most_given(self) -> list[str]:
        """The names, those the most variables take first."""
        if self._ordered is None:
            self._ordered = sorted(self.counts, key=lambda name: -self.counts[name])
        return self._ordered

    def has_other(self, name: str, own: str) -> bool:
        """Whether a variable other than the one called `own` is called `name`."""
        return self.counts.get(name, 0) > (name == own)

    def other(self, name: str, own: str) -> tuple[str, int] | None:
        """Where a variable other than the one called `own` is called `name`."""
        return (self.path, self.lines[name]) if self.has_other(name, own) else None


@dataclass
class Ranking:
    """Scores of every candidate of the variable's language, computed once per variable."""

    language: str
    rows: np.ndarray  # candidate rows of this language
    count_scores: np.ndarray
    embedding_scores: np.ndarray
    lexical_scores: np.ndarray
    combined: np.ndarray
    context_vector: np.ndarray
    context_subtokens: frozenset[str]
    occurrences: int
    unseen_count: float = 0.0  # the count score of a name never seen as a local
    embedding_normaliser: float = 0.0  # log-sum-exp of the candidates' embedding logits
    context_identifiers: frozenset[str] = frozenset()
    called_identifiers: frozenset[str] = frozenset()
    known: np.ndarray | None = None  # candidates a model without the held-out file would hold (None: all)
    held_counts: np.ndarray | None = None  # each candidate's use count without the held-out file
    own_place: tuple[str, int, int] | None = None  # the variable's file and scope lines: never its own evidence
    flow: Flow | None = None  # what the variable's cues say about its name
    unseen: frozenset[str] = frozenset()  # tokens a model without the held-out file would not know
    file_names: "FileNames | None" = None  # the names of the file's variables, where each is first given
    name: str = ""  # the variable's own name when ranked

    def in_file(self, name: str) -> float:
        """1.0 when another variable of the same file is called `name`, else 0.0 (a feature)."""
        return 1.0 if self.file_names is not None and self.file_names.has_other(name, self.name) else 0.0

    def named_in_file(self, name: str) -> tuple[str, int] | None:
        """Where another variable of the same file is called `name` (path, line), or None."""
        if self.file_names is None:
            return None
        return self.file_names.other(name, self.name)

    def name_count(self, tables: "NameTables", row: int) -> float:
        """How often the team used a candidate's name (without the held-out file, if any)."""
        if self.held_counts is None:
            return float(tables.name_counts[row])
        return float(self.held_counts[int(np.searchsorted(self.rows, row))])


@dataclass
class Judgement:
    """How well a variable's name fits: oddness (None when the name cannot be judged) and suggestions."""

    variable: Variable
    oddness: float | None
    suggestions: list[Suggestion]
    features: np.ndarray | None = None
    dictated: str = ""  # why the name is never judged
    flaggable: bool = True  # whether the name can be flagged at all (see `flaggable`)
    agreement: float | None = None  # where a cue contradicts the name: the team's share of the name it gives


# --- contexts ---------------------------------------------------------------------------


def token_ids(source: SourceFile, vocabulary: Vocabulary) -> np.ndarray:
    return np.fromiter(map(vocabulary.index.get, map(_TEXT, source.tokens), repeat(0)), dtype=np.int64,
                       count=len(source.tokens))


_TEXT = attrgetter("text")


def lexical_context(source: SourceFile, variable: Variable) -> tuple[frozenset[str], frozenset[str], frozenset[str]]:
    """Sub-tokens of other identifiers near the variable's uses (and of its function's name),
    those identifiers themselves, and the ones among them that are called."""
    own = set(variable.occurrences)
    tokens = source.tokens
    identifiers: set[str] = set()
    called: set[str] = set()
    for position in variable.occurrences[:MAX_OCCURRENCES]:
        for j in range(max(0, position - LEXICAL_WINDOW), min(len(tokens), position + LEXICAL_WINDOW + 1)):
            if j not in own and tokens[j].kind == NAME:
                identifiers.add(tokens[j].text)
                if j + 1 < len(tokens) and tokens[j + 1].text == "(":
                    called.add(tokens[j].text)
    found: set[str] = set(split_identifier(variable.function)) if variable.function else set()
    for identifier in identifiers:
        found.update(split_identifier(identifier))
    return frozenset(found - STOP_SUBTOKENS), frozenset(identifiers - RECEIVER_NAMES), frozenset(called)


def lexical_fit(subtokens: frozenset[str], context: frozenset[str]) -> float:
    """Share of a name's sub-tokens that appear among its context's sub-tokens."""
    if not subtokens:
        return 0.0
    return len(subtokens & context) / len(subtokens)


# --- scoring ----------------------------------------------------------------------------


@dataclass
class Weights:
    """How the three scores combine into one ranking."""

    embedding: float = 0.0
    lexical: float = 3.0
    counts: float = 1.0


def rank_candidates(tables: NameTables, source: SourceFile, variable: Variable, ids: np.ndarray,
                    weights: Weights | None = None) -> Ranking | None:
    """Score every candidate name of the variable's language against its contexts."""
    return rank_many(tables, source, [variable], ids, weights)[0]


_OFFSETS = np.concatenate([np.arange(-WINDOW, 0), np.arange(1, WINDOW + 1)])
_EMBEDDING_OFFSETS = np.concatenate([np.arange(-EMBEDDING_WINDOW, 0), np.arange(1, EMBEDDING_WINDOW + 1)])
_EMBEDDING_WEIGHTS = (EMBEDDING_WINDOW + 1 - np.abs(_EMBEDDING_OFFSETS)) / EMBEDDING_WINDOW


def rank_many(tables: NameTables, source: SourceFile, variables: list[Variable], ids: np.ndarray,
              weights: Weights | None = None, holdout=None, view: FlowView | None = None,
              file_names: FileNames | None = None) -> list[Ranking | None]:
    """rank_candidates for many variables of one file at once (the same numbers, far faster).

    With a `holdout` (counts.Holdout) the file's own share of the counts is taken out first,
    so the file is scored as a model trained without it would score it.
    """
    weights = weights or Weights()
    rows = tables.rows_by_language.get(source.language)
    if rows is None or len(rows) == 0 or not variables:
        return [None] * len(variables)
    positions, owners, counts = occurrence_table(variables)
    count_scores = _count_scores(tables, source.language, rows, ids, positions, owners, counts, len(variables),
                                 holdout)
    known, held_counts = None, None
    if holdout is not None:
        known, held_counts = holdout.known_rows(tables, rows), holdout.counts(tables, rows)
    unseen_count = -2 * WINDOW * math.log(SMOOTHING)
    vectors = context_vectors(tables.input_vectors, tables.self_id, tables.pad_id, ids, positions, owners,
                              len(variables))
    if weights.embedding:
        logits = vectors @ tables._output_by_language[source.language].T
        top = logits.max(axis=1, keepdims=True)
        normalisers = (top + np.log(np.exp(logits - top).sum(axis=1, keepdims=True))).ravel()
        embedding_scores = logits - normalisers[:, None]
    else:
        # Measured: in-sample embeddings make a file's own names fit too well when it is scored as
        # if unseen, and the thresholds then flag ten times the budget on new code.
        normalisers = np.zeros(len(variables), dtype=np.float32)
        embedding_scores = np.zeros((len(variables), len(rows)), dtype=np.float32)
    contexts, identifiers, called = [], [], []
    postings = tables.subtoken_columns[source.language]
    sizes = tables.subtoken_sizes[rows].astype(np.float32)
    hits = []  # flat (variable, candidate) cells, one per shared sub-token
    for index, variable in enumerate(variables):
        subtokens, near, calls = lexical_context(source, variable)
        contexts.append(subtokens)
        identifiers.append(near)
        called.append(calls)
        for subtoken in subtokens:
            columns = postings.get(subtoken)
            if columns is not None and len(columns):
                hits.append(columns + index * len(rows))
    lexical_scores = np.bincount(np.concatenate(hits) if hits else np.zeros(0, np.int64),
                                 minlength=len(variables) * len(rows)).astype(np.float32).reshape(len(variables), -1)
    lexical_scores /= sizes[None, :]
    combined = count_scores * np.float32(weights.counts)
    if weights.embedding:
        combined += embedding_scores * np.float32(weights.embedding)
    combined += lexical_scores * np.float32(weights.lexical)
    view = view or file_view(tables, source, holdout)
    style = tables.styles.get(source.language, get_language(source.language).naming_style)
    reserved = reserved_words(source.language)
    flows = [variable_flow(v, view, style, _name_filter(v, reserved), 1.0) if v.cues else None for v in variables]
    names = file_names if file_names is not None else FileNames(source)
    return [Ranking(source.language, rows, count_scores[i], embedding_scores[i], lexical_scores[i], combined[i],
                    vectors[i], contexts[i], int(counts[i]), unseen_count, float(normalisers[i]),
                    identifiers[i], called[i], known, held_counts,
                    (source.path, 0, 10**9) if holdout is not None and holdout.whole_file else
                    (source.path, variables[i].scope_start, variables[i].scope_end), flows[i],
                    holdout.unseen if holdout is not None else frozenset(), names, variables[i].name)
            for i in range(len(variables))]


def _name_filter(variable: Variable, reserved: frozenset[str]):
    """Names a variable's cues may put forward: its own, or any not bound in its scope nor reserved."""
    bound = variable.bound_names

    def allowed(name: str) -> bool:
        return name == variable.name or (name not in bound and name not in reserved and name not in IGNORED_NAMES
                                         and not name.startswith("_"))
    return allowed


def rank_in_batches(tables: NameTables, source: SourceFile, variables: list[Variable], ids: np.ndarray,
                    weights: Weights | None = None, holdout=None, batch: int = 128) -> list[Ranking | None]:
    """rank_many over a whole file, a batch at a time: a file's variables times a language's
    candidates is too large a matrix to hold at once."""
    rankings: list[Ranking | None] = []
    view = file_view(tables, source, holdout)
    names = FileNames(source)
    for start in range(0, len(variables), batch):
        rankings.extend(rank_many(tables, source, variables[start:start + batch], ids, weights, holdout, view,
                                  names))
    return rankings


def file_view(tables: NameTables, source: SourceFile, holdout=None) -> FlowView:
    """The flow index as the file sees it: less what the model learned from it, plus the file as it is."""
    if holdout is not None and holdout.flow is not None and holdout.flow_is_current:
        return FlowView(tables.flow)  # the file as the model learned it is the file as it is
    return FlowView(tables.flow, holdout.flow if holdout is not None else None, file_flow(source.variables))


def occurrence_table(variables: list[Variable]) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Every judged occurrence's token index, the variable it belongs to, and occurrences per variable."""
    counts = np.array([min(len(v.occurrences), MAX_OCCURRENCES) for v in variables], dtype=np.int64)
    positions = np.fromiter((i for v in variables for i in v.occurrences[:MAX_OCCURRENCES]), dtype=np.int64,
                            count=int(counts.sum()))
    owners = np.repeat(np.arange(len(variables)), counts)
    return positions, owners, counts


def _window(ids: np.ndarray, positions: np.ndarray, owners: np.ndarray, offsets: np.ndarray,
            own_keys: np.ndarray, self_id: int, pad_id: int) -> np.ndarray:
    where = positions[:, None] + offsets[None, :]
    inside = (where >= 0) & (where < len(ids))
    context = np.where(inside, ids[np.clip(where, 0, max(len(ids) - 1, 0))], pad_id)
    keys = owners[:, None] * (len(ids) + 1) + where
    context[np.isin(keys, own_keys)] = self_id
    return context


def _own_keys(variables_positions: np.ndarray, owners: np.ndarray, ids_length: int) -> np.ndarray:
    return owners * (ids_length + 1) + variables_positions


def _count_scores(tables: NameTables, language: str, rows: np.ndarray, ids: np.ndarray, positions: np.ndarray,
                  owners: np.ndarray, counts: np.ndarray, variables: int, holdout=None) -> np.ndarray:
    from scipy.sparse import csr_matrix

    own = _own_keys(positions, owners, len(ids))
    contexts = _window(ids, positions, owners, _OFFSETS, own, tables.self_id, tables.pad_id)
    slots = np.arange(contexts.shape[1], dtype=np.int64) if tables.positional else np.zeros(contexts.shape[1], np.int64)
    keys = (slots[None, :] * len(tables.vocabulary) + contexts).ravel()
    feature_owners = np.repeat(owners, contexts.shape[1])
    # Scores are float32 throughout: a file's variables times a language's candidates is a large
    # matrix, and these sums need no more precision.
    if holdout is not None:
        base = holdout.base(tables, rows)
    else:
        base = (tables.log_counts[rows] - 2 * WINDOW * tables.log_count_smoothed[rows]).astype(np.float32)
    if len(tables.feature_keys) == 0:
        return np.tile(base, (variables, 1))
    found = np.clip(np.searchsorted(tables.feature_keys, keys), 0, len(tables.feature_keys) - 1)
    valid = tables.feature_keys[found] == keys
    weights = (1.0 / counts[feature_owners[valid]]).astype(np.float32)  # the evidence is float32: stay in it
    if holdout is None:
        features = csr_matrix((weights, (feature_owners[valid], found[valid])),
                              shape=(variables, len(tables.feature_keys)))
        scores = (features @ tables.context_evidence[language]).toarray()
    else:
        used, columns = np.unique(found[valid], return_inverse=True)
        features = csr_matrix((weights, (feature_owners[valid], columns.ravel())), shape=(variables, len(used)))
        scores = (features @ holdout.evidence(tables, language, used)).toarray()
    scores += base
    return scores


def context_vectors(input_vectors: np.ndarray, self_id: int, pad_id: int, ids: np.ndarray, positions: np.ndarray,
                    owners: np.ndarray, variables: int) -> np.ndarray:
    """Each variable's CBOW context vector: nearer neighbours of its uses weigh more, itself masked."""
    own = _own_keys(positions, owners, len(ids))
    contexts = _window(ids, positions, owners, _EMBEDDING_OFFSETS, own, self_id, pad_id)
    weight = np.broadcast_to(_EMBEDDING_WEIGHTS, contexts.shape).copy()
    weight[(contexts == self_id) | (contexts == pad_id) | (contexts == 0)] = 0.0
    vectors = np.asarray(input_vectors[contexts.ravel()], dtype=np.float32).reshape(
        contexts.shape[0], contexts.shape[1], -1)
    summed = np.zeros((variables, vectors.shape[2]), dtype=np.float64)
    np.add.at(summed, owners, np.einsum("ow,owd->od", weight, vectors))
    totals = np.bincount(owners, weights=weight.sum(axis=1), minlength=variables)
    totals[totals <= 0] = 1.0
    return (summed / totals[:, None]).astype(np.float32)


def _logsumexp(values: np.ndarray) -> float:
    top = float(values.max())
    return top + math.log(float(np.exp(values - top).sum()))


def allowed_mask(tables: NameTables, ranking: Ranking, bound_names: frozenset[str], current: str) -> np.ndarray:
    """Candidates that may replace the current name: not bound nearby, not reserved, in the team's style."""
    # Variables of one scope share their bound names: work out their mask once.
    key = (ranking.language, bound_names)
    shared = tables.bound_masks.get(key)
    if shared is None:
        mask = tables.static_allowed.copy()
        for name in bound_names:
            row = tables.row_by_name.get((ranking.language, name))
            if row is not None:
                mask[row] = False
        shared = mask[ranking.rows]
        if len(tables.bound_masks) > 256:
            tables.bound_masks.clear()
        tables.bound_masks[key] = shared
    allowed = shared & ranking.known if ranking.known is not None else shared.copy()
    row = tables.row_by_name.get((ranking.language, current))
    if row is not None:
        allowed[int(np.searchsorted(ranking.rows, row))] = False
    return allowed


@dataclass
class NameFit:
    """Scores of one name in a ranking; known is False when judged by sub-tokens only."""

    count: float
    embedding: float
    lexical: float
    combined: float
    rank: int
    known: bool
    parts_known: float = 1.0


# Names this short are the language's or the team's shorthand (`i`, `r`, `ok`): which one fits
# takes more than the model sees, so they get suggestions but are never flagged.
MIN_FLAGGED_LENGTH = 3


def flaggable(fit: NameFit | None, name: str, flow: Flow | None = None, need_contradiction: bool = False) -> bool:
    """Whether a name may be flagged: longer than shorthand, and either a name the team uses
    elsewhere or a single word (`flag`). A compound the team has never used for a variable
    (`extracted_path`) was spelled out on purpose: judged by its parts for suggestions, never flagged.
    With `need_contradiction`, only where the team's names at one of the variable's cues say
    otherwise (Flow.contradiction): a flag a reviewer can check against the team's code."""
    if fit is None or len(name.strip("_")) < MIN_FLAGGED_LENGTH:
        return False
    if not (fit.known or len(split_identifier(name)) == 1):
        return False
    return not need_contradiction or (flow is not None and flow.contradiction(name) is not None)


def name_fit(tables: NameTables, ranking: Ranking, name: str, weights: Weights | None = None) -> NameFit | None:
    """Where a name stands among the candidates; unseen names are judged by their sub-tokens."""
    weights = weights or Weights()
    row = tables.row_by_name.get((ranking.language, name))
    subtokens = [part for part in split_identifier(name) if part not in STOP_SUBTOKENS]
    if not subtokens:
        return None
    lexical = lexical_fit(frozenset(subtokens), ranking.context_subtokens)
    if row is not None and ranking.known is not None and not ranking.known[int(np.searchsorted(ranking.rows, row))]:
        row = None  # only the held-out file used this name: a model without it never saw the name
    if row is not None:
        index = int(np.searchsorted(ranking.rows, row))
        count = float(ranking.count_scores[index])
        embedding = float(ranking.embedding_scores[index])
        known, parts_known = True, 1.0
    else:
        known = False
        part_rows = [tables.row_by_name.get((ranking.language, part)) for part in subtokens]
        indices = np.searchsorted(ranking.rows, [r for r in part_rows if r is not None]).astype(np.int64)
        count = float(ranking.count_scores[indices].mean()) if len(indices) else ranking.unseen_count
        vocabulary_rows = [tables.vocabulary.index[p] for p in subtokens
                           if p in tables.vocabulary.index and p not in ranking.unseen]
        parts_known = len(vocabulary_rows) / len(subtokens)
        if vocabulary_rows and weights.embedding:
            composed = np.asarray(tables.output_vectors[vocabulary_rows], dtype=np.float32).mean(axis=0)
            embedding = float(composed @ ranking.context_vector) - ranking.embedding_normaliser
        else:
            embedding = float(ranking.embedding_scores.min())
    combined = weights.counts * count + weights.embedding * embedding + weights.lexical * lexical
    rank = int((ranking.combined > combined).sum())
    return NameFit(count, embedding, lexical, combined, rank, known, parts_known)


FEATURE_NAMES = (
    "combined_gap", "count_gap", "embedding_gap", "lexical_current", "lexical_best", "log_rank",
    "log_name_count", "known", "log_occurrences", "is_parameter", "embedding_current", "count_current_gap_top1",
    "parts_known", "flow_share_current", "flow_strong_current", "flow_weak_current", "flow_partial_current",
    "flow_best_other_share", "flow_peak_share", "flow_peak_agrees", "flow_cues", "flow_fit_current",
)


def detection_features(tables: NameTables, ranking: Ranking, allowed: np.ndarray, fit: NameFit,
                       name: str, variable: Variable) -> np.ndarray:
    """The detector's inputs for one variable under one name. Where no other name may be
    offered, the best alternative counts as level with the current name (gaps of 0)."""
    row = tables.row_by_name.get((ranking.language, name))
    name_count = ranking.name_count(tables, row) if row is not None else 0.0
    if allowed.any():
        combined = np.where(allowed, ranking.combined, -np.inf)
        best = int(np.argmax(combined))
        combined_gap = float(combined[best]) - fit.combined
        count_gap = float(np.max(np.where(allowed, ranking.count_scores, -np.inf))) - fit.count
        # Embeddings off: every candidate's embedding score is 0.
        best_embedding = (float(np.max(np.where(allowed, ranking.embedding_scores, -np.inf)))
                          if ranking.embedding_scores.any() else 0.0)
        embedding_gap = best_embedding - fit.embedding
        lexical_best = float(ranking.lexical_scores[best])
        count_gap_top1 = float(ranking.count_scores[best]) - fit.count
    else:
        combined_gap = count_gap = embedding_gap = count_gap_top1 = 0.0
        lexical_best = fit.lexical
    return np.array([
        combined_gap,
        count_gap,
        embedding_gap,
        fit.lexical,
        lexical_best,
        math.log1p(fit.rank),
        math.log1p(name_count),
        1.0 if fit.known else 0.0,
        math.log(ranking.occurrences),
        1.0 if variable.kind == "parameter" else 0.0,
        fit.embedding,
        count_gap_top1,
        fit.parts_known,
        *_flow_detection(ranking.flow, name),
    ], dtype=np.float64)


def _flow_detection(flow: Flow | None, name: str) -> list[float]:
    """How the variable's cues back its current name against any other name."""
    if flow is None:
        return [0.0] * 9
    share, _, strong, weak, partial, cues, fit = flow.features(name)
    peak_name, peak_share = flow.peak()
    return [share, strong, weak, partial, flow.best_other_share(name), peak_share, 1.0 if peak_name == name else 0.0,
            cues, fit]


@dataclass
class LinearModel:
    """Logistic regression over standardised features, stored with the names of its features."""

    mean: np.ndarray
    scale: np.ndarray
    coefficients: np.ndarray
    intercept: float

    FEATURES: ClassVar[tuple[str, ...]] = ()

    def logit(self, features: np.ndarray) -> np.ndarray:
        return ((features - self.mean) / self.scale) @ self.coefficients + self.intercept

    def to_json(self) -> dict:
        return {"features": list(self.FEATURES), "mean": self.mean.tolist(), "scale": self.scale.tolist(),
                "coefficients": self.coefficients.tolist(), "intercept": self.intercept}

    @classmethod
    def from_json(cls, data: dict):
        if data.get("features") != list(cls.FEATURES):
            raise ValueError(f"the {cls.__name__.lower()} was trained on other features")
        return cls(np.array(data["mean"]), np.array(data["scale"]), np.array(data["coefficients"]),
                   float(data["intercept"]))


class Detector(LinearModel):
    """The detector: its logit over detection features is the oddness."""

    FEATURES = FEATURE_NAMES

    def oddness(self, features: np.ndarray) -> np.ndarray:
        return self.logit(features)


def fit_detector(features: np.ndarray, labels: np.ndarray, l2: float = 1.0, iterations: int = 50) -> Detector:
    """Fit logistic regression by Newton's method with an L2 penalty."""
    mean = features.mean(axis=0)
    scale = features.std(axis=0)
    scale[scale < 1e-9] = 1.0
    x = np.hstack([(features - mean) / scale, np.ones((len(features), 1))])
    w = np.zeros(x.shape[1])
    penalty = np.full(x.shape[1], l2)
    penalty[-1] = 0.0
    for _ in range(iterations):
        p = 1.0 / (1.0 + np.exp(-np.clip(x @ w, -30, 30)))
        gradient = x.T @ (p - labels) + penalty * w
        hessian = (x * (p * (1 - p))[:, None]).T @ x + np.diag(penalty + 1e-9)
        step = np.linalg.solve(hessian, gradient)
        w -= step
        if np.abs(step).max() < 1e-7:
            break
    return Detector(mean, scale, w[:-1], float(w[-1]))


# --- the per-file judgement -------------------------------------------------------------


class Scorer:
    """A loaded model's scoring: judge every variable of a file, suggest names for one."""

    def __init__(self, tables: NameTables, detector: Detector | None, thresholds: dict[str, float],
                 weights: Weights | None = None, reranker=None):
        self.tables = tables
        self.detector = detector
        self.thresholds = thresholds  # per language; a language without one gets suggestions only
        self.weights = weights or Weights()
        self.reranker = reranker  # reranking.Reranker, or None to rank by the combined score alone

    def threshold_for(self, language: str, override: float | None = None) -> float:
        """The oddness above which a name is flagged in a language (infinite: never)."""
        if override is not None:
            return override
        return self.thresholds.get(language, math.inf)

    def judge(self, source: SourceFile, variable: Variable, ids: np.ndarray | None = None,
              limit: int = 5) -> Judgement:
        return self.judge_many(source, [variable], ids, limit)[0]

    def judge_many(self, source: SourceFile, variables: list[Variable], ids: np.ndarray | None = None,
                   limit: int = 5, chunk: int = 128, suggest_above: float | None = None) -> list[Judgement]:
        """Judgements for many variables of one file, scored in batches.

        With suggest_above, names are suggested only for variables whose oddness passes it
        (the others keep an empty list): the expensive part is skipped where nothing is shown.
        """
        if not variables:
            return []
        holdout = None
        if source.digest and self.tables.trained_files.get(source.path) == source.digest:
            # The model learned from this very file: take its share out, as calibration did, or the
            # file's own names would back themselves. (A file changed since is read as new code.)
            from .counts import forget_file

            holdout, ids = forget_file(self.tables, source, whole_file=False)
        elif ids is None:
            ids = token_ids(source, self.tables.vocabulary)
        judged = [v for v in variables if v.name not in IGNORED_NAMES]
        rankings = {id(variable): ranking for variable, ranking in
                    zip(judged, rank_in_batches(self.tables, source, judged, ids, self.weights, holdout, chunk))}
        return [self._judge_ranked(source, v, rankings.get(id(v)), limit, suggest_above) for v in variables]

    def may_be_flagged(self, source: SourceFile, variable: Variable) -> bool:
        """False for a variable no judgement could flag (shorthand, a compound the team never used,
        a dictated name), known before any scoring: a check that shows only flags skips it."""
        name = variable.name
        if name in IGNORED_NAMES or len(name.strip("_")) < MIN_FLAGGED_LENGTH:
            return False
        if (source.language, name) not in self.tables.row_by_name and len(split_identifier(name)) > 1:
            return False
        return not self.dictated(source, variable)

    def contradicted_only(self, source: SourceFile, variables: list[Variable]) -> list[Variable]:
        """Of `variables`, those a model that flags only contradicted names could flag: the ones the
        team's naming at a cue contradicts (Flow.contradiction), found from the flow alone, under
        the view scoring would take. A model that flags any name keeps them all."""
        if not self.tables.flags_need_contradiction:
            return variables
        trained = bool(source.digest) and self.tables.trained_files.get(source.path) == source.digest
        view = FlowView(self.tables.flow) if trained else \
            FlowView(self.tables.flow, None, file_flow(source.variables))
        style = self.tables.styles.get(source.language, get_language(source.language).naming_style)
        reserved = reserved_words(source.language)
        return [v for v in variables if v.cues and variable_flow(
            v, view, style, _name_filter(v, reserved), 1.0).contradiction(v.name) is not None]

    def dictated(self, source: SourceFile, variable: Variable) -> str:
        """Why a variable's name is not the team's to choose, or "": then it is never flagged."""
        if variable.dictated or variable.kind != "parameter" or not variable.owner:
            return variable.dictated
        from .overrides import inherited_from

        base = inherited_from(variable.owner, variable.function, source.facts, self.tables.classes)
        return f"it overrides `{base}`" if base else ""

    def _judge_ranked(self, source: SourceFile, variable: Variable, ranking: Ranking | None,
                      limit: int, suggest_above: float | None = None) -> Judgement:
        if ranking is None:
            return Judgement(variable, None, [])
        dictated = self.dictated(source, variable)
        if dictated:
            # Not the team's name to choose: never flagged, though names are still offered on request.
            suggestions = [] if suggest_above is not None else self.suggestions(
                ranking, allowed_mask(self.tables, ranking, variable.bound_names, variable.name), limit,
                variable.bound_names, variable.name)
            return Judgement(variable, None, suggestions, dictated=dictated)
        allowed = allowed_mask(self.tables, ranking, variable.bound_names, variable.name)
        fit = name_fit(self.tables, ranking, variable.name, self.weights)
        oddness, features = None, None
        if fit is not None:
            features = detection_features(self.tables, ranking, allowed, fit, variable.name, variable)
            if self.detector is not None:
                oddness = float(self.detector.oddness(features[None, :])[0])
            else:
                oddness = float(features[0])
        suggestions = []
        if suggest_above is None or (oddness is not None and oddness > suggest_above):
            suggestions = self.suggestions(ranking, allowed, limit, variable.bound_names, variable.name)
        may_flag = flaggable(fit, variable.name, ranking.flow, self.tables.flags_need_contradiction)
        agreement = None
        if may_flag and suggestions and self.tables.flags_need_contradiction:
            # A flag is about the name its cue gives: when that name cannot be offered, no flag.
            suggestions, may_flag = self._contradicting_first(suggestions, ranking, allowed, variable.name, limit)
            agreement = ranking.flow.contradiction(variable.name)[2] if may_flag else None
        return Judgement(variable, oddness, suggestions, features, flaggable=may_flag, agreement=agreement)

    def _contradicting_first(self, suggestions: list[Suggestion], ranking: Ranking, allowed: np.ndarray,
                             name: str, limit: int) -> tuple[list[Suggestion], bool]:
        """A flag's first suggestion is the name its contradicting cue gives, with that cue as the reason;
        (the suggestions, whether that name could be offered)."""
        other, cue, _ = ranking.flow.contradiction(name)
        found = next((s for s in suggestions if s.name == other), None)
        if found is None:
            row = self.tables.row_by_name.get((ranking.language, other))
            if row is not None and not allowed[int(np.searchsorted(ranking.rows, row))]:
                return suggestions, False
            found = self._backed(other, suggestions[0].score, row, ranking)
            if found is None:
                return suggestions, False
        # Its reason is the cue that contradicts the name, with places where the team names it so.
        places = [place for place in self.tables.flow.places.get((cue, other), []) if not _is_own(place, ranking.own_place)]
        found = Suggestion(found.name, found.score, (places + [p for p in found.evidence if p not in places])[:3],
                           ranking.flow.reason_at(cue, other))
        return [found] + [s for s in suggestions if s.name != other][:limit - 1], True

    def suggestions(self, ranking: Ranking, allowed: np.ndarray, limit: int,
                    bound: frozenset[str] = frozenset(), current: str = "") -> list[Suggestion]:
        """The best names for a variable, best first, each with what backs it: places in the team's
        code, or the variable's flow. A name with neither is never offered."""
        if self.reranker is not None:
            ranked = self.reranker.rank(self.tables, ranking, allowed, bound, current, self.weights, 2 * limit)
        else:
            combined = np.where(allowed, ranking.combined, -np.inf)
            if not allowed.any():
                return []
            take = min(2 * limit, len(combined) - 1)
            candidates = np.argpartition(-combined, take)[:take] if take > 0 else np.arange(len(combined))
            top = [int(i) for i in candidates[np.argsort(-combined[candidates], kind="stable")]
                   if np.isfinite(combined[i])]
            shifted = combined[top] - _logsumexp(combined[np.isfinite(combined)])
            ranked = [(self.tables.names[ranking.rows[i]], float(math.exp(score)), int(ranking.rows[i]))
                      for i, score in zip(top, shifted)]
        found = []
        for name, score, row in ranked:
            suggestion = self._backed(name, score, row, ranking)
            if suggestion is not None:
                found.append(suggestion)
                if len(found) == limit:
                    break
        return found

    def _backed(self, name: str, score: float, row: int | None, ranking: Ranking) -> Suggestion | None:
        places = self.evidence(row, ranking) if row is not None else []
        reason, cue = ranking.flow.reason(name) if ranking.flow is not None else ("", "")
        if cue:
            cue_places = [place for place in self.tables.flow.places.get((cue, name), [])
                          if not _is_own(place, ranking.own_place)]
            places = (cue_places + [p for p in places if p not in cue_places])[:3]
        if not places:
            in_file = ranking.named_in_file(name)  # another variable of the same file is called so
            if in_file is None and not reason:
                return None
            places = [in_file] if in_file is not None else []
            return Suggestion(name, score, places, reason, in_file=in_file is not None)
        return Suggestion(name, score, places, reason)

    def evidence(self, row: int, ranking: Ranking, limit: int = 3) -> list[tuple[str, int]]:
        """Places in the team's code where a name is used in the most similar contexts.

        Never the variable's own place (a rename the model has not yet learned would otherwise
        back itself), nor anywhere in a file scored as if unseen.
        """
        tables = self.tables
        start, end = int(tables.evidence_start[row]), int(tables.evidence_start[row + 1])
        if start == end:
            return []
        path_ids = np.asarray(tables.evidence_path_ids[start:end])
        keep = np.ones(end - start, dtype=bool)
        if ranking.own_place is not None:
            own_path, first_line, last_line = ranking.own_place
            own = tables.path_id.get(own_path)
            if own is not None:
                lines = np.asarray(tables.evidence_lines[start:end])
                keep &= ~((path_ids == own) & (lines >= first_line) & (lines <= last_line))
        if not keep.any():
            return []
        similarity = np.asarray(tables.evidence_vectors[start:end]) @ ranking.context_vector
        similarity[~keep] = -np.inf
        order = np.argsort(-similarity, kind="stable")[:min(limit, int(keep.sum()))]
        return [(tables.evidence_paths[int(path_ids[i])], int(tables.evidence_lines[start + i])) for i in order]

    def is_flagged(self, judgement: Judgement, limit: float) -> bool:
        """Whether a judgement passes a threshold, with a name to offer instead."""
        return judgement.flaggable and judgement.oddness is not None and judgement.oddness > limit and \
            bool(judgement.suggestions)


def _is_own(place: tuple[str, int], own: tuple[str, int, int] | None) -> bool:
    return own is not None and place[0] == own[0] and own[1] <= place[1] <= own[2]


def dominant_style(names: dict[str, float], default: str = "snake") -> str:
    """The case style most local names are written in. Single lower-case words count for none, nor
    do single letters: `G` for a graph is shorthand, not a sign the team writes `PascalCase`."""
    votes: dict[str, float] = {}
    for name, count in names.items():
        if len(name.strip("_")) < 2:
            continue
        style = case_style(name)
        if style in ("snake", "camel", "pascal", "screaming"):
            votes[style] = votes.get(style, 0) + count
    return max(votes, key=votes.get) if votes else default
